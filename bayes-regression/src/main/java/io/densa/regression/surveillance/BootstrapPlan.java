package io.densa.regression.surveillance;

import io.densa.core.internal.CountSampling;
import io.densa.core.internal.Seeds;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * The parametric bootstrap of {@link ExcessCounts}, one unit at a time: what every unit shares
 * (quadrature, basis values, bands, draws) and the per-unit loop. Immutable; the work arrays are
 * per thread ({@link Buffers}).
 */
final class BootstrapPlan {
    final BandQuadrature quad;
    final double[] phi;
    final double[] phiF;
    final int k;
    final int nb;
    final double[] bands;
    final int draws;
    final double lo;
    final double hi;
    final boolean own;
    final long seed;

    BootstrapPlan(BandQuadrature quad, double[] phi, double[] phiF, int k, int nb, double[] bands, int draws, double lo,
            double hi, boolean own, long seed) {
        this.quad = quad;
        this.phi = phi;
        this.phiF = phiF;
        this.k = k;
        this.nb = nb;
        this.bands = bands;
        this.draws = draws;
        this.lo = lo;
        this.hi = hi;
        this.own = own;
        this.seed = seed;
    }

    ExcessCounts.UnitExcess unit(int i, String id, double[] coords, double[] obs, double total, double denominator,
            double sd, Buffers b) {
        int nq = quad.x.length;
        matVec(phi, nq, k, coords, i * k, b.base);
        quad.bandProbabilities(b.base, b.piHat);
        double scale = own ? total : denominator;
        double[] expected = new double[nb];
        double displaced = 0;
        for (int t = 0; t < nb; t++) {
            expected[t] = scale * b.piHat[t];
            displaced += Math.max(0, obs[t] - denominator * b.piHat[t]);
        }
        SplittableRandom rng = Seeds.stream(seed, i);
        // the null of no change, on a stream of its own: band counts from the baseline (drawn from its
        // error law when one is given: the same baselines as the interval's draws), against the
        // baseline as given
        SplittableRandom nullRng = Seeds.stream(Seeds.mix(seed, NULL_STREAM), i);
        int beyond = 0;
        double nullSum = 0;
        double[][] sample = b.sample;
        CountSampling.Poisson[] poisson = new CountSampling.Poisson[nb];
        for (int t = 0; t < nb; t++) {
            poisson[t] = new CountSampling.Poisson(obs[t]);
        }
        int width = b.width;
        for (int r0 = 0; r0 < draws; r0 += width) {
            int n = Math.min(width, draws - r0);
            // the random numbers in the order of one draw after the other: K normals, then the bands' counts
            for (int rr = 0; rr < n; rr++) {
                if (sd > 0) {
                    for (int c = 0; c < k; c++) {
                        b.z[c][rr] = rng.nextGaussian() * sd;
                    }
                }
                for (int t = 0; t < nb; t++) {
                    sample[t][r0 + rr] = poisson[t].sample(rng);
                }
            }
            if (sd > 0) {
                quad.bandProbabilities(b.base, phiF, k, b.z, n, b.v, b.shift, b.total, b.pi);
            }
            for (int rr = 0; rr < n; rr++) {
                int r = r0 + rr;
                double nStar = 0;
                for (int t = 0; t < nb; t++) {
                    nStar += sample[t][r];
                }
                double tStar = own ? nStar : denominator;
                double dStar = 0;
                for (int t = 0; t < nb; t++) {
                    double e = sample[t][r] - tStar * (sd > 0 ? b.pi[t][rr] : b.piHat[t]);
                    sample[t][r] = e;
                    dStar += Math.max(0, e);
                }
                sample[nb][r] = nStar - tStar;
                sample[nb + 1][r] = dStar;
                double d0 = nullDisplaced(sd > 0 ? b.pi : null, rr, b.piHat, total, scale, expected, nullRng);
                beyond += d0 >= displaced ? 1 : 0;
                nullSum += d0;
            }
        }
        double[][] ends = new double[nb + 2][2];
        for (int t = 0; t < nb + 2; t++) {
            ends[t][1] = quantile(sample[t], hi);
            ends[t][0] = quantile(sample[t], lo);
        }
        List<ExcessCounts.BandExcess> list = new ArrayList<>(nb);
        for (int t = 0; t < nb; t++) {
            double e = denominator * b.piHat[t];
            list.add(new ExcessCounts.BandExcess(bands[t], bands[t + 1], obs[t], e, obs[t] - e, ends[t][0], ends[t][1]));
        }
        ExcessCounts.BandExcess overall = new ExcessCounts.BandExcess(bands[0], bands[nb], total, denominator, total - denominator,
                ends[nb][0], ends[nb][1]);
        double noiseMean = 0;
        if (sd > 0) {
            noiseMean = nullSum / draws;
        } else {
            for (int t = 0; t < nb; t++) {
                noiseMean += own ? binomialPositivePart((long) total, b.piHat[t]) : poissonPositivePart(expected[t]);
            }
        }
        ExcessCounts.Displaced disp = new ExcessCounts.Displaced(displaced, ends[nb + 1][0], ends[nb + 1][1], noiseMean,
                (1.0 + beyond) / (1.0 + draws));
        return new ExcessCounts.UnitExcess(i, id, overall, list, disp);
    }

