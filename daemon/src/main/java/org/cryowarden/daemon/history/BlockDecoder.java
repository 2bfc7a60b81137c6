package org.cryowarden.daemon.history;

import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Optional;
import java.util.zip.CRC32C;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * Reads what {@link BlockEncoder} wrote: first the prefix, length and checksum (so a damaged or truncated block is
 * refused before any value is decoded), then the header, then the reading stream. Every failure is a
 * {@link CorruptBlockException} naming the block.
 */
final class BlockDecoder {

    private BlockDecoder() {
    }

    static HistoryBlock parse(String label, byte[] data) {
        if (data.length >= 4 && !startsWithMagic(data)) {
            throw new CorruptBlockException(label, "not a history block (starts with 0x"
                    + HexFormat.of().formatHex(data, 0, 4) + ", expected \"CWHB\")");
        }
        if (data.length < BlockFormat.PREFIX_BYTES) {
            throw new CorruptBlockException(label, "truncated: " + data.length + " bytes, shorter than the "
                    + BlockFormat.PREFIX_BYTES + "-byte prefix");
        }
        int version = data[4] & 0xFF;
        if (version != BlockFormat.VERSION && version != BlockFormat.VERSION_1) {
            throw new CorruptBlockException(label, "format version " + version
                    + " is not one this build reads (it reads versions " + BlockFormat.VERSION_1 + " and "
                    + BlockFormat.VERSION + ")");
        }
        long declared = readInt(data, 5) & 0xFFFFFFFFL;
        if (data.length < declared) {
            throw new CorruptBlockException(label, "truncated: " + data.length + " of " + declared + " bytes");
        }
        if (data.length > declared) {
            throw new CorruptBlockException(label, (data.length - declared) + " bytes follow its end at byte "
                    + declared);
        }
        if (declared < BlockFormat.PREFIX_BYTES + BlockFormat.CHECKSUM_BYTES) {
            throw new CorruptBlockException(label, "declared length of " + declared + " bytes is too short");
        }
        int end = data.length - BlockFormat.CHECKSUM_BYTES;
        CRC32C crc = new CRC32C();
        crc.update(data, 0, end);
        int computed = (int) crc.getValue();
        int stored = readInt(data, end);
        if (computed != stored) {
            throw new CorruptBlockException(label, "checksum mismatch (stored 0x" + HexFormat.of().toHexDigits(stored)
                    + ", computed 0x" + HexFormat.of().toHexDigits(computed) + "): the block is damaged");
        }
        try {
            return version == BlockFormat.VERSION_1 ? header(label, data, end) : headerV2(label, data, end);
        } catch (IndexOutOfBoundsException e) {
            throw new CorruptBlockException(label, "corrupt header: it runs past the end of the block");
        }
    }

    private static HistoryBlock header(String label, byte[] data, int end) {
        Cursor cursor = new Cursor(data, BlockFormat.PREFIX_BYTES, end);
        int resolutionCode = cursor.u8();
        TimeResolution resolution = TimeResolution.ofCode(resolutionCode);
        if (resolution == null) {
            throw new CorruptBlockException(label, "corrupt header: unknown time resolution code " + resolutionCode);
        }
        int coding = cursor.u8();
        if (coding != BlockFormat.XOR_CODING && coding > BlockFormat.MAX_SCALE) {
            throw new CorruptBlockException(label, "corrupt header: unknown value coding " + coding);
        }
        String channel = cursor.text(label);
        String symbol = cursor.text(label);
        Optional<Unit> unit = Unit.bySymbol(symbol);
        if (unit.isEmpty() || !unit.get().symbol().equals(symbol)) {
            throw new CorruptBlockException(label, "corrupt header: unknown unit '" + symbol + "'");
        }
        long count = cursor.varint();
        if (count < 1 || count > Integer.MAX_VALUE) {
            throw new CorruptBlockException(label, "corrupt header: reading count " + count);
        }
        long first = cursor.i64();
        long last = cursor.i64();
        if (last < first) {
            throw new CorruptBlockException(label, "corrupt header: last timestamp before the first");
        }
        runs(label, cursor, count);
        long bitLength = cursor.varint();
        long streamBytes = (bitLength + 7) >>> 3;
        if (bitLength < 0 || streamBytes != end - cursor.position) {
            throw new CorruptBlockException(label, "corrupt header: a reading stream of " + bitLength
                    + " bits does not fill the " + (end - cursor.position) + " bytes left");
        }
        return new HistoryBlock(label, channel, unit.get(), BlockEncoder.instant(first), BlockEncoder.instant(last),
                (int) count, data);
    }

