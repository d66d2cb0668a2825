package io.densa.spatial.internal;

import java.util.Arrays;
import java.util.function.IntToDoubleFunction;

/**
 * Neighbour candidates ordered by distance: every other unit with its distance, and candidates
 * sorted by (distance, index), ties in distance broken by the smaller index so that the order
 * never depends on the order in which candidates were found. Stateless.
 */
public final class ByDistance {
    private ByDistance() {
    }

    /**
     * Writes the units 0..n−1 other than {@code i}, ascending, into {@code idx[0..n−1)} and their
     * distances from {@code i} into {@code dist[0..n−1)}.
     */
    public static void others(int n, int i, IntToDoubleFunction distance, int[] idx, double[] dist) {
        int m = 0;
        for (int j = 0; j < n; j++) {
            if (j != i) {
                idx[m] = j;
                dist[m++] = distance.applyAsDouble(j);
            }
        }
    }

    /** The first {@code m} entries of {@code idx} ordered by (dist, idx) (a new array; inputs not modified). */
    public static int[] sorted(int[] idx, double[] dist, int m) {
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
}
