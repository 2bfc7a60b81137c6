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

    BoundFunction(DerivedFunction function, Unit[] from, Unit[] to, Unit resultUnit, Unit channelUnit,
            double[] parameters, double ambientPa) {
        this.function = function;
        this.from = from;
        this.to = to;
        this.resultUnit = resultUnit;
        this.channelUnit = channelUnit;
        this.parameters = parameters;
        this.ambientPa = ambientPa;
        this.scratch = new double[from.length];
    }

    /** The result in the channel's unit, from input values in their channels' units; NaN where undefined. */
    double apply(double[] inputs) {
        for (int i = 0; i < inputs.length; i++) {
            scratch[i] = from[i] == to[i] ? inputs[i] : from[i].convert(inputs[i], to[i], ambientPa);
        }
        double result = function.apply(scratch, parameters);
        return resultUnit == channelUnit ? result : resultUnit.convert(result, channelUnit, ambientPa);
    }
}