    private static HistoryBlock headerV2(String label, byte[] data, int end) {
        Cursor cursor = new Cursor(data, BlockFormat.PREFIX_BYTES, end);
        int resolutionCode = cursor.u8();
        if (TimeResolution.ofCode(resolutionCode) == null) {
            throw new CorruptBlockException(label, "corrupt header: unknown time resolution code " + resolutionCode);
        }
        coding(label, cursor);
        String channel = cursor.text(label);
        String symbol = cursor.text(label);
        Optional<Unit> unit = Unit.bySymbol(symbol);
        if (unit.isEmpty() || !unit.get().symbol().equals(symbol)) {
            throw new CorruptBlockException(label, "corrupt header: unknown unit '" + symbol + "'");
        }
        long count = cursor.varint();
        if (count < 1 || count > Integer.MAX_VALUE) {
            throw new CorruptBlockException(label, "corrupt header: reading count " + count);
        }
        long first = cursor.i64();
        long last = cursor.i64();
        if (last < first) {
            throw new CorruptBlockException(label, "corrupt header: last timestamp before the first");
        }
        runs(label, cursor, count);
        for (String stream : new String[] {"time", "value"}) {
            long bitLength = cursor.varint();
            long streamBytes = (bitLength + 7) >>> 3;
            if (bitLength < 0 || streamBytes > end - cursor.position
                    || (stream.equals("value") && streamBytes != end - cursor.position)) {
                throw new CorruptBlockException(label, "corrupt header: a " + stream + " stream of " + bitLength
                        + " bits does not fit the " + (end - cursor.position) + " bytes left");
            }
            cursor.position += (int) streamBytes;
        }
        return new HistoryBlock(label, channel, unit.get(), BlockEncoder.instant(first), BlockEncoder.instant(last),
                (int) count, data);
    }

    private static ValueCoding coding(String label, Cursor cursor) {
        int code = cursor.u8();
        ValueCoding.Kind kind = ValueCoding.Kind.ofCode(code);
        if (kind == null) {
            throw new CorruptBlockException(label, "corrupt header: unknown value coding " + code);
        }
        if (kind == ValueCoding.Kind.XOR) {
            return ValueCoding.XOR;
        }
        long scale = cursor.varint();
        int ulps = cursor.u8();
        long step = cursor.varint();
        long zigzag = cursor.varint();
        long origin = (zigzag >>> 1) ^ -(zigzag & 1);
        long maxScale = kind == ValueCoding.Kind.DECIMAL ? ValueCoding.MAX_DECIMAL_SCALE
                : ValueCoding.MAX_BINARY_SCALE;
        if (scale > maxScale || ulps > 1 || step < 1 || step >= ValueCoding.MAX_EXACT_INTEGER
                || Math.abs(origin) >= ValueCoding.MAX_EXACT_INTEGER) {
            throw new CorruptBlockException(label, "corrupt header: " + kind.name().toLowerCase(java.util.Locale.ROOT)
                    + " lattice of scale " + scale + ", step " + step + ", origin " + origin + ", ulp flag " + ulps);
        }
        return new ValueCoding(kind, (int) scale, step, origin, ulps == 1);
    }

