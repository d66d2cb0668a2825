package io.densa.regression.surveillance;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * The monitor's excess counts on invented count panels whose truth is known: each unit has a fixed
 * age-like profile (a normal N(μ_i, σ_i²) truncated to [0, 1], band probabilities from Commons
 * Math's normal CDF), a fixed size between 80 and 2,000 events a period (small units included), and
 * multinomial counts in 10 bins every period; densities and estimation variances come from the
 * penalised-likelihood estimator with every default. In units without change the displaced events'
 * p-values are valid (P(p ≤ α) ≤ α, the definition of a valid p-value), which needs the baseline's
 * own error in the null: against counting noise alone they are far too small. Units whose profile
 * shifts are found in the period of the shift.
 */
class MonitorExcessTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 3);
    static final int UNITS = 48;
    static final int BINS = 10;
    static final double[] EDGES = new double[BINS + 1];

    static {
        for (int j = 0; j <= BINS; j++) {
            EDGES[j] = j / (double) BINS;
        }
    }

    /** Bin probabilities of N(mu, sd²) truncated to [0, 1]. */
    static double[] binProbabilities(double mu, double sd) {
        NormalDistribution nd = new NormalDistribution(null, mu, sd);
        double mass = nd.cumulativeProbability(1) - nd.cumulativeProbability(0);
        double[] p = new double[BINS];
        for (int j = 0; j < BINS; j++) {
            p[j] = (nd.cumulativeProbability(EDGES[j + 1]) - nd.cumulativeProbability(EDGES[j])) / mass;
        }
        return p;
    }

    /**
     * Periods 0..periods−1; units in {@code shifted} move their centre by +0.12 from period
     * {@code onset} on.
     */
    static List<Period> panel(int periods, int onset, boolean[] shifted, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        double[] mu = new double[UNITS];
        double[] sd = new double[UNITS];
        long[] size = new long[UNITS];
        for (int i = 0; i < UNITS; i++) {
            mu[i] = 0.35 + 0.3 * rng.nextDouble();
            sd[i] = 0.15 + 0.1 * rng.nextDouble();
            size[i] = Math.round(80 * Math.pow(25, i / (UNITS - 1.0))); // 80 to 2,000 events
        }
        String[] ids = new String[UNITS];
        Arrays.setAll(ids, i -> "u" + i);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(SPACE)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED); // the same reading every period
        List<Period> out = new ArrayList<>();
        for (int t = 0; t < periods; t++) {
            long[][] counts = new long[UNITS][BINS];
            int[][] intCounts = new int[UNITS][BINS];
            for (int i = 0; i < UNITS; i++) {
                double[] p = binProbabilities(mu[i] + (shifted[i] && t >= onset ? 0.12 : 0), sd[i]);
                for (long e = 0; e < size[i]; e++) {
                    double u = rng.nextDouble();
                    int j = 0;
                    while (j < BINS - 1 && u >= p[j]) {
                        u -= p[j];
                        j++;
                    }
                    counts[i][j]++;
                    intCounts[i][j]++;
                }
            }
            BatchEstimate b = est.fitAll(EDGES, intCounts, ids);
            out.add(new Period(t, b.densities(), null, b.estimationVariances(), counts, EDGES));
        }
        return out;
    }

    @Test
    void displacedEventsAreUniformWithoutChangeAndFoundWithIt() {
        boolean[] shifted = new boolean[UNITS];
        for (int i = 0; i < UNITS; i += 8) {
            shifted[i] = true; // six units, small and large
        }
        int periods = 40;
        int onset = 36;
        List<Period> all = panel(periods, onset, shifted, 5);
        BaselineMonitor m = RollingBaseline.withDefaults().withCalibrationPeriods(6).withDraws(199, 3)
                .withExcessBands(0, 0.3, 0.5, 0.7, 1).fit(all.subList(0, 20));
        ExcessCounts noiseOnly = ExcessCounts.withDefaults().withDraws(199, 3);
        int quiet = 0;
        int small = 0;
        int smallNoiseOnly = 0;
        int found = 0;
        int shiftedTotal = 0;
        for (int t = 20; t < periods; t++) {
            Period p = all.get(t);
            PeriodReport rep = m.score(p);
            assertEquals(4, rep.excess().units().get(0).bands().size());
            ExcessCounts.Result none = noiseOnly.estimate(rep.expected(), p.counts(), EDGES,
                    new double[] {0, 0.3, 0.5, 0.7, 1}, ExcessCounts.BaselineError.none());
            for (int i = 0; i < UNITS; i++) {
                double pv = rep.excess().units().get(i).displaced().pValue();
                if (shifted[i] && t == onset) {
                    // a lag-1 baseline predicts the next period from this one, so a lasting shift
                    // stands out in its first period
                    shiftedTotal++;
                    found += pv <= 0.05 ? 1 : 0;
                } else if (!shifted[i]) {
                    quiet++;
                    small += pv <= 0.1 ? 1 : 0;
                    smallNoiseOnly += none.units().get(i).displaced().pValue() <= 0.1 ? 1 : 0;
                }
            }
            m = m.absorb(p);
        }
        double share = small / (double) quiet;
        double shareNoiseOnly = smallNoiseOnly / (double) quiet;
        System.out.printf(java.util.Locale.ROOT, "monitor displaced events: quiet unit-periods %d, P(p <= 0.1) %.3f"
                + " (counting noise alone %.3f); shifted units at the onset: %d of %d with p <= 0.05%n", quiet, share,
                shareNoiseOnly,
                found, shiftedTotal);
        // a valid p-value has P(p <= 0.1) <= 0.1; 840 quiet unit-periods, correlated through the shared
        // baseline and calibration set (the binomial SD of the share at 0.1 alone is 0.010). The error law
        // is a model (a variance line and one shape for every unit), on the cautious side here (about 0.05);
        // against counting noise alone the p-values are not valid
        assertTrue(share <= 0.13 && share >= 0.03, "share of quiet unit-periods with p <= 0.1: " + share);
        assertTrue(shareNoiseOnly >= 0.18, "counting noise alone: " + shareNoiseOnly + " against " + share);
        assertTrue(found >= 4, found + " of " + shiftedTotal + " shifted units found at the onset");
        int flaggedUnits = 0;
        for (AlertHistory h : m.history()) {
            if (h.flaggedPeriods() == 0) {
                assertEquals(0, h.cumulativeDisplaced(), 0);
            } else {
                assertTrue(h.cumulativeDisplaced() > 0, h.toString());
                flaggedUnits++;
            }
        }
        assertTrue(flaggedUnits > 0, "no unit flagged, so the alert history's displaced events went untested");
    }

    /** Excess bands that do not fit a period's bins are refused when the period is scored, naming both. */
    @Test
    void bandsThatDoNotFitTheBinsAreNamed() {
        List<Period> all = panel(12, 99, new boolean[UNITS], 6);
        BaselineMonitor m = RollingBaseline.withDefaults().withCalibrationPeriods(2).withDraws(99, 1)
                .withExcessBands(0, 0.35, 1).fit(all.subList(0, 11));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> m.score(all.get(11)));
        assertTrue(e.getMessage().startsWith("period 11: excess band edge 0.35 (withExcessBands) is not one of the"
                + " period's bin edges"), e.getMessage());
        BaselineMonitor ending = RollingBaseline.withDefaults().withCalibrationPeriods(2).withDraws(99, 1)
                .withExcessBands(0, 0.5, 0.9).fit(all.subList(0, 11));
        e = assertThrows(IllegalArgumentException.class, () -> ending.score(all.get(11)));
        assertTrue(e.getMessage().contains("must be the layout's last bin edge 1.0"), e.getMessage());
        PeriodReport rep = RollingBaseline.withDefaults().withCalibrationPeriods(2).withDraws(99, 1).fit(all.subList(0, 11))
                .score(all.get(11));
        e = assertThrows(IllegalArgumentException.class, () -> rep.displacedEvents(UNITS));
        assertTrue(e.getMessage().equals("unit index 48 is out of range: accepted are 0..47 (48 units)"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> rep.residualCovariance(-1));
        assertThrows(IllegalArgumentException.class, () -> rep.flagged(UNITS));
        assertThrows(IllegalArgumentException.class, () -> RollingBaseline.withDefaults().withExcessBands(0.5));
        assertThrows(IllegalArgumentException.class, () -> RollingBaseline.withDefaults().withExcessBands(0, 0.5, 0.5));
    }
}
