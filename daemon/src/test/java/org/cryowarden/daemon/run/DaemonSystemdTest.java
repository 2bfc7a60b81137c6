package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.net.ServerSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.CopyOnWriteArrayList;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.Configuration;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The daemon's systemd notifications through an injected notifier, on a virtual clock in driven mode. */
class DaemonSystemdTest {

    @TempDir
    Path folder;

    @Test
    void readyThenWatchdogPingsWhileHealthyThenStopping() throws Exception {
        int closedPort;
        try (ServerSocket socket = new ServerSocket(0)) {
            closedPort = socket.getLocalPort(); // nothing listens once closed: the bus stays down, polling goes on
        }
        Path site = folder.resolve("bench-site.yaml");
        Files.writeString(site, """
                site: {name: Systemd bench}
                buses:
                  - id: bench-bus
                    transport: {kind: tcp, host: 127.0.0.1, port: %d, connect_timeout: 200ms}
                    instruments:
                      - id: aim-1
                        driver: modbus-rtu
                        settings: {unit: 3, timeout: 200ms}
                        channels:
                          - id: o2-bench
                            unit: "%%vol"
                            period: 1s
                            point: {table: input, address: 0, type: uint16, scale: 0.001}
                watchdog: {heartbeat: 10s}
                api: {enabled: false}
                """.formatted(closedPort));
        Path rules = folder.resolve("bench-rules.yaml");
        Files.writeString(rules, "rules: []\n");
        VirtualTimeSource clock = new VirtualTimeSource(Instant.parse("2025-11-14T22:00:00Z"));
        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.empty());
        Configuration configuration = SiteSetup.load(site, List.of(rules), catalog, clock);
        // Mosquitto on 127.0.0.1:1883 (started by .ci/run), under a prefix of this test's own.
        String id = java.util.UUID.randomUUID().toString();
        DaemonSettings settings = DaemonSettings.read(configuration.site(), folder)
                .withBroker(Optional.of("tcp://127.0.0.1:1883"), 1883)
                .withPrefix("cryowarden-test/" + id, "test-" + id);
        NightSettings night = NightSettings.read(configuration, folder);
        List<String> sent = new CopyOnWriteArrayList<>();
        Daemon daemon = Daemon.start(site, List.of(rules), configuration, settings, night, sent::add, catalog, clock,
                Daemon.Options.defaults().driven());
        try {
            for (int i = 0; i < 30; i++) {
                clock.advance(Duration.ofSeconds(1));
                daemon.step();
                daemon.awaitQuiet(Duration.ofSeconds(5));
            }
        } finally {
            daemon.close();
        }
        // 30 s of health with the ping every heartbeat (no WATCHDOG_USEC given): at 1 s, 11 s and 21 s.
        assertThat(sent).containsExactly("READY=1", "WATCHDOG=1", "WATCHDOG=1", "WATCHDOG=1", "STOPPING=1");
    }
}
