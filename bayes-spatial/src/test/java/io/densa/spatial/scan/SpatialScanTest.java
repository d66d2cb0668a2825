package io.densa.spatial.scan;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.spatial.Locations;
import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.random.Well19937c;
import org.junit.jupiter.api.Test;

/**
 * {@link SpatialScan} against the Poisson log-likelihood ratio of Kulldorff (1997), A spatial scan
 * statistic, Commun. Stat. Theory Methods 26(6), computed by hand on a small case, and the size
 * and power of its Monte Carlo test on simulated data with known truth.
 */
class SpatialScanTest {
    private static final Locations LINE = Locations.planar(new double[] {0, 1, 2, 3, 4}, new double[5]);

    /** The paper's LLR: c ln(c/e) + (C − c) ln((C − c)/(C − e)) for c &gt; e, written out here. */
    private static double kulldorff(double c, double e, double total) {
        return c * Math.log(c / e) + (total - c) * Math.log((total - c) / (total - e));
    }

    @Test
    void handComputedCase() {
        // five units on a line, 50 events, expected 10 each; zones hold at most 2 units (share 0.4 ≤ 0.5).
        // Candidate zones by hand: {0,1}: c = 38, e = 20 → 38 ln 1.9 + 12 ln 0.4 = 13.39496; {0}: 20 ln 2 + 30 ln 0.75
        // = 5.23248; {1}: 18 ln 1.8 + 32 ln 0.8 = 3.43957; every other zone has c ≤ e. So {0,1} wins.
        long[] obs = {20, 18, 5, 4, 3};
        double[] exp = {10, 10, 10, 10, 10};
        SpatialScan.Result r = SpatialScan.withDefaults().withReplicates(999, 4).test(LINE, obs, exp);
        double llr = kulldorff(38, 20, 50);
        assertEquals(13.394958890, llr, 1e-8); // hand arithmetic: 38·0.641853886 − 12·0.916290732
        SpatialScan.Cluster c = r.mostLikely();
        assertEquals(llr, c.logLikelihoodRatio(), 1e-12);
        int[] members = c.members();
        Arrays.sort(members);
        assertArrayEquals(new int[] {0, 1}, members);
        assertEquals(38, c.observed());
        assertEquals(20, c.expected(), 1e-12);
        assertEquals(18, c.excess(), 1e-12);
        assertEquals((38 / 20.0) / (12 / 30.0), c.relativeRisk(), 1e-12);
        assertEquals(10, r.zones()); // two per centre
        // 38 of 50 events where 20 are expected: under the null (binomial(50, 0.4) for one fixed zone,
        // P(≥ 38) ≈ 1e-7) no replicate reaches it
        assertEquals(0.001, r.pValue(), 1e-12);
        // the result is a TestResult: statistic = the cluster's LLR, p ≤ alpha decides
        assertEquals(c.logLikelihoodRatio(), r.statistic());
        assertEquals("Monte Carlo (999 replicates, seed 4), upper tail", r.method());
        assertTrue(r.significantAt(0.001));
        assertFalse(r.significantAt(0.000999));
        assertThrows(IllegalArgumentException.class, () -> r.significantAt(0));
        assertThrows(IllegalArgumentException.class, () -> r.significantAt(Double.NaN));
        assertEquals(kulldorff(20, 10, 50), SpatialScan.llr(20, 10, 50), 1e-12);
        assertEquals(5.232481, SpatialScan.llr(20, 10, 50), 1e-6);
    }

    @Test
    void expectedCountsAreRescaledToTheObservedTotal() {
        long[] obs = {20, 18, 5, 4, 3};
        SpatialScan.Result r = SpatialScan.withDefaults().withReplicates(99, 4).test(LINE, obs,
                new double[] {5, 5, 5, 5, 5});
        assertEquals(kulldorff(38, 20, 50), r.mostLikely().logLikelihoodRatio(), 1e-12);
        assertEquals(10, r.mostLikely().expected(), 1e-12);
        assertEquals(20, r.mostLikely().expectedConditional(), 1e-12);
        assertEquals(28, r.mostLikely().excess(), 1e-12);
    }

