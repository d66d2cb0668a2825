package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Densities whose clr peaks far above its values at the quadrature nodes: at a domain end (a
 * normal centred on the end, an exponential piled up against it), between two nodes, and the
 * spline density with coordinates ±1e4 whose evaluation used to overflow (cdf NaN, logPdf −∞).
 *
 * <p>Independent references: closed forms through Commons Math's {@link NormalDistribution}
 * (commons-math3 3.6.1) — a normal N(μ, σ²) restricted to [a, b] lies exactly in a space that
 * contains quadratics, its cdf is (Φ((x−μ)/σ) − Φ((a−μ)/σ)) / (Φ((b−μ)/σ) − Φ((a−μ)/σ)) (common
 * practice) — the truncated-exponential cdf (1 − e^{−λ(b−x)})… written below, and for the spline
 * density, Commons Math's {@link IterativeLegendreGaussIntegrator} applied to exp(clr) with the clr
 * taken from the orthonormal basis values ({@link BayesSpace#basisAt}), not from the raw-coefficient
 * path the space integrates with.
 *
 * <p>Tolerances: a clr of size C is evaluated with a rounding error of about ε C, which becomes a
 * relative error of the pdf of the same size; each test states its C.
 */
class PeakedDensityTest {

    /** σ = 1e-5 on [0, 1], centred on the lower end: half the mass within 4e-5 of a, where no node lies. */
    @Test
    void normalCentredOnTheDomainEnd() {
        double mu = 0, sd = 1e-5;
        BayesSpace s = BayesSpace.polynomials(0, 1, 2);
        Density f = s.projectLogPdf(x -> -(x - mu) * (x - mu) / (2 * sd * sd)).density();
        NormalDistribution n = new NormalDistribution(mu, sd);
        // clr terms up to 1/(2σ²) = 5e9: rounding about 1e-6 relative
        double rel = 1e-6;
        for (double z : new double[] {0.01, 0.5, 1, 2, 4, 7}) {
            double x = mu + z * sd;
            double cdf = (n.cumulativeProbability(x) - 0.5) / 0.5;
            double tail = 2 * n.cumulativeProbability(-z * sd); // P(X > x) for the half-normal
            assertEquals(cdf, f.cdf(x), rel * cdf, "cdf at z = " + z);
            assertEquals(tail, f.tailProbability(x), rel * tail, "tail at z = " + z);
            assertEquals(2 * n.density(x), f.pdf(x), rel * 2 * n.density(x), "pdf at z = " + z);
            assertEquals(Math.log(2 * n.density(x)), f.logPdf(x), rel * 10, "logPdf at z = " + z);
        }
        for (double p : new double[] {1e-9, 0.1, 0.5, 0.9, 1 - 1e-9}) {
            double expected = n.inverseCumulativeProbability(0.5 + 0.5 * p);
            assertEquals(expected, f.quantile(p), rel * expected + 1e-15, "quantile(" + p + ")");
        }
        // half-normal: mean σ √(2/π), variance σ² (1 − 2/π)
        assertEquals(sd * Math.sqrt(2 / Math.PI), f.mean(), rel * sd);
        assertEquals(sd * sd * (1 - 2 / Math.PI), f.variance(), rel * sd * sd);
    }

    /** σ = 1e-5 between two quadrature nodes: the clr at every node is at least 10³ below its peak. */
    @Test
    void normalBetweenTwoNodes() {
        BayesSpace s = BayesSpace.splines(0, 1, 4, 3);
        double[] nodes = s.nodesInternal();
        int i = nodes.length / 3;
        double mu = 0.5 * (nodes[i] + nodes[i + 1]);
        double sd = 1e-5;
        assertTrue((nodes[i + 1] - nodes[i]) / 2 > 40 * sd, "peak must lie far from the nodes");
        Density f = s.projectLogPdf(x -> -(x - mu) * (x - mu) / (2 * sd * sd)).density();
        NormalDistribution n = new NormalDistribution(mu, sd); // truncation to [0, 1] is below e^-1000
        double rel = 1e-6; // clr terms up to 1/(2σ²) = 5e9
        for (double z : new double[] {-6, -2, -0.3, 0, 1, 3}) {
            double x = mu + z * sd;
            double lower = n.cumulativeProbability(x), upper = n.cumulativeProbability(2 * mu - x);
            assertEquals(lower, f.cdf(x), rel * lower, "cdf at z = " + z);
            assertEquals(upper, f.tailProbability(x), rel * upper, "tail at z = " + z);
            assertEquals(n.density(x), f.pdf(x), rel * n.density(x), "pdf at z = " + z);
        }
        for (double p : new double[] {1e-6, 0.25, 0.5, 0.75, 1 - 1e-6}) {
            assertEquals(n.inverseCumulativeProbability(p), f.quantile(p), rel * sd, "quantile(" + p + ")");
        }
        assertEquals(mu, f.mean(), rel * sd);
        assertEquals(sd * sd, f.variance(), rel * sd * sd);
    }

    /**
     * Exponential with rate 10⁷ piled up against the upper end b: f(x) = λ e^{−λ(b−x)} / (1 − e^{−λη}),
     * P(X &gt; x) = (1 − e^{−λ(b−x)}) / (1 − e^{−λη}), mean b − 1/λ (to e^{−λη}), variance 1/λ² (common practice).
     */
    @Test
    void exponentialPiledAgainstTheUpperEnd() {
        double a = -2, b = 1, lambda = 1e7;
        BayesSpace s = BayesSpace.polynomials(a, b, 1);
        Density f = s.projectLogPdf(x -> lambda * x).density();
        double rel = 1e-7; // clr terms up to λ η = 3e7
        for (double d : new double[] {1e-10, 1e-8, 1e-7, 5e-7, 2e-6}) {
            double x = b - d;
            double tail = -Math.expm1(-lambda * d);
            assertEquals(tail, f.tailProbability(x), rel * tail, "tail at b − " + d);
            assertEquals(1 - tail, f.cdf(x), rel * (1 - tail) + 1e-16, "cdf at b − " + d);
            assertEquals(Math.log(lambda) - lambda * d, f.logPdf(x), rel * 20, "logPdf at b − " + d);
        }
        for (double p : new double[] {1e-6, 0.5, 1 - 1e-6}) {
            double expected = b + Math.log1p(-(1 - p)) / lambda; // P(X > q) = 1 − p
            assertEquals(expected, f.quantile(p), 1e-6 / lambda, "quantile(" + p + ")");
        }
        assertEquals(b - 1 / lambda, f.mean(), 1e-6 / lambda);
        assertEquals(1 / (lambda * lambda), f.variance(), rel * 10 / (lambda * lambda));
    }

    /**
     * The case that gave cdf NaN, logPdf −∞ and quantile/mean at the wrong place: cubic splines
     * with 5 interior knots on [0, 1] and coordinates alternating +1e4, −1e4. Its clr peaks at
     * x = 0 (about 1.5e5, some 1,700 above its largest node value), so the density is piled up
     * against 0 within about 1e-7. Reference: the clr from the orthonormal basis values, integrated
     * by Commons Math on pieces [0, 1e-12], [1e-12, 1e-11], …, [0.1, 1] (relative accuracy 1e-13,
     * absolute 1e-24 against a normaliser of about 1e-7).
     */
    @Test
    void splineWithCoordinatesOfTenThousand() {
        BayesSpace s = BayesSpace.splines(0, 1, 4, 5);
        double[] c = new double[s.dimension()];
        for (int i = 0; i < c.length; i++) {
            c[i] = i % 2 == 0 ? 1e4 : -1e4;
        }
        Density f = s.density(c);
        DoubleUnaryOperator clr = x -> {
            double[] e = s.basisAt(x);
            double v = 0;
            for (int k = 0; k < c.length; k++) {
                v += e[k] * c[k];
            }
            return v;
        };
        double top = clr.applyAsDouble(0);
        assertTrue(top > 1.4e5, "the clr peaks at 0: " + top);
        DoubleUnaryOperator g = x -> Math.exp(clr.applyAsDouble(x) - top);
        double z = piecewise(g, 0, 1);
        double rel = 1e-9; // clr terms up to 2e5: rounding about 1e-10
        // log pdf errors are absolute: about ε · 2e5 = 4e-11
        assertEquals(-Math.log(z), f.logPdf(0), 1e-8, "log pdf at the peak (minus the log normaliser)");
        for (double x : new double[] {1e-9, 1e-8, 1e-7, 3e-7, 1e-6}) {
            double cdf = piecewise(g, 0, x) / z;
            double tail = piecewise(g, x, 1) / z;
            assertEquals(cdf, f.cdf(x), rel * cdf, "cdf at " + x);
            assertEquals(tail, f.tailProbability(x), rel * tail, "tail at " + x);
            assertEquals(clr.applyAsDouble(x) - top - Math.log(z), f.logPdf(x), 1e-8, "logPdf at " + x);
        }
        for (double p : new double[] {0.01, 0.5, 0.99}) {
            double q = f.quantile(p);
            assertEquals(p, piecewise(g, 0, q) / z, 1e-8, "cdf at quantile(" + p + ")");
        }
        double mean = piecewise(x -> x * g.applyAsDouble(x), 0, 1) / z;
        double second = piecewise(x -> (x - mean) * (x - mean) * g.applyAsDouble(x), 0, 1) / z;
        assertEquals(mean, f.mean(), rel * mean);
        assertEquals(second, f.variance(), 1e-7 * second);
        // the batch path agrees with the single-density path
        DensitySet set = DensitySet.of(java.util.List.of(f, f.power(0.5)));
        assertEquals(f.cdf(1e-7), set.cdf(1e-7)[0]);
        assertEquals(f.quantile(0.5), set.quantiles(0.5)[0]);
        assertEquals(f.mean(), set.means()[0]);
        assertEquals(f.pdf(2e-7), set.pdf(2e-7).get(0, 0), 1e-9 * f.pdf(2e-7));
    }

    /**
     * Coordinates whose clr cannot be evaluated to 0.01 in double precision (about 1e13 here) are
     * rejected by every evaluation with a message saying how much smaller they must be, never
     * answered with NaN or a value at the wrong place; norms and distances still work.
     */
    @Test
    void coordinatesBeyondWhatDoublePrecisionResolves() {
        BayesSpace s = BayesSpace.splines(0, 1, 4, 5);
        double[] c = new double[s.dimension()];
        for (int i = 0; i < c.length; i++) {
            c[i] = i % 2 == 0 ? 1e300 : -1e300;
        }
        Density f = s.density(c);
        for (Runnable r : new Runnable[] {() -> f.cdf(0.5), () -> f.pdf(0.5), () -> f.logPdf(0.5),
                () -> f.quantile(0.5), () -> f.mean(), () -> f.variance(), () -> f.tailProbability(0.5)}) {
            DensaException e = assertThrows(DensaException.class, r::run);
            assertTrue(e.getMessage().matches(".*rounding error in double precision is about .*, above the 0.01 that"
                    + " pdf, cdf, quantile and moment evaluation accept: coordinates about .* times smaller would be"
                    + " evaluated.*"), e.getMessage());
        }
        DensitySet set = DensitySet.of(java.util.List.of(s.neutral(), f));
        DensaException e = assertThrows(DensaException.class, () -> set.cdf(0.5));
        assertTrue(e.getMessage().startsWith("row 1 (#1): "), e.getMessage());
        // typed diagnostics: the clr magnitude that could not be evaluated
        EvaluationDiagnostics d = e.diagnostics(EvaluationDiagnostics.class).orElseThrow();
        assertEquals("clr magnitude", d.quantity());
        assertTrue(d.size() > 1e299, d.toString());
        assertTrue(e.diagnostics(SolveDiagnostics.class).isEmpty());
        assertEquals(1e300 * Math.sqrt(c.length), f.norm(), 1e-15 * 1e300 * Math.sqrt(c.length));
    }

    /** ∫_u^v g by Commons Math on log-spaced pieces (the integrand is sharp near 0). */
    private static double piecewise(DoubleUnaryOperator g, double u, double v) {
        IterativeLegendreGaussIntegrator in = new IterativeLegendreGaussIntegrator(16, 1e-13, 1e-24);
        double[] cuts = {0, 1e-12, 1e-11, 1e-10, 1e-9, 1e-8, 3e-8, 1e-7, 2e-7, 4e-7, 1e-6, 3e-6, 1e-5, 1e-4, 1e-3,
            1e-2, 0.1, 1};
        double sum = 0;
        for (int i = 0; i + 1 < cuts.length; i++) {
            double lo = Math.max(u, cuts[i]), hi = Math.min(v, cuts[i + 1]);
            if (hi > lo) {
                sum += in.integrate(1_000_000, g::applyAsDouble, lo, hi);
            }
        }
        return sum;
    }
}
