package org.cryowarden.daemon.report;

import java.time.Duration;
import java.util.List;
import java.util.Objects;
import java.util.OptionalLong;
import org.cryowarden.daemon.journal.MinuteAggregate;

/**
 * How much of a channel's data arrived GOOD over the period. With a poll period (a measured channel of the site
 * file) the expected count is one reading per period over the period, both ends included
 * ({@code floor(length / period) + 1}); otherwise the share is of the readings recorded.
 *
 * @param expected empty when the channel has no poll period (derived, or no site file)
 */
public record ChannelCompleteness(String channel, long recorded, long good, OptionalLong expected) {

    public ChannelCompleteness {
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(expected, "expected");
    }

    /** GOOD readings as a fraction of the expected ones (at most 1), or of those recorded. */
    public double goodFraction() {
        long base = expected.orElse(recorded);
        return base == 0 ? 0 : Math.min(1.0, (double) good / base);
    }

    static ChannelCompleteness of(String channel, List<MinuteAggregate> minutes, ReportWindow window,
            java.util.Optional<Duration> period) {
        long recorded = 0;
        long good = 0;
        for (MinuteAggregate minute : minutes) {
            recorded += minute.totalCount();
            good += minute.goodCount();
        }
        OptionalLong expected = period.map(p -> OptionalLong.of(window.length().toMillis() / p.toMillis() + 1))
                .orElse(OptionalLong.empty());
        return new ChannelCompleteness(channel, recorded, good, expected);
    }
}
