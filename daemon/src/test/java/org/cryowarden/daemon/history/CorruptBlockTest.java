package org.cryowarden.daemon.history;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Arrays;
import java.util.HexFormat;
import java.util.List;
import java.util.zip.CRC32C;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.junit.jupiter.api.Test;

/** A damaged, truncated or foreign block is refused with a message naming it; no reading of it is ever returned. */
class CorruptBlockTest {

    private static final String LABEL = "journal.db row 42";

    @Test
    void flippedBitAnywhereIsAChecksumMismatch() {
        byte[] data = block().toBytes();
        for (int bit = 9 * 8; bit < (data.length - 4) * 8; bit += 7) {
            byte[] damaged = data.clone();
            damaged[bit / 8] ^= (byte) (0x80 >>> (bit % 8));
            assertThatThrownBy(() -> HistoryBlock.parse(LABEL, damaged).readings())
                    .isInstanceOf(CorruptBlockException.class)
                    .hasMessage("history block journal.db row 42: checksum mismatch (stored 0x" + hex(stored(damaged))
                            + ", computed 0x" + hex(computed(damaged)) + "): the block is damaged");
        }
    }

    @Test
    void truncatedBlockSaysHowMuchIsThere() {
        byte[] data = block().toBytes();
        byte[] truncated = Arrays.copyOf(data, 57);

        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, truncated))
                .isInstanceOf(CorruptBlockException.class)
                .hasMessage("history block journal.db row 42: truncated: 57 of " + data.length + " bytes");
        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, Arrays.copyOf(data, 6)))
                .hasMessage("history block journal.db row 42: truncated: 6 bytes, shorter than the 9-byte prefix");
        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, new byte[0]))
                .hasMessage("history block journal.db row 42: truncated: 0 bytes, shorter than the 9-byte prefix");
    }

    @Test
    void bytesAfterTheEndAreRefused() {
        byte[] data = block().toBytes();
        byte[] longer = Arrays.copyOf(data, data.length + 3);

        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, longer))
                .hasMessage("history block journal.db row 42: 3 bytes follow its end at byte " + data.length);
    }

    @Test
    void foreignBytesAreNotAHistoryBlock() {
        byte[] sqliteHeader = "SQLite format 3\0".getBytes(java.nio.charset.StandardCharsets.US_ASCII);

        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, sqliteHeader))
                .hasMessage("history block journal.db row 42: not a history block (starts with 0x53514c69, "
                        + "expected \"CWHB\")");
    }

    @Test
    void newerFormatVersionIsRefusedByNumber() {
        byte[] data = block().toBytes();
        data[4] = 3;

        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, data))
                .hasMessage("history block journal.db row 42: format version 3 is not one this build reads "
                        + "(it reads versions 1 and 2)");
    }

    @Test
    void reSealedBlockWithACutReadingStreamIsRefusedNotMisread() {
        byte[] data = block().toBytes();
        // The last byte of the value stream (the bits of readings 19 and 20) sits just before the checksum; rebuild the block without it, fixing the
        // declared stream length and the checksum, as a buggy writer might.
        HistoryBlock original = HistoryBlock.parse(LABEL, data);
        assertThat(original.count()).isEqualTo(20);
        int streamEnd = data.length - 4;
        int bitLengthAt = varintStart(data, streamEnd);
        long bitLength = readVarint(data, bitLengthAt);
        byte[] cut = new byte[data.length - 1];
        System.arraycopy(data, 0, cut, 0, streamEnd - 1);
        writeVarintInPlace(cut, bitLengthAt, bitLength - 8, varintLength(data, bitLengthAt));
        reseal(cut);

        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, cut).readings())
                .isInstanceOf(CorruptBlockException.class)
                .hasMessage("history block journal.db row 42: corrupt: the streams of o2_a end inside "
                        + "reading 19 of 20");
    }

    @Test
    void reSealedBlockWithAWrongCountIsRefused() {
        byte[] data = block().toBytes();
        int countAt = new String(data, java.nio.charset.StandardCharsets.ISO_8859_1).indexOf("o2_a") + "o2_a".length()
                + 1 + "%vol".length();
        assertThat(data[countAt]).isEqualTo((byte) 20);
        data[countAt] = 21;
        reseal(data);

        assertThatThrownBy(() -> HistoryBlock.parse(LABEL, data))
                .hasMessage("history block journal.db row 42: corrupt header: quality runs cover 20 readings but "
                        + "the block holds 21");
    }

    private static HistoryBlock block() {
        BlockEncoder encoder = new BlockEncoder("o2_a", Unit.PERCENT_VOLUME);
        List<Reading> readings = Series.oxygenCell(5).subList(0, 20);
        readings.forEach(encoder::append);
        return encoder.snapshot();
    }

    private static int stored(byte[] data) {
        int end = data.length - 4;
        return ((data[end] & 0xFF) << 24) | ((data[end + 1] & 0xFF) << 16) | ((data[end + 2] & 0xFF) << 8)
                | (data[end + 3] & 0xFF);
    }

    private static int computed(byte[] data) {
        CRC32C crc = new CRC32C();
        crc.update(data, 0, data.length - 4);
        return (int) crc.getValue();
    }

    private static String hex(int value) {
        return HexFormat.of().toHexDigits(value);
    }

    /** Rewrites the declared length and the checksum of {@code data} in place. */
    private static void reseal(byte[] data) {
        int length = data.length;
        data[5] = (byte) (length >>> 24);
        data[6] = (byte) (length >>> 16);
        data[7] = (byte) (length >>> 8);
        data[8] = (byte) length;
        int checksum = computed(data);
        data[length - 4] = (byte) (checksum >>> 24);
        data[length - 3] = (byte) (checksum >>> 16);
        data[length - 2] = (byte) (checksum >>> 8);
        data[length - 1] = (byte) checksum;
    }

    /** Finds the stream's bit-length varint: the one whose value's byte count reaches exactly {@code streamEnd}. */
    private static int varintStart(byte[] data, int streamEnd) {
        for (int at = streamEnd - 1; at > 9; at--) {
            if (at > 0 && (data[at - 1] & 0x80) != 0) {
                continue;
            }
            long bits = readVarint(data, at);
            int length = varintLength(data, at);
            if (at + length + (bits + 7) / 8 == streamEnd && bits > 0) {
                return at;
            }
        }
        throw new AssertionError("no bit length found");
    }

    private static long readVarint(byte[] data, int at) {
        long result = 0;
        for (int shift = 0, i = at; ; shift += 7, i++) {
            result |= (long) (data[i] & 0x7F) << shift;
            if ((data[i] & 0x80) == 0) {
                return result;
            }
        }
    }

    private static int varintLength(byte[] data, int at) {
        int i = at;
        while ((data[i] & 0x80) != 0) {
            i++;
        }
        return i - at + 1;
    }

    private static void writeVarintInPlace(byte[] data, int at, long value, int length) {
        long rest = value;
        for (int i = 0; i < length; i++) {
            int b = (int) (rest & 0x7F);
            rest >>>= 7;
            data[at + i] = (byte) (i < length - 1 ? b | 0x80 : b);
        }
    }
}
