package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.model.DerivedChannelDef;

/**
 * A channel computed by a built-in function from other channels; it has a value only when every input has
 * reported once. Its quality is the worst of its inputs (BAD worse than STALE worse than UNCERTAIN worse than GOOD),
 * except for aggregate functions (min, max, mean): with some inputs BAD or STALE they are computed over the others
 * and the result is UNCERTAIN, so that one dead sensor does not blind a rule to what the others read (an UNCERTAIN
 * reading can raise an alarm but never clear one). A physics function whose input is outside its equation's range
 * gives a BAD reading whose reason names the range.
 */
final class DerivedChannel extends ChannelNode {

    private final DerivedChannelDef def;
    private final ChannelNode[] inputs;
    private final BoundFunction function;
    private final double[] values;
    private final boolean[] usable;

    DerivedChannel(DerivedChannelDef def, ChannelNode[] inputs, BoundFunction function) {
        super(def.id(), def.unit());
        this.def = def;
        this.inputs = inputs;
        this.function = function;
        this.values = new double[inputs.length];
        this.usable = new boolean[inputs.length];
    }

    /** The new reading after {@code trigger} arrived on an input, or null while an input has never reported. */
    Reading recompute(Reading trigger) {
        Reading worst = null;
        int usableCount = 0;
        for (int i = 0; i < inputs.length; i++) {
            Reading input = inputs[i].latest;
            if (input == null) {
                return null;
            }
            if (worst == null || rank(input.quality()) > rank(worst.quality())) {
                worst = input;
            }
            values[i] = input.value();
            usable[i] = input.quality() == Quality.GOOD || input.quality() == Quality.UNCERTAIN;
            if (usable[i]) {
                usableCount++;
            }
        }
        Quality quality = worst.quality();
        String inherited = quality.isGood() ? "" : "from " + Texts.reading(worst);
        boolean partial = usableCount < inputs.length;
        if (partial && !(function.aggregate() && usableCount > 0)) {
            return new Reading(id, Double.NaN, unit, trigger.timestamp(), quality, inherited);
        }
        double value;
        try {
            value = partial ? function.applyUsable(values, usable) : function.apply(values);
        } catch (IllegalArgumentException outOfRange) {
            return Reading.bad(id, unit, trigger.timestamp(), def.function() + ": " + outOfRange.getMessage());
        }
        if (!Double.isFinite(value)) {
            return Reading.bad(id, unit, trigger.timestamp(), def.function() + " has no value for these inputs");
        }
        if (partial) {
            return new Reading(id, value, unit, trigger.timestamp(), Quality.UNCERTAIN,
                    "over " + usableCount + " of " + inputs.length + " inputs; " + inherited);
        }
        return new Reading(id, value, unit, trigger.timestamp(), quality, inherited);
    }

    private static int rank(Quality quality) {
        switch (quality) {
            case GOOD:
                return 0;
            case UNCERTAIN:
                return 1;
            case STALE:
                return 2;
            default:
                return 3;
        }
    }
}
