package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.internal.RawBasis;
import java.util.SplittableRandom;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;

/**
 * Spaces on a circle: the Fourier space against the von Mises family in closed form, the periodic
 * spline space against the cardinal B-spline and its rotation invariance, the circular summaries,
 * and cdf/quantile from a cut point against a general-purpose integrator.
 */
class CircularSpaceTest {

    /**
     * Modified Bessel function I_ν(z) of integer order by its power series
     * I_ν(z) = (z/2)^ν Σ_k (z²/4)^k / (k! (ν + k)!) (Abramowitz &amp; Stegun (1964), Handbook of
     * Mathematical Functions, 9.6.10), summed until the terms no longer change the sum.
     */
    static double besselI(int nu, double z) {
        double term = 1;
        for (int i = 1; i <= nu; i++) {
            term *= z / 2 / i;
        }
        double sum = term;
        double q = z * z / 4;
        for (int k = 1; k < 500; k++) {
            term *= q / (k * (double) (nu + k));
            sum += term;
            if (term < 1e-17 * sum) {
                break;
            }
        }
        return sum;
    }

    @Test
    void besselSeriesMatchesTheIntegralRepresentation() {
        // I_n(z) = (1/π) ∫_0^π e^{z cos t} cos(nt) dt (Abramowitz & Stegun (1964), 9.6.19), by
        // Commons Math's Gauss–Legendre integration: an independent check of the series
        IterativeLegendreGaussIntegrator integ = new IterativeLegendreGaussIntegrator(16, 1e-15, 1e-15);
        for (int n = 0; n <= 1; n++) {
            for (double z : new double[] {0.1, 1, 3, 6, 20}) {
                int order = n;
                double integral = integ.integrate(1_000_000, t -> Math.exp(z * Math.cos(t)) * Math.cos(order * t), 0,
                        Math.PI) / Math.PI;
                assertEquals(integral, besselI(n, z), 1e-13 * integral, "I_" + n + "(" + z + ")");
            }
        }
    }

    /** Coordinates of the von Mises density with concentration κ and mean direction μ (a position). */
    private static double[] vonMises(double start, double period, double kappa, double mu) {
        // clr = κ cos(θ − θμ) = κ cos θμ cos θ + κ sin θμ sin θ; the orthonormal basis is √(2/P) cos θ,
        // √(2/P) sin θ, so c = κ √(P/2) (cos θμ, sin θμ)
        double t = 2 * Math.PI * (mu - start) / period;
        double s = kappa * Math.sqrt(period / 2);
        return new double[] {s * Math.cos(t), s * Math.sin(t)};
    }

    /** von Mises pdf on [start, start + P): exp(κ cos(θ − θμ)) / (P I0(κ)) (Mardia &amp; Jupp (2000), 3.5.4). */
    private static double vonMisesPdf(double start, double period, double kappa, double mu, double x) {
        double th = 2 * Math.PI * (x - mu) / period;
        return Math.exp(kappa * Math.cos(th)) / (period * besselI(0, kappa));
    }

    @Test
    void fourierSpaceHoldsTheVonMisesFamilyExactly() {
        double start = -3, period = 365;
        BayesSpace s = BayesSpace.fourier(start, period, 1);
        assertEquals(2, s.dimension());
        assertTrue(s.isPeriodic());
        assertEquals(period, s.period(), 0.0);
        for (double[] km : new double[][] {{0.5, 40}, {2.0, -1}, {6.0, 300}}) {
            double kappa = km[0], mu = km[1];
            Density f = s.density(vonMises(start, period, kappa, mu));
            for (int i = 0; i <= 200; i++) {
                double x = start - period + 3 * period * i / 200.0; // three turns: wrapping included
                double expected = vonMisesPdf(start, period, kappa, mu, x);
                // closed form: Mardia & Jupp (2000), Directional Statistics, 3.5.4; A&S 9.6.10 for I0
                assertEquals(expected, f.pdf(x), 1e-12 * expected, "pdf at " + x);
                assertEquals(kappa * Math.cos(2 * Math.PI * (x - mu) / period), f.clr(x), 1e-12 * kappa);
            }
            // mean resultant length I1(κ)/I0(κ) and mean direction μ (Mardia & Jupp (2000), 3.5.4)
            assertEquals(besselI(1, kappa) / besselI(0, kappa), f.meanResultantLength(), 1e-12);
            double m = f.circularMean();
            assertTrue(m >= start && m < start + period, "mean direction " + m + " on [start, start + P)");
            double wrappedMu = start + (((mu - start) % period) + period) % period;
            assertEquals(wrappedMu, m, 1e-9);
        }
    }

