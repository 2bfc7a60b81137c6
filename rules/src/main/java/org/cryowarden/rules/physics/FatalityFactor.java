package org.cryowarden.rules.physics;

/**
 * The probability that someone exposed to an oxygen fraction dies of it, as the ODH method uses it. Source:
 * Fermilab ES&H Manual (FESHM) chapter 4240, Oxygen Deficiency Hazards: F = 1 at or below 8.8 % oxygen,
 * F = 10^(6.5 - 76 C) between 8.8 % and 18 %, F = 0 at or above 18 % (the exponential commonly fitted to the
 * manual's curve; it steps at both ends, from 1 to 0.65 at 8.8 % and from 6.6e-8 to 0 at 18 %).
 */
public final class FatalityFactor {

    public static final double CERTAIN_FRACTION = 0.088;
    public static final double SAFE_FRACTION = 0.18;

    private FatalityFactor() {
    }

    /**
     * @param oxygenFraction oxygen by volume, 0 to 1
     * @throws OutOfRangeException outside 0 to 1, or NaN
     */
    public static double of(double oxygenFraction) {
        RangeCheck.finite("oxygen fraction", oxygenFraction);
        if (oxygenFraction < 0 || oxygenFraction > 1) {
            throw new OutOfRangeException("oxygen fraction " + RangeCheck.format(oxygenFraction) + " is outside 0 to 1");
        }
        if (oxygenFraction <= CERTAIN_FRACTION) {
            return 1;
        }
        if (oxygenFraction >= SAFE_FRACTION) {
            return 0;
        }
        return Math.pow(10, 6.5 - 76 * oxygenFraction);
    }
}
