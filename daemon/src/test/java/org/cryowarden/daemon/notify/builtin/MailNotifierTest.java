package org.cryowarden.daemon.notify.builtin;

import static org.assertj.core.api.Assertions.assertThat;

import com.icegreen.greenmail.junit5.GreenMailExtension;
import com.icegreen.greenmail.util.ServerSetup;
import com.icegreen.greenmail.util.ServerSetupTest;
import jakarta.mail.internet.MimeMessage;
import java.nio.file.Files;
import java.nio.file.Path;
import org.cryowarden.daemon.notify.spi.Delivery;
import org.cryowarden.daemon.notify.spi.Notice;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.config.YamlReader;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;

/** The e-mail sender against GreenMail's plain SMTP and implicit-TLS SMTPS servers (its self-signed certificate). */
class MailNotifierTest {

    @RegisterExtension
    static GreenMailExtension smtp = new GreenMailExtension(new ServerSetup[] {ServerSetupTest.SMTP,
        ServerSetupTest.SMTPS});

    @TempDir
    Path folder;

    private static final Notice NOTICE = new Notice("a7.s1.ines", "ines", "ines.okafor@harbour-hall.example",
            "[cryowarden harbour-hall] CRITICAL o2-east-low: oxygen 18.9 %vol below 19.5 %vol",
            "oxygen 18.9 %vol below 19.5 %vol\n", "{\"id\":\"a7.s1.ines\"}");

    @Test
    void starttlsIsRequiredSoAServerWithoutItGetsNothingInClear() throws Exception {
        MailNotifier notifier = create("{host: 127.0.0.1, port: " + smtp.getSmtp().getPort() + ", security: starttls,"
                + " from: cryowarden@harbour-hall.example, timeout: 5s}");

        Delivery delivery = notifier.deliver(NOTICE);

        // RFC 3207: a client that requires STARTTLS must not go on when the server does not offer it.
        assertThat(delivery.delivered()).isFalse();
        assertThat(delivery.detail()).contains("STARTTLS");
        assertThat(smtp.getReceivedMessages()).isEmpty();
    }

    @Test
    void implicitTlsWithLoginDeliversOnceTheCertificateIsTrusted() throws Exception {
        smtp.setUser("cryowarden@harbour-hall.example", "cryowarden", "night-shift-password");
        Files.writeString(folder.resolve("smtp-password"), "night-shift-password\n");
        MailNotifier notifier = create("{host: 127.0.0.1, port: " + smtp.getSmtps().getPort() + ", security: tls,"
                + " username: cryowarden, password_file: smtp-password, from: cryowarden@harbour-hall.example,"
                + " timeout: 5s}");
        // GreenMail's certificate is self-signed for its own name: trust it, as a site would its CA.
        notifier.session().getProperties().put("mail.smtps.ssl.trust", "127.0.0.1");
        notifier.session().getProperties().put("mail.smtps.ssl.checkserveridentity", "false");

        Delivery delivery = notifier.deliver(NOTICE);

        assertThat(delivery.delivered()).as(delivery.detail()).isTrue();
        MimeMessage[] received = smtp.getReceivedMessages();
        assertThat(received).hasSize(1);
        assertThat(received[0].getHeader("Message-ID")[0]).isEqualTo("<a7.s1.ines@cryowarden>");
        assertThat(received[0].getSubject()).isEqualTo(NOTICE.subject());
    }

    @Test
    void implicitTlsRefusesAnUntrustedCertificate() throws Exception {
        MailNotifier notifier = create("{host: 127.0.0.1, port: " + smtp.getSmtps().getPort() + ", security: tls,"
                + " from: cryowarden@harbour-hall.example, timeout: 5s}");

        Delivery delivery = notifier.deliver(NOTICE);

        assertThat(delivery.delivered()).isFalse();
        assertThat(smtp.getReceivedMessages()).isEmpty();
    }

    private MailNotifier create(String yaml) throws Exception {
        SettingsReader settings = new SettingsReader((ConfigNode.Mapping) YamlReader.read(yaml, "<sender>"),
                "sender 'lab-mail'");
        return (MailNotifier) new MailNotifierFactory().create("lab-mail", settings, folder);
    }
}
