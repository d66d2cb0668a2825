package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.Random;
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
 * for copying the coordinates. Input shapes: {@code SMOOTH} rows are smooth densities (64
 * seeded two-component normal mixtures projected onto the space, plus coordinate noise of
 * standard deviation 0.05), as estimated densities are; {@code ROUGH} rows have independent
 * N(0, 1) coordinates, whose log-densities vary so fast that many quadrature panels need
 * adaptive refinement when the normalisers are computed.
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

    /** Input shape, see the class comment. */
    @Param({"SMOOTH", "ROUGH"})
    public String input;

    private DensitySet set;
    private double[] coords;
    private double[] grid;
    private double[] out;
    private BayesSpace space;

    @Setup
    public void setup() {
        space = BayesSpace.cubicSplines(0, 1, knots);
        int rows = BenchConfig.size(n, 2_000);
        set = "SMOOTH".equals(input) ? smoothSet(space, rows, 3) : CoreBatchBenchmark.randomSet(space, rows, 3);
        coords = set.coordinatesRowMajor();
        grid = new double[m];
        for (int j = 0; j < m; j++) {
            grid[j] = (j + 0.5) / m;
        }
        out = new double[rows * m];
        set.pdf(grid, out); // warm the normaliser cache
    }

    /** Rows: one of 64 projected normal mixtures plus small coordinate noise (seeded). */
    static DensitySet smoothSet(BayesSpace space, int rows, long seed) {
        Random r = new Random(seed);
        int k = space.dimension();
        double lo = space.lower(), width = space.upper() - space.lower();
        double[][] pool = new double[64][];
        for (int p = 0; p < pool.length; p++) {
            double m1 = lo + width * (0.15 + 0.7 * r.nextDouble()), m2 = lo + width * (0.15 + 0.7 * r.nextDouble());
            double s1 = width * (0.05 + 0.15 * r.nextDouble()), s2 = width * (0.05 + 0.15 * r.nextDouble());
            double w = 0.2 + 0.6 * r.nextDouble();
            pool[p] = space.project(x -> w * Math.exp(-0.5 * sq((x - m1) / s1)) / s1
                    + (1 - w) * Math.exp(-0.5 * sq((x - m2) / s2)) / s2).density().coordinates();
        }
        double[] d = new double[rows * k];
        for (int i = 0; i < rows; i++) {
            double[] c = pool[r.nextInt(pool.length)];
            for (int j = 0; j < k; j++) {
                d[i * k + j] = c[j] + 0.05 * r.nextGaussian();
            }
        }
        return DensitySet.ofRowMajor(space, d, rows, null);
    }

    private static double sq(double v) {
        return v * v;
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
