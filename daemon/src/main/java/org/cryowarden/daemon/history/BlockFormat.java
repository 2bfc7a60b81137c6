package org.cryowarden.daemon.history;

import org.cryowarden.rules.Quality;

/**
 * The layout of a history block, version 1, shared by {@link BlockEncoder} and {@link BlockDecoder}.
 *
 * <pre>
 *  4 bytes  magic "CWHB"
 *  1 byte   format version (1)
 *  4 bytes  total block length in bytes, big-endian, including this prefix and the checksum
 *  1 byte   time resolution code (0 ns, 1 µs, 2 ms, 3 s)
 *  1 byte   value coding: 0xFF Gorilla XOR, else the decimal scale d (values are k / 10^d)
 *  varint + UTF-8   channel id
 *  varint + UTF-8   unit symbol
 *  varint   reading count
 *  8 bytes  first timestamp, nanoseconds since the epoch, big-endian
 *  8 bytes  last timestamp, same
 *  varint   number of quality runs, then per run: varint length, 1 byte quality, varint + UTF-8 reason
 *  varint   bit length of the reading stream, then its bytes
 *  4 bytes  CRC-32C of every byte before it
 * </pre>
 *
 * Varints are unsigned LEB128. Per reading the bit stream holds the timestamp's delta-of-delta, then the value.
 */
final class BlockFormat {

    static final byte[] MAGIC = {'C', 'W', 'H', 'B'};
    static final int VERSION = 1;
    /** Magic, version and total length: what must be there before anything else can be judged. */
    static final int PREFIX_BYTES = 9;
    static final int CHECKSUM_BYTES = 4;
    static final int XOR_CODING = 0xFF;
    /** Largest decimal scale tried: 10^15 is still an exact double, and k stays within 2^53. */
    static final int MAX_SCALE = 15;
    static final long MAX_EXACT_INTEGER = 1L << 53;

    static final double[] POWERS_OF_TEN = new double[MAX_SCALE + 1];

    static {
        double power = 1;
        for (int d = 0; d <= MAX_SCALE; d++) {
            POWERS_OF_TEN[d] = power;
            power *= 10;
        }
    }

    private BlockFormat() {
    }

    /** Whether {@code value} is exactly {@code k / 10^scale} for an integer k within 2^53 (then the integer). */
    static boolean decimal(double value, int scale) {
        double scaled = value * POWERS_OF_TEN[scale];
        double k = Math.rint(scaled);
        if (!(Math.abs(k) <= MAX_EXACT_INTEGER)) {
            return false;
        }
        long integer = (long) k;
        return Double.doubleToRawLongBits(integer / POWERS_OF_TEN[scale]) == Double.doubleToRawLongBits(value);
    }

    static long decimalInteger(double value, int scale) {
        return (long) Math.rint(value * POWERS_OF_TEN[scale]);
    }

    static int qualityCode(Quality quality) {
        return switch (quality) {
            case GOOD -> 0;
            case UNCERTAIN -> 1;
            case BAD -> 2;
            case STALE -> 3;
        };
    }

    /** The quality of a stored code; null when the code is unknown. */
    static Quality quality(int code) {
        return switch (code) {
            case 0 -> Quality.GOOD;
            case 1 -> Quality.UNCERTAIN;
            case 2 -> Quality.BAD;
            case 3 -> Quality.STALE;
            default -> null;
        };
    }
}
