package org.cryowarden.daemon.demo;

import static org.cryowarden.daemon.demo.DashboardView.alarms;
import static org.cryowarden.daemon.demo.DashboardView.await;
import static org.cryowarden.daemon.demo.DashboardView.events;
import static org.cryowarden.daemon.demo.DashboardView.state;
import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.UUID;
import org.cryowarden.daemon.journal.AlarmStateRecord;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.run.Payloads;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Pace;
import org.cryowarden.simulator.SimulationRun;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The built jar's {@code run} as a process against the simulator's quench night (physics at 120x, the daemon in
 * real time) on the machine's Mosquitto. The ventilation trips, the physics is frozen with the air still thin, an
 * operator acknowledges the evacuation alarm and the 2oo3 oxygen alarm stays unacknowledged; then the process is
 * killed with SIGKILL ({@code destroyForcibly}). The broker publishes the last will; the
 * restarted process, on the same journal, restores everything before its first poll. The reference is the
 * state recorded before the kill with the physics frozen, so that nothing may legitimately change meanwhile.
 */
class KillNineJarProcessTest {

    private static final String TRIP = "magnet-hall-ventilation";
    /** No on-delay: raised at once when the quench's helium takes the hall below 18 %vol; latching. */
    /** 2oo3 below 19.5 %vol with a 5 s on-delay; latching; left unacknowledged. */
    private static final String O2_LOW = "o2-magnet-hall-low";
    private static final String EVACUATE = "o2-magnet-hall-evacuate";

