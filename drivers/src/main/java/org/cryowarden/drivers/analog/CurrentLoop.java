package org.cryowarden.drivers.analog;

import java.util.Locale;
import org.cryowarden.rules.Quality;

/**
 * A 4-20 mA transmitter loop: linear scaling of the loop current to the channel's unit (4 mA is {@code low},
 * 20 mA is {@code high}) and failure signalling after NAMUR NE 43: below 3.6 mA or above 21 mA the transmitter
 * signals a failure (BAD), 3.8-20.5 mA is the measuring range (GOOD), the bands between are UNCERTAIN. The band
 * limits are those of NAMUR Recommendation NE 43 (Standardization of the Signal Level for the Failure Information
 * of Digital Transmitters) as published summaries of it state them (e.g. instrunexus.com, "An Interactive Guide to
 * NAMUR NE 43"); the recommendation's own table has not been read.
 *
 * @param low  the value at 4 mA, in the channel's unit
 * @param high the value at 20 mA, in the channel's unit (may be below {@code low} for reverse-acting loops)
 */
public record CurrentLoop(double low, double high) {

    /** Below this the loop signals a failure (NE 43). */
    public static final double FAILURE_LOW_MA = 3.6;
    /** Above this the loop signals a failure (NE 43). */
    public static final double FAILURE_HIGH_MA = 21.0;
    /** Lower end of the measuring range, under-range included (NE 43). */
    public static final double RANGE_LOW_MA = 3.8;
    /** Upper end of the measuring range, over-range included (NE 43). */
    public static final double RANGE_HIGH_MA = 20.5;

    public CurrentLoop {
        if (!Double.isFinite(low) || !Double.isFinite(high) || low == high) {
            throw new IllegalArgumentException("a 4-20 mA range needs two different finite ends, got [" + low + ", "
                    + high + "]");
        }
    }

    /** The value in the channel's unit of a loop current, with its NE 43 quality. */
    public Value convert(double milliamps) {
        if (!Double.isFinite(milliamps)) {
            return new Value(Double.NaN, Quality.BAD, "loop current is not a number");
        }
        String current = String.format(Locale.ROOT, "%.2f mA", milliamps);
        if (milliamps < FAILURE_LOW_MA) {
            return new Value(Double.NaN, Quality.BAD, "sensor failure / wire break: loop current " + current
                    + " is below 3.6 mA (NAMUR NE 43)");
        }
        if (milliamps > FAILURE_HIGH_MA) {
            return new Value(Double.NaN, Quality.BAD, "sensor failure / wire break: loop current " + current
                    + " is above 21 mA (NAMUR NE 43)");
        }
        double value = low + (milliamps - 4.0) / 16.0 * (high - low);
        if (!Double.isFinite(value)) {
            return new Value(Double.NaN, Quality.BAD, "loop current " + current + " scales to a value too large to "
                    + "represent on the range [" + low + ", " + high + "]");
        }
        if (milliamps < RANGE_LOW_MA || milliamps > RANGE_HIGH_MA) {
            return new Value(value, Quality.UNCERTAIN, "loop current " + current
                    + " is outside the measuring range 3.8-20.5 mA (NAMUR NE 43)");
        }
        return new Value(value, Quality.GOOD, "");
    }

    /** The loop current that represents {@code value}; the simulator uses it to drive a loop. */
    public double milliampsFor(double value) {
        return 4.0 + (value - low) / (high - low) * 16.0;
    }

    /** A converted loop value; {@code value} is NaN when BAD. */
    public record Value(double value, Quality quality, String reason) {
    }
}
