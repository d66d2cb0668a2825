package io.densa.spatial.autocorrelation;

/**
 * Fixtures shared by the autocorrelation tests: brute-force formulas (lattices are in
 * {@link io.densa.spatial.Lattices}).
 */
final class AutocorrelationTestSupport {
    private AutocorrelationTestSupport() {
    }

    /** Moran's I straight from Moran (1950): (n/S0) Σ w_ij z_i z_j / Σ z_i², on a dense matrix. */
    static double moranDense(double[][] w, double[] x) {
        return pairSum(w, x, false);
    }

    /** Geary's c straight from Geary (1954): (n−1) Σ w_ij (x_i − x_j)² / (2 S0 Σ z_i²). */
    static double gearyDense(double[][] w, double[] x) {
        return pairSum(w, x, true);
    }

    private static double pairSum(double[][] w, double[] x, boolean geary) {
        int n = x.length;
        double mean = 0;
        for (double v : x) {
            mean += v;
        }
        mean /= n;
        double num = 0, den = 0, s0 = 0;
        for (int i = 0; i < n; i++) {
            den += (x[i] - mean) * (x[i] - mean);
            for (int j = 0; j < n; j++) {
                num += w[i][j] * (geary ? (x[i] - x[j]) * (x[i] - x[j]) : (x[i] - mean) * (x[j] - mean));
                s0 += w[i][j];
            }
        }
        return geary ? (n - 1) * num / (2 * s0 * den) : n / s0 * num / den;
    }

    /** {mean, variance} of a statistic over seeded draws of n iid N(0, 1) values. */
    static double[] normalSimulation(int n, int draws, long seed, java.util.function.ToDoubleFunction<double[]> stat) {
        java.util.Random rnd = new java.util.Random(seed);
        double s = 0, ss = 0;
        double[] x = new double[n];
        for (int d = 0; d < draws; d++) {
            for (int i = 0; i < n; i++) {
                x[i] = rnd.nextGaussian();
            }
            double v = stat.applyAsDouble(x);
            s += v;
            ss += v * v;
        }
        double mean = s / draws;
        return new double[] {mean, ss / draws - mean * mean};
    }

    /** Calls body for every permutation of a (in place; Heap's algorithm, iterative). */
    static void forEachPermutation(double[] a, java.util.function.Consumer<double[]> body) {
        int n = a.length;
        int[] c = new int[n];
        body.accept(a);
        int i = 0;
        while (i < n) {
            if (c[i] < i) {
                int j = (i % 2 == 0) ? 0 : c[i];
                double t = a[j];
                a[j] = a[i];
                a[i] = t;
                body.accept(a);
                c[i]++;
                i = 0;
            } else {
                c[i] = 0;
                i++;
            }
        }
    }
}
