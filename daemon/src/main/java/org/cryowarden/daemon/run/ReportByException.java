package org.cryowarden.daemon.run;

import java.time.Duration;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;

/**
 * Report by exception for the reading topics: a reading is published when its quality changes, when its value
 * moved by more than the channel's deadband since the last published one (any change when the deadband is 0),
 * or when the maximum interval passed, so a retained topic is never older than that. Times are the program
 * clock's monotonic nanoseconds. Used by one thread.
 */
final class ReportByException {

    private final Map<String, Double> deadbands;
    private final long maxIntervalNanos;
    private final Map<String, Last> last = new HashMap<>();

    private record Last(double value, Quality quality, long at) {
    }

    ReportByException(Map<String, Double> deadbands, Duration maxInterval) {
        this.deadbands = Map.copyOf(deadbands);
        this.maxIntervalNanos = maxInterval.toNanos();
    }

    /** Whether {@code reading} is to be published now; if so it becomes the channel's last published one. */
    boolean admit(Reading reading, long now) {
        Last previous = last.get(reading.channel());
        boolean publish;
        if (previous == null || previous.quality != reading.quality()
                || now - previous.at >= maxIntervalNanos) {
            publish = true;
        } else if (Double.isNaN(previous.value) != Double.isNaN(reading.value())) {
            publish = true;
        } else {
            double deadband = deadbands.getOrDefault(reading.channel(), 0.0);
            double moved = Math.abs(reading.value() - previous.value);
            publish = deadband == 0 ? moved > 0 : moved > deadband;
        }
        if (publish) {
            last.put(reading.channel(), new Last(reading.value(), reading.quality(), now));
        }
        return publish;
    }

    /** Channels whose last publication is at least the maximum interval old. */
    List<String> overdue(long now) {
        List<String> due = new ArrayList<>();
        last.forEach((channel, l) -> {
            if (now - l.at >= maxIntervalNanos) {
                due.add(channel);
            }
        });
        return due;
    }

    /** Forgets what was published (after a reconnect everything is published again). */
    void reset() {
        last.clear();
    }
}
