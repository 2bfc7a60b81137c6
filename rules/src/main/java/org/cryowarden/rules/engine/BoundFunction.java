package org.cryowarden.rules.engine;

import org.cryowarden.rules.Unit;

/** A derived function bound to one derived channel: the unit conversions around it and its parameter values. */
final class BoundFunction {

    private final DerivedFunction function;
    private final Unit[] from;
    private final Unit[] to;
    private final Unit resultUnit;
    private final Unit channelUnit;
    private final double[] parameters;
    private final double ambientPa;
    private final double[] scratch;
    private final boolean aggregate;

    BoundFunction(DerivedFunction function, Unit[] from, Unit[] to, Unit resultUnit, Unit channelUnit,
            double[] parameters, double ambientPa, boolean aggregate) {
        this.aggregate = aggregate;
        this.function = function;
        this.from = from;
        this.to = to;
        this.resultUnit = resultUnit;
        this.channelUnit = channelUnit;
        this.parameters = parameters;
        this.ambientPa = ambientPa;
        this.scratch = new double[from.length];
    }

    /** Whether the function may be computed over the usable inputs alone. */
    boolean aggregate() {
        return aggregate;
    }

    /**
     * The result in the channel's unit, from input values in their channels' units; NaN where undefined.
     *
     * @throws IllegalArgumentException from a physics function whose input is outside its equation's range
     */
    double apply(double[] inputs) {
        for (int i = 0; i < inputs.length; i++) {
            scratch[i] = from[i] == to[i] ? inputs[i] : from[i].convert(inputs[i], to[i], ambientPa);
        }
        return result(function.apply(scratch, parameters));
    }

    /** Like {@link #apply(double[])} over the inputs marked usable only; at least one must be. */
    double applyUsable(double[] inputs, boolean[] usable) {
        int count = 0;
        for (int i = 0; i < inputs.length; i++) {
            if (usable[i]) {
                scratch[count++] = from[i] == to[i] ? inputs[i] : from[i].convert(inputs[i], to[i], ambientPa);
            }
        }
        return result(function.apply(java.util.Arrays.copyOf(scratch, count), parameters));
    }

    private double result(double value) {
        return resultUnit == channelUnit ? value : resultUnit.convert(value, channelUnit, ambientPa);
    }
}