    private static void runs(String label, Cursor cursor, long count) {
        long runCount = cursor.varint();
        long covered = 0;
        for (long i = 0; i < runCount; i++) {
            long length = cursor.varint();
            int quality = cursor.u8();
            if (BlockFormat.quality(quality) == null) {
                throw new CorruptBlockException(label, "corrupt header: unknown quality code " + quality);
            }
            cursor.text(label);
            if (length < 1) {
                throw new CorruptBlockException(label, "corrupt header: empty quality run");
            }
            covered += length;
        }
        if (covered != count) {
            throw new CorruptBlockException(label, "corrupt header: quality runs cover " + covered
                    + " readings but the block holds " + count);
        }
    }

    /** Decodes every reading of a block that {@link #parse} accepted (or that an encoder made). */
    static List<Reading> readings(HistoryBlock block) {
        return (block.data()[4] & 0xFF) == BlockFormat.VERSION_1 ? readingsV1(block) : readingsV2(block);
    }

    private static List<Reading> readingsV2(HistoryBlock block) {
        byte[] data = block.data();
        String label = block.label();
        int end = data.length - BlockFormat.CHECKSUM_BYTES;
        Cursor cursor = new Cursor(data, BlockFormat.PREFIX_BYTES, end);
        TimeResolution resolution = TimeResolution.ofCode(cursor.u8());
        ValueCoding coding = coding(label, cursor);
        String channel = cursor.text(label);
        cursor.text(label);
        int count = (int) cursor.varint();
        long nanos = cursor.i64();
        long last = cursor.i64();
        int runCount = (int) cursor.varint();
        Quality[] qualities = new Quality[runCount];
        String[] reasons = new String[runCount];
        int[] lengths = new int[runCount];
        for (int i = 0; i < runCount; i++) {
            lengths[i] = (int) cursor.varint();
            qualities[i] = BlockFormat.quality(cursor.u8());
            reasons[i] = cursor.text(label);
        }
        long timeBits = cursor.varint();
        BitReader times = new BitReader(data, cursor.position, timeBits);
        cursor.position += (int) ((timeBits + 7) >>> 3);
        long valueBits = cursor.varint();
        BitReader valueIn = new BitReader(data, cursor.position, valueBits);
        ValueReader values = new ValueReader(coding, valueIn);
        Unit unit = block.unit();
        List<Reading> readings = new ArrayList<>(count);
        int run = 0;
        int leftInRun = lengths[0];
        long delta = 0;
        int index = 0;
        try {
            for (index = 0; index < count; index++) {
                if (index > 0) {
                    delta += deltaOfDelta(times);
                    nanos += delta * resolution.nanos;
                }
                double value = values.next();
                if (leftInRun == 0) {
                    run++;
                    leftInRun = lengths[run];
                }
                leftInRun--;
                readings.add(new Reading(channel, value, unit, BlockEncoder.instant(nanos), qualities[run],
                        reasons[run]));
            }
        } catch (BitReader.EndOfBits e) {
            throw new CorruptBlockException(label, "corrupt: the streams of " + channel
                    + " end inside reading " + (index + 1) + " of " + count);
        } catch (ValueReader.Malformed e) {
            throw new CorruptBlockException(label, "corrupt: reading " + (index + 1) + " of " + channel + " "
                    + e.getMessage());
        } catch (IllegalArgumentException e) {
            throw new CorruptBlockException(label, "corrupt: reading " + (index + 1) + " of " + channel
                    + " is not a valid reading (" + e.getMessage() + ")");
        }
        if (times.position() != timeBits || valueIn.position() != valueBits) {
            throw new CorruptBlockException(label, "corrupt: " + (timeBits - times.position() + valueBits
                    - valueIn.position()) + " bits follow the last reading of " + channel);
        }
        if (nanos != last) {
            throw new CorruptBlockException(label, "corrupt: the readings of " + channel + " end at "
                    + BlockEncoder.instant(nanos) + " but the header says " + BlockEncoder.instant(last));
        }
        return readings;
    }