    @Test
    void perturbationAddsNaturalParameters() {
        // exponential family: perturbation multiplies the densities, so the natural parameters
        // κ e^{iμ} add (Mardia & Jupp (2000), 3.5.4, the von Mises family in natural parameters)
        double start = 0, period = 24;
        BayesSpace s = BayesSpace.fourier(start, period, 1);
        double k1 = 1.5, m1 = 3, k2 = 2.5, m2 = 20;
        double t1 = 2 * Math.PI * m1 / period, t2 = 2 * Math.PI * m2 / period;
        double re = k1 * Math.cos(t1) + k2 * Math.cos(t2), im = k1 * Math.sin(t1) + k2 * Math.sin(t2);
        double kappa = Math.hypot(re, im);
        double mu = period * Math.atan2(im, re) / (2 * Math.PI);
        Density f = s.density(vonMises(start, period, k1, m1)).perturb(s.density(vonMises(start, period, k2, m2)));
        for (int i = 0; i < 100; i++) {
            double x = period * i / 100.0;
            double expected = vonMisesPdf(start, period, kappa, mu, x);
            assertEquals(expected, f.pdf(x), 1e-12 * expected);
        }
        assertEquals(besselI(1, kappa) / besselI(0, kappa), f.meanResultantLength(), 1e-12);
    }

    @Test
    void cdfFromACutPointMatchesANumericalIntegral() {
        // the cdf from a cut point against Commons Math's Gauss–Legendre integration of the closed-form pdf
        double start = 0, period = 365, kappa = 3, mu = 2;
        BayesSpace s = BayesSpace.fourier(start, period, 1);
        Density f = s.density(vonMises(start, period, kappa, mu));
        IterativeLegendreGaussIntegrator integ = new IterativeLegendreGaussIntegrator(16, 1e-14, 1e-14);
        double[][] cases = {{300, 20}, {300, 350}, {10, 5}, {0, 200}, {-65, 400}, {180, 181}};
        for (double[] cx : cases) {
            double cut = cx[0], x = cx[1];
            double c = ((cut % period) + period) % period, y = ((x % period) + period) % period;
            double expected = y >= c ? integrate(integ, start, period, kappa, mu, c, y)
                    : integrate(integ, start, period, kappa, mu, c, period) + integrate(integ, start, period, kappa, mu, 0, y);
            assertEquals(expected, f.cdfFrom(cut, x), 1e-8, "cut " + cut + ", x " + x);
        }
        // the default cut point is the start: cdf(x) = cdfFrom(start, x)
        assertEquals(integrate(integ, start, period, kappa, mu, 0, 100), f.cdf(100), 1e-8);
        assertEquals(f.cdf(100), f.cdfFrom(start, 100), 1e-14);
        // quantileFrom inverts cdfFrom
        for (double cut : new double[] {300, 0, 17.5, -40}) {
            for (double p : new double[] {1e-6, 0.05, 0.3, 0.5, 0.77, 0.95, 1 - 1e-9}) {
                double q = f.quantileFrom(cut, p);
                assertTrue(q >= start && q < start + period, "quantile " + q);
                assertEquals(p, f.cdfFrom(cut, q), 1e-11, "cut " + cut + ", p " + p);
            }
        }
    }

    private static double integrate(IterativeLegendreGaussIntegrator integ, double start, double period, double kappa,
            double mu, double lo, double hi) {
        if (!(hi > lo)) {
            return 0.0;
        }
        return integ.integrate(1_000_000, x -> vonMisesPdf(start, period, kappa, mu, x), lo, hi);
    }

    /** Cardinal cubic B-spline on [0, 4) (de Boor (1978), A Practical Guide to Splines, the uniform case; from memory). */
    private static double cardinalCubic(double t) {
        if (t < 0 || t >= 4) {
            return 0;
        }
        if (t < 1) {
            return t * t * t / 6;
        }
        if (t < 2) {
            return (-3 * t * t * t + 12 * t * t - 12 * t + 4) / 6;
        }
        if (t < 3) {
            return (3 * t * t * t - 24 * t * t + 60 * t - 44) / 6;
        }
        double u = 4 - t;
        return u * u * u / 6;
    }

