package org.cryowarden.daemon.journal;

import java.time.Instant;
import java.util.Objects;

/**
 * One stored history block of a channel, as the journal keeps it: the header fields it is indexed by and the
 * encoded readings, which the journal does not interpret.
 *
 * @param id     the row id; 0 for a block not stored yet
 * @param sealed whether the block is complete (an open block is rewritten at every flush until it is sealed)
 */
public record BlockRow(long id, String channel, Instant first, Instant last, int count, boolean sealed,
                       byte[] data) {

    public BlockRow {
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(first, "first");
        Objects.requireNonNull(last, "last");
        Objects.requireNonNull(data, "data");
    }
}
