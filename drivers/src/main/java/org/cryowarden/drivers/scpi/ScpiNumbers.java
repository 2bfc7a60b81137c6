package org.cryowarden.drivers.scpi;

import java.util.Locale;
import java.util.regex.Pattern;

/**
 * Parsing and formatting of numeric response data: NR1 (integer), NR2 (explicit decimal point) and NR3
 * (exponent) after IEEE 488.2-1992, §8.7.2-§8.7.4, and the SCPI special values 9.91E37 (not a number) and
 * ±9.9E37 (overflow) after SCPI 1999, Volume 1, §7.2.1.
 */
public final class ScpiNumbers {

    /** The SCPI not-a-number value. */
    public static final double NOT_A_NUMBER = 9.91E37;
    /** The SCPI value for positive infinity / overflow; its negation is negative overflow. */
    public static final double OVERFLOW = 9.9E37;

    private static final Pattern NUMERIC = Pattern.compile("[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?");
    private static final int MAX_LENGTH = 64;

    private ScpiNumbers() {
    }

    /** Classifies one response field (surrounding spaces allowed); never throws on device text. */
    public static ScpiValue parse(String text) {
        String trimmed = text.strip();
        if (trimmed.length() > MAX_LENGTH || !NUMERIC.matcher(trimmed).matches()) {
            return new ScpiValue.Malformed(text);
        }
        double value = Double.parseDouble(trimmed);
        if (Math.abs(value - NOT_A_NUMBER) < 1e33) {
            return new ScpiValue.NotANumber();
        }
        if (value >= OVERFLOW || Double.isInfinite(value)) {
            return new ScpiValue.Overflow(true);
        }
        if (value <= -OVERFLOW) {
            return new ScpiValue.Overflow(false);
        }
        return new ScpiValue.Number(value);
    }

    /** NR3 text for an instrument's answer, e.g. "+7.735000E+01"; NaN becomes 9.91E+37, infinities ±9.9E+37. */
    public static String formatNr3(double value) {
        if (Double.isNaN(value)) {
            return "9.91E+37";
        }
        if (Double.isInfinite(value)) {
            return value > 0 ? "9.9E+37" : "-9.9E+37";
        }
        String text = String.format(Locale.ROOT, "%+.6E", value);
        return text;
    }
}
