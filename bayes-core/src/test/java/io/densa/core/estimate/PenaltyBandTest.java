package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.internal.RoughnessPenalty;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The objective's quadratic terms skip the zero entries of each row of the penalty: the sums
 * must equal the full-loop sums bit for bit, and the second-derivative penalty of cubic B-splines
 * must be banded as B-spline supports imply (φ_i'' and φ_j'' overlap only for |i − j| ≤ 3: de
 * Boor (1978), A Practical Guide to Splines, ch. IX; the band is checked, not assumed).
 */
class PenaltyBandTest {
    private static double full(double[] m, double[] b, int k) {
        double s = 0;
        for (int i = 0; i < k; i++) {
            double r = 0;
            for (int j = 0; j < k; j++) {
                r += m[i * k + j] * b[j];
            }
            s += b[i] * r;
        }
        return s;
    }

    @Test
    void bandedSumsEqualFullSums() {
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        int k = space.dimension();
        double[] pen = RoughnessPenalty.raw(EstimationSupport.rawBasis(space.basis()), 2);
        int outside = 0;
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                outside += Math.abs(i - j) > 3 && pen[i * k + j] != 0.0 ? 1 : 0;
            }
        }
        assertEquals(0, outside, "entries of the cubic-spline penalty outside |i - j| <= 3");
        // a dense prior with a zero row and a zero column in the middle
        double[] prior = new double[k * k];
        Random rng = new Random(11);
        for (int i = 0; i < k; i++) {
            for (int j = 0; j <= i; j++) {
                double v = i == 5 || j == 5 ? 0.0 : rng.nextGaussian();
                prior[i * k + j] = v;
                prior[j * k + i] = v;
            }
        }
        double[] edges = {0, 100, 200, 365};
        PenalizedObjective obj = new PenalizedObjective(new BinLayout(space, edges, 0), pen, prior);
        for (int t = 0; t < 200; t++) {
            double[] b = new double[k + 1];
            for (int i = 0; i < k; i++) {
                b[i] = rng.nextGaussian() * Math.pow(10, rng.nextInt(7) - 3);
            }
            assertEquals(full(pen, b, k), obj.penalty(b), 0.0);
            assertEquals(full(prior, b, k), obj.priorPenalty(b), 0.0);
            assertTrue(obj.penalty(b) >= 0, "the penalty is positive semi-definite");
        }
    }
}
