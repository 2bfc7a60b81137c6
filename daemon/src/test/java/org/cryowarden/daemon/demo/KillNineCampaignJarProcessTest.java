package org.cryowarden.daemon.demo;

import static org.cryowarden.daemon.demo.DashboardView.alarms;
import static org.cryowarden.daemon.demo.DashboardView.await;
import static org.cryowarden.daemon.demo.DashboardView.events;
import static org.cryowarden.daemon.demo.DashboardView.state;
import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.time.Duration;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
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
 * A {@code kill -9} campaign against the built jar's {@code run} on the simulator's quench night (physics paced,
 * the daemon in real time, the machine's Mosquitto): the process is killed at random points of the night while
 * operators acknowledge alarms and the ventilation interlock trips, and restarted on the same journal each time.
 * After every kill the journal is consistent (sequence 1..n without a gap, nothing recorded before is gone,
 * every acknowledgement the operator was told was done is there) and the latched trip is still latched; after
 * every restart the retained alarm documents of the latched alarms match the journal, acknowledged or not.
 *
 * <p>3 kill points in CI; 50 with {@code -Dcryowarden.long=true}; {@code -Dcryowarden.killPoints=N} and
 * {@code -Dcryowarden.killSeed=S} choose them (the seed is printed, so a failing campaign can be run again).
 */
class KillNineCampaignJarProcessTest {

    private static final boolean LONG = Boolean.getBoolean("cryowarden.long");
    private static final int POINTS = Integer.getInteger("cryowarden.killPoints", LONG ? 50 : 3);
    private static final long SEED = Long.getLong("cryowarden.killSeed", System.nanoTime());
    /** The night's 2 h at 120x last one minute: enough for 3 points; 50 points need about 6 minutes (20x). */
    private static final int PACE = LONG || POINTS > 5 ? 20 : 120;
    private static final String TRIP = "interlock:magnet-hall-ventilation";
    /** Latching alarms (config-examples/harbour-hall-rules.yaml): only an operator changes them once raised. */
    private static final List<String> LATCHED = List.of("o2-magnet-hall-low", "o2-magnet-hall-evacuate");

    @TempDir
    Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @Test
    void daemonKilledAtRandomPointsOfANightLosesNoRecordedEventAcknowledgementOrTrip() throws Exception {
        System.out.printf("kill -9 campaign: seed %d, %d points, physics at %dx%n", SEED, POINTS, PACE);
        Random random = new Random(SEED);
        String prefix = "cryowarden-test/" + UUID.randomUUID();
        Path journalFile = folder.resolve("night.db");
        Scenario scenario = DemoNight.unpaced(ScenarioReader.read(Path.of("..", "config-examples",
                "harbour-hall-quench-scenario.yaml")));
        List<JournalEvent> recorded = List.of();
        Map<String, String> toldDone = new LinkedHashMap<>();
        int kills = 0;
        int restarts = 0;
        long eventsChecked = 0;
        long eventsLost = 0;
        try (Simulator simulator = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), false);
             Subscriber dashboard = new Subscriber(Night.MOSQUITTO, prefix + "/#")) {
            List<Endpoint> endpoints = simulator.startEmulators(EmulatorOptions.loopbackAnyPort());
            Path site = JarProcess.site(folder, endpoints, Night.MOSQUITTO, prefix, "campaign-" + UUID.randomUUID());
            String[] run = {"run", "--site", site.toString(), "--rules", folder.resolve(DemoFiles.RULES).toString(),
                "--journal", journalFile.toString()};
            SimulationRun physics = simulator.start(new Pace(PACE), Duration.ofHours(2));
            for (int point = 0; point <= POINTS; point++) {
                dashboard.received.clear();
                try (JarProcess daemon = JarProcess.start(folder.resolve("run-" + point + ".log"), run)) {
                    await(() -> state(dashboard, prefix, "status").path("state").asText().equals("online"), 60,
                            daemon);
                    if (point > 0) {
                        restarts++;
                        Map<String, AlarmStateRecord> states = alarmStates(journalFile, daemon);
                        for (String alarm : LATCHED) {
                            AlarmStateRecord state = states.get(alarm);
                            if (state == null || Payloads.JSON.readTree(state.stateJson()).path("state").asText()
                                    .equals("normal")) {
                                continue;
                            }
                            JsonNode journaled = Payloads.JSON.readTree(state.stateJson());
                            await(() -> alarms(dashboard, prefix).containsKey(alarm), 30, daemon);
                            JsonNode retained = alarms(dashboard, prefix).get(alarm);
                            assertThat(retained.path("state").asText()).as(alarm + " after restart " + point)
                                    .isEqualTo(journaled.path("state").asText());
                            assertThat(retained.path("acknowledged_by").asText()).as(alarm)
                                    .isEqualTo(journaled.path("acknowledged_by").asText());
                        }
                    }
                    if (point == POINTS) {
                        // The last run: let the night reach its trip (if no kill came after it yet), stop cleanly.
                        await(() -> events(dashboard, prefix).contains("interlock.tripped magnet-hall-ventilation")
                                || tripped(journalFile), 120, daemon);
                        daemon.process.destroy();
                        assertThat(daemon.awaitExit(Duration.ofSeconds(30))).as(daemon.output()).isTrue();
                        break;
                    }
                    if (point >= POINTS / 2) {
                        // The second half of the campaign falls after the trip, with latched alarms to acknowledge.
                        await(() -> tripped(journalFile), 120, daemon);
                        // The restarted daemon republishes its alarms (those still unacknowledged among them).
                        await(() -> alarms(dashboard, prefix).keySet().containsAll(LATCHED), 30, daemon);
                    }
                    String ackTarget = alarms(dashboard, prefix).entrySet().stream()
                            .filter(a -> a.getValue().path("state").asText().endsWith("-unacknowledged"))
                            .map(Map.Entry::getKey).findFirst().orElse(null);
                    // One operator of the example site acks throughout; the note tells the acknowledgements apart.
                    String note = "ack-" + point;
                    if (ackTarget != null && (point >= POINTS / 2 || random.nextBoolean())) {
                        dashboard.request(prefix + "/command/ack", "{\"target\": \"" + ackTarget + "\","
                                + " \"operator\": \"" + DemoNight.OPERATOR + "\", \"note\": \"" + note + "\"}",
                                prefix + "/replies/campaign", note);
                    }
                    long killAt = System.nanoTime() + Duration.ofMillis(200 + random.nextInt(4000)).toNanos();
                    await(() -> System.nanoTime() > killAt, 10, daemon);
                    daemon.process.destroyForcibly();
                    assertThat(daemon.awaitExit(Duration.ofSeconds(10))).isTrue();
                    kills++;
                    for (Subscriber.Message reply : dashboard.on(prefix + "/replies/campaign")) {
                        if (new String(reply.correlation()).equals("ack-" + point)
                                && reply.text().equals("{\"ok\":true}")) {
                            toldDone.put(note, ackTarget);
                        }
                    }
                }
                await(() -> state(dashboard, prefix, "status").path("reason").asText().equals("connection lost"),
                        30, null);
                List<JournalEvent> now;
                try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
                    now = journal.eventsAfter(0, 1_000_000);
                    boolean trippedBefore = recorded.stream().anyMatch(e -> e.kind().equals("interlock.tripped"));
                    if (trippedBefore || now.stream().anyMatch(e -> e.kind().equals("interlock.tripped"))) {
                        assertThat(journal.alarmStates().get(TRIP).stateJson()).as("after kill " + kills)
                                .contains("\"tripped\":true");
                    }
                }
                for (int i = 0; i < now.size(); i++) {
                    assertThat(now.get(i).seq()).as("seq of event %d after kill %d", i, kills).isEqualTo(i + 1L);
                }
                // Nothing recorded before this run is gone, or changed.
                List<JournalEvent> kept = now.subList(0, Math.min(now.size(), recorded.size()));
                eventsLost += recorded.size() - kept.size();
                assertThat(kept).as("events recorded before kill " + kills).isEqualTo(recorded);
                for (Map.Entry<String, String> done : toldDone.entrySet()) {
                    assertThat(now).as("acknowledgement %s, answered ok", done.getKey())
                            .anyMatch(e -> e.kind().equals("alarm.acknowledged")
                                    && e.operator().orElse("").equals(DemoNight.OPERATOR)
                                    && e.payloadJson().contains("\"note\":\"" + done.getKey() + "\"")
                                    && e.subject().orElse("").equals(done.getValue()));
                }
                eventsChecked += now.size();
                recorded = now;
            }
            physics.stop();
            assertThat(physics.await(Duration.ofSeconds(10))).isTrue();
        }
        try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
            List<JournalEvent> all = journal.eventsAfter(0, 1_000_000);
            for (int i = 0; i < all.size(); i++) {
                assertThat(all.get(i).seq()).isEqualTo(i + 1L);
            }
            assertThat(all.subList(0, recorded.size())).isEqualTo(recorded);
            // The trip happened once and stayed latched through every restart: it was never tripped again.
            assertThat(all).filteredOn(e -> e.kind().equals("interlock.tripped")).hasSize(1);
            assertThat(journal.alarmStates().get(TRIP).stateJson()).contains("\"tripped\":true");
            eventsChecked += all.size();
        }
        System.out.printf("kill -9 campaign (seed %d): faults injected %d, restarts %d, acknowledgements answered"
                + " ok %d (all journaled), events checked %d, events lost %d%n", SEED, kills, restarts,
                toldDone.size(), eventsChecked, eventsLost);
        assertThat(eventsLost).isZero();
    }

    // ---- helpers ----

    private static boolean tripped(Path journalFile) {
        try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
            AlarmStateRecord trip = journal.alarmStates().get(TRIP);
            return trip != null && trip.stateJson().contains("\"tripped\":true");
        } catch (Exception e) {
            return false;
        }
    }

    private static Map<String, AlarmStateRecord> alarmStates(Path journalFile, JarProcess daemon) throws Exception {
        try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
            return journal.alarmStates();
        } catch (Exception e) {
            throw new AssertionError("journal unreadable beside the running daemon; output:\n" + daemon.output(), e);
        }
    }
}
