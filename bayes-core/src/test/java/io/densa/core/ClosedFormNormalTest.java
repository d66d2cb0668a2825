package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Closed forms for normal and exponential densities on a bounded interval. Exponential families
 * are linear subspaces of B2 (Egozcue, Díaz-Barrero, Pawlowsky-Glahn (2006), Hilbert space of
 * probability density functions based on Aitchison geometry, Acta Math. Sinica 22(4); van den
 * Boogaart, Egozcue, Pawlowsky-Glahn (2014), Bayes Hilbert spaces, Aust. N. Z. J. Stat. 56(2)):
 * for f_θ ∝ exp(θ'T(x)) the clr is θ'(T − T̄), T̄ the mean of T over [a, b], so normals have a
 * centred quadratic clr and lie exactly in a polynomial space of degree ≥ 2 and in a cubic-spline
 * space.
 *
 * <p>The formulas are derived here. With T = (x, x²), θ = (μ/σ², −1/(2σ²)), η = b − a and
 * x = (a + b)/2 + t, t ∈ [−η/2, η/2]: x − x̄ = t and x² − mean(x²) = (a + b) t + (t² − η²/12), so
 * clr f − clr g = (Δθ1 + (a + b)Δθ2) t + Δθ2 (t² − η²/12). The two terms are orthogonal on the
 * symmetric interval, ∫ t² dt = η³/12 and ∫ (t² − η²/12)² dt = η⁵/180, hence
 * d² = η[(η²/12)(Δθ1 + (a + b)Δθ2)² + (η⁴/180)Δθ2²]. The table values below follow from these
 * formulas, and where possible the test recomputes them independently with Apache Commons Math
 * integrators ({@code TestSpaces.integrate}). Lebesgue reference unless stated. Relative
 * tolerance 1e-10 (values given to fewer digits are compared to their last digit).
 */
class ClosedFormNormalTest {
    private static final double REL = 1e-10;

    /** The log-pdf of N(μ, σ²) up to a constant (projectLogPdf absorbs constants). */
    static Density normal(BayesSpace s, double mu, double sigma) {
        Projection p = s.projectLogPdf(x -> -(x - mu) * (x - mu) / (2 * sigma * sigma));
        assertTrue(p.relativeError() < 1e-12, "a normal lies in " + s + ", residual " + p.relativeError());
        return p.density();
    }

    /** clr of N(μ, σ²) on [a, b] (derived in the class comment): −(1/(2σ²)) [ (x−μ)² − ((b−μ)³ − (a−μ)³)/(3η) ]. */
    static double clrNormal(double x, double mu, double sigma, double a, double b) {
        double eta = b - a;
        double cube = (Math.pow(b - mu, 3) - Math.pow(a - mu, 3)) / (3 * eta);
        return -((x - mu) * (x - mu) - cube) / (2 * sigma * sigma);
    }

    /** d² between two normals on [a, b] (derived in the class comment), with θ1 = μ/σ², θ2 = −1/(2σ²). */
    static double distanceSqFormula(double a, double b, double m1, double s1, double m2, double s2) {
        double eta = b - a;
        double d1 = m1 / (s1 * s1) - m2 / (s2 * s2);
        double d2 = -1 / (2 * s1 * s1) + 1 / (2 * s2 * s2);
        double lin = d1 + (a + b) * d2;
        return eta * (eta * eta / 12 * lin * lin + Math.pow(eta, 4) / 180 * d2 * d2);
    }

    @Test
    void clrOfNormalIsCentredQuadratic() {
        // from clrNormal: on [−1, 1], clr N(0, 0.5²)(x) = −2x² + 2/3
        for (BayesSpace s : new BayesSpace[] {BayesSpace.polynomials(-1, 1, 2), BayesSpace.splines(-1, 1, 4, 3)}) {
            Density f = normal(s, 0, 0.5);
            // the constant 2/3 re-derived: −(1/η) ∫ −2x² dx by a Commons Math integrator
            double constant = -TestSpaces.integrate(s, x -> -2 * x * x) / 2;
            assertEquals(2.0 / 3, constant, 1e-13);
            for (double x : TestSpaces.grid(s, 21)) {
                double expected = -2 * x * x + 2.0 / 3;
                assertEquals(expected, f.clr(x), REL * Math.max(1, Math.abs(expected)), s + " at " + x);
                assertEquals(clrNormal(x, 0, 0.5, -1, 1), f.clr(x), REL);
            }
        }
    }

    @Test
    void innerProductAndDistanceOnMinusOneOne() {
        BayesSpace s = BayesSpace.polynomials(-1, 1, 2);
        Density f = normal(s, 0, 0.5);
        Density g = normal(s, 0.3, 0.8);
        // from the formulas above: ⟨N(0, .5²), N(.3, .8²)⟩ = 5/18, d² = 0.410546875
        assertEquals(5.0 / 18, f.inner(g), REL);
        assertEquals(0.410546875, f.distanceSq(g), REL);
        // re-derived: ∫ clr f clr g dx and ∫ (clr f − clr g)² dx with the closed-form clr, Commons Math
        assertEquals(5.0 / 18, TestSpaces.integrate(s,
                x -> clrNormal(x, 0, 0.5, -1, 1) * clrNormal(x, 0.3, 0.8, -1, 1)), 1e-12);
        assertEquals(0.410546875, distanceSqFormula(-1, 1, 0, 0.5, 0.3, 0.8), 1e-15);
        // uniform probability reference: d² divided by η = 2 (table: 0.2052734)
        BayesSpace u = s.withReference(Reference.uniform());
        assertEquals(0.2052734, normal(u, 0, 0.5).distanceSq(normal(u, 0.3, 0.8)), 1e-7);
        assertEquals(0.410546875 / 2, normal(u, 0, 0.5).distanceSq(normal(u, 0.3, 0.8)), REL);
    }

    @Test
    void distanceOnZeroThreeInSplineSpace() {
        // from distanceSqFormula: on [0, 3], d²(N(1, .5²), N(1.5, 1)) = 12.0375; exact in a cubic
        // spline space because cubic splines contain the quadratics
        BayesSpace s = BayesSpace.splines(0, 3, 4, 5);
        double d2 = normal(s, 1, 0.5).distanceSq(normal(s, 1.5, 1));
        assertEquals(12.0375, d2, REL * 12.0375);
        assertEquals(12.0375, distanceSqFormula(0, 3, 1, 0.5, 1.5, 1), 1e-12);
        double viaIntegral = TestSpaces.integrate(s, x -> {
            double d = clrNormal(x, 1, 0.5, 0, 3) - clrNormal(x, 1.5, 1, 0, 3);
            return d * d;
        });
        assertEquals(12.0375, viaIntegral, 1e-10);
    }

    @Test
    void perturbationAndPoweringOfNormals() {
        // perturbation adds natural parameters (Egozcue et al. 2006): N(0, 1) ⊕ N(2, 1) = N(1, 1/2); α ⊙ N(μ, σ²) = N(μ, σ²/α)
        for (BayesSpace s : new BayesSpace[] {BayesSpace.polynomials(-2, 3, 2), BayesSpace.splines(-2, 3, 4, 4)}) {
            Density sum = normal(s, 0, 1).perturb(normal(s, 2, 1));
            assertTrue(sum.distance(normal(s, 1, Math.sqrt(0.5))) < REL, s + ": " + sum);
            double alpha = 2.5;
            Density pow = normal(s, 0.4, 0.7).power(alpha);
            assertTrue(pow.distance(normal(s, 0.4, 0.7 / Math.sqrt(alpha))) < REL);
        }
    }

    @Provide
    Arbitrary<double[]> normalPairs() {
        // a, η, μ1, σ1, μ2, σ2
        return Arbitraries.doubles().between(0, 1).ofScale(12).array(double[].class).ofSize(6).map(u -> {
            double a = -3 + 3 * u[0];
            double eta = 0.5 + 3.5 * u[1];
            return new double[] {a, a + eta, a - 1 + (eta + 2) * u[2], 0.3 + 1.7 * u[3], a - 1 + (eta + 2) * u[4],
                    0.3 + 1.7 * u[5]};
        });
    }

    /** The general d² formula (class comment) over random intervals and normal parameters. */
    @Property(tries = 1000, seed = "20261220")
    void distanceFormulaForRandomNormals(@ForAll("normalPairs") double[] v) {
        BayesSpace s = BayesSpace.polynomials(v[0], v[1], 2);
        double expected = distanceSqFormula(v[0], v[1], v[2], v[3], v[4], v[5]);
        double actual = normal(s, v[2], v[3]).distanceSq(normal(s, v[4], v[5]));
        assertEquals(expected, actual, REL * Math.max(1e-3, expected));
    }

    @Test
    void exponentialDistance() {
        // derived as in the class comment with T = x: Exp(λ) has clr −λ (x − (a+b)/2); d² = (λ1 − λ2)² η³ / 12
        for (BayesSpace s : new BayesSpace[] {BayesSpace.polynomials(0.5, 3, 1), BayesSpace.splines(0.5, 3, 4, 2)}) {
            double l1 = 0.7, l2 = 2.9, eta = 2.5;
            Density f = s.projectLogPdf(x -> -l1 * x).density();
            Density g = s.projectLogPdf(x -> -l2 * x).density();
            double expected = (l1 - l2) * (l1 - l2) * eta * eta * eta / 12;
            assertEquals(expected, f.distanceSq(g), REL * expected);
            assertEquals(-l1 * (1.2 - 1.75), f.clr(1.2), REL);
        }
    }

    /**
     * pdf and cdf of N(0, 0.5²) truncated to [−1, 1] against Commons Math's
     * {@link NormalDistribution}: pdf = φ/(Φ(1) − Φ(−1)), cdf = (Φ(x) − Φ(−1))/(Φ(1) − Φ(−1)); mean
     * and variance of the truncated normal (Johnson, Kotz, Balakrishnan (1994), Continuous
     * Univariate Distributions vol. 1, ch. 13, from memory; confirmed by integration below).
     */
    @Test
    void normalAgainstCommonsMathTruncated() {
        NormalDistribution n = new NormalDistribution(0.2, 0.5);
        for (BayesSpace s : new BayesSpace[] {BayesSpace.polynomials(-1, 1, 2), BayesSpace.splines(-1, 1, 4, 5),
                BayesSpace.polynomials(-1, 1, 3).withReference(Reference.uniform())}) {
            Density f = normal(s, 0.2, 0.5);
            double lo = n.cumulativeProbability(-1), z = n.cumulativeProbability(1) - lo;
            for (double x : TestSpaces.grid(s, 31)) {
                assertEquals(n.density(x) / z, f.pdf(x), REL * n.density(x) / z, "pdf at " + x);
                double c = (n.cumulativeProbability(x) - lo) / z;
                assertEquals(c, f.cdf(x), 1e-14 + REL * c, "cdf at " + x);
            }
            for (double p : new double[] {1e-8, 0.05, 0.5, 0.95, 1 - 1e-8}) {
                double q = f.quantile(p);
                double c = (n.cumulativeProbability(q) - lo) / z;
                assertEquals(p, c, 1e-15 + REL * Math.min(p, 1 - p), "quantile " + p);
            }
            NormalDistribution std = new NormalDistribution(0, 1);
            double al = (-1 - 0.2) / 0.5, be = (1 - 0.2) / 0.5;
            double zz = std.cumulativeProbability(be) - std.cumulativeProbability(al);
            double mean = 0.2 + 0.5 * (std.density(al) - std.density(be)) / zz;
            double var = 0.25 * (1 + (al * std.density(al) - be * std.density(be)) / zz
                    - Math.pow((std.density(al) - std.density(be)) / zz, 2));
            assertEquals(mean, f.mean(), REL);
            assertEquals(var, f.variance(), REL * var);
            // second derivation of the recalled moment formulas: ∫ x φ and ∫ x² φ over [−1, 1] by
            // Commons Math integration, divided by the mass Φ(1) − Φ(−1)
            IterativeLegendreGaussIntegrator gl = new IterativeLegendreGaussIntegrator(16, 1e-14, 1e-16);
            double m1 = gl.integrate(10_000, x -> x * n.density(x), -1, 1) / z;
            double m2 = gl.integrate(10_000, x -> x * x * n.density(x), -1, 1) / z;
            assertEquals(m1, mean, REL);
            assertEquals(m2 - m1 * m1, var, REL * var);
        }
    }
}
