package org.cryowarden.rules;

import java.time.Duration;
import java.time.Instant;
import java.util.Objects;

/**
 * A clock that moves only when told, so a whole night runs in milliseconds and the same inputs give the same
 * events. {@link #advance(Duration)} moves both sides together; {@link #stepWall(Duration)} moves only the
 * wall clock, as an NTP correction would. Thread-safe: the simulator advances it while the daemon reads it.
 */
public final class VirtualTimeSource implements TimeSource {

    private Instant wall;
    private long monotonic;

    public VirtualTimeSource(Instant start) {
        this.wall = Objects.requireNonNull(start, "start");
    }

    @Override
    public synchronized Instant wallNow() {
        return wall;
    }

    @Override
    public synchronized long monotonicNanos() {
        return monotonic;
    }

    /** Lets time pass on both sides. */
    public synchronized void advance(Duration step) {
        if (step.isNegative()) {
            throw new IllegalArgumentException("time cannot run backwards, got a step of " + step);
        }
        wall = wall.plus(step);
        monotonic += step.toNanos();
    }

    /** Jumps the wall clock only (either way), leaving monotonic time where it is. */
    public synchronized void stepWall(Duration jump) {
        wall = wall.plus(jump);
    }
}
