package org.cryowarden.daemon.history;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.zip.CRC32C;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * Builds the history block of one channel, reading by reading, in time order.
 *
 * <p>Timestamps are stored as delta-of-delta and values as XOR with the previous value, the method of
 * T. Pelkonen et al., "Gorilla: A Fast, Scalable, In-Memory Time Series Database", PVLDB 8(12), 2015, section 4.1.
 * Two additions keep it lossless and small on instrument data: the block counts time in the coarsest step (s, ms,
 * µs or ns) that every interval is a multiple of, and values that are exact decimals ({@code 20.93}, as an
 * instrument prints them) are stored as the difference of their scaled integers, which Gorilla's XOR does poorly on;
 * other values (NaN with its payload, infinities, -0.0, full-precision noise) escape to their raw 64 bits, and a
 * block where such values are common falls back to XOR for every value. Quality and reason are stored as runs, so
 * a night of GOOD readings costs a few bytes. When a reading needs a finer step or another value coding, the block
 * so far is re-encoded once; each can only become more general, so that happens a bounded number of times.
 *
 * <p>{@link #snapshot()} may be taken at any time (e.g. at every journal flush) and appending continues after it.
 * Single-threaded: one encoder per channel, fed from the engine's thread.
 */
public final class BlockEncoder {

    private static final int ESCAPES_BEFORE_XOR = 8;

    private final String channel;
    private final Unit unit;
    private final boolean xorOnly;

    private TimeResolution resolution = TimeResolution.SECOND;
    private int coding;
    private BitWriter bits = new BitWriter(256);
    private int count;
    private long firstNanos;
    private long prevNanos;
    private long prevDelta;
    private long prevValueBits;
    private int prevLeading = -1;
    private int prevTrailing;
    private long prevInteger;
    private boolean haveEscape;
    private long prevEscapeBits;
    private int escapes;
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
        this.coding = initialCoding();
    }

    /** An encoder that codes every value with Gorilla's XOR alone: the baseline the decimal coding is measured against. */
    static BlockEncoder xorOnly(String channel, Unit unit) {
        return new BlockEncoder(channel, unit, true);
    }

    private int initialCoding() {
        return xorOnly ? BlockFormat.XOR_CODING : 0;
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
        long nanos = nanos(reading.timestamp(), channel);
        if (count > 0 && nanos < prevNanos) {
            throw new IllegalArgumentException("reading of " + channel + " at " + reading.timestamp()
                    + " is earlier than the previous one at " + instant(prevNanos)
                    + ": a history block takes readings in time order");
        }
        double value = reading.value();
        TimeResolution neededResolution = count == 0 ? resolution
                : TimeResolution.fitting(nanos - prevNanos, resolution);
        int neededCoding = neededCoding(value);
        if (neededResolution != resolution || neededCoding != coding) {
            reencode(neededResolution, neededCoding);
        }
        write(nanos, value);
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
        byte[] data = serialize();
        return new HistoryBlock(label(), channel, unit, instant(firstNanos), instant(prevNanos), count, data);
    }

    /** The block so far, after which the encoder starts an empty block of the same channel. */
    public HistoryBlock seal() {
        HistoryBlock block = snapshot();
        clear();
        runs.clear();
        resolution = TimeResolution.SECOND;
        coding = initialCoding();
        return block;
    }

    private String label() {
        return channel + " from " + instant(firstNanos);
    }

    private int neededCoding(double value) {
        if (coding == BlockFormat.XOR_CODING || BlockFormat.decimal(value, coding)) {
            return coding;
        }
        for (int scale = coding + 1; scale <= BlockFormat.MAX_SCALE; scale++) {
            if (BlockFormat.decimal(value, scale)) {
                return scale;
            }
        }
        int escapesAfter = escapes + 1;
        if (escapesAfter >= ESCAPES_BEFORE_XOR && escapesAfter * 4L > count + 1L) {
            return BlockFormat.XOR_CODING;
        }
        return coding;
    }

    private void reencode(TimeResolution newResolution, int newCoding) {
        List<Reading> previous = count == 0 ? List.of() : BlockDecoder.readings(snapshot());
        clear();
        resolution = newResolution;
        coding = newCoding;
        for (Reading reading : previous) {
            write(nanos(reading.timestamp(), channel), reading.value());
        }
    }

    private void clear() {
        bits = new BitWriter(256);
        count = 0;
        prevDelta = 0;
        prevLeading = -1;
        prevTrailing = 0;
        prevInteger = 0;
        haveEscape = false;
        escapes = 0;
    }

    private void write(long nanos, double value) {
        if (count == 0) {
            firstNanos = nanos;
        } else {
            long delta = (nanos - prevNanos) / resolution.nanos;
            writeDeltaOfDelta(delta - prevDelta);
            prevDelta = delta;
        }
        prevNanos = nanos;
        if (coding == BlockFormat.XOR_CODING) {
            writeXor(Double.doubleToRawLongBits(value));
        } else {
            writeDecimal(value);
        }
        count++;
    }

    /** Gorilla's variable-length delta-of-delta, with a 64-bit escape so nanosecond steps of any size stay exact. */
    private void writeDeltaOfDelta(long dod) {
        if (dod == 0) {
            bits.writeBit(false);
        } else if (fits(dod, 7)) {
            bits.write(0b10, 2);
            bits.write(dod, 7);
        } else if (fits(dod, 9)) {
            bits.write(0b110, 3);
            bits.write(dod, 9);
        } else if (fits(dod, 12)) {
            bits.write(0b1110, 4);
            bits.write(dod, 12);
        } else if (fits(dod, 32)) {
            bits.write(0b11110, 5);
            bits.write(dod, 32);
        } else {
            bits.write(0b11111, 5);
            bits.write(dod, 64);
        }
    }

    private void writeXor(long valueBits) {
        if (count == 0) {
            bits.write(valueBits, 64);
            prevValueBits = valueBits;
            return;
        }
        long xor = valueBits ^ prevValueBits;
        prevValueBits = valueBits;
        if (xor == 0) {
            bits.writeBit(false);
            return;
        }
        int leading = Math.min(31, Long.numberOfLeadingZeros(xor));
        int trailing = Long.numberOfTrailingZeros(xor);
        if (prevLeading >= 0 && leading >= prevLeading && trailing >= prevTrailing) {
            bits.write(0b10, 2);
            bits.write(xor >>> prevTrailing, 64 - prevLeading - prevTrailing);
        } else {
            int significant = 64 - leading - trailing;
            bits.write(0b11, 2);
            bits.write(leading, 5);
            bits.write(significant & 63, 6);
            bits.write(xor >>> trailing, significant);
            prevLeading = leading;
            prevTrailing = trailing;
        }
    }

    private void writeDecimal(double value) {
        if (!BlockFormat.decimal(value, coding)) {
            long raw = Double.doubleToRawLongBits(value);
            bits.write(0b11111, 5);
            if (haveEscape && raw == prevEscapeBits) {
                bits.writeBit(false);
            } else {
                bits.writeBit(true);
                bits.write(raw, 64);
            }
            haveEscape = true;
            prevEscapeBits = raw;
            escapes++;
            return;
        }
        long integer = BlockFormat.decimalInteger(value, coding);
        long delta = integer - prevInteger;
        prevInteger = integer;
        if (delta == 0) {
            bits.writeBit(false);
        } else if (fits(delta, 6)) {
            bits.write(0b10, 2);
            bits.write(delta, 6);
        } else if (fits(delta, 12)) {
            bits.write(0b110, 3);
            bits.write(delta, 12);
        } else if (fits(delta, 24)) {
            bits.write(0b1110, 4);
            bits.write(delta, 24);
        } else {
            bits.write(0b11110, 5);
            bits.write(delta, 64);
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
        byte[] stream = bits.toByteArray();
        ByteArrayOutputStream out = new ByteArrayOutputStream(64 + stream.length);
        out.writeBytes(BlockFormat.MAGIC);
        out.write(BlockFormat.VERSION);
        writeInt(out, 0);
        out.write(resolution.code);
        out.write(coding);
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
        writeVarint(out, bits.bitLength());
        out.writeBytes(stream);
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
