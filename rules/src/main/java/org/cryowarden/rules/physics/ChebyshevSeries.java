package org.cryowarden.rules.physics;

/**
 * A calibration written as a Chebyshev series in a scaled variable, the form cryogenic sensor calibration
 * reports give for one range: {@code value = sum_{i=0..n} A_i T_i(k)} with
 * {@code k = ((Z - ZL) - (ZU - Z)) / (ZU - ZL)}, Z the raw reading or its log10, and T_i the Chebyshev
 * polynomials of the first kind, {@code T_i(k) = cos(i arccos k)} (M. Abramowitz and I. A. Stegun, Handbook of
 * Mathematical Functions, 22.3.15). The scaling and the convention that A_0 is not halved are common practice
 * in such reports; check a report's own convention before entering its coefficients. Outside ZL to ZU there is
 * no value.
 */
public final class ChebyshevSeries {

    private final double zLower;
    private final double zUpper;
    private final double[] coefficients;
    private final ChebyshevVariable variable;

    /**
     * @throws IllegalArgumentException unless ZL &lt; ZU and there is at least one finite coefficient
     */
    public ChebyshevSeries(double zLower, double zUpper, double[] coefficients, ChebyshevVariable variable) {
        if (!(zLower < zUpper) || !Double.isFinite(zLower) || !Double.isFinite(zUpper)) {
            throw new IllegalArgumentException("a Chebyshev range needs ZL < ZU, got ZL = " + zLower + ", ZU = " + zUpper);
        }
        if (coefficients.length == 0) {
            throw new IllegalArgumentException("a Chebyshev series needs at least one coefficient");
        }
        for (double coefficient : coefficients) {
            if (!Double.isFinite(coefficient)) {
                throw new IllegalArgumentException("Chebyshev coefficient " + coefficient + " is not a finite number");
            }
        }
        this.zLower = zLower;
        this.zUpper = zUpper;
        this.coefficients = coefficients.clone();
        this.variable = java.util.Objects.requireNonNull(variable, "variable");
    }

    public double zLower() {
        return zLower;
    }

    public double zUpper() {
        return zUpper;
    }

    /**
     * The calibrated value at a raw reading (Clenshaw's recurrence).
     *
     * @throws OutOfRangeException when Z is outside ZL to ZU, or the raw reading is not positive for a log series
     */
    public double value(double raw) {
        RangeCheck.finite("raw value", raw);
        if (variable == ChebyshevVariable.LOG10_RAW && raw <= 0) {
            throw new OutOfRangeException("raw value " + RangeCheck.format(raw)
                    + " must be positive for a series in log10 of the reading");
        }
        double z = variable == ChebyshevVariable.LOG10_RAW ? Math.log10(raw) : raw;
        if (z < zLower || z > zUpper) {
            String name = variable == ChebyshevVariable.LOG10_RAW ? "log10 of the reading" : "reading";
            throw new OutOfRangeException(name + " " + RangeCheck.format(z) + " is outside the Chebyshev fit range "
                    + RangeCheck.format(zLower) + " to " + RangeCheck.format(zUpper));
        }
        double k = ((z - zLower) - (zUpper - z)) / (zUpper - zLower);
        double next = 0;
        double after = 0;
        for (int i = coefficients.length - 1; i >= 1; i--) {
            double current = 2 * k * next - after + coefficients[i];
            after = next;
            next = current;
        }
        return k * next - after + coefficients[0];
    }
}
