package io.densa.core.internal;

/**
 * Sorted arrays: the binary search written once for the panels and leaves of the space's
 * quadrature and the knot spans of the raw basis, and the sample quantile. Internal.
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

    /**
     * Sample quantile of a sorted array by linear interpolation between order statistics
     * (definition 7 of Hyndman &amp; Fan (1996), Sample quantiles in statistical packages, Am. Stat.
     * 50(4) — from memory): x_(⌊h⌋) + (h − ⌊h⌋)(x_(⌊h⌋+1) − x_(⌊h⌋)) with h = (n − 1)p, 0-based.
     *
     * @param sorted at least one value, ascending (not modified)
     * @param p      probability in [0, 1] (not checked)
     */
    public static double quantile(double[] sorted, double p) {
        int n = sorted.length;
        if (n == 1) {
            return sorted[0];
        }
        double h = (n - 1) * p;
        int lo = (int) Math.floor(h);
        int hi = Math.min(n - 1, lo + 1);
        return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }
}
