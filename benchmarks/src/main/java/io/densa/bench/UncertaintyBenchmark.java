package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import io.densa.spatial.variogram.VariogramModel;
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
 * Monte Carlo intervals on a grid (issue 15 target: 10⁶ cells, 200 draws, the median, one
 * exceedance probability and the 99th percentile per cell under 30 s on 2 cores, heap under 1 GB).
 * Invented data (seeded): {@code stations} stations in the unit square with densities of a log
 * concentration in a cubic-spline space on [0, ln 150] with 8 interior knots (K = 11, as in study
 * 2): normal shapes whose location and spread vary between stations; ordinary kriging with the
 * {@code neighbours} nearest stations, exponential model.
 * <ul>
 * <li>{@link #intervals}: {@code PredictiveDistribution.summariseGrid} of a gridSide² grid;</li>
 * <li>{@link #krigingOnly}: the same grid's kriging with variance (the baseline the intervals add to).</li>
 * </ul>
 * Sizes go through {@link BenchConfig#size} (quick mode shrinks them). Give single shots of the
 * full grid a longer JMH timeout ({@code -to 60m}): the default of 10 minutes per iteration ends a
 * run on a loaded machine (a plain 10⁶-cell run in a 1 GB heap completed with at most 252 MB in
 * use and about 40 MB live after each collection, so memory is not what stops it).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 1, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(value = 1, jvmArgsAppend = "-Xmx1g")
public class UncertaintyBenchmark {
    @Param({"1000"})
    public int gridSide;

    @Param({"1000"})
    public int stations;

    @Param({"16"})
    public int neighbours;

    @Param({"200"})
    public int draws;

    /** Tiles one after the other on the calling thread (for {@link AlternatingJars}; JMH runs them in parallel). */
    public boolean serial;

    private PredictiveDistribution pd;
    private int side;
    private UncertaintyOptions options;

    @Setup
    public void setup() {
        BayesSpace space = BayesSpace.splines(0, Math.log(150), 4, 8);
        int n = BenchConfig.size(stations, 100);
        Random r = new Random(7);
        double[] x = new double[n], y = new double[n];
        double[][] c = new double[n][];
        for (int i = 0; i < n; i++) {
            x[i] = r.nextDouble();
            y[i] = r.nextDouble();
            double mu = 2.1 + 0.4 * x[i] + 0.2 * Math.sin(6 * y[i]) + 0.05 * r.nextGaussian();
            double sd = 0.38 + 0.04 * r.nextGaussian();
            c[i] = space.project(t -> Math.exp(-0.5 * Math.pow((t - mu) / sd, 2))).density().coordinates();
        }
        Kriging kr = Kriging.ordinary(Locations.planar(x, y), DensitySet.of(space, c),
                VariogramModel.exponential(0.2, 0.4).withNugget(0.01), KrigingOptions.withDefaults()
                        .withNeighbourhood(Neighbourhood.nearest(neighbours)));
        pd = PredictiveDistribution.of(kr);
        side = BenchConfig.size(gridSide, 16);
        options = UncertaintyOptions.withSeed(11).withDraws(BenchConfig.size(draws, 20)).withQuantiles(0.5, 0.99)
                .withExceedances(Math.log(15));
    }

    /** Intervals for the median, P(X &gt; ln 15) and the 99th percentile per cell; returns a checksum. */
    @Benchmark
    public double intervals() {
        double[] sum = {0};
        pd.summariseGrid(Grid.over(0, 0, 1, 1, side, side), GridOptions.withDefaults().withParallel(!serial), options, t -> {
            for (int q = 0; q < t.size(); q++) {
                sum[0] += t.quantiles().get(0).uppers()[q] + t.exceedances().get(0).lowers()[q]
                        + t.quantiles().get(1).sds()[q];
            }
        });
        return sum[0];
    }

    /** The same grid's kriging with variance only; returns a checksum. */
    @Benchmark
    public double krigingOnly() {
        double[] sum = {0};
        pd.kriging().predictGrid(Grid.over(0, 0, 1, 1, side, side), GridOptions.withDefaults(), t -> {
            for (int q = 0; q < t.size(); q++) {
                sum[0] += t.variances()[q];
            }
        });
        return sum[0];
    }
}
