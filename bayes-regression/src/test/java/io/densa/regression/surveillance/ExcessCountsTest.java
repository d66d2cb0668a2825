package io.densa.regression.surveillance;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.random.Well19937c;
import org.junit.jupiter.api.Test;

/**
 * {@link ExcessCounts} against outside references: band probabilities of truncated normal
 * densities (a polynomial Bayes space of degree 2 holds them exactly) against Commons Math's normal
 * CDF; the bootstrap interval with a known baseline against the delta-method normal interval of the
 * Poisson model; and the coverage of 90 % intervals on simulated data with known truth.
 */
class ExcessCountsTest {
    private static final double A = 0;
    private static final double B = 10;
    private static final BayesSpace SPACE = BayesSpace.polynomials(A, B, 2);
    private static final double[] BIN_EDGES = new double[11];
    private static final double[] BANDS = {0, 2, 5, 10};

    static {
        for (int j = 0; j <= 10; j++) {
            BIN_EDGES[j] = j;
        }
    }

    private static double[] truncatedNormal(double mu, double sd) {
        return SPACE.projectLogPdf(x -> -(x - mu) * (x - mu) / (2 * sd * sd)).density().coordinates();
    }

    /** P(X in [lo, hi]) for a normal(mu, sd) truncated to [A, B] (Commons Math 3.6.1 normal CDF). */
    private static double truncatedNormalProbability(double mu, double sd, double lo, double hi) {
        NormalDistribution nd = new NormalDistribution(null, mu, sd);
        return (nd.cumulativeProbability(hi) - nd.cumulativeProbability(lo))
                / (nd.cumulativeProbability(B) - nd.cumulativeProbability(A));
    }

    /** P(X in band) of the three bands for a normal(mu, sd) truncated to [A, B]. */
    private static double[] bandProbabilities(double mu, double sd) {
        double[] p = new double[BANDS.length - 1];
        for (int t = 0; t < p.length; t++) {
            p[t] = truncatedNormalProbability(mu, sd, BANDS[t], BANDS[t + 1]);
        }
        return p;
    }

    private static long[] counts(double[] bandCounts) {
        // spread each band's count over its first bin (band totals are all that matter)
        long[] c = new long[10];
        c[0] = (long) bandCounts[0];
        c[2] = (long) bandCounts[1];
        c[5] = (long) bandCounts[2];
        return c;
    }

    /**
     * The coordinates' law of truncated normals N(μ, 2²) with μ ~ N(4, 0.5²): the coordinates are
     * linear in μ in the quadratic space, c(μ) = c(4) + (μ − 4) v with v = c(5) − c(4), so the law is
     * N(c(4), 0.25 v vᵀ).
     */
    private static double[][] shiftLaw() {
        double[] c4 = truncatedNormal(4, 2);
        double[] c5 = truncatedNormal(5, 2);
        double[][] sigma = new double[c4.length][c4.length];
        for (int a = 0; a < c4.length; a++) {
            for (int b = 0; b < c4.length; b++) {
                sigma[a][b] = 0.25 * (c5[a] - c4[a]) * (c5[b] - c4[b]);
            }
        }
        return sigma;
    }

    /** Units whose displaced events' p-value is at most level. */
    private static int below(ExcessCounts.Result r, double level) {
        int c = 0;
        for (ExcessCounts.UnitExcess u : r.units()) {
            c += u.displaced().pValue() <= level ? 1 : 0;
        }
        return c;
    }

    /** Counts of {@code total} events drawn one by one into the three bands with probabilities pi. */
    private static long[] multinomial(double[] pi, long total, SplittableRandom rng) {
        double[] band = new double[3];
        for (long e = 0; e < total; e++) {
            double u = rng.nextDouble();
            band[u < pi[0] ? 0 : u < pi[0] + pi[1] ? 1 : 2]++;
        }
        return counts(band);
    }

