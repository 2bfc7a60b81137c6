package org.cryowarden.drivers.modbus;

/**
 * The CRC-16 of a Modbus RTU frame: polynomial 0x8005 reflected (0xA001), initial value 0xFFFF, sent low byte
 * first. Source: Modbus over Serial Line Specification and Implementation Guide V1.02, §2.5.1.2 and
 * Appendix B (CRC generation).
 */
public final class ModbusCrc {

    private static final int[] TABLE = new int[256];

    static {
        for (int i = 0; i < 256; i++) {
            int crc = i;
            for (int bit = 0; bit < 8; bit++) {
                crc = (crc & 1) != 0 ? (crc >>> 1) ^ 0xA001 : crc >>> 1;
            }
            TABLE[i] = crc;
        }
    }

    private ModbusCrc() {
    }

    /** The CRC of {@code length} bytes from {@code offset}, as a 16-bit value (low byte is sent first). */
    public static int compute(byte[] bytes, int offset, int length) {
        int crc = 0xFFFF;
        for (int i = offset; i < offset + length; i++) {
            crc = (crc >>> 8) ^ TABLE[(crc ^ bytes[i]) & 0xFF];
        }
        return crc;
    }

    /** True when the last two of {@code length} bytes are the CRC of the bytes before them. */
    public static boolean isValid(byte[] frame, int length) {
        if (length < 3) {
            return false;
        }
        int crc = compute(frame, 0, length - 2);
        return (frame[length - 2] & 0xFF) == (crc & 0xFF) && (frame[length - 1] & 0xFF) == (crc >>> 8);
    }

    /** A copy of {@code body} with its CRC appended, low byte first: a complete RTU frame. */
    public static byte[] append(byte[] body) {
        byte[] frame = new byte[body.length + 2];
        System.arraycopy(body, 0, frame, 0, body.length);
        int crc = compute(body, 0, body.length);
        frame[body.length] = (byte) crc;
        frame[body.length + 1] = (byte) (crc >>> 8);
        return frame;
    }
}
