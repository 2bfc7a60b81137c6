package org.cryowarden.rules.engine;

import java.math.BigDecimal;
import java.math.MathContext;
import java.time.Duration;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/** How numbers, quantities and durations read in causes and refusals. */
final class Texts {

    private static final MathContext SIGNIFICANT = new MathContext(6);
    private static final double[] POWERS = new double[16];

    static {
        double power = 1;
        for (int i = 0; i < POWERS.length; i++) {
            POWERS[i] = power;
            power *= 10;
        }
    }

    private Texts() {
    }

    /** Up to six significant digits, no trailing zeros, no exponent: {@code 19.4}, {@code 0.000125}, {@code 101325}. */
    static String number(double value) {
        if (!Double.isFinite(value)) {
            return Double.toString(value);
        }
        if (value == 0) {
            return "0";
        }
        String fast = roundedFast(value);
        return fast != null ? fast : exact(value);
    }

    /** The exact decimal expansion of the double, rounded half up to six significant digits. */
    static String exact(double value) {
        return new BigDecimal(value).round(SIGNIFICANT).stripTrailingZeros().toPlainString();
    }

    /**
     * The same text as {@link #exact} without big-number arithmetic, or null when it cannot be sure: causes are
     * written on every alarm change, and the exact route costs a microsecond. One scaling by an exactly
     * representable power of ten errs by at most half an ulp of a number below 10^6 (about 1e-10), so the six
     * digits are certain unless the scaled value lies within 1e-9 of a rounding tie.
     */
    private static String roundedFast(double value) {
        double magnitude = Math.abs(value);
        if (!(magnitude >= 1e-9 && magnitude < 1e15)) {
            return null;
        }
        int exponent = (int) Math.floor(Math.log10(magnitude));
        int shift = 5 - exponent;
        if (shift < -15 || shift > 15) {
            return null;
        }
        double scaled = shift >= 0 ? magnitude * POWERS[shift] : magnitude / POWERS[-shift];
        if (scaled < 100_000 || scaled >= 1_000_000) {
            return null;
        }
        double whole = Math.floor(scaled);
        double fraction = scaled - whole;
        // Near a whole number either side rounds to it, and near a decade boundary either exponent gives the same
        // value; only near a tie can the error decide.
        if (Math.abs(fraction - 0.5) < 1e-9) {
            return null;
        }
        long digits = (long) whole + (fraction > 0.5 ? 1 : 0);
        int power = -shift;
        if (digits == 1_000_000) {
            digits = 100_000;
            power++;
        }
        while (digits % 10 == 0) {
            digits /= 10;
            power++;
        }
        String text = Long.toString(digits);
        StringBuilder out = new StringBuilder(24);
        if (value < 0) {
            out.append('-');
        }
        if (power >= 0) {
            out.append(text);
            for (int i = 0; i < power; i++) {
                out.append('0');
            }
        } else if (text.length() > -power) {
            int point = text.length() + power;
            out.append(text, 0, point).append('.').append(text, point, text.length());
        } else {
            out.append("0.");
            for (int i = 0; i < -power - text.length(); i++) {
                out.append('0');
            }
            out.append(text);
        }
        return out.toString();
    }

    static String quantity(double value, Unit unit) {
        return number(value) + " " + unit.symbol();
    }

    static String duration(Duration duration) {
        return DurationSyntax.format(duration);
    }

    static String nanos(long nanos) {
        return DurationSyntax.format(Duration.ofNanos(nanos));
    }

    /** A reading as a cause shows it: {@code o2_a 18.9 %vol}, or {@code o2_a BAD (no reply)}. */
    static String reading(Reading reading) {
        if (reading.quality().isGood()) {
            return reading.channel() + " " + quantity(reading.value(), reading.unit());
        }
        if (Double.isFinite(reading.value())) {
            return reading.channel() + " " + quantity(reading.value(), reading.unit()) + " " + reading.quality()
                    + (reading.reason().isEmpty() ? "" : " (" + reading.reason() + ")");
        }
        return reading.channel() + " " + reading.quality() + (reading.reason().isEmpty() ? "" : " (" + reading.reason() + ")");
    }
}
