package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.util.Objects;

/**
 * The thresholds of the alarm analysis.
 *
 * @param fleetingBelow an activation shorter than this is fleeting
 * @param chatterCount  this many activations of one alarm ...
 * @param chatterWindow ... starting within less than this make it chattering
 * @param rateInterval  the length of the intervals the alarm rate is counted in
 * @param floodAbove    more than this many activations (of all alarms) within less than {@code rateInterval} are a
 *                      flood
 */
public record AnalysisSettings(
        Duration fleetingBelow, int chatterCount, Duration chatterWindow, Duration rateInterval, int floodAbove) {

    public AnalysisSettings {
        Objects.requireNonNull(fleetingBelow, "fleetingBelow");
        Objects.requireNonNull(chatterWindow, "chatterWindow");
        Objects.requireNonNull(rateInterval, "rateInterval");
        if (fleetingBelow.isNegative()) {
            throw new IllegalArgumentException("the fleeting threshold cannot be negative, got " + fleetingBelow);
        }
        if (chatterCount < 2) {
            throw new IllegalArgumentException("chattering needs at least 2 activations, got " + chatterCount);
        }
        if (chatterWindow.isNegative() || chatterWindow.isZero() || rateInterval.isNegative() || rateInterval.isZero()) {
            throw new IllegalArgumentException("the chatter window and the rate interval must be positive");
        }
        if (floodAbove < 1) {
            throw new IllegalArgumentException("the flood threshold must be at least 1, got " + floodAbove);
        }
    }

    /**
     * Chattering: 3 or more activations within 1 minute (the usual ANSI/ISA-18.2 and EEMUA 191 metric); flood: more
     * than 10 alarms in 10 minutes (EEMUA 191); fleeting below 5 s, a choice of ours to be set per site.
     */
    public static AnalysisSettings defaults() {
        return new AnalysisSettings(Duration.ofSeconds(5), 3, Duration.ofMinutes(1), Duration.ofMinutes(10), 10);
    }

    /** The same settings with another fleeting threshold. */
    public AnalysisSettings withFleetingBelow(Duration threshold) {
        return new AnalysisSettings(threshold, chatterCount, chatterWindow, rateInterval, floodAbove);
    }
}