    @Test
    void bandProbabilitiesMatchTruncatedNormal() {
        double[] bands = {0, 1.5, 2, 4.25, 7, 10};
        for (double[] ms : new double[][] {{3, 1.2}, {6.5, 2.5}, {-1, 4}, {9.5, 0.8}}) {
            double[] p = BandQuadrature.bandProbabilities(SPACE, truncatedNormal(ms[0], ms[1]), bands);
            for (int t = 0; t + 1 < bands.length; t++) {
                assertEquals(truncatedNormalProbability(ms[0], ms[1], bands[t], bands[t + 1]), p[t], 1e-8,
                        "mu " + ms[0] + " sd " + ms[1] + " band " + t);
            }
        }
    }

    @Test
    void bandProbabilitiesMatchTheSpacesCdfOnASplineSpace() {
        // a bimodal age profile in a cubic-spline space: the quadrature against Density.cdf (the space's own
        // Gauss–Legendre rule per knot span, checked by its own tests), relative error below 1e-6
        BayesSpace splines = BayesSpace.splines(0, 100, 4, new double[] {2, 6, 12, 20, 30, 42, 55, 68, 80, 90});
        io.densa.core.Density f = splines.projectLogPdf(x -> Math.log(0.6 * Math.exp(-Math.pow((x - 8) / 5, 2))
                + 0.4 * Math.exp(-Math.pow((x - 70) / 12, 2)) + 1e-3)).density();
        double[] bands = {0, 15, 25, 45, 65, 100};
        double[] p = BandQuadrature.bandProbabilities(splines, f.coordinates(), bands);
        for (int t = 0; t + 1 < bands.length; t++) {
            double ref = f.cdf(bands[t + 1]) - f.cdf(bands[t]);
            assertEquals(ref, p[t], 1e-6 * ref, "band " + t);
        }
    }

    @Test
    void knownBaselineIntervalMatchesDeltaMethod() {
        // O(B) − N π(B) under independent Poisson band counts: variance O(1 − π)² + π²(N − O), the delta
        // method (common practice); with thousands of events the percentile interval must match the normal one.
        double[] c = truncatedNormal(4, 2);
        double[] pi = bandProbabilities(4, 2);
        double[] band = {3000, 9000, 8000};
        double n = band[0] + band[1] + band[2];
        DensitySet baseline = DensitySet.of(SPACE, new double[][] {c});
        ExcessCounts.Result r = ExcessCounts.withDefaults().withDraws(4000, 5).estimate(baseline,
                new long[][] {counts(band)}, BIN_EDGES, BANDS, ExcessCounts.BaselineError.none());
        double z = new NormalDistribution().inverseCumulativeProbability(0.95);
        for (int t = 0; t < 3; t++) {
            ExcessCounts.BandExcess e = r.units().get(0).bands().get(t);
            double sd = Math.sqrt(band[t] * (1 - pi[t]) * (1 - pi[t]) + pi[t] * pi[t] * (n - band[t]));
            assertEquals(band[t] - n * pi[t], e.excess(), 1e-6 * n, "point estimate, band " + t);
            // Monte Carlo error of a 5 % quantile from 4000 draws ≈ 0.033 sd; allow 0.12 sd
            assertEquals(e.excess() - z * sd, e.lower(), 0.12 * sd, "lower end, band " + t);
            assertEquals(e.excess() + z * sd, e.upper(), 0.12 * sd, "upper end, band " + t);
        }
        assertEquals(0, r.units().get(0).overall().excess(), 0);
    }

    @Test
    void expectedTotalsGiveOverallPoissonInterval() {
        // overall excess N − T with T known: N* ~ Poisson(N), interval N − T ± 1.645 √N (normal approximation)
        double[] c = truncatedNormal(4, 2);
        double[] band = {300, 900, 800};
        ExcessCounts.Result r = ExcessCounts.withDefaults().withDraws(4000, 6).estimate(
                DensitySet.of(SPACE, new double[][] {c}), new long[][] {counts(band)}, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.none(), new double[] {1800});
        ExcessCounts.BandExcess o = r.units().get(0).overall();
        assertEquals(200, o.excess(), 1e-9);
        double sd = Math.sqrt(2000);
        assertEquals(200 - 1.645 * sd, o.lower(), 0.15 * sd);
        assertEquals(200 + 1.645 * sd, o.upper(), 0.15 * sd);
        assertEquals(1800 * truncatedNormalProbability(4, 2, 0, 2), r.units().get(0).bands().get(0).expected(), 1e-5);
    }

