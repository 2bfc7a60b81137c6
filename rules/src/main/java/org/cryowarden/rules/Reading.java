package org.cryowarden.rules;

import java.time.Instant;
import java.util.Objects;

/**
 * One value of one channel at one instant, in the channel's unit, with its quality.
 *
 * @param channel   channel id, as in the site file
 * @param value     the value in {@code unit}; NaN when the quality carries no value
 * @param unit      the engineering unit of {@code value}
 * @param timestamp wall-clock instant (UTC) at which the value was taken
 * @param quality   how far the value can be trusted
 * @param reason    why the quality is not GOOD ("bad CRC", "timeout after 500 ms"); empty when GOOD
 */
public record Reading(String channel, double value, Unit unit, Instant timestamp, Quality quality, String reason) {

    public Reading {
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(timestamp, "timestamp");
        Objects.requireNonNull(quality, "quality");
        Objects.requireNonNull(reason, "reason");
        if (quality == Quality.GOOD && !Double.isFinite(value)) {
            throw new IllegalArgumentException("a GOOD reading of " + channel + " must have a finite value, got " + value);
        }
    }

    /** A trusted value. */
    public static Reading good(String channel, double value, Unit unit, Instant timestamp) {
        return new Reading(channel, value, unit, timestamp, Quality.GOOD, "");
    }

    /** A reading that carries no usable value, with the reason an operator will read. */
    public static Reading bad(String channel, Unit unit, Instant timestamp, String reason) {
        return new Reading(channel, Double.NaN, unit, timestamp, Quality.BAD, reason);
    }

    /** A reading marking that no fresh value arrived in time. */
    public static Reading stale(String channel, Unit unit, Instant timestamp, String reason) {
        return new Reading(channel, Double.NaN, unit, timestamp, Quality.STALE, reason);
    }

    /** The same reading with another quality and reason, keeping the value (e.g. a range check downgrading it). */
    public Reading withQuality(Quality newQuality, String newReason) {
        return new Reading(channel, value, unit, timestamp, newQuality, newReason);
    }
}
