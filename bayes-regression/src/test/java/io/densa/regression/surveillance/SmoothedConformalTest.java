package io.densa.regression.surveillance;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;

/**
 * Smoothed conformal p-values of {@link AnomalyScoring} (Vovk, Gammerman, Shafer (2005),
 * Algorithmic Learning in a Random World, §2.4, from memory): exactly uniform under
 * exchangeability, also when scores tie, which the ordinary conformal p-value is not.
 */
class SmoothedConformalTest {
    private static final BayesSpace SPACE = BayesSpace.steps(0, 1, 2); // K = 1: residual norm = |coordinate|
    private static final double[] GRID = {0.25, 0.75};

    /** 19 calibration norms and 1 new norm, all Poisson(2) values (many ties); 6,000 replicates. */
    private static double[][] nullPValues(int replicates) {
        SplittableRandom rng = new SplittableRandom(2024);
        double[] smooth = new double[replicates];
        double[] plain = new double[replicates];
        for (int r = 0; r < replicates; r++) {
            double[][] c = new double[19][1];
            for (double[] row : c) {
                row[0] = poisson2(rng);
            }
            AnomalyScoring.Calibrated cal = AnomalyScoring.withDefaults().fit(DensitySet.of(SPACE, c), GRID);
            double[] s = {poisson2(rng)};
            smooth[r] = cal.smoothedPValues(s, rng.nextLong())[0];
            plain[r] = cal.pValues(s)[0];
        }
        return new double[][] {smooth, plain};
    }

    private static double poisson2(SplittableRandom rng) {
        double p = Math.exp(-2);
        double f = p;
        double u = rng.nextDouble();
        int k = 0;
        while (u > f) {
            k++;
            p *= 2.0 / k;
            f += p;
        }
        return k;
    }

    @Test
    void smoothedPValueIsUniformUnderExchangeableTiedScores() {
        int reps = 6000;
        double[][] p = nullPValues(reps);
        // Kolmogorov–Smirnov test against U(0, 1) (Commons Math 3.6.1)
        double ks = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(new UniformRealDistribution(0, 1), p[0]);
        assertTrue(ks > 0.001, "KS p = " + ks);
        for (double alpha : new double[] {0.05, 0.1, 0.25, 0.5}) {
            double smooth = Arrays.stream(p[0]).filter(v -> v <= alpha).count() / (double) reps;
            double plain = Arrays.stream(p[1]).filter(v -> v <= alpha).count() / (double) reps;
            double mc = 4 * Math.sqrt(alpha * (1 - alpha) / reps);
            assertEquals(alpha, smooth, mc, "smoothed P(p ≤ " + alpha + ")");
            assertTrue(plain <= alpha + mc, "ordinary P(p ≤ " + alpha + ") = " + plain);
        }
        // the ordinary p-value is conservative with ties: at α = 0.25 its size is well below α
        double plain25 = Arrays.stream(p[1]).filter(v -> v <= 0.25).count() / (double) reps;
        assertTrue(plain25 < 0.2, "ordinary size at 0.25 = " + plain25);
    }

    @Test
    void smoothedFormulaAndNoTiesAtTheFloor() {
        DensitySet cal = DensitySet.of(SPACE, new double[][] {{1}, {-2}, {3}, {4}});
        AnomalyScoring.Calibrated c = AnomalyScoring.withDefaults().fit(cal, GRID);
        double[] s = {2.5, 5, 6, 7, 2};
        double[] plain = c.pValues(s);
        double[] smooth = c.smoothedPValues(s, 9);
        // (#{> s} + U (1 + #{= s})) / 5: s = 2.5 → (2 + U)/5 in (0.4, 0.6); s = 2 → (2 + 2U)/5 in (0.4, 0.8)
        assertTrue(smooth[0] > 0.4 && smooth[0] < 0.6, "" + smooth[0]);
        assertTrue(smooth[4] > 0.4 && smooth[4] < 0.8, "" + smooth[4]);
        for (int i = 1; i <= 3; i++) {
            assertEquals(0.2, plain[i], 1e-15);
            assertTrue(smooth[i] > 0 && smooth[i] < 0.2, "" + smooth[i]);
        }
        assertTrue(smooth[1] != smooth[2] && smooth[2] != smooth[3] && smooth[1] != smooth[3]);
        for (int i = 0; i < s.length; i++) {
            assertTrue(smooth[i] <= plain[i]);
        }
        assertArrayEquals(smooth, c.smoothedPValues(s, 9), 0.0, "same seed, same p-values");
    }

    @Test
    void scoreUsesSmoothedPValuesAndRankingBreaksTiesByNorm() {
        DensitySet cal = DensitySet.of(SPACE, new double[][] {{1}, {-2}, {3}, {4}});
        DensitySet units = DensitySet.of(SPACE, new double[][] {{6}, {7}, {0.5}, {5}});
        AnomalyScoring.Report plain = AnomalyScoring.withDefaults().fit(cal, GRID).score(units);
        // three units tie at the floor 1/5: ranked by norm 7, 6, 5, then the unit with p = 1
        assertArrayEquals(new int[] {1, 0, 3, 2}, plain.ranking());
        AnomalyScoring.Report smooth = AnomalyScoring.withDefaults().withRandomisedTies(3).fit(cal, GRID)
                .score(units);
        double[] expected = AnomalyScoring.withDefaults().fit(cal, GRID).smoothedPValues(units.norms(), 3);
        for (int i = 0; i < 4; i++) {
            assertEquals(expected[i], smooth.units().get(i).pValue(), 0.0);
        }
    }
}
