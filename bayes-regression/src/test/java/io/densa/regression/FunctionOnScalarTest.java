package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.internal.Sorted;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;

class FunctionOnScalarTest {
    private final BayesSpace space = TestData.space8();
    private final int k = space.dimension();

    /** Simulated data: intercept, numeric dose, 3-level group; known coefficient coordinates. */
    private static final class Sim {
        Design design;
        DensitySet response;
        double[][] beta; // p × K true
    }

    private Sim simulate(long seed, int n, double effect, double noise) {
        Random r = new Random(seed);
        double[] dose = new double[n];
        String[] group = new String[n];
        for (int i = 0; i < n; i++) {
            dose[i] = r.nextDouble() * 2 - 1;
            group[i] = new String[] {"a", "b", "c"}[r.nextInt(3)];
        }
        Sim s = new Sim();
        s.design = Design.builder().numeric("dose", dose).categorical("group", group, "a").build();
        int p = s.design.columns();
        s.beta = new double[p][k];
        for (int j = 0; j < p; j++) {
            for (int l = 0; l < k; l++) {
                s.beta[j][l] = j == 1 ? effect * Math.cos(l) : 0.5 * Math.sin(j + l);
            }
        }
        double[][] c = new double[n][k];
        for (int i = 0; i < n; i++) {
            for (int l = 0; l < k; l++) {
                double v = noise * r.nextGaussian();
                for (int j = 0; j < p; j++) {
                    v += s.design.value(i, j) * s.beta[j][l];
                }
                c[i][l] = v;
            }
        }
        s.response = DensitySet.of(space, c);
        return s;
    }

    private double[][] designRows(Design d) {
        double[][] x = new double[d.rows()][d.columns()];
        for (int i = 0; i < d.rows(); i++) {
            for (int j = 0; j < d.columns(); j++) {
                x[i][j] = d.value(i, j);
            }
        }
        return x;
    }

