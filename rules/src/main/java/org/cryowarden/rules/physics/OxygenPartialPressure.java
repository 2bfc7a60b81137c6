package org.cryowarden.rules.physics;

/**
 * Oxygen partial pressure from a volume fraction and the barometric pressure (Dalton's law), which is what the
 * body and an electrochemical oxygen cell respond to: 20.9 % at altitude is less oxygen than at sea level.
 * Common practice.
 */
public final class OxygenPartialPressure {

    private OxygenPartialPressure() {
    }

    /**
     * Partial pressure in Pa.
     *
     * @param fraction       oxygen by volume, 0 to 1 (0.209 for fresh air)
     * @param barometricPascal absolute barometric pressure
     * @throws OutOfRangeException for a fraction outside 0 to 1 or a pressure that is not positive
     */
    public static double pascal(double fraction, double barometricPascal) {
        RangeCheck.finite("oxygen fraction", fraction);
        if (fraction < 0 || fraction > 1) {
            throw new OutOfRangeException("oxygen fraction " + RangeCheck.format(fraction) + " is outside 0 to 1");
        }
        RangeCheck.positive("barometric pressure", barometricPascal, "Pa");
        return fraction * barometricPascal;
    }
}