    @Test
    void ninetyPercentIntervalsCoverWithBaselineError() {
        // Simulation with known truth: true baseline c0 (normal 4, 2), the unit's true profile mixes in a
        // young component (normal 1.5, 0.8) with share 0.25; λ = 400 expected events, counts Poisson per
        // band; the baseline given to the method is c0 + F z with Σ = diag(0.2, 0.1). Target quantity:
        // λ(p(B) − π(B)). 300 units = 300 replicates, 299 draws each.
        double[] c0 = truncatedNormal(4, 2);
        double[] pi = bandProbabilities(4, 2);
        double share = 0.25;
        double[] p = new double[3];
        double[][] young = {{0, 2}, {2, 5}, {5, 10}};
        for (int t = 0; t < 3; t++) {
            p[t] = (1 - share) * pi[t] + share * truncatedNormalProbability(1.5, 0.8, young[t][0], young[t][1]);
        }
        double lambda = 400;
        int n = 300;
        double[][] cov = {{0.2, 0}, {0, 0.1}};
        SplittableRandom rng = new SplittableRandom(77);
        double[][] cHat = new double[n][];
        long[][] cnt = new long[n][];
        for (int i = 0; i < n; i++) {
            cHat[i] = new double[] {c0[0] + Math.sqrt(0.2) * rng.nextGaussian(), c0[1] + Math.sqrt(0.1) * rng.nextGaussian()};
            double[] band = new double[3];
            for (int t = 0; t < 3; t++) {
                PoissonDistribution pd = new PoissonDistribution(new Well19937c(rng.nextLong()), lambda * p[t],
                        PoissonDistribution.DEFAULT_EPSILON, PoissonDistribution.DEFAULT_MAX_ITERATIONS);
                band[t] = pd.sample();
            }
            cnt[i] = counts(band);
        }
        ExcessCounts.Result r = ExcessCounts.withDefaults().withDraws(299, 8).estimate(DensitySet.of(SPACE, cHat),
                cnt, BIN_EDGES, BANDS, ExcessCounts.BaselineError.common(cov));
        for (int t = 0; t < 3; t++) {
            double truth = lambda * (p[t] - pi[t]);
            int covered = 0;
            for (ExcessCounts.UnitExcess u : r.units()) {
                ExcessCounts.BandExcess e = u.bands().get(t);
                if (e.lower() <= truth && truth <= e.upper()) {
                    covered++;
                }
            }
            double coverage = covered / (double) n;
            assertTrue(coverage >= 0.85 && coverage <= 0.95, "band " + t + ": coverage " + coverage
                    + " (truth " + truth + ")");
        }
    }

    /**
     * The closed forms of E max(0, X − mean) (de Moivre's mean absolute deviation, halved) against
     * direct sums over Commons Math's binomial and Poisson probability mass functions.
     */
    @Test
    void noiseMeanClosedFormsMatchSumsOverTheMassFunctions() {
        for (long n : new long[] {1, 7, 40, 333, 5000}) {
            for (double p : new double[] {0.001, 0.05, 0.3, 0.5, 0.77, 0.999}) {
                org.apache.commons.math3.distribution.BinomialDistribution bd =
                        new org.apache.commons.math3.distribution.BinomialDistribution(null, (int) n, p);
                double sum = 0;
                for (int x = 0; x <= n; x++) {
                    sum += Math.max(0, x - n * p) * bd.probability(x);
                }
                assertEquals(sum, BootstrapPlan.binomialPositivePart(n, p), 1e-10 * (1 + sum), "n " + n + ", p " + p);
            }
        }
        for (double lambda : new double[] {0.01, 0.7, 1, 3.5, 42, 900.25}) {
            PoissonDistribution pd = new PoissonDistribution(lambda);
            double sum = 0;
            for (int x = 0; x <= lambda + 40 * Math.sqrt(lambda) + 40; x++) {
                sum += Math.max(0, x - lambda) * pd.probability(x);
            }
            assertEquals(sum, BootstrapPlan.poissonPositivePart(lambda), 1e-10 * (1 + sum), "lambda " + lambda);
        }
    }

