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
        centralInterval(a, n, alpha, out, off, null);
    }

    /**
     * {@link #centralInterval(double[], int, double, double[], int)} with work storage for
     * {@link #sampledTails} (null: allocated when needed).
     */
    static void centralInterval(double[] a, int n, double alpha, double[] out, int off, double[] work) {
        if (sampledTails(a, n, alpha, out, off, work)) {
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

    /** Values per sampled value in {@link #sampledTails}, and the least n it is used for. */
    private static final int SAMPLE_STRIDE = 8;
    private static final int SAMPLED_MIN = 64;

    /** Length of the work array of {@link #sampledTails} for n values. */
    static int sampledWork(int n) {
        return 2 * n + n / SAMPLE_STRIDE;
    }

    /**
     * {@link #centralInterval} without reordering a, by two cut-offs: every eighth value is sorted,
     * and the values of that sample at ranks where about twice the needed order statistics lie
     * beyond them become the cut-offs; one branch-free pass copies the values strictly below the
     * low cut-off and strictly above the high one into two buffers, which are sorted. Every value
     * not copied lies between the cut-offs, so when each buffer holds at least the order statistics
     * its tail needs, they are those of the whole array and the results are those of the selection;
     * otherwise (or for n &lt; 64, a NaN among the values, or alpha = ½) returns false and does
     * nothing. work, when null or too short, is allocated.
     */
    static boolean sampledTails(double[] a, int n, double alpha, double[] out, int off, double[] work) {
        double hl = (n - 1) * alpha;
        int il = (int) Math.floor(hl);
        double hh = (n - 1) * (1 - alpha);
        int ih = Math.min(n - 1, (int) Math.floor(hh));
        int nl = Math.min(n, il + 2);
        int nh = n - ih;
        int ns = n / SAMPLE_STRIDE;
        if (n < SAMPLED_MIN || ih <= il) {
            return false;
        }
        double[] w = work != null && work.length >= sampledWork(n) ? work : new double[sampledWork(n)];
        double sum = 0;
        for (int i = 0; i < n; i++) {
            sum += a[i];
        }
        if (sum != sum) {
            return false;
        }
        int so = 2 * n;
        for (int k = 0; k < ns; k++) {
            w[so + k] = a[k * SAMPLE_STRIDE];
        }
        insertionSort(w, so, so + ns);
        int kl = Math.min(ns - 1, (int) Math.ceil(2.0 * nl * (ns + 1) / n));
        int kh = Math.max(0, ns - 1 - (int) Math.ceil(2.0 * nh * (ns + 1) / n));
        double lowCut = w[so + kl], highCut = w[so + kh];
        // the sign bit of v − cut is 1 exactly when v < cut (finite values; no NaN here)
        int cl = 0, ch = 0;
        for (int i = 0; i < n; i++) {
            double v = a[i];
            w[cl] = v;
            cl += (int) (Double.doubleToRawLongBits(v - lowCut) >>> 63);
            w[n + ch] = v;
            ch += (int) (Double.doubleToRawLongBits(highCut - v) >>> 63);
        }
        if (cl < nl || ch < nh) {
            return false;
        }
        insertionSort(w, 0, cl);
        insertionSort(w, n, n + ch);
        double lo = w[il];
        double lo1 = il + 1 < n ? w[il + 1] : lo;
        out[off] = lo + (hl - il) * (lo1 - lo);
        // the buffer holds the ch largest values ascending: v_(ih) is at ch − nh
        double hi = w[n + ch - nh];
        double hi1 = ih + 1 < n ? w[n + ch - nh + 1] : hi;
        out[off + 1] = hi + (hh - ih) * (hi1 - hi);
        return true;
    }

    /**
     * Sorts w[from..to) ascending (no NaN): by insertion for the few tens of values
     * {@link #sampledTails} usually has, else by {@link java.util.Arrays#sort(double[], int, int)}.
     */
    private static void insertionSort(double[] w, int from, int to) {
        if (to - from > 64) {
            java.util.Arrays.sort(w, from, to);
            return;
        }
        for (int i = from + 1; i < to; i++) {
            double v = w[i];
            int j = i - 1;
            while (j >= from && w[j] > v) {
                w[j + 1] = w[j];
                j--;
            }
            w[j + 1] = v;
        }
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
