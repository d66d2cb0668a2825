package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static io.densa.core.estimate.EstimationTestSupport.ks;
import static io.densa.core.estimate.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.estimate.EstimationTestSupport.Truth;
import java.util.Arrays;
import java.util.List;
import org.apache.commons.math3.random.RandomGenerator;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

class SmoothingSplineEstimatorTest {

    /**
     * GCV (Craven &amp; Wahba 1979, from memory: D·RSS/(D − tr H)²) recomputed by brute force with EJML:
     * explicit hat matrix H = X (X'X + λΩ̃)⁻¹ X' on a fine grid of λ; the estimator's choice must match
     * the grid minimum and its criterion values must equal the brute-force ones.
     */
    @Test
    void gcvChoiceAgreesWithBruteForceGrid() {
        Truth truth = EstimationTestSupport.mixture();
        BayesSpace space = BayesSpace.splines(0, 1, 4, 6);
        int bins = 30;
        double[] e = edges(0, 1, bins);
        double[] counts = Arrays.stream(truth.counts(400, bins, rng(11))).asDoubleStream().toArray();
        SmoothingSplineEstimator est = SmoothingSplineEstimator.withDefaults(space);
        UnitEstimate fit = est.fit(e, counts);
        double chosen = fit.diagnostics().smoothing();

        // independent construction of y, X and Ω̃
        double[] r = ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.JEFFREYS).replace(counts);
        double[] mid = new double[bins];
        DMatrixRMaj y = new DMatrixRMaj(bins, 1);
        double mean = 0;
        for (int j = 0; j < bins; j++) {
            mid[j] = 0.5 * (e[j] + e[j + 1]);
            y.set(j, 0, Math.log(r[j] / (e[j + 1] - e[j])));
            mean += y.get(j, 0) / bins;
        }
        for (int j = 0; j < bins; j++) {
            y.set(j, 0, y.get(j, 0) - mean);
        }
        int k = space.dimension();
        DMatrixRMaj basis = space.basisMatrix(mid);
        DMatrixRMaj x = new DMatrixRMaj(bins, k + 1);
        for (int j = 0; j < bins; j++) {
            x.set(j, 0, 1);
            for (int c = 0; c < k; c++) {
                x.set(j, c + 1, basis.get(j, c));
            }
        }
        DMatrixRMaj om = new DMatrixRMaj(k + 1, k + 1);
        DMatrixRMaj omega = est.penalty();
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < k; b++) {
                om.set(a + 1, b + 1, omega.get(a, b));
            }
        }
        double bestL = Double.NaN, best = Double.POSITIVE_INFINITY;
        for (double g = -8; g <= 4; g += 0.01) {
            double lambda = Math.pow(10, g);
            double v = bruteGcv(x, y, om, lambda);
            if (v < best) {
                best = v;
                bestL = lambda;
            }
            if (Math.abs(g - Math.rint(g)) < 1e-9) {
                assertEquals(v, est.gcv(e, counts, lambda), 1e-9 * v, "GCV at lambda = " + lambda);
            }
        }
        String where = "chosen lambda " + chosen + " (GCV " + fit.diagnostics().criterionValue()
                + "), brute-force grid lambda " + bestL + " (GCV " + best + ")";
        assertTrue(fit.diagnostics().criterionValue() <= best * (1 + 1e-9), "chosen GCV above the grid minimum: "
                + where);
        assertEquals(Math.log10(bestL), Math.log10(chosen), 0.02, where);
        // and the coordinates equal the brute-force penalised least-squares solution
        DMatrixRMaj lhs = new DMatrixRMaj(k + 1, k + 1);
        CommonOps_DDRM.multTransA(x, x, lhs);
        CommonOps_DDRM.addEquals(lhs, chosen, om);
        DMatrixRMaj rhs = new DMatrixRMaj(k + 1, 1);
        CommonOps_DDRM.multTransA(x, y, rhs);
        DMatrixRMaj sol = new DMatrixRMaj(k + 1, 1);
        CommonOps_DDRM.solve(lhs, rhs, sol);
        for (int c = 0; c < k; c++) {
            assertEquals(sol.get(c + 1, 0), fit.density().coordinate(c), 1e-8);
        }
    }

    private static double bruteGcv(DMatrixRMaj x, DMatrixRMaj y, DMatrixRMaj om, double lambda) {
        int d = x.numRows, p = x.numCols;
        DMatrixRMaj lhs = new DMatrixRMaj(p, p);
        CommonOps_DDRM.multTransA(x, x, lhs);
        CommonOps_DDRM.addEquals(lhs, lambda, om);
        DMatrixRMaj inv = new DMatrixRMaj(p, p);
        CommonOps_DDRM.invert(lhs, inv);
        DMatrixRMaj tmp = new DMatrixRMaj(d, p);
        CommonOps_DDRM.mult(x, inv, tmp);
        DMatrixRMaj h = new DMatrixRMaj(d, d);
        CommonOps_DDRM.multTransB(tmp, x, h);
        DMatrixRMaj fit = new DMatrixRMaj(d, 1);
        CommonOps_DDRM.mult(h, y, fit);
        double rss = 0;
        for (int j = 0; j < d; j++) {
            double res = y.get(j, 0) - fit.get(j, 0);
            rss += res * res;
        }
        double tr = CommonOps_DDRM.trace(h);
        return d * rss / ((d - tr) * (d - tr));
    }

    /** Simulation recovery with dense counts: B2 and KS distances shrink over N = 500, 5,000, 50,000. */
    @Test
    void recoversKnownDensities() {
        for (Truth truth : List.of(EstimationTestSupport.normal(), EstimationTestSupport.mixture(),
                EstimationTestSupport.gamma())) {
            BayesSpace space = BayesSpace.splines(truth.a, truth.b, 4, 10);
            Density target = space.project(truth.pdfFunction()).density();
            SmoothingSplineEstimator est = SmoothingSplineEstimator.withDefaults(space);
            int[] sizes = {500, 5000, 50000};
            double[] d = new double[3], kd = new double[3];
            int reps = 5;
            for (int s = 0; s < 3; s++) {
                double[] dd = new double[reps], kk = new double[reps];
                for (int rep = 0; rep < reps; rep++) {
                    UnitEstimate f = est.fit(edges(truth.a, truth.b, 40), truth.counts(sizes[s], 40, rng(50 + 10 * s + rep)));
                    dd[rep] = f.density().distance(target);
                    kk[rep] = ks(f.density(), truth);
                }
                Arrays.sort(dd);
                Arrays.sort(kk);
                d[s] = dd[reps / 2];
                kd[s] = kk[reps / 2];
            }
            String medians = truth.name + ": median B2 " + Arrays.toString(d) + " KS " + Arrays.toString(kd);
            assertTrue(d[1] < d[0] && d[2] < d[1], "B2 not shrinking: " + medians);
            assertTrue(kd[1] < kd[0] && kd[2] < kd[1], "KS not shrinking: " + medians);
            assertTrue(kd[2] < 0.02, "KS at N = 50000: " + medians);
        }
    }

    @Test
    void parallelBatchIsBitIdenticalToSerial() {
        Truth truth = EstimationTestSupport.normal();
        RandomGenerator r = rng(5);
        int[][] counts = new int[500][];
        for (int i = 0; i < counts.length; i++) {
            counts[i] = truth.counts(30 + r.nextInt(300), 30, r);
        }
        SmoothingSplineEstimator est = SmoothingSplineEstimator.withDefaults(BayesSpace.splines(0, 1, 4, 8));
        BatchEstimate p = est.withParallel(true).fitAll(edges(0, 1, 30), counts, null);
        BatchEstimate s = est.withParallel(false).fitAll(edges(0, 1, 30), counts, null);
        assertArrayEquals(s.densities().coordinatesRowMajor(), p.densities().coordinatesRowMajor());
        assertEquals(s.diagnostics(), p.diagnostics());
    }
}
