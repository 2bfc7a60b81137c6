package org.cryowarden.daemon.history;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.zip.CRC32C;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * Builds the history block of one channel, reading by reading, in time order (format version 2, see
 * {@link BlockFormat}).
 *
 * <p>Timestamps are stored as delta-of-delta and values, by default, as XOR with the previous value: the method of
 * T. Pelkonen et al., "Gorilla: A Fast, Scalable, In-Memory Time Series Database", PVLDB 8(12), 2015, section 4.1.
 * Three extensions keep it lossless and small on instrument data. The block counts time in the coarsest step (s,
 * ms, µs or ns) that every interval is a multiple of. Values that sit on a lattice (a printed decimal like
 * {@code 20.93}; a register scaled through a 4-20 mA loop, k/640 give or take an ulp of rounding; a float32 scaled
 * by a power of two) are stored as Rice-coded differences of their lattice integers plus a small ulp correction,
 * see {@link ValueCoding}; XOR does poorly on them because a step of one unit flips most mantissa bits. Other values
 * (NaN with its payload, infinities, -0.0, noise) escape to their raw 64 bits. Quality and reason are stored as
 * runs, so a night of GOOD readings costs a few bytes.
 *
 * <p>Like version 1, the encoder holds only the bit streams (and the first values until a coding is chosen): what
 * it re-encodes, it reads back from them. The value coding is chosen by trying XOR and the coarsest decimal and binary lattice on the block's first
 * {@value #CHOOSE_AFTER} values (or at the first snapshot), chosen again when escapes pile up, and once more on
 * every value when the block is sealed, so a sealed block is in the cheapest of the three. Timestamps move to a
 * finer step when an interval needs it (at most three times). Every choice is made from the block's own values, so
 * the same readings always give the same bytes.
 *
 * <p>{@link #snapshot()} may be taken at any time (e.g. at every journal flush) and appending continues after it.
 * Single-threaded: one encoder per channel, fed from the engine's thread.
 */
public final class BlockEncoder {

    static final int CHOOSE_AFTER = 64;
    private static final int ESCAPES_BEFORE_CHOOSING_AGAIN = 16;
    private static final int MAX_CHOICES = 8;

    private final String channel;
    private final Unit unit;
    private final boolean xorOnly;

    private TimeResolution resolution = TimeResolution.SECOND;
    private BitWriter times = new BitWriter(256);
    private long firstNanos;
    private long prevNanos;
    /** The values before a coding is chosen; afterwards the value stream is the only copy. */
    private final double[] early = new double[CHOOSE_AFTER];
    private int count;
    private long prevDelta;
    private ValueWriter writer;
    private BitWriter valueBits;
    private int choices;
    private int chooseAgainAt;
    private final List<Run> runs = new ArrayList<>();

    /** An encoder for readings of {@code channel}, whose values are in {@code unit}. */
    public BlockEncoder(String channel, Unit unit) {
        this(channel, unit, false);
    }

    private BlockEncoder(String channel, Unit unit, boolean xorOnly) {
        this.channel = Objects.requireNonNull(channel, "channel");
        this.unit = Objects.requireNonNull(unit, "unit");
        if (channel.isEmpty()) {
            throw new IllegalArgumentException("a history block needs a channel id");
        }
        this.xorOnly = xorOnly;
    }

    /** An encoder that codes every value with Gorilla's XOR alone: the baseline the lattices are measured against. */
    static BlockEncoder xorOnly(String channel, Unit unit) {
        return new BlockEncoder(channel, unit, true);
    }

    public String channel() {
        return channel;
    }

    public Unit unit() {
        return unit;
    }

    public int count() {
        return count;
    }

    public boolean isEmpty() {
        return count == 0;
    }

    /** The timestamp of the first reading of the block; only when it is not empty. */
    Instant firstInstant() {
        return instant(firstNanos);
    }

    /** The timestamp of the last reading appended, if any. */
    public Optional<Instant> last() {
        return count == 0 ? Optional.empty() : Optional.of(instant(prevNanos));
    }

    /** The value coding in use; XOR until one is chosen. */
    ValueCoding coding() {
        return writer == null ? ValueCoding.XOR : writer.coding();
    }

    /**
     * Appends a reading.
     *
     * @throws IllegalArgumentException when the reading is of another channel or unit, or earlier than the previous
     *                                  one (equal timestamps are kept, in the order given)
     */
    public void append(Reading reading) {
        if (!reading.channel().equals(channel)) {
            throw new IllegalArgumentException("reading of channel '" + reading.channel()
                    + "' does not belong in the history block of '" + channel + "'");
        }
        if (reading.unit() != unit) {
            throw new IllegalArgumentException("reading of " + channel + " is in " + reading.unit().symbol()
                    + " but its history block is in " + unit.symbol());
        }
        long at = nanos(reading.timestamp(), channel);
        if (count > 0 && at < prevNanos) {
            throw new IllegalArgumentException("reading of " + channel + " at " + reading.timestamp()
                    + " is earlier than the previous one at " + instant(prevNanos)
                    + ": a history block takes readings in time order");
        }
        if (count > 0) {
            TimeResolution needed = TimeResolution.fitting(at - prevNanos, resolution);
            if (needed != resolution) {
                rewriteTimes(needed);
            }
            writeTime(at);
        } else {
            firstNanos = at;
        }
        prevNanos = at;
        double value = reading.value();
        if (writer == null) {
            early[count] = value;
        }
        count++;
        if (writer != null) {
            writer.write(value);
            if (writer.escapes() >= chooseAgainAt && choices < MAX_CHOICES) {
                choose();
            }
        } else if (count >= CHOOSE_AFTER) {
            choose();
        }
        addToRuns(reading.quality(), reading.reason());
    }

    /**
     * The block of every reading appended so far; appending may continue.
     *
     * @throws IllegalStateException when nothing was appended
     */
    public HistoryBlock snapshot() {
        if (count == 0) {
            throw new IllegalStateException("the history block of " + channel + " is empty");
        }
        if (writer == null) {
            choose();
        }
        return new HistoryBlock(label(), channel, unit, instant(firstNanos), instant(prevNanos), count, serialize());
    }

    /** The block so far, in the cheapest coding for all its values, after which the encoder starts afresh. */
    public HistoryBlock seal() {
        if (count > 0 && writer != null && !xorOnly) {
            double[] values = values();
            ValueCoding best = ValueCoding.cheapest(values, count);
            if (!best.equals(writer.coding()) && ValueCoding.cost(best, values, count) < valueBits.bitLength()) {
                encodeValues(best, values);
            }
        }
        HistoryBlock block = snapshot();
        times = new BitWriter(256);
        count = 0;
        prevDelta = 0;
        writer = null;
        valueBits = null;
        choices = 0;
        runs.clear();
        resolution = TimeResolution.SECOND;
        return block;
    }

    private String label() {
        return channel + " from " + instant(firstNanos);
    }

    private void choose() {
        choices++;
        double[] values = values();
        encodeValues(xorOnly ? ValueCoding.XOR : ValueCoding.cheapest(values, count), values);
        chooseAgainAt = Math.max(ESCAPES_BEFORE_CHOOSING_AGAIN, 2 * writer.escapes());
    }

    /** Every value so far, read back from the value stream (the encoder keeps no other copy once it has one). */
    private double[] values() {
        if (writer == null) {
            return Arrays.copyOf(early, count);
        }
        double[] values = new double[count];
        ValueReader reader = new ValueReader(writer.coding(),
                new BitReader(valueBits.toByteArray(), 0, valueBits.bitLength()));
        try {
            for (int i = 0; i < count; i++) {
                values[i] = reader.next();
            }
        } catch (BitReader.EndOfBits | ValueReader.Malformed e) {
            throw new IllegalStateException("history block of " + channel + " cannot read back its own values", e);
        }
        return values;
    }

    private void encodeValues(ValueCoding coding, double[] values) {
        valueBits = new BitWriter(Math.max(256, count));
        writer = new ValueWriter(coding, valueBits);
        for (int i = 0; i < count; i++) {
            writer.write(values[i]);
        }
    }

    /** Writes the time stream again in a finer step, reading back the timestamps from the current one. */
    private void rewriteTimes(TimeResolution finer) {
        long[] stamps = new long[count];
        BitReader in = new BitReader(times.toByteArray(), 0, times.bitLength());
        long at = firstNanos;
        long delta = 0;
        stamps[0] = at;
        try {
            for (int i = 1; i < count; i++) {
                delta += BlockDecoder.deltaOfDelta(in);
                at += delta * resolution.nanos;
                stamps[i] = at;
            }
        } catch (BitReader.EndOfBits e) {
            throw new IllegalStateException("history block of " + channel + " cannot read back its own times", e);
        }
        resolution = finer;
        times = new BitWriter(Math.max(256, count));
        prevDelta = 0;
        prevNanos = firstNanos;
        for (int i = 1; i < count; i++) {
            writeTime(stamps[i]);
            prevNanos = stamps[i];
        }
    }

    private void writeTime(long at) {
        long delta = (at - prevNanos) / resolution.nanos;
        writeDeltaOfDelta(delta - prevDelta);
        prevDelta = delta;
    }

    /** Gorilla's variable-length delta-of-delta, with a 64-bit escape so nanosecond steps of any size stay exact. */
    private void writeDeltaOfDelta(long dod) {
        if (dod == 0) {
            times.writeBit(false);
        } else if (fits(dod, 7)) {
            times.write(0b10, 2);
            times.write(dod, 7);
        } else if (fits(dod, 9)) {
            times.write(0b110, 3);
            times.write(dod, 9);
        } else if (fits(dod, 12)) {
            times.write(0b1110, 4);
            times.write(dod, 12);
        } else if (fits(dod, 32)) {
            times.write(0b11110, 5);
            times.write(dod, 32);
        } else {
            times.write(0b11111, 5);
            times.write(dod, 64);
        }
    }

    private void addToRuns(Quality quality, String reason) {
        if (!runs.isEmpty()) {
            Run last = runs.get(runs.size() - 1);
            if (last.quality == quality && last.reason.equals(reason)) {
                last.length++;
                return;
            }
        }
        runs.add(new Run(quality, reason));
    }

    private byte[] serialize() {
        byte[] channelBytes = channel.getBytes(StandardCharsets.UTF_8);
        byte[] unitBytes = unit.symbol().getBytes(StandardCharsets.UTF_8);
        byte[] timeStream = times.toByteArray();
        byte[] valueStream = valueBits.toByteArray();
        ValueCoding coding = writer.coding();
        ByteArrayOutputStream out = new ByteArrayOutputStream(80 + timeStream.length + valueStream.length);
        out.writeBytes(BlockFormat.MAGIC);
        out.write(BlockFormat.VERSION);
        writeInt(out, 0);
        out.write(resolution.code);
        out.write(coding.kind().code);
        if (coding.kind() != ValueCoding.Kind.XOR) {
            writeVarint(out, coding.scale());
            out.write(coding.ulps() ? 1 : 0);
            writeVarint(out, coding.step());
            writeVarint(out, (coding.origin() << 1) ^ (coding.origin() >> 63));
        }
        writeText(out, channelBytes);
        writeText(out, unitBytes);
        writeVarint(out, count);
        writeLong(out, firstNanos);
        writeLong(out, prevNanos);
        writeVarint(out, runs.size());
        for (Run run : runs) {
            writeVarint(out, run.length);
            out.write(BlockFormat.qualityCode(run.quality));
            writeText(out, run.reason.getBytes(StandardCharsets.UTF_8));
        }
        writeVarint(out, times.bitLength());
        out.writeBytes(timeStream);
        writeVarint(out, valueBits.bitLength());
        out.writeBytes(valueStream);
        writeInt(out, 0);
        byte[] data = out.toByteArray();
        int length = data.length;
        data[5] = (byte) (length >>> 24);
        data[6] = (byte) (length >>> 16);
        data[7] = (byte) (length >>> 8);
        data[8] = (byte) length;
        CRC32C crc = new CRC32C();
        crc.update(data, 0, length - BlockFormat.CHECKSUM_BYTES);
        int checksum = (int) crc.getValue();
        data[length - 4] = (byte) (checksum >>> 24);
        data[length - 3] = (byte) (checksum >>> 16);
        data[length - 2] = (byte) (checksum >>> 8);
        data[length - 1] = (byte) checksum;
        return data;
    }

    static long nanos(Instant instant, String channel) {
        try {
            return Math.addExact(Math.multiplyExact(instant.getEpochSecond(), 1_000_000_000L), instant.getNano());
        } catch (ArithmeticException e) {
            throw new IllegalArgumentException("reading of " + channel + " at " + instant
                    + " is outside the years 1677 to 2262 that a history block can hold");
        }
    }

    static Instant instant(long nanos) {
        return Instant.ofEpochSecond(Math.floorDiv(nanos, 1_000_000_000L), Math.floorMod(nanos, 1_000_000_000L));
    }

    private static boolean fits(long value, int width) {
        long half = 1L << (width - 1);
        return value >= -half && value < half;
    }

    private static void writeText(ByteArrayOutputStream out, byte[] text) {
        writeVarint(out, text.length);
        out.writeBytes(text);
    }

    private static void writeVarint(ByteArrayOutputStream out, long value) {
        long rest = value;
        while ((rest & ~0x7FL) != 0) {
            out.write((int) ((rest & 0x7F) | 0x80));
            rest >>>= 7;
        }
        out.write((int) rest);
    }

    private static void writeInt(ByteArrayOutputStream out, int value) {
        out.write(value >>> 24);
        out.write(value >>> 16);
        out.write(value >>> 8);
        out.write(value);
    }

    private static void writeLong(ByteArrayOutputStream out, long value) {
        writeInt(out, (int) (value >>> 32));
        writeInt(out, (int) value);
    }

    /** A stretch of consecutive readings with the same quality and reason. */
    private static final class Run {
        final Quality quality;
        final String reason;
        int length = 1;

        Run(Quality quality, String reason) {
            this.quality = quality;
            this.reason = reason;
        }
    }
}
