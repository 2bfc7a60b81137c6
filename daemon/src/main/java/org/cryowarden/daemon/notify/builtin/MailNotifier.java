package org.cryowarden.daemon.notify.builtin;

import jakarta.mail.Message;
import jakarta.mail.MessagingException;
import jakarta.mail.Session;
import jakarta.mail.Transport;
import jakarta.mail.internet.InternetAddress;
import jakarta.mail.internet.MimeMessage;
import java.time.Duration;
import java.util.Date;
import java.util.Optional;
import java.util.Properties;
import org.cryowarden.daemon.notify.spi.Delivery;
import org.cryowarden.daemon.notify.spi.Notice;
import org.cryowarden.daemon.notify.spi.Notifier;

/**
 * One SMTP sender. Each notice is one message, one connection (a night sends a handful). The notice id is the
 * {@code Message-ID} local part, so a repeated delivery carries the same id and mail clients thread it as one.
 */
final class MailNotifier implements Notifier {

    record Server(String host, int port, MailNotifierFactory.Security security, Optional<String> username,
                  Optional<String> password, InternetAddress from, Duration timeout) {
    }

    private final Server server;
    private final Session session;

    MailNotifier(Server server) {
        this.server = server;
        Properties props = new Properties();
        String protocol = server.security() == MailNotifierFactory.Security.TLS ? "smtps" : "smtp";
        String p = "mail." + protocol + ".";
        props.put("mail.transport.protocol", protocol);
        props.put(p + "host", server.host());
        props.put(p + "port", Integer.toString(server.port()));
        props.put(p + "auth", Boolean.toString(server.username().isPresent()));
        String millis = Long.toString(server.timeout().toMillis());
        props.put(p + "connectiontimeout", millis);
        props.put(p + "timeout", millis);
        props.put(p + "writetimeout", millis);
        if (server.security() == MailNotifierFactory.Security.STARTTLS) {
            props.put(p + "starttls.enable", "true");
            props.put(p + "starttls.required", "true");
        }
        if (server.security() != MailNotifierFactory.Security.NONE) {
            props.put(p + "ssl.checkserveridentity", "true");
        }
        this.session = Session.getInstance(props);
    }

    /** For tests: the Jakarta Mail session (to trust a test certificate). */
    Session session() {
        return session;
    }

    @Override
    public Delivery deliver(Notice notice) {
        try {
            MimeMessage message = new MimeMessage(session) {
                @Override
                protected void updateMessageID() throws MessagingException {
                    setHeader("Message-ID", "<" + notice.id() + "@cryowarden>");
                }
            };
            message.setFrom(server.from());
            message.setRecipients(Message.RecipientType.TO, InternetAddress.parse(notice.address(), true));
            message.setSubject(notice.subject(), "UTF-8");
            message.setSentDate(new Date());
            message.setHeader("X-Cryowarden-Notice", notice.id());
            message.setText(notice.text(), "UTF-8");
            message.saveChanges();
            try (Transport transport = session.getTransport()) {
                if (server.username().isPresent()) {
                    transport.connect(server.host(), server.port(), server.username().get(),
                            server.password().orElse(""));
                } else {
                    transport.connect();
                }
                transport.sendMessage(message, message.getAllRecipients());
            }
            return Delivery.delivered("accepted by " + server.host() + ":" + server.port());
        } catch (MessagingException e) {
            return Delivery.failed("SMTP " + server.host() + ":" + server.port() + ": " + describe(e));
        }
    }

    private static String describe(MessagingException e) {
        StringBuilder text = new StringBuilder(String.valueOf(e.getMessage()).strip());
        Throwable cause = e.getCause();
        if (cause != null && cause.getMessage() != null && !text.toString().contains(cause.getMessage())) {
            text.append(" (").append(cause.getMessage().strip()).append(')');
        }
        return text.toString();
    }
}