    /** Version 1: one interleaved stream, XOR or an exact decimal scale; kept so older journals still replay. */
    private static List<Reading> readingsV1(HistoryBlock block) {
        byte[] data = block.data();
        String label = block.label();
        int end = data.length - BlockFormat.CHECKSUM_BYTES;
        Cursor cursor = new Cursor(data, BlockFormat.PREFIX_BYTES, end);
        TimeResolution resolution = TimeResolution.ofCode(cursor.u8());
        int coding = cursor.u8();
        String channel = cursor.text(label);
        cursor.text(label);
        int count = (int) cursor.varint();
        long nanos = cursor.i64();
        long last = cursor.i64();
        int runCount = (int) cursor.varint();
        Quality[] qualities = new Quality[runCount];
        String[] reasons = new String[runCount];
        int[] lengths = new int[runCount];
        for (int i = 0; i < runCount; i++) {
            lengths[i] = (int) cursor.varint();
            qualities[i] = BlockFormat.quality(cursor.u8());
            reasons[i] = cursor.text(label);
        }
        long bitLength = cursor.varint();
        BitReader in = new BitReader(data, cursor.position, bitLength);
        Unit unit = block.unit();
        List<Reading> readings = new ArrayList<>(count);
        int run = 0;
        int leftInRun = lengths[0];
        long delta = 0;
        long valueBits = 0;
        int leading = -1;
        int trailing = 0;
        long integer = 0;
        long escapeBits = 0;
        boolean haveEscape = false;
        int index = 0;
        try {
            for (index = 0; index < count; index++) {
                if (index > 0) {
                    delta += deltaOfDelta(in);
                    nanos += delta * resolution.nanos;
                }
                double value;
                if (coding == BlockFormat.XOR_CODING) {
                    if (index == 0) {
                        valueBits = in.read(64);
                    } else if (in.readBit()) {
                        if (!in.readBit()) {
                            if (leading < 0) {
                                throw new CorruptBlockException(label, "corrupt: reading " + (index + 1) + " of "
                                        + channel + " reuses a bit window that was never set");
                            }
                            valueBits ^= in.read(64 - leading - trailing) << trailing;
                        } else {
                            leading = (int) in.read(5);
                            int significant = (int) in.read(6);
                            if (significant == 0) {
                                significant = 64;
                            }
                            trailing = 64 - leading - significant;
                            if (trailing < 0) {
                                throw new CorruptBlockException(label, "corrupt: reading " + (index + 1) + " of "
                                        + channel + " has a bit window wider than 64 bits");
                            }
                            valueBits ^= in.read(significant) << trailing;
                        }
                    }
                    value = Double.longBitsToDouble(valueBits);
                } else {
                    int prefix = unary(in);
                    if (prefix == 5) {
                        if (in.readBit()) {
                            escapeBits = in.read(64);
                        } else if (!haveEscape) {
                            throw new CorruptBlockException(label, "corrupt: reading " + (index + 1) + " of "
                                    + channel + " repeats an escaped value before any");
                        }
                        haveEscape = true;
                        value = Double.longBitsToDouble(escapeBits);
                    } else {
                        integer += switch (prefix) {
                            case 0 -> 0;
                            case 1 -> signed(in.read(6), 6);
                            case 2 -> signed(in.read(12), 12);
                            case 3 -> signed(in.read(24), 24);
                            default -> in.read(64);
                        };
                        value = integer / BlockFormat.POWERS_OF_TEN[coding];
                    }
                }
                if (leftInRun == 0) {
                    run++;
                    leftInRun = lengths[run];
                }
                leftInRun--;
                readings.add(new Reading(channel, value, unit, BlockEncoder.instant(nanos), qualities[run],
                        reasons[run]));
            }
        } catch (BitReader.EndOfBits e) {
            throw new CorruptBlockException(label, "corrupt: the reading stream of " + channel
                    + " ends inside reading " + (index + 1) + " of " + count);
        } catch (IllegalArgumentException e) {
            throw new CorruptBlockException(label, "corrupt: reading " + (index + 1) + " of " + channel
                    + " is not a valid reading (" + e.getMessage() + ")");
        }
        if (in.position() != bitLength) {
            throw new CorruptBlockException(label, "corrupt: " + (bitLength - in.position())
                    + " bits follow the last reading of " + channel);
        }
        if (nanos != last) {
            throw new CorruptBlockException(label, "corrupt: the readings of " + channel + " end at "
                    + BlockEncoder.instant(nanos) + " but the header says " + BlockEncoder.instant(last));
        }
        return readings;
    }

