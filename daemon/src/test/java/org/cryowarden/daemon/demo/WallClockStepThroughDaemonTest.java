package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.OptionalInt;
import java.util.concurrent.TimeUnit;
import java.util.function.BooleanSupplier;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.run.OperatorCommand;
import org.cryowarden.simulator.emulators.Fault;
import org.cryowarden.simulator.emulators.FaultKind;
import org.cryowarden.simulator.emulators.Instrument;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The wall clock steps by an hour either way (an NTP correction, someone setting the clock) while the whole
 * daemon runs the night: pollers, engine loop and journal. Stale timeouts and shelving expiry are measured on
 * the monotonic clock, so each takes as many simulated seconds with the step as without it.
 */
class WallClockStepThroughDaemonTest {

    private static final String STALE = "o2-magnet-hall-east-stale";
    private static final List<Duration> STEPS = List.of(Duration.ZERO, Duration.ofHours(1), Duration.ofHours(-1));

    @TempDir
    Path folder;

    @Test
    void staleTimeoutAndShelvingExpiryTakeTheSameTimeWhenTheWallClockStepsAnHour() throws Exception {
        try (Night night = Night.start(folder, Night.MOSQUITTO, false)) {
            Instrument aim = night.simulator.instrument("aim-1").orElseThrow();
            night.stepUntil(night.daemon::acceptingCommands, 100);
            night.steps(15);
            List<Integer> staleAfter = new ArrayList<>();
            List<Integer> shelvedFor = new ArrayList<>();
            for (Duration jump : STEPS) {
                long seen = lastSeq(night);
                aim.startFault(new Fault(FaultKind.SILENCE, 0, Duration.ZERO, OptionalInt.empty(),
                        night.simulator.elapsed().toSeconds()));
                night.steps(3);
                night.simulator.clock().stepWall(jump);
                staleAfter.add(3 + stepsUntil(night, () -> has(night, seen, "alarm.raised", STALE), 60));
                aim.clearFault(Optional.of(FaultKind.SILENCE));
                stepsUntil(night, () -> has(night, seen, "alarm.cleared", STALE), 60);

                long shelvedAt = lastSeq(night);
                Instant wallBefore = night.simulator.clock().wallNow();
                var done = night.daemon.command(new OperatorCommand("shelve", STALE, DemoNight.OPERATOR, "",
                        Optional.of(Duration.ofMinutes(1)), "sensor swap"));
                // Counted from the step in which the engine took the command, which under load may be the next.
                stepsUntil(night, () -> has(night, shelvedAt, "alarm.shelved", STALE), 5);
                assertThat(done.get(5, TimeUnit.SECONDS)).isEmpty();
                night.steps(10);
                night.simulator.clock().stepWall(jump);
                shelvedFor.add(10 + stepsUntil(night, () -> has(night, shelvedAt, "alarm.unshelved", STALE), 120));
                assertThat(Duration.between(wallBefore, night.simulator.clock().wallNow()).minus(jump).toSeconds())
                        .isBetween(55L, 65L);
            }
            System.out.printf("wall clock steps %s: stale alarm after %s s, shelving over after %s s%n", STEPS,
                    staleAfter, shelvedFor);
            // The rule's stale timeout is 10 s and the shelving 1 min (config-examples/harbour-hall-rules.yaml); the
            // bus itself marks the silent module's channels STALE after its retries, which may come first.
            assertThat(staleAfter).allSatisfy(steps -> assertThat(steps).isBetween(1, 12));
            assertThat(staleAfter).containsOnly(staleAfter.get(0));
            assertThat(shelvedFor).allSatisfy(steps -> assertThat(steps).isBetween(60, 61));
            assertThat(shelvedFor).containsOnly(shelvedFor.get(0));
        }
    }

    // ---- helpers ----

    /** Steps until {@code done}; returns how many steps it took. */
    private static int stepsUntil(Night night, BooleanSupplier done, int max) throws InterruptedException {
        for (int i = 1; i <= max; i++) {
            night.step();
            if (done.getAsBoolean()) {
                return i;
            }
        }
        throw new AssertionError("not within " + max + " steps");
    }

    private static long lastSeq(Night night) throws Exception {
        List<JournalEvent> all = night.daemon.eventsAfter(0, 100_000);
        return all.isEmpty() ? 0 : all.get(all.size() - 1).seq();
    }

    private static boolean has(Night night, long after, String kind, String subject) {
        try {
            return night.daemon.eventsAfter(after, 100_000).stream()
                    .anyMatch(e -> e.kind().equals(kind) && e.subject().orElse("").equals(subject));
        } catch (Exception e) {
            throw new AssertionError(e);
        }
    }
}
