package io.densa.spatial.uncertainty;

import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.Locations;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Monte Carlo summaries against an independent reference. With the polynomial basis of degree 2
 * (K = 2) on [0, 1] every density is a normal N(μ, s²) truncated to [0, 1] (clr quadratic with a
 * negative leading coefficient), so for the coordinates c:
 * <ul>
 * <li>P(X &gt; t) = (Φ(β) − Φ(τ)) / (Φ(β) − Φ(α)) and the median μ + s Φ⁻¹((Φ(α) + Φ(β))/2), with
 *     α = −μ/s, β = (1 − μ)/s, τ = (t − μ)/s (the truncated normal; Johnson, Kotz &amp; Balakrishnan
 *     (1994), Continuous Univariate Distributions vol. 1, ch. 13 — from memory), Φ from Commons
 *     Math {@link NormalDistribution};</li>
 * <li>both increase with the coordinate c₁ of the linear basis function when c₂ is fixed (the
 *     family is an exponential family in x for fixed c₂: monotone likelihood ratio), so under the
 *     Gaussian predictive law N(m, V) of c the distribution function of such a quantity Q is the
 *     one-dimensional integral P(Q ≤ v) = ∫ φ(z) Φ((c₁*(c₂(z), v) − m₁|₂)/s₁|₂) dz over the
 *     second coordinate, with c₁* the root of Q(c₁, c₂) = v (Commons Math
 *     {@link BrentSolver}) and the integral by Commons Math
 *     {@link IterativeLegendreGaussIntegrator}; its quantiles by Brent again.</li>
 * </ul>
 * The Monte Carlo interval ends must match these quantiles within four standard errors of a
 * sample quantile, √(p(1 − p)/n) / f_Q(q_p) (f_Q by a central difference of the reference
 * distribution function), and the Monte Carlo mean the reference mean within four standard errors.
 */
class PredictiveReferenceTest {
    static final BayesSpace SPACE = BayesSpace.polynomials(0, 1, 2);
    static final NormalDistribution PHI = new NormalDistribution(null, 0, 1);
    static final double T = 0.6;

    /** μ and s of the truncated normal with coordinates c, from the clr at three points. */
    static double[] normal(double c1, double c2) {
        double[] f = new double[3];
        double[] xs = {0, 0.5, 1};
        for (int i = 0; i < 3; i++) {
            double[] e = SPACE.basisAt(xs[i]);
            f[i] = c1 * e[0] + c2 * e[1];
        }
        // clr = A x² + B x + C through the three values
        double a = 2 * (f[2] - 2 * f[1] + f[0]);
        double b = f[2] - f[0] - a;
        if (!(a < 0)) {
            throw new IllegalStateException("clr not concave: " + a);
        }
        double s2 = -1 / (2 * a);
        return new double[] {b * s2, Math.sqrt(s2)};
    }

    static double exceedance(double c1, double c2) {
        double[] ms = normal(c1, c2);
        double lo = PHI.cumulativeProbability(-ms[0] / ms[1]);
        double hi = PHI.cumulativeProbability((1 - ms[0]) / ms[1]);
        double at = PHI.cumulativeProbability((T - ms[0]) / ms[1]);
        return (hi - at) / (hi - lo);
    }

    static double median(double c1, double c2) {
        double[] ms = normal(c1, c2);
        double lo = PHI.cumulativeProbability(-ms[0] / ms[1]);
        double hi = PHI.cumulativeProbability((1 - ms[0]) / ms[1]);
        return ms[0] + ms[1] * PHI.inverseCumulativeProbability(0.5 * (lo + hi));
    }

    interface Quantity {
        double at(double c1, double c2);
    }

    /** The reference law of Q(c) for c ~ N(m, v) (2 × 2). */
    static final class Law {
        final Quantity q;
        final double m1;
        final double m2;
        final double s2;
        final double slope;
        final double s12;
        final double sign;

        Law(Quantity q, double[] m, double[][] v) {
            this.q = q;
            this.m1 = m[0];
            this.m2 = m[1];
            this.s2 = Math.sqrt(v[1][1]);
            this.slope = v[0][1] / v[1][1];
            this.s12 = Math.sqrt(v[0][0] - v[0][1] * v[0][1] / v[1][1]);
            this.sign = Math.signum(q.at(m1 + 1e-3, m2) - q.at(m1 - 1e-3, m2));
        }

        double cdf(double value) {
            UnivariateFunction inner = z -> {
                double c2 = m2 + s2 * z;
                double mc = m1 + slope * (c2 - m2);
                double lo = mc - 12 * s12, hi = mc + 12 * s12;
                double flo = sign * (q.at(lo, c2) - value), fhi = sign * (q.at(hi, c2) - value);
                double pz = Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
                if (flo >= 0) {
                    return 0;
                }
                if (fhi <= 0) {
                    return pz;
                }
                double root = new BrentSolver(1e-13).solve(200, c -> q.at(c, c2) - value, lo, hi);
                double p = PHI.cumulativeProbability((root - mc) / s12);
                return pz * (sign > 0 ? p : 1 - p);
            };
            return new IterativeLegendreGaussIntegrator(16, 1e-10, 1e-12).integrate(100_000, inner, -8, 8);
        }

