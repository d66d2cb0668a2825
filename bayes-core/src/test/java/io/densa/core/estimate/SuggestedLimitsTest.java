package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.junit.jupiter.api.Test;

/**
 * {@link DetectionLimits#suggested}: the spike test against Commons Math's binomial distribution,
 * and the suggestions on invented units — normal values on [0, 5] in 40 bins, some with every value
 * below a limit recorded at the limit (5–30 % of them), others untouched — whose truth is known.
 */
class SuggestedLimitsTest {
    static final int BINS = 40;
    static final double[] EDGES = new double[BINS + 1];

    static {
        for (int j = 0; j <= BINS; j++) {
            EDGES[j] = 5.0 * j / BINS;
        }
    }

    /** P(X ≥ k) for X ~ Binomial(m, ½) by Commons Math 3.6.1. */
    static double upperTail(int k, int m) {
        return 1 - new BinomialDistribution(null, m, 0.5).cumulativeProbability(k - 1);
    }

    @Test
    void spikeTestIsTheBinomialUpperTail() {
        for (int[] km : new int[][] {{10, 10}, {9, 9}, {15, 20}, {14, 20}, {40, 60}, {39, 60}, {120, 200},
                {130, 200}}) {
            boolean want = upperTail(km[0], km[1]) <= DetectionLimits.SPIKE_LEVEL;
            assertEquals(want, DetectionLimits.spike(km[0], km[1] - km[0]), "k " + km[0] + " of " + km[1]);
        }
        // P(X ≥ 10 | m = 10) = 2^-10 < 0.001 < 2^-9 = P(X ≥ 9 | m = 9)
        assertTrue(DetectionLimits.spike(10, 0));
        assertTrue(!DetectionLimits.spike(9, 0));
    }

    /**
     * Above {@link DetectionLimits#EXACT_LIMIT} events the test's normal approximation decides as the
     * exact binomial tail (Commons Math) a few events away from the level's quantile, and extreme
     * counts give an answer, not an exception from the beta function's continued fraction.
     */
    @Test
    void largeCountsUseTheNormalApproximationAndExtremesStayQuiet() {
        int m = 200_000;
        BinomialDistribution b = new BinomialDistribution(null, m, 0.5);
        int q = b.inverseCumulativeProbability(1 - DetectionLimits.SPIKE_LEVEL); // P(X <= q) >= 1 - level
        for (int k : new int[] {q - 40, q - 10, q + 10, q + 40}) {
            boolean exact = 1 - b.cumulativeProbability(k - 1) <= DetectionLimits.SPIKE_LEVEL;
            assertEquals(exact, DetectionLimits.spike(k, m - k), "k " + k + " of " + m + " (quantile " + q + ")");
        }
        assertTrue(DetectionLimits.spike(1e300, 0));
        assertTrue(!DetectionLimits.spike(1e300, 1e300));
        assertTrue(!DetectionLimits.spike(Double.MAX_VALUE, Double.MAX_VALUE));
        assertTrue(!DetectionLimits.spike(4.9e-324, 0));
        DetectionLimits d = DetectionLimits.suggested(new double[] {0, 1, 2, 3, 4, 5},
                new double[][] {{0, 0, 1e300, 1e300, 1}, {0, 0, 1e18, 0, 1}});
        assertTrue(!d.censored(0));
        assertEquals(2.0, d.lower()[1], 0.0);
    }

    /** Counts of n normal(mu, sd) values on [0, 5]; values below limit (when finite) recorded at it. */
    static double[] unit(double mu, double sd, int n, double limit, SplittableRandom rng) {
        double[] c = new double[BINS];
        for (int e = 0; e < n; e++) {
            double v;
            do {
                v = mu + sd * Math.sqrt(-2 * Math.log(1 - rng.nextDouble())) * Math.cos(2 * Math.PI * rng.nextDouble());
            } while (v < 0 || v >= 5);
            if (limit == limit && v < limit) {
                v = limit;
            }
            c[(int) (v / 5 * BINS)]++;
        }
        return c;
    }

