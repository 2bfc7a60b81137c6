package org.cryowarden.drivers.modbus;

/**
 * Coil and discrete-input packing: the first bit is the least significant bit of the first byte, unused high
 * bits of the last byte are zero (Modbus Application Protocol Specification V1.1b3, §6.1).
 */
final class BitPacking {

    private BitPacking() {
    }

    static byte[] pack(int[] bits) {
        byte[] packed = new byte[(bits.length + 7) / 8];
        for (int i = 0; i < bits.length; i++) {
            if (bits[i] != 0) {
                packed[i / 8] |= (byte) (1 << (i % 8));
            }
        }
        return packed;
    }

    static int[] unpack(byte[] bytes, int offset, int count) {
        int[] bits = new int[count];
        for (int i = 0; i < count; i++) {
            bits[i] = (bytes[offset + i / 8] >> (i % 8)) & 1;
        }
        return bits;
    }
}