    /**
     * Units whose counts follow the baseline exactly (multinomial with their own totals): the mean of
     * their displaced events matches the noise mean, and the p-values are uniform (P(p ≤ 0.1) ≈ 0.1);
     * a unit with a real shift has a small p-value.
     */
    @Test
    void displacedEventsAgainstCountingNoiseAlone() {
        double[] c0 = truncatedNormal(4, 2);
        double[] pi = bandProbabilities(4, 2);
        int n = 400;
        long total = 300;
        SplittableRandom rng = new SplittableRandom(91);
        double[][] c = new double[n][];
        long[][] cnt = new long[n][];
        for (int i = 0; i < n; i++) {
            c[i] = c0;
            cnt[i] = multinomial(pi, total, rng);
        }
        ExcessCounts.Result r = ExcessCounts.withDefaults().withDraws(199, 5).estimate(DensitySet.of(SPACE, c), cnt,
                BIN_EDGES, BANDS, ExcessCounts.BaselineError.none());
        double mean = 0;
        int small = 0;
        for (ExcessCounts.UnitExcess u : r.units()) {
            mean += u.displaced().value() / n;
            small += u.displaced().pValue() <= 0.1 ? 1 : 0;
        }
        double noise = r.units().get(0).displaced().noiseMean();
        double expected = 0;
        for (double q : pi) {
            expected += BootstrapPlan.binomialPositivePart(total, q);
        }
        assertEquals(expected, noise, 1e-9 * expected); // band probabilities by quadrature, to about 1e-12
        // the displaced events' SD is about 0.6 of their mean here: standard error of the mean ≈ 0.03 of it
        assertEquals(noise, mean, 0.1 * noise, "mean displaced " + mean + " against the noise mean " + noise);
        // 400 p-values: binomial SD of the share at 0.1 is 0.015
        assertEquals(0.1, small / (double) n, 0.05, "share of p <= 0.1");
        double[] shifted = {0.5 * total, 0.3 * total, 0.2 * total};
        ExcessCounts.Displaced d = ExcessCounts.withDefaults().withDraws(199, 5).estimate(
                DensitySet.of(SPACE, new double[][] {c0}), new long[][] {counts(shifted)}, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.none()).units().get(0).displaced();
        assertTrue(d.pValue() <= 0.01 && d.value() > 3 * d.noiseMean(), d.toString());
    }

