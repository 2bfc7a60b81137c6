package org.cryowarden.daemon.history;

import java.util.Arrays;

/**
 * Appends bits most significant first into a growing byte buffer: the output side of the history block's bit
 * stream. Single-threaded.
 */
final class BitWriter {

    private byte[] buffer;
    private long bits;

    BitWriter() {
        this(64);
    }

    BitWriter(int initialBytes) {
        buffer = new byte[Math.max(8, initialBytes)];
    }

    /** Appends the low {@code count} bits of {@code value}, the most significant of them first. */
    void write(long value, int count) {
        if (count < 0 || count > 64) {
            throw new IllegalArgumentException("bit count must be 0 to 64, got " + count);
        }
        ensure(bits + count);
        int remaining = count;
        while (remaining > 0) {
            int index = (int) (bits >>> 3);
            int free = 8 - (int) (bits & 7);
            int take = Math.min(free, remaining);
            int chunk = (int) (value >>> (remaining - take)) & ((1 << take) - 1);
            buffer[index] |= (byte) (chunk << (free - take));
            remaining -= take;
            bits += take;
        }
    }

    void writeBit(boolean bit) {
        ensure(bits + 1);
        if (bit) {
            buffer[(int) (bits >>> 3)] |= (byte) (0x80 >>> (bits & 7));
        }
        bits++;
    }

    /** Number of bits written so far. */
    long bitLength() {
        return bits;
    }

    /** The bytes holding every bit written so far; the unused low bits of the last byte are zero. */
    byte[] toByteArray() {
        return Arrays.copyOf(buffer, (int) ((bits + 7) >>> 3));
    }

    void clear() {
        Arrays.fill(buffer, 0, (int) Math.min(buffer.length, (bits + 7) >>> 3), (byte) 0);
        bits = 0;
    }

    private void ensure(long neededBits) {
        long neededBytes = (neededBits + 7) >>> 3;
        if (neededBytes > buffer.length) {
            if (neededBytes > Integer.MAX_VALUE - 16) {
                throw new IllegalStateException("history block bit stream too large: " + neededBits + " bits");
            }
            buffer = Arrays.copyOf(buffer, (int) Math.max(neededBytes, Math.min(Integer.MAX_VALUE - 16L, buffer.length * 2L)));
        }
    }
}
