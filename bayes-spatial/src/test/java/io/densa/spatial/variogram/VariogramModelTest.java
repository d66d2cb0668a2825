package io.densa.spatial.variogram;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;

/**
 * Variogram formulas against their published definitions (Cressie (1993), Statistics for Spatial
 * Data, §2.3.1 — from memory) evaluated in closed form at tabulated points, and
 * the modified Bessel function K_ν against closed forms and handbook values.
 */
class VariogramModelTest {
    @Test
    void sphericalAtTabulatedPoints() {
        VariogramModel m = VariogramModel.spherical(2, 10);
        // c (1.5 t − 0.5 t³): t = 0.5 → 2 · 0.6875
        assertEquals(1.375, m.gamma(5), 1e-15);
        assertEquals(2 * (1.5 * 0.2 - 0.5 * 0.008), m.gamma(2), 1e-15);
        assertEquals(2, m.gamma(10), 1e-15);
        assertEquals(2, m.gamma(50), 1e-15);
        assertEquals(0, m.gamma(0), 0);
    }

    @Test
    void exponentialAndGaussianUsePracticalRange() {
        // by the definition of the practical range (correlation e^{−3} at h = a):
        // γ(a) = c (1 − e^{−3}) = 0.9502129316321360 c (e^{−3} = 0.049787068367863944)
        assertEquals(0.9502129316321360, VariogramModel.exponential(1, 7).gamma(7), 1e-15);
        assertEquals(0.9502129316321360, VariogramModel.gaussian(1, 7).gamma(7), 1e-15);
        assertEquals(3 * (1 - Math.exp(-3 * 2.0 / 7)), VariogramModel.exponential(3, 7).gamma(2), 1e-14);
        assertEquals(3 * (1 - Math.exp(-3 * 4.0 / 49)), VariogramModel.gaussian(3, 7).gamma(2), 1e-14);
        // Isaaks & Srivastava covariance 10 e^{-0.3h} is exponential(10, 10)
        assertEquals(10 * Math.exp(-0.3 * 4), VariogramModel.exponential(10, 10).covariance(4), 1e-13);
    }

    @Test
    void nuggetPowerAndNestedSums() {
        VariogramModel m = VariogramModel.nugget(0.5).plus(VariogramModel.spherical(2, 10));
        assertEquals(0, m.gamma(0), 0);
        assertEquals(0.5 + 1.375, m.gamma(5), 1e-15);
        assertEquals(2.5, m.sill(), 0);
        assertEquals(0.5, m.nugget(), 0);
        assertEquals(2.5, m.covariance(0), 0);
        VariogramModel p = VariogramModel.power(2, 1.5);
        assertEquals(2 * Math.pow(3, 1.5), p.gamma(3), 1e-14);
        assertFalse(p.bounded());
        assertThrows(IllegalStateException.class, () -> p.covariance(1));
    }

    @Test
    void maternHalfEqualsExponentialAndThreeHalvesClosedForm() {
        // the practical range a: correlation e^{-3} at h = a for every family with that convention.
        // For ν = 3/2 and 5/2 the Matérn correlation has closed forms (Stein (1999), Interpolation of
        // Spatial Data, §2.7 — from memory): (1 + t) e^{−t} and (1 + t + t²/3) e^{−t} with t = h/φ.
        // Derivation: Γ(3/2) = √π/2 and K_{3/2}(t) = √(π/(2t)) e^{−t} (1 + 1/t) (Abramowitz & Stegun
        // (1964) 10.2.17) give 2^{−1/2}/Γ(3/2) t^{3/2} K_{3/2}(t) = (1 + t) e^{−t}; K_{5/2}(t) =
        // √(π/(2t)) e^{−t} (1 + 3/t + 3/t²) with Γ(5/2) = 3√π/4 gives (1 + t + t²/3) e^{−t}. The
        // scale φ = a / r follows from solving the closed form for r = e^{-3} by bisection here, an
        // independent derivation of the library's Brent root on the Bessel-function form.
        double r32 = root(t -> (1 + t) * Math.exp(-t));
        double r52 = root(t -> (1 + t + t * t / 3) * Math.exp(-t));
        assertEquals(1.7 / r32, VariogramModel.matern(2, 1.7, 1.5).structures().get(0).scale(), 1e-14);
        for (double h : new double[] {1e-6, 0.01, 0.3, 1, 1.7, 2.5, 7, 40}) {
            // Matérn ν = 1/2 with practical range a is the exponential with practical range a (e^{−3h/a})
            assertEquals(VariogramModel.exponential(2, 1.7).gamma(h), VariogramModel.matern(2, 1.7, 0.5).gamma(h),
                    1e-13, "h=" + h);
            double t = h * r32 / 1.7;
            assertEquals(2 * (1 - (1 + t) * Math.exp(-t)), VariogramModel.matern(2, 1.7, 1.5).gamma(h), 1e-12,
                    "h=" + h);
            double u = h * r52 / 1.7;
            assertEquals(2 * (1 - (1 + u + u * u / 3) * Math.exp(-u)), VariogramModel.matern(2, 1.7, 2.5).gamma(h),
                    1e-12, "h=" + h);
        }
        for (double nu : new double[] {0.3, 0.8, 1.5, 4, 20}) {
            // γ(a) = c (1 − e^{−3}) at the practical range, whatever the smoothness
            assertEquals(2 * -Math.expm1(-3), VariogramModel.matern(2, 1.7, nu).gamma(1.7), 1e-12, "nu=" + nu);
        }
        // general order through the integral: continuous in ν near 1/2
        assertEquals(VariogramModel.matern(1, 1, 0.5).gamma(0.8), VariogramModel.matern(1, 1, 0.5000001).gamma(0.8),
                1e-6);
    }

