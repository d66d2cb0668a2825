package io.densa.spatial.internal;

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
        int[] order = new int[m];
        for (int a = 0; a < m; a++) {
            order[a] = a;
        }
        // merge sort of positions (stable; the order is total anyway, ties in distance going to the
        // smaller index), without boxing every position as a comparator sort of objects would
        int[] buf = new int[m];
        for (int width = 1; width < m; width *= 2) {
            for (int lo = 0; lo < m - width; lo += 2 * width) {
                int mid = lo + width, hi = Math.min(lo + 2 * width, m);
                int i = lo, j = mid, t = lo;
                while (i < mid && j < hi) {
                    buf[t++] = before(order[j], order[i], idx, dist) ? order[j++] : order[i++];
                }
                while (i < mid) {
                    buf[t++] = order[i++];
                }
                while (j < hi) {
                    buf[t++] = order[j++];
                }
                System.arraycopy(buf, lo, order, lo, hi - lo);
            }
        }
        int[] out = new int[m];
        for (int a = 0; a < m; a++) {
            out[a] = idx[order[a]];
        }
        return out;
    }

    /** Whether position a comes before position b in the order (dist, idx); distances by {@link Double#compare}. */
    private static boolean before(int a, int b, int[] idx, double[] dist) {
        int c = Double.compare(dist[a], dist[b]);
        return c < 0 || c == 0 && idx[a] < idx[b];
    }
}
