package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static io.densa.core.estimate.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.ProgressListener;
import io.densa.core.estimate.EstimationTestSupport.Truth;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.math3.random.RandomGenerator;
import org.junit.jupiter.api.Test;

/**
 * Batch estimation reports units done through the optional listener: {@code done} non-decreasing,
 * ending at the number of units, task named; results identical with and without a listener, serial
 * and parallel.
 */
class EstimationProgressTest {

    /** Records every report; synchronized because calls may come from worker threads. */
    private static final class Recorder implements ProgressListener {
        final List<long[]> calls = new ArrayList<>();
        final List<String> tasks = new ArrayList<>();

        @Override
        public synchronized void progress(String task, long done, long total) {
            tasks.add(task);
            calls.add(new long[] {done, total});
        }

        synchronized void check(String task, long n) {
            assertTrue(!calls.isEmpty(), "no progress reported for " + task);
            long prev = 0;
            for (int i = 0; i < calls.size(); i++) {
                long[] c = calls.get(i);
                assertEquals(task, tasks.get(i));
                assertEquals(n, c[1], "total of report " + i);
                assertTrue(c[0] >= prev && c[0] <= n, "report " + i + ": done " + c[0] + " after " + prev);
                prev = c[0];
            }
            assertEquals(n, prev, "last report of " + task);
        }
    }

    private static int[][] counts(int n, long seed) {
        Truth truth = EstimationTestSupport.mixture();
        RandomGenerator r = rng(seed);
        int[][] counts = new int[n][];
        for (int i = 0; i < n; i++) {
            counts[i] = truth.counts(30 + r.nextInt(200), 25, r);
        }
        return counts;
    }

    @Test
    void penalisedLikelihoodReportsUnitsDoneAndKeepsResults() {
        int n = 150;
        int[][] counts = counts(n, 3);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(0, 1, 4, 6));
        BatchEstimate plain = est.fitAll(edges(0, 1, 25), counts, null);
        for (boolean par : new boolean[] {true, false}) {
            Recorder rec = new Recorder();
            BatchEstimate withListener = est.withParallel(par).withProgressListener(rec)
                    .fitAll(edges(0, 1, 25), counts, null);
            rec.check(PenalizedLikelihoodEstimator.PROGRESS_TASK, n);
            assertArrayEquals(plain.densities().coordinatesRowMajor(), withListener.densities().coordinatesRowMajor());
            assertEquals(plain.diagnostics(), withListener.diagnostics());
        }
        // dense units with empty ends, read as censored in batches of their own: still one task to n
        int[][] dense = new int[40][25];
        for (int i = 0; i < dense.length; i++) {
            for (int j = 3 + i % 4; j < 22; j++) {
                dense[i][j] = 20 + (i * 7 + j * 13) % 30;
            }
        }
        for (boolean par : new boolean[] {true, false}) {
            Recorder rec = new Recorder();
            BatchEstimate withListener = est.withParallel(par).withProgressListener(rec).fitAll(edges(0, 1, 25), dense, null);
            rec.check(PenalizedLikelihoodEstimator.PROGRESS_TASK, dense.length);
            assertArrayEquals(est.fitAll(edges(0, 1, 25), dense, null).densities().coordinatesRowMajor(),
                    withListener.densities().coordinatesRowMajor());
        }
        // raw samples
        Truth truth = EstimationTestSupport.normal();
        RandomGenerator r = rng(4);
        double[][] samples = new double[70][];
        for (int i = 0; i < samples.length; i++) {
            samples[i] = truth.sample(50 + r.nextInt(50), r);
        }
        PenalizedLikelihoodEstimator se = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(truth.a, truth.b, 4, 6));
        Recorder rec = new Recorder();
        BatchEstimate a = se.fitAllSamples(samples, null, null);
        BatchEstimate b = se.withProgressListener(rec).fitAllSamples(samples, null, null);
        rec.check(PenalizedLikelihoodEstimator.PROGRESS_TASK, samples.length);
        assertArrayEquals(a.densities().coordinatesRowMajor(), b.densities().coordinatesRowMajor());
        assertThrows(NullPointerException.class, () -> se.withProgressListener(null));
    }

    @Test
    void smoothingSplineReportsUnitsDoneAndKeepsResults() {
        int n = 300;
        int[][] counts = counts(n, 8);
        SmoothingSplineEstimator est = SmoothingSplineEstimator.withDefaults(BayesSpace.splines(0, 1, 4, 6));
        BatchEstimate plain = est.fitAll(edges(0, 1, 25), counts, null);
        for (boolean par : new boolean[] {true, false}) {
            Recorder rec = new Recorder();
            BatchEstimate withListener = est.withParallel(par).withProgressListener(rec)
                    .fitAll(edges(0, 1, 25), counts, null);
            rec.check(SmoothingSplineEstimator.PROGRESS_TASK, n);
            assertArrayEquals(plain.densities().coordinatesRowMajor(), withListener.densities().coordinatesRowMajor());
            assertEquals(plain.diagnostics(), withListener.diagnostics());
        }
        assertThrows(NullPointerException.class, () -> est.withProgressListener(null));
    }
}
