package org.cryowarden.daemon.history;

import org.cryowarden.rules.Quality;

/**
 * The layout of a history block, shared by {@link BlockEncoder} and {@link BlockDecoder}. Version 2 (written):
 *
 * <pre>
 *  4 bytes  magic "CWHB"
 *  1 byte   format version (2)
 *  4 bytes  total block length in bytes, big-endian, including this prefix and the checksum
 *  1 byte   time resolution code (0 ns, 1 µs, 2 ms, 3 s)
 *  1 byte   value coding (0 Gorilla XOR, 1 decimal lattice, 2 binary lattice), for a lattice followed by:
 *             varint scale, 1 byte ulp flag (0/1), varint step, zigzag varint origin (see {@link ValueCoding})
 *  varint + UTF-8   channel id
 *  varint + UTF-8   unit symbol
 *  varint   reading count
 *  8 bytes  first timestamp, nanoseconds since the epoch, big-endian
 *  8 bytes  last timestamp, same
 *  varint   number of quality runs, then per run: varint length, 1 byte quality, varint + UTF-8 reason
 *  varint   bit length of the time stream (delta-of-delta per reading after the first), then its bytes
 *  varint   bit length of the value stream (see {@link ValueWriter}), then its bytes
 *  4 bytes  CRC-32C of every byte before it
 * </pre>
 *
 * Version 1 (read only, so journals written before version 2 still replay):
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
 * Varints are unsigned LEB128. In version 1, per reading the bit stream holds the timestamp's delta-of-delta, then the value.
 */
final class BlockFormat {

    static final byte[] MAGIC = {'C', 'W', 'H', 'B'};
    static final int VERSION = 2;
    static final int VERSION_1 = 1;
    /** Magic, version and total length: what must be there before anything else can be judged. */
    static final int PREFIX_BYTES = 9;
    static final int CHECKSUM_BYTES = 4;
    static final int XOR_CODING = 0xFF;
    /** Largest decimal scale of either version: 10^15 is still an exact double. */
    static final int MAX_SCALE = 15;

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
