package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.Objects;

/**
 * An active bypass of an interlock.
 *
 * @param until     wall-clock instant at which it expires (for people and the journal)
 * @param remaining time left on the engine's monotonic clock, which is what actually expires it
 */
public record Bypass(String owner, String reason, Instant until, Duration remaining) {

    public Bypass {
        Objects.requireNonNull(owner, "owner");
        Objects.requireNonNull(reason, "reason");
        Objects.requireNonNull(until, "until");
        Objects.requireNonNull(remaining, "remaining");
    }
}
