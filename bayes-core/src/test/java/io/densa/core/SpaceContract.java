package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;

/**
 * Contract every Bayes space must satisfy, run by one subclass per basis kind and reference
 * (STYLE.md point 8). The axioms are those of a real inner-product space (any linear-algebra
 * text; for B2 see Egozcue, Díaz-Barrero, Pawlowsky-Glahn (2006), Hilbert space of probability
 * density functions based on Aitchison geometry, Acta Math. Sinica 22(4)).
 *
 * <p>Tolerance: every comparison is relative, |actual − expected| ≤ 1e-10 · scale, where scale
 * is the size of the terms combined (floor 1), stated next to each check.
 */
abstract class SpaceContract {
    /** Relative tolerance of every check in this contract. */
    static final double REL = 1e-10;

    /** The space under test. */
    abstract BayesSpace space();

    @Provide
    Arbitrary<double[]> coords() {
        return Arbitraries.doubles().between(-3, 3).ofScale(12).array(double[].class).ofSize(space().dimension());
    }

    @Provide
    Arbitrary<Double> scalars() {
        return Arbitraries.doubles().between(-4, 4).ofScale(12);
    }

    @Provide
    Arbitrary<Double> units() {
        return Arbitraries.doubles().between(0, 1).ofScale(14);
    }

    /** Probabilities spread over the tails: p = 1 / (1 + e^{−t}), t in [−20, 20]. */
    @Provide
    Arbitrary<Double> probabilities() {
        return Arbitraries.doubles().between(-20, 20).ofScale(12).map(t -> 1 / (1 + Math.exp(-t)));
    }

    private Density d(double[] c) {
        return space().density(c);
    }

    private double x(double u) {
        BayesSpace s = space();
        return Math.min(s.upper(), s.lower() + u * (s.upper() - s.lower()));
    }

    private static double norm(double[] c) {
        double s = 0;
        for (double v : c) {
            s += v * v;
        }
        return Math.sqrt(s);
    }

    /** Asserts that two densities coincide: B2 distance ≤ REL · max(1, scale). */
    static void assertSame(Density expected, Density actual, double scale) {
        double dist = expected.distance(actual);
        assertTrue(dist <= REL * Math.max(1, scale), "distance " + dist + " between " + expected + " and " + actual);
    }

    // ------------------------------------------------------------------ vector-space axioms

    @Property(tries = 1000, seed = "20261201")
    void perturbationIsAssociative(@ForAll("coords") double[] f, @ForAll("coords") double[] g,
            @ForAll("coords") double[] h) {
        Density l = d(f).perturb(d(g)).perturb(d(h));
        Density r = d(f).perturb(d(g).perturb(d(h)));
        assertSame(l, r, norm(f) + norm(g) + norm(h));
    }

    @Property(tries = 1000, seed = "20261202")
    void perturbationIsCommutative(@ForAll("coords") double[] f, @ForAll("coords") double[] g) {
        assertSame(d(f).perturb(d(g)), d(g).perturb(d(f)), norm(f) + norm(g));
    }

    @Property(tries = 1000, seed = "20261203")
    void neutralElementLeavesDensityUnchanged(@ForAll("coords") double[] f) {
        assertSame(d(f), d(f).perturb(space().neutral()), norm(f));
        assertSame(d(f), space().neutral().perturb(d(f)), norm(f));
    }

    @Property(tries = 1000, seed = "20261204")
    void inverseGivesNeutralElement(@ForAll("coords") double[] f) {
        Density z = d(f).perturb(d(f).inverse());
        assertTrue(z.norm() <= REL * Math.max(1, norm(f)), "‖f ⊕ ⊖f‖ = " + z.norm());
        assertSame(space().neutral(), d(f).minus(d(f)), norm(f));
    }

    @Property(tries = 1000, seed = "20261205")
    void poweringDistributesOverPerturbation(@ForAll("coords") double[] f, @ForAll("coords") double[] g,
            @ForAll("scalars") double alpha) {
        Density l = d(f).perturb(d(g)).power(alpha);
        Density r = d(f).power(alpha).perturb(d(g).power(alpha));
        assertSame(l, r, Math.abs(alpha) * (norm(f) + norm(g)));
    }