    @TempDir
    Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @Test
    void killedDaemonLeavesTheLastWillAndRestartsWithLatchedTripsAcknowledgementsAndSequence() throws Exception {
        String prefix = "cryowarden-test/" + UUID.randomUUID();
        Path journalFile = folder.resolve("night.db");
        Scenario scenario = DemoNight.unpaced(ScenarioReader.read(Path.of("..", "config-examples",
                "harbour-hall-quench-scenario.yaml")));
        try (Simulator simulator = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), false);
             Subscriber dashboard = new Subscriber(Night.MOSQUITTO, prefix + "/#")) {
            List<Endpoint> endpoints = simulator.startEmulators(EmulatorOptions.loopbackAnyPort());
            Path site = JarProcess.site(folder, endpoints, Night.MOSQUITTO, prefix, "kill-test-" + UUID.randomUUID());
            String[] run = {"run", "--site", site.toString(), "--rules", folder.resolve(DemoFiles.RULES).toString(),
                "--journal", journalFile.toString()};
            SimulationRun physics = simulator.start(new Pace(120), Duration.ofHours(2));
            Map<String, JsonNode> before;
            List<JournalEvent> eventsBefore;
            try (JarProcess first = JarProcess.start(folder.resolve("first.log"), run)) {
                await(() -> state(dashboard, prefix, "status").path("state").asText().equals("online"), 60, first);
                // The quench at 00:20 (10 s of real time at 120x) takes the hall's oxygen down; the trip follows.
                await(() -> events(dashboard, prefix).contains("interlock.tripped " + TRIP), 90, first);
                // Freeze the physics with the hall's air still thin: the 2oo3 alarm (5 s on-delay) follows and stays.
                physics.stop();
                assertThat(physics.await(Duration.ofSeconds(10))).isTrue();
                dashboard.request(prefix + "/command/ack", "{\"target\": \"" + EVACUATE + "\", \"operator\": \""
                        + DemoNight.OPERATOR + "\", \"note\": \"fan running\"}", prefix + "/replies/kill", "ack-1");
                await(() -> !dashboard.on(prefix + "/replies/kill").isEmpty(), 30, first);
                assertThat(dashboard.on(prefix + "/replies/kill").get(0).text()).isEqualTo("{\"ok\":true}");
                await(() -> events(dashboard, prefix).contains("alarm.acknowledged " + EVACUATE), 30, first);
                await(() -> state(dashboard, prefix, "alarm/" + O2_LOW).path("state").asText()
                        .equals("active-unacknowledged"), 30, first);
                // Frozen: let two poll rounds settle every alarm on the last values.
                long settle = System.nanoTime() + Duration.ofSeconds(3).toNanos();
                await(() -> System.nanoTime() > settle, 10, first);
                before = alarms(dashboard, prefix);

                first.process.destroyForcibly();
                assertThat(first.awaitExit(Duration.ofSeconds(10))).isTrue();
            }
            // The broker saw the connection drop without a DISCONNECT: the retained last will.
            await(() -> state(dashboard, prefix, "status").path("reason").asText().equals("connection lost"), 30,
                    null);
            assertThat(state(dashboard, prefix, "status").path("state").asText()).isEqualTo("offline");
            try (Subscriber late = new Subscriber(Night.MOSQUITTO, prefix + "/status")) {
                JsonNode status = Payloads.JSON.readTree(late.last(prefix + "/status", Duration.ofSeconds(5)).text());
                assertThat(status.path("state").asText()).isEqualTo("offline");
                assertThat(status.path("reason").asText()).isEqualTo("connection lost");
            }
            Map<String, AlarmStateRecord> statesBefore;
            try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
                eventsBefore = journal.eventsAfter(0, 10_000);
                statesBefore = journal.alarmStates();
            }
            assertThat(statesBefore.get("interlock:" + TRIP).stateJson()).contains("\"tripped\":true");
            assertThat(statesBefore.get(EVACUATE).stateJson()).contains("\"unacknowledged\":false");
            assertThat(eventsBefore).filteredOn(e -> e.kind().equals("alarm.acknowledged"))
                    .extracting(e -> e.subject().orElseThrow() + " by " + e.operator().orElseThrow())
                    .containsExactly(EVACUATE + " by " + DemoNight.OPERATOR);

            dashboard.received.clear();
            try (JarProcess second = JarProcess.start(folder.resolve("second.log"), run)) {
                await(() -> state(dashboard, prefix, "status").path("state").asText().equals("online"), 60, second);
                await(() -> alarms(dashboard, prefix).keySet().containsAll(before.keySet()), 60, second);
                long settle = System.nanoTime() + Duration.ofSeconds(3).toNanos();
                await(() -> System.nanoTime() > settle, 10, second);
                Map<String, JsonNode> after = alarms(dashboard, prefix);
                // Every alarm that was not normal at the kill comes back as it was. (Normal ones may change on
                // the new process's first readings: the frozen simulator no longer streams the vacuum gauge.)
                List<String> restored = before.keySet().stream()
                        .filter(a -> !before.get(a).path("state").asText().equals("normal")).toList();
                assertThat(restored).contains(EVACUATE);
                for (String alarm : restored) {
                    assertThat(view(after.get(alarm))).as(alarm).isEqualTo(view(before.get(alarm)));
                }
                assertThat(restored).contains(O2_LOW);
                assertThat(after.get(O2_LOW).path("state").asText()).isEqualTo("active-unacknowledged");
                assertThat(after.get(EVACUATE).path("acknowledged_by").asText()).isEqualTo(DemoNight.OPERATOR);
                second.process.destroy(); // SIGTERM: a clean stop
                assertThat(second.awaitExit(Duration.ofSeconds(30))).as(second.output()).isTrue();
                assertThat(second.output()).contains("restored");
            }
            try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
                List<JournalEvent> all = journal.eventsAfter(0, 10_000);
                assertThat(all.subList(0, eventsBefore.size())).isEqualTo(eventsBefore);
                for (int i = 0; i < all.size(); i++) {
                    assertThat(all.get(i).seq()).as("seq of event %d", i).isEqualTo(i + 1L);
                }
                assertThat(all.get(eventsBefore.size()).kind()).isEqualTo("daemon.started");
                // The restart trips nothing again and needs no second acknowledgement.
                assertThat(all.subList(eventsBefore.size(), all.size())).extracting(JournalEvent::kind)
                        .doesNotContain("interlock.tripped", "alarm.acknowledged");
                assertThat(journal.alarmStates().get("interlock:" + TRIP).stateJson()).contains("\"tripped\":true");
                assertThat(journal.alarmStates().get(EVACUATE).stateJson()).contains("\"unacknowledged\":false");
            }
            JsonNode status = state(dashboard, prefix, "status");
            assertThat(status.path("reason").asText()).isEqualTo("shutdown");
        }
    }

    // ---- helpers ----

    /** What must survive the restart: the lifecycle state, who acknowledged, and the shelving. */
    private static String view(JsonNode alarm) {
        return alarm.path("state").asText() + " by " + alarm.path("acknowledged_by").asText() + " shelved "
                + alarm.path("shelved_until").asText();
    }
}
