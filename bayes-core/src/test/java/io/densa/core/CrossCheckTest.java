package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Independent cross-checks of the Bayes-space operations against their definitions, with every
 * integral computed by Apache Commons Math (commons-math3 3.6.1,
 * {@code IterativeLegendreGaussIntegrator}) instead of the space's quadrature. Definitions from
 * Egozcue, Díaz-Barrero, Pawlowsky-Glahn (2006), Hilbert space of probability density functions
 * based on Aitchison geometry, Acta Math. Sinica 22(4), and for weighted references Talská,
 * Menafoglio, Hron, Egozcue, Palarea-Albaladejo (2020), Weighting the domain of probability
 * densities in functional data analysis, Stat 9:e283 (from memory): with Lebesgue pdfs g and
 * reference density p, a density with respect to P is g/p, so g1 ⊕ g2 ∝ (g1/p)(g2/p) p = g1 g2 / p
 * and α ⊙ g ∝ p (g/p)^α (derived from the definition of B2(P)). Relative tolerance 1e-10 throughout.
 */
class CrossCheckTest {
    private static final double REL = 1e-10;

    private static void close(double expected, double actual, String what) {
        assertEquals(expected, actual, REL * Math.max(1e-300, Math.abs(expected)), what);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void perturbationIsNormalisedPointwiseProduct(String name, BayesSpace s) {
        Random rnd = new Random(11);
        for (int rep = 0; rep < 3; rep++) {
            Density f = s.density(TestSpaces.randomCoordinates(s, rnd, 1.5));
            Density g = s.density(TestSpaces.randomCoordinates(s, rnd, 1.5));
            Density fg = f.perturb(g);
            double z = TestSpaces.integrate(s, x -> f.pdf(x) * g.pdf(x) / s.referenceDensity(x));
            for (double x : TestSpaces.grid(s, 23)) {
                double expected = f.pdf(x) * g.pdf(x) / s.referenceDensity(x) / z;
                if (s.referenceDensity(x) > 0) {
                    close(expected, fg.pdf(x), "(f ⊕ g)(" + x + ")");
                }
            }
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void poweringIsNormalisedPower(String name, BayesSpace s) {
        Random rnd = new Random(12);
        for (double alpha : new double[] {-1.3, 0.4, 2.5}) {
            Density f = s.density(TestSpaces.randomCoordinates(s, rnd, 1.5));
            Density fa = f.power(alpha);
            double z = TestSpaces.integrate(s, x -> s.referenceDensity(x) * Math.pow(f.pdf(x) / s.referenceDensity(x), alpha));
            for (double x : TestSpaces.grid(s, 23)) {
                double p = s.referenceDensity(x);
                if (p > 0) {
                    close(p * Math.pow(f.pdf(x) / p, alpha) / z, fa.pdf(x), alpha + " ⊙ f at " + x);
                }
            }
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void pdfIntegratesToOne(String name, BayesSpace s) {
        Random rnd = new Random(13);
        for (int rep = 0; rep < 3; rep++) {
            Density f = s.density(TestSpaces.randomCoordinates(s, rnd, 2));
            close(1.0, TestSpaces.integrate(s, f::pdf), "∫ pdf");
        }
        close(1.0, TestSpaces.integrate(s, s.neutral()::pdf), "∫ pdf of the neutral element");
    }

    /**
     * ⟨f, g⟩_B = (1 / (2 P(I))) ∫∫ ln(f(x)/f(y)) ln(g(x)/g(y)) dP(x) dP(y), with f, g the densities
     * with respect to P (van den Boogaart, Egozcue, Pawlowsky-Glahn (2014), Bayes Hilbert spaces,
     * Aust. N. Z. J. Stat. 56(2), from memory). Nested Commons Math integrals; the second form of
     * the same inner product, ∫ clr f clr g dP, is checked against it below.
     */
    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void innerProductEqualsDoubleIntegral(String name, BayesSpace s) {
        Random rnd = new Random(14);
        Density f = s.density(TestSpaces.randomCoordinates(s, rnd, 1.5));
        Density g = s.density(TestSpaces.randomCoordinates(s, rnd, 1.5));
        java.util.function.DoubleUnaryOperator lf = x -> f.logPdf(x) - Math.log(s.referenceDensity(x));
        java.util.function.DoubleUnaryOperator lg = x -> g.logPdf(x) - Math.log(s.referenceDensity(x));
        double outer = TestSpaces.integrate(s, x -> {
            double fx = lf.applyAsDouble(x), gx = lg.applyAsDouble(x);
            return s.referenceDensity(x) * TestSpaces.integrate(s,
                    y -> s.referenceDensity(y) * (fx - lf.applyAsDouble(y)) * (gx - lg.applyAsDouble(y)),
                    s.lower(), s.upper());
        }, nudge(s, s.lower(), 1), nudge(s, s.upper(), -1));
        double expected = outer / (2 * s.referenceMass());
        assertEquals(expected, f.inner(g), REL * Math.max(1, Math.abs(expected)), "double-integral form");
        // second form: ∫ clr f clr g dP, clr = log P-density minus its P-mean
        double lo = nudge(s, s.lower(), 1), hi = nudge(s, s.upper(), -1);
        double mf = TestSpaces.integrate(s, x -> s.referenceDensity(x) * lf.applyAsDouble(x), lo, hi) / s.referenceMass();
        double mg = TestSpaces.integrate(s, x -> s.referenceDensity(x) * lg.applyAsDouble(x), lo, hi) / s.referenceMass();
        double single = TestSpaces.integrate(s,
                x -> s.referenceDensity(x) * (lf.applyAsDouble(x) - mf) * (lg.applyAsDouble(x) - mg), lo, hi);
        assertEquals(expected, single, REL * Math.max(1, Math.abs(expected)), "single-integral form");
    }

    /** Moves an end point inwards by a hair when the reference weight vanishes there (beta). */
    private static double nudge(BayesSpace s, double x, int dir) {
        return s.referenceDensity(x) > 0 ? x : x + dir * 1e-12 * (s.upper() - s.lower());
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void cdfQuantileMeanVarianceAgreeWithIntegrals(String name, BayesSpace s) {
        Random rnd = new Random(15);
        for (int rep = 0; rep < 2; rep++) {
            Density f = s.density(TestSpaces.randomCoordinates(s, rnd, 2));
            for (double x : TestSpaces.grid(s, 13)) {
                double expected = TestSpaces.integrate(s, f::pdf, s.lower(), x);
                assertEquals(expected, f.cdf(x), 1e-14 + REL * expected, "cdf(" + x + ")");
                double upper = TestSpaces.integrate(s, f::pdf, x, s.upper());
                assertEquals(upper, f.tailProbability(x), 1e-15 + REL * upper, "tail(" + x + ")");
            }
            for (double p : new double[] {1e-6, 0.01, 0.3, 0.5, 0.77, 0.999, 1 - 1e-7}) {
                double q = f.quantile(p);
                // the tail on the side of p, so that both tails are checked relatively; a quantile is
                // exact only to the double spacing at q: allow pdf(q)·ulp(q) besides REL
                double side = p <= 0.5 ? p : 1 - p;
                double mass = p <= 0.5 ? TestSpaces.integrate(s, f::pdf, s.lower(), q)
                        : TestSpaces.integrate(s, f::pdf, q, s.upper());
                double tol = 1e-15 + REL * side + 4 * f.pdf(q) * Math.ulp(q);
                assertEquals(side, mass, tol, "tail mass at quantile(" + p + ")");
            }
            double mean = TestSpaces.integrate(s, x -> x * f.pdf(x));
            close(mean, f.mean(), "mean");
            double var = TestSpaces.integrate(s, x -> (x - mean) * (x - mean) * f.pdf(x));
            close(var, f.variance(), "variance");
        }
    }
}
