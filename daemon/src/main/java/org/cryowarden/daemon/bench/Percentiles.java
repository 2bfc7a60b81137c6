package org.cryowarden.daemon.bench;

import java.util.Arrays;

/** p50, p99 and max of latency samples in milliseconds, by the nearest-rank method. */
record Percentiles(int count, double p50, double p99, double max) {

    static Percentiles of(double[] samples) {
        if (samples.length == 0) {
            return new Percentiles(0, Double.NaN, Double.NaN, Double.NaN);
        }
        double[] sorted = samples.clone();
        Arrays.sort(sorted);
        return new Percentiles(sorted.length, rank(sorted, 0.50), rank(sorted, 0.99), sorted[sorted.length - 1]);
    }

    private static double rank(double[] sorted, double p) {
        int index = (int) Math.ceil(p * sorted.length) - 1;
        return sorted[Math.max(0, Math.min(sorted.length - 1, index))];
    }
}
