package org.cryowarden.daemon.history;

/**
 * Reads bits most significant first from a byte range, refusing to read past the stated bit length: the input side
 * of the history block's bit stream. Single-threaded.
 */
final class BitReader {

    /** Reading past the end of the bit stream: the block is truncated or corrupt. */
    static final class EndOfBits extends Exception {
        EndOfBits(String message) {
            super(message, null, false, false);
        }
    }

    private final byte[] data;
    private final int offset;
    private final long bitLength;
    private long position;

    /** Reads {@code bitLength} bits starting at byte {@code offset} of {@code data}. */
    BitReader(byte[] data, int offset, long bitLength) {
        if (offset < 0 || bitLength < 0 || offset + ((bitLength + 7) >>> 3) > data.length) {
            throw new IllegalArgumentException("bit range " + offset + "+" + bitLength + " bits outside "
                    + data.length + " bytes");
        }
        this.data = data;
        this.offset = offset;
        this.bitLength = bitLength;
    }

    /** Reads {@code count} bits (0 to 64) as the low bits of a long. */
    long read(int count) throws EndOfBits {
        if (position + count > bitLength) {
            throw new EndOfBits("needs " + count + " bits at bit " + position + " of " + bitLength);
        }
        long result = 0;
        int remaining = count;
        while (remaining > 0) {
            int index = offset + (int) (position >>> 3);
            int used = (int) (position & 7);
            int available = 8 - used;
            int take = Math.min(available, remaining);
            int chunk = ((data[index] & 0xFF) >>> (available - take)) & ((1 << take) - 1);
            result = (result << take) | chunk;
            remaining -= take;
            position += take;
        }
        return result;
    }

    boolean readBit() throws EndOfBits {
        if (position >= bitLength) {
            throw new EndOfBits("needs 1 bit at bit " + position + " of " + bitLength);
        }
        int index = offset + (int) (position >>> 3);
        boolean bit = (data[index] & (0x80 >>> (position & 7))) != 0;
        position++;
        return bit;
    }

    long position() {
        return position;
    }

    long bitLength() {
        return bitLength;
    }
}
