package io.densa.core.internal;

/**
 * Sample quantiles of sorted data. Internal: not exported outside the Densa modules; may change
 * without notice.
 */
public final class SampleQuantiles {
    private SampleQuantiles() {
    }

    /**
     * Sample quantile of a sorted array by linear interpolation between order statistics
     * (definition 7 of Hyndman &amp; Fan (1996), Sample quantiles in statistical packages, Am. Stat.
     * 50(4) — from memory): x_(⌊h⌋) + (h − ⌊h⌋)(x_(⌊h⌋+1) − x_(⌊h⌋)) with h = (n − 1)p, 0-based.
     *
     * @param sorted at least one value, ascending (not modified)
     * @param p      probability in [0, 1] (not checked)
     */
    public static double sorted(double[] sorted, double p) {
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
