package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * Redundant sensors that disagree: the spread (max - min) of the latest GOOD readings exceeds the tolerance. Values
 * are compared in the first channel's unit. With fewer than two GOOD readings there is nothing to compare and the
 * condition holds (the stale rules report the missing sensors).
 */
final class DeviationEvaluator extends RuleEvaluator {

    private final ChannelNode[] channels;
    private final Unit unit;
    private final double tolerance;
    private final String toleranceText;
    private final double ambientPa;
    /** The latest GOOD value of each channel in {@link #unit}, NaN where not GOOD: filled at each evaluation. */
    private final double[] values;
    /** Whether every channel is in {@link #unit}, so that a band in that unit holds for each of them. */
    private final boolean oneUnit;

    DeviationEvaluator(AlarmRuntime alarm, ChannelNode[] channels, double tolerance, double ambientPa) {
        super(alarm);
        this.channels = channels;
        this.unit = channels[0].unit;
        this.tolerance = tolerance;
        this.toleranceText = Texts.quantity(tolerance, unit);
        this.ambientPa = ambientPa;
        this.values = new double[channels.length];
        boolean same = true;
        for (ChannelNode channel : channels) {
            same &= channel.unit == unit;
        }
        this.oneUnit = same;
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        onInput(node, indexOf(node), reading);
    }

    @Override
    void onInput(ChannelNode node, int i, Reading reading) {
        // Each channel's latest reading is its node's: a reading this rule skipped (inside the band) is read here too.
        int lowest = -1;
        int highest = -1;
        int goodCount = 0;
        for (int j = 0; j < channels.length; j++) {
            Reading latest = channels[j].latest;
            double value = Double.NaN;
            if (latest != null && latest.quality() == Quality.GOOD) {
                ChannelNode channel = channels[j];
                value = channel.unit == unit ? latest.value() : channel.unit.convert(latest.value(), unit, ambientPa);
            }
            values[j] = value;
            if (value == value) {
                goodCount++;
                if (lowest < 0 || value < values[lowest]) {
                    lowest = j;
                }
                if (highest < 0 || value > values[highest]) {
                    highest = j;
                }
            }
        }
        if (goodCount < 2) {
            neverQuiet();
            return;
        }
        double spread = values[highest] - values[lowest];
        boolean past = spread > tolerance;
        double centre = (values[highest] + values[lowest]) / 2;
        // Short of half the tolerance by more than rounding could ever add to a difference of such values.
        double half = tolerance / 2 - (tolerance * 1e-9 + 4 * Math.ulp(Math.abs(centre) + tolerance));
        if (!past && goodCount == channels.length && oneUnit && half > 0 && spread / 2 <= half) {
            // Every value inside one band narrower than the tolerance, holding the present values, keeps the spread
            // within it; a channel that turns other than GOOD is evaluated, so the band may be shared.
            for (int j = 0; j < channels.length; j++) {
                quietBetween(j, centre - half, centre + half);
            }
        } else {
            neverQuiet();
        }
        if (past != raw) {
            change(past, reading, past
                    ? channels[highest].id + " and " + channels[lowest].id + " differ by " + Texts.quantity(spread, unit)
                            + ", more than the tolerance of " + toleranceText
                    : "spread back to " + Texts.quantity(spread, unit) + ", within the tolerance of "
                            + toleranceText);
        }
    }

    private int indexOf(ChannelNode node) {
        for (int i = 0; i < channels.length; i++) {
            if (channels[i] == node) {
                return i;
            }
        }
        throw new IllegalStateException(node.id + " is not an input of deviation " + alarm.id);
    }
}
