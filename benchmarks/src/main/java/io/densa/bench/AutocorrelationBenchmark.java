package io.densa.bench;

import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.autocorrelation.AutocorrelationOptions;
import io.densa.spatial.autocorrelation.LocalMoran;
import io.densa.spatial.autocorrelation.MoranI;
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
 * Spatial weights and autocorrelation on n random planar units (a smooth trend plus noise):
 * building k-nearest-neighbour weights (k = 8, union-symmetrised, JTS STRtree search), global
 * Moran's I with its moments and 999 permutations, and local Moran's I with 999 conditional
 * permutations per unit. The baseline is one spatial lag W z (the inner kernel of every
 * permutation). Work per permutation is O(links); LISA is O(R · links).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class AutocorrelationBenchmark {
    @Param({"10000"})
    public int units;

    @Param({"8"})
    public int neighbours;

    private Locations locations;
    private SpatialWeights weights;
    private double[] values;
    private AutocorrelationOptions options;

    @Setup
    public void setup() {
        int n = BenchConfig.size(units, 400);
        Random r = new Random(7);
        double[] x = new double[n];
        double[] y = new double[n];
        values = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = r.nextDouble() * 100;
            y[i] = r.nextDouble() * 100;
            values[i] = Math.sin(x[i] / 15) + Math.cos(y[i] / 20) + r.nextGaussian();
        }
        locations = Locations.planar(x, y);
        weights = SpatialWeights.nearestNeighbours(locations, neighbours, SpatialWeights.Symmetry.UNION)
                .rowStandardised();
        options = AutocorrelationOptions.withDefaults().withPermutations(999, 1);
    }

    /** Baseline: one spatial lag. */
    @Benchmark
    public double spatialLag() {
        return weights.spatialLag(values)[0];
    }

    /** k-nearest-neighbour weights from scratch. */
    @Benchmark
    public int nearestNeighbourWeights() {
        return SpatialWeights.nearestNeighbours(locations, neighbours, SpatialWeights.Symmetry.UNION).linkCount();
    }

    /** Global Moran's I with moments and 999 permutations. */
    @Benchmark
    public double globalMoran999() {
        return MoranI.test(weights, values, options).permutation().orElseThrow().pTwoSided();
    }

    /** Local Moran's I of every unit with 999 conditional permutations each. */
    @Benchmark
    public double localMoran999() {
        return LocalMoran.test(weights, values, options).sum();
    }
}
