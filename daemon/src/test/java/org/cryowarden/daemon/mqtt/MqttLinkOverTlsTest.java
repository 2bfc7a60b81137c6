package org.cryowarden.daemon.mqtt;

import static org.cryowarden.daemon.LoopbackPort.freePort;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.net.InetAddress;
import java.net.Socket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The link against a Mosquitto of its own (not the system one on 1883) with three TLS listeners on free loopback
 * ports, a password file and certificates made by openssl for this run:
 * {@code good} (a certificate for localhost), {@code misnamed} (a certificate for another host, same authority)
 * and {@code mutual} ({@code require_certificate true}).
 */
class MqttLinkOverTlsTest {

    private static final String USER = "cryowarden";
    private static final String PASSWORD = "tls-test-password-9f3c";
    /** A refused connect shows as no connect within this; an accepted one takes a few tens of milliseconds. */
    private static final Duration REFUSAL_WAIT = Duration.ofSeconds(2);

    @TempDir
    static Path dir;

    private static Process mosquitto;
    private static int good;
    private static int misnamed;
    private static int mutual;

    @BeforeAll
    static void startMosquittoWithTls() throws Exception {
        Assumptions.assumeTrue(onPath("mosquitto") && onPath("openssl") && onPath("mosquitto_passwd"),
                "mosquitto, mosquitto_passwd or openssl not installed");
        authority("ca");
        authority("other-ca");
        signed("server", "ca", "localhost", "subjectAltName=DNS:localhost,IP:127.0.0.1");
        signed("stranger", "ca", "broker.invalid", "subjectAltName=DNS:broker.invalid");
        signed("client", "ca", "cryowarden-client", "extendedKeyUsage=clientAuth");
        run("mosquitto_passwd", "-b", "-c", dir.resolve("passwd").toString(), USER, PASSWORD);
        good = freePort();
        misnamed = freePort();
        mutual = freePort();
        String config = "user root\nallow_anonymous false\npassword_file " + dir.resolve("passwd") + "\n"
                + listener(good, "server", false) + listener(misnamed, "stranger", false)
                + listener(mutual, "server", true);
        Path conf = Files.writeString(dir.resolve("mosquitto.conf"), config);
        mosquitto = new ProcessBuilder("mosquitto", "-c", conf.toString())
                .redirectErrorStream(true).redirectOutput(dir.resolve("mosquitto.log").toFile()).start();
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
        for (int port : List.of(good, misnamed, mutual)) {
            while (!listening(port)) {
                assertThat(mosquitto.isAlive()).as("mosquitto exited: %s",
                        Files.readString(dir.resolve("mosquitto.log"))).isTrue();
                assertThat(System.nanoTime()).as("mosquitto listening on %d", port).isLessThan(deadline);
                Thread.onSpinWait();
            }
        }
    }

    @AfterAll
    static void stopMosquitto() throws InterruptedException {
        if (mosquitto != null) {
            mosquitto.destroy();
            if (!mosquitto.waitFor(5, TimeUnit.SECONDS)) {
                mosquitto.destroyForcibly().waitFor();
            }
        }
    }

    @Test
    void connectsWithTheRightAuthorityAndPassword() throws Exception {
        assertThat(connects(settings("ssl://localhost:" + good, "ca", PASSWORD, false))).isTrue();
    }

    @Test
    void mqttsSchemeIsTheSameAsSsl() throws Exception {
        assertThat(connects(settings("mqtts://localhost:" + good, "ca", PASSWORD, false))).isTrue();
    }

    @Test
    void brokerSignedByAnotherAuthorityIsRefused() throws Exception {
        assertThat(connects(settings("ssl://localhost:" + good, "other-ca", PASSWORD, false))).isFalse();
    }

    @Test
    void brokerNotTrustedByTheJvmIsRefusedWithoutACaFile() throws Exception {
        MqttLinkSettings settings = MqttLinkSettings.of("ssl://localhost:" + good, "tls-default-trust", "test/tls",
                "online", "offline").withCredentials(USER, PASSWORD);
        assertThat(connects(settings)).isFalse();
    }

    @Test
    void wrongPasswordIsRefused() throws Exception {
        assertThat(connects(settings("ssl://localhost:" + good, "ca", "not-the-password", false))).isFalse();
    }

    @Test
    void certificateForAnotherHostIsRefused() throws Exception {
        // Same authority, right password: only the name in the certificate (broker.invalid) differs from localhost.
        assertThat(connects(settings("ssl://localhost:" + misnamed, "ca", PASSWORD, false))).isFalse();
    }

    @Test
    void listenerRequiringAClientCertificateAcceptsOurs() throws Exception {
        assertThat(connects(settings("ssl://localhost:" + mutual, "ca", PASSWORD, true))).isTrue();
    }

