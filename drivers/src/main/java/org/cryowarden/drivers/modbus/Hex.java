package org.cryowarden.drivers.modbus;

/** Frames as hex for reasons and {@code --verbose} output: "01 03 00 00 00 0A C5 CD". */
public final class Hex {

    private static final int MAX_SHOWN = 64;

    private Hex() {
    }

    /** The first {@code length} bytes, at most 64 of them, followed by "..." when cut. */
    public static String of(byte[] bytes, int length) {
        StringBuilder text = new StringBuilder(Math.min(length, MAX_SHOWN) * 3);
        for (int i = 0; i < Math.min(length, MAX_SHOWN); i++) {
            if (i > 0) {
                text.append(' ');
            }
            text.append(String.format("%02X", bytes[i] & 0xFF));
        }
        if (length > MAX_SHOWN) {
            text.append(" ...");
        }
        return text.toString();
    }

    public static String of(byte[] bytes) {
        return of(bytes, bytes.length);
    }

    /** Parses "01 03 00 00" or "01030000" into bytes; for tests and the simulator's scripts. */
    public static byte[] parse(String text) {
        String digits = text.replaceAll("\\s+", "");
        if (digits.length() % 2 != 0) {
            throw new IllegalArgumentException("odd number of hex digits in '" + text + "'");
        }
        byte[] bytes = new byte[digits.length() / 2];
        for (int i = 0; i < bytes.length; i++) {
            bytes[i] = (byte) Integer.parseInt(digits.substring(2 * i, 2 * i + 2), 16);
        }
        return bytes;
    }
}
