package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.RawBasis;
import io.densa.core.internal.RoughnessPenalty;
import io.densa.core.internal.UnitLanes;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * Units carried in the lanes of one vector ({@link NewtonLanes}) must be fitted exactly as one
 * unit alone by {@link PenalizedNewton#solve}: the same bits in every number the engine hands on
 * (coefficients, iterations, failure message, log-likelihood, quadrature state, Newton factor's
 * log determinant, robust sandwich covariance and edf), whatever the other lanes hold. The reference is the one-unit engine on the
 * same (vector) kernel path; the check is exact equality. Runs on the vector path only (the
 * test execution with {@code --add-modules jdk.incubator.vector}).
 */
class NewtonLanesTest {

    /** Counts of many shapes: dense and sparse, empty ends, a spike, a single occupied bin, none at all. */
    private static double[][] units(int n, long seed) {
        Random r = new Random(seed);
        double[][] c = new double[n][365];
        for (int i = 0; i < n; i++) {
            int kind = i % 7;
            double centre = 40 + 280 * r.nextDouble(), width = 5 + 80 * r.nextDouble();
            double level = kind == 0 ? 0.05 : kind == 1 ? 40 : 1 + 5 * r.nextDouble();
            for (int j = 0; j < 365; j++) {
                double x = (j + 0.5 - centre) / width;
                double mean = level * Math.exp(-0.5 * x * x) * (kind == 2 && j > 300 ? 0 : 1);
                c[i][j] = Math.floor(mean + r.nextDouble() * Math.sqrt(mean + 0.1));
            }
            if (kind == 3) {
                c[i][(int) centre] += 400; // a spike
            }
            if (kind == 4 && i % 2 == 0) {
                java.util.Arrays.fill(c[i], 0);
                c[i][100 + i % 50] = 3; // one occupied bin
            }
            if (kind == 5 && i % 3 == 0) {
                java.util.Arrays.fill(c[i], 0); // no events: not fitted
            }
        }
        return c;
    }

    /** Daily counts summed into the given number of equal bins. */
    private static double[][] coarse(double[][] daily, int bins) {
        double[][] c = new double[daily.length][bins];
        for (int i = 0; i < daily.length; i++) {
            for (int j = 0; j < 365; j++) {
                c[i][(int) ((long) j * bins / 365)] += daily[i][j];
            }
        }
        return c;
    }

    private record Fit(double[] beta, int iterations, String failure, double loglik, double logDet, double z,
            double shift, double[] ex, double[] mass, double[] cov, double edf) {
        /** The engine's state, and its robust sandwich covariance (given, or computed by the engine). */
        static Fit of(PenalizedNewton e, double lambda, double[] u, double[] cov, double edf) {
            PenalizedObjective lik = e.objective();
            double[] beta = e.coefficients(), ex = lik.ex.clone(), mass = lik.mass.clone();
            double z = lik.zScaled(), shift = lik.shift();
            if (cov == null) {
                cov = new double[u.length];
                e.fisherInformation();
                edf = e.sandwich(lambda, u, cov, true, null);
            }
            return new Fit(beta, e.iterations(), e.failure(), e.logLikelihood(), e.newtonLogDet(), z, shift, ex, mass,
                    cov, edf);
        }

        void assertSame(Fit o, String where) {
            assertEquals(bits(beta), bits(o.beta), where + ": coefficients");
            assertEquals(iterations, o.iterations, where + ": iterations");
            assertEquals(failure, o.failure, where + ": failure");
            assertEquals(Double.doubleToLongBits(loglik), Double.doubleToLongBits(o.loglik), where + ": loglik");
            assertEquals(Double.doubleToLongBits(logDet), Double.doubleToLongBits(o.logDet), where + ": log det");
            assertEquals(Double.doubleToLongBits(z), Double.doubleToLongBits(o.z), where + ": Z");
            assertEquals(Double.doubleToLongBits(shift), Double.doubleToLongBits(o.shift), where + ": shift");
            assertEquals(bits(ex), bits(o.ex), where + ": exponentials");
            assertEquals(bits(mass), bits(o.mass), where + ": masses");
            assertEquals(bits(cov), bits(o.cov), where + ": covariance");
            assertEquals(Double.doubleToLongBits(edf), Double.doubleToLongBits(o.edf), where + ": edf");
        }

        private static List<Long> bits(double[] a) {
            List<Long> out = new ArrayList<>();
            for (double v : a) {
                out.add(Double.doubleToLongBits(v));
            }
            return out;
        }
    }

    private static void check(double lambda, double[] prior, long seed, int maxIter, int bins) {
        UnitLanes lanes = UnitLanes.active();
        assumeTrue(lanes != null, "the vector path is not active (no --add-modules jdk.incubator.vector)");
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        double[] edges = new double[bins + 1];
        for (int j = 0; j <= bins; j++) {
            edges[j] = 365.0 * j / bins;
        }
        BinLayout lay = new BinLayout(space, edges, 0);
        RawBasis raw = EstimationSupport.rawBasis(space.basis());
        double[] pen = RoughnessPenalty.raw(raw, 2);
        double[] startConst = new double[space.dimension()];
        double[] startMap = lay.startMap(space, raw, pen, startConst);
        double[] u = EstimationSupport.upperU(space.basisTransform(), space.dimension());
        java.util.function.Supplier<PenalizedNewton> engines = () -> {
            PenalizedNewton e = new PenalizedNewton(lay, pen, prior);
            e.setCoordinateMap(u);
            e.setStartMap(startMap, startConst);
            return e;
        };
        double[][] counts = coarse(units(61, seed), bins);
        double[] totals = new double[counts.length];
        Fit[] alone = new Fit[counts.length];
        PenalizedNewton one = engines.get();
        for (int i = 0; i < counts.length; i++) {
            for (double v : counts[i]) {
                totals[i] += v;
            }
            if (totals[i] > 0) {
                one.useCounts(counts[i].clone(), totals[i]);
                one.startFromCounts();
                one.solve(lambda, maxIter, 1e-12);
                alone[i] = Fit.of(one, lambda, u, null, Double.NaN);
            }
        }
        Fit[] laned = new Fit[counts.length];
        boolean[] seen = new boolean[counts.length];
        new NewtonLanes(lanes, lay, engines, lambda, null, Double.NaN, pen, prior, u).fit(0, counts.length, maxIter,
                1e-12, new NewtonLanes.Units() {
            @Override
            public boolean load(int i, PenalizedNewton eng, double[] row) {
                seen[i] = true;
                if (!(totals[i] > 0)) {
                    return false;
                }
                System.arraycopy(counts[i], 0, row, 0, row.length);
                eng.useCounts(row, totals[i]); // the start is the lanes' (the reference: startFromCounts)
                return true;
            }

            @Override
            public void finish(int i, PenalizedNewton eng, double lam, double[] found, boolean converged, double[] cov,
                    double edf, boolean definite) {
                assertEquals(eng.failure() == null, converged, "unit " + i);
                // definite: the one-unit Cholesky of the covariance succeeds
                int k = space.dimension();
                assertEquals(cov != null && Cholesky.factor(cov.clone(), k, k, 0) < 0, definite, "unit " + i);
                laned[i] = Fit.of(eng, lambda, u, cov, edf);
            }
        });
        int fitted = 0;
        for (int i = 0; i < counts.length; i++) {
            assertTrue(seen[i], "unit " + i + " offered");
            if (alone[i] == null) {
                assertEquals(null, laned[i], "unit " + i + " without events is not fitted");
                continue;
            }
            alone[i].assertSame(laned[i], "lambda " + lambda + ", unit " + i);
            fitted++;
        }
        assertTrue(fitted > 40, "units fitted: " + fitted);

    }

    @Test
    void lanesGiveTheBitsOfOneUnitAlone() {
        check(5e4, null, 11, 100, 365);
        check(30, null, 12, 100, 365); // little smoothing: more iterations, line searches
        check(30, null, 16, 3, 365); // stopped after three iterations
    }

    /** Bins wider than the knot spans: most bins in the general loop, observed information often not positive definite. */
    @Test
    void lanesGiveTheBitsOfOneUnitAloneOnWideBins() {
        check(1e-2, null, 17, 100, 40);
        check(1e-4, null, 18, 100, 15);
        check(0.0, null, 20, 100, 15); // fewer bins than coordinates, no penalty: singular information
    }

    @Test
    void lanesGiveTheBitsOfOneUnitAloneWithAPrior() {
        int k = BayesSpace.cubicSplines(0, 365, 21).dimension();
        double[] prior = new double[k * k];
        for (int i = 0; i < k; i++) {
            prior[i * k + i] = 1e-3;
        }
        check(300, prior, 13, 100, 365);
        check(3, prior, 19, 100, 40);
    }

    /**
     * The public batch: one call for many units (through the lanes) against one call per unit (a
     * single unit is fitted on its own engine, without the lanes): the same bits and diagnostics.
     */
    @Test
    void batchEqualsUnitByUnit() {
        assumeTrue(UnitLanes.active() != null, "the vector path is not active");
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        double[] edges = new double[366];
        for (int j = 0; j <= 365; j++) {
            edges[j] = j;
        }
        double[][] c = units(23, 14);
        int[][] counts = new int[c.length][];
        for (int i = 0; i < c.length; i++) {
            counts[i] = new int[365];
            for (int j = 0; j < 365; j++) {
                counts[i][j] = (int) c[i][j];
            }
            counts[i][200] += 1; // every unit has events
        }
        PenalizedLikelihoodEstimator e = PenalizedLikelihoodEstimator.withDefaults(space).withSmoothing(2e3)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED);
        assertBatchEqualsUnits(e, edges, counts, "fixed lambda");
    }

    /**
     * Without the reference prior and with fewer bins than coordinates at λ = 0 the penalised
     * information is singular: such a unit's edf and covariance are computed again with the default
     * prior added (from its own Fisher information, not the lanes'). The batch against one call per
     * unit: the same bits and diagnostics, and at least one unit took that path.
     */
    @Test
    void batchEqualsUnitByUnitWithSingularInformation() {
        assumeTrue(UnitLanes.active() != null, "the vector path is not active");
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        int bins = 5;
        double[] edges = new double[bins + 1];
        for (int j = 0; j <= bins; j++) {
            edges[j] = 365.0 * j / bins;
        }
        double[][] c = coarse(units(19, 31), bins);
        int[][] counts = new int[c.length][];
        for (int i = 0; i < c.length; i++) {
            counts[i] = new int[bins];
            for (int j = 0; j < bins; j++) {
                counts[i][j] = (int) c[i][j];
            }
            counts[i][2] += 1;
        }
        PenalizedLikelihoodEstimator e = PenalizedLikelihoodEstimator.withDefaults(space)
                .withCriterion(SmoothingCriterion.AIC).withSmoothing(0).withReferencePrior(0).withMaxIterations(5)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED);
        assertTrue(assertBatchEqualsUnits(e, edges, counts, "singular information"), "the batch compared");
        String[] ids = new String[counts.length];
        java.util.Arrays.setAll(ids, i -> "u" + i);
        long singular = e.fitAll(edges, counts, ids).diagnostics().stream()
                .filter(d -> d.reason().contains("reported with the default reference prior")).count();
        assertTrue(singular > 0, "units on the singular path: " + singular);
    }

    /**
     * With λ chosen per unit (each unit's search runs its fits in its lane): the batch against one
     * call per unit, for every criterion the lanes carry (cross-validation is fitted unit by unit),
     * with and without the reference prior: the same λ, the same bits, the same diagnostics.
     */
    @Test
    void batchEqualsUnitByUnitWithChosenSmoothing() {
        assumeTrue(UnitLanes.active() != null, "the vector path is not active");
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        double[] edges = new double[74];
        for (int j = 0; j < edges.length; j++) {
            edges[j] = Math.min(365, 5.0 * j);
        }
        double[][] c = coarse(units(29, 23), 73);
        int[][] counts = new int[c.length][];
        for (int i = 0; i < c.length; i++) {
            counts[i] = new int[73];
            for (int j = 0; j < 73; j++) {
                counts[i][j] = (int) c[i][j];
            }
            counts[i][40] += 1;
        }
        int compared = 0;
        for (SmoothingCriterion crit : new SmoothingCriterion[] {SmoothingCriterion.MARGINAL_LIKELIHOOD,
            SmoothingCriterion.AIC, SmoothingCriterion.AICC, SmoothingCriterion.GCV}) {
            PenalizedLikelihoodEstimator e = PenalizedLikelihoodEstimator.withDefaults(space).withCriterion(crit);
            compared += assertBatchEqualsUnits(e, edges, counts, crit.toString()) ? 1 : 0;
            compared += assertBatchEqualsUnits(e.withReferencePrior(0), edges, counts, crit + " without prior") ? 1 : 0;
        }
        // AICc is undefined for the sparsest units, and without the prior one unit's information is singular
        assertTrue(compared >= 5, "batches compared: " + compared);
        // empty end runs read as censored cells (merged bins on the shared quadrature, in lanes too)
        PenalizedLikelihoodEstimator censored = PenalizedLikelihoodEstimator.withDefaults(space)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.CENSORED);
        assertTrue(assertBatchEqualsUnits(censored, edges, counts, "censored ends"), "the censored batch compared");
        assertTrue(censored.fitAll(edges, counts, null).diagnostics().stream().filter(d -> d.reason().contains("censor"))
                .count() > 3, "units read as censored");
        // on a circle (periodic cubic splines: the same lanes, the nodes wrapping around)
        BayesSpace circle = BayesSpace.periodicSplines(0, 365, 4, 14);
        assertTrue(assertBatchEqualsUnits(PenalizedLikelihoodEstimator.withDefaults(circle), edges, counts, "circle"),
                "the circle's batch compared");
    }

    /**
     * A batch of the units against one call per unit (a single unit is fitted without the lanes):
     * the same bits and diagnostics, or the batch throws what the first of its units (in input
     * order) that throws alone throws (nothing differs silently, and the batch names the unit a
     * unit-by-unit loop names). Returns whether the batch was compared (false: it threw).
     */
    private static boolean assertBatchEqualsUnits(PenalizedLikelihoodEstimator e, double[] edges, int[][] counts,
            String where) {
        int n = counts.length;
        String[] ids = new String[n];
        java.util.Arrays.setAll(ids, i -> "u" + i);
        BatchEstimate all;
        try {
            all = e.fitAll(edges, counts, ids);
        } catch (RuntimeException batch) {
            for (int i = 0; i < n; i++) {
                try {
                    e.fitAll(edges, new int[][] {counts[i]}, new String[] {ids[i]});
                } catch (RuntimeException one) {
                    assertEquals(one.getClass(), batch.getClass(), where + ": unit " + i + " alone");
                    assertEquals(one.getMessage(), batch.getMessage(), where + ": unit " + i + " alone");
                    return false;
                }
            }
            throw new AssertionError(where + ": the batch threw " + batch + " but no unit alone does", batch);
        }
        DensitySet d = all.densities();
        for (int i = 0; i < counts.length; i++) {
            UnitEstimate one = e.fitAll(edges, new int[][] {counts[i]}, new String[] {ids[i]}).unit(0);
            double[] a = d.get(i).coordinates(), b = one.density().coordinates();
            for (int j = 0; j < a.length; j++) {
                assertEquals(Double.doubleToLongBits(b[j]), Double.doubleToLongBits(a[j]),
                        where + ", unit " + i + ", " + j);
            }
            assertEquals(one.diagnostics(), all.diagnostics().get(i), where + ", unit " + i);
        }
        return true;
    }

    /**
     * The same on random layouts (5–400 bins, 2–31 knots), smoothing 10⁻³–10⁷ or chosen per unit,
     * with and without the reference prior, units from flat to spiked: a batch either equals its units fitted one at a
     * time to the bit, or throws, and then so does one of its units alone (nothing differs
     * silently). A longer run of this (400 layouts, about 10⁴ units) found no difference.
     */
    @Test
    void batchEqualsUnitByUnitOnRandomLayouts() {
        assumeTrue(UnitLanes.active() != null, "the vector path is not active");
        Random r = new Random(21);
        for (int t = 0; t < 12; t++) {
            int bins = 5 + r.nextInt(400);
            BayesSpace space = BayesSpace.cubicSplines(0, 100, 2 + r.nextInt(30));
            double[] edges = new double[bins + 1];
            for (int j = 0; j <= bins; j++) {
                edges[j] = 100.0 * j / bins;
            }
            int n = 8 + r.nextInt(24);
            int[][] counts = new int[n][bins];
            for (int i = 0; i < n; i++) {
                double centre = 100 * r.nextDouble(), width = 0.5 + 40 * r.nextDouble();
                double level = Math.pow(10, -1 + 4 * r.nextDouble());
                for (int j = 0; j < bins; j++) {
                    double x = (100.0 * (j + 0.5) / bins - centre) / width;
                    double m = level * Math.exp(-0.5 * x * x) / bins * 50;
                    counts[i][j] = (int) Math.floor(m + r.nextDouble() * Math.sqrt(m + 0.01));
                }
                if (i % 4 == 3) {
                    counts[i][r.nextInt(bins)] += 1 + r.nextInt(1000);
                }
                counts[i][r.nextInt(bins)] += 1;
            }
            PenalizedLikelihoodEstimator e = PenalizedLikelihoodEstimator.withDefaults(space).withReferencePrior(t % 2)
                    .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED);
            // every other layout with λ chosen per unit: by the default criterion, or by AICc, undefined
            // for the sparsest units (the batch must then name the first such unit in input order)
            e = t % 4 < 2 ? e.withSmoothing(Math.pow(10, -3 + 10 * r.nextDouble()))
                    : t % 4 == 3 ? e.withCriterion(SmoothingCriterion.AICC) : e;
            assertBatchEqualsUnits(e, edges, counts, "layout " + t);
        }
    }
}
