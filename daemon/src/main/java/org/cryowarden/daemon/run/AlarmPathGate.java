package org.cryowarden.daemon.run;

import java.util.concurrent.locks.LockSupport;
import java.util.function.BooleanSupplier;
import java.util.function.LongSupplier;
import org.cryowarden.drivers.poll.TransactionGate;

/**
 * Lets an alarm go first: once the engine queues a batch of events for the journal, and while the journal is still
 * recording what is queued and handing it to the MQTT outbox, the bus pollers and the readings publisher wait before
 * their next transaction or slice. On a two-core server a bus's round polled all at once otherwise takes both cores
 * while the alarm's commit and publish wait their turn.
 *
 * <p>Bounded, since polling must never stop (stale detection and every other alarm depend on it): a hold lasts at
 * most {@link #HOLD_NANOS} from the batch that began it, however many follow or whether the journal ever answers,
 * and the next hold begins no sooner than as long again after it ran out, so that in an alarm flood the pollers
 * still get at least half the time. Whether the path is busy is read from the journal's own state, not counted
 * here, so nothing can drift.
 */
final class AlarmPathGate implements TransactionGate {

    /** The longest a poller or the readings publisher waits for one hold, and the least time between two holds. */
    static final long HOLD_NANOS = 20_000_000L;
    /** How often a waiting thread looks again: short against the commit it waits for. */
    private static final long LOOK_NANOS = 200_000L;

    /** Whether the journal still has queued or unfinished batches. */
    private final BooleanSupplier pathBusy;
    /** Real monotonic nanoseconds (System::nanoTime in the daemon): the gate is about CPU, not site time. */
    private final LongSupplier nanos;
    /** Monotonic time at which the present (or the last) hold runs out. */
    private volatile long holdUntil;

    AlarmPathGate(BooleanSupplier pathBusy) {
        this(pathBusy, System::nanoTime);
    }

    AlarmPathGate(BooleanSupplier pathBusy, LongSupplier nanos) {
        this.pathBusy = pathBusy;
        this.nanos = nanos;
        this.holdUntil = nanos.getAsLong() - HOLD_NANOS;
    }

    /**
     * A batch of events was queued for the journal (the engine's turn; call it after queueing, so that a waiting
     * thread finds the journal busy): begins a hold unless one ran out less than {@link #HOLD_NANOS} ago.
     */
    void entered() {
        long now = nanos.getAsLong();
        if (now - holdUntil >= HOLD_NANOS) {
            holdUntil = now + HOLD_NANOS;
        }
    }

    @Override
    public void awaitTurn() {
        long now = nanos.getAsLong();
        long until = holdUntil;
        if (now - until >= 0 || !pathBusy.getAsBoolean()) {
            return;
        }
        while (pathBusy.getAsBoolean() && (now = nanos.getAsLong()) - until < 0) {
            LockSupport.parkNanos(Math.min(LOOK_NANOS, until - now));
        }
    }
}
