package io.densa.core.estimate;

import io.densa.core.Density;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.distribution.AbstractRealDistribution;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.random.MersenneTwister;
import org.apache.commons.math3.random.RandomGenerator;

/** Known densities truncated to a domain, sampled with Commons Math distributions (fixed seeds). */
final class EstimationTestSupport {
    private EstimationTestSupport() {
    }

    /** A truth: a Commons Math distribution (or two-component mixture) truncated to [a, b]. */
    static final class Truth {
        final String name;
        final double a;
        final double b;
        final AbstractRealDistribution d1;
        final AbstractRealDistribution d2; // null unless a mixture
        final double p1;
        final double mass;

        Truth(String name, double a, double b, AbstractRealDistribution d1, AbstractRealDistribution d2, double p1) {
            this.name = name;
            this.a = a;
            this.b = b;
            this.d1 = d1;
            this.d2 = d2;
            this.p1 = p1;
            this.mass = rawCdf(b) - rawCdf(a);
        }

        private double rawCdf(double x) {
            return d2 == null ? d1.cumulativeProbability(x)
                    : p1 * d1.cumulativeProbability(x) + (1 - p1) * d2.cumulativeProbability(x);
        }

        double pdf(double x) {
            double v = d2 == null ? d1.density(x) : p1 * d1.density(x) + (1 - p1) * d2.density(x);
            return v / mass;
        }

        double cdf(double x) {
            return (rawCdf(x) - rawCdf(a)) / mass;
        }

        DoubleUnaryOperator pdfFunction() {
            return this::pdf;
        }

        /** n draws from the truncated distribution by rejection. */
        double[] sample(int n, RandomGenerator rng) {
            double[] out = new double[n];
            int i = 0;
            while (i < n) {
                double x;
                if (d2 == null || rng.nextDouble() < p1) {
                    x = d1.inverseCumulativeProbability(rng.nextDouble());
                } else {
                    x = d2.inverseCumulativeProbability(rng.nextDouble());
                }
                if (x >= a && x <= b) {
                    out[i++] = x;
                }
            }
            return out;
        }

        /** Multinomial counts of n draws over equal bins. */
        int[] counts(int n, int bins, RandomGenerator rng) {
            int[] c = new int[bins];
            for (double x : sample(n, rng)) {
                int j = (int) Math.min(bins - 1, Math.floor((x - a) / (b - a) * bins));
                c[j]++;
            }
            return c;
        }
    }

    static Truth normal() {
        return new Truth("normal", 0, 1, new NormalDistribution(null, 0.45, 0.18), null, 1);
    }

    /** Beta(2.5, 4) truncated to [0.02, 0.98], so that its log-density stays bounded on the domain. */
    static Truth beta() {
        return new Truth("beta", 0.02, 0.98, new BetaDistribution(null, 2.5, 4.0), null, 1);
    }

    /** Gamma(shape 3, scale 1.2) truncated to [0.3, 12] (log-density bounded on the domain). */
    static Truth gamma() {
        return new Truth("gamma", 0.3, 12, new GammaDistribution(null, 3.0, 1.2), null, 1);
    }

    static Truth mixture() {
        return new Truth("mixture", 0, 1, new NormalDistribution(null, 0.3, 0.08), new NormalDistribution(null, 0.7,
                0.12), 0.45);
    }

    static RandomGenerator rng(long seed) {
        return new MersenneTwister(seed);
    }

    static double[] edges(double a, double b, int bins) {
        double[] e = new double[bins + 1];
        for (int i = 0; i <= bins; i++) {
            e[i] = i == bins ? b : a + (b - a) * i / bins;
        }
        return e;
    }

    /** Kolmogorov–Smirnov distance sup |F_est − F_true| on a fine grid. */
    static double ks(Density est, Truth truth) {
        double m = 0;
        int n = 400;
        for (int i = 1; i < n; i++) {
            double x = truth.a + (truth.b - truth.a) * i / n;
            m = Math.max(m, Math.abs(est.cdf(x) - truth.cdf(x)));
        }
        return m;
    }
}
