package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.internal.RoughnessPenalty;
import org.junit.jupiter.api.Test;

/**
 * The engine reuses the state a converged search fit leaves behind (the evaluation at β, and at
 * the same λ the Newton factor and step): a sequence of fits must give bit for bit the numbers of
 * the same sequence in which every fit starts from a fresh copy of β (so that nothing is reused).
 * The reference is the engine's own uncached path; the check is exact equality of every double
 * it reports (coefficients, log-likelihood, log det of the Newton matrix, iteration counts).
 */
class NewtonResumeTest {
    /** The sequence of fits: λ, and whether the fit is exact (else a search fit at tolerance 1e-9). */
    private static final double[] LAMBDAS = {3e4, 3e3, 3e2, 3e2, 3e2, 1e3, 2e3, 2e3};
    private static final boolean[] EXACT = {false, false, false, false, true, false, true, true};

    /**
     * The sequence: a grid of search fits (each from the last), the same λ again, an exact fit at
     * that λ (resumes), a search fit, an exact fit at another λ (must not resume), and again.
     */
    private static double[] run(boolean fresh, double[] prior) {
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        double[] edges = new double[366];
        double[] counts = new double[365];
        double total = 0;
        for (int j = 0; j <= 365; j++) {
            edges[j] = j;
        }
        for (int j = 0; j < 365; j++) {
            // a seasonal profile with a second peak and empty days (deterministic)
            double x = j + 0.5;
            double w = 2 + 8 * Math.exp(-Math.pow((x - 200) / 40, 2)) + 3 * Math.exp(-Math.pow((x - 60) / 10, 2));
            counts[j] = Math.floor(w * (1 + 0.5 * Math.sin(7.3 * j)));
            total += counts[j];
        }
        BinLayout lay = new BinLayout(space, edges, 0);
        double[] pen = RoughnessPenalty.raw(EstimationSupport.rawBasis(space.basis()), 2);
        PenalizedNewton eng = new PenalizedNewton(lay, pen, prior);
        eng.setCoordinateMap(EstimationSupport.upperU(space.basisTransform(), space.dimension()));
        eng.useCounts(counts, total);
        eng.clearCoefficients();
        int k = space.dimension();
        double[] out = new double[LAMBDAS.length * (k + 4)];
        int o = 0;
        for (int step = 0; step < LAMBDAS.length; step++) {
            if (fresh) {
                double[] copy = eng.coefficients();
                eng.clearCoefficients();
                eng.setCoefficients(copy);
            }
            boolean ok = EXACT[step] ? eng.solve(LAMBDAS[step], 100, 1e-12)
                    : eng.solveForSearch(LAMBDAS[step], 100, 1e-9);
            assertTrue(ok, eng.failure());
            double[] b = eng.coefficients();
            System.arraycopy(b, 0, out, o, k);
            o += k;
            out[o++] = eng.logLikelihood();
            out[o++] = eng.newtonLogDet();
            out[o++] = eng.iterations();
            out[o++] = eng.penalty();
        }
        return out;
    }

    @Test
    void reusedStateGivesTheNumbersOfFreshStarts() {
        double[] reused = run(false, null);
        double[] fresh = run(true, null);
        assertArrayEquals(fresh, reused, 0.0);
        // the same λ twice: the second search fit starts converged (one derivative pass)
        int k = 24;
        assertEquals(1.0, reused[3 * (k + 4) + k + 2], "iterations of the repeated search fit");
        assertTrue(reused[6 * (k + 4) + k + 2] >= 2, "an exact fit at a new lambda takes steps");
    }

    @Test
    void reusedStateGivesTheNumbersOfFreshStartsWithAPrior() {
        int k = 24;
        double[] q = new double[k * k];
        for (int i = 0; i < k; i++) {
            q[i * k + i] = 0.5;
        }
        assertArrayEquals(run(true, q), run(false, q), 0.0);
    }
}
