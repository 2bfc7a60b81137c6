package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.Objects;

/**
 * An active shelving of an alarm.
 *
 * @param until     wall-clock instant at which it expires (for people and the journal)
 * @param remaining time left on the engine's monotonic clock, which is what actually expires it
 */
public record Shelving(String operator, String reason, Instant until, Duration remaining) {

    public Shelving {
        Objects.requireNonNull(operator, "operator");
        Objects.requireNonNull(reason, "reason");
        Objects.requireNonNull(until, "until");
        Objects.requireNonNull(remaining, "remaining");
    }
}
