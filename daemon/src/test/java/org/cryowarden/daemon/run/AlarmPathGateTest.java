package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.LongSupplier;
import org.junit.jupiter.api.Test;

/**
 * The gate that lets an alarm's way to the journal go before the next poll, on a clock that moves 1 ms each time the
 * gate reads it (so a hold ends by the clock, not by sleeping it out).
 */
class AlarmPathGateTest {

    private static final long MS = 1_000_000L;

    /** Monotonic nanoseconds that step 1 ms at every read, counting the reads. */
    private static final class SteppingClock implements LongSupplier {
        long nanos = 5_000 * MS;
        int reads;

        @Override
        public long getAsLong() {
            reads++;
            nanos += MS;
            return nanos;
        }
    }

    @Test
    void withNoAlarmOnItsWayAPollerGoesOnAtOnce() {
        SteppingClock clock = new SteppingClock();
        AlarmPathGate gate = new AlarmPathGate(() -> true, clock);
        long before = clock.nanos;

        gate.awaitTurn();

        assertThat(clock.nanos - before).as("one look at the clock, no waiting").isEqualTo(MS);
    }

    @Test
    void aPollerWaitsWhileTheJournalRecordsTheAlarmAndGoesOnWhenItIsDone() {
        SteppingClock clock = new SteppingClock();
        AtomicBoolean busy = new AtomicBoolean(true);
        int[] looks = {0};
        AlarmPathGate gate = new AlarmPathGate(() -> {
            // The journal finishes after the poller looked five times.
            if (++looks[0] > 5) {
                busy.set(false);
            }
            return busy.get();
        }, clock);
        gate.entered();
        long before = clock.nanos;

        gate.awaitTurn();

        assertThat(busy).isFalse();
        assertThat(clock.nanos - before).as("released by the journal, well before the bound")
                .isLessThan(AlarmPathGate.HOLD_NANOS / 2);
    }

    @Test
    void aJournalThatNeverAnswersHoldsAPollerNoLongerThanTheBound() {
        SteppingClock clock = new SteppingClock();
        AlarmPathGate gate = new AlarmPathGate(() -> true, clock);
        gate.entered();
        long entered = clock.nanos;

        gate.awaitTurn();

        assertThat(clock.nanos - entered).isBetween(AlarmPathGate.HOLD_NANOS, AlarmPathGate.HOLD_NANOS + 2 * MS);
        long after = clock.nanos;
        gate.awaitTurn();
        assertThat(clock.nanos - after).as("the hold ran out: the next poll goes at once").isEqualTo(MS);
    }

    @Test
    void aFloodOfAlarmsLeavesThePollersAtLeastHalfTheTime() {
        SteppingClock clock = new SteppingClock();
        AlarmPathGate gate = new AlarmPathGate(() -> true, clock);
        long start = clock.nanos;
        long held = 0;
        // An alarm batch before every poll for a simulated second, the journal never idle.
        while (clock.nanos - start < 1_000 * MS) {
            gate.entered();
            long before = clock.nanos;
            gate.awaitTurn();
            held += clock.nanos - before - MS;
        }

        assertThat((double) held / (clock.nanos - start)).isBetween(0.3, 0.55);
    }
}
