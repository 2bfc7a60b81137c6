package org.cryowarden.rules.physics;

/**
 * One ITS-90 helium vapour-pressure equation, {@code T90/K = A0 + sum Ai ((ln(p/Pa) - B) / C)^i}, with its
 * temperature range; the inverse (p from T) is found numerically. Source: ITS-90, H. Preston-Thomas,
 * Metrologia 27 (1990) 3-10, equation (3) and Table 3.
 */
final class Its90VapourEquation {

    /** The inversion stops when the T90 of the pressure found is this close to the target, far inside 0.01 mK. */
    private static final double INVERSION_TOLERANCE_KELVIN = 1e-12;

    /** The search for ln p stays where the scaled variable is within +-1.2, around each published range. */
    private static final double SEARCH_HALF_WIDTH = 1.2;

    private final double[] a;
    private final double b;
    private final double c;
    private final double minKelvin;
    private final double maxKelvin;
    private final double minLogPascal;
    private final double maxLogPascal;

    Its90VapourEquation(double[] a, double b, double c, double minKelvin, double maxKelvin) {
        this.a = a.clone();
        this.b = b;
        this.c = c;
        this.minKelvin = minKelvin;
        this.maxKelvin = maxKelvin;
        double low = b - SEARCH_HALF_WIDTH * c;
        double high = b + SEARCH_HALF_WIDTH * c;
        this.minLogPascal = solveLogPressure(minKelvin, low, high);
        this.maxLogPascal = solveLogPressure(maxKelvin, low, high);
    }

    double minKelvin() {
        return minKelvin;
    }

    double maxKelvin() {
        return maxKelvin;
    }

    double minPascal() {
        return Math.exp(minLogPascal);
    }

    double maxPascal() {
        return Math.exp(maxLogPascal);
    }

    /** T90 of the equation at a pressure; the caller has checked the range. */
    double temperature(double pascal) {
        return temperatureAtLog(Math.log(pascal));
    }

    /** The pressure whose T90 is {@code kelvin}; the caller has checked the range. */
    double pressure(double kelvin) {
        return Math.exp(solveLogPressure(kelvin, minLogPascal, maxLogPascal));
    }

    private double temperatureAtLog(double logPascal) {
        double x = (logPascal - b) / c;
        double sum = 0;
        for (int i = a.length - 1; i >= 0; i--) {
            sum = sum * x + a[i];
        }
        return sum;
    }

    private double slopeAtLog(double logPascal) {
        double x = (logPascal - b) / c;
        double sum = 0;
        for (int i = a.length - 1; i >= 1; i--) {
            sum = sum * x + i * a[i];
        }
        return sum / c;
    }

    /** Newton's method on ln p, kept inside a shrinking bracket (bisection when a step would leave it). */
    private double solveLogPressure(double kelvin, double low, double high) {
        double lo = low;
        double hi = high;
        double x = 0.5 * (lo + hi);
        for (int iteration = 0; iteration < 200; iteration++) {
            double error = temperatureAtLog(x) - kelvin;
            if (Math.abs(error) < INVERSION_TOLERANCE_KELVIN) {
                return x;
            }
            if (error > 0) {
                hi = x;
            } else {
                lo = x;
            }
            double slope = slopeAtLog(x);
            double next = slope > 0 ? x - error / slope : Double.NaN;
            if (!(next > lo && next < hi)) {
                next = 0.5 * (lo + hi);
            }
            if (next == x) {
                return x;
            }
            x = next;
        }
        return x;
    }
}
