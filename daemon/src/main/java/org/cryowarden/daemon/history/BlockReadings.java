package org.cryowarden.daemon.history;

import java.util.Collections;
import java.util.Iterator;
import java.util.NoSuchElementException;
import org.cryowarden.rules.Reading;

/**
 * The readings of a channel's consecutive history blocks as one stream, decoding one block at a time so a long
 * history never sits in memory whole.
 */
public final class BlockReadings implements Iterator<Reading> {

    private final Iterator<HistoryBlock> blocks;
    private Iterator<Reading> current = Collections.emptyIterator();
    private HistoryBlock previous;

    private BlockReadings(Iterator<HistoryBlock> blocks) {
        this.blocks = blocks;
    }

    /**
     * The readings of {@code blocks}, which must be of one channel, in time order and not overlapping.
     *
     * @throws CorruptBlockException (when iterating) if a block cannot be decoded
     * @throws IllegalArgumentException (when iterating) if the blocks are of several channels or overlap
     */
    public static BlockReadings of(Iterable<HistoryBlock> blocks) {
        return new BlockReadings(blocks.iterator());
    }

    @Override
    public boolean hasNext() {
        while (!current.hasNext() && blocks.hasNext()) {
            HistoryBlock block = blocks.next();
            if (previous != null) {
                if (!block.channel().equals(previous.channel())) {
                    throw new IllegalArgumentException("history block " + block.label() + " is of channel "
                            + block.channel() + ", not " + previous.channel());
                }
                if (block.first().isBefore(previous.last())) {
                    throw new IllegalArgumentException("history block " + block.label() + " starts at "
                            + block.first() + ", before the previous block " + previous.label() + " ends at "
                            + previous.last());
                }
            }
            previous = block;
            current = block.readings().iterator();
        }
        return current.hasNext();
    }

    @Override
    public Reading next() {
        if (!hasNext()) {
            throw new NoSuchElementException("no more readings");
        }
        return current.next();
    }
}
