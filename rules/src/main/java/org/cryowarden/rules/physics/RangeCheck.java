package org.cryowarden.rules.physics;

import java.util.Locale;

/** Guards and number formatting shared by the physics classes, so every range message reads the same way. */
final class RangeCheck {

    private RangeCheck() {
    }

    /** Rejects NaN and infinities with a message naming the quantity. */
    static double finite(String what, double value) {
        if (!Double.isFinite(value)) {
            throw new OutOfRangeException(what + " must be a finite number, got " + value);
        }
        return value;
    }

    static double positive(String what, double value, String unit) {
        finite(what, value);
        if (value <= 0) {
            throw new OutOfRangeException(what + " must be greater than 0 " + unit + ", got " + format(value) + " " + unit);
        }
        return value;
    }

    static double nonNegative(String what, double value, String unit) {
        finite(what, value);
        if (value < 0) {
            throw new OutOfRangeException(what + " must not be negative, got " + format(value) + " " + unit);
        }
        return value;
    }

    /**
     * A value a unit conversion left a few ulps outside a range bound ({@code 1123.15 K} is
     * {@code 850.0000000000001 °C}) is moved onto the bound; anything further out is returned unchanged for the
     * caller's range check to refuse. The tolerance, 1e-12 of the bound, is far below any measurement.
     */
    static double snapToBounds(double value, double min, double max) {
        if (value < min && value >= min - 1e-12 * Math.max(1, Math.abs(min))) {
            return min;
        }
        if (value > max && value <= max + 1e-12 * Math.max(1, Math.abs(max))) {
            return max;
        }
        return value;
    }

    /** Up to six significant digits, no exponent for everyday magnitudes, no trailing zeros: 114.77, 0.0012, 2e-07. */
    static String format(double value) {
        if (value == 0) {
            return "0";
        }
        double magnitude = Math.abs(value);
        String text;
        if (magnitude >= 1e-3 && magnitude < 1e7) {
            text = new java.math.BigDecimal(value).round(new java.math.MathContext(6)).stripTrailingZeros().toPlainString();
        } else {
            text = String.format(Locale.ROOT, "%.5g", value);
            if (text.contains("e")) {
                String mantissa = text.substring(0, text.indexOf('e'));
                String exponent = text.substring(text.indexOf('e'));
                if (mantissa.contains(".")) {
                    mantissa = mantissa.replaceAll("0+$", "").replaceAll("\\.$", "");
                }
                text = mantissa + exponent;
            }
        }
        return text;
    }

    /** A fixed number of decimals, for bounds where the digits matter (18.5201 ohm). */
    static String fixed(double value, int decimals) {
        return String.format(Locale.ROOT, "%." + decimals + "f", value);
    }
}
