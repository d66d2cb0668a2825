package io.densa.report.chart;

import java.util.Objects;

/**
 * A unit's data drawn beside its estimated density, on the density scale: counts per bin
 * divided by (total × bin width), or a histogram of a sample with the same normalisation, so that
 * points and curve share the y axis.
 *
 * @param name    legend text, e.g. "observed share per year of age"
 * @param x       bin midpoints
 * @param density the data's density per bin (count / (total · width))
 */
public record Observed(String name, double[] x, double[] density) {
    /** Checks and copies. */
    public Observed {
        Objects.requireNonNull(name, "name");
        if (x.length != density.length) {
            throw new IllegalArgumentException("observed '" + name + "': " + x.length + " positions and "
                    + density.length + " values");
        }
        x = x.clone();
        density = density.clone();
    }

    /** A copy of the midpoints. */
    @Override
    public double[] x() {
        return x.clone();
    }

    /** A copy of the values. */
    @Override
    public double[] density() {
        return density.clone();
    }

    /**
     * Counts in bins [lower_j, upper_j) on the density scale.
     *
     * @throws IllegalArgumentException if lengths differ, a bin is empty or reversed, a count is
     *                                  negative or not finite, or the total is zero
     */
    public static Observed counts(String name, double[] lower, double[] upper, double[] counts) {
        int n = counts.length;
        if (lower.length != n || upper.length != n) {
            throw new IllegalArgumentException("observed '" + name + "': " + lower.length + " lower edges, "
                    + upper.length + " upper edges and " + n + " counts");
        }
        double total = 0;
        for (int j = 0; j < n; j++) {
            if (!(counts[j] >= 0) || Double.isInfinite(counts[j])) {
                throw new IllegalArgumentException("observed '" + name + "': count of bin " + j + " is " + counts[j]);
            }
            if (!(upper[j] > lower[j])) {
                throw new IllegalArgumentException("observed '" + name + "': bin " + j + " is [" + lower[j] + ", "
                        + upper[j] + ")");
            }
            total += counts[j];
        }
        if (!(total > 0)) {
            throw new IllegalArgumentException("observed '" + name + "': all counts are zero");
        }
        double[] mid = new double[n];
        double[] d = new double[n];
        for (int j = 0; j < n; j++) {
            mid[j] = 0.5 * (lower[j] + upper[j]);
            d[j] = counts[j] / (total * (upper[j] - lower[j]));
        }
        return new Observed(name, mid, d);
    }

    /** Integer counts in bins, see {@link #counts(String, double[], double[], double[])}. */
    public static Observed counts(String name, double[] lower, double[] upper, int[] counts) {
        double[] c = new double[counts.length];
        for (int j = 0; j < c.length; j++) {
            c[j] = counts[j];
        }
        return counts(name, lower, upper, c);
    }

    /**
     * A histogram of a sample in {@code bins} equal bins on [lo, hi]; values outside are left out
     * (but count in the total, so the histogram and a density on a wider domain agree).
     */
    public static Observed sample(String name, double[] values, double lo, double hi, int bins) {
        if (!(Double.isFinite(lo) && Double.isFinite(hi) && hi > lo) || bins < 1) {
            throw new IllegalArgumentException("observed '" + name + "': histogram needs finite lo < hi and bins >= 1"
                    + ", got [" + lo + ", " + hi + "], " + bins);
        }
        if (values.length == 0) {
            throw new IllegalArgumentException("observed '" + name + "': the sample is empty");
        }
        double w = (hi - lo) / bins;
        double[] mid = new double[bins];
        double[] d = new double[bins];
        for (int b = 0; b < bins; b++) {
            mid[b] = lo + (b + 0.5) * w;
        }
        for (double v : values) {
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException("observed '" + name + "': sample value " + v + " is not finite");
            }
            int b = (int) Math.floor((v - lo) / w);
            if (b == bins && v == hi) {
                b = bins - 1;
            }
            if (b >= 0 && b < bins) {
                d[b] += 1.0 / (values.length * w);
            }
        }
        return new Observed(name, mid, d);
    }
}
