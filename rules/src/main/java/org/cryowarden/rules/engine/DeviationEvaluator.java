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
    private final double[] values;
    private final boolean[] good;

    DeviationEvaluator(AlarmRuntime alarm, ChannelNode[] channels, double tolerance, double ambientPa) {
        super(alarm);
        this.channels = channels;
        this.unit = channels[0].unit;
        this.tolerance = tolerance;
        this.toleranceText = Texts.quantity(tolerance, unit);
        this.ambientPa = ambientPa;
        this.values = new double[channels.length];
        this.good = new boolean[channels.length];
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        onInput(node, indexOf(node), reading);
    }

    @Override
    void onInput(ChannelNode node, int i, Reading reading) {
        saw(node);
        if (reading.quality() == Quality.GOOD) {
            good[i] = true;
            values[i] = node.unit == unit ? reading.value() : node.unit.convert(reading.value(), unit, ambientPa);
        } else {
            good[i] = false;
        }
        int lowest = -1;
        int highest = -1;
        int goodCount = 0;
        for (int j = 0; j < channels.length; j++) {
            if (good[j]) {
                goodCount++;
                if (lowest < 0 || values[j] < values[lowest]) {
                    lowest = j;
                }
                if (highest < 0 || values[j] > values[highest]) {
                    highest = j;
                }
            }
        }
        if (goodCount < 2) {
            return;
        }
        double spread = values[highest] - values[lowest];
        boolean past = spread > tolerance;
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