    /**
     * Units without change whose true density differs from the baseline by the baseline's error:
     * truncated normals N(μ_i, 2²) on [0, 10] with μ_i ~ N(4, 0.5²), counted multinomially (300
     * events, band probabilities from Commons Math's normal CDF), against the baseline μ = 4. In the
     * polynomial space of degree 2 the coordinates are linear in μ (clr = xμ/σ² + terms without μ),
     * so the error law is exactly Gaussian: c_i = ĉ + (μ_i − 4) v with v = c(5) − c(4), Σ = 0.25 v vᵀ.
     * With that law given, the displaced events' p-values are uniform (P(p ≤ 0.1) ≈ 0.1, the
     * definition of a p-value); against counting noise alone they are too small.
     */
    @Test
    void displacedEventsAgainstTheBaselinesErrorToo() {
        double[] c4 = truncatedNormal(4, 2);
        double[][] sigma = shiftLaw();
        int n = 400;
        long total = 300;
        SplittableRandom rng = new SplittableRandom(17);
        double[][] c = new double[n][];
        long[][] cnt = new long[n][];
        for (int i = 0; i < n; i++) {
            c[i] = c4;
            cnt[i] = multinomial(bandProbabilities(4 + 0.5 * rng.nextGaussian(), 2), total, rng);
        }
        ExcessCounts ex = ExcessCounts.withDefaults().withDraws(199, 5);
        ExcessCounts.Result withError = ex.estimate(DensitySet.of(SPACE, c), cnt, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.common(sigma));
        ExcessCounts.Result noiseOnly = ex.estimate(DensitySet.of(SPACE, c), cnt, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.none());
        int small = below(withError, 0.1);
        int smallNoiseOnly = below(noiseOnly, 0.1);
        double mean = 0;
        for (int i = 0; i < n; i++) {
            mean += withError.units().get(i).displaced().value() / n;
        }
        double noise = withError.units().get(0).displaced().noiseMean();
        System.out.printf(java.util.Locale.ROOT, "displaced events under the baseline's error: P(p <= 0.1) %.3f (noise"
                + " alone %.3f), null mean %.2f (noise alone %.2f), mean displaced %.2f%n", small / (double) n,
                smallNoiseOnly / (double) n, noise, noiseOnly.units().get(0).displaced().noiseMean(), mean);
        // 400 p-values: binomial SD of the share at 0.1 is 0.015
        assertEquals(0.1, small / (double) n, 0.05, "share of p <= 0.1 against noise and baseline error");
        assertTrue(smallNoiseOnly / (double) n >= 0.2, "share of p <= 0.1 against counting noise alone: "
                + smallNoiseOnly / (double) n);
        // the null's mean (Monte Carlo, 199 draws per unit) matches the displaced events' mean over the units
        assertEquals(mean, noise, 0.1 * mean, "null mean " + noise + " against the mean displaced " + mean);
        assertTrue(noise > 1.3 * noiseOnly.units().get(0).displaced().noiseMean(), "null mean with the error " + noise);
    }

    /**
     * The same with known expected totals T (Poisson band counts of mean T π(B), Commons Math's
     * Poisson sampler): against the baseline's error law the p-values are uniform, against counting
     * noise alone too small.
     */
    @Test
    void displacedEventsWithGivenTotalsAgainstTheBaselinesError() {
        double[] c4 = truncatedNormal(4, 2);
        double[][] sigma = shiftLaw();
        int n = 400;
        double total = 300;
        SplittableRandom rng = new SplittableRandom(23);
        double[][] c = new double[n][];
        long[][] cnt = new long[n][];
        double[] totals = new double[n];
        for (int i = 0; i < n; i++) {
            c[i] = c4;
            totals[i] = total;
            double[] pi = bandProbabilities(4 + 0.5 * rng.nextGaussian(), 2);
            double[] band = new double[3];
            for (int t = 0; t < 3; t++) {
                band[t] = new PoissonDistribution(new Well19937c(rng.nextLong()), total * pi[t],
                        PoissonDistribution.DEFAULT_EPSILON, PoissonDistribution.DEFAULT_MAX_ITERATIONS).sample();
            }
            cnt[i] = counts(band);
        }
        ExcessCounts ex = ExcessCounts.withDefaults().withDraws(199, 6);
        ExcessCounts.Result withError = ex.estimate(DensitySet.of(SPACE, c), cnt, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.common(sigma), totals);
        ExcessCounts.Result noiseOnly = ex.estimate(DensitySet.of(SPACE, c), cnt, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.none(), totals);
        int small = below(withError, 0.1);
        int smallNoiseOnly = below(noiseOnly, 0.1);
        System.out.printf(java.util.Locale.ROOT, "displaced events, given totals, under the baseline's error: P(p <= 0.1)"
                + " %.3f (noise alone %.3f)%n", small / (double) n, smallNoiseOnly / (double) n);
        assertEquals(0.1, small / (double) n, 0.05, "share of p <= 0.1 against noise and baseline error");
        assertTrue(smallNoiseOnly / (double) n >= 0.2, "counting noise alone: " + smallNoiseOnly / (double) n);
        // adjusted for testing 400 units without change: hardly any discovery at FDR 0.1 with the error law
        // (Benjamini & Hochberg 1995: the expected share of false discoveries is at most q), many without it
        double[] q = withError.displacedAdjustedPValues();
        double[] p = new double[n];
        for (int i = 0; i < n; i++) {
            p[i] = withError.units().get(i).displaced().pValue();
        }
        org.junit.jupiter.api.Assertions.assertArrayEquals(io.densa.core.BenjaminiHochberg.adjust(p), q, 0.0);
        long found = java.util.Arrays.stream(q).filter(v -> v <= 0.1).count();
        long foundNoiseOnly = java.util.Arrays.stream(noiseOnly.displacedAdjustedPValues()).filter(v -> v <= 0.1).count();
        System.out.println("displaced events, FDR 0.1 discoveries among 400 units without change: " + found
                + " (against counting noise alone " + foundNoiseOnly + ")");
        assertTrue(found <= 4, found + " discoveries with the law");
        assertTrue(foundNoiseOnly >= 20, foundNoiseOnly + " discoveries against counting noise alone");
    }

