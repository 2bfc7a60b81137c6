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

    /**
     * Flush every 10 s, keep 14 days, blocks of at most 15 min or 900 readings. Each flush rewrites every open block
     * whole, so the block length sets how much is written for how little new: with hour-long blocks of 200
     * channels at 1 Hz a flush wrote some 500 kB for 2,000 new readings (about 4 GB a day into the write-ahead
     * log, twice that with checkpoints); a quarter-hour block writes a quarter of that, for some 0.1 byte a reading
     * more in block headers and rows.
     */
    public static HistorySettings defaults() {
        return new HistorySettings(Duration.ofSeconds(10), Duration.ofDays(14), Duration.ofMinutes(15), 900);
    }

    public HistorySettings withFlushEvery(Duration every) {
        return new HistorySettings(every, retention, sealAfter, sealReadings);
    }

    public HistorySettings withRetention(Duration keep) {
        return new HistorySettings(flushEvery, keep, sealAfter, sealReadings);
    }
}