    @Test
    void clippedUnitsAreFoundAndUntouchedOnesAreLeftAlone() {
        SplittableRandom rng = new SplittableRandom(3);
        int n = 400;
        double[][] counts = new double[n][];
        double[] truth = new double[n];
        for (int i = 0; i < n; i++) {
            double mu = 2 + rng.nextDouble();
            double sd = 0.4 + 0.3 * rng.nextDouble();
            int events = 500 + rng.nextInt(2501);
            truth[i] = Double.NaN;
            if (i % 2 == 0) {
                // a limit at a bin edge between the 5 % and 30 % quantiles
                double q = 0.05 + 0.25 * rng.nextDouble();
                double at = mu + sd * new org.apache.commons.math3.distribution.NormalDistribution(null, 0, 1)
                        .inverseCumulativeProbability(q);
                truth[i] = Math.floor(at / 5 * BINS) * 5 / BINS;
            }
            counts[i] = unit(mu, sd, events, truth[i], rng);
        }
        DetectionLimits s = DetectionLimits.suggested(EDGES, counts);
        int found = 0;
        int right = 0;
        int falseLower = 0;
        int falseUpper = 0;
        for (int i = 0; i < n; i++) {
            double got = s.lower()[i];
            if (i % 2 == 0) {
                found += got == got ? 1 : 0;
                right += got == truth[i] ? 1 : 0;
            } else {
                falseLower += got == got ? 1 : 0;
            }
            falseUpper += s.upper()[i] == s.upper()[i] ? 1 : 0;
        }
        System.out.printf("suggested limits: %d of %d clipped units found (%d at the true limit's bin), %d of %d"
                + " untouched units with a lower suggestion, %d upper suggestions%n", found, n / 2, right, falseLower,
                n / 2, falseUpper);
        assertTrue(found >= 0.95 * n / 2, found + " of " + n / 2 + " clipped units found");
        assertEquals(found, right, "every suggestion at the bin that holds the limit");
        assertTrue(falseLower <= 2, falseLower + " untouched units with a lower suggestion");
        assertEquals(0, falseUpper, "no unit is clipped at the top");
    }

    @Test
    void suggestionsFeedTheEstimatorAndBadInputIsNamed() {
        SplittableRandom rng = new SplittableRandom(4);
        double[][] counts = {unit(2.5, 0.5, 2000, 2.0, rng), unit(2.5, 0.5, 2000, Double.NaN, rng)};
        DetectionLimits s = DetectionLimits.suggested(EDGES, counts);
        assertEquals(2.0, s.lower()[0], 0.0);
        assertTrue(!s.censored(1));
        int[][] ints = new int[2][BINS];
        for (int i = 0; i < 2; i++) {
            for (int j = 0; j < BINS; j++) {
                ints[i][j] = (int) counts[i][j];
            }
        }
        assertEquals(s, DetectionLimits.suggested(EDGES, ints));
        BatchEstimate b = PenalizedLikelihoodEstimator.withDefaults(io.densa.core.BayesSpace.splines(0, 5, 4, 8))
                .fitAll(EDGES, ints, new String[] {"a", "b"}, s);
        // the clipped unit's estimated mass below the limit is that of the values recorded at it (about 16 %
        // below 2.0 for N(2.5, 0.5²)): more than 5 %, where reading the spike as real would give almost none
        assertTrue(b.densities().get(0).cdf(2.0) > 0.05, "mass below the limit " + b.densities().get(0).cdf(2.0));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> DetectionLimits.suggested(EDGES, new double[][] {{1, -1}}));
        assertTrue(e.getMessage().contains("row 0 has 2 bins, expected 40"), e.getMessage());
        double[] bad = counts[1].clone();
        bad[3] = -1;
        e = assertThrows(IllegalArgumentException.class, () -> DetectionLimits.suggested(EDGES, new double[][] {bad}));
        assertTrue(e.getMessage().contains("row 0, bin 3 is -1.0"), e.getMessage());
    }
}