    @Test
    void baselineErrorWidensTheInterval() {
        double[] c = truncatedNormal(4, 2);
        DensitySet b = DensitySet.of(SPACE, new double[][] {c});
        long[][] cnt = {counts(new double[] {300, 900, 800})};
        ExcessCounts ex = ExcessCounts.withDefaults().withDraws(999, 3);
        ExcessCounts.BandExcess none = ex.estimate(b, cnt, BIN_EDGES, BANDS, ExcessCounts.BaselineError.none())
                .units().get(0).bands().get(0);
        ExcessCounts.BandExcess some = ex.estimate(b, cnt, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.common(new double[][] {{0.05, 0}, {0, 0.05}})).units().get(0).bands().get(0);
        assertTrue(some.upper() - some.lower() > 1.2 * (none.upper() - none.lower()),
                none + " vs " + some);
        assertEquals(none.excess(), some.excess(), 0);
    }

    @Test
    void selectedQuantilesEqualSortedOnes() {
        // selection against core's sorted-array quantile (both definition 7 of Hyndman & Fan 1996), with ties
        SplittableRandom rng = new SplittableRandom(4);
        for (int len : new int[] {9, 10, 999, 1000}) {
            for (int rep = 0; rep < 20; rep++) {
                double[] x = new double[len];
                for (int i = 0; i < len; i++) {
                    x[i] = rep % 2 == 0 ? rng.nextGaussian() : rng.nextInt(7);
                }
                double[] sorted = x.clone();
                java.util.Arrays.sort(sorted);
                for (double p : new double[] {0, 0.05, 0.5, 0.95, 1}) {
                    assertEquals(io.densa.core.internal.Sorted.quantile(sorted, p),
                            BootstrapPlan.quantile(x.clone(), p), 0.0, "len " + len + " p " + p);
                }
            }
        }
    }

    @Test
    void fastExponentialAgreesWithMathExp() {
        // against java.lang.Math.exp (within 1 ulp of the exact value by its specification), relative 1e-14
        SplittableRandom rng = new SplittableRandom(5);
        for (int i = 0; i < 200_000; i++) {
            double y = i < 100 ? -i * 0.5 : -rng.nextDouble() * (i % 2 == 0 ? 50 : 700);
            double ref = Math.exp(y);
            assertEquals(ref, BandQuadrature.expNonPositive(y), 1e-14 * ref, "y = " + y);
        }
        assertEquals(1.0, BandQuadrature.expNonPositive(0), 1e-16);
        assertTrue(BandQuadrature.expNonPositive(-1e6) < 1e-300);
    }