    @Test
    void listenerRequiringAClientCertificateRefusesUsWithoutOne() throws Exception {
        assertThat(connects(settings("ssl://localhost:" + mutual, "ca", PASSWORD, false))).isFalse();
    }

    @Test
    void missingOrBadPemFilesAreNamedWhenTheLinkIsBuilt() throws IOException {
        Path notPem = Files.writeString(dir.resolve("garbage.pem"), "hello");
        MqttLinkSettings base = MqttLinkSettings.of("ssl://localhost:" + good, "tls-bad", "test/tls", "on", "off");
        assertThatThrownBy(() -> new MqttLink(base.withTls(new LinkTls(Optional.of(dir.resolve("none.pem")),
                Optional.empty(), Optional.empty()))).close())
                .hasMessage(dir.resolve("none.pem") + ": no such file");
        assertThatThrownBy(() -> new MqttLink(base.withTls(new LinkTls(Optional.of(notPem),
                Optional.empty(), Optional.empty()))).close())
                .hasMessageStartingWith(notPem + ": ");
        assertThatThrownBy(() -> new MqttLink(base.withTls(new LinkTls(Optional.of(dir.resolve("ca.pem")),
                Optional.of(dir.resolve("client.pem")), Optional.of(notPem)))).close())
                .hasMessageStartingWith(notPem + ": no unencrypted PKCS#8 key (BEGIN PRIVATE KEY)");
    }

    @Test
    void passwordNeverAppearsInTheSettingsText() {
        assertThat(settings("ssl://localhost:" + good, "ca", PASSWORD, true).toString())
                .doesNotContain(PASSWORD).contains("password set", "TLS");
    }

    private static MqttLinkSettings settings(String uri, String authority, String password, boolean clientCert) {
        LinkTls tls = new LinkTls(Optional.of(dir.resolve(authority + ".pem")),
                clientCert ? Optional.of(dir.resolve("client.pem")) : Optional.empty(),
                clientCert ? Optional.of(dir.resolve("client.key")) : Optional.empty());
        return MqttLinkSettings.of(uri, "tls-" + authority + (clientCert ? "-cert" : ""), "test/tls", "online",
                "offline").withCredentials(USER, password).withTls(tls)
                .withRetryDelays(Duration.ofMillis(200), Duration.ofMillis(400));
    }

    private static boolean connects(MqttLinkSettings settings) throws InterruptedException {
        MqttLink link = new MqttLink(settings);
        try {
            link.start();
            boolean accepted = link.awaitFirstConnect(REFUSAL_WAIT);
            return accepted && link.isConnected();
        } finally {
            link.close();
        }
    }

    private static String listener(int port, String cert, boolean requireClientCert) {
        return "listener " + port + " 127.0.0.1\n"
                + "cafile " + dir.resolve("ca.pem") + "\n"
                + "certfile " + dir.resolve(cert + ".pem") + "\n"
                + "keyfile " + dir.resolve(cert + ".key") + "\n"
                + "require_certificate " + requireClientCert + "\n";
    }

    private static void authority(String name) throws Exception {
        run("openssl", "req", "-x509", "-newkey", "rsa:2048", "-nodes", "-days", "2", "-subj", "/CN=" + name,
                "-keyout", dir.resolve(name + ".key").toString(), "-out", dir.resolve(name + ".pem").toString());
    }

    private static void signed(String name, String authority, String commonName, String extension) throws Exception {
        Path ext = Files.writeString(dir.resolve(name + ".ext"), extension + "\n");
        run("openssl", "req", "-newkey", "rsa:2048", "-nodes", "-subj", "/CN=" + commonName,
                "-keyout", dir.resolve(name + ".key").toString(), "-out", dir.resolve(name + ".csr").toString());
        run("openssl", "x509", "-req", "-days", "2", "-in", dir.resolve(name + ".csr").toString(),
                "-CA", dir.resolve(authority + ".pem").toString(), "-CAkey", dir.resolve(authority + ".key").toString(),
                "-CAcreateserial", "-extfile", ext.toString(), "-out", dir.resolve(name + ".pem").toString());
    }

    private static void run(String... command) throws Exception {
        Process process = new ProcessBuilder(command).redirectErrorStream(true).start();
        String output = new String(process.getInputStream().readAllBytes());
        assertThat(process.waitFor(30, TimeUnit.SECONDS)).isTrue();
        assertThat(process.exitValue()).as("%s: %s", List.of(command), output).isZero();
    }

    private static boolean onPath(String program) {
        List<String> folders = new ArrayList<>(List.of(System.getenv().getOrDefault("PATH", "").split(":")));
        folders.add("/usr/sbin");
        return folders.stream().anyMatch(f -> Files.isExecutable(Path.of(f, program)));
    }

    private static boolean listening(int port) {
        try (Socket socket = new Socket(InetAddress.getLoopbackAddress(), port)) {
            return true;
        } catch (IOException e) {
            return false;
        }
    }
}
