package io.densa.spatial.uncertainty;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The central intervals of {@link Selection} against the type-7 sample quantiles read off a full
 * sort (Hyndman &amp; Fan (1996), Sample quantiles in statistical packages, Am. Stat. 50(4): the
 * quantile of probability p is v_(⌊h⌋) + (h − ⌊h⌋)(v_(⌊h⌋+1) − v_(⌊h⌋)), h = (n − 1) p), for each of
 * both ways it finds them (buckets, selection).
 */
class SelectionTest {

    static double type7(double[] sorted, double p) {
        int n = sorted.length;
        double h = (n - 1) * p;
        int i = (int) Math.floor(h);
        double v = sorted[i];
        double v1 = i + 1 < n ? sorted[i + 1] : v;
        return v + (h - i) * (v1 - v);
    }

    @Test
    void everyPathGivesTheSortedQuantiles() {
        Random rnd = new Random(5);
        int bucketed = 0, large = 0;
        for (int rep = 0; rep < 3000; rep++) {
            int n = new int[] {20, 64, 200, 201, 1000}[rep % 5];
            double alpha = new double[] {0.05, 0.005, 0.25, 0.5}[(rep / 5) % 4];
            int kind = (rep / 20) % 6;
            double[] a = new double[n];
            for (int i = 0; i < n; i++) {
                double z = rnd.nextGaussian();
                // normal; heavy ties at 0 and 1 (probabilities near the bounds); skewed; a few huge values;
                // two values only; a few infinities
                a[i] = kind == 0 ? z : kind == 1 ? Math.max(0, Math.min(1, 0.1 * z + (rep % 3 == 0 ? 0.05 : 0.5)))
                        : kind == 2 ? Math.exp(2 * z) : kind == 3 ? (i % 50 == 0 ? 1e300 * z : z)
                        : kind == 4 ? (z > 0.3 ? 2.5 : -1) : (i % 40 == 7 ? z / 0.0 : z);
            }
            double[] orig = a.clone();
            double[] sorted = a.clone();
            Arrays.sort(sorted);
            double lo = type7(sorted, alpha), hi = type7(sorted, 1 - alpha);
            double[] out = new double[2];
            // with two tails (alpha < ½) and n ≥ 64 the buckets serve every array
            boolean typical = n >= 64 && alpha < 0.5;
            large += typical ? 1 : 0;
            if (Selection.bucketTails(a, n, alpha, out, 0, null)) {
                bucketed += typical ? 1 : 0;
                assertEquals(lo, out[0], 0.0, "buckets, n " + n + ", alpha " + alpha + ", kind " + kind);
                assertEquals(hi, out[1], 0.0, "buckets, n " + n + ", alpha " + alpha + ", kind " + kind);
            }
            assertTrue(Arrays.equals(orig, a), "the bucket path leaves the values in place");
            Selection.centralInterval(a, n, alpha, out, 0);
            assertEquals(lo, out[0], 0.0);
            assertEquals(hi, out[1], 0.0);
            double[] b = orig.clone();
            Selection.centralInterval(b, n, alpha, out, 0, new double[Selection.workLength(n)]);
            assertEquals(lo, out[0], 0.0);
            assertEquals(hi, out[1], 0.0);
        }
        assertEquals(large, bucketed, "bucketed " + bucketed + " of " + large);
        System.out.println("buckets served " + bucketed + " of " + large + " arrays");
    }

    @Test
    void aNaNLeavesTheBucketPath() {
        double[] a = new double[200];
        Arrays.setAll(a, i -> i);
        a[77] = Double.NaN;
        assertTrue(!Selection.bucketTails(a, 200, 0.05, new double[2], 0, null));
    }
}
