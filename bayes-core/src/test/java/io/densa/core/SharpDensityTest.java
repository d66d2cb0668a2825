package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Accuracy for sharply peaked densities, in the tails and at the domain ends: a normal with a
 * standard deviation of 1/1000 of the domain (narrower than the quadrature panels), and an
 * exponential piled up at the left end, against Commons Math's {@link NormalDistribution} and
 * the closed-form truncated exponential cdf F(x) = (1 − e^{−λ(x−a)}) / (1 − e^{−λη}) (common
 * practice). Relative tolerance 1e-10 on the tail of the side considered.
 */
class SharpDensityTest {
    private static final double REL = 1e-10;

    @Test
    void narrowNormalInTheMiddle() {
        BayesSpace s = BayesSpace.polynomials(0, 1, 2);
        double mu = 0.4, sd = 0.001;
        Density f = s.projectLogPdf(x -> -(x - mu) * (x - mu) / (2 * sd * sd)).density();
        NormalDistribution n = new NormalDistribution(mu, sd); // truncation to [0, 1] is below e^-80000
        for (double p : new double[] {1e-12, 1e-6, 0.01, 0.3, 0.5, 0.8, 0.99, 1 - 1e-6, 1 - 1e-10}) {
            double q = f.quantile(p);
            double lower = n.cumulativeProbability(q);
            double upper = n.cumulativeProbability(2 * mu - q); // P(X > q) by symmetry
            double res = 4 * f.pdf(q) * Math.ulp(q);
            if (p <= 0.5) {
                assertEquals(p, lower, REL * p + res, "lower tail at quantile(" + p + ")");
            } else {
                assertEquals(1 - p, upper, REL * (1 - p) + res, "upper tail at quantile(" + p + ")");
            }
        }
        for (double z : new double[] {-6, -3, -1, 0, 0.5, 2, 5}) {
            double x = mu + z * sd;
            double lower = n.cumulativeProbability(x), upper = n.cumulativeProbability(2 * mu - x);
            assertEquals(lower, f.cdf(x), REL * lower + 1e-15, "cdf at z = " + z);
            assertEquals(upper, f.tailProbability(x), REL * upper + 1e-15, "tail at z = " + z);
            assertEquals(n.density(x), f.pdf(x), REL * n.density(x), "pdf at z = " + z);
        }
        assertEquals(mu, f.mean(), REL);
        assertEquals(sd * sd, f.variance(), REL * sd * sd);
        assertEquals(1.0, f.cdf(1.0));
        assertEquals(0.0, f.cdf(0.0));
    }

    @Test
    void cdfIsMonotoneAcrossThePeak() {
        BayesSpace s = BayesSpace.splines(0, 1, 4, 8);
        Density f = s.projectLogPdf(x -> -(x - 0.61) * (x - 0.61) / (2 * 0.004 * 0.004)).density();
        double prev = 0;
        for (int i = 0; i <= 20_000; i++) {
            double x = 0.55 + 0.12 * i / 20_000.0;
            double c = f.cdf(x);
            assertTrue(c >= prev, "cdf decreases at " + x + ": " + c + " < " + prev);
            prev = c;
        }
    }

    @Test
    void exponentialPiledAtTheLeftEnd() {
        double a = 1, b = 3, lambda = 2000;
        BayesSpace s = BayesSpace.polynomials(a, b, 1);
        Density f = s.projectLogPdf(x -> -lambda * x).density();
        double norm = -Math.expm1(-lambda * (b - a));
        for (double p : new double[] {1e-14, 1e-6, 0.5, 0.9, 1 - 1e-9}) {
            double expected = a - Math.log1p(-p * norm) / lambda;
            double q = f.quantile(p);
            assertEquals(expected, q, 1e-10 * (expected - a) + 4 * Math.ulp(q), "quantile(" + p + ")");
        }
        for (double x : new double[] {a + 1e-7, a + 1e-3, a + 0.01}) {
            double cdf = -Math.expm1(-lambda * (x - a)) / norm;
            assertEquals(cdf, f.cdf(x), REL * cdf, "cdf at " + x);
            double tail = 1 - cdf;
            assertEquals(tail, f.tailProbability(x), REL * tail + 1e-16, "tail at " + x);
        }
        // at the ends: pdf(a) = λ / (1 − e^{−λη}), cdf(a) = 0, cdf(b) = 1, tails 1 and 0
        assertEquals(lambda / norm, f.pdf(a), REL * lambda);
        assertEquals(0.0, f.cdf(a));
        assertEquals(1.0, f.cdf(b));
        assertEquals(1.0, f.tailProbability(a));
        assertEquals(0.0, f.tailProbability(b));
        assertEquals(0.0, f.pdf(a - 1e-9));
        assertEquals(a + 1 / lambda, f.mean(), REL);
        assertEquals(1 / (lambda * lambda), f.variance(), REL / (lambda * lambda));
    }
}
