package org.cryowarden.rules;

import java.time.Instant;

/** The machine's clocks: {@link Instant#now()} and {@link System#nanoTime()}. */
final class SystemTimeSource implements TimeSource {

    static final SystemTimeSource INSTANCE = new SystemTimeSource();

    private SystemTimeSource() {
    }

    @Override
    public Instant wallNow() {
        return Instant.now();
    }

    @Override
    public long monotonicNanos() {
        return System.nanoTime();
    }
}
