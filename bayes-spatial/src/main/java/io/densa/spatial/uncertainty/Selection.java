package io.densa.spatial.uncertainty;

/**
 * Sample quantiles by selection, and the summary of a quantity's draws (package-private): the quantile of probability p of n values is
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
     * {@link #bucketTails} (null: allocated when needed).
     */
    static void centralInterval(double[] a, int n, double alpha, double[] out, int off, double[] work) {
        if (bucketTails(a, n, alpha, out, off, work)) {
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

    /** Buckets of {@link #bucketTails}, the least n it is used for, and the count sorted directly. */
    private static final int BUCKETS = 32;
    private static final int BUCKETED_MIN = 64;
    private static final int FEW = 24;

    /** Length of the work array of {@link #bucketTails} for n values. */
    static int workLength(int n) {
        return BUCKETS + 2 * n + 2;
    }

    /**
     * {@link #centralInterval} without reordering a, by buckets: the values' range [min, max] is cut
     * into 32 equal buckets, the values counted per bucket, and only those in the buckets that hold
     * the needed order statistics (v_(⌊h⌋) and v_(⌊h⌋+1) of each tail) are kept, the rank of the
     * first kept value known from the counts below it; the kept values are bucketed again over their
     * own range until at most 24 remain (or all are equal), which are sorted. The bucket of a value,
     * ⌊(v − min) · 32/(max − min)⌋ capped at 31, never decreases as v grows (each operation is
     * monotone in floating point), so the kept values are exactly those of the ranks in between and
     * the results are those of the selection. For the roughly normal values of Monte Carlo draws one
     * pass leaves a few values per tail, where sorting buffers of about 30 values by insertion spent
     * most of the time on mispredicted branches. Returns false and does nothing for n &lt; 64, a NaN
     * among the values, or tails that share their order statistics (alpha near ½). work, when null
     * or too short, is allocated.
     */
    static boolean bucketTails(double[] a, int n, double alpha, double[] out, int off, double[] work) {
        double hl = (n - 1) * alpha;
        int il = (int) Math.floor(hl);
        double hh = (n - 1) * (1 - alpha);
        int ih = Math.min(n - 1, (int) Math.floor(hh));
        if (n < BUCKETED_MIN || ih <= il + 1) {
            return false;
        }
        double[] w = work != null && work.length >= workLength(n) ? work : new double[workLength(n)];
        double lo = a[0], hi = a[0];
        for (int i = 1; i < n; i++) {
            lo = Math.min(lo, a[i]);
            hi = Math.max(hi, a[i]);
        }
        if (!(lo <= hi)) {
            return false; // a NaN (Math.min and Math.max propagate it)
        }
        int res = BUCKETS + 2 * n;
        orderPair(a, n, il, lo, hi, w, res);
        out[off] = w[res] + (hl - il) * (w[res + 1] - w[res]);
        orderPair(a, n, ih, lo, hi, w, res);
        out[off + 1] = w[res] + (hh - ih) * (w[res + 1] - w[res]);
        return true;
    }

    /**
     * v_(r) and v_(min(r + 1, n − 1)) of a[0..n) (no NaN; lo and hi its least and largest value) into
     * w[res] and w[res + 1], by the buckets of {@link #bucketTails}; a is not modified, w has
     * {@link #workLength}(n) values (counts, two buffers of n, the result).
     */
    private static void orderPair(double[] a, int n, int r, double lo, double hi, double[] w, int res) {
        double[] src = a;
        int srcOff = 0, len = n, base = 0, r2 = Math.min(r + 1, n - 1);
        int buf = BUCKETS;
        while (true) {
            double scale = BUCKETS / (hi - lo);
            if (!(lo < hi)) {
                w[res] = lo; // every remaining value equals lo
                w[res + 1] = lo;
                return;
            }
            if (len <= FEW || !(scale < Double.POSITIVE_INFINITY) || !(scale > 0)) {
                if (src != w || srcOff != buf) {
                    System.arraycopy(src, srcOff, w, buf, len);
                }
                insertionSort(w, buf, buf + len);
                w[res] = w[buf + r - base];
                w[res + 1] = w[buf + r2 - base];
                return;
            }
            java.util.Arrays.fill(w, 0, BUCKETS, 0.0);
            for (int i = srcOff; i < srcOff + len; i++) {
                w[bucket(src[i], lo, scale)] += 1;
            }
            int b1 = -1, b2 = -1, below = 0;
            double cum = 0;
            for (int b = 0; b < BUCKETS && b2 < 0; b++) {
                double next = cum + w[b];
                if (b1 < 0 && next > r - base) {
                    b1 = b;
                    below = (int) cum;
                }
                if (next > r2 - base) {
                    b2 = b;
                }
                cum = next;
            }
            // keep the values of buckets b1..b2 (branch-free: the sign bit says whether b − b1 or
            // b2 − b is negative), in the other half of the buffer space
            int dst = buf == BUCKETS ? BUCKETS + n : BUCKETS;
            int kept = 0;
            double klo = Double.POSITIVE_INFINITY, khi = Double.NEGATIVE_INFINITY;
            for (int i = srcOff; i < srcOff + len; i++) {
                double v = src[i];
                int b = bucket(v, lo, scale);
                w[dst + kept] = v;
                kept += 1 - (((b - b1) | (b2 - b)) >>> 31);
            }
            for (int i = dst; i < dst + kept; i++) {
                klo = Math.min(klo, w[i]);
                khi = Math.max(khi, w[i]);
            }
            if (kept == len) {
                // no bucket left out (say all values at the two ends of the range): sort them
                System.arraycopy(src, srcOff, w, dst, len);
                java.util.Arrays.sort(w, dst, dst + len);
                w[res] = w[dst + r - base];
                w[res + 1] = w[dst + r2 - base];
                return;
            }
            src = w;
            srcOff = dst;
            buf = dst;
            len = kept;
            base += below;
            lo = klo;
            hi = khi;
        }
    }

    /** The bucket ⌊(v − lo) · scale⌋, capped at BUCKETS − 1 (v ≥ lo). */
    private static int bucket(double v, double lo, double scale) {
        return Math.min(BUCKETS - 1, (int) ((v - lo) * scale));
    }

    /**
     * Sorts w[from..to) ascending (no NaN): by insertion for the few values {@link #bucketTails}
     * usually keeps, else by {@link java.util.Arrays#sort(double[], int, int)}.
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

    /**
     * The summary of one quantity's draws at a location: writes estimate (plug-in, v[draws]), mean, sd, lower and upper (central interval at level) of
     * v[0..draws) into out[0..5).
     *
     * @param v      the draws' values then the plug-in value; a circular quantity's draws are unrolled
     *               in place around the plug-in value (within half a period of it)
     * @param period the period of a circular quantity, NaN for a linear one
     * @param sel    working storage of at least draws values
     * @param tails  working storage of {@link Selection#workLength}(draws) values
     */
    static void summarise(double[] v, int draws, double level, double period, double[] sel, double[] tails,
            double[] out) {
        if (!Double.isNaN(period)) {
            // a circular mean: the draws unrolled around the plug-in value (within half a period of it)
            double p = period, at = v[draws];
            for (int d = 0; d < draws; d++) {
                v[d] = at + (v[d] - at - p * Math.rint((v[d] - at) / p));
            }
        }
        // four running sums each (draws d ≡ 0, 1, 2, 3 mod 4): one sum's chain of dependent additions
        // held the loop to the adder's latency
        double s0 = 0, s1 = 0, s2 = 0, s3 = 0;
        int d4 = draws & ~3;
        for (int d = 0; d < d4; d += 4) {
            s0 += v[d];
            s1 += v[d + 1];
            s2 += v[d + 2];
            s3 += v[d + 3];
        }
        for (int d = d4; d < draws; d++) {
            s0 += v[d];
        }
        double mu = ((s0 + s1) + (s2 + s3)) / draws;
        s0 = 0;
        s1 = 0;
        s2 = 0;
        s3 = 0;
        for (int d = 0; d < d4; d += 4) {
            double e0 = v[d] - mu, e1 = v[d + 1] - mu, e2 = v[d + 2] - mu, e3 = v[d + 3] - mu;
            s0 += e0 * e0;
            s1 += e1 * e1;
            s2 += e2 * e2;
            s3 += e3 * e3;
        }
        for (int d = d4; d < draws; d++) {
            double e = v[d] - mu;
            s0 += e * e;
        }
        double ss = (s0 + s1) + (s2 + s3);
        System.arraycopy(v, 0, sel, 0, draws);
        double a = 0.5 * (1 - level);
        out[0] = v[draws];
        out[1] = mu;
        out[2] = Math.sqrt(ss / (draws - 1));
        Selection.centralInterval(sel, draws, a, out, 3, tails);
    }
}
