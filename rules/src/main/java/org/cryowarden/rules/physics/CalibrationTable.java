package org.cryowarden.rules.physics;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;

/**
 * A sensor calibration table of (raw, value) points, interpolated with a monotone piecewise cubic that never
 * overshoots: between two points the curve stays between their values, and it is monotone wherever the data
 * are. Method: M. Steffen, A simple method for monotonic interpolation in one dimension, Astronomy and
 * Astrophysics 239 (1990) 443-450 (interior slopes eq. 11, end slopes eqs. 26-27). Optionally the same in
 * ln(raw), ln(value) space. Outside the table there is no value: an {@link OutOfRangeException}, or a BAD
 * reading through {@link #convert(Reading)}.
 *
 * <p>Raw values may rise or fall along the table (diode voltages fall as temperature rises); they are sorted
 * and must be distinct.
 */
public final class CalibrationTable {

    private final List<CalibrationPoint> points;
    private final Interpolation interpolation;
    private final Unit rawUnit;
    private final Unit valueUnit;
    private final double[] x;
    private final double[] y;
    private final double[] slope;

    /**
     * @throws IllegalArgumentException for fewer than two points, repeated raw values, non-finite numbers, or
     *                                  points that are not positive in a log-log table
     */
    public CalibrationTable(List<CalibrationPoint> points, Interpolation interpolation, Unit rawUnit, Unit valueUnit) {
        Objects.requireNonNull(interpolation, "interpolation");
        this.rawUnit = Objects.requireNonNull(rawUnit, "rawUnit");
        this.valueUnit = Objects.requireNonNull(valueUnit, "valueUnit");
        this.interpolation = interpolation;
        if (points.size() < 2) {
            throw new IllegalArgumentException("a calibration table needs at least 2 points, got " + points.size());
        }
        List<CalibrationPoint> sorted = new ArrayList<>(points);
        sorted.sort(Comparator.comparingDouble(CalibrationPoint::raw));
        for (int i = 0; i < sorted.size(); i++) {
            CalibrationPoint point = sorted.get(i);
            if (!Double.isFinite(point.raw()) || !Double.isFinite(point.value())) {
                throw new IllegalArgumentException("calibration point (" + point.raw() + ", " + point.value()
                        + ") is not a pair of finite numbers");
            }
            if (interpolation == Interpolation.LOG_LOG && (point.raw() <= 0 || point.value() <= 0)) {
                throw new IllegalArgumentException("a log-log table needs positive raw values and values, got ("
                        + RangeCheck.format(point.raw()) + ", " + RangeCheck.format(point.value()) + ")");
            }
            if (i > 0 && sorted.get(i - 1).raw() == point.raw()) {
                throw new IllegalArgumentException("raw value " + RangeCheck.format(point.raw())
                        + " appears twice in the calibration table");
            }
        }
        this.points = List.copyOf(sorted);
        int n = sorted.size();
        x = new double[n];
        y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = interpolation == Interpolation.LOG_LOG ? Math.log(sorted.get(i).raw()) : sorted.get(i).raw();
            y[i] = interpolation == Interpolation.LOG_LOG ? Math.log(sorted.get(i).value()) : sorted.get(i).value();
        }
        slope = steffenSlopes(x, y);
    }

    public List<CalibrationPoint> points() {
        return points;
    }

    public Interpolation interpolation() {
        return interpolation;
    }

    public Unit rawUnit() {
        return rawUnit;
    }

    public Unit valueUnit() {
        return valueUnit;
    }

    public double minRaw() {
        return points.get(0).raw();
    }

    public double maxRaw() {
        return points.get(points.size() - 1).raw();
    }

    /**
     * The calibrated value at a raw reading.
     *
     * @throws OutOfRangeException outside the table's raw range, or for NaN
     */
    public double value(double raw) {
        RangeCheck.finite("raw value", raw);
        if (raw < minRaw() || raw > maxRaw()) {
            throw new OutOfRangeException("raw value " + RangeCheck.format(raw) + " " + rawUnit.symbol()
                    + " is outside the calibration table " + RangeCheck.format(minRaw()) + " " + rawUnit.symbol()
                    + " to " + RangeCheck.format(maxRaw()) + " " + rawUnit.symbol());
        }
        double t = interpolation == Interpolation.LOG_LOG ? Math.log(raw) : raw;
        int i = interval(t);
        double h = x[i + 1] - x[i];
        double s = (t - x[i]) / h;
        double h00 = (1 + 2 * s) * (1 - s) * (1 - s);
        double h10 = s * (1 - s) * (1 - s);
        double h01 = s * s * (3 - 2 * s);
        double h11 = s * s * (s - 1);
        double result = h00 * y[i] + h10 * h * slope[i] + h01 * y[i + 1] + h11 * h * slope[i + 1];
        // Steffen's slopes keep the cubic between the two values; the clamp only removes rounding (1 ulp)
        result = Math.max(Math.min(y[i], y[i + 1]), Math.min(Math.max(y[i], y[i + 1]), result));
        return interpolation == Interpolation.LOG_LOG ? Math.exp(result) : result;
    }

    /**
     * A raw reading turned into a calibrated one: same channel and time, the value unit; a raw reading that
     * is not GOOD keeps its quality and reason, and one outside the table becomes BAD with the range as reason.
     */
    public Reading convert(Reading raw) {
        if (!raw.quality().isGood()) {
            return new Reading(raw.channel(), Double.NaN, valueUnit, raw.timestamp(), raw.quality(), raw.reason());
        }
        double rawValue = raw.unit() == rawUnit ? raw.value() : raw.unit().convert(raw.value(), rawUnit, 0);
        try {
            return Reading.good(raw.channel(), value(rawValue), valueUnit, raw.timestamp());
        } catch (OutOfRangeException outside) {
            return new Reading(raw.channel(), Double.NaN, valueUnit, raw.timestamp(), Quality.BAD, outside.getMessage());
        }
    }

    private int interval(double t) {
        int lo = 0;
        int hi = x.length - 1;
        while (hi - lo > 1) {
            int mid = (lo + hi) >>> 1;
            if (x[mid] <= t) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    /** Steffen (1990) slopes: eq. 11 inside, eqs. 26-27 at the ends; linear for two points. */
    private static double[] steffenSlopes(double[] x, double[] y) {
        int n = x.length;
        double[] h = new double[n - 1];
        double[] s = new double[n - 1];
        for (int i = 0; i < n - 1; i++) {
            h[i] = x[i + 1] - x[i];
            s[i] = (y[i + 1] - y[i]) / h[i];
        }
        double[] d = new double[n];
        if (n == 2) {
            d[0] = s[0];
            d[1] = s[0];
            return d;
        }
        for (int i = 1; i < n - 1; i++) {
            double p = (s[i - 1] * h[i] + s[i] * h[i - 1]) / (h[i - 1] + h[i]);
            d[i] = (Math.signum(s[i - 1]) + Math.signum(s[i]))
                    * Math.min(Math.min(Math.abs(s[i - 1]), Math.abs(s[i])), 0.5 * Math.abs(p));
        }
        d[0] = endSlope(s[0], s[1], h[0], h[1]);
        d[n - 1] = endSlope(s[n - 2], s[n - 3], h[n - 2], h[n - 3]);
        return d;
    }

    private static double endSlope(double sEnd, double sNext, double hEnd, double hNext) {
        double p = sEnd * (1 + hEnd / (hEnd + hNext)) - sNext * hEnd / (hEnd + hNext);
        if (p * sEnd <= 0) {
            return 0;
        }
        if (Math.abs(p) > 2 * Math.abs(sEnd)) {
            return 2 * sEnd;
        }
        return p;
    }
}
