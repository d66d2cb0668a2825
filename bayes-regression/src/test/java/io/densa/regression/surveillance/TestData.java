package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import java.util.Random;

/** Seeded simulation helpers for the surveillance tests (invented data). */
final class TestData {
    private TestData() {
    }

    /** Cubic splines on [0, 1] with 5 interior knots: K = 8. */
    static BayesSpace space8() {
        return BayesSpace.splines(0, 1, 4, 5);
    }

    /** n × k independent N(0, sd²) coordinates. */
    static double[][] gaussian(Random r, int n, int k, double sd) {
        double[][] x = new double[n][k];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                x[i][j] = sd * r.nextGaussian();
            }
        }
        return x;
    }
}
