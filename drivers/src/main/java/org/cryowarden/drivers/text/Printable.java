package org.cryowarden.drivers.text;

/** Device text made safe for a reason or a log line: control characters escaped, length bounded. */
public final class Printable {

    private static final int MAX_SHOWN = 60;

    private Printable() {
    }

    /** "12.5\r" becomes "12.5\\r"; text over 60 characters is cut and marked with "...". */
    public static String of(String text) {
        StringBuilder out = new StringBuilder(Math.min(text.length(), MAX_SHOWN) + 8);
        for (int i = 0; i < text.length() && i < MAX_SHOWN; i++) {
            char c = text.charAt(i);
            switch (c) {
                case '\r' -> out.append("\\r");
                case '\n' -> out.append("\\n");
                case '\t' -> out.append("\\t");
                default -> {
                    if (c < 0x20 || (c >= 0x7F && c < 0xA0)) {
                        out.append(String.format("\\x%02X", (int) c));
                    } else {
                        out.append(c);
                    }
                }
            }
        }
        if (text.length() > MAX_SHOWN) {
            out.append("...");
        }
        return out.toString();
    }
}
