package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static io.densa.core.estimate.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.EstimationTestSupport.Truth;
import java.util.SplittableRandom;
import org.apache.commons.math3.random.RandomGenerator;
import org.junit.jupiter.api.Test;

/**
 * Cross-validation fold streams: one independent stream per unit. A SplittableRandom seeded with
 * seed ^ (γ·(i + 1)) for its own increment γ gives, for seed 1, unit i + 2 the stream of unit i
 * shifted by two draws (SplittableRandom adds γ to its state each draw; Steele, Lea &amp; Flood
 * (2014), Fast splittable pseudorandom number generators, OOPSLA — from memory; the JDK's
 * SplittableRandom is the independent implementation it is checked against, see also SeedsTest).
 */
class FoldStreamTest {

    private static long[] draws(SplittableRandom r, int m) {
        long[] d = new long[m];
        for (int i = 0; i < m; i++) {
            d[i] = r.nextLong();
        }
        return d;
    }

    /** Unit i + s never reproduces unit i's draws shifted by s (s = 1..4), for several seeds. */
    @Test
    void unitStreamsAreNotShiftedCopies() {
        int m = 64;
        for (long seed : new long[] {0, 1, 2, 42, -1}) {
            for (int i = 0; i < 20; i++) {
                long[] a = draws(CrossValidationFolds.foldStream(seed, i), m);
                for (int s = 1; s <= 4; s++) {
                    long[] b = draws(CrossValidationFolds.foldStream(seed, i + s), m);
                    int equal = 0;
                    for (int j = 0; j + s < m; j++) {
                        if (a[j + s] == b[j]) {
                            equal++;
                        }
                    }
                    assertEquals(0, equal, "seed " + seed + ": unit " + (i + s) + " repeats unit " + i
                            + " shifted by " + s + " draws in " + equal + " places");
                }
                long[] other = draws(CrossValidationFolds.foldStream(seed, i + 1), m);
                assertFalse(java.util.Arrays.equals(a, other), "seed " + seed + ", unit " + i);
            }
        }
    }

    /** Seeded cross-validation is reproducible and the parallel batch equals the serial one. */
    @Test
    void seededCrossValidationIsReproducibleAndParallelEqualsSerial() {
        Truth truth = EstimationTestSupport.mixture();
        RandomGenerator r = rng(11);
        int n = 40;
        int[][] counts = new int[n][];
        for (int i = 0; i < n; i++) {
            counts[i] = truth.counts(60 + r.nextInt(100), 20, r);
        }
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(0, 1, 4, 6))
                .withCrossValidation(5, 1);
        BatchEstimate par = est.withParallel(true).fitAll(edges(0, 1, 20), counts, null);
        BatchEstimate ser = est.withParallel(false).fitAll(edges(0, 1, 20), counts, null);
        BatchEstimate again = est.withParallel(true).fitAll(edges(0, 1, 20), counts, null);
        assertArrayEquals(ser.densities().coordinatesRowMajor(), par.densities().coordinatesRowMajor());
        assertEquals(ser.diagnostics(), par.diagnostics());
        assertArrayEquals(par.densities().coordinatesRowMajor(), again.densities().coordinatesRowMajor());
    }
}
