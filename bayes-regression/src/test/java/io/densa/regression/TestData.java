package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.Random;

/** Seeded simulation helpers for the tests (invented data; public for the surveillance tests). */
public final class TestData {
    private TestData() {
    }

    /** Cubic splines on [0, 1] with 5 interior knots: K = 8. */
    public static BayesSpace space8() {
        return BayesSpace.splines(0, 1, 4, 5);
    }

    /** n × k independent N(0, sd²) coordinates. */
    public static double[][] gaussian(Random r, int n, int k, double sd) {
        double[][] x = new double[n][k];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                x[i][j] = sd * r.nextGaussian();
            }
        }
        return x;
    }

    /** A random K × K orthogonal matrix (QR of a Gaussian matrix by Gram–Schmidt), columns orthonormal. */
    static double[][] orthogonal(Random r, int k) {
        double[][] q = new double[k][k]; // q[col][row]
        for (int c = 0; c < k; c++) {
            double[] v = new double[k];
            for (int i = 0; i < k; i++) {
                v[i] = r.nextGaussian();
            }
            for (int pass = 0; pass < 2; pass++) {
                for (int p = 0; p < c; p++) {
                    double d = 0;
                    for (int i = 0; i < k; i++) {
                        d += q[p][i] * v[i];
                    }
                    for (int i = 0; i < k; i++) {
                        v[i] -= d * q[p][i];
                    }
                }
            }
            double nn = 0;
            for (double e : v) {
                nn += e * e;
            }
            nn = Math.sqrt(nn);
            for (int i = 0; i < k; i++) {
                q[c][i] = v[i] / nn;
            }
        }
        return q;
    }

    static DensitySet set(BayesSpace s, double[][] c) {
        return DensitySet.of(s, c);
    }
}