    @Test
    void blockExponentialAgreesWithMathExp() {
        // against java.lang.Math.exp (within 1 ulp by its specification): relative 3e-10 on [-45, 0]
        SplittableRandom rng = new SplittableRandom(6);
        for (int i = 0; i < 200_000; i++) {
            double y = -rng.nextDouble() * 45;
            double ref = Math.exp(y);
            assertEquals(ref, io.densa.core.internal.Kernels.expFast(y), 3e-10 * ref, "y = " + y);
        }
        assertEquals(1.0, io.densa.core.internal.Kernels.expFast(0), 1e-15);
        assertEquals(Math.exp(-45), io.densa.core.internal.Kernels.expFast(-1e6), 1e-9 * Math.exp(-45));
    }

    @Test
    void blockOfDrawsMatchesOneDrawAtATime() {
        // the draws' band probabilities (vectorised over draws, fast exponential) against the
        // one-draw method with the exponential of Cody & Waite: relative 1e-9
        BayesSpace splines = BayesSpace.splines(0, 100, 4, new double[] {2, 6, 12, 20, 30, 42, 55, 68, 80, 90});
        int k = splines.dimension();
        double[] bands = {0, 15, 25, 45, 65, 100};
        BandQuadrature quad = BandQuadrature.of(splines, bands);
        int nq = quad.x.length, nb = bands.length - 1, n = 37, width = 40;
        double[] phi = splines.basisMatrix(quad.x).data;
        SplittableRandom rng = new SplittableRandom(8);
        double[] coords = new double[k];
        for (int c = 0; c < k; c++) {
            coords[c] = 1.5 * rng.nextGaussian() / (1 + c);
        }
        double[] f = new double[k * nq];
        for (int i = 0; i < f.length; i++) {
            f[i] = 0.3 * rng.nextGaussian();
        }
        double[] base = new double[nq];
        for (int q = 0; q < nq; q++) {
            for (int c = 0; c < k; c++) {
                base[q] += phi[q * k + c] * coords[c];
            }
        }
        double[][] z = new double[k][width];
        for (double[] row : z) {
            for (int d = 0; d < width; d++) {
                row[d] = rng.nextGaussian();
            }
        }
        double[][] out = new double[nb][width];
        quad.bandProbabilities(base, f, k, z, n, new double[nq][width], new double[width], new double[width], out);
        double[] v = new double[nq];
        double[] one = new double[nb];
        for (int d = 0; d < n; d++) {
            for (int q = 0; q < nq; q++) {
                v[q] = base[q];
            }
            for (int c = 0; c < k; c++) {
                for (int q = 0; q < nq; q++) {
                    v[q] += f[c * nq + q] * z[c][d];
                }
            }
            quad.bandProbabilities(v, one);
            for (int t = 0; t < nb; t++) {
                assertEquals(one[t], out[t][d], 1e-9 * one[t] + 1e-300, "draw " + d + ", band " + t);
            }
        }
    }

    @Test
    void badInputIsNamed() {
        DensitySet b = DensitySet.of(SPACE, new double[][] {truncatedNormal(4, 2)});
        ExcessCounts ex = ExcessCounts.withDefaults();
        long[][] cnt = {new long[10]};
        ExcessCounts.BaselineError none = ExcessCounts.BaselineError.none();
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ex.estimate(b, cnt, BIN_EDGES, new double[] {0, 2.5, 10}, none));
        assertTrue(e.getMessage().contains("bandEdges[1] = 2.5"), e.getMessage());
        long[][] neg = {new long[10]};
        neg[0][3] = -1;
        e = assertThrows(IllegalArgumentException.class, () -> ex.estimate(b, neg, BIN_EDGES, BANDS, none));
        assertTrue(e.getMessage().contains("bin 3"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> ExcessCounts.BaselineError.common(
                new double[][] {{1, 0}, {0, -1}}));
        assertThrows(IllegalArgumentException.class, () -> ex.withLevel(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> ex.estimate(b, cnt, BIN_EDGES, BANDS,
                ExcessCounts.BaselineError.common(new double[][] {{1}})));
    }
}
