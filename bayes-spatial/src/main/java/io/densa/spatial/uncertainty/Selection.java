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
        if (smallTails(a, n, alpha, out, off)) {
            return;
        }
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

    /** Largest number of order statistics per tail that {@link #smallTails} keeps. */
    private static final int TAIL_BUFFER = 24;

    /**
     * {@link #centralInterval} without reordering a, when each tail needs at most
     * {@link #TAIL_BUFFER} order statistics: one pass keeps the ⌊h⌋ + 2 smallest and the n − ⌊h'⌋
     * largest values in two sorted buffers (an insertion is rare after the first few values). The
     * order statistics, and so the results, are those of the selection. Returns false (and does
     * nothing) when a tail needs more values or a value is NaN.
     */
    static boolean smallTails(double[] a, int n, double alpha, double[] out, int off) {
        double hl = (n - 1) * alpha;
        int il = (int) Math.floor(hl);
        double hh = (n - 1) * (1 - alpha);
        int ih = Math.min(n - 1, (int) Math.floor(hh));
        int nl = Math.min(n, il + 2);
        int nh = n - ih;
        if (nl > TAIL_BUFFER || nh > TAIL_BUFFER || ih <= il) {
            return false;
        }
        double[] low = new double[nl];
        double[] high = new double[nh];
        // low ascending (low[nl-1] the largest kept), high descending (high[nh-1] the smallest kept)
        int cl = 0, ch = 0;
        for (int i = 0; i < n; i++) {
            double v = a[i];
            if (v != v) {
                return false;
            }
            if (cl < nl || v < low[nl - 1]) {
                int p = cl < nl ? cl++ : nl - 1;
                while (p > 0 && low[p - 1] > v) {
                    low[p] = low[p - 1];
                    p--;
                }
                low[p] = v;
            }
            if (ch < nh || v > high[nh - 1]) {
                int p = ch < nh ? ch++ : nh - 1;
                while (p > 0 && high[p - 1] < v) {
                    high[p] = high[p - 1];
                    p--;
                }
                high[p] = v;
            }
        }
        double lo = low[il];
        double lo1 = il + 1 < n ? low[il + 1] : lo;
        out[off] = lo + (hl - il) * (lo1 - lo);
        // v_(ih) is the (n − 1 − ih)-th largest, v_(ih+1) the one above it
        double hi = high[n - 1 - ih];
        double hi1 = ih + 1 < n ? high[n - 2 - ih] : hi;
        out[off + 1] = hi + (hh - ih) * (hi1 - hi);
        return true;
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
