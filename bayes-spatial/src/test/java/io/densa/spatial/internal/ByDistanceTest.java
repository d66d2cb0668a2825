package io.densa.spatial.internal;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The neighbour order (distance, then index) against the JDK's general-purpose comparison sort
 * ({@link Arrays#sort(Object[], java.util.Comparator)}, a stable merge sort) with the same
 * comparator: equal for every length 0–70 and for distances with many ties, zeros, infinities and NaN.
 */
class ByDistanceTest {
    private static int[] reference(int[] idx, double[] dist, int m) {
        Integer[] order = new Integer[m];
        for (int a = 0; a < m; a++) {
            order[a] = a;
        }
        Arrays.sort(order, (a, b) -> {
            int c = Double.compare(dist[a], dist[b]);
            return c != 0 ? c : Integer.compare(idx[a], idx[b]);
        });
        int[] out = new int[m];
        for (int a = 0; a < m; a++) {
            out[a] = idx[order[a]];
        }
        return out;
    }

    @Test
    void orderEqualsTheComparisonSort() {
        Random r = new Random(12);
        double[] special = {0.0, Double.POSITIVE_INFINITY, Double.NaN, 1e-300, 1.0};
        for (int m = 0; m <= 70; m++) {
            for (int rep = 0; rep < 20; rep++) {
                int n = m + r.nextInt(5);
                int[] idx = new int[n];
                double[] dist = new double[n];
                for (int a = 0; a < n; a++) {
                    idx[a] = r.nextInt(3 * n + 1);
                    dist[a] = rep % 3 == 0 ? r.nextInt(4) : rep % 3 == 1 ? r.nextDouble()
                            : special[r.nextInt(special.length)];
                }
                int[] idxCopy = idx.clone();
                double[] distCopy = dist.clone();
                assertArrayEquals(reference(idx, dist, m), ByDistance.sorted(idx, dist, m), "m = " + m);
                assertArrayEquals(idxCopy, idx);
                assertArrayEquals(distCopy, dist);
            }
        }
    }
}
