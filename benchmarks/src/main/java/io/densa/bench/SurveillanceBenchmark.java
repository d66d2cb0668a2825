package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.ExcessCounts;
import io.densa.spatial.Locations;
import io.densa.spatial.scan.SpatialScan;
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
 * Surveillance speed: excess counts of n units with 999 bootstrap draws each (target &lt; 10 s at
 * n = 10,000), in the age-profile setting of study 1 — a cubic-spline space on [0, 100] with 10
 * interior knots (K = 13), counts by single year of age (50 to 3,000 events per unit), 5 age bands,
 * and baseline uncertainty drawn from a K × K covariance per unit (the costly case: K normals, a
 * 13-column product at every quadrature node and one exponential per node per draw);
 * {@code excessCountsKnownBaseline} is the same without baseline uncertainty (counting noise only).
 * {@code scan} is Kulldorff's scan statistic with 999 replicates for 1,000 units (zones up to 50 %).
 * Quick mode uses small sizes.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 1, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(1)
public class SurveillanceBenchmark {
    @Param({"10000"})
    public int units;

    @Param({"1000"})
    public int scanUnits;

    private static final double[] BANDS = {0, 15, 25, 45, 65, 100};
    private DensitySet baseline;
    private long[][] counts;
    private double[] edges;
    private ExcessCounts.BaselineError error;
    private ExcessCounts config;
    private Locations sites;
    private long[] observed;
    private double[] expected;
    private SpatialScan scan;

    @Setup
    public void setup() {
        BayesSpace space = BayesSpace.splines(0, 100, 4, new double[] {2, 6, 12, 20, 30, 42, 55, 68, 80, 90});
        int k = space.dimension();
        int n = BenchConfig.size(units, 50);
        SplittableRandom r = new SplittableRandom(1);
        double[][] c = new double[n][k];
        counts = new long[n][100];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                c[i][j] = 0.5 * r.nextGaussian() / (1 + j);
            }
            int total = 50 + r.nextInt(2951);
            for (int e = 0; e < total; e++) {
                counts[i][r.nextInt(100)]++;
            }
        }
        baseline = DensitySet.of(space, c);
        edges = new double[101];
        for (int a = 0; a <= 100; a++) {
            edges[a] = a;
        }
        double[][] cov = new double[k][k];
        for (int j = 0; j < k; j++) {
            cov[j][j] = 0.02 / (1 + j);
        }
        error = ExcessCounts.BaselineError.common(cov);
        config = ExcessCounts.withDefaults().withDraws(999, 7);
        int m = BenchConfig.size(scanUnits, 100);
        double[] x = new double[m];
        double[] y = new double[m];
        observed = new long[m];
        expected = new double[m];
        for (int i = 0; i < m; i++) {
            x[i] = r.nextDouble() * 100;
            y[i] = r.nextDouble() * 100;
            expected[i] = 20 + 200 * r.nextDouble();
            observed[i] = Math.round(expected[i] + Math.sqrt(expected[i]) * r.nextGaussian());
        }
        sites = Locations.planar(x, y);
        scan = SpatialScan.withDefaults().withReplicates(999, 3);
    }

    @Benchmark
    public ExcessCounts.Result excessCounts() {
        return config.estimate(baseline, counts, edges, BANDS, error);
    }

    @Benchmark
    public ExcessCounts.Result excessCountsKnownBaseline() {
        return config.estimate(baseline, counts, edges, BANDS, ExcessCounts.BaselineError.none());
    }

    @Benchmark
    public SpatialScan.Result scan() {
        return scan.test(sites, observed, expected);
    }
}
