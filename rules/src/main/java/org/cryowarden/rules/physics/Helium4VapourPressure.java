package org.cryowarden.rules.physics;

/**
 * Helium-4 bath temperature from its saturated vapour pressure and back, by the two ITS-90 helium-4
 * vapour-pressure equations: 1.25 K to 2.1768 K and 2.1768 K to 5.0 K. Source: The International Temperature
 * Scale of 1990, H. Preston-Thomas, Metrologia 27 (1990) 3-10, equation (3) and Table 3.
 *
 * <p>The two equations meet at the lambda point; the pressure there is taken from the upper equation and the
 * lower one is used strictly below it (they agree within 0.1 mK). Outside 1.25 K to 5.0 K there is no answer:
 * an {@link OutOfRangeException} names the range.
 */
public final class Helium4VapourPressure {

    /** T90 of the lambda point on the saturated vapour curve. */
    public static final double LAMBDA_KELVIN = 2.1768;
    public static final double MIN_KELVIN = 1.25;
    public static final double MAX_KELVIN = 5.0;

    static final Its90VapourEquation LOWER = new Its90VapourEquation(new double[] {
        1.392408, 0.527153, 0.166756, 0.050988, 0.026514, 0.001975, -0.017976, 0.005409, 0.013259, 0},
            5.6, 2.9, MIN_KELVIN, LAMBDA_KELVIN);
    static final Its90VapourEquation UPPER = new Its90VapourEquation(new double[] {
        3.146631, 1.357655, 0.413923, 0.091159, 0.016349, 0.001826, -0.004325, -0.004973, 0, 0},
            10.3, 1.9, LAMBDA_KELVIN, MAX_KELVIN);

    /** Vapour pressure at 1.25 K, the lowest pressure accepted. */
    public static final double MIN_PASCAL = LOWER.minPascal();
    /** Vapour pressure at the lambda point (from the upper equation). */
    public static final double LAMBDA_PASCAL = UPPER.minPascal();
    /** Vapour pressure at 5.0 K, the highest pressure accepted. */
    public static final double MAX_PASCAL = UPPER.maxPascal();

    private Helium4VapourPressure() {
    }

    /**
     * The bath temperature and phase at an absolute vapour pressure.
     *
     * @throws OutOfRangeException outside the vapour pressures of 1.25 K to 5.0 K, or for NaN
     */
    public static HeliumSaturation temperature(double measuredPascal) {
        double pascal = RangeCheck.snapToBounds(measuredPascal, MIN_PASCAL, MAX_PASCAL);
        RangeCheck.finite("helium-4 vapour pressure", pascal);
        if (pascal < MIN_PASCAL || pascal > MAX_PASCAL) {
            throw new OutOfRangeException("pressure " + Pressures.describe(pascal)
                    + " is outside the ITS-90 helium-4 vapour-pressure range " + Pressures.describe(MIN_PASCAL)
                    + " to " + Pressures.describe(MAX_PASCAL) + " (1.25 K to 5.0 K)");
        }
        if (pascal < LAMBDA_PASCAL) {
            return new HeliumSaturation(LOWER.temperature(pascal), pascal, HeliumPhase.HE_II);
        }
        return new HeliumSaturation(UPPER.temperature(pascal), pascal, HeliumPhase.HE_I);
    }

    /**
     * The saturated vapour pressure at a T90, by inverting the equation of that range (to far better than
     * 0.01 mK).
     *
     * @throws OutOfRangeException outside 1.25 K to 5.0 K, or for NaN
     */
    public static double pressure(double requestedKelvin) {
        double kelvin = RangeCheck.snapToBounds(requestedKelvin, MIN_KELVIN, MAX_KELVIN);
        checkTemperature(kelvin);
        return kelvin < LAMBDA_KELVIN ? LOWER.pressure(kelvin) : UPPER.pressure(kelvin);
    }

    /** He II below the lambda point, He I at and above it. */
    public static HeliumPhase phase(double requestedKelvin) {
        double kelvin = RangeCheck.snapToBounds(requestedKelvin, MIN_KELVIN, MAX_KELVIN);
        checkTemperature(kelvin);
        return kelvin < LAMBDA_KELVIN ? HeliumPhase.HE_II : HeliumPhase.HE_I;
    }

    private static void checkTemperature(double kelvin) {
        RangeCheck.finite("helium-4 bath temperature", kelvin);
        if (kelvin < MIN_KELVIN || kelvin > MAX_KELVIN) {
            throw new OutOfRangeException("temperature " + RangeCheck.format(kelvin)
                    + " K is outside the ITS-90 helium-4 vapour-pressure range 1.25 K to 5.0 K");
        }
    }
}