    @Property(tries = 1000, seed = "20261206")
    void poweringDistributesOverScalarSum(@ForAll("coords") double[] f,
            @ForAll("scalars") double alpha, @ForAll("scalars") double beta) {
        Density l = d(f).power(alpha + beta);
        Density r = d(f).power(alpha).perturb(d(f).power(beta));
        assertSame(l, r, (Math.abs(alpha) + Math.abs(beta)) * norm(f));
    }

    @Property(tries = 1000, seed = "20261207")
    void poweringIsCompatibleAndOneIsIdentity(@ForAll("coords") double[] f,
            @ForAll("scalars") double alpha, @ForAll("scalars") double beta) {
        assertSame(d(f).power(alpha * beta), d(f).power(beta).power(alpha), Math.abs(alpha * beta) * norm(f));
        assertEquals(d(f), d(f).power(1.0), "1 ⊙ f must equal f exactly");
    }

    /** The clr is a linear isometry: clr(α ⊙ f ⊕ g)(x) = α clr f(x) + clr g(x), checked pointwise. */
    @Property(tries = 1000, seed = "20261208")
    void clrIsLinear(@ForAll("coords") double[] f, @ForAll("coords") double[] g,
            @ForAll("scalars") double alpha, @ForAll("units") double u) {
        double x = x(u);
        double l = d(f).power(alpha).perturb(d(g)).clr(x);
        double a = alpha * d(f).clr(x);
        double b = d(g).clr(x);
        assertEquals(a + b, l, REL * Math.max(1, Math.abs(a) + Math.abs(b)));
    }

    // ------------------------------------------------------------------ inner product

    @Property(tries = 1000, seed = "20261209")
    void innerProductIsSymmetricAndBilinear(@ForAll("coords") double[] f, @ForAll("coords") double[] g,
            @ForAll("coords") double[] h, @ForAll("scalars") double alpha) {
        assertEquals(d(f).inner(d(g)), d(g).inner(d(f)), REL * Math.max(1, norm(f) * norm(g)));
        double l = d(f).power(alpha).perturb(d(g)).inner(d(h));
        double r = alpha * d(f).inner(d(h)) + d(g).inner(d(h));
        assertEquals(r, l, REL * Math.max(1, (Math.abs(alpha) * norm(f) + norm(g)) * norm(h)));
    }

    @Property(tries = 1000, seed = "20261210")
    void innerProductIsPositiveDefinite(@ForAll("coords") double[] f) {
        double n2 = d(f).inner(d(f));
        assertEquals(d(f).normSq(), n2, REL * Math.max(1, n2));
        assertTrue(n2 >= 0);
        if (norm(f) > 0) {
            assertTrue(n2 > 0, "⟨f, f⟩ = 0 for f ≠ neutral");
        }
        assertEquals(0.0, space().neutral().normSq(), 0.0);
    }

    /** ⟨f, g⟩_B equals ∫ clr f clr g dP evaluated from the clr functions (the space's quadrature). */
    @Property(tries = 1000, seed = "20261211")
    void innerProductIsIntegralOfClrProduct(@ForAll("coords") double[] f, @ForAll("coords") double[] g) {
        Density df = d(f), dg = d(g);
        double integral = space().integrate(x -> df.clr(x) * dg.clr(x));
        assertEquals(df.inner(dg), integral, REL * Math.max(1, norm(f) * norm(g)));
    }

    @Property(tries = 1000, seed = "20261212")
    void cauchySchwarzHolds(@ForAll("coords") double[] f, @ForAll("coords") double[] g) {
        double lhs = Math.abs(d(f).inner(d(g)));
        double rhs = d(f).norm() * d(g).norm();
        assertTrue(lhs <= rhs * (1 + REL) + REL, lhs + " > " + rhs);
    }

