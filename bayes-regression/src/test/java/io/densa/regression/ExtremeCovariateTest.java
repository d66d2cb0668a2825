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
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

/**
 * Covariates of any magnitude are judged by their direction, not by the overflow or underflow of
 * their squares. Least squares is equivariant under column scaling: multiplying covariate x₁ by s
 * divides its coefficient by s and leaves fitted values, R², F statistics and the scale-free
 * bootstrap critical values unchanged (common practice: X β = (X D)(D⁻¹ β) for a diagonal D; least
 * squares by QR as in Golub and Van Loan (2013), Matrix Computations, 4th ed., ch. 5, from memory).
 * The unit-scale fit is itself checked against Apache Commons Math
 * {@code OLSMultipleLinearRegression}.
 */
class ExtremeCovariateTest {
    private static final BayesSpace S = BayesSpace.splines(0, 1, 4, 2);
    private static final int N = 25;

    private static double[] covariate(long seed, double scale) {
        Random r = new Random(seed);
        double[] x = new double[N];
        for (int i = 0; i < N; i++) {
            x[i] = (r.nextGaussian() + 0.5) * scale;
        }
        return x;
    }

    private static DensitySet response(double[] x1, double[] x2) {
        Random r = new Random(9);
        double[][] c = new double[N][S.dimension()];
        for (int i = 0; i < N; i++) {
            for (int k = 0; k < c[i].length; k++) {
                c[i][k] = 0.3 * k + 0.8 * x1[i] - 0.5 * (k % 2) * x2[i] + 0.4 * r.nextGaussian();
            }
        }
        return DensitySet.of(S, c);
    }

    @ParameterizedTest(name = "x1 × {0}")
    @ValueSource(doubles = {1e300, 1e200, 1e-170, 1e-300, 3e-308})
    void scaledCovariateGivesTheScaledFit(double s) {
        double[] x1 = covariate(1, 1.0), x2 = covariate(2, 1.0);
        DensitySet y = response(x1, x2);
        Design unit = Design.builder().numeric("x1", x1).numeric("x2", x2).build();
        double[] x1s = x1.clone();
        for (int i = 0; i < N; i++) {
            x1s[i] *= s;
        }
        Design scaled = Design.builder().numeric("x1", x1s).numeric("x2", x2).build();
        // the scaled values are what the fit sees; the reference divides the unit coefficient by the
        // realised factor x1s[0] / x1[0] (s up to the rounding of x1s)
        double realised = x1s[0] / x1[0];
        FunctionOnScalarFit a = FunctionOnScalarRegression.withDefaults().fit(unit, y);
        FunctionOnScalarFit b = FunctionOnScalarRegression.withDefaults().fit(scaled, y);
        DMatrixRMaj ca = a.coefficients(), cb = b.coefficients();
        for (int k = 0; k < S.dimension(); k++) {
            assertEquals(ca.get(1, k) / realised, cb.get(1, k), 1e-9 * Math.abs(ca.get(1, k) / realised) + 1e-300 / realised,
                    "x1 coefficient, coordinate " + k);
            assertEquals(ca.get(2, k), cb.get(2, k), 1e-9, "x2 coefficient, coordinate " + k);
            assertEquals(ca.get(0, k), cb.get(0, k), 1e-9, "intercept, coordinate " + k);
        }
        assertEquals(a.rSquared(), b.rSquared(), 1e-9);
        assertEquals(a.diagnostics().effectiveParameters(), b.diagnostics().effectiveParameters(), 1e-9);
        assertEquals(a.test("x1", 49, 3).fStatistic(), b.test("x1", 49, 3).fStatistic(), 1e-7);
        List<FunctionOnScalarFit.CoefficientBand> ba = a.bootstrapBands(new double[] {0.2, 0.7}, 40, 0.9, 5);
        List<FunctionOnScalarFit.CoefficientBand> bb = b.bootstrapBands(new double[] {0.2, 0.7}, 40, 0.9, 5);
        assertEquals(ba.get(1).simultaneousCritical(), bb.get(1).simultaneousCritical(), 1e-7);
        for (int q = 0; q < 2; q++) {
            double sa = ba.get(1).standardError()[q] / realised, sb = bb.get(1).standardError()[q];
            assertTrue(Double.isFinite(sb) && Math.abs(sa - sb) <= 1e-7 * Math.abs(sa), sa + " vs " + sb);
            assertTrue(Double.isFinite(bb.get(1).simultaneousLower()[q]) && Double.isFinite(bb.get(1).pointwiseUpper()[q]));
        }
        // FPCA-free prediction on the training design reproduces the fitted values
        assertEquals(b.fitted().coordinate(3, 1), b.predict(scaled).coordinate(3, 1), 1e-12);
    }

    @Test
    void unitScaleAgreesWithCommonsMath() {
        double[] x1 = covariate(1, 1.0), x2 = covariate(2, 1.0);
        DensitySet y = response(x1, x2);
        FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults()
                .fit(Design.builder().numeric("x1", x1).numeric("x2", x2).build(), y);
        double[][] x = new double[N][];
        for (int i = 0; i < N; i++) {
            x[i] = new double[] {x1[i], x2[i]};
        }
        for (int k = 0; k < S.dimension(); k++) {
            double[] yk = new double[N];
            for (int i = 0; i < N; i++) {
                yk[i] = y.coordinate(i, k);
            }
            OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
            ols.newSampleData(yk, x);
            double[] beta = ols.estimateRegressionParameters();
            for (int j = 0; j < 3; j++) {
                assertEquals(beta[j], fit.coefficients().get(j, k), 1e-10, "coefficient " + j + ", coordinate " + k);
            }
        }
    }

    @Test
    void subnormalColumnsAndCollinearityAreNamed() {
        double[] tiny = new double[N];
        tiny[3] = 4.9e-322;
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Design.builder().numeric("tiny", tiny));
        assertTrue(e.getMessage().startsWith("covariate 'tiny' has largest |value| 4.9E-322, below the smallest normal"
                + " double"), e.getMessage());
        // a huge covariate that is an exact multiple of another is still collinear
        double[] x1 = covariate(1, 1.0);
        double[] big = x1.clone();
        for (int i = 0; i < N; i++) {
            big[i] *= 0x1p1000;
        }
        Design d = Design.builder().numeric("x1", x1).numeric("big", big).build();
        e = assertThrows(IllegalArgumentException.class,
                () -> FunctionOnScalarRegression.withDefaults().fit(d, response(x1, x1)));
        assertTrue(e.getMessage().contains("column(s) [big] are zero or linear combinations of earlier columns"),
                e.getMessage());
    }
}
