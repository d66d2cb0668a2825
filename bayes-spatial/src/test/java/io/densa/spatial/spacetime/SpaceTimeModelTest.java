package io.densa.spatial.spacetime;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.spatial.variogram.VariogramModel;
import java.util.List;
import java.util.Random;
import java.util.function.DoubleBinaryOperator;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;
import org.junit.jupiter.api.Test;

/**
 * Validity and limits of the space–time models, checked against their definitions in the
 * published sources and against EJML's symmetric eigen-decomposition.
 */
class SpaceTimeModelTest {
    static final List<SpaceTimeModel> MODELS = List.of(
            SpaceTimeModel.separable(VariogramModel.exponential(2, 0.5), VariogramModel.exponential(1, 3), 0),
            SpaceTimeModel.separable(VariogramModel.spherical(1, 0.7).withNugget(0.2), VariogramModel.gaussian(4, 2),
                    0.1),
            SpaceTimeModel.productSum(VariogramModel.exponential(2, 0.5), VariogramModel.spherical(1, 4), 0.5, 0),
            SpaceTimeModel.productSum(VariogramModel.gaussian(1, 0.6), VariogramModel.exponential(3, 2), 0.05, 0.2),
            SpaceTimeModel.productSum(VariogramModel.matern(1.5, 0.4, 1.5), VariogramModel.exponential(1, 5), 1e-3,
                    0),
            SpaceTimeModel.gneiting(2, 0.5, 3, 0, 0.5, 0.5, 0),
            SpaceTimeModel.gneiting(2, 0.5, 3, 1, 0.5, 1, 0),
            SpaceTimeModel.gneiting(1, 0.8, 2, 0.6, 1, 0.5, 0.1),
            SpaceTimeModel.gneiting(1, 0.3, 6, 1, 0.25, 0.75, 0));

    /** Smallest eigenvalue of the symmetric matrix (EJML). */
    static double minEigenvalue(DMatrixRMaj a) {
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(a.numRows, false, true);
        assertTrue(eig.decompose(a.copy()));
        double min = Double.POSITIVE_INFINITY;
        for (int i = 0; i < a.numRows; i++) {
            min = Math.min(min, eig.getEigenvalue(i).real);
        }
        return min;
    }

