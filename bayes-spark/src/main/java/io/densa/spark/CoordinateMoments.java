package io.densa.spark;

import java.io.Serializable;

/**
 * Running sums of coordinate rows with Neumaier's compensated summation (Neumaier (1974),
 * Rundungsfehleranalyse einiger Verfahren zur Summation endlicher Summen, ZAMM 54; from memory),
 * for the tree aggregations of {@link SparkFpca}: the sum Σ c_i (first pass) or, about a given
 * centre m, the upper triangle of Σ (c_i − m)(c_i − m)ᵀ (second pass). Each sum carries its
 * compensation, and merging two partial sums adds sums and compensations, so the result is
 * accurate to a few units in the last place whatever the partitioning.
 *
 * <p>Mutable (an aggregation buffer); not thread-safe.
 */
final class CoordinateMoments implements Serializable {
    private static final long serialVersionUID = 1L;

    final int k;
    final double[] centre; // null: first pass (sums of coordinates)
    long n;
    final double[] sum;
    final double[] comp;

    CoordinateMoments(int k, double[] centre) {
        this.k = k;
        this.centre = centre;
        int m = centre == null ? k : k * (k + 1) / 2;
        this.sum = new double[m];
        this.comp = new double[m];
    }

    private void add(int i, double v) {
        double s = sum[i];
        double t = s + v;
        comp[i] += Math.abs(s) >= Math.abs(v) ? (s - t) + v : (v - t) + s;
        sum[i] = t;
    }

    CoordinateMoments add(double[] c) {
        if (c.length != k) {
            throw new IllegalArgumentException("a coordinate row has " + c.length + " entries; the space has dimension "
                    + k);
        }
        for (int j = 0; j < k; j++) {
            if (!Double.isFinite(c[j])) {
                throw new IllegalArgumentException("coordinate " + j + " of a row is not finite: " + c[j]);
            }
        }
        n++;
        if (centre == null) {
            for (int j = 0; j < k; j++) {
                add(j, c[j]);
            }
        } else {
            int o = 0;
            for (int a = 0; a < k; a++) {
                double da = c[a] - centre[a];
                for (int b = a; b < k; b++) {
                    add(o++, da * (c[b] - centre[b]));
                }
            }
        }
        return this;
    }

    CoordinateMoments merge(CoordinateMoments other) {
        n += other.n;
        for (int i = 0; i < sum.length; i++) {
            add(i, other.sum[i]);
            add(i, other.comp[i]);
        }
        return this;
    }

    /** The compensated totals. */
    double[] totals() {
        double[] t = new double[sum.length];
        for (int i = 0; i < t.length; i++) {
            t[i] = sum[i] + comp[i];
        }
        return t;
    }
}
