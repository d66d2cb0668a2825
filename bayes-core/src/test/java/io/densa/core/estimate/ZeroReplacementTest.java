package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.junit.jupiter.api.Test;

class ZeroReplacementTest {
    private static final double[] COUNTS = {0, 3, 7, 10};

    /**
     * Worked example, counts (0, 3, 7, 10): the formulas are from memory of Martín-Fernández, Hron,
     * Templ, Filzmoser, Palarea-Albaladejo (2015), Bayesian-multiplicative treatment of count zeros in
     * compositional data sets, Statistical Modelling 15(2); the numbers were derived by hand from
     * those formulas (they are not values printed in the paper) and are derived a second way in
     * {@link #zeroPartIsDirichletPosteriorMean()} (Dirichlet–multinomial conjugacy).
     */
    @Test
    void reproducesWorkedExample() {
        check(ZeroReplacement.Prior.JEFFREYS, 0.022727, 0.146591, 0.342045, 0.488636);
        check(ZeroReplacement.Prior.PERKS, 0.011905, 0.148214, 0.345833, 0.494048);
        check(ZeroReplacement.Prior.BAYES_LAPLACE, 0.041667, 0.143750, 0.335417, 0.479167);
        check(ZeroReplacement.Prior.SQUARE_ROOT, 0.045686, 0.143147, 0.334010, 0.477157);
    }

    private static void check(ZeroReplacement.Prior prior, double... expected) {
        double[] r = ZeroReplacement.bayesianMultiplicative(prior).replace(COUNTS);
        for (int j = 0; j < 4; j++) {
            assertEquals(expected[j], r[j], 6e-7, prior + " part " + j);
        }
    }

    /**
     * Independent re-derivation with Commons Math: under the Dirichlet(s t) prior the posterior of a
     * part is Beta(c_j + s t_j, n + s − c_j − s t_j), and the replacement of a zero part is its
     * posterior mean; the non-zero parts are the observed proportions scaled to the remaining mass.
     */
    @Test
    void zeroPartIsDirichletPosteriorMean() {
        double n = 20;
        int d = 4;
        for (ZeroReplacement.Prior prior : ZeroReplacement.Prior.values()) {
            ZeroReplacement z = ZeroReplacement.bayesianMultiplicative(prior);
            double s = z.priorStrength(d, n);
            double[] r = z.replace(COUNTS);
            double alpha = 0 + s / d;
            double mean = new BetaDistribution(null, alpha, n + s - alpha).getNumericalMean();
            assertEquals(mean, r[0], 1e-14, prior.toString());
            for (int j = 1; j < d; j++) {
                assertEquals(COUNTS[j] / n * (1 - mean), r[j], 1e-14);
            }
        }
    }

    /** Ratios of non-zero parts are kept exactly, compositions close to 1 and every part is > 0. */
    @Test
    void keepsRatiosOfNonZeroParts() {
        Random rnd = new Random(3);
        ZeroReplacement[] all = {ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.JEFFREYS),
            ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.PERKS),
            ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.BAYES_LAPLACE),
            ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.SQUARE_ROOT),
            ZeroReplacement.multiplicative(0.001)};
        for (int rep = 0; rep < 200; rep++) {
            int d = 3 + rnd.nextInt(30);
            double[] c = new double[d];
            c[rnd.nextInt(d)] = 1 + rnd.nextInt(5);
            for (int j = 0; j < d; j++) {
                if (rnd.nextDouble() < 0.5) {
                    c[j] += rnd.nextInt(20);
                }
            }
            for (ZeroReplacement z : all) {
                double[] r = z.replace(c);
                double sum = 0;
                for (int j = 0; j < d; j++) {
                    assertTrue(r[j] > 0);
                    sum += r[j];
                    for (int i = 0; i < d; i++) {
                        if (c[i] > 0 && c[j] > 0) {
                            assertEquals(c[i] / c[j], r[i] / r[j], 1e-12 * c[i] / c[j]);
                        }
                    }
                }
                assertEquals(1.0, sum, 1e-12);
            }
        }
    }

    @Test
    void simpleMultiplicativeReplacesByDelta() {
        double[] r = ZeroReplacement.multiplicative(0.01).replace(COUNTS);
        // closed form: zeros -> δ, others x_j (1 − Z δ) with x = c / n
        assertEquals(0.01, r[0], 0);
        assertEquals(0.15 * 0.99, r[1], 1e-15);
        assertEquals(0.35 * 0.99, r[2], 1e-15);
        assertEquals(0.5 * 0.99, r[3], 1e-15);
    }

    @Test
    void rejectsBadCompositions() {
        ZeroReplacement z = ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.PERKS);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> z.replaceAll(new double[][] {{1, 2}, {1, Double.NaN}}));
        assertTrue(e.getMessage().matches("row 1, part 1: count must be finite and >= 0, got NaN"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> z.replace(new double[] {0, 0, 0}));
        assertTrue(e.getMessage().matches(".*total count is 0.*"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> z.replace(new double[] {1, -1}));
        assertTrue(e.getMessage().matches(".*part 1: count must be finite and >= 0, got -1.0"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> ZeroReplacement.multiplicative(Double.NaN));
        e = assertThrows(IllegalArgumentException.class,
                () -> ZeroReplacement.multiplicative(0.4).replace(new double[] {0, 0, 0, 1}));
        assertTrue(e.getMessage().matches(".*3 zeros times delta = 0.4 must stay below 1"), e.getMessage());
    }

    /**
     * Counts near the overflow limit: the total 2 × 10³⁰⁸ overflows, so the counts are scaled by
     * their maximum first; the result is closed, positive, and keeps the ratios of the non-zero
     * parts (the definition above).
     */
    @Test
    void hugeCountsGiveClosedCompositions() {
        for (ZeroReplacement z : new ZeroReplacement[] {ZeroReplacement.multiplicative(0.01),
            ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.JEFFREYS),
            ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.SQUARE_ROOT)}) {
            double[] r = z.replace(new double[] {1e308, 0, 1e308});
            assertEquals(1.0, r[0] + r[1] + r[2], 1e-15, z.toString());
            assertTrue(r[1] > 0, z.toString());
            assertEquals(r[0], r[2], 0.0, z.toString());
        }
        double[] r = ZeroReplacement.multiplicative(0.01).replace(new double[] {1e308, 0, 1e308});
        assertEquals(0.01, r[1], 0.0);
        assertEquals(0.495, r[0], 1e-16);
    }

    /** A count whose proportion underflows cannot be returned as a part &gt; 0: rejected, naming it. */
    @Test
    void underflowingProportionIsRejected() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> ZeroReplacement
                .bayesianMultiplicative(ZeroReplacement.Prior.PERKS).replace(new double[] {Double.MIN_VALUE, 10, 10}));
        assertTrue(e.getMessage().matches("composition, part 0: count 4.9E-324 is too small.*"), e.getMessage());
    }
}