    static DMatrixRMaj matrix(DoubleBinaryOperator c, double[] x, double[] y, double[] t) {
        int n = t.length;
        DMatrixRMaj m = new DMatrixRMaj(n, n);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                m.set(i, j, c.applyAsDouble(Math.hypot(x[i] - x[j], y[i] - y[j]), Math.abs(t[i] - t[j])));
            }
        }
        return m;
    }

    @Test
    void everyModelIsPositiveDefiniteOnRandomConfigurations() {
        // a covariance function is valid iff every covariance matrix it forms is positive semi-definite
        // (Cressie (1993), Statistics for Spatial Data, §2.3.1 — from memory); validity of the families:
        // Schur's product theorem for the separable model (Horn & Johnson (1985), Matrix Analysis,
        // Thm 7.5.3 — from memory), De Iaco, Myers & Posa (2001), Stat. Probab. Lett. 52(1) for
        // the product-sum model with 0 < k <= 1/max(sills), Gneiting (2002), JASA 97(458), eq. (14)
        // with tau >= d/2. Configurations: 40 points, 12 sites in the unit square (so repeated
        // sites), random real times in [0, 10] and some repeated integer times.
        Random r = new Random(1201);
        for (SpaceTimeModel m : MODELS) {
            for (int rep = 0; rep < 15; rep++) {
                int n = 40;
                double[] sx = new double[12], sy = new double[12];
                for (int i = 0; i < 12; i++) {
                    sx[i] = r.nextDouble();
                    sy[i] = r.nextDouble();
                }
                double[] x = new double[n], y = new double[n], t = new double[n];
                for (int i = 0; i < n; i++) {
                    int s = r.nextInt(12);
                    x[i] = sx[s];
                    y[i] = sy[s];
                    t[i] = r.nextBoolean() ? r.nextInt(5) : 10 * r.nextDouble();
                }
                DMatrixRMaj c = matrix(m::covariance, x, y, t);
                double min = minEigenvalue(c);
                // rounding of an n x n eigen-decomposition: n eps times the largest entry, common practice
                assertTrue(min >= -1e-12 * n * m.sill(), m + " configuration " + rep + ": min eigenvalue " + min);
                DMatrixRMaj jittered = c.copy();
                for (int i = 0; i < n; i++) {
                    jittered.add(i, i, 1e-9 * m.sill());
                }
                assertTrue(DecompositionFactory_DDRM.chol(n, true).decompose(jittered), m + " Cholesky");
            }
        }
    }

    @Test
    void theEigenvalueCheckRejectsAProductSumBeyondItsBound() {
        // negative control: k above 1/max(sills) makes k3 = sill_t - k sill_s sill_t < 0 in
        // k1 rs rt + k2 rs + k3 rt (De Cesare, Myers & Posa (2001), Environmetrics 12(1)); at one
        // time over many distant sites the matrix is then (d - k3) I + k3 11' with a negative
        // eigenvalue d + (n - 1) k3
        VariogramModel s = VariogramModel.exponential(2, 0.5), tm = VariogramModel.exponential(1, 1);
        double k = 1.5 * SpaceTimeModel.maxProductSumK(2, 1);
        DoubleBinaryOperator bad = (h, u) -> {
            double gs = s.gamma(h), gt = tm.gamma(u);
            return 2 + 1 - k * 2 * 1 - (gs + gt - k * gs * gt);
        };
        int n = 40;
        double[] x = new double[n], y = new double[n], t = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = 100 * i;
        }
        assertTrue(minEigenvalue(matrix(bad, x, y, t)) < -0.1);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SpaceTimeModel.productSum(s, tm, k, 0));
        assertTrue(e.getMessage().contains("0 < k <= 1 / max"), e.getMessage());
    }

    @Test
    void zeroTimeLagGivesTheSpatialModelAndZeroSpatialLagTheTemporalOne() {
        VariogramModel vs = VariogramModel.spherical(1.5, 0.7).plus(VariogramModel.exponential(0.5, 0.3));
        VariogramModel vt = VariogramModel.gaussian(4, 2);
        double c0 = 0.1;
        SpaceTimeModel sep = SpaceTimeModel.separable(vs, vt, c0);
        SpaceTimeModel ps = SpaceTimeModel.productSum(vs, vt, 0.1, c0);
        for (double h : new double[] {1e-3, 0.1, 0.35, 0.7, 2}) {
            // separable C(h,0) = Cs(h) Ct(0)/Ct(0); product-sum γ(h,0) = γs(h) (De Cesare, Myers & Posa 2001)
            assertEquals(vs.withNugget(c0).gamma(h), sep.gamma(h, 0), 1e-14, "separable h " + h);
            assertEquals(vs.withNugget(c0).gamma(h), ps.gamma(h, 0), 1e-14, "product-sum h " + h);
        }
        for (double u : new double[] {0.5, 1, 2, 5}) {
            assertEquals(c0 + vs.sill() / vt.sill() * vt.gamma(u), sep.gamma(0, u), 1e-14, "separable u " + u);
            assertEquals(vt.withNugget(c0).gamma(u), ps.gamma(0, u), 1e-14, "product-sum u " + u);
        }
        assertEquals(vs.sill() + c0, sep.sill(), 0);
        assertEquals(vs.sill() + vt.sill() - 0.1 * vs.sill() * vt.sill() + c0, ps.sill(), 1e-14);
    }

    @Test
    void productSumEqualsItsCovarianceForm() {
        // De Cesare, Myers & Posa (2001): C = k1 Cs Ct + k2 Cs + k3 Ct with marginal sills
        // Ss = k2 + k1 Ct(0)... written for unit-sill correlations: k1 = k Ss St, k2 = Ss - k1, k3 = St - k1
        VariogramModel vs = VariogramModel.exponential(2, 0.5), vt = VariogramModel.spherical(1, 4);
        double k = 0.3;
        SpaceTimeModel ps = SpaceTimeModel.productSum(vs, vt, k, 0);
        double k1 = k * 2 * 1, k2 = 2 - k1, k3 = 1 - k1;
        for (double h : new double[] {0, 0.2, 0.9}) {
            for (double u : new double[] {0, 1, 3, 6}) {
                double rs = vs.covariance(h) / 2, rt = vt.covariance(u) / 1;
                assertEquals(k1 * rs * rt + k2 * rs + k3 * rt, ps.covariance(h, u), 1e-14, h + ", " + u);
            }
        }
    }

    @Test
    void gneitingMarginsAndSeparableCase() {
        // Gneiting (2002), eq. (14), C(h,u) = s2 / psi^tau exp(-c h^(2g) / psi^(b g)), psi = a u^(2 alpha) + 1:
        // at u = 0 with g = 1/2 it is the exponential covariance s2 exp(-c h) (practical range 3/c),
        // with g = 1 the Gaussian s2 exp(-c h^2)
        double s2 = 2, rs = 0.5, rt = 3, c0 = 0.2;
        SpaceTimeModel half = SpaceTimeModel.gneiting(s2, rs, rt, 0.7, 0.5, 1, c0);
        SpaceTimeModel one = SpaceTimeModel.gneiting(s2, rs, rt, 0.7, 1, 1, c0);
        for (double h : new double[] {1e-3, 0.1, 0.5, 1.5}) {
            assertEquals(VariogramModel.exponential(s2, rs).withNugget(c0).gamma(h), half.gamma(h, 0), 1e-14);
            assertEquals(VariogramModel.gaussian(s2, rs).withNugget(c0).gamma(h), one.gamma(h, 0), 1e-14);
        }
        // at h = 0: s2 / (a u^(2 alpha) + 1) with tau = 1; the practical range gives C(0, rt) = s2 e^-3
        double a = Math.expm1(3) / (rt * rt);
        for (double u : new double[] {0.5, 1, 3, 7}) {
            assertEquals(s2 / (a * u * u + 1), half.covariance(0, u), 1e-14, "u " + u);
        }
        assertEquals(s2 * Math.exp(-3), half.covariance(0, rt), 1e-14);
        // beta = 0 is separable: C(h,u) C(0,0) = C(h,0) C(0,u) (structured part, no nugget)
        SpaceTimeModel sep = SpaceTimeModel.gneiting(s2, rs, rt, 0, 0.5, 0.5, 0);
        SpaceTimeModel ns = SpaceTimeModel.gneiting(s2, rs, rt, 1, 0.5, 0.5, 0);
        for (double h : new double[] {0.1, 0.4}) {
            for (double u : new double[] {1, 4}) {
                assertEquals(sep.covariance(h, 0) * sep.covariance(0, u), sep.covariance(h, u) * s2, 1e-13);
                // with beta = 1 the spatial correlation decays more slowly at longer time lags
                assertTrue(ns.covariance(h, u) * s2 > ns.covariance(h, 0) * ns.covariance(0, u));
            }
        }
    }

    @Test
    void extremeLagsGiveFiniteValues() {
        // nothing silent: every model is finite at every lag; far apart in space and time the
        // covariance of each family tends to 0, so γ tends to the sill (the limit of each formula)
        for (SpaceTimeModel m : MODELS) {
            for (double[] hu : new double[][] {{1e300, 0}, {0, 1e300}, {1e300, 1e300}, {Double.MAX_VALUE,
                Double.MAX_VALUE}, {Double.MIN_VALUE, Double.MIN_VALUE}}) {
                double g = m.gamma(hu[0], hu[1]);
                assertTrue(Double.isFinite(g) && g >= 0 && g <= m.sill() * (1 + 1e-15), m + " at " + hu[0] + ", "
                        + hu[1] + ": " + g);
            }
            assertEquals(m.sill(), m.gamma(1e300, 1e300), 1e-12 * m.sill(), m.toString());
        }
    }

    @Test
    void badParametersAreNamed() {
        VariogramModel v = VariogramModel.exponential(1, 1);
        assertThrows(IllegalArgumentException.class, () -> SpaceTimeModel.separable(VariogramModel.power(1, 1), v, 0));
        assertTrue(assertThrows(IllegalArgumentException.class, () -> SpaceTimeModel.separable(v, v, Double.NaN))
                .getMessage().contains("nugget"));
        assertTrue(assertThrows(IllegalArgumentException.class, () -> SpaceTimeModel.gneiting(1, 1, 1, 1.5, 0.5, 0.5,
                0)).getMessage().contains("beta"));
        assertTrue(assertThrows(IllegalArgumentException.class, () -> SpaceTimeModel.gneiting(1, 1, 1, 0.5, 0, 0.5,
                0)).getMessage().contains("gamma"));
        assertTrue(assertThrows(IllegalArgumentException.class, () -> SpaceTimeModel.productSum(v, v, 0, 0))
                .getMessage().contains("k = 0.0"));
        assertThrows(IllegalArgumentException.class, () -> SpaceTimeModel.gneiting(1, 1, 1, 0.5, 0.5, 0.5, 0)
                .gamma(-1, 0));
        assertThrows(IllegalArgumentException.class, () -> SpaceTimeModel.gneiting(1, 1, 1, 0.5, 0.5, 0.5, 0)
                .covariance(0, Double.NaN));
    }
}
