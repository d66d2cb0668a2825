package io.densa.core.internal;

/**
 * Binary search in a non-decreasing array, written once for the panels and leaves of the space's
 * quadrature and the knot spans of the raw basis. Internal.
 */
public final class Sorted {
    private Sorted() {
    }

    /**
     * The last index i in [lo, hi] with {@code sorted[i] <= x}, or lo when there is none: the
     * interval [sorted[i], sorted[i + 1]) that holds x. {@code sorted[lo..hi]} must be
     * non-decreasing and lo ≤ hi; NaN x gives lo.
     */
    public static int lastAtMost(double[] sorted, int lo, int hi, double x) {
        while (lo < hi) {
            int mid = (lo + hi + 1) >>> 1;
            if (sorted[mid] <= x) {
                lo = mid;
            } else {
                hi = mid - 1;
            }
        }
        return lo;
    }
}
