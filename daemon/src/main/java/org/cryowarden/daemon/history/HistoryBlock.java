package org.cryowarden.daemon.history;

import java.time.Instant;
import java.util.Arrays;
import java.util.List;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * One stored block of a channel's raw history: the readings of one channel over a stretch of time, encoded by
 * {@link BlockEncoder}. The header fields (channel, unit, first and last instant, count) can be read without
 * decoding the readings, e.g. to index blocks in the journal. Immutable.
 */
public final class HistoryBlock {

    private final String label;
    private final String channel;
    private final Unit unit;
    private final Instant first;
    private final Instant last;
    private final int count;
    private final byte[] data;

    HistoryBlock(String label, String channel, Unit unit, Instant first, Instant last, int count, byte[] data) {
        this.label = label;
        this.channel = channel;
        this.unit = unit;
        this.first = first;
        this.last = last;
        this.count = count;
        this.data = data;
    }

    /**
     * Reads a stored block, checking its format version, length and checksum and its header.
     *
     * @param label names the block in error messages, e.g. {@code "journal.db row 42"}
     * @throws CorruptBlockException naming {@code label} when the bytes are not a whole, intact block of a known
     *                               version
     */
    public static HistoryBlock parse(String label, byte[] data) {
        return BlockDecoder.parse(label, data.clone());
    }

    /** Every reading of the block, in the order appended (time order). */
    public List<Reading> readings() {
        return BlockDecoder.readings(this);
    }

    public String label() {
        return label;
    }

    public String channel() {
        return channel;
    }

    public Unit unit() {
        return unit;
    }

    /** The timestamp of the first reading. */
    public Instant first() {
        return first;
    }

    /** The timestamp of the last reading. */
    public Instant last() {
        return last;
    }

    /** Number of readings. */
    public int count() {
        return count;
    }

    /** Size of the stored form in bytes. */
    public int byteSize() {
        return data.length;
    }

    /** The stored form, to write into the journal. */
    public byte[] toBytes() {
        return data.clone();
    }

    byte[] data() {
        return data;
    }

    @Override
    public boolean equals(Object other) {
        return other instanceof HistoryBlock block && Arrays.equals(data, block.data);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(data);
    }

    @Override
    public String toString() {
        return "history block " + label + " (" + count + " readings of " + channel + " in " + data.length + " bytes)";
    }
}
