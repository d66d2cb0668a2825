package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;

class FunctionOnFunctionTest {
    private final BayesSpace xSpace = TestData.space8();
    private final BayesSpace ySpace = BayesSpace.polynomials(0, 2, 5);
    private final int kx = xSpace.dimension();
    private final int ky = ySpace.dimension();
    private final double[] sds = {2, 1.5, 1, 0.7, 0.3, 0.2, 0.1, 0.05};
    private final double[][] v = TestData.orthogonal(new Random(77), kx);

    /** True kernel coordinates G = Σ_{j<4} v_j b_jᵀ: the kernel lives in the first 4 predictor PCs. */
    private double[][] trueKernel() {
        double[][] g = new double[kx][ky];
        for (int j = 0; j < 4; j++) {
            for (int m = 0; m < ky; m++) {
                double b = Math.cos(1.3 * j + 0.7 * m) / (1 + j);
                for (int l = 0; l < kx; l++) {
                    g[l][m] += v[j][l] * b;
                }
            }
        }
        return g;
    }

    private DensitySet[] simulate(long seed, int n, double noise) {
        Random r = new Random(seed);
        double[][] g = trueKernel();
        double[][] x = new double[n][kx];
        double[][] y = new double[n][ky];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < kx; j++) {
                double z = sds[j] * r.nextGaussian();
                for (int l = 0; l < kx; l++) {
                    x[i][l] += z * v[j][l];
                }
            }
            for (int l = 0; l < kx; l++) {
                x[i][l] += 0.5;
            }
            for (int m = 0; m < ky; m++) {
                double s = 0.2 * m + noise * r.nextGaussian();
                for (int l = 0; l < kx; l++) {
                    s += x[i][l] * g[l][m];
                }
                y[i][m] = s;
            }
        }
        return new DensitySet[] {DensitySet.of(xSpace, x), DensitySet.of(ySpace, y)};
    }

    private double ise(FunctionOnFunctionFit fit) {
        // ∫∫ (β̂ − β)² dP dP = ‖Ĝ − G‖²_F in orthonormal bases
        double[][] g = trueKernel();
        DMatrixRMaj gh = fit.kernelCoefficients(0);
        double s = 0;
        for (int l = 0; l < kx; l++) {
            for (int m = 0; m < ky; m++) {
                double d = gh.get(l, m) - g[l][m];
                s += d * d;
            }
        }
        return s;
    }

    /**
     * Simulation recovery (fixed seeds): with a known kernel in the span of the first 4 predictor
     * components, the integrated squared error of β̂ with m = 4 falls with n (average over 5
     * data sets per n), roughly like 1/n.
     */
    @Test
    void integratedSquaredErrorFallsWithSampleSize() {
        FunctionalRegression cfg = FunctionalRegression.truncation().withComponents(4, 4);
        double[] mean = new double[3];
        int[] ns = {100, 1000, 10000};
        for (int a = 0; a < 3; a++) {
            for (int rep = 0; rep < 5; rep++) {
                DensitySet[] d = simulate(10 * a + rep, ns[a], 0.5);
                mean[a] += ise(cfg.fit(List.of(d[0]), null, d[1])) / 5;
            }
        }
        assertTrue(mean[1] < mean[0] / 4 && mean[2] < mean[1] / 4,
                "ISE " + java.util.Arrays.toString(mean));
        // the kernel on a grid is Σ G_km e_k(s) e_m(t)
        DensitySet[] d = simulate(1, 500, 0.5);
        FunctionOnFunctionFit fit = cfg.fit(List.of(d[0]), null, d[1]);
        DMatrixRMaj kern = fit.kernel(0, new double[] {0.1, 0.6}, new double[] {0.3, 1.9});
        DMatrixRMaj g = fit.kernelCoefficients(0);
        double[] es = xSpace.basisAt(0.6);
        double[] et = ySpace.basisAt(1.9);
        double manual = 0;
        for (int l = 0; l < kx; l++) {
            for (int m = 0; m < ky; m++) {
                manual += g.get(l, m) * es[l] * et[m];
            }
        }
        assertEquals(manual, kern.get(1, 1), 1e-12);
    }

    /** CV over m = 1..8 on data whose kernel uses 4 components picks 4 or 5 in most data sets. */
    @Test
    void crossValidationPicksComponentCountNearTheTruth() {
        int near = 0;
        for (int rep = 0; rep < 10; rep++) {
            DensitySet[] d = simulate(300 + rep, 400, 1.0);
            FunctionOnFunctionFit fit = FunctionalRegression.truncation().withComponents(1, 8).withSeed(rep)
                    .fit(List.of(d[0]), null, d[1]);
            int m = fit.chosen().predictorComponents();
            assertTrue(m >= 4, "chose " + m + " < 4 (too few components lose the signal)");
            if (m <= 5) {
                near++;
            }
            assertEquals(8, fit.crossValidation().size());
        }
        assertTrue(near >= 7, "CV chose 4 or 5 components in " + near + "/10 data sets");
    }

    /**
     * With all K components kept, truncation is ordinary least squares of each response
     * coordinate on [1, predictor coordinates] (reference: Commons Math OLS); residuals and R²
     * follow.
     */
    @Test
    void fullTruncationEqualsCommonsMathOls() {
        DensitySet[] d = simulate(5, 120, 0.5);
        FunctionOnFunctionFit fit = FunctionalRegression.truncation().withComponents(kx, kx)
                .fit(List.of(d[0]), null, d[1]);
        double[][] x = d[0].coordinates();
        double[][] y = d[1].coordinates();
        DMatrixRMaj g = fit.kernelCoefficients(0);
        for (int m = 0; m < ky; m++) {
            double[] ym = new double[120];
            for (int i = 0; i < 120; i++) {
                ym[i] = y[i][m];
            }
            OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
            ols.newSampleData(ym, x);
            double[] b = ols.estimateRegressionParameters();
            assertEquals(b[0], fit.coefficient("intercept").coordinate(m), 1e-9);
            for (int l = 0; l < kx; l++) {
                assertEquals(b[l + 1], g.get(l, m), 1e-9);
            }
        }
        DensitySet pred = fit.predict(List.of(d[0]), null);
        double rss = 0;
        double tss = 0;
        DensitySet res = fit.residuals();
        for (int i = 0; i < 120; i++) {
            assertTrue(pred.get(i).equalsWithin(fit.fitted().get(i), 1e-12));
            assertEquals(d[1].get(i).distance(pred.get(i)), fit.residualNorms()[i], 1e-10);
            rss += res.get(i).normSq();
            tss += d[1].get(i).distanceSq(d[1].mean());
        }
        assertEquals(1 - rss / tss, fit.rSquared(), 1e-10);
    }

    /**
     * Ridge with a single λ equals OLS on data augmented by rows √(nλ) e_j for every kernel
     * coordinate (Hoerl and Kennard (1970), Technometrics 12(1) [from memory]; Commons Math OLS). Derived
     * in one line: the normal equations of [X; √(nλ) E] b = [y; 0] are (XᵀX + nλ EᵀE) b = Xᵀy.
     */
    @Test
    void ridgeMatchesAugmentedOls() {
        int n = 80;
        DensitySet[] d = simulate(6, n, 0.5);
        double lambda = 0.05;
        FunctionOnFunctionFit fit = FunctionalRegression.ridge().withLambdas(lambda)
                .fit(List.of(d[0]), null, d[1]);
        double[][] x = d[0].coordinates();
        double[][] y = d[1].coordinates();
        for (int m = 0; m < ky; m++) {
            double[] ya = new double[n + kx];
            double[][] xa = new double[n + kx][kx + 1];
            for (int i = 0; i < n; i++) {
                ya[i] = y[i][m];
                xa[i][0] = 1;
                System.arraycopy(x[i], 0, xa[i], 1, kx);
            }
            for (int l = 0; l < kx; l++) {
                xa[n + l][l + 1] = Math.sqrt(n * lambda);
            }
            OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
            ols.setNoIntercept(true);
            ols.newSampleData(ya, xa);
            double[] b = ols.estimateRegressionParameters();
            for (int l = 0; l < kx; l++) {
                assertEquals(b[l + 1], fit.kernelCoefficients(0).get(l, m), 1e-9);
            }
        }
        // ridge with CV over its default grid is a sensible estimator too
        DensitySet[] big = simulate(7, 2000, 0.5);
        FunctionOnFunctionFit cv = FunctionalRegression.ridge().fit(List.of(big[0]), null, big[1]);
        assertEquals(17, cv.crossValidation().size());
        assertTrue(ise(cv) < 0.05, "ridge ISE " + ise(cv));
    }

    /** Two density predictors and a scalar covariate; response truncation to all components is a no-op. */
    @Test
    void severalPredictorsCovariatesAndResponseTruncation() {
        int n = 3000;
        DensitySet[] d = simulate(8, n, 0.3);
        Random r = new Random(9);
        double[][] x2 = TestData.gaussian(r, n, ky, 1.0);
        double[] u = new double[n];
        double[][] y = d[1].coordinates();
        for (int i = 0; i < n; i++) {
            u[i] = r.nextGaussian();
            for (int m = 0; m < ky; m++) {
                y[i][m] += 0.4 * x2[i][m] + (m == 0 ? 0.7 * u[i] : 0.0);
            }
        }
        DensitySet x2s = DensitySet.of(ySpace, x2);
        DensitySet ys = DensitySet.of(ySpace, y);
        Design cov = Design.builder().numeric("u", u).build();
        FunctionOnFunctionFit fit = FunctionalRegression.truncation().withComponents(1, 8)
                .withResponseComponents(2, ky).fit(List.of(d[0], x2s), cov, ys);
        assertEquals(0.7, fit.coefficient("u").coordinate(0), 0.03);
        assertEquals(0.4, fit.kernelCoefficients(1).get(2, 2), 0.03);
        assertEquals(0.0, fit.kernelCoefficients(1).get(2, 3), 0.03);
        assertTrue(fit.rSquared() > 0.8);
        assertEquals(ky, fit.chosen().responseComponents());
        assertEquals(16, fit.crossValidation().size());
        DensitySet res = fit.residuals(List.of(d[0], x2s), cov, ys);
        assertTrue(res.get(10).equalsWithin(fit.residuals().get(10), 1e-12));
    }

    /**
     * A year-like covariate (offset 10⁴, spread 1) with a density predictor: with all components
     * kept, truncation is OLS of each response coordinate on [1, year, predictor coordinates];
     * the coefficients must match Commons Math {@code OLSMultipleLinearRegression} (QR) to 1e-8
     * relative although cond(XᵀX) ≈ 10¹⁰.
     */
    @Test
    void illConditionedCovariateMatchesCommonsMathOls() {
        int n = 200;
        DensitySet[] d = simulate(41, n, 0.5);
        Random r = new Random(42);
        double[] year = new double[n];
        double[][] y = d[1].coordinates();
        for (int i = 0; i < n; i++) {
            year[i] = 1e4 + r.nextDouble();
            for (int m = 0; m < ky; m++) {
                y[i][m] += 0.5 * (year[i] - 1e4);
            }
        }
        Design cov = Design.builder().numeric("year", year).build();
        FunctionOnFunctionFit fit = FunctionalRegression.truncation().withComponents(kx, kx)
                .fit(List.of(d[0]), cov, DensitySet.of(ySpace, y));
        double[][] x = d[0].coordinates();
        double[][] xa = new double[n][kx + 1];
        for (int i = 0; i < n; i++) {
            xa[i][0] = year[i];
            System.arraycopy(x[i], 0, xa[i], 1, kx);
        }
        for (int m = 0; m < ky; m++) {
            double[] ym = new double[n];
            for (int i = 0; i < n; i++) {
                ym[i] = y[i][m];
            }
            OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
            ols.newSampleData(ym, xa);
            double[] b = ols.estimateRegressionParameters();
            assertEquals(b[0], fit.coefficient("intercept").coordinate(m), 1e-8 * Math.abs(b[0]));
            assertEquals(b[1], fit.coefficient("year").coordinate(m), 1e-8 * Math.abs(b[1]));
            for (int l = 0; l < kx; l++) {
                assertEquals(b[l + 2], fit.kernelCoefficients(0).get(l, m), 1e-8 * (1 + Math.abs(b[l + 2])));
            }
        }
    }

    /** Scalar-on-function: with m = K the coefficients equal Commons Math OLS; CV error is reported. */
    @Test
    void scalarOnFunctionRegression() {
        int n = 300;
        DensitySet[] d = simulate(12, n, 0.5);
        double[][] x = d[0].coordinates();
        double[] beta = {0.5, -1, 0.3, 0, 0.2, 0, 0, 0.1};
        Random r = new Random(13);
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            y[i] = 1.0 + 0.3 * r.nextGaussian();
            for (int l = 0; l < kx; l++) {
                y[i] += beta[l] * x[i][l];
            }
        }
        ScalarOnFunctionFit fit = FunctionalRegression.truncation().withComponents(kx, kx)
                .fit(List.of(d[0]), null, y);
        OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
        ols.newSampleData(y.clone(), x);
        double[] b = ols.estimateRegressionParameters();
        assertEquals(b[0], fit.coefficient("intercept"), 1e-9);
        for (int l = 0; l < kx; l++) {
            assertEquals(b[l + 1], fit.coefficientFunction(0).coordinate(l), 1e-9);
        }
        assertEquals(ols.calculateRSquared(), fit.rSquared(), 1e-9);
        ScalarOnFunctionFit cv = FunctionalRegression.truncation().fit(List.of(d[0]), null, y);
        double cvErr = cv.crossValidatedError().orElseThrow();
        assertTrue(cvErr > 0.05 && cvErr < 0.2, "CV mean squared error " + cvErr + " (noise variance 0.09)");
        // a single candidate runs no cross-validation: the error is absent, not NaN
        ScalarOnFunctionFit single = FunctionalRegression.truncation().withComponents(3, 3)
                .fit(List.of(d[0]), null, y);
        assertTrue(single.crossValidatedError().isEmpty());
        assertTrue(single.chosen().cvError().isEmpty());
        assertEquals(1, single.crossValidation().size());
        // penalised alternative: ridge with one λ equals OLS on rows augmented by √(nλ) e_l
        double lambda = 0.02;
        ScalarOnFunctionFit ridge = FunctionalRegression.ridge().withLambdas(lambda)
                .fit(List.of(d[0]), null, y);
        double[] ya = new double[n + kx];
        double[][] xa = new double[n + kx][kx + 1];
        for (int i = 0; i < n; i++) {
            ya[i] = y[i];
            xa[i][0] = 1;
            System.arraycopy(x[i], 0, xa[i], 1, kx);
        }
        for (int l = 0; l < kx; l++) {
            xa[n + l][l + 1] = Math.sqrt(n * lambda);
        }
        OLSMultipleLinearRegression aug = new OLSMultipleLinearRegression();
        aug.setNoIntercept(true);
        aug.newSampleData(ya, xa);
        double[] ba = aug.estimateRegressionParameters();
        for (int l = 0; l < kx; l++) {
            assertEquals(ba[l + 1], ridge.coefficientFunction(0).coordinate(l), 1e-9);
        }
        double[] pred = cv.predict(List.of(d[0]), null);
        assertEquals(cv.fitted()[5], pred[5], 1e-12);
        assertEquals(cv.coefficientFunction(0).clr(0.3), cv.coefficientClr(0, 0.3)[0], 1e-10);
    }

    @Test
    void badInputGivesClearErrors() {
        DensitySet[] d = simulate(14, 50, 0.5);
        FunctionalRegression cfg = FunctionalRegression.truncation().withComponents(1, 4);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> cfg.fit(List.of(d[0].subset(0, 1, 2)), null, d[1]));
        assertTrue(e.getMessage().matches("predictor 0 has 3 rows but the response has 50.*"), e.getMessage());
        // predictor and response in different spaces of the same domain and dimension
        BayesSpace poly = BayesSpace.polynomials(0, 2, 5);
        BayesSpace spl = BayesSpace.splines(0, 2, 3, 3);
        DensitySet xs = DensitySet.of(spl, TestData.gaussian(new Random(1), 50, 5, 1));
        DensitySet ys = DensitySet.of(poly, TestData.gaussian(new Random(2), 50, 5, 1));
        e = assertThrows(IllegalArgumentException.class, () -> cfg.fit(List.of(xs), null, ys));
        assertTrue(e.getMessage().matches("predictor 0 lives in .* and the response in .*differ.*"), e.getMessage());
        // the same check for every predictor, not only the first
        DensitySet xs2 = DensitySet.of(spl, TestData.gaussian(new Random(3), 50, 5, 1));
        DensitySet xok = DensitySet.of(BayesSpace.splines(0, 1, 4, 2), TestData.gaussian(new Random(4), 50, 5, 1));
        e = assertThrows(IllegalArgumentException.class,
                () -> cfg.fit(List.of(xok, xs2), null, ys));
        assertTrue(e.getMessage().matches("predictor 1 lives in .* and the response in .*differ.*"), e.getMessage());
        // prediction with predictors from another space
        FunctionOnFunctionFit fit = cfg.fit(List.of(d[0]), null, d[1]);
        e = assertThrows(IllegalArgumentException.class, () -> fit.predictorFpca(1));
        assertTrue(e.getMessage().matches("predictor index 1 outside \\[0, 1\\)"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> fit.predict(List.of(ys), null));
        assertTrue(e.getMessage().matches("predictor 0 lives in .* but .* is required; use space.project.*"), e.getMessage());
        // fewer observations than parameters
        DensitySet[] small = simulate(15, 8, 0.5);
        e = assertThrows(IllegalArgumentException.class,
                () -> FunctionalRegression.truncation().fit(List.of(small[0]), null, small[1]));
        assertTrue(e.getMessage().matches(".*8 observations .* need more observations than parameters.*"),
                e.getMessage());
        // rank-deficient truncated designs name the offending columns: a duplicated predictor, and a
        // predictor whose coordinates span only 2 directions (components 3 and 4 have no variance)
        e = assertThrows(IllegalArgumentException.class,
                () -> cfg.fit(List.of(d[0], d[0]), null, d[1]));
        assertTrue(e.getMessage().matches(".*column\\(s\\) \\[predictor 1 component 1, predictor 1 component 2,"
                + " predictor 1 component 3, predictor 1 component 4\\] have no variance or are linear combinations.*"),
                e.getMessage());
        double[][] flat = new double[50][kx];
        Random rf = new Random(16);
        for (int i = 0; i < 50; i++) {
            flat[i][0] = rf.nextGaussian();
            flat[i][1] = rf.nextGaussian();
        }
        e = assertThrows(IllegalArgumentException.class,
                () -> cfg.fit(List.of(DensitySet.of(xSpace, flat)), null, d[1]));
        assertTrue(e.getMessage().matches(".*\\[predictor 0 component 3, predictor 0 component 4\\] have no variance.*"
                + "lower the component range.*"), e.getMessage());
        // ridge handles collinear predictors
        FunctionalRegression.ridge().withLambdas(0.1).fit(List.of(d[0], d[0]), null, d[1]);
        // design without intercept, NaN scalar response
        Design noInt = Design.builder().withoutIntercept().numeric("u", new double[50]).build();
        e = assertThrows(IllegalArgumentException.class, () -> cfg.fit(List.of(d[0]), noInt, d[1]));
        assertTrue(e.getMessage().matches(".*must contain the intercept.*"), e.getMessage());
        double[] y = new double[50];
        y[7] = Double.NaN;
        e = assertThrows(IllegalArgumentException.class, () -> cfg.fit(List.of(d[0]), null, y));
        assertTrue(e.getMessage().matches("response row 7 is not finite: NaN"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> FunctionalRegression.ridge().withLambdas(-1));
        assertTrue(e.getMessage().matches("λ must be positive and finite, got -1.0"), e.getMessage());
    }
}