    @Property(tries = 1000, seed = "20261213")
    void triangleInequalityHolds(@ForAll("coords") double[] f, @ForAll("coords") double[] g,
            @ForAll("coords") double[] h) {
        double direct = d(f).distance(d(h));
        double via = d(f).distance(d(g)) + d(g).distance(d(h));
        assertTrue(direct <= via * (1 + REL) + REL, direct + " > " + via);
        assertTrue(d(f).perturb(d(g)).norm() <= (d(f).norm() + d(g).norm()) * (1 + REL) + REL);
    }

    // ------------------------------------------------------------------ round trips

    /** Evaluation points: 4K + 8 equally spaced points including both ends. */
    double[] points() {
        BayesSpace s = space();
        int m = 4 * s.dimension() + 8;
        double[] xs = new double[m];
        for (int i = 0; i < m; i++) {
            xs[i] = i == m - 1 ? s.upper() : s.lower() + (s.upper() - s.lower()) * i / (m - 1);
        }
        return xs;
    }

    /** coordinates → clr values at points → coordinates (least squares, {@code fromClr}). */
    @Property(tries = 1000, seed = "20261214")
    void roundTripThroughClrValues(@ForAll("coords") double[] f) {
        double[] xs = points();
        double[] clr = d(f).clr(xs);
        double[] back = space().fromClr(xs, clr).coordinates();
        assertTrue(dist(f, back) <= REL * Math.max(1, norm(f)), "round trip moved by " + dist(f, back));
    }

    /** coordinates → log-pdf function → coordinates ({@code projectLogPdf}); residual ≈ 0. */
    @Property(tries = 1000, seed = "20261215")
    void roundTripThroughLogPdf(@ForAll("coords") double[] f) {
        Density df = d(f);
        Projection p = space().projectLogPdf(df::logPdf);
        double[] back = p.density().coordinates();
        assertTrue(dist(f, back) <= REL * Math.max(1, norm(f)), "round trip moved by " + dist(f, back));
        assertTrue(p.error() <= REL * Math.max(1, norm(f)), "projection error " + p.error());
    }

    // ------------------------------------------------------------------ distribution functions

    /** cdf is non-decreasing, in [0, 1], and quantile inverts it: cdf(quantile(p)) = p. */
    @Property(tries = 1000, seed = "20261216")
    void quantileInvertsCdf(@ForAll("coords") double[] f, @ForAll("probabilities") double p,
            @ForAll("units") double u, @ForAll("units") double v) {
        Density df = d(f);
        double q = df.quantile(p);
        assertTrue(q >= space().lower() && q <= space().upper());
        // exact to the double spacing at q: pdf(q)·ulp(q) besides the relative tolerance on the tail
        // of p's side; cdf itself sums panel masses from the left, so near 1 it is good to 1e-12 absolute
        // (for the sharply peaked densities drawn here clr values reach the hundreds and carry rounding ~1e-13)
        double res = 4 * df.pdf(q) * Math.ulp(q);
        if (p <= 0.5) {
            assertEquals(p, df.cdf(q), REL * p + res, "cdf(quantile(" + p + "))");
        } else {
            assertEquals(1 - p, df.tailProbability(q), REL * (1 - p) + res, "tail(quantile(" + p + "))");
            assertEquals(p, df.cdf(q), 1e-12 + res, "cdf(quantile(" + p + "))");
        }
        double x1 = x(Math.min(u, v)), x2 = x(Math.max(u, v));
        double c1 = df.cdf(x1), c2 = df.cdf(x2);
        assertTrue(c1 >= 0 && c2 <= 1 && c1 <= c2, "cdf not monotone: cdf(" + x1 + ") = " + c1 + " > cdf(" + x2
                + ") = " + c2);
    }

    private static double dist(double[] a, double[] b) {
        double s = 0;
        for (int i = 0; i < a.length; i++) {
            s += (a[i] - b[i]) * (a[i] - b[i]);
        }
        return Math.sqrt(s);
    }
}
