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
        return new BigDecimal(value).round(SIGNIFICANT).stripTrailingZeros().toPlainString();
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
