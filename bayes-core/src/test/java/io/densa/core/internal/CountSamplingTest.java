package io.densa.core.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.IntToDoubleFunction;
import java.util.function.LongSupplier;
import org.apache.commons.math3.distribution.BinomialDistribution;
import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.special.Gamma;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;

/**
 * The count samplers against Commons Math 3.6.1's probability mass functions: Pearson's
 * chi-square goodness-of-fit test on 40,000 seeded draws, with cells pooled to an expected count
 * of at least 5 (common practice), must not reject at the 0.001 level.
 */
class CountSamplingTest {
    private static final int DRAWS = 40_000;

    private static void fits(LongSupplier sampler, IntToDoubleFunction pmf, int lo, int hi) {
        long[] counts = new long[hi - lo + 1];
        long outside = 0;
        for (int r = 0; r < DRAWS; r++) {
            long k = sampler.getAsLong();
            if (k < lo || k > hi) {
                outside++;
            } else {
                counts[(int) (k - lo)]++;
            }
        }
        List<double[]> cells = new ArrayList<>();
        double e = 0;
        double o = 0;
        double mass = 0;
        for (int k = lo; k <= hi; k++) {
            e += DRAWS * pmf.applyAsDouble(k);
            mass += pmf.applyAsDouble(k);
            o += counts[k - lo];
            if (e >= 5) {
                cells.add(new double[] {e, o});
                e = 0;
                o = 0;
            }
        }
        e += DRAWS * (1 - mass);
        o += outside;
        cells.get(cells.size() - 1)[0] += e;
        cells.get(cells.size() - 1)[1] += o;
        double[] expected = cells.stream().mapToDouble(c -> c[0]).toArray();
        long[] observed = cells.stream().mapToLong(c -> (long) c[1]).toArray();
        double p = new ChiSquareTest().chiSquareTest(expected, observed);
        assertTrue(p > 0.001, "chi-square p = " + p + " over " + expected.length + " cells");
    }

    @ParameterizedTest
    @CsvSource({"0.3", "3.5", "9.99", "10", "25", "400", "12345.6"})
    void poissonMatchesCommonsMath(double mean) {
        SplittableRandom rng = new SplittableRandom(11);
        PoissonDistribution d = new PoissonDistribution(mean);
        int lo = (int) Math.max(0, Math.floor(mean - 6 * Math.sqrt(mean) - 2));
        int hi = (int) Math.ceil(mean + 6 * Math.sqrt(mean) + 5);
        fits(() -> CountSampling.poisson(mean, rng), d::probability, lo, hi);
    }

    @ParameterizedTest
    @CsvSource({"3.5", "25", "12345.6"})
    void preparedPoissonGivesTheSameVariates(double mean) {
        SplittableRandom a = new SplittableRandom(21);
        SplittableRandom b = new SplittableRandom(21);
        CountSampling.Poisson p = new CountSampling.Poisson(mean);
        for (int r = 0; r < 10_000; r++) {
            assertEquals(CountSampling.poisson(mean, a), p.sample(b));
        }
    }

    @ParameterizedTest
    @CsvSource({"10, 0.3", "50, 0.9", "1000, 0.3", "1000, 0.97", "1000000, 0.01", "7, 0.5", "200000, 0.5"})
    void binomialMatchesCommonsMath(int n, double p) {
        SplittableRandom rng = new SplittableRandom(12);
        BinomialDistribution d = new BinomialDistribution(n, p);
        double sd = Math.sqrt(n * p * (1 - p));
        int lo = (int) Math.max(0, Math.floor(n * p - 6 * sd - 2));
        int hi = (int) Math.min(n, Math.ceil(n * p + 6 * sd + 2));
        fits(() -> CountSampling.binomial(n, p, rng), d::probability, lo, hi);
    }

    @Test
    void multinomialMarginalsAreBinomialAndTotalsExact() {
        SplittableRandom rng = new SplittableRandom(13);
        double[] w = {2, 0, 5, 3, 0};
        long[] out = new long[w.length];
        long[] first = new long[DRAWS];
        for (int r = 0; r < DRAWS; r++) {
            CountSampling.multinomial(500, w, rng, out);
            assertEquals(500, out[0] + out[1] + out[2] + out[3] + out[4]);
            assertEquals(0, out[1]);
            assertEquals(0, out[4]);
            first[r] = out[2];
        }
        int[] i = {0};
        BinomialDistribution d = new BinomialDistribution(500, 0.5);
        fits(() -> first[i[0]++], d::probability, 180, 320);
    }

    @Test
    void logFactorialMatchesCommonsMath() {
        for (long k : new long[] {0, 1, 10, 255, 256, 1000, 123456789L}) {
            double ref = Gamma.logGamma(k + 1.0); // Commons Math 3.6.1
            assertEquals(ref, CountSampling.logFactorial(k), 1e-13 * Math.max(1, Math.abs(ref)), "k = " + k);
        }
    }

    @Test
    void gammaMeanAndVariance() {
        // Gamma(shape, 1): mean and variance both equal the shape (closed form)
        SplittableRandom rng = new SplittableRandom(14);
        double shape = 3.7;
        double s = 0;
        double s2 = 0;
        int n = 200_000;
        for (int r = 0; r < n; r++) {
            double g = CountSampling.gamma(shape, rng);
            s += g;
            s2 += g * g;
        }
        double mean = s / n;
        double var = s2 / n - mean * mean;
        assertEquals(shape, mean, 4 * Math.sqrt(shape / n));
        assertEquals(shape, var, 0.05 * shape);
    }
}
