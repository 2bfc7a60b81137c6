package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.model.DerivedChannelDef;

/**
 * A channel computed by a built-in function from other channels. Its quality is the worst of its inputs (BAD worse
 * than STALE worse than UNCERTAIN worse than GOOD); it has a value only when every input has reported once.
 */
final class DerivedChannel extends ChannelNode {

    private final DerivedChannelDef def;
    private final ChannelNode[] inputs;
    private final BoundFunction function;
    private final double[] values;

    DerivedChannel(DerivedChannelDef def, ChannelNode[] inputs, BoundFunction function) {
        super(def.id(), def.unit());
        this.def = def;
        this.inputs = inputs;
        this.function = function;
        this.values = new double[inputs.length];
    }

    /** The new reading after {@code trigger} arrived on an input, or null while an input has never reported. */
    Reading recompute(Reading trigger) {
        Reading worst = null;
        for (int i = 0; i < inputs.length; i++) {
            Reading input = inputs[i].latest;
            if (input == null) {
                return null;
            }
            if (worst == null || rank(input.quality()) > rank(worst.quality())) {
                worst = input;
            }
            values[i] = input.value();
        }
        Quality quality = worst.quality();
        String inherited = quality.isGood() ? "" : "from " + Texts.reading(worst);
        if (quality == Quality.BAD || quality == Quality.STALE) {
            return new Reading(id, Double.NaN, unit, trigger.timestamp(), quality, inherited);
        }
        double value = function.apply(values);
        if (!Double.isFinite(value)) {
            return Reading.bad(id, unit, trigger.timestamp(), def.function() + " has no value for these inputs");
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