    private static Locations randomSites(SplittableRandom rng, int n) {
        double[] x = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = rng.nextDouble() * 100;
            y[i] = rng.nextDouble() * 100;
        }
        return Locations.planar(x, y);
    }

    private static long poisson(SplittableRandom rng, double mean) {
        return new PoissonDistribution(new Well19937c(rng.nextLong()), mean, PoissonDistribution.DEFAULT_EPSILON,
                PoissonDistribution.DEFAULT_MAX_ITERATIONS).sample();
    }

    @Test
    void sizeUnderTheNull() {
        // 200 data sets of 50 units with Poisson(expected) counts and no cluster; 99 replicates each.
        // A valid Monte Carlo test has P(p ≤ α) ≤ α: check α = 0.05, 0.2 and 0.5 within 3.5 binomial sd.
        SplittableRandom rng = new SplittableRandom(99);
        int sets = 200;
        double[] p = new double[sets];
        for (int s = 0; s < sets; s++) {
            Locations loc = randomSites(rng, 50);
            double[] e = new double[50];
            long[] o = new long[50];
            for (int i = 0; i < 50; i++) {
                e[i] = 5 + 45 * rng.nextDouble();
                o[i] = poisson(rng, e[i]);
            }
            p[s] = SpatialScan.withDefaults().withReplicates(99, s).test(loc, o, e).pValue();
        }
        for (double alpha : new double[] {0.05, 0.2, 0.5}) {
            double size = Arrays.stream(p).filter(v -> v <= alpha).count() / (double) sets;
            double sd = Math.sqrt(alpha * (1 - alpha) / sets);
            assertTrue(size <= alpha + 3.5 * sd && size >= alpha - 3.5 * sd, "P(p ≤ " + alpha + ") = " + size);
        }
    }

    @Test
    void plantedClusterIsFound() {
        // relative risk 1.8 in the 6 units nearest to unit 0 (itself included): found (p ≤ 0.01) in at least
        // 9 of 10 data sets, the reported zone sharing at least 4 of the 6 planted units
        SplittableRandom rng = new SplittableRandom(7);
        int found = 0;
        for (int s = 0; s < 10; s++) {
            Locations loc = randomSites(rng, 60);
            Integer[] byDistance = new Integer[60];
            for (int i = 0; i < 60; i++) {
                byDistance[i] = i;
            }
            Arrays.sort(byDistance, (a, b) -> Double.compare(loc.distance(0, a), loc.distance(0, b)));
            boolean[] planted = new boolean[60];
            for (int t = 0; t < 6; t++) {
                planted[byDistance[t]] = true;
            }
            double[] e = new double[60];
            long[] o = new long[60];
            for (int i = 0; i < 60; i++) {
                e[i] = 20;
                o[i] = poisson(rng, planted[i] ? 1.8 * e[i] : e[i]);
            }
            SpatialScan.Result r = SpatialScan.withDefaults().withReplicates(199, s).test(loc, o, e);
            int shared = 0;
            for (int m : r.mostLikely().members()) {
                if (planted[m]) {
                    shared++;
                }
            }
            if (r.pValue() <= 0.01 && shared >= 4) {
                found++;
            }
        }
        assertTrue(found >= 9, "found " + found + " of 10");
    }

    @Test
    void seededAndBadInputNamed() {
        long[] obs = {20, 18, 5, 4, 3};
        double[] exp = {10, 10, 10, 10, 10};
        SpatialScan scan = SpatialScan.withDefaults().withReplicates(99, 1);
        assertEquals(scan.test(LINE, new long[] {12, 9, 8, 11, 10}, exp),
                scan.test(LINE, new long[] {12, 9, 8, 11, 10}, exp));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
                () -> scan.test(LINE, new long[] {1, 2, -3, 4, 5}, exp));
        assertTrue(ex.getMessage().contains("unit 2"), ex.getMessage());
        ex = assertThrows(IllegalArgumentException.class,
                () -> scan.test(LINE, obs, new double[] {1, 1, Double.NaN, 1, 1}));
        assertTrue(ex.getMessage().contains("unit 2"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> scan.test(LINE, new long[5], exp));
        assertThrows(IllegalArgumentException.class, () -> SpatialScan.withDefaults().withMaxShare(0));
        SpatialScan.Result none = scan.test(LINE, new long[] {10, 10, 10, 10, 10}, exp);
        assertEquals(1.0, none.pValue());
        assertEquals(0, none.mostLikely().members().length);
    }
}