    /**
     * One draw of the null's displaced events: band counts with shares pi[t][rr] (a drawn baseline)
     * or piHat (pi null), multinomial with the unit's total or Poisson with mean scale × share,
     * against the expected counts.
     */
    private double nullDisplaced(double[][] pi, int rr, double[] piHat, double total, double scale, double[] expected,
            SplittableRandom nullRng) {
        double d0 = 0;
        long left = (long) total;
        double rest = 1;
        for (int t = 0; t < nb; t++) {
            double p = pi != null ? pi[t][rr] : piHat[t];
            double o;
            if (own) {
                double share = rest > 0 ? Math.min(1, p / rest) : 0;
                long x = t == nb - 1 ? left : CountSampling.binomial(left, share, nullRng);
                left -= x;
                rest -= p;
                o = x;
            } else {
                o = CountSampling.poisson(scale * p, nullRng);
            }
            d0 += Math.max(0, o - expected[t]);
        }
        return d0;
    }

    /** Index mixed into the seed for the noise-only draws of the displaced events. */
    static final long NULL_STREAM = 0x6e6f697365L;

    /**
     * E max(0, X − np) for X ~ Binomial(n, p): ν (1 − p) P(X = ν), ν = ⌊np⌋ + 1 (see
     * {@link ExcessCounts.Displaced}).
     */
    static double binomialPositivePart(long n, double p) {
        if (!(p > 0) || !(p < 1) || n <= 0) {
            return 0;
        }
        long nu = (long) Math.floor(n * p) + 1;
        if (nu > n) {
            return 0;
        }
        double logPmf = CountSampling.logFactorial(n) - CountSampling.logFactorial(nu)
                - CountSampling.logFactorial(n - nu) + nu * Math.log(p) + (n - nu) * Math.log1p(-p);
        return nu * (1 - p) * Math.exp(logPmf);
    }

    /** E max(0, X − λ) for X ~ Poisson(λ): λ P(X = ⌊λ⌋) (see {@link ExcessCounts.Displaced}). */
    static double poissonPositivePart(double lambda) {
        if (!(lambda > 0)) {
            return 0;
        }
        long m = (long) Math.floor(lambda);
        return lambda * Math.exp(-lambda + m * Math.log(lambda) - CountSampling.logFactorial(m));
    }

    /** out = M x (M rows × k, x from offset off). */
    private static void matVec(double[] m, int rows, int k, double[] x, int off, double[] out) {
        for (int q = 0; q < rows; q++) {
            double s = 0;
            int base = q * k;
            for (int c = 0; c < k; c++) {
                s += m[base + c] * x[off + c];
            }
            out[q] = s;
        }
    }

    /**
     * The sample quantile at p of the values (reordered in place), definition 7 of Hyndman &amp;
     * Fan (1996), Sample quantiles in statistical packages, Am. Stat. 50(4) (from memory): the
     * two neighbouring order statistics by selection instead of a full sort.
     */
    static double quantile(double[] x, double p) {
        int n = x.length;
        double h = (n - 1) * p;
        int j = (int) Math.floor(h);
        double lo = select(x, j);
        if (j + 1 >= n) {
            return lo;
        }
        double next = Double.POSITIVE_INFINITY;
        for (int i = j + 1; i < n; i++) {
            next = Math.min(next, x[i]);
        }
        return lo + (h - j) * (next - lo);
    }

    /** Hoare's selection: the j-th smallest value, with x[..j] ≤ x[j] ≤ x[j+1..] afterwards. */
    private static double select(double[] x, int j) {
        int left = 0;
        int right = x.length - 1;
        while (right > left) {
            int mid = (left + right) >>> 1;
            // median of three as pivot
            double a = x[left];
            double b = x[mid];
            double c = x[right];
            double pivot = a < b ? (b < c ? b : Math.max(a, c)) : (a < c ? a : Math.max(b, c));
            int i = left;
            int k = right;
            while (i <= k) {
                while (x[i] < pivot) {
                    i++;
                }
                while (x[k] > pivot) {
                    k--;
                }
                if (i <= k) {
                    double t = x[i];
                    x[i] = x[k];
                    x[k] = t;
                    i++;
                    k--;
                }
            }
            if (j <= k) {
                right = k;
            } else if (j >= i) {
                left = i;
            } else {
                return x[j];
            }
        }
        return x[j];
    }

    /** Draws whose quadrature is evaluated together (one row of block values per node). */
    static final int BLOCK = 256;

    /** Per-thread work arrays. */
    static final class Buffers {
        final int width;
        final double[] base;
        final double[] piHat;
        final double[][] z;
        final double[][] pi;
        final double[][] v;
        final double[] shift;
        final double[] total;
        final double[][] sample;

        Buffers(int nq, int k, int nb, int draws) {
            width = Math.min(draws, BLOCK);
            base = new double[nq];
            piHat = new double[nb];
            z = new double[k][width];
            pi = new double[nb][width];
            v = new double[nq][width];
            shift = new double[width];
            total = new double[width];
            sample = new double[nb + 2][draws];
        }
    }
}
