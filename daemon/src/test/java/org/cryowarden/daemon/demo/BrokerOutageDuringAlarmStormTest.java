package org.cryowarden.daemon.demo;

import static org.cryowarden.daemon.LoopbackPort.freePort;
import static org.cryowarden.daemon.demo.Subscriber.json;
import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.OptionalInt;
import java.util.concurrent.TimeUnit;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.mqtt.TcpRelay;
import org.cryowarden.simulator.emulators.Fault;
import org.cryowarden.simulator.emulators.FaultKind;
import org.cryowarden.simulator.emulators.Instrument;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A Mosquitto of the test's own is down for 5 simulated minutes (1 in CI) while the magnet hall's oxygen module falls
 * silent and answers again by turns, so that its stale alarms are raised and cleared over and over (an alarm
 * storm). Afterwards the dashboard, which listened before and after the outage, has every journaled event once,
 * in sequence order, without a gap, each the same as in the journal.
 */
class BrokerOutageDuringAlarmStormTest {

    /** Each round: long enough silent for the 10 s stale timeout of the oxygen channels, then long enough heard. */
    private static final int SILENT_STEPS = 12;
    private static final int HEARD_STEPS = 8;
    /**
     * 5 simulated minutes with {@code -Dcryowarden.long=true}; 1 in CI (each silent step costs the module's real
     * 300 ms reply timeout).
     */
    private static final Duration OUTAGE = Boolean.getBoolean("cryowarden.long") ? Duration.ofMinutes(5)
            : Duration.ofMinutes(1);

    @TempDir
    Path folder;

    @Test
    void alarmStormDuringABrokerOutageLosesNoEventAndKeepsTheSequence() throws Exception {
        int port = freePort();
        String uri = "tcp://127.0.0.1:" + port;
        Process broker = Night.ownMosquitto(port);
        List<JsonNode> seen = new ArrayList<>();
        try (TcpRelay relay = new TcpRelay(port);
             Night night = Night.start(folder, relay.uri(), false)) {
            String events = night.prefix + "/event";
            Instrument aim = night.simulator.instrument("aim-1").orElseThrow();
            long lastBefore;
            try (Subscriber before = new Subscriber(uri, night.prefix + "/#")) {
                night.stepUntil(night.daemon::acceptingCommands, 100);
                night.steps(20);
                lastBefore = night.daemon.eventsAfter(0, 100_000).size();
                long deadline = System.nanoTime() + Duration.ofSeconds(10).toNanos();
                while (before.on(events).size() < lastBefore && System.nanoTime() < deadline) {
                    Thread.sleep(10);
                }
                assertThat(before.on(events)).hasSize((int) lastBefore);
                relay.accepting(false);
                broker.destroy();
                assertThat(broker.waitFor(10, TimeUnit.SECONDS)).as("broker stopped").isTrue();
                relay.breakConnections();
                before.on(events).forEach(m -> seen.add(json(m)));
            }
            night.stepUntil(() -> !night.daemon.mqttConnected(), 100);

            Duration start = night.simulator.elapsed();
            int rounds = 0;
            while (night.simulator.elapsed().minus(start).compareTo(OUTAGE) < 0) {
                aim.startFault(new Fault(FaultKind.SILENCE, 0, Duration.ZERO, OptionalInt.empty(),
                        night.simulator.elapsed().toSeconds()));
                night.steps(SILENT_STEPS);
                aim.clearFault(Optional.of(FaultKind.SILENCE));
                night.steps(HEARD_STEPS);
                rounds++;
            }
            assertThat(night.daemon.mqttConnected()).isFalse();
            List<JournalEvent> duringOutage = night.daemon.eventsAfter(lastBefore, 100_000);
            long raised = duringOutage.stream().filter(e -> e.kind().equals("alarm.raised")).count();
            long cleared = duringOutage.stream().filter(e -> e.kind().equals("alarm.cleared")
                    || e.kind().equals("alarm.changed")).count();
            // Three oxygen channels on the silent module, one stale alarm each, every round.
            assertThat(raised).as("alarms raised while the broker was down").isGreaterThanOrEqualTo(3L * rounds);

            broker = Night.ownMosquitto(port);
            long journaled = night.daemon.eventsAfter(0, 100_000).size();
            try (Subscriber after = new Subscriber(uri, night.prefix + "/#")) {
                relay.accepting(true);
                night.stepUntil(night.daemon::mqttConnected, 3000);
                night.stepUntil(() -> after.on(events).stream().anyMatch(m -> json(m).path("seq").asLong()
                        >= journaled), 600);
                after.on(events).forEach(m -> seen.add(json(m)));
            }
            List<JournalEvent> journal = night.daemon.eventsAfter(0, 100_000);
            for (int i = 0; i < seen.size(); i++) {
                JsonNode event = seen.get(i);
                assertThat(event.path("seq").asLong()).as("event %d", i).isEqualTo(i + 1L);
                JournalEvent recorded = journal.get(i);
                assertThat(event.path("kind").asText() + " " + event.path("subject").asText(""))
                        .isEqualTo(recorded.kind() + " " + recorded.subject().orElse(""));
            }
            long lost = journaled - seen.stream().filter(e -> e.path("seq").asLong() <= journaled).count();
            assertThat(lost).isZero();
            System.out.printf("broker outage of %s during an alarm storm: %d rounds, %d alarms raised and %d"
                    + " cleared while down; events checked %d, lost %d%n", OUTAGE, rounds, raised, cleared,
                    seen.size(), lost);
        } finally {
            broker.destroy();
            broker.waitFor(10, TimeUnit.SECONDS);
        }
    }

    // ---- helpers ----
}