    @Test
    void periodicSplinesAreWrappedCardinalSplinesAndSumToOne() {
        double start = 5, period = 12;
        int n = 8;
        BayesSpace s = BayesSpace.periodicSplines(start, period, 4, n);
        assertEquals(n - 1, s.dimension());
        RawBasis raw = s.basis().raw();
        double h = period / n;
        double[] vals = new double[raw.scratchSize()];
        SplittableRandom rnd = new SplittableRandom(7);
        for (int i = 0; i < 500; i++) {
            double x = start - 2 * period + 5 * period * rnd.nextDouble();
            assertEquals(0, raw.evalLocal(x, vals));
            double u = (((x - start) % period) + period) % period / h;
            double total = 0;
            for (int j = 0; j < n; j++) {
                // periodic B-spline j starts at knot j: the cardinal spline at u − j taken modulo N
                double expected = cardinalCubic(((u - j) % n + n) % n);
                total += expected;
                if (j < n - 1) {
                    assertEquals(expected, vals[j], 1e-13, "function " + j + " at x = " + x);
                }
            }
            // partition of unity (de Boor (1978)): the N periodic B-splines sum to 1
            assertEquals(1.0, total, 1e-13);
        }
    }

    /**
     * B-spline i of order k on knots t at x by the Cox–de Boor recursion from its definition
     * (de Boor (1978), A Practical Guide to Splines, Springer, chapter IX), written independently of
     * the library's triangular scheme.
     */
    private static double coxDeBoor(double[] t, int i, int k, double x) {
        if (k == 1) {
            return t[i] <= x && x < t[i + 1] ? 1 : 0;
        }
        double left = t[i + k - 1] > t[i] ? (x - t[i]) / (t[i + k - 1] - t[i]) * coxDeBoor(t, i, k - 1, x) : 0;
        double right = t[i + k] > t[i + 1] ? (t[i + k] - x) / (t[i + k] - t[i + 1]) * coxDeBoor(t, i + 1, k - 1, x) : 0;
        return left + right;
    }

    @Test
    void periodicSplinesOnGivenKnotsAreTheWrappedBSplinesAndSumToOne() {
        double start = -1, period = 10;
        double[] knots = {-1, -0.2, 0.5, 2.5, 3, 4.8, 6, 8.1};
        int n = knots.length;
        for (int order : new int[] {2, 3, 4, 5}) {
            BayesSpace s = BayesSpace.periodicSplines(start, period, order, knots);
            assertEquals(n - 1, s.dimension());
            RawBasis raw = s.basis().raw();
            double[] vals = new double[raw.scratchSize()];
            // the knots continued around the circle over three turns: B-spline j + n·turn is periodic function j
            double[] t = new double[3 * n + 1];
            for (int i = 0; i <= 3 * n; i++) {
                t[i] = knots[i % n] + period * (i / n - 1);
            }
            SplittableRandom rnd = new SplittableRandom(order);
            for (int rep = 0; rep < 300; rep++) {
                double x = start + period * rnd.nextDouble();
                raw.evalLocal(x + period * (rnd.nextInt(5) - 2), vals); // evaluated a few turns away
                double total = 0;
                for (int j = 0; j < n; j++) {
                    double v = 0;
                    for (int turn = 0; turn < 3; turn++) {
                        int i = j + n * turn;
                        if (i + order < t.length) {
                            v += coxDeBoor(t, i, order, x);
                        }
                    }
                    total += v;
                    if (j < n - 1) {
                        assertEquals(v, vals[j], 1e-12, "order " + order + ", function " + j + " at " + x);
                    }
                }
                // partition of unity (de Boor (1978)): the n periodic B-splines sum to 1
                assertEquals(1.0, total, 1e-12, "order " + order + " at " + x);
            }
        }
        double[] equal = new double[8];
        for (int i = 0; i < 8; i++) {
            equal[i] = 2 + 12.0 * i / 8;
        }
        assertEquals(BayesSpace.periodicSplines(2, 12, 4, 8), BayesSpace.periodicSplines(2, 12, 4, equal));
        assertThrows(IllegalArgumentException.class, () -> BayesSpace.periodicSplines(0, 10, 4, new double[] {1, 2, 3, 4}));
        assertThrows(IllegalArgumentException.class, () -> BayesSpace.periodicSplines(0, 10, 4, new double[] {0, 2, 2, 4}));
        assertThrows(IllegalArgumentException.class, () -> BayesSpace.periodicSplines(0, 10, 4, new double[] {0, 2, 4, 10}));
    }

