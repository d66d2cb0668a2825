package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.io.model.ModelFile;
import io.densa.io.model.ModelLimits;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramModel;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
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
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Loading a saved kriging model ({@link ModelFile}): {@code stations} invented stations (seeded,
 * uniform on a 1000 × 1000 square), densities of dimension K = 32 (cubic splines, 29 interior
 * knots; coordinates drawn N(0, 1)), exponential + nugget model, 32 nearest neighbours. Target:
 * 10⁴ stations loaded under 1 s. {@link #readBytes} (the file's bytes alone) is the baseline;
 * {@link #loadAndPredict} adds one prediction, so nothing left lazy by the load is hidden.
 */
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
@State(Scope.Benchmark)
public class ModelFileBenchmark {
    @Param({"10000"})
    public int stations;

    Path file;

    @Setup
    public void setUp() throws IOException {
        int n = BenchConfig.size(stations, 200);
        SplittableRandom r = new SplittableRandom(20261203L);
        double[] x = new double[n];
        double[] y = new double[n];
        BayesSpace space = BayesSpace.splines(0, 1, 4, 29);
        double[][] c = new double[n][space.dimension()];
        for (int i = 0; i < n; i++) {
            x[i] = 1000 * r.nextDouble();
            y[i] = 1000 * r.nextDouble();
            for (int k = 0; k < c[i].length; k++) {
                c[i][k] = gaussian(r);
            }
        }
        Kriging k = Kriging.ordinary(Locations.planar(x, y), DensitySet.of(space, c),
                VariogramModel.exponential(1, 200).withNugget(0.1),
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(32)));
        file = Files.createTempFile("densa-kriging-" + n, ".densa.json");
        ModelFile.save(file, k);
    }

    private static double gaussian(SplittableRandom r) {
        double u = 1 - r.nextDouble();
        return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * r.nextDouble());
    }

    @TearDown
    public void tearDown() throws IOException {
        Files.deleteIfExists(file);
    }

    /** Baseline: the file's bytes, read. */
    @Benchmark
    public byte[] readBytes() throws IOException {
        return Files.readAllBytes(file);
    }

    /** The model loaded: parse, size checks, checksum, decoding, {@code Kriging.ordinary}. */
    @Benchmark
    public Kriging load() throws IOException {
        return ModelFile.load(file, Kriging.class, ModelLimits.defaults());
    }

    /** The model loaded and one prediction made. */
    @Benchmark
    public KrigingPrediction loadAndPredict() throws IOException {
        return ModelFile.load(file, Kriging.class, ModelLimits.defaults()).predict(500, 500);
    }
}
