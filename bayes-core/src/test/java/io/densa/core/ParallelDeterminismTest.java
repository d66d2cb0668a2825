package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import io.densa.core.internal.Kernels;
import java.util.concurrent.ForkJoinPool;
import java.util.function.Supplier;
import org.junit.jupiter.api.Test;

/**
 * Parallel batch results are bit-identical to serial ones (STYLE.md point 9): every batch result
 * of a set large enough to run on the common pool is compared exactly with the same computation
 * run inside a one-thread {@link ForkJoinPool} (where the parallel streams run serially), and the
 * kernels are compared with their serial path.
 */
class ParallelDeterminismTest {
    private static final BayesSpace S = BayesSpace.splines(0, 10, 4, 9);
    private static final DensitySet BIG = DensitySetTest.randomSet(S, 20_000, 41);
    private static final DensitySet MID = DensitySetTest.randomSet(S, 1_500, 42);

    private static <T> T serially(Supplier<T> job) {
        ForkJoinPool one = new ForkJoinPool(1);
        try {
            return one.submit(job::get).get();
        } catch (Exception e) {
            throw new AssertionError(e);
        } finally {
            one.shutdown();
        }
    }

    /** A fresh copy, so that cached normalisers are recomputed on each path. */
    private static DensitySet copy(DensitySet s) {
        return DensitySet.ofRowMajor(s.space(), s.coordinatesRowMajor(), s.size(), null);
    }

    @Test
    void meanCentringAndCrossProducts() {
        assertArrayEquals(serially(() -> BIG.mean().coordinates()), BIG.mean().coordinates());
        assertArrayEquals(serially(() -> BIG.centred().coordinatesRowMajor()), BIG.centred().coordinatesRowMajor());
        assertArrayEquals(serially(() -> BIG.crossProducts(true).data), BIG.crossProducts(true).data);
        assertArrayEquals(serially(() -> BIG.covariance().data), BIG.covariance().data);
        double[] d = BIG.coordinatesRowMajor();
        int k = S.dimension();
        assertArrayEquals(Kernels.columnSums(d, BIG.size(), k, false), Kernels.columnSums(d, BIG.size(), k, true));
        assertArrayEquals(Kernels.crossProduct(d, BIG.size(), k, null, false),
                Kernels.crossProduct(d, BIG.size(), k, null, true));
    }

    @Test
    void gramAndDistances() {
        assertArrayEquals(serially(() -> MID.gram().data), MID.gram().data);
        assertArrayEquals(serially(() -> MID.distances().data), MID.distances().data);
    }

    @Test
    void batchEvaluation() {
        double[] grid = TestSpaces.grid(S, 64);
        assertArrayEquals(serially(() -> copy(BIG).pdf(grid).data), copy(BIG).pdf(grid).data);
        assertArrayEquals(serially(() -> copy(BIG).clr(grid).data), copy(BIG).clr(grid).data);
        DensitySet part = BIG.subset(java.util.stream.IntStream.range(0, 3_000).toArray());
        assertArrayEquals(serially(() -> part.cdf(3.3)), part.cdf(3.3));
        assertArrayEquals(serially(() -> part.tailProbability(7.1)), part.tailProbability(7.1));
        assertArrayEquals(serially(() -> part.quantiles(0.9)), part.quantiles(0.9));
        assertArrayEquals(serially(() -> part.means()), part.means());
    }
}