    @Test
    void periodicSplineSpaceIsInvariantUnderRotationByAKnotSpacing() {
        double start = 5, period = 12;
        int n = 8;
        double h = period / n;
        BayesSpace s = BayesSpace.periodicSplines(start, period, 4, n);
        SplittableRandom rnd = new SplittableRandom(11);
        for (int rep = 0; rep < 5; rep++) {
            double[] c = new double[s.dimension()];
            for (int k = 0; k < c.length; k++) {
                c[k] = rnd.nextDouble(-2, 2);
            }
            Density f = s.density(c);
            for (double shift : new double[] {h, -h, 3 * h}) {
                Projection p = s.projectLogPdf(x -> f.logPdf(x - shift));
                Density g = p.density();
                // the shifted spline is again a periodic spline on the same knots: nothing is left over
                assertTrue(p.error() < 1e-10 * f.norm(), "residual " + p.error());
                // rotation permutes the periodic B-splines: an isometry of the clr subspace
                assertEquals(f.norm(), g.norm(), 1e-10 * f.norm());
                for (int i = 0; i <= 300; i++) {
                    double x = start - period + 3 * period * i / 300.0;
                    assertEquals(f.pdf(x - shift), g.pdf(x), 1e-10 * f.pdf(x - shift), "pdf at " + x);
                }
            }
            // a shift by a fraction of the spacing is not held exactly (a check that can fail)
            Projection off = s.projectLogPdf(x -> f.logPdf(x - 0.37 * h));
            assertTrue(off.error() > 1e-6 * f.norm(), "residual " + off.error());
        }
    }

    @Test
    void evaluationWrapsModuloThePeriod() {
        BayesSpace s = BayesSpace.periodicSplines(0, 7, 3, 7);
        Density f = s.density(0.3, -1.2, 0.8, 0.1, -0.4, 0.9);
        for (double x : new double[] {0, 0.5, 3.3, 6.999}) {
            for (int turns : new int[] {-3, -1, 1, 2, 40}) {
                double y = x + turns * 7.0;
                assertEquals(f.pdf(x), f.pdf(y), 1e-11 * f.pdf(x));
                assertEquals(f.clr(x), f.clr(y), 1e-11);
                assertEquals(f.logPdf(x), f.logPdf(y), 1e-11);
            }
        }
        // continuity across the cut point: the periodic basis joins smoothly
        assertEquals(f.pdf(0), f.pdf(7), 1e-12 * f.pdf(0));
        assertEquals(f.pdf(1e-9), f.pdf(7 - 1e-9), 1e-7 * f.pdf(0));
        // the DensitySet grid evaluation wraps the same way
        DensitySet set = DensitySet.of(java.util.List.of(f));
        double[] grid = {-6.5, 0.5, 7.5, 20.5};
        double[] out = set.pdf(grid).data;
        for (int j = 0; j < grid.length; j++) {
            assertEquals(f.pdf(grid[j]), out[j], 1e-12 * f.pdf(grid[j]));
        }
    }

    @Test
    void boundedSpacesHaveNoCircularSummaries() {
        BayesSpace s = BayesSpace.cubicSplines(0, 1, 3);
        assertFalse(s.isPeriodic());
        IllegalStateException e = assertThrows(IllegalStateException.class, s::period);
        assertTrue(e.getMessage().contains("not periodic"), e.getMessage());
        Density f = s.density(new double[s.dimension()]);
        assertThrows(IllegalStateException.class, f::circularMean);
        assertThrows(IllegalStateException.class, f::meanResultantLength);
        assertThrows(IllegalStateException.class, () -> f.cdfFrom(0.5, 0.2));
        assertThrows(IllegalStateException.class, () -> f.quantileFrom(0.5, 0.2));
        // the uniform density on a circle has R = 0 and no mean direction
        BayesSpace c = BayesSpace.fourier(0, 1, 2);
        assertEquals(0.0, c.neutral().meanResultantLength(), 1e-15);
        assertThrows(IllegalStateException.class, () -> c.neutral().circularMean());
        assertThrows(IllegalArgumentException.class, () -> c.neutral().pdf(Double.POSITIVE_INFINITY));
        assertThrows(IllegalArgumentException.class, () -> BayesSpace.periodicSplines(0, 1, 4, 3));
        assertThrows(IllegalArgumentException.class, () -> BayesSpace.fourier(0, 1, 0));
        assertThrows(IllegalArgumentException.class, () -> BayesSpace.fourier(0, -1, 2));
    }
}