    static long deltaOfDelta(BitReader in) throws BitReader.EndOfBits {
        return switch (unary(in)) {
            case 0 -> 0;
            case 1 -> signed(in.read(7), 7);
            case 2 -> signed(in.read(9), 9);
            case 3 -> signed(in.read(12), 12);
            case 4 -> signed(in.read(32), 32);
            default -> in.read(64);
        };
    }

    /** Counts leading one bits up to 5, consuming the terminating zero when there is one. */
    private static int unary(BitReader in) throws BitReader.EndOfBits {
        int ones = 0;
        while (ones < 5 && in.readBit()) {
            ones++;
        }
        return ones;
    }

    private static long signed(long bits, int width) {
        return (bits << (64 - width)) >> (64 - width);
    }

    private static boolean startsWithMagic(byte[] data) {
        for (int i = 0; i < BlockFormat.MAGIC.length; i++) {
            if (data[i] != BlockFormat.MAGIC[i]) {
                return false;
            }
        }
        return true;
    }

    private static int readInt(byte[] data, int at) {
        return ((data[at] & 0xFF) << 24) | ((data[at + 1] & 0xFF) << 16) | ((data[at + 2] & 0xFF) << 8)
                | (data[at + 3] & 0xFF);
    }

    /** Reads header fields from a byte range; reading past its end throws IndexOutOfBoundsException. */
    private static final class Cursor {
        final byte[] data;
        final int end;
        int position;

        Cursor(byte[] data, int position, int end) {
            this.data = data;
            this.position = position;
            this.end = end;
        }

        int u8() {
            check(1);
            return data[position++] & 0xFF;
        }

        long i64() {
            check(8);
            long high = readInt(data, position) & 0xFFFFFFFFL;
            long low = readInt(data, position + 4) & 0xFFFFFFFFL;
            position += 8;
            return (high << 32) | low;
        }

        long varint() {
            long result = 0;
            for (int shift = 0; shift < 64; shift += 7) {
                int b = u8();
                result |= (long) (b & 0x7F) << shift;
                if ((b & 0x80) == 0) {
                    return result;
                }
            }
            throw new IndexOutOfBoundsException("varint longer than 64 bits");
        }

        String text(String label) {
            long length = varint();
            if (length < 0 || length > end - position) {
                throw new IndexOutOfBoundsException("text of " + length + " bytes");
            }
            int start = position;
            position += (int) length;
            try {
                return StandardCharsets.UTF_8.newDecoder()
                        .onMalformedInput(CodingErrorAction.REPORT)
                        .onUnmappableCharacter(CodingErrorAction.REPORT)
                        .decode(java.nio.ByteBuffer.wrap(data, start, (int) length)).toString();
            } catch (CharacterCodingException e) {
                throw new CorruptBlockException(label, "corrupt header: text at byte " + start + " is not UTF-8");
            }
        }

        private void check(int bytes) {
            if (position + bytes > end) {
                throw new IndexOutOfBoundsException("needs " + bytes + " bytes at " + position);
            }
        }
    }
}
