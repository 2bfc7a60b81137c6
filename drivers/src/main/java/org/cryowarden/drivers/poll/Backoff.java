package org.cryowarden.drivers.poll;

import java.time.Duration;

/**
 * Exponential backoff between reopen attempts of a transport: {@code initial}, doubling up to {@code max}
 * (1 s to 30 s by default: common practice, quick after a brief glitch, gentle on a port that is gone for good).
 */
public record Backoff(Duration initial, Duration max) {

    public static final Backoff DEFAULT = new Backoff(Duration.ofSeconds(1), Duration.ofSeconds(30));

    public Backoff {
        if (initial.isNegative() || initial.isZero() || max.compareTo(initial) < 0) {
            throw new IllegalArgumentException("backoff needs 0 < initial <= max, got " + initial + ", " + max);
        }
    }

    /** The wait after {@code failures} consecutive failed attempts (1 or more). */
    public Duration after(int failures) {
        Duration wait = initial;
        for (int i = 1; i < failures && wait.compareTo(max) < 0; i++) {
            wait = wait.multipliedBy(2);
        }
        return wait.compareTo(max) > 0 ? max : wait;
    }
}
