package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.NewtonCost;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.SmoothingSplineEstimator;
import java.util.SplittableRandom;
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
 * Density estimation from daily counts: {@code units} units (100,000; 200 in quick mode) of 365-bin
 * counts (a year of days), cubic splines with K = 24 on [0, 365], penalised likelihood with a
 * fixed smoothing parameter and with λ chosen per unit by the corrected AIC, and zero replacement
 * + smoothing spline (GCV) for comparison; plus a baseline that only sums the counts.
 *
 * <p>Invented data (seeded): each unit's density is exp(α cos(2π(x − φ)/365) + β cos(4π(x − ψ)/365))
 * with random α, β, φ, ψ; its total is log-uniform in [20, 2000] events (so most bins of most units
 * are empty); counts are Poisson draws around N p_j.
 *
 * <p>Cost against the arithmetic limit: {@link #newtonCost()} gives the flop count and exp calls of
 * one Newton iteration for one unit (the fixed-λ fit takes about 5 iterations per unit from the
 * data-driven start; the diagnostics report each unit's count), so achieved GFLOP/s =
 * flops × iterations × units / time, to compare with the machine's FMA peak.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 1)
@Measurement(iterations = 3)
@Fork(value = 1, jvmArgsAppend = "-Xmx8g")
public class EstimationBenchmark {
    static final int BINS = 365;
    static final int INTERIOR_KNOTS = 21; // K = 21 + 4 − 1 = 24
    /** About the median of the per-unit AICc choices on these data (pilot of 400 units). */
    static final double FIXED_LAMBDA = 5e4;

    @Param({"100000"})
    public int units;

    private BayesSpace space;
    private double[] edges;
    private int[][] counts;
    private PenalizedLikelihoodEstimator fixed;
    private PenalizedLikelihoodEstimator chosen;
    private SmoothingSplineEstimator spline;

    /** The space of the benchmark: cubic splines on [0, 365] with K = 24. */
    public static BayesSpace benchmarkSpace() {
        return BayesSpace.splines(0, BINS, 4, INTERIOR_KNOTS);
    }

    /** Daily bin edges 0, 1, …, 365. */
    public static double[] dailyEdges() {
        double[] e = new double[BINS + 1];
        for (int i = 0; i <= BINS; i++) {
            e[i] = i;
        }
        return e;
    }

    /** Flops and exp calls of one Newton iteration for one unit of this benchmark. */
    public static NewtonCost newtonCost() {
        return PenalizedLikelihoodEstimator.withDefaults(benchmarkSpace()).newtonCost(dailyEdges());
    }

    /** Seeded invented counts (see the class comment). */
    public static int[][] simulate(int n, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        int[][] out = new int[n][BINS];
        double[] p = new double[BINS];
        for (int u = 0; u < n; u++) {
            double alpha = 2 * rnd.nextDouble(), beta = rnd.nextDouble();
            double phi = BINS * rnd.nextDouble(), psi = BINS * rnd.nextDouble();
            double total = 0;
            for (int j = 0; j < BINS; j++) {
                double x = j + 0.5;
                p[j] = Math.exp(alpha * Math.cos(2 * Math.PI * (x - phi) / BINS)
                        + beta * Math.cos(4 * Math.PI * (x - psi) / BINS));
                total += p[j];
            }
            double events = 20 * Math.pow(100, rnd.nextDouble());
            int sum = 0;
            for (int j = 0; j < BINS; j++) {
                out[u][j] = poisson(events * p[j] / total, rnd);
                sum += out[u][j];
            }
            if (sum == 0) {
                out[u][rnd.nextInt(BINS)] = 1;
            }
        }
        return out;
    }

    private static int poisson(double mean, SplittableRandom rnd) {
        double l = Math.exp(-mean);
        int k = 0;
        double prod = rnd.nextDouble();
        while (prod > l) {
            k++;
            prod *= rnd.nextDouble();
        }
        return k;
    }

    @Setup
    public void setup() {
        int n = BenchConfig.size(units, 200);
        space = benchmarkSpace();
        edges = dailyEdges();
        counts = simulate(n, 20261201L);
        fixed = PenalizedLikelihoodEstimator.withDefaults(space).withSmoothing(FIXED_LAMBDA);
        chosen = PenalizedLikelihoodEstimator.withDefaults(space);
        spline = SmoothingSplineEstimator.withDefaults(space);
    }

    /** Baseline: read every count once. */
    @Benchmark
    public long baselineSumCounts() {
        long s = 0;
        for (int[] row : counts) {
            for (int c : row) {
                s += c;
            }
        }
        return s;
    }

    /** Penalised likelihood, fixed λ (target: under 20 s for 100,000 units on 2 cores). */
    @Benchmark
    public BatchEstimate penalizedLikelihoodFixedSmoothing() {
        return fixed.fitAll(edges, counts, null);
    }

    /** Penalised likelihood, λ chosen per unit by the corrected AIC. */
    @Benchmark
    public BatchEstimate penalizedLikelihoodChosenSmoothing() {
        return chosen.fitAll(edges, counts, null);
    }

    /** Zero replacement + compositional smoothing spline, λ by GCV per unit. */
    @Benchmark
    public BatchEstimate smoothingSplineGcv() {
        return spline.fitAll(edges, counts, null);
    }
}
