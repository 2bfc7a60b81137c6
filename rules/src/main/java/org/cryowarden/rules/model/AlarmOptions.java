package org.cryowarden.rules.model;

import java.time.Duration;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * What every alarming rule shares: how urgent it is, what the operator reads, its timing options and what it
 * trips.
 *
 * @param priority      urgency
 * @param message       one line for the operator, e.g. "Oxygen below 19.5 %vol in magnet hall"
 * @param onDelay       the condition must hold this long before the alarm activates (zero: at once)
 * @param offDelay      the condition must be clear this long before the alarm returns to normal
 * @param latching      a latched alarm stays active after the condition clears until acknowledged
 * @param suppressWhile alarm ids; while any of them is active this alarm is suppressed by design
 * @param trips         the interlock this alarm trips when it activates, if any
 */
public record AlarmOptions(
        Priority priority,
        String message,
        Duration onDelay,
        Duration offDelay,
        boolean latching,
        List<String> suppressWhile,
        Optional<String> trips) {

    public AlarmOptions {
        Objects.requireNonNull(priority, "priority");
        Objects.requireNonNull(message, "message");
        Objects.requireNonNull(onDelay, "onDelay");
        Objects.requireNonNull(offDelay, "offDelay");
        suppressWhile = List.copyOf(suppressWhile);
        Objects.requireNonNull(trips, "trips");
        if (onDelay.isNegative() || offDelay.isNegative()) {
            throw new IllegalArgumentException("delays cannot be negative, got on " + onDelay + ", off " + offDelay);
        }
    }

    /** Immediate, non-latching, suppressed by nothing, tripping nothing. */
    public static AlarmOptions simple(Priority priority, String message) {
        return new AlarmOptions(priority, message, Duration.ZERO, Duration.ZERO, false, List.of(), Optional.empty());
    }
}
