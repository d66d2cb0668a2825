package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.concurrent.TimeUnit;
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
 * Batch pdf of n = 100,000 densities (K = 32, cubic splines) on a 512-point grid: one n × K by
 * K × m matrix product (2 n K m flops = 3.3 GFLOP) plus one exp/normalise pass (n m exp calls).
 * GFLOP/s = 2 n K m / time. {@code pdfGrid} reuses the set's cached log normalisers (repeated
 * evaluation of one set); {@code pdfGridFresh} builds a fresh set each time, so it also pays
 * for the normalisers (one n × K by K × Q product and n Q exp calls, Q quadrature nodes) and
 * for copying the coordinates.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(value = 1, jvmArgs = {"-Xmx8g"})
public class PdfGridBenchmark {
    /** Number of densities. */
    @Param({"100000"})
    public int n;

    /** Grid points. */
    @Param({"512"})
    public int m;

    /** Interior knots of the cubic-spline space: K = knots + 3. */
    @Param({"29"})
    public int knots;

    private DensitySet set;
    private double[] coords;
    private double[] grid;
    private double[] out;
    private BayesSpace space;

    @Setup
    public void setup() {
        space = BayesSpace.splines(0, 1, 4, knots);
        int rows = BenchConfig.size(n, 2_000);
        set = CoreBatchBenchmark.randomSet(space, rows, 3);
        coords = set.coordinatesRowMajor();
        grid = new double[m];
        for (int j = 0; j < m; j++) {
            grid[j] = (j + 0.5) / m;
        }
        out = new double[rows * m];
        set.pdf(grid, out); // warm the normaliser cache
    }

    /** pdfs into a caller buffer, normalisers cached. */
    @Benchmark
    public double[] pdfGrid() {
        set.pdf(grid, out);
        return out;
    }

    /** pdfs of a fresh set (normalisers computed, coordinates copied). */
    @Benchmark
    public double[] pdfGridFresh() {
        DensitySet fresh = DensitySet.ofRowMajor(space, coords, set.size(), null);
        fresh.pdf(grid, out);
        return out;
    }
}
