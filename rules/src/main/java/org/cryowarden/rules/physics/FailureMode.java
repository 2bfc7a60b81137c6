package org.cryowarden.rules.physics;

import java.util.Objects;

/**
 * One way a room can lose oxygen, as an ODH assessment counts it: how often it happens and the lowest oxygen
 * fraction it leads to.
 *
 * @param name               what fails, in the user's words
 * @param ratePerHour        expected events per hour (P_i)
 * @param oxygenMinFraction  lowest oxygen fraction the event leads to, 0 to 1
 */
public record FailureMode(String name, double ratePerHour, double oxygenMinFraction) {

    public FailureMode {
        Objects.requireNonNull(name, "name");
        RangeCheck.nonNegative("failure rate of " + name, ratePerHour, "/h");
        RangeCheck.finite("oxygen fraction of " + name, oxygenMinFraction);
        if (oxygenMinFraction < 0 || oxygenMinFraction > 1) {
            throw new OutOfRangeException("oxygen fraction of " + name + " is outside 0 to 1");
        }
    }

    /** F_i at this mode's oxygen minimum. */
    public double fatalityFactor() {
        return FatalityFactor.of(oxygenMinFraction);
    }

    /** P_i F_i, this mode's share of the fatality rate, per hour. */
    public double fatalityRatePerHour() {
        return ratePerHour * fatalityFactor();
    }
}
