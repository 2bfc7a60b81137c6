package org.cryowarden.rules.engine;

/**
 * One built-in function of a derived channel. Inputs arrive in the units its catalogue entry declares (or all in
 * the derived channel's unit, for the same-unit functions such as {@code mean}), parameters likewise, and the
 * result is in the entry's output unit. Return NaN where the function is undefined (e.g. a pressure outside an
 * equation's range); the engine turns that into a BAD reading.
 */
@FunctionalInterface
public interface DerivedFunction {

    double apply(double[] inputs, double[] parameters);
}
