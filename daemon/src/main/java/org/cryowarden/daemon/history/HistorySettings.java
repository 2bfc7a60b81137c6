package org.cryowarden.daemon.history;

import java.time.Duration;
import java.util.Objects;

/**
 * How the daemon keeps raw history (site file {@code journal: {history_flush: 10s, history_retention: 14d}}).
 *
 * @param flushEvery   how often the open blocks are written: what a {@code kill -9} can lose at most
 * @param retention    how long blocks are kept after their last reading
 * @param sealAfter    a block is sealed once it spans this long ...
 * @param sealReadings ... or holds this many readings, whichever comes first
 */
public record HistorySettings(Duration flushEvery, Duration retention, Duration sealAfter, int sealReadings) {

    public HistorySettings {
        Objects.requireNonNull(flushEvery, "flushEvery");
        Objects.requireNonNull(retention, "retention");
        Objects.requireNonNull(sealAfter, "sealAfter");
        if (flushEvery.isNegative() || flushEvery.isZero() || retention.isNegative() || retention.isZero()
                || sealAfter.isNegative() || sealAfter.isZero()) {
            throw new IllegalArgumentException("history flush interval, retention and block length must be positive");
        }
        if (sealReadings < 2) {
            throw new IllegalArgumentException("a history block must hold at least 2 readings, got " + sealReadings);
        }
    }

    /** Flush every 10 s, keep 14 days, blocks of at most 1 h or 3600 readings. */
    public static HistorySettings defaults() {
        return new HistorySettings(Duration.ofSeconds(10), Duration.ofDays(14), Duration.ofHours(1), 3600);
    }

    public HistorySettings withFlushEvery(Duration every) {
        return new HistorySettings(every, retention, sealAfter, sealReadings);
    }

    public HistorySettings withRetention(Duration keep) {
        return new HistorySettings(flushEvery, keep, sealAfter, sealReadings);
    }
}
