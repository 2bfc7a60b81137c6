package org.cryowarden.rules.trend;

import java.util.Arrays;

/**
 * The Theil-Sen line: the slope is the median of the slopes between every pair of points, the intercept the
 * median of {@code y - slope * x}. Up to about 29 % of the points can be arbitrarily wrong (a spike, a probe
 * that read full for one poll) before the slope moves far, where one bad point already drags a least-squares
 * slope.
 *
 * <p>Sources: H. Theil, "A rank-invariant method of linear and polynomial regression analysis", Proc. Royal
 * Netherlands Academy of Sciences 53 (1950) 386-392, 521-525, 1397-1412; P. K. Sen, "Estimates of the regression
 * coefficient based on Kendall's tau", J. Amer. Statist. Assoc. 63 (1968) 1379-1389. The median is the middle
 * value, or the mean of the two middle values for an even count.
 *
 * <p>Cost: n(n-1)/2 slopes and a linear-time selection, so callers keep n bounded (a few hundred points).
 */
public final class TheilSen {

    /** A fitted line {@code y = intercept + slope * x}. */
    public record Line(double slope, double intercept) {

        public double at(double x) {
            return intercept + slope * x;
        }
    }

    private double[] scratch = new double[0];

    /**
     * Fits {@code count} points. Pairs with equal x are skipped; with fewer than two distinct x there is no slope.
     *
     * @return the line, or null when no pair of points has distinct x
     */
    public Line fit(double[] x, double[] y, int count) {
        int pairs = count * (count - 1) / 2;
        if (scratch.length < Math.max(pairs, count)) {
            scratch = new double[Math.max(pairs, count)];
        }
        int m = 0;
        for (int i = 0; i < count; i++) {
            for (int j = i + 1; j < count; j++) {
                double dx = x[j] - x[i];
                if (dx != 0) {
                    scratch[m++] = (y[j] - y[i]) / dx;
                }
            }
        }
        if (m == 0) {
            return null;
        }
        double slope = median(scratch, m);
        for (int i = 0; i < count; i++) {
            scratch[i] = y[i] - slope * x[i];
        }
        return new Line(slope, median(scratch, count));
    }

    /** One-shot convenience: fits all points of {@code x} and {@code y}. */
    public static Line of(double[] x, double[] y) {
        if (x.length != y.length) {
            throw new IllegalArgumentException("x and y differ in length: " + x.length + " and " + y.length);
        }
        return new TheilSen().fit(x, y, x.length);
    }

    /** The median of the first {@code n} values (reordered in place), by quickselect. */
    static double median(double[] values, int n) {
        int upper = n / 2;
        double high = select(values, n, upper);
        if (n % 2 == 1) {
            return high;
        }
        // After selecting index `upper`, every value left of it is <= high: the lower middle is their maximum.
        double low = values[0];
        for (int i = 1; i < upper; i++) {
            low = Math.max(low, values[i]);
        }
        return (low + high) / 2;
    }

    /** The k-th smallest (0-based) of the first n values; partitions the array around it. */
    private static double select(double[] a, int n, int k) {
        int left = 0;
        int right = n - 1;
        while (left < right) {
            // Median of three as pivot: deterministic, and linear on sorted input.
            int mid = (left + right) >>> 1;
            double pivot = medianOfThree(a[left], a[mid], a[right]);
            int i = left;
            int j = right;
            while (i <= j) {
                while (a[i] < pivot) {
                    i++;
                }
                while (a[j] > pivot) {
                    j--;
                }
                if (i <= j) {
                    double t = a[i];
                    a[i] = a[j];
                    a[j] = t;
                    i++;
                    j--;
                }
            }
            if (k <= j) {
                right = j;
            } else if (k >= i) {
                left = i;
            } else {
                return a[k];
            }
        }
        return a[k];
    }

    private static double medianOfThree(double a, double b, double c) {
        return Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
    }

    /** For tests: the median of a copy. */
    static double medianOf(double... values) {
        double[] copy = Arrays.copyOf(values, values.length);
        return median(copy, copy.length);
    }
}
