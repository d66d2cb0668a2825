package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.rookLattice;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.spatial.SpatialWeights;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The progress listener of the permutation tests: the count is non-decreasing, reaches the total,
 * and results are identical with and without a listener, serial or parallel.
 */
class AutocorrelationProgressTest {
    /** Records every call (thread-safe). */
    static final class Recorder implements ProgressListener {
        final List<long[]> calls = new ArrayList<>();
        final List<String> tasks = new ArrayList<>();

        @Override
        public synchronized void progress(String task, long done, long total) {
            tasks.add(task);
            calls.add(new long[] {done, total});
        }

        synchronized void assertCompleteMonotone(long expectedTotal) {
            assertTrue(!calls.isEmpty(), "no progress reported");
            long prev = 0;
            for (long[] c : calls) {
                assertEquals(expectedTotal, c[1]);
                assertTrue(c[0] >= prev && c[0] <= c[1], "done " + c[0] + " after " + prev);
                prev = c[0];
            }
            assertEquals(expectedTotal, prev, "done must reach total");
        }
    }

    private static double[] field(int n, long seed) {
        Random r = new Random(seed);
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = r.nextGaussian() + 0.05 * i;
        }
        return x;
    }

    @Test
    void globalStatisticsReportEveryPermutationAndKeepTheirResults() {
        // 20 x 20 rook lattice, 1,000 permutations (16 blocks): enough work for the parallel path.
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(20, 20));
        double[] x = field(400, 3);
        int perms = 1000;
        for (boolean parallel : new boolean[] {false, true}) {
            AutocorrelationOptions plain = AutocorrelationOptions.withDefaults().withPermutations(perms, 9)
                    .withParallel(parallel);
            Recorder rm = new Recorder();
            MoranI.Result m0 = MoranI.test(w, x, plain);
            MoranI.Result m1 = MoranI.test(w, x, plain.withProgressListener(rm));
            assertEquals(m0, m1);
            rm.assertCompleteMonotone(perms);
            assertEquals("Moran's I permutations", rm.tasks.get(0));

            Recorder rg = new Recorder();
            GearyC.Result g0 = GearyC.test(w, x, plain);
            GearyC.Result g1 = GearyC.test(w, x, plain.withProgressListener(rg));
            assertEquals(g0, g1);
            rg.assertCompleteMonotone(perms);
            assertEquals("Geary's c permutations", rg.tasks.get(0));
        }
    }

    @Test
    void localMoranReportsEveryUnitAndKeepsItsResults() {
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(20, 30));
        double[] x = field(600, 4);
        AutocorrelationOptions plain = AutocorrelationOptions.withDefaults().withPermutations(99, 5);
        Recorder rec = new Recorder();
        LocalMoran.Result a = LocalMoran.test(w, x, plain);
        LocalMoran.Result b = LocalMoran.test(w, x, plain.withProgressListener(rec));
        assertEquals(a, b);
        rec.assertCompleteMonotone(600); // 3 blocks of up to 256 units
        assertEquals("local Moran's I permutations", rec.tasks.get(0));
    }

    @Test
    void densityMoranReportsEveryPermutation() {
        BayesSpace space = BayesSpace.polynomials(0, 1, 3);
        int n = 100;
        double[][] c = new double[n][3];
        Random r = new Random(6);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < 3; j++) {
                c[i][j] = r.nextGaussian() + 0.01 * i;
            }
        }
        DensitySet d = DensitySet.of(space, c);
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(10, 10));
        AutocorrelationOptions plain = AutocorrelationOptions.withDefaults().withPermutations(300, 2);
        Recorder rec = new Recorder();
        assertEquals(MoranI.test(w, d, plain), MoranI.test(w, d, plain.withProgressListener(rec)));
        rec.assertCompleteMonotone(300);
    }

    @Test
    void noReportsWithoutPermutationsAndNullIsRejected() {
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        Recorder rec = new Recorder();
        MoranI.test(w, field(9, 1), AutocorrelationOptions.withDefaults().withProgressListener(rec));
        assertTrue(rec.calls.isEmpty());
        org.junit.jupiter.api.Assertions.assertThrows(NullPointerException.class,
                () -> AutocorrelationOptions.withDefaults().withProgressListener(null));
    }
}
