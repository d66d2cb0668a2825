package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.ejml.data.DMatrixRMaj;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Batch algebra of a {@link DensitySet}: ⊕-mean, centring and the K × K cross-product matrix of
 * n = 1,000,000 densities with K = 32 (a 256 MB coordinate matrix; effective GB/s = bytes read
 * and written / time: mean reads 8nK bytes, centring reads 16nK (mean + pass) and writes 8nK,
 * crossProducts reads 16nK), to be compared with {@link MemoryBandwidthBenchmark}. The n × n Gram
 * matrix of 10⁶ densities would need 8 TB, so {@code gram} runs at n = 5,000 (2 n² K flops).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(value = 1, jvmArgs = {"-Xmx8g"})
public class CoreBatchBenchmark {
    /** Number of densities in the large set. */
    @Param({"1000000"})
    public int n;

    /** Number of densities for the n × n Gram matrix. */
    @Param({"5000"})
    public int gramN;

    /** Interior knots of the cubic-spline space: K = knots + 3. */
    @Param({"29"})
    public int knots;

    private DensitySet set;
    private DensitySet small;

    static DensitySet randomSet(BayesSpace space, int rows, long seed) {
        Random r = new Random(seed);
        int k = space.dimension();
        double[] d = new double[rows * k];
        for (int i = 0; i < d.length; i++) {
            d[i] = r.nextGaussian();
        }
        return DensitySet.ofRowMajor(space, d, rows, null);
    }

    @Setup
    public void setup() {
        BayesSpace space = BayesSpace.cubicSplines(0, 1, knots);
        set = randomSet(space, BenchConfig.size(n, 20_000), 1);
        small = randomSet(space, BenchConfig.size(gramN, 300), 2);
    }

    /** ⊕-mean: column means of the n × K coordinate matrix. */
    @Benchmark
    public Density mean() {
        return set.mean();
    }

    /** Centring: mean, then every row minus the mean into a fresh n × K matrix. */
    @Benchmark
    public DensitySet centred() {
        return set.centred();
    }

    /** K × K cross products of the centred coordinates (the covariance numerator). */
    @Benchmark
    public DMatrixRMaj crossProducts() {
        return set.crossProducts(true);
    }

    /** n × n Gram matrix of B2 inner products at n = gramN. */
    @Benchmark
    public DMatrixRMaj gram() {
        return small.gram();
    }
}
