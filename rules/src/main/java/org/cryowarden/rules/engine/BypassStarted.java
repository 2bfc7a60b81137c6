package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.Objects;

/**
 * An interlock was bypassed: until the bypass ends its cause alarms still raise but do not trip it. Alarm-worthy
 * in itself, since the protection is defeated.
 */
public record BypassStarted(
        Instant instant, String interlockId, String owner, String reason, Instant until, Duration duration,
        String cause) implements EngineEvent {

    public BypassStarted {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(interlockId, "interlockId");
        Objects.requireNonNull(owner, "owner");
        Objects.requireNonNull(reason, "reason");
        Objects.requireNonNull(until, "until");
        Objects.requireNonNull(duration, "duration");
        Objects.requireNonNull(cause, "cause");
    }
}
