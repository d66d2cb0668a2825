package io.densa.core.estimate;

import io.densa.core.internal.RawBasis;

/**
 * Per-observation local basis values of one sample and its sufficient statistic, for the
 * penalised-likelihood fit of raw samples. Internal.
 */
final class SampleData {
    final int n;
    final int[] first;
    final double[] vals;
    final double[] w;
    final double[] linear;
    final int width;
    /** Smallest and largest value with positive weight. */
    final double min;
    final double max;
    /** Total weight. */
    final double total;

    SampleData(double[] v, double[] weights, RawBasis basis, int width, int k, double[] scratch) {
        n = v.length;
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < n; i++) {
            if (weights == null || weights[i] > 0) {
                lo = Math.min(lo, v[i]);
                hi = Math.max(hi, v[i]);
            }
        }
        min = lo;
        max = hi;
        double tw = 0;
        for (int i = 0; i < n; i++) {
            tw += weights == null ? 1.0 : weights[i];
        }
        total = tw;
        this.width = width;
        first = new int[n];
        vals = new double[n * width];
        w = new double[n];
        linear = new double[k + 1];
        for (int i = 0; i < n; i++) {
            int f = basis.evalLocal(v[i], scratch);
            first[i] = f;
            w[i] = weights == null ? 1.0 : weights[i];
            for (int j = 0; j < width; j++) {
                double val = f + j < k ? scratch[j] : 0.0;
                vals[i * width + j] = val;
                linear[f + j] += w[i] * val;
            }
        }
    }
}
