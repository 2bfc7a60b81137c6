package org.cryowarden.rules.physics;

/**
 * Industrial platinum resistance thermometer, resistance from temperature and back, by the Callendar-Van
 * Dusen equation {@code R(t) = R0 [1 + A t + B t^2 + C (t - 100) t^3]} (C = 0 at and above 0 °C) from
 * -200 °C to 850 °C, for any R0 (Pt100, Pt1000, ...). Source: IEC 60751:2008, Industrial platinum resistance
 * thermometers and platinum temperature sensors, with A = 3.9083e-3, B = -5.775e-7, C = -4.183e-12.
 *
 * <p>The inverse is the closed-form root at and above 0 °C and Newton's method below it, exact to far better
 * than 1 mK. Resistances outside R(-200 °C) to R(850 °C) are refused, never extrapolated.
 */
public final class PlatinumResistanceThermometer {

    public static final double A = 3.9083e-3;
    public static final double B = -5.775e-7;
    public static final double C = -4.183e-12;
    public static final double MIN_CELSIUS = -200;
    public static final double MAX_CELSIUS = 850;

    private static final double NEWTON_TOLERANCE_CELSIUS = 1e-10;

    private final double r0Ohm;

    /** @param r0Ohm resistance at 0 °C, e.g. 100 for a Pt100 */
    public PlatinumResistanceThermometer(double r0Ohm) {
        this.r0Ohm = RangeCheck.positive("R0", r0Ohm, "ohm");
    }

    public static PlatinumResistanceThermometer pt100() {
        return new PlatinumResistanceThermometer(100);
    }

    public static PlatinumResistanceThermometer pt1000() {
        return new PlatinumResistanceThermometer(1000);
    }

    public double r0Ohm() {
        return r0Ohm;
    }

    public double minOhm() {
        return ratio(MIN_CELSIUS) * r0Ohm;
    }

    public double maxOhm() {
        return ratio(MAX_CELSIUS) * r0Ohm;
    }

    /**
     * The resistance at a temperature.
     *
     * @throws OutOfRangeException outside -200 °C to 850 °C, or for NaN
     */
    public double resistance(double requestedCelsius) {
        double celsius = requestedCelsius;
        RangeCheck.finite("PRT temperature", celsius);
        celsius = RangeCheck.snapToBounds(celsius, MIN_CELSIUS, MAX_CELSIUS);
        if (celsius < MIN_CELSIUS || celsius > MAX_CELSIUS) {
            throw new OutOfRangeException("temperature " + RangeCheck.format(celsius)
                    + " °C is outside the IEC 60751 range -200 °C to 850 °C");
        }
        return r0Ohm * ratio(celsius);
    }

    /**
     * The temperature in °C at a measured resistance.
     *
     * @throws OutOfRangeException outside R(-200 °C) to R(850 °C) for this R0, or for NaN
     */
    public double temperature(double measuredOhm) {
        double ohm = measuredOhm;
        RangeCheck.finite("PRT resistance", ohm);
        ohm = RangeCheck.snapToBounds(ohm, minOhm(), maxOhm());
        if (ohm < minOhm() || ohm > maxOhm()) {
            throw new OutOfRangeException("resistance " + RangeCheck.format(ohm) + " ohm is outside the IEC 60751 range "
                    + RangeCheck.fixed(minOhm(), 4) + " ohm to " + RangeCheck.fixed(maxOhm(), 4)
                    + " ohm (-200 °C to 850 °C) for R0 = " + RangeCheck.format(r0Ohm) + " ohm");
        }
        double w = ohm / r0Ohm;
        double t = quadraticRoot(w);
        if (w >= 1) {
            return t;
        }
        for (int iteration = 0; iteration < 50; iteration++) {
            double error = ratio(t) - w;
            double slope = A + 2 * B * t + C * (4 * t * t * t - 300 * t * t);
            double step = error / slope;
            t -= step;
            if (Math.abs(step) < NEWTON_TOLERANCE_CELSIUS) {
                break;
            }
        }
        return t;
    }

    /** R/R0 at t. */
    private static double ratio(double t) {
        double value = 1 + A * t + B * t * t;
        if (t < 0) {
            value += C * (t - 100) * t * t * t;
        }
        return value;
    }

    /** The root of 1 + A t + B t^2 = w, exact at and above 0 °C and the starting point below it. */
    private static double quadraticRoot(double w) {
        return (-A + Math.sqrt(A * A - 4 * B * (1 - w))) / (2 * B);
    }
}
