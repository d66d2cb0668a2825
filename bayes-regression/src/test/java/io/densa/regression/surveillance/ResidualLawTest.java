package io.densa.regression.surveillance;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;

/**
 * {@link PeriodReport#residualCovariance}: the covariance of a unit's residual against the
 * baseline in periods without change, checked against the generating law of invented panels
 * y_t = b0 + A y_{t−1} + e_t with e_t ~ N(0, v_i I) (closed form: the residual's covariance is v_i I
 * up to the coefficients' estimation error, about d / (rows of the fit) of it), and its calibration:
 * the squared Mahalanobis norm of each new null residual is χ²_K, so it lies below the χ²_K 0.9
 * quantile (Commons Math's {@link ChiSquaredDistribution}) for about 90 % of unit-periods.
 */
class ResidualLawTest {
    static final BayesSpace SPACE = BayesSpace.polynomials(0, 1, 3);
    static final int K = SPACE.dimension();
    static final int UNITS = 40;

    /** Invented panel; unit i's noise variance per coordinate v_i; estimation variances K v_i when asked. */
    static List<Period> panel(int periods, double[] v, boolean withVariances, long seed) {
        Random r = new Random(seed);
        double[][] a = {{0.5, 0.1, 0}, {0, 0.4, 0.1}, {0.1, 0, 0.3}};
        double[] b0 = {0.3, -0.2, 0.1};
        String[] ids = new String[UNITS];
        Arrays.setAll(ids, i -> "unit" + i);
        double[][] prev = new double[UNITS][K];
        double[] u = new double[UNITS];
        for (int i = 0; i < UNITS; i++) {
            u[i] = K * v[i];
        }
        List<Period> out = new ArrayList<>();
        for (int t = 0; t < periods; t++) {
            double[][] y = new double[UNITS][K];
            for (int i = 0; i < UNITS; i++) {
                for (int j = 0; j < K; j++) {
                    double s = b0[j] + Math.sqrt(v[i]) * r.nextGaussian();
                    for (int m = 0; m < K; m++) {
                        s += a[j][m] * prev[i][m];
                    }
                    y[i][j] = s;
                }
            }
            out.add(new Period(t, DensitySet.of(SPACE, y, ids), null, withVariances ? u.clone() : null, null, null));
            prev = y;
        }
        return out;
    }

    /** Share of unit-periods 20..59 whose residual's Mahalanobis norm² is below the χ²_K 0.9 quantile. */
    static double coverage(List<Period> periods, double[] v, boolean checkLaw) {
        BaselineMonitor m = RollingBaseline.withDefaults().withCalibrationPeriods(6).fit(periods.subList(0, 20));
        double q90 = new ChiSquaredDistribution(null, K).inverseCumulativeProbability(0.9);
        int inside = 0;
        int total = 0;
        for (int t = 20; t < periods.size(); t++) {
            Period p = periods.get(t);
            PeriodReport rep = m.score(p);
            double[][] yhat = rep.expected().coordinates();
            double[][] y = p.densities().coordinates();
            for (int i = 0; i < UNITS; i++) {
                double[][] sigma = rep.residualCovariance(i);
                if (checkLaw && t == 20) {
                    // the generating law, v_i I: 6 × 40 calibration residuals, so a relative standard
                    // error of about √(2/240) ≈ 0.09 on the diagonal and √(1/240) ≈ 0.065 of v_i off it
                    for (int a = 0; a < K; a++) {
                        for (int b = 0; b < K; b++) {
                            double want = a == b ? v[i] : 0.0;
                            assertEquals(want, sigma[a][b], 0.35 * v[i], "unit " + i + " (" + a + ", " + b + ")");
                        }
                    }
                }
                RealMatrix inv = new LUDecomposition(new Array2DRowRealMatrix(sigma)).getSolver().getInverse();
                double[] d = new double[K];
                for (int j = 0; j < K; j++) {
                    d[j] = y[i][j] - yhat[i][j];
                }
                double z = 0;
                for (int a = 0; a < K; a++) {
                    for (int b = 0; b < K; b++) {
                        z += d[a] * inv.getEntry(a, b) * d[b];
                    }
                }
                inside += z <= q90 ? 1 : 0;
                total++;
            }
            m = m.absorb(p);
        }
        return inside / (double) total;
    }

    @Test
    void commonNoiseWithoutEstimationVariances() {
        double[] v = new double[UNITS];
        Arrays.fill(v, 0.09);
        double c = coverage(panel(60, v, false, 11), v, true);
        System.out.println("residual law, common noise: coverage " + c);
        // 1,600 unit-periods, correlated within a period through the shared calibration set; binomial
        // SD 0.0075 alone
        assertTrue(Math.abs(c - 0.9) <= 0.04, "coverage " + c);
    }

    @Test
    void unitNoiseScaledByTheEstimationVariances() {
        double[] v = new double[UNITS];
        for (int i = 0; i < UNITS; i++) {
            v[i] = 0.02 * Math.pow(8, i / (UNITS - 1.0)); // 0.02 to 0.16: noise SDs over a factor 2.8
        }
        double c = coverage(panel(60, v, true, 12), v, true);
        System.out.println("residual law, unit noise: coverage " + c);
        assertTrue(Math.abs(c - 0.9) <= 0.04, "coverage " + c);
    }
}
