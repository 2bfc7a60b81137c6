package org.cryowarden.daemon.journal;

import java.time.Duration;
import java.util.Objects;

/**
 * How the journal runs.
 *
 * @param busyTimeout        how long a write waits for another connection's lock before it fails
 * @param aggregateRetention how long minute aggregates are kept; older minutes are pruned
 */
public record JournalSettings(Duration busyTimeout, Duration aggregateRetention) {

    public JournalSettings {
        Objects.requireNonNull(busyTimeout, "busyTimeout");
        Objects.requireNonNull(aggregateRetention, "aggregateRetention");
        if (busyTimeout.isNegative() || busyTimeout.toMillis() > Integer.MAX_VALUE) {
            throw new IllegalArgumentException("journal busy timeout must be between 0 and 24 days, got " + busyTimeout);
        }
        if (aggregateRetention.compareTo(Duration.ofMinutes(1)) < 0) {
            throw new IllegalArgumentException("aggregate retention must be at least one minute, got "
                    + aggregateRetention);
        }
    }

    /** 5 s busy timeout, minute aggregates kept for 90 days (about 130 000 rows per channel). */
    public static JournalSettings defaults() {
        return new JournalSettings(Duration.ofSeconds(5), Duration.ofDays(90));
    }

    public JournalSettings withAggregateRetention(Duration retention) {
        return new JournalSettings(busyTimeout, retention);
    }
}
