package org.cryowarden.rules.physics;

/**
 * Helium-3 bath temperature from its saturated vapour pressure and back, 0.65 K to 3.2 K, by the ITS-90
 * helium-3 vapour-pressure equation. Source: The International Temperature Scale of 1990, H. Preston-Thomas,
 * Metrologia 27 (1990) 3-10, equation (3) and Table 3.
 *
 * <p><b>The coefficients are from memory</b> and have not been checked against the published table; they agree
 * with the independent 1962 helium-3 scale within the few millikelvin the scales are known to differ by, which
 * catches a wrong digit in the leading terms but is no substitute for reading the table. Do not rely on this
 * class for calibration until someone has checked them.
 */
public final class Helium3VapourPressure {

    public static final double MIN_KELVIN = 0.65;
    public static final double MAX_KELVIN = 3.2;

    static final Its90VapourEquation EQUATION = new Its90VapourEquation(new double[] {
        1.053447, 0.980106, 0.676380, 0.372692, 0.151656, -0.002263, 0.006596, 0.088966, -0.004770, -0.054943},
            7.3, 4.3, MIN_KELVIN, MAX_KELVIN);

    public static final double MIN_PASCAL = EQUATION.minPascal();
    public static final double MAX_PASCAL = EQUATION.maxPascal();

    private Helium3VapourPressure() {
    }

    /**
     * The bath temperature at an absolute vapour pressure (the phase is always normal liquid in this range).
     *
     * @throws OutOfRangeException outside the vapour pressures of 0.65 K to 3.2 K, or for NaN
     */
    public static HeliumSaturation temperature(double measuredPascal) {
        double pascal = RangeCheck.snapToBounds(measuredPascal, MIN_PASCAL, MAX_PASCAL);
        RangeCheck.finite("helium-3 vapour pressure", pascal);
        if (pascal < MIN_PASCAL || pascal > MAX_PASCAL) {
            throw new OutOfRangeException("pressure " + Pressures.describe(pascal)
                    + " is outside the ITS-90 helium-3 vapour-pressure range " + Pressures.describe(MIN_PASCAL)
                    + " to " + Pressures.describe(MAX_PASCAL) + " (0.65 K to 3.2 K)");
        }
        return new HeliumSaturation(EQUATION.temperature(pascal), pascal, HeliumPhase.HE_I);
    }

    /**
     * The saturated vapour pressure at a T90.
     *
     * @throws OutOfRangeException outside 0.65 K to 3.2 K, or for NaN
     */
    public static double pressure(double requestedKelvin) {
        double kelvin = RangeCheck.snapToBounds(requestedKelvin, MIN_KELVIN, MAX_KELVIN);
        RangeCheck.finite("helium-3 bath temperature", kelvin);
        if (kelvin < MIN_KELVIN || kelvin > MAX_KELVIN) {
            throw new OutOfRangeException("temperature " + RangeCheck.format(kelvin)
                    + " K is outside the ITS-90 helium-3 vapour-pressure range 0.65 K to 3.2 K");
        }
        return EQUATION.pressure(kelvin);
    }
}
