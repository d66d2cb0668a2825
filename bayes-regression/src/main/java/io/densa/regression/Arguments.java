package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.internal.Kernels;

/** Argument checks shared by the regression models (package-private). */
final class Arguments {
    private Arguments() {
    }

    /** Copies of grid points, each checked to be finite. */
    static double[] grid(double[] xs, String name) {
        return Kernels.checkedPoints(xs, Double.NaN, Double.NaN, name);
    }

    /**
     * Copies of evaluation points, each checked to be finite and inside the space's domain
     * (naming the offending index).
     */
    static double[] grid(BayesSpace space, double[] xs, String name) {
        return Kernels.checkedPoints(xs, space.lower(), space.upper(), name);
    }

    /**
     * Largest accepted |value| of data whose squares are summed (n·K of them for n densities of
     * dimension K): 1e150 / √(count), so that residual sums of squares, R², variances and
     * cross-validation errors stay within the double range.
     */
    static double magnitudeLimit(long count) {
        return 1e150 / Math.sqrt(Math.max(1, count));
    }

    /**
     * Requires a set's coordinates to be at most {@link #magnitudeLimit} in magnitude.
     *
     * @throws IllegalArgumentException naming the row and column of the largest value
     */
    static void requireModerate(DensitySet set, String what) {
        requireModerate(set.coordinatesRowMajor(), set.dimension(), what + " coordinate");
    }

    /** The same for a row-major array of values with {@code width} columns. */
    static void requireModerate(double[] values, int width, String what) {
        double limit = magnitudeLimit(values.length);
        int at = -1;
        double big = 0;
        for (int i = 0; i < values.length; i++) {
            if (Math.abs(values[i]) > big) {
                big = Math.abs(values[i]);
                at = i;
            }
        }
        if (!(big <= limit)) {
            throw new IllegalArgumentException(what + " (row " + at / width + ", column " + at % width + ") is "
                    + values[at] + "; the regression sums squares of " + values.length + " such values, so magnitudes"
                    + " up to " + String.format("%.3g", limit) + " are accepted (power(α) with a small α shrinks"
                    + " densities towards the reference)");
        }
    }

    /** Requires a set to have n rows. */
    static void rows(DensitySet set, int n, String what) {
        if (set.size() != n) {
            throw new IllegalArgumentException(what + " has " + set.size() + " rows, expected " + n
                    + " (one per observation)");
        }
    }

    /** Checks that a is non-null, of length len and finite; names {@code what} and the index. */
    static void finiteArray(double[] a, int len, String what) {
        java.util.Objects.requireNonNull(a, what);
        if (a.length != len) {
            throw new IllegalArgumentException(what + " has " + a.length + " values; " + len + " are required");
        }
        for (int i = 0; i < len; i++) {
            if (!Double.isFinite(a[i])) {
                throw new IllegalArgumentException(what + "[" + i + "] is not finite: " + a[i]);
            }
        }
    }
}