    /**
     * Reference: Apache Commons Math {@code OLSMultipleLinearRegression} (a general-purpose
     * regression), fitted separately for every coordinate with the intercept in the design.
     */
    @Test
    void coefficientsEqualCommonsMathOlsPerCoordinate() {
        Sim s = simulate(1, 80, 1.0, 0.3);
        FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response);
        DMatrixRMaj b = fit.coefficients();
        double[][] c = s.response.coordinates();
        for (int l = 0; l < k; l++) {
            double[] y = new double[80];
            for (int i = 0; i < 80; i++) {
                y[i] = c[i][l];
            }
            OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
            ols.setNoIntercept(true);
            ols.newSampleData(y, designRows(s.design));
            double[] ref = ols.estimateRegressionParameters();
            for (int j = 0; j < ref.length; j++) {
                assertEquals(ref[j], b.get(j, l), 1e-10, "coefficient " + j + ", coordinate " + l);
            }
        }
        assertEquals(List.of("intercept", "dose", "group=b", "group=c"), fit.design().columnNames());
        assertTrue(fit.rSquared() > 0.5 && fit.rSquared() < 1);
        // residual norms are the B2 distances between observed and fitted densities
        double[] rn = fit.residualNorms();
        assertEquals(s.response.get(3).distance(fit.fitted().get(3)), rn[3], 1e-12);
        // coefficient clr at points = Σ b_k e_k(t)
        assertEquals(fit.coefficient("dose").clr(0.4), fit.coefficientClr("dose", 0.4)[0], 1e-10);
    }

    /**
     * Weighted least squares equals OLS on rows scaled by √w (Commons Math reference); ridge with
     * R = I equals OLS on the data augmented by rows √λ e_j for every penalised column (a
     * textbook identity, Hoerl and Kennard (1970), Technometrics 12(1) [from memory]; derived in one
     * line: the normal equations of the augmented system [X; √λ E] b = [y; 0] are
     * (XᵀX + λ EᵀE) b = Xᵀy, the ridge equations).
     */
    @Test
    void weightsAndRidgeMatchAugmentedOls() {
        Sim s = simulate(2, 60, 1.0, 0.3);
        Random r = new Random(3);
        double[] w = new double[60];
        for (int i = 0; i < 60; i++) {
            w[i] = 0.5 + 3 * r.nextDouble();
        }
        double lambda = 2.5;
        FunctionOnScalarFit wf = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response, w);
        FunctionOnScalarFit rf = FunctionOnScalarRegression.withDefaults().withPenalty(lambda, Penalties.ridge(k))
                .fit(s.design, s.response);
        double[][] x = designRows(s.design);
        int p = x[0].length;
        double[][] c = s.response.coordinates();
        for (int l = 0; l < k; l++) {
            double[] yw = new double[60];
            double[][] xw = new double[60][p];
            double[] ya = new double[60 + p - 1];
            double[][] xa = new double[60 + p - 1][p];
            for (int i = 0; i < 60; i++) {
                double sw = Math.sqrt(w[i]);
                yw[i] = sw * c[i][l];
                ya[i] = c[i][l];
                for (int j = 0; j < p; j++) {
                    xw[i][j] = sw * x[i][j];
                    xa[i][j] = x[i][j];
                }
            }
            for (int j = 1; j < p; j++) {
                xa[60 + j - 1][j] = Math.sqrt(lambda);
            }
            OLSMultipleLinearRegression o1 = new OLSMultipleLinearRegression();
            o1.setNoIntercept(true);
            o1.newSampleData(yw, xw);
            OLSMultipleLinearRegression o2 = new OLSMultipleLinearRegression();
            o2.setNoIntercept(true);
            o2.newSampleData(ya, xa);
            double[] b1 = o1.estimateRegressionParameters();
            double[] b2 = o2.estimateRegressionParameters();
            for (int j = 0; j < p; j++) {
                assertEquals(b1[j], wf.coefficients().get(j, l), 1e-10);
                assertEquals(b2[j], rf.coefficients().get(j, l), 1e-10);
            }
        }
    }

    /**
     * Accuracy on an ill-conditioned design: a covariate like a calendar year (offset 10⁴, spread
     * 1, so cond(X) ≈ 10⁴·√12 and cond(XᵀX) ≈ 10¹⁰). The coefficients must still match Commons
     * Math {@code OLSMultipleLinearRegression} (Householder QR) to 1e-9 relative; solving the
     * normal equations loses about cond(XᵀX)·ε ≈ 10⁻⁶.
     */
    @Test
    void illConditionedDesignMatchesCommonsMathOls() {
        for (double offset : new double[] {1e3, 1e4}) {
            Random r = new Random(3);
            int n = 60;
            double[] year = new double[n];
            double[][] c = new double[n][k];
            for (int i = 0; i < n; i++) {
                year[i] = offset + r.nextDouble();
                for (int l = 0; l < k; l++) {
                    c[i][l] = 0.3 * (year[i] - offset) + r.nextGaussian();
                }
            }
            Design d = Design.builder().numeric("year", year).build();
            FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(d, DensitySet.of(space, c));
            for (int l = 0; l < k; l++) {
                double[] y = new double[n];
                double[][] x = new double[n][1];
                for (int i = 0; i < n; i++) {
                    y[i] = c[i][l];
                    x[i][0] = year[i];
                }
                OLSMultipleLinearRegression o = new OLSMultipleLinearRegression();
                o.newSampleData(y, x);
                double[] b = o.estimateRegressionParameters();
                assertEquals(b[1], fit.coefficients().get(1, l), 1e-9 * Math.abs(b[1]), "offset " + offset);
                assertEquals(b[0], fit.coefficients().get(0, l), 1e-9 * Math.abs(b[0]), "offset " + offset);
            }
        }
    }

    /**
     * Effective number of parameters tr H: p without penalty; with the ridge penalty R = I every
     * direction has the same hat matrix X (XᵀWX + λD)⁻¹ XᵀW, whose trace is computed here directly
     * with EJML (inverse and products); with a roughness penalty it falls as λ grows.
     */
    @Test
    void effectiveParametersAreTheTraceOfTheHatMatrix() {
        Sim s = simulate(31, 50, 1.0, 0.5);
        double[] w = new double[50];
        for (int i = 0; i < 50; i++) {
            w[i] = 1 + (i % 3);
        }
        int p = s.design.columns();
        FunctionOnScalarFit ols = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response, w);
        assertEquals(p, ols.diagnostics().effectiveParameters(), 1e-10);
        double lambda = 7.0;
        FunctionOnScalarFit ridge = FunctionOnScalarRegression.withDefaults().withPenalty(lambda, Penalties.ridge(k))
                .fit(s.design, s.response, w);
        DMatrixRMaj x = s.design.matrix();
        DMatrixRMaj xw = x.copy();
        for (int i = 0; i < 50; i++) {
            for (int j = 0; j < p; j++) {
                xw.set(i, j, xw.get(i, j) * w[i]);
            }
        }
        DMatrixRMaj a = new DMatrixRMaj(p, p);
        org.ejml.dense.row.CommonOps_DDRM.multTransA(x, xw, a);
        for (int j = 1; j < p; j++) {
            a.add(j, j, lambda);
        }
        DMatrixRMaj ainv = new DMatrixRMaj(p, p);
        assertTrue(org.ejml.dense.row.CommonOps_DDRM.invert(a, ainv));
        DMatrixRMaj xa = new DMatrixRMaj(50, p);
        org.ejml.dense.row.CommonOps_DDRM.mult(x, ainv, xa);
        DMatrixRMaj hat = new DMatrixRMaj(50, 50);
        org.ejml.dense.row.CommonOps_DDRM.multTransB(xa, xw, hat);
        assertEquals(org.ejml.dense.row.CommonOps_DDRM.trace(hat), ridge.diagnostics().effectiveParameters(), 1e-10);
        assertTrue(ridge.diagnostics().effectiveParameters() < p);
        DMatrixRMaj rough = Penalties.secondDerivative(space);
        double prev = p + 1e-9;
        for (double l : new double[] {0, 1e-4, 1e-2, 1}) {
            double edf = FunctionOnScalarRegression.withDefaults().withPenalty(l, rough).fit(s.design, s.response)
                    .diagnostics().effectiveParameters();
            assertTrue(edf < prev && edf >= 1 - 1e-9, "λ = " + l + ": " + edf);
            prev = edf;
        }
    }

    /** A roughness penalty solves its normal equations XᵀX B + λ D B R = XᵀC (closed form). */
    @Test
    void roughnessPenaltySolvesItsNormalEquations() {
        Sim s = simulate(4, 50, 1.0, 0.5);
        DMatrixRMaj rough = Penalties.secondDerivative(space);
        double lambda = 1e-3;
        FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().withPenalty(lambda, rough)
                .fit(s.design, s.response);
        DMatrixRMaj x = s.design.matrix();
        DMatrixRMaj b = fit.coefficients();
        DMatrixRMaj c = s.response.coordinateMatrix();
        int p = x.numCols;
        DMatrixRMaj xtx = new DMatrixRMaj(p, p);
        org.ejml.dense.row.CommonOps_DDRM.multTransA(x, x, xtx);
        DMatrixRMaj lhs = new DMatrixRMaj(p, k);
        org.ejml.dense.row.CommonOps_DDRM.mult(xtx, b, lhs);
        DMatrixRMaj br = new DMatrixRMaj(p, k);
        org.ejml.dense.row.CommonOps_DDRM.mult(b, rough, br);
        DMatrixRMaj rhs = new DMatrixRMaj(p, k);
        org.ejml.dense.row.CommonOps_DDRM.multTransA(x, c, rhs);
        double scale = org.ejml.dense.row.NormOps_DDRM.normF(rhs);
        for (int j = 0; j < p; j++) {
            for (int l = 0; l < k; l++) {
                double v = lhs.get(j, l) + (j == 0 ? 0 : lambda * br.get(j, l)) - rhs.get(j, l);
                assertEquals(0.0, v, 1e-9 * scale);
            }
        }
        // the penalty lowers the roughness of the dose coefficient
        FunctionOnScalarFit ols = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response);
        assertTrue(quad(fit.coefficient("dose").coordinates(), rough) < quad(ols.coefficient("dose").coordinates(),
                rough));
        // second-derivative matrix: f = t² has ∫_0^1 (f'')² = 4 (closed form; coordinates from
        // projecting exp(t²)); see PenaltiesTest for the exactness checks
        double[] c2 = space.project(t -> Math.exp(t * t)).density().coordinates();
        assertEquals(4.0, quad(c2, rough), 1e-9);
    }

    private static double quad(double[] b, DMatrixRMaj r) {
        double s = 0;
        for (int i = 0; i < b.length; i++) {
            for (int j = 0; j < b.length; j++) {
                s += b[i] * r.get(i, j) * b[j];
            }
        }
        return s;
    }

    /**
     * Bootstrap bands: coverage of the true coefficient over 60 simulated data sets, nominal 90 %;
     * we accept pointwise coverage in [0.75, 0.99] at a fixed point (binomial sd ≈ 0.04) and
     * simultaneous coverage ≥ 0.75 of the whole curve on the grid. Simultaneous bands are wider.
     */
    @Test
    void bootstrapBandsCoverTheTruth() {
        double[] grid = new double[21];
        for (int q = 0; q <= 20; q++) {
            grid[q] = q / 20.0;
        }
        int pointHits = 0;
        int simHits = 0;
        int reps = 60;
        for (int rep = 0; rep < reps; rep++) {
            Sim s = simulate(100 + rep, 60, 1.0, 0.4);
            FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response);
            FunctionOnScalarFit.CoefficientBand band = fit.bootstrapBands(grid, 200, 0.9, rep).get(1);
            assertEquals("dose", band.column());
            double[] truth = DenseAlgebra.clrAt(space, s.beta[1], grid);
            if (truth[7] >= band.pointwiseLower()[7] && truth[7] <= band.pointwiseUpper()[7]) {
                pointHits++;
            }
            boolean all = true;
            for (int q = 0; q < grid.length; q++) {
                all &= truth[q] >= band.simultaneousLower()[q] && truth[q] <= band.simultaneousUpper()[q];
                assertTrue(band.simultaneousUpper()[q] - band.simultaneousLower()[q]
                        >= 0.9 * (band.pointwiseUpper()[q] - band.pointwiseLower()[q]));
            }
            if (all) {
                simHits++;
            }
        }
        double pc = pointHits / (double) reps;
        double sc = simHits / (double) reps;
        assertTrue(pc >= 0.75 && pc <= 0.99, "pointwise coverage " + pc);
        assertTrue(sc >= 0.75, "simultaneous coverage " + sc);
    }

    /**
     * The bootstrap is what its definition says: with a roughness penalty and weights, replicate
     * b refits the model to ŷ_i + √w_src r_src / √w_i (the same draws as the implementation: one
     * {@code SplittableRandom(seed).nextInt(n)} per row and replicate), and the bands are the
     * basic limits and standard deviations of β* − β̂ computed here by brute force.
     */
    @Test
    void penalisedBootstrapEqualsBruteForceRefits() {
        Sim s = simulate(21, 40, 1.0, 0.5);
        int n = 40;
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            w[i] = 0.5 + (i % 4);
        }
        FunctionOnScalarRegression cfg = FunctionOnScalarRegression.withDefaults()
                .withPenalty(0.05, Penalties.secondDerivative(space));
        FunctionOnScalarFit fit = cfg.fit(s.design, s.response, w);
        double[] grid = {0.1, 0.45, 0.8};
        int reps = 40;
        double level = 0.8;
        List<FunctionOnScalarFit.CoefficientBand> bands = fit.bootstrapBands(grid, reps, level, 99L);
        double[][] fitted = fit.fitted().coordinates();
        double[][] res = fit.residuals().coordinates();
        java.util.SplittableRandom rnd = new java.util.SplittableRandom(99L);
        int p = s.design.columns();
        double[][][] delta = new double[p][grid.length][reps];
        for (int b = 0; b < reps; b++) {
            double[][] y = new double[n][k];
            for (int i = 0; i < n; i++) {
                int src = rnd.nextInt(n);
                for (int l = 0; l < k; l++) {
                    y[i][l] = fitted[i][l] + res[src][l] * Math.sqrt(w[src] / w[i]);
                }
            }
            FunctionOnScalarFit star = cfg.fit(s.design, DensitySet.of(space, y), w);
            for (int j = 0; j < p; j++) {
                String col = s.design.columnNames().get(j);
                double[] bs = star.coefficientClr(col, grid);
                double[] bh = fit.coefficientClr(col, grid);
                for (int q = 0; q < grid.length; q++) {
                    delta[j][q][b] = bs[q] - bh[q];
                }
            }
        }
        for (int j = 0; j < p; j++) {
            FunctionOnScalarFit.CoefficientBand band = bands.get(j);
            for (int q = 0; q < grid.length; q++) {
                double[] d = delta[j][q].clone();
                double mean = java.util.Arrays.stream(d).average().orElseThrow();
                double ss = 0;
                for (double v : d) {
                    ss += (v - mean) * (v - mean);
                }
                java.util.Arrays.sort(d);
                double scale = 1e-9 * (1 + Math.abs(band.estimate()[q]));
                assertEquals(Math.sqrt(ss / (reps - 1)), band.standardError()[q], scale);
                assertEquals(band.estimate()[q] - Sorted.quantile(d, 1 - (1 - level) / 2),
                        band.pointwiseLower()[q], scale);
                assertEquals(band.estimate()[q] - Sorted.quantile(d, (1 - level) / 2),
                        band.pointwiseUpper()[q], scale);
            }
        }
    }

    /**
     * Permutation F-test (Freedman–Lane): under H₀ (no dose effect) the rejection rate at 5 % over
     * 150 simulated data sets lies in [0.01, 0.11] (binomial 99 % range for p = 0.05 is about
     * [0.01, 0.10]); under an effect it rejects in ≥ 90 % of 40 data sets.
     */
    @Test
    void permutationTestHasNominalSizeAndPower() {
        int rej = 0;
        int reps = 150;
        for (int rep = 0; rep < reps; rep++) {
            Sim s = simulate(1000 + rep, 30, 0.0, 1.0);
            FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response);
            if (fit.test("dose", 99, rep).pValue() <= 0.05) {
                rej++;
            }
        }
        double size = rej / (double) reps;
        assertTrue(size >= 0.01 && size <= 0.11, "size " + size);
        int power = 0;
        for (int rep = 0; rep < 40; rep++) {
            Sim s = simulate(5000 + rep, 30, 0.9, 1.0);
            FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response);
            FunctionOnScalarFit.PermutationTest t = fit.test("dose", 99, rep);
            assertEquals(1, t.df1());
            assertEquals(26, t.df2());
            io.densa.core.TestResult r = t; // the shared statistic-and-p-value view
            assertEquals(t.fStatistic(), r.statistic(), 0.0);
            assertTrue(r.method().contains("99 permutations"), r.method());
            if (t.pValue() <= 0.05) {
                power++;
            }
        }
        assertTrue(power >= 36, "power " + power + "/40");
        // a categorical term is tested jointly over its level columns
        Sim s = simulate(7, 40, 0.0, 1.0);
        assertEquals(2, FunctionOnScalarRegression.withDefaults().fit(s.design, s.response)
                .test("group", 19, 1).df1());
    }

    /**
     * With a one-dimensional response space (two bins, K = 1) and Gaussian errors, the
     * Freedman–Lane permutation p-value approximates the classical F-test p-value from the
     * F(df₁, n − p) distribution (Commons Math {@code FDistribution}); 1999 permutations give a
     * Monte Carlo sd ≤ 0.011, we allow 0.04.
     */
    @Test
    void permutationPValueApproximatesTheClassicalFTest() {
        BayesSpace two = BayesSpace.steps(0, 1, 2);
        Random r = new Random(31);
        for (int rep = 0; rep < 4; rep++) {
            int n = 40;
            double[] u = new double[n];
            double[] v = new double[n];
            double[][] c = new double[n][1];
            for (int i = 0; i < n; i++) {
                u[i] = r.nextGaussian();
                v[i] = r.nextGaussian();
                c[i][0] = 0.5 * v[i] + 0.12 * rep * u[i] + r.nextGaussian();
            }
            Design d = Design.builder().numeric("u", u).numeric("v", v).build();
            FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(d, DensitySet.of(two, c));
            FunctionOnScalarFit.PermutationTest t = fit.test("u", 1999, rep);
            double classical = 1 - new org.apache.commons.math3.distribution.FDistribution(1, n - 3)
                    .cumulativeProbability(t.fStatistic());
            assertEquals(classical, t.pValue(), 0.04, "replicate " + rep + ", F = " + t.fStatistic());
        }
    }

    /** Categorical levels fixed in advance give designs for new data with the same columns. */
    @Test
    void newDataWithFixedLevelsAndConcurrentPrediction() throws Exception {
        Sim s = simulate(21, 60, 1.0, 0.2);
        FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response);
        Design fresh = Design.builder().numeric("dose", new double[] {0.5, -0.5})
                .categorical("group", new String[] {"c", "c"}, "a", "a", "b", "c").build();
        DensitySet pred = fit.predict(fresh);
        double[] expected = new double[k];
        DMatrixRMaj b = fit.coefficients();
        for (int l = 0; l < k; l++) {
            expected[l] = b.get(0, l) + 0.5 * b.get(1, l) + b.get(3, l);
        }
        assertTrue(pred.get(0).equalsWithin(space.density(expected), 1e-12));
        Design missingLevel = Design.builder().numeric("dose", new double[] {0.5, -0.5})
                .categorical("group", new String[] {"c", "a"}, "a").build();
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> fit.predict(missingLevel));
        assertTrue(e.getMessage().matches("new design has columns .* but the model was fitted with .*"),
                e.getMessage());
        // a fitted model is shared between threads: concurrent predictions equal the serial one
        java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(4);
        try {
            List<java.util.concurrent.Future<DensitySet>> fs = new java.util.ArrayList<>();
            for (int t = 0; t < 8; t++) {
                fs.add(pool.submit(() -> fit.predict(s.design)));
            }
            DensitySet serial = fit.predict(s.design);
            for (java.util.concurrent.Future<DensitySet> f : fs) {
                org.junit.jupiter.api.Assertions.assertArrayEquals(serial.coordinatesRowMajor(),
                        f.get().coordinatesRowMajor());
            }
        } finally {
            pool.shutdown();
        }
    }

    @Test
    void predictionAndNewResiduals() {
        Sim s = simulate(9, 40, 1.0, 0.2);
        FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(s.design, s.response);
        DensitySet pred = fit.predict(s.design);
        DensitySet res = fit.residuals(s.design, s.response);
        for (int i = 0; i < 5; i++) {
            assertTrue(pred.get(i).equalsWithin(fit.fitted().get(i), 1e-12));
            assertTrue(res.get(i).equalsWithin(fit.residuals().get(i), 1e-12));
        }
        FunctionOnScalarFit.Diagnostics diag = fit.diagnostics();
        assertEquals(36, diag.residualDf());
        assertEquals(fit.residualSumOfSquares(), diag.residualSumOfSquares(), 0.0);
        Design interceptOnly = Design.interceptOnly(40);
        FunctionOnScalarFit mean = FunctionOnScalarRegression.withDefaults().fit(interceptOnly, s.response);
        assertEquals(0.0, mean.rSquared(), 1e-12);
        assertTrue(mean.coefficient("intercept").equalsWithin(s.response.mean(), 1e-12));
    }

    @Test
    void badInputGivesClearErrors() {
        Sim s = simulate(11, 20, 1.0, 0.2);
        FunctionOnScalarRegression m = FunctionOnScalarRegression.withDefaults();
        // mismatched row counts
        DensitySet fewer = s.response.subset(0, 1, 2);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> m.fit(s.design, fewer));
        assertTrue(e.getMessage().matches("response has 3 rows, expected 20.*"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> Design.builder().numeric("a", new double[3])
                .numeric("b", new double[4]));
        assertTrue(e.getMessage().matches("covariate 'b' has 4 values but 'a' has 3.*"), e.getMessage());
        // NaN covariate
        e = assertThrows(IllegalArgumentException.class,
                () -> Design.builder().numeric("x", new double[] {1, Double.NaN, 2}));
        assertTrue(e.getMessage().matches("covariate 'x' row 1 is not finite: NaN.*"), e.getMessage());
        // rank deficiency names the offending columns
        double[] x1 = new double[20];
        double[] x2 = new double[20];
        double[] x3 = new double[20];
        Random r = new Random(1);
        for (int i = 0; i < 20; i++) {
            x1[i] = r.nextGaussian();
            x2[i] = r.nextGaussian();
            x3[i] = 2 * x1[i] - x2[i];
        }
        Design bad = Design.builder().numeric("x1", x1).numeric("x2", x2).numeric("x3", x3).build();
        e = assertThrows(IllegalArgumentException.class, () -> m.fit(bad, s.response));
        assertTrue(e.getMessage().matches(".*rank deficient; column\\(s\\) \\[x3\\] are .*"), e.getMessage());
        // fewer observations than parameters
        Design wide = Design.builder().numeric("x1", new double[] {1, 2}).numeric("x2", new double[] {3, 1})
                .build();
        DensitySet two = s.response.subset(0, 1);
        e = assertThrows(IllegalArgumentException.class, () -> m.fit(wide, two));
        assertTrue(e.getMessage().matches(".*2 observations for 3 parameters.*"), e.getMessage());
        // weights
        double[] w = new double[20];
        java.util.Arrays.fill(w, 1.0);
        w[4] = Double.NaN;
        e = assertThrows(IllegalArgumentException.class, () -> m.fit(s.design, s.response, w));
        assertTrue(e.getMessage().matches("weight of row 4 .* is NaN.*"), e.getMessage());
        // new data from another space
        FunctionOnScalarFit fit = m.fit(s.design, s.response);
        DensitySet alien = DensitySet.of(BayesSpace.polynomials(0, 1, 8), new double[20][8]);
        e = assertThrows(IllegalArgumentException.class, () -> fit.residuals(s.design, alien));
        assertTrue(e.getMessage().matches("response lives in .* but .* is required; use space.project.*"), e.getMessage());
        // categorical without the reference level / unknown level
        e = assertThrows(IllegalArgumentException.class,
                () -> Design.builder().categorical("g", new String[] {"a", "b"}, "z"));
        assertTrue(e.getMessage().matches(".*reference level 'z' is not among its levels.*"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> m.withPenalty(Double.NaN, Penalties.ridge(k)));
        assertTrue(e.getMessage().matches(".*must be finite and >= 0, got NaN"), e.getMessage());
        // an indefinite penalty (eigenvalues 3 and -1) would reward roughness: rejected, not clipped
        DMatrixRMaj indefinite = Penalties.ridge(k);
        indefinite.set(0, 0, 1);
        indefinite.set(0, 1, 2);
        indefinite.set(1, 0, 2);
        indefinite.set(1, 1, 1);
        e = assertThrows(IllegalArgumentException.class, () -> m.withPenalty(0.1, indefinite));
        assertTrue(e.getMessage().matches("penalty matrix must be positive semi-definite; its smallest eigenvalue is"
                + " -(1\\.0|0\\.9999).* \\(largest (3\\.0|2\\.9999).*"), e.getMessage());
        // permutation test of a response that the model fits exactly: F = 0/0 must not give a p-value
        Sim exact = simulate(12, 20, 1.0, 0.0);
        FunctionOnScalarFit exactFit = m.fit(exact.design, exact.response);
        e = assertThrows(IllegalArgumentException.class, () -> exactFit.test("dose", 99, 1));
        assertTrue(e.getMessage().matches("permutation test of 'dose': the full model fits the response exactly.*"),
                e.getMessage());
        // design entries outside the matrix (column p of row 0 used to return row 1's intercept)
        int cols = s.design.columns();
        e = assertThrows(IllegalArgumentException.class, () -> s.design.value(0, cols));
        assertTrue(e.getMessage().matches("design entry \\(0, 4\\) outside the 20 x 4 design.*"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> s.design.value(20, 0));
        // evaluation points outside the domain are named by index
        e = assertThrows(IllegalArgumentException.class,
                () -> fit.bootstrapBands(new double[] {0.2, 1.5}, 20, 0.9, 1));
        assertTrue(e.getMessage().matches("grid\\[1\\] = 1\\.5 is outside the domain \\[0\\.0, 1\\.0\\].*"),
                e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> fit.coefficientClr("dose", Double.NaN));
        assertTrue(e.getMessage().matches("points\\[0\\] is not finite: NaN"), e.getMessage());
        // empty subsets, null levels and null rows are named
        e = assertThrows(IllegalArgumentException.class, () -> s.design.subset());
        assertTrue(e.getMessage().matches("a design subset needs at least one row.*"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> s.design.subset(3, 20));
        assertTrue(e.getMessage().matches("row 20 outside \\[0, 20\\)"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> Design.builder().categorical("g", new String[] {"a", "b"}, "a", "a", null, "b"));
        assertTrue(e.getMessage().matches("covariate 'g': level 1 is null.*"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> Design.builder().categorical("g", new String[] {"a", null}, "a"));
        assertTrue(e.getMessage().matches("covariate 'g' row 1 is null; every row needs a level.*"), e.getMessage());
        // a semi-definite one (rank 1) is accepted
        DMatrixRMaj rankOne = new DMatrixRMaj(k, k);
        rankOne.set(2, 2, 1.0);
        assertEquals(0.1, m.withPenalty(0.1, rankOne).lambda(), 0.0);
    }
}
