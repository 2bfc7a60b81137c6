package org.cryowarden.daemon.demo;

import static org.cryowarden.daemon.demo.Subscriber.json;
import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.net.InetAddress;
import java.net.Socket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.UUID;
import java.util.function.BooleanSupplier;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The daemon on the example site against the simulator's quench night over TCP, publishing to the machine's
 * Mosquitto on 127.0.0.1:1883 under a topic prefix of its own. A Paho subscriber checks what a dashboard and an
 * operator would see. The night runs on a virtual clock, stepped by the test.
 */
class QuenchNightOnMosquittoTest {

    static final String MOSQUITTO = "tcp://127.0.0.1:1883";

    @TempDir
    Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        if (!listening(1883)) {
            new ProcessBuilder("mosquitto", "-d", "-c", "/etc/mosquitto/mosquitto.conf").inheritIO().start().waitFor();
            long deadline = System.nanoTime() + Duration.ofSeconds(10).toNanos();
            while (!listening(1883) && System.nanoTime() < deadline) {
                Thread.sleep(50);
            }
        }
        assertThat(listening(1883)).as("Mosquitto on 127.0.0.1:1883").isTrue();
    }

    @Test
    void quenchNightPublishesRetainedStateEventsInOrderAndAnswersCommands() throws Exception {
        String prefix = "cryowarden-test/" + UUID.randomUUID();
        Path examples = Files.createDirectories(folder.resolve("config-examples"));
        for (String name : List.of(DemoFiles.SITE, DemoFiles.RULES, "harbour-hall-quench-scenario.yaml")) {
            Files.copy(Path.of("..", "config-examples", name), examples.resolve(name));
        }
        Scenario scenario = DemoNight.unpaced(ScenarioReader.read(examples.resolve("harbour-hall-quench-scenario.yaml")));
        VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.empty());
        Path site = examples.resolve(DemoFiles.SITE);
        List<Path> rules = List.of(examples.resolve(DemoFiles.RULES));
        try (Subscriber dashboard = new Subscriber(MOSQUITTO, prefix + "/#");
             Simulator simulator = Simulator.create(scenario, clock, false)) {
            List<Endpoint> endpoints = simulator.startEmulators(new EmulatorOptions(InetAddress.getLoopbackAddress(),
                    Optional.empty(), Optional.empty()));
            Configuration configuration = DemoNight.pointAt(SiteSetup.load(site, rules, catalog, clock), endpoints);
            DaemonSettings settings = DaemonSettings.read(configuration.site(), examples)
                    .withBroker(Optional.of(MOSQUITTO), 1883).withPrefix(prefix, "test-" + UUID.randomUUID())
                    .withJournal(folder.resolve("journal.db")).withApi(Optional.empty(), Optional.empty());
            try (Daemon daemon = Daemon.start(site, rules, configuration, settings, catalog, clock,
                    Daemon.Options.defaults().driven())) {
                stepUntil(simulator, daemon, daemon::mqttConnected, 100);
                // 22 simulated minutes: the quench at 00:20 takes the magnet hall's oxygen down.
                for (int i = 0; i < 22 * 60; i++) {
                    simulator.step();
                    daemon.step();
                    daemon.awaitQuiet(Duration.ofSeconds(5));
                }
                String replies = prefix + "/replies/console-1";
                dashboard.request(prefix + "/command/ack", "{\"target\": \"o2-magnet-hall-lwo\", \"operator\": \""
                        + DemoNight.OPERATOR + "\"}", replies, "c1");
                dashboard.request(prefix + "/command/ack", "{\"target\": \"o2-magnet-hall-low\"", replies, "c2");
                dashboard.request(prefix + "/command/ack", "{\"target\": \"o2-magnet-hall-low\"}", replies, "c3");
                dashboard.request(prefix + "/command/ack", "{\"target\": \"o2-magnet-hall-low\", \"operator\": \""
                        + DemoNight.OPERATOR + "\", \"note\": \"fan running, room closed\"}", replies, "c4");
                stepUntil(simulator, daemon, () -> dashboard.on(replies).size() >= 4, 2000);

                // Replies come back matched by correlation data (those the engine decides come later).
                java.util.Map<String, JsonNode> answers = new java.util.TreeMap<>();
                for (Subscriber.Message reply : dashboard.on(replies)) {
                    answers.put(new String(reply.correlation()), json(reply));
                }
                assertThat(answers).containsOnlyKeys("c1", "c2", "c3", "c4");
                assertThat(answers.get("c1").path("ok").asBoolean()).isFalse();
                assertThat(answers.get("c1").path("error").asText())
                        .isEqualTo("there is no alarm 'o2-magnet-hall-lwo': did you mean 'o2-magnet-hall-low'?");
                assertThat(answers.get("c2").path("error").asText()).startsWith("command body is not valid JSON");
                assertThat(answers.get("c3").path("error").asText()).isEqualTo("missing operator: say who is acting");
                assertThat(answers.get("c4").toString()).isEqualTo("{\"ok\":true}");
                // The retained alarm document goes out on commit; the event follows the refusals' events through
                // the outbox: wait for both.
                stepUntil(simulator, daemon, () -> dashboard.on(prefix + "/alarm/o2-magnet-hall-low").stream()
                        .anyMatch(m -> m.text().contains("\"acknowledged_by\":\"" + DemoNight.OPERATOR + "\""))
                        && dashboard.on(prefix + "/event").stream()
                        .anyMatch(m -> m.text().contains("\"kind\":\"alarm.acknowledged\"")), 2000);

                // Every event, in order, without a gap, each once.
                List<Long> seqs = new ArrayList<>();
                List<String> kinds = new ArrayList<>();
                for (Subscriber.Message event : dashboard.on(prefix + "/event")) {
                    seqs.add(json(event).path("seq").asLong());
                    kinds.add(json(event).path("kind").asText() + " " + json(event).path("subject").asText());
                }
                assertThat(seqs).isNotEmpty();
                for (int i = 0; i < seqs.size(); i++) {
                    assertThat(seqs.get(i)).isEqualTo(seqs.get(0) + i);
                }
                assertThat(kinds).contains("daemon.started null", "alarm.raised o2-magnet-hall-low",
                        "interlock.tripped magnet-hall-ventilation", "alarm.acknowledged o2-magnet-hall-low");
                assertThat(kinds.indexOf("alarm.raised o2-magnet-hall-low"))
                        .isLessThan(kinds.indexOf("interlock.tripped magnet-hall-ventilation"));
            }
        }
        // A dashboard connecting afterwards gets the retained state; the clean stop left "offline, shutdown".
        try (Subscriber late = new Subscriber(MOSQUITTO, prefix + "/#")) {
            JsonNode reading = json(late.last(prefix + "/reading/o2-magnet-hall-east", Duration.ofSeconds(5)));
            assertThat(reading.path("unit").asText()).isEqualTo("%vol");
            assertThat(reading.path("quality").asText()).isEqualTo("good");
            assertThat(reading.path("value").asDouble()).isBetween(10.0, 21.5);
            JsonNode alarm = json(late.last(prefix + "/alarm/o2-magnet-hall-low", Duration.ofSeconds(5)));
            assertThat(alarm.path("priority").asText()).isEqualTo("critical");
            assertThat(alarm.path("acknowledged_by").asText()).isEqualTo(DemoNight.OPERATOR);
            assertThat(alarm.path("note").asText()).isEqualTo("fan running, room closed");
            JsonNode summary = json(late.last(prefix + "/summary", Duration.ofSeconds(5)));
            assertThat(summary.path("active").has("critical")).isTrue();
            assertThat(summary.has("highest_active_priority")).isTrue();
            JsonNode status = json(late.last(prefix + "/status", Duration.ofSeconds(5)));
            assertThat(status.path("state").asText()).isEqualTo("offline");
            assertThat(status.path("reason").asText()).isEqualTo("shutdown");
            assertThat(late.received).allMatch(Subscriber.Message::retained);
        }
    }

    private static void stepUntil(Simulator simulator, Daemon daemon, BooleanSupplier done, int maxSteps)
            throws InterruptedException {
        for (int i = 0; i < maxSteps && !done.getAsBoolean(); i++) {
            simulator.step();
            daemon.step();
            daemon.awaitQuiet(Duration.ofSeconds(5));
            Thread.sleep(5); // real time for the broker round trip; the simulated clock moves only by steps
        }
        assertThat(done.getAsBoolean()).as("condition within " + maxSteps + " steps").isTrue();
    }

    private static boolean listening(int port) {
        try (Socket socket = new Socket(InetAddress.getLoopbackAddress(), port)) {
            return true;
        } catch (java.io.IOException e) {
            return false;
        }
    }
}
