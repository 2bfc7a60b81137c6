package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.Objects;

/**
 * The alarm rate fell back below the flood's end criterion (ANSI/ISA-18.2-2016 guidance: fewer than 5 in
 * 10 minutes).
 *
 * @param startedAt     the {@link FloodStarted#instant()} of this flood
 * @param activations   every alarm activation from the flood's first-out to its end
 * @param firstOutAlarm the flood's first-out alarm
 * @param duration      from the first-out's activation to now, on the engine's monotonic clock
 */
public record FloodEnded(Instant instant, Instant startedAt, int activations, String firstOutAlarm,
        Duration duration, String cause) implements EngineEvent {

    public FloodEnded {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(startedAt, "startedAt");
        Objects.requireNonNull(firstOutAlarm, "firstOutAlarm");
        Objects.requireNonNull(duration, "duration");
        Objects.requireNonNull(cause, "cause");
    }
}