        double quantile(double p, double lo, double hi) {
            return new BrentSolver(1e-12).solve(200, v -> cdf(v) - p, lo, hi);
        }

        double mean() {
            UnivariateFunction outer = z2 -> {
                double c2 = m2 + s2 * z2;
                double mc = m1 + slope * (c2 - m2);
                UnivariateFunction in = z1 -> Math.exp(-0.5 * z1 * z1) / Math.sqrt(2 * Math.PI)
                        * q.at(mc + s12 * z1, c2);
                double e = new IterativeLegendreGaussIntegrator(16, 1e-10, 1e-12).integrate(100_000, in, -8, 8);
                return Math.exp(-0.5 * z2 * z2) / Math.sqrt(2 * Math.PI) * e;
            };
            return new IterativeLegendreGaussIntegrator(16, 1e-10, 1e-12).integrate(100_000, outer, -8, 8);
        }
    }

    /** A predictive distribution on invented data simulated under the model (seeded). */
    static PredictiveDistribution fitted() {
        Locations loc = TestData.uniformSquare(30, 10, 11);
        // mean density N(0.45, 0.15²) on [0, 1]; coordinates vary mostly in location
        double[] mean = SPACE.project(x -> Math.exp(-0.5 * Math.pow((x - 0.45) / 0.15, 2))).density().coordinates();
        double[][] a = {{1.0, 0.0}, {0.25, 0.2}};
        double norm = Math.sqrt(1.0 + 0.0625 + 0.04);
        for (double[] row : a) {
            for (int j = 0; j < 2; j++) {
                row[j] /= norm;
            }
        }
        VariogramModel model = VariogramModel.exponential(1.0, 6).withNugget(0.02);
        double[][] c = ProportionalFields.sample(loc, model, mean, a, 12);
        Kriging kr = Kriging.ordinary(loc, DensitySet.of(SPACE, c), model, KrigingOptions.withDefaults());
        return PredictiveDistribution.of(kr);
    }

    static void check(String what, DerivedInterval mc, Law law, double plugIn, double lo, double hi, int n) {
        double ql = law.quantile(0.05, lo, hi);
        double qu = law.quantile(0.95, lo, hi);
        double mean = law.mean();
        double h = 1e-3 * (qu - ql);
        double fl = (law.cdf(ql + h) - law.cdf(ql - h)) / (2 * h);
        double fu = (law.cdf(qu + h) - law.cdf(qu - h)) / (2 * h);
        double se = Math.sqrt(0.05 * 0.95 / n);
        System.out.printf("%s: plug-in %.6f / %.6f; lower %.5f vs %.5f (se %.5f); upper %.5f vs %.5f (se %.5f);"
                + " mean %.5f vs %.5f (se %.5f)%n", what, mc.estimate(), plugIn, mc.lower(), ql, se / fl, mc.upper(),
                qu, se / fu, mc.mean(), mean, mc.sd() / Math.sqrt(n));
        assertEquals(plugIn, mc.estimate(), 1e-6, what + " plug-in");
        assertEquals(ql, mc.lower(), 4 * se / fl, what + " lower end");
        assertEquals(qu, mc.upper(), 4 * se / fu, what + " upper end");
        assertEquals(mean, mc.mean(), 4 * mc.sd() / Math.sqrt(n), what + " mean");
        assertTrue(mc.upper() - mc.lower() > 10 * se / Math.min(fl, fu), what + ": the interval is not degenerate");
    }

    @Test
    void monteCarloIntervalsMatchTheTwoDimensionalIntegral() {
        PredictiveDistribution pd = fitted();
        double x = 4.2, y = 6.9;
        int n = 4000;
        UncertaintyOptions o = UncertaintyOptions.withSeed(2027).withDraws(n).withQuantiles(0.5).withExceedances(T);
        LocationUncertainty u = pd.summarise(x, y, o);
        double[] m = u.law().mean();
        double[][] v = u.law().covariance();
        assertTrue(u.law().prediction().variance() > 0.05, "a location away from the data");
        Law med = new Law(PredictiveReferenceTest::median, m, v);
        Law exc = new Law(PredictiveReferenceTest::exceedance, m, v);
        check("median", u.quantiles().get(0), med, median(m[0], m[1]), 0, 1, n);
        check("P(X > 0.6)", u.exceedances().get(0), exc, exceedance(m[0], m[1]), 0, 1, n);
    }

    @Test
    void covarianceIsTheKrigingVarianceTimesTheShape() {
        PredictiveDistribution pd = fitted();
        CoordinateLaw law = pd.at(3, 3);
        double[][] s = pd.shape();
        double[][] v = law.covariance();
        double var = law.prediction().variance();
        assertEquals(1.0, s[0][0] + s[1][1], 1e-14, "the shape has unit trace");
        assertEquals(var, v[0][0] + v[1][1], 1e-12 * var, "the trace of the covariance is the kriging variance");
        for (int i = 0; i < 2; i++) {
            for (int j = 0; j < 2; j++) {
                assertEquals(var * s[i][j], v[i][j], 1e-15);
            }
        }
    }
}
