package org.cryowarden.simulator.model;

/**
 * Saturated vapour pressure of nitrogen and its inverse, by the vapour-pressure ancillary equation of
 * R. Span, E. W. Lemmon, R. T. Jacobsen, W. Wagner and A. Yokozeki, A reference equation of state for the
 * thermodynamic properties of nitrogen for temperatures from 63.151 to 1000 K and pressures to 2200 MPa,
 * J. Phys. Chem. Ref. Data 29 (2000) 1361, p. 1368:
 * {@code ln(p/pc) = (Tc/T) (N1 t + N2 t^1.5 + N3 t^2.5 + N4 t^5)}, {@code t = 1 - T/Tc}, Tc = 126.192 K,
 * pc = 3.3958 MPa, from the triple point (63.151 K) to the critical point.
 *
 * <p>The rules module has no nitrogen saturation curve yet, so the simulator carries this one; it belongs in
 * {@code org.cryowarden.rules.physics} beside the ITS-90 helium equations.
 */
public final class NitrogenSaturation {

    public static final double CRITICAL_KELVIN = 126.192;
    public static final double CRITICAL_PASCAL = 3.3958e6;
    public static final double TRIPLE_KELVIN = 63.151;

    private static final double N1 = -6.12445284;
    private static final double N2 = 1.26327220;
    private static final double N3 = -0.765910082;
    private static final double N4 = -1.77570564;

    /** Vapour pressure at the triple point, the lowest pressure with a liquid. */
    public static final double TRIPLE_PASCAL = pressure(TRIPLE_KELVIN);

    private NitrogenSaturation() {
    }

    /** Saturated vapour pressure in Pa at a temperature between the triple and the critical point. */
    public static double pressure(double kelvin) {
        if (!(kelvin >= TRIPLE_KELVIN && kelvin <= CRITICAL_KELVIN)) {
            throw new IllegalArgumentException("nitrogen temperature " + kelvin
                    + " K is outside the saturation curve 63.151 K to 126.192 K");
        }
        double t = 1 - kelvin / CRITICAL_KELVIN;
        double sum = N1 * t + N2 * Math.pow(t, 1.5) + N3 * Math.pow(t, 2.5) + N4 * Math.pow(t, 5);
        return CRITICAL_PASCAL * Math.exp(CRITICAL_KELVIN / kelvin * sum);
    }

    /** Saturation temperature in K at an absolute pressure, by bisection on {@link #pressure} (to 1 µK). */
    public static double temperature(double pascal) {
        if (!(pascal >= TRIPLE_PASCAL && pascal <= CRITICAL_PASCAL)) {
            throw new IllegalArgumentException("nitrogen pressure " + pascal
                    + " Pa is outside the saturation curve (triple point to critical point)");
        }
        double lo = TRIPLE_KELVIN;
        double hi = CRITICAL_KELVIN;
        while (hi - lo > 1e-7) {
            double mid = 0.5 * (lo + hi);
            if (pressure(mid) < pascal) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return 0.5 * (lo + hi);
    }
}
