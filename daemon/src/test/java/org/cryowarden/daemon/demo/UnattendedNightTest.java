package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.icegreen.greenmail.junit5.GreenMailExtension;
import com.icegreen.greenmail.util.ServerSetupTest;
import jakarta.mail.internet.MimeMessage;
import java.net.InetAddress;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.function.BooleanSupplier;
import org.cryowarden.daemon.access.OperatorRoster;
import org.cryowarden.daemon.access.Role;
import org.cryowarden.daemon.notify.WebhookReceiver;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.NightSettings;
import org.cryowarden.daemon.run.OperatorCommand;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.emulators.RelayModule;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;

/**
 * The example site's quench night, brought forward to the first simulated minutes, through the running daemon
 * (driven, one virtual clock with the simulator): the critical oxygen alarm pages the on-call contact by webhook
 * and e-mail, the second contact after the escalation wait, the acknowledgement tells the first who took it, and
 * the building common-alarm coil of the emulated relay module follows the night.
 */
class UnattendedNightTest {

    @RegisterExtension
    static GreenMailExtension smtp = new GreenMailExtension(ServerSetupTest.SMTP);

    private static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    Path folder;

    /** The second contact acknowledges: an operator of the site whose id is the roster contact's. */
    private static final String PAGED_OPERATOR = "tomas";

    private static final String ROSTER = """
            time_zone: UTC
            contacts:
              - id: ines
                name: Ines Okafor
                reach:
                  - {sender: pager-hook}
                  - {sender: lab-mail, to: ines.okafor@harbour-hall.example}
              - id: tomas
                name: Tomas Reyes
                reach:
                  - {sender: pager-hook}
                  - {sender: lab-mail, to: tomas.reyes@harbour-hall.example}
            schedule:
              shifts:
                - {days: [mon, tue, wed, thu, fri, sat, sun], from: "18:00", to: "08:00", on_call: [ines]}
              otherwise: [tomas]
            escalation:
              critical:
                steps:
                  - notify: [on-call]
                  - {after: 1min, notify: [tomas]}
            pacing: 0s
            """;

