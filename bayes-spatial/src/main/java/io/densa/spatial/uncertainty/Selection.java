package io.densa.spatial.uncertainty;

/**
 * Sample quantiles by selection (package-private): the quantile of probability p of n values is
 * (1 − f) v_(⌊h⌋) + f v_(⌊h⌋+1) with h = (n − 1) p, f = h − ⌊h⌋ and v_(i) the order statistics
 * (0-based): the linear interpolation that Hyndman &amp; Fan (1996), Sample quantiles in statistical
 * packages, Am. Stat. 50(4), call type 7 (from memory). Order statistics are found by Hoare's
 * selection in expected linear time instead of a full sort.
 */
final class Selection {
    private Selection() {
    }

    /**
     * The quantiles of probabilities alpha and 1 − alpha (alpha ≤ ½) of a[0..n) into
     * out[off] and out[off + 1]; a is reordered.
     */
    static void centralInterval(double[] a, int n, double alpha, double[] out, int off) {
        double hl = (n - 1) * alpha;
        int il = (int) Math.floor(hl);
        select(a, 0, n - 1, il);
        double lo = a[il];
        double lo1 = il + 1 < n ? min(a, il + 1, n) : lo;
        out[off] = lo + (hl - il) * (lo1 - lo);
        double hh = (n - 1) * (1 - alpha);
        int ih = Math.min(n - 1, (int) Math.floor(hh));
        if (ih > il) {
            select(a, il + 1, n - 1, ih);
        }
        double hi = a[ih];
        double hi1 = ih + 1 < n ? min(a, ih + 1, n) : hi;
        out[off + 1] = hi + (hh - ih) * (hi1 - hi);
    }

    /** The type-7 sample quantile of probability p of a[0..n) (a is reordered). */
    static double quantile(double[] a, int n, double p) {
        double h = (n - 1) * p;
        int i = (int) Math.floor(h);
        select(a, 0, n - 1, i);
        double v = a[i];
        double v1 = i + 1 < n ? min(a, i + 1, n) : v;
        return v + (h - i) * (v1 - v);
    }

    private static double min(double[] a, int from, int to) {
        double m = a[from];
        for (int i = from + 1; i < to; i++) {
            m = Math.min(m, a[i]);
        }
        return m;
    }

    /** Reorders a[left..right] so that a[kth] is the value of rank kth, smaller ones before, larger after. */
    static void select(double[] a, int left, int right, int kth) {
        while (right > left) {
            // median of three as pivot
            int mid = (left + right) >>> 1;
            if (a[mid] < a[left]) {
                swap(a, mid, left);
            }
            if (a[right] < a[left]) {
                swap(a, right, left);
            }
            if (a[right] < a[mid]) {
                swap(a, right, mid);
            }
            double pivot = a[mid];
            int i = left, j = right;
            while (i <= j) {
                while (a[i] < pivot) {
                    i++;
                }
                while (a[j] > pivot) {
                    j--;
                }
                if (i <= j) {
                    swap(a, i, j);
                    i++;
                    j--;
                }
            }
            if (kth <= j) {
                right = j;
            } else if (kth >= i) {
                left = i;
            } else {
                return;
            }
        }
    }

    private static void swap(double[] a, int i, int j) {
        double t = a[i];
        a[i] = a[j];
        a[j] = t;
    }
}
