package io.densa.core.internal;

import java.util.SplittableRandom;

/**
 * Exact samplers for counts: Poisson, binomial and multinomial variates from a caller's
 * {@link SplittableRandom}. Internal; not public API. Arguments are not checked beyond what the
 * algorithms need: callers validate.
 *
 * <ul>
 * <li>Poisson, mean &lt; 10: inversion by sequential search (Devroye (1986), Non-Uniform Random
 * Variate Generation, Springer, §X.3 — from memory); mean ≥ 10: the transformed rejection method
 * PTRS of Hörmann (1993), The transformed rejection method for generating Poisson random
 * variables, Insurance: Mathematics and Economics 12(1), 39–45 (constants from the paper, from
 * memory).</li>
 * <li>Binomial: while n·min(p, 1 − p) ≥ 30, the order-statistic split of Knuth (1998), The Art of
 * Computer Programming vol. 2, 3rd ed., §3.4.1 F (the a-th of n uniforms is Beta(a, n + 1 − a);
 * the uniforms below and above it are again uniform) with Beta variates as a ratio of gammas from
 * Marsaglia &amp; Tsang (2000), A simple method for generating gamma variables, ACM TOMS 26(3);
 * then inversion.</li>
 * <li>Multinomial: conditional binomials in order.</li>
 * </ul>
 * The tests compare each sampler's frequencies with Commons Math's probability mass functions.
 */
public final class CountSampling {
    private static final double[] LOG_FACTORIAL = new double[256];

    static {
        for (int k = 1; k < LOG_FACTORIAL.length; k++) {
            LOG_FACTORIAL[k] = LOG_FACTORIAL[k - 1] + Math.log(k);
        }
    }

    private CountSampling() {
    }

    /** log k! : a table below 256, Stirling's series with three correction terms above (error &lt; 1e-15 relative). */
    public static double logFactorial(long k) {
        if (k < LOG_FACTORIAL.length) {
            return LOG_FACTORIAL[(int) k];
        }
        double x = k + 1.0;
        double ix = 1 / x;
        double ix2 = ix * ix;
        // log Γ(x) = (x − ½) log x − x + ½ log 2π + 1/(12x) − 1/(360x³) + 1/(1260x⁵)
        return (x - 0.5) * Math.log(x) - x + 0.9189385332046728 + ix * (1.0 / 12 - ix2 * (1.0 / 360 - ix2 / 1260));
    }

    /**
     * A Poisson variate.
     *
     * @param mean finite, ≥ 0
     */
    public static long poisson(double mean, SplittableRandom rng) {
        if (mean <= 0) {
            return 0;
        }
        if (mean < 10) {
            double p = Math.exp(-mean);
            double f = p;
            double u = rng.nextDouble();
            long k = 0;
            while (u > f && p > 0) {
                k++;
                p *= mean / k;
                f += p;
            }
            return k;
        }
        return new Poisson(mean).sample(rng); // PTRS (the prepared sampler's draws)
    }

    /**
     * A Poisson sampler prepared for one mean (the same variates as {@link #poisson(double,
     * SplittableRandom)}, without recomputing the PTRS constants at every draw). Immutable.
     */
    public static final class Poisson {
        private final double mean;
        private final double a;
        private final double b;
        private final double logInvAlpha;
        private final double vr;
        private final double logMean;

        /**
         * @param mean finite, ≥ 0
         */
        public Poisson(double mean) {
            this.mean = mean;
            double smu = Math.sqrt(Math.max(mean, 0));
            this.b = 0.931 + 2.53 * smu;
            this.a = -0.059 + 0.02483 * b;
            this.logInvAlpha = Math.log(1.1239 + 1.1328 / (b - 3.4));
            this.vr = 0.9277 - 3.6224 / (b - 2);
            this.logMean = mean > 0 ? Math.log(mean) : 0;
        }

        /** One variate. */
        public long sample(SplittableRandom rng) {
            if (mean < 10) {
                return poisson(mean, rng);
            }
            while (true) {
                double u = rng.nextDouble() - 0.5;
                double v = rng.nextDouble();
                double us = 0.5 - Math.abs(u);
                long k = (long) Math.floor((2 * a / us + b) * u + mean + 0.43);
                if (us >= 0.07 && v <= vr) {
                    return k;
                }
                if (k < 0 || (us < 0.013 && v > us)) {
                    continue;
                }
                if (Math.log(v) + logInvAlpha - Math.log(a / (us * us) + b) <= -mean + k * logMean - logFactorial(k)) {
                    return k;
                }
            }
        }
    }

    /**
     * A binomial variate.
     *
     * @param n trials, ≥ 0
     * @param p success probability in [0, 1]
     */
    public static long binomial(long n, double p, SplittableRandom rng) {
        if (n <= 0 || p <= 0) {
            return 0;
        }
        if (p >= 1) {
            return n;
        }
        long k = 0;
        while (n * Math.min(p, 1 - p) >= 30) {
            long a = 1 + n / 2;
            long b = n + 1 - a;
            double g1 = gamma(a, rng);
            double g2 = gamma(b, rng);
            double x = g1 / (g1 + g2);
            if (x >= p) {
                n = a - 1;
                p = p / x;
            } else {
                k += a;
                n = b - 1;
                p = (p - x) / (1 - x);
            }
        }
        return k + binomialInversion(n, p, rng);
    }

    private static long binomialInversion(long n, double p, SplittableRandom rng) {
        if (n <= 0 || p <= 0) {
            return 0;
        }
        if (p >= 1) {
            return n;
        }
        if (p > 0.5) {
            return n - binomialInversion(n, 1 - p, rng);
        }
        double q = 1 - p;
        double s = p / q;
        double a = (n + 1) * s;
        double r = Math.pow(q, n);
        double u = rng.nextDouble();
        long x = 0;
        while (u > r && x < n) {
            u -= r;
            x++;
            r *= a / x - s;
        }
        return x;
    }

    /**
     * A gamma variate of the given shape (≥ 1) and unit scale (Marsaglia &amp; Tsang 2000).
     */
    public static double gamma(double shape, SplittableRandom rng) {
        double d = shape - 1.0 / 3;
        double c = 1 / Math.sqrt(9 * d);
        while (true) {
            double x = rng.nextGaussian();
            double v = 1 + c * x;
            if (v <= 0) {
                continue;
            }
            v = v * v * v;
            double u = rng.nextDouble();
            double x2 = x * x;
            if (u < 1 - 0.0331 * x2 * x2) {
                return d * v;
            }
            if (Math.log(u) < 0.5 * x2 + d * (1 - v + Math.log(v))) {
                return d * v;
            }
        }
    }

    /**
     * A multinomial draw of n events over the categories, by conditional binomials.
     *
     * @param n      events, ≥ 0
     * @param weight non-negative weights, not all zero (not modified; need not sum to 1)
     * @param out    receives the counts (same length as weight)
     */
    public static void multinomial(long n, double[] weight, SplittableRandom rng, long[] out) {
        double left = 0;
        int last = -1;
        for (int j = 0; j < weight.length; j++) {
            left += weight[j];
            if (weight[j] > 0) {
                last = j;
            }
        }
        long remaining = n;
        for (int j = 0; j < weight.length; j++) {
            if (remaining == 0 || j >= last) {
                out[j] = j == last ? remaining : 0;
                remaining -= out[j];
                continue;
            }
            double p = left > 0 ? Math.min(1, weight[j] / left) : 0;
            long x = binomial(remaining, p, rng);
            out[j] = x;
            remaining -= x;
            left -= weight[j];
        }
    }
}