    @Test
    void besselKIntegralAgainstClosedForms() {
        // K_{1/2}(x) = √(π/(2x)) e^{−x}; K_{3/2}(x) = K_{1/2}(x)(1 + 1/x) (Abramowitz & Stegun 10.2.17 — from memory)
        for (double x : new double[] {1e-4, 0.01, 0.2, 1, 3, 10, 50, 300}) {
            double k12 = Math.sqrt(Math.PI / (2 * x)) * Math.exp(-x);
            assertEquals(1, BesselK.integral(0.5, x) / k12, 1e-12, "K_1/2 at " + x);
            assertEquals(1, BesselK.integral(1.5, x) / (k12 * (1 + 1 / x)), 1e-12, "K_3/2 at " + x);
        }
        // handbook values (Abramowitz & Stegun (1964) Table 9.8 — from memory)
        assertEquals(0.42102443824070834, BesselK.k(0, 1), 1e-14);
        assertEquals(0.60190723019723457, BesselK.k(1, 1), 1e-14);
        assertEquals(0.11389387274953344, BesselK.k(0, 2), 1e-14);
    }

    @Test
    void besselKRecurrenceAndCommonsMathQuadrature() {
        // K_{ν+1}(x) = K_{ν−1}(x) + (2ν/x) K_ν(x) (A&S 9.6.26) at a non-half-integer order
        for (double x : new double[] {0.05, 0.7, 4, 25}) {
            double nu = 1.3;
            double lhs = BesselK.k(nu + 1, x);
            double rhs = BesselK.k(nu - 1, x) + 2 * nu / x * BesselK.k(nu, x);
            assertEquals(1, lhs / rhs, 1e-12, "x=" + x);
        }
        // ∫_0^∞ exp(−x cosh t) cosh(νt) dt by Commons Math Gauss–Legendre on [0, 12]
        IterativeLegendreGaussIntegrator gl = new IterativeLegendreGaussIntegrator(16, 1e-14, 1e-14);
        double nu = 0.8, x = 1.3;
        double ref = gl.integrate(100000, t -> Math.exp(-x * Math.cosh(t)) * Math.cosh(nu * t), 0, 12);
        assertEquals(1, BesselK.k(nu, x) / ref, 1e-11);
    }

    @Test
    void invalidParametersAreRejected() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> VariogramModel.exponential(1, Double.NaN));
        assertTrue(e.getMessage().matches("range must be finite and > 0, got NaN"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> VariogramModel.spherical(-1, 1));
        e = assertThrows(IllegalArgumentException.class, () -> VariogramModel.power(1, 2));
        assertTrue(e.getMessage().matches("power exponent must be in \\(0, 2\\), got 2.0"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> VariogramModel.matern(1, 1, 0));
        assertThrows(IllegalArgumentException.class, () -> VariogramModel.exponential(1, 1).gamma(-1));
        assertThrows(IllegalArgumentException.class, () -> VariogramModel.exponential(1, 1).gamma(Double.NaN));
    }

    /** The t in (0, 50) where the decreasing correlation rho falls to e^{-3}, by bisection. */
    private static double root(java.util.function.DoubleUnaryOperator rho) {
        double lo = 0, hi = 50, target = Math.exp(-3);
        for (int it = 0; it < 200; it++) {
            double mid = 0.5 * (lo + hi);
            if (rho.applyAsDouble(mid) > target) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return 0.5 * (lo + hi);
    }
}
