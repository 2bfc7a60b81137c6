package org.cryowarden.daemon.notify.builtin;

import jakarta.mail.internet.AddressException;
import jakarta.mail.internet.InternetAddress;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.daemon.notify.spi.Notifier;
import org.cryowarden.daemon.notify.spi.NotifierFactory;
import org.cryowarden.drivers.settings.SettingsReader;

/**
 * {@code kind: email}: sends each notice as a plain-text e-mail through an SMTP server with Jakarta Mail
 * (Eclipse Angus). {@code security} is {@code starttls} (the default: STARTTLS required, RFC 3207; the session
 * fails rather than send in clear), {@code tls} (implicit TLS, usually port 465) or {@code none} (a local relay).
 * <pre>
 * - {id: lab-mail, kind: email, host: smtp.example.org, port: 587, security: starttls,
 *    username: cryowarden, password_file: smtp-password, from: cryowarden@example.org, timeout: 20s}
 * </pre>
 */
public final class MailNotifierFactory implements NotifierFactory {

    /** How the SMTP connection is protected. */
    enum Security { STARTTLS, TLS, NONE }

    static final Map<String, Security> SECURITY = Map.of("starttls", Security.STARTTLS, "tls", Security.TLS,
            "none", Security.NONE);

    @Override
    public String kind() {
        return "email";
    }

    @Override
    public String description() {
        return "plain-text e-mail through SMTP (STARTTLS, TLS or none; optional login)";
    }

    @Override
    public void validate(SettingsReader settings, Path folder) {
        read(settings, folder);
    }

    @Override
    public Notifier create(String senderId, SettingsReader settings, Path folder) {
        return new MailNotifier(read(settings, folder).orElseThrow(() -> new IllegalArgumentException(
                "sender " + senderId + " did not validate: " + settings.problems())));
    }

    private static Optional<MailNotifier.Server> read(SettingsReader settings, Path folder) {
        settings.allowOnly("host", "port", "security", "username", "password_file", "from", "timeout");
        Optional<String> host = settings.text("host", true);
        Security security = settings.choice("security", SECURITY, false).orElse(Security.STARTTLS);
        int port = settings.integer("port", 1, 65535, false)
                .orElse(security == Security.TLS ? 465 : security == Security.STARTTLS ? 587 : 25);
        Optional<String> username = settings.text("username", false);
        Optional<String> password = Optional.empty();
        if (username.isPresent()) {
            password = SecretFile.read(settings, "password_file", folder, true);
        } else if (settings.has("password_file")) {
            settings.problem(settings.position("password_file"), "password_file needs a username");
        }
        Optional<InternetAddress> from = settings.text("from", true).flatMap(text -> {
            try {
                InternetAddress address = new InternetAddress(text, true);
                return Optional.of(address);
            } catch (AddressException e) {
                settings.problem(settings.position("from"), "from must be an e-mail address, got '" + text + "': "
                        + e.getMessage());
                return Optional.empty();
            }
        });
        Duration timeout = settings.duration("timeout", Duration.ofSeconds(1), Duration.ofMinutes(5), false)
                .orElse(Duration.ofSeconds(20));
        if (host.isEmpty() || from.isEmpty() || !settings.problems().isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(new MailNotifier.Server(host.get(), port, security, username, password, from.get(),
                timeout));
    }

    /** Whether {@code text} is an e-mail address the sender can use; for the roster loader. */
    public static Optional<String> addressProblem(String text) {
        try {
            new InternetAddress(text, true).validate();
            return Optional.empty();
        } catch (AddressException e) {
            return Optional.of(e.getMessage());
        }
    }
}