    @Test
    void criticalAlarmPagesOnCallThenSecondContactAndTheRelayContactDropsAtTheAlarm() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                Plant plant = Plant.start(folder, "harbour-hall-quench-scenario.yaml", Optional.of(receiver.url()))) {
            Stepper stepper = plant.stepper;
            Daemon daemon = plant.daemon;
            stepper.until(() -> !calls(receiver, "ines", "alarm").isEmpty(), 400);
            Instant paged = plant.clock.wallNow();
            JsonNode first = calls(receiver, "ines", "alarm").get(0);
            assertThat(first.path("id").asText()).endsWith(".s1.ines");
            assertThat(first.path("priority").asText()).isEqualTo("critical");
            assertThat(calls(receiver, "tomas", "alarm")).isEmpty();
            // Fail-safe contact: off before the daemon ran, energised once the first summary was clear, dropped
            // at the critical alarm (its write goes out in the step after the alarm was recorded).
            assertThat(stepper.coil).containsExactly("off", "on", "off");
            Instant firstHigh = plant.daemon.eventsAfter(0, 100_000).stream()
                    .filter(e -> e.kind().equals("alarm.raised") && (e.payloadJson().contains("\"priority\":\"high\"")
                            || e.payloadJson().contains("\"priority\":\"critical\"")))
                    .map(e -> e.at()).findFirst().orElseThrow();
            // The site's common_alarm priority is high: the first high (or critical) alarm drops it.
            assertThat(Duration.between(firstHigh, stepper.droppedAt)).isBetween(Duration.ZERO,
                    Duration.ofSeconds(2));
            assertThat(stepper.droppedAt).isBeforeOrEqualTo(paged);
            // The quench raises two critical alarms 4 s apart, whose pages may cross; follow the first one paged.
            String alarm = first.path("alarm").asText();
            stepper.until(() -> !calls(receiver, "tomas", "alarm", alarm).isEmpty(), 100);
            // The roster's second step waits 1 min after the first; the driven steps are 1 s.
            // Measured between the notices' own times, so that a delivery retried under load does not move it.
            assertThat(Duration.between(noticeTime(first), noticeTime(calls(receiver, "tomas", "alarm", alarm).get(0))))
                    .isBetween(Duration.ofSeconds(58), Duration.ofSeconds(65));
            var ack = daemon.command(new OperatorCommand("ack", alarm, PAGED_OPERATOR, "on my way",
                    Optional.empty(), "")); // driven: the engine takes it at the next step
            stepper.until(ack::isDone, 5);
            assertThat(ack.get()).isEmpty();
            stepper.until(() -> !calls(receiver, "ines", "taken").isEmpty(), 30);
            assertThat(calls(receiver, "ines", "taken").get(0).path("operator").asText()).isEqualTo(PAGED_OPERATOR);
            stepper.steps(10); // acknowledged: nothing further for this alarm
            assertThat(receiver.calls().stream().map(c -> json(c.text()))
                    .filter(j -> j.path("alarm").asText().equals(alarm)).map(j -> j.path("id").asText()
                            .replaceFirst("^a\\d+", "a")).toList())
                    .containsExactly("a.s1.ines", "a.s2.tomas", "a.taken.ines");
            // The same notices by e-mail, one per contact and notice, each with its notice id.
            long deadline = System.nanoTime() + Duration.ofSeconds(10).toNanos();
            while (smtp.getReceivedMessages().length < 3 && System.nanoTime() < deadline) {
                Thread.sleep(10);
            }
            List<String> mails = new ArrayList<>();
            for (MimeMessage mail : smtp.getReceivedMessages()) {
                mails.add(mail.getAllRecipients()[0] + " " + mail.getHeader("X-Cryowarden-Notice")[0]);
            }
            assertThat(mails).anyMatch(m -> m.startsWith("ines.okafor@") && m.endsWith(".s1.ines"));
            assertThat(mails).anyMatch(m -> m.startsWith("tomas.reyes@") && m.endsWith(".s2.tomas"));
            assertThat(mails).anyMatch(m -> m.startsWith("ines.okafor@") && m.endsWith(".taken.ines"));
            assertThat(plant.journalKinds()).contains("notify.queued", "notify.sent");
        }
    }

    @Test
    void escalationUnderWayCarriesOnThroughADaemonRestart() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                Plant plant = Plant.start(folder, "harbour-hall-quench-scenario.yaml", Optional.of(receiver.url()))) {
            plant.stepper.until(() -> !calls(receiver, "ines", "alarm").isEmpty(), 400);
            Instant paged = noticeTime(calls(receiver, "ines", "alarm").get(0));
            String alarm = calls(receiver, "ines", "alarm").get(0).path("alarm").asText();
            plant.stepper.steps(20);
            plant.restartDaemon(); // 20 s into the roster's 1 min wait, the alarm still unacknowledged
            plant.stepper.until(() -> !calls(receiver, "tomas", "alarm", alarm).isEmpty(), 100);

            // The roster's second step waits 1 min after the first; the restart does not start it again.
            assertThat(Duration.between(paged, noticeTime(calls(receiver, "tomas", "alarm", alarm).get(0))))
                    .isBetween(Duration.ofSeconds(58), Duration.ofSeconds(65));
            assertThat(receiver.calls().stream().map(c -> json(c.text()))
                    .filter(j -> j.path("alarm").asText().equals(alarm)).map(j -> j.path("id").asText()
                            .replaceFirst("^a\\d+", "a")).toList())
                    .containsExactly("a.s1.ines", "a.s2.tomas");
        }
    }

    @Test
    void reloadTakesTheEditedRosterForTheEscalationUnderWayAndSaysWhatNeedsARestart() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                Plant plant = Plant.start(folder, "harbour-hall-quench-scenario.yaml", Optional.of(receiver.url()))) {
            plant.stepper.until(() -> !calls(receiver, "ines", "alarm").isEmpty(), 400);
            Instant paged = noticeTime(calls(receiver, "ines", "alarm").get(0));
            String alarm = calls(receiver, "ines", "alarm").get(0).path("alarm").asText();
            plant.stepper.steps(10);
            Path roster = plant.examples().resolve("night-roster.yaml");
            // A broken roster (a step naming nobody known) is refused and the running one stays.
            Files.writeString(roster, ROSTER.replace("notify: [tomas]", "notify: [tomass]"));
            assertThat(plant.reload()).anyMatch(p -> p.contains("tomass"));
            assertThat(plant.journalKinds()).contains("config.rejected");
            // The second step now goes to Noor instead of Tomas; the heartbeat change needs a restart.
            Files.writeString(roster, ROSTER.replace("  - id: tomas\n", "  - id: noor\n    name: Noor Haddad\n"
                    + "    reach:\n      - {sender: pager-hook}\n  - id: tomas\n").replace("notify: [tomas]", "notify: [noor]"));
            Path site = plant.examples().resolve(DemoFiles.SITE);
            Files.writeString(site, Files.readString(site).replace("watchdog: {heartbeat: 10s,", "watchdog: {heartbeat: 20s,"));
            assertThat(plant.reload()).isEmpty();
            plant.stepper.until(() -> !calls(receiver, "noor", "alarm", alarm).isEmpty(), 100);

            assertThat(Duration.between(paged, noticeTime(calls(receiver, "noor", "alarm", alarm).get(0))))
                    .isBetween(Duration.ofSeconds(58), Duration.ofSeconds(65));
            assertThat(receiver.calls().stream().map(c -> json(c.text()))
                    .filter(j -> j.path("alarm").asText().equals(alarm)).map(j -> j.path("id").asText()
                            .replaceFirst("^a\\d+", "a")).toList()).containsExactly("a.s1.ines", "a.s2.noor");
            JsonNode reloaded = JSON.readTree(plant.daemon.eventsAfter(0, 100_000).stream()
                    .filter(e -> e.kind().equals("config.reloaded")).findFirst().orElseThrow().payloadJson());
            assertThat(reloaded.path("restart_needed").toString()).isEqualTo("[\"watchdog\"]");
        }
    }

    @Test
    void relayContactIsEnergisedWhileAllIsWellAndDropsWhenTheDaemonStops() throws Exception {
        try (Plant plant = Plant.start(folder, "harbour-hall-quiet-scenario.yaml", Optional.empty())) {
            plant.stepper.steps(20);
            assertThat(plant.stepper.coil).containsExactly("off", "on");
            plant.daemon.close();
            plant.stepper.sample();
            assertThat(plant.stepper.coil).containsExactly("off", "on", "off");
        }
    }

    /** The example site on the simulator, driven on one virtual clock, with notifiers when a webhook is given. */
    private static final class Plant implements AutoCloseable {
        final VirtualTimeSource clock;
        final Simulator simulator;
        final Stepper stepper;
        private final Restart restart;
        Daemon daemon;

        /** What starting the daemon again on the same journal needs. */
        private record Restart(Path site, List<Path> rules, Configuration configuration, DaemonSettings settings,
                               NightSettings night, DriverCatalog catalog) {
        }

        private Plant(VirtualTimeSource clock, Simulator simulator, Daemon daemon, Stepper stepper, Restart restart) {
            this.clock = clock;
            this.simulator = simulator;
            this.daemon = daemon;
            this.stepper = stepper;
            this.restart = restart;
        }

        /** Stops the daemon and starts a new one on the same journal, as a service restart would. */
        void restartDaemon() throws Exception {
            daemon.close();
            daemon = Daemon.start(restart.site(), restart.rules(), restart.configuration(), restart.settings(),
                    restart.night(), restart.catalog(), clock, Daemon.Options.defaults().driven());
            stepper.daemon = daemon;
        }

        static Plant start(Path folder, String scenarioName, Optional<String> webhook) throws Exception {
            Path examples = Files.createDirectories(folder.resolve("config-examples"));
            for (String name : List.of(DemoFiles.SITE, DemoFiles.RULES)) {
                Files.copy(Path.of("..", "config-examples", name), examples.resolve(name));
            }
            // The quench comes at 00:01 instead of 00:20, so the night reaches its alarm within seconds of real time.
            String scenarioText = Files.readString(Path.of("..", "config-examples", scenarioName))
                    .replace("{at: \"00:20\", do: quench", "{at: \"00:01\", do: quench");
            Files.writeString(examples.resolve("night-scenario.yaml"), scenarioText);
            if (webhook.isPresent()) {
                Files.writeString(examples.resolve("night-roster.yaml"), ROSTER);
                Files.writeString(examples.resolve("pager-hook-secret"), "harbour-hall-shared-secret\n");
                Files.writeString(examples.resolve(DemoFiles.SITE), Files.readString(examples.resolve(DemoFiles.SITE))
                        + "notifiers:\n  roster: night-roster.yaml\n  senders:\n"
                        + "    - {id: pager-hook, kind: webhook, url: \"" + webhook.get() + "\","
                        + " secret_file: pager-hook-secret, timeout: 2s}\n"
                        + "    - {id: lab-mail, kind: email, host: 127.0.0.1, port: " + smtp.getSmtp().getPort()
                        + ", security: none, from: cryowarden@harbour-hall.example, timeout: 5s}\n");
            }
            Scenario scenario = DemoNight.unpaced(ScenarioReader.read(examples.resolve("night-scenario.yaml")));
            VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
            DriverCatalog catalog = DriverCatalog.discover(UnattendedNightTest.class.getClassLoader(),
                    Optional.empty());
            Path site = examples.resolve(DemoFiles.SITE);
            List<Path> rules = List.of(examples.resolve(DemoFiles.RULES));
            Simulator simulator = Simulator.create(scenario, clock, false);
            try {
                List<Endpoint> endpoints = simulator.startEmulators(new EmulatorOptions(
                        InetAddress.getLoopbackAddress(), Optional.of(0), Optional.empty()));
                // The site file itself points at the emulators, so that a reload reads the same buses.
                Files.writeString(site, pointedAt(Files.readString(site), endpoints));
                Configuration configuration = SiteSetup.load(site, rules, catalog, clock);
                NightSettings night = NightSettings.read(configuration, examples);
                assertThat(night.notifiers().isPresent()).isEqualTo(webhook.isPresent());
                Night.mosquittoRuns();
                String id = java.util.UUID.randomUUID().toString();
                DaemonSettings settings = DaemonSettings.read(configuration.site(), examples)
                        .withBroker(Optional.of(Night.MOSQUITTO), 1883).withPrefix("cryowarden-test/" + id, "test-" + id)
                        .withJournal(folder.resolve("journal.db")).withApi(Optional.empty(), Optional.empty())
                        .withOperators(OperatorRoster.of(List.of(new OperatorRoster.Operator(PAGED_OPERATOR,
                                Role.OPERATOR, Optional.empty()))));
                RelayModule relay = (RelayModule) simulator.instrument("relay-1").orElseThrow();
                Stepper stepper = new Stepper(simulator, relay, clock);
                stepper.sample();
                Daemon daemon = Daemon.start(site, rules, configuration, settings, night, catalog, clock,
                        Daemon.Options.defaults().driven());
                stepper.daemon = daemon;
                return new Plant(clock, simulator, daemon, stepper,
                        new Restart(site, rules, configuration, settings, night, catalog));
            } catch (Exception | AssertionError e) {
                simulator.close();
                throw e;
            }
        }

        /** The site file text with each emulated bus's transport replaced by the emulator's TCP endpoint. */
        private static String pointedAt(String siteText, List<Endpoint> endpoints) {
            StringBuilder out = new StringBuilder();
            String bus = "";
            for (String line : siteText.split("\n", -1)) {
                java.util.regex.Matcher id = java.util.regex.Pattern.compile("^  - id: (\\S+)").matcher(line);
                if (id.find()) {
                    bus = id.group(1);
                }
                String current = bus;
                Optional<Endpoint> endpoint = endpoints.stream().filter(e -> e.portId().equals(current)).findFirst();
                if (line.startsWith("    transport:") && endpoint.isPresent()) {
                    line = "    transport: {kind: tcp, host: " + endpoint.get().host() + ", port: "
                            + endpoint.get().tcpPort() + ", connect_timeout: 2s}";
                }
                out.append(line).append('\n');
            }
            return out.substring(0, out.length() - 1);
        }

        /** Reloads as SIGHUP would, stepping the driven daemon until the engine took the new set. */
        List<String> reload() throws Exception {
            var done = java.util.concurrent.CompletableFuture.supplyAsync(daemon::reload);
            stepper.until(done::isDone, 10);
            return done.get();
        }

        Path examples() {
            return restart.site().getParent();
        }

        List<String> journalKinds() throws Exception {
            return daemon.eventsAfter(0, 100_000).stream().map(e -> e.kind()).toList();
        }

        @Override
        public void close() {
            try {
                daemon.close();
            } finally {
                simulator.close();
            }
        }
    }

    /** Steps simulator and daemon together and samples the relay module's common-alarm coil after each step. */
    private static final class Stepper {
        final Simulator simulator;
        final RelayModule relay;
        final VirtualTimeSource clock;
        final List<String> coil = new ArrayList<>();
        Daemon daemon;
        Instant droppedAt;

        Stepper(Simulator simulator, RelayModule relay, VirtualTimeSource clock) {
            this.simulator = simulator;
            this.relay = relay;
            this.clock = clock;
        }

        void step() throws InterruptedException {
            simulator.step();
            daemon.step();
            daemon.awaitQuiet(Duration.ofSeconds(5));
            sample();
        }

        void steps(int count) throws InterruptedException {
            for (int i = 0; i < count; i++) {
                step();
            }
        }

        void until(BooleanSupplier done, int maxSteps) throws InterruptedException {
            for (int i = 0; i < maxSteps && !done.getAsBoolean(); i++) {
                step();
            }
            assertThat(done.getAsBoolean()).as("condition within " + maxSteps + " steps").isTrue();
        }

        void sample() {
            String state = relay.coilState(2) ? "on" : "off";
            if (coil.isEmpty() || !coil.get(coil.size() - 1).equals(state)) {
                if (state.equals("off") && !coil.isEmpty()) {
                    droppedAt = clock.wallNow();
                }
                coil.add(state);
            }
        }
    }

    /** The webhook notices for {@code contact} of {@code kind}, in arrival order. */
    private static List<JsonNode> calls(WebhookReceiver receiver, String contact, String kind) {
        return receiver.calls().stream().map(c -> json(c.text()))
                .filter(j -> j.path("contact").asText().equals(contact) && j.path("kind").asText().equals(kind))
                .toList();
    }

    /** The webhook notices for {@code contact} of {@code kind} about one alarm, in arrival order. */
    private static List<JsonNode> calls(WebhookReceiver receiver, String contact, String kind, String alarm) {
        return calls(receiver, contact, kind).stream().filter(j -> j.path("alarm").asText().equals(alarm)).toList();
    }

    /** When the escalation issued a notice, on the daemon's clock (not when it reached the receiver). */
    private static Instant noticeTime(JsonNode notice) {
        return Instant.parse(notice.path("time").asText());
    }

    private static JsonNode json(String text) {
        try {
            return JSON.readTree(text);
        } catch (java.io.IOException e) {
            throw new AssertionError(e);
        }
    }
}
