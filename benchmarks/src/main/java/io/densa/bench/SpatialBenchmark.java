package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.ejml.dense.row.RandomMatrices_DDRM;
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
 * Spatial kernels on invented data (seeded), K = 32 (cubic compositional splines, 29 interior
 * knots):
 * <ul>
 * <li>{@link #variogram}: empirical trace-variogram of {@code variogramLocations} locations
 *     (n(n−1)/2 pairs; 20,000 gives 2·10⁸), 15 bins; target under 5 s on 2 cores;</li>
 * <li>{@link #ordinaryGridNearest}: ordinary kriging of a gridSide × gridSide grid from
 *     {@code stations} stations with the {@code neighbours} nearest, kriging variance and one
 *     tail probability per cell; target under 10 s;</li>
 * <li>{@link #globalDualGrid}: global-neighbourhood dual form on a dualSide² grid (no variance);
 *     GFLOP/s = 2 · cells · stations · K / time for the prediction product (the covariance
 *     evaluations come on top), to be compared with {@link #dgemmReference};</li>
 * <li>{@link #dgemmReference}: EJML {@code CommonOps_DDRM.mult} of two dgemmSize² matrices;
 *     GFLOP/s = 2 n³ / time.</li>
 * </ul>
 * Sizes go through {@link BenchConfig#size} (quick mode shrinks them).
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 1, time = 1)
@Measurement(iterations = 3, time = 1)
@Fork(1)
public class SpatialBenchmark {
    @Param({"20000"})
    public int variogramLocations;

    @Param({"2000"})
    public int stations;

    @Param({"1000"})
    public int gridSide;

    @Param({"32"})
    public int neighbours;

    @Param({"300"})
    public int dualSide;

    @Param({"1000"})
    public int dgemmSize;

    private Locations vLoc;
    private DensitySet vData;
    private Kriging nearest;
    private Kriging global;
    private int side;
    private int dSide;
    private DMatrixRMaj a;
    private DMatrixRMaj b;
    private DMatrixRMaj c;

    static Locations square(int n, long seed) {
        Random r = new Random(seed);
        double[] x = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = r.nextDouble();
            y[i] = r.nextDouble();
        }
        return Locations.planar(x, y);
    }

    static DensitySet data(BayesSpace s, int n, long seed) {
        Random r = new Random(seed);
        double[][] c = new double[n][s.dimension()];
        for (double[] row : c) {
            for (int j = 0; j < row.length; j++) {
                row[j] = 0.3 * r.nextGaussian();
            }
        }
        return DensitySet.of(s, c);
    }

    @Setup
    public void setup() {
        BayesSpace space = BayesSpace.splines(0, 1, 4, 29);
        int nv = BenchConfig.size(variogramLocations, 400);
        vLoc = square(nv, 1);
        vData = data(space, nv, 2);
        int ns = BenchConfig.size(stations, 200);
        Locations sLoc = square(ns, 3);
        DensitySet sData = data(space, ns, 4);
        VariogramModel model = VariogramModel.exponential(1, 0.3).withNugget(0.05);
        nearest = Kriging.ordinary(sLoc, sData, model, KrigingOptions.withDefaults()
                .withNeighbourhood(Neighbourhood.nearest(neighbours)));
        global = Kriging.ordinary(sLoc, sData, model, KrigingOptions.withDefaults());
        global.predict(0.5, 0.5); // factorise once, outside the measurement
        side = BenchConfig.size(gridSide, 16);
        dSide = BenchConfig.size(dualSide, 8);
        int n = BenchConfig.size(dgemmSize, 40);
        a = RandomMatrices_DDRM.rectangle(n, n, new Random(5));
        b = RandomMatrices_DDRM.rectangle(n, n, new Random(6));
        c = new DMatrixRMaj(n, n);
    }

    /** Empirical trace-variogram; returns the first bin's semivariance. */
    @Benchmark
    public double variogram() {
        return EmpiricalVariogram.of(vLoc, vData, VariogramOptions.withDefaults()).semivariances()[0];
    }

    /** Nearest-neighbour ordinary kriging grid with variance and P(X &gt; 0.5); returns a checksum. */
    @Benchmark
    public double ordinaryGridNearest() {
        double[] sum = {0};
        nearest.predictGrid(Grid.over(0, 0, 1, 1, side, side), GridOptions.withDefaults().withTailProbabilities(0.5),
                t -> {
                    for (int q = 0; q < t.size(); q++) {
                        sum[0] += t.variances()[q] + t.tailProbabilities()[0][q];
                    }
                });
        return sum[0];
    }

    /** Global dual-form grid prediction without variance; returns a checksum. */
    @Benchmark
    public double globalDualGrid() {
        double[] sum = {0};
        global.predictGrid(Grid.over(0, 0, 1, 1, dSide, dSide), GridOptions.withDefaults().withVariance(false),
                t -> sum[0] += t.predictions().coordinate(0, 0));
        return sum[0];
    }

    /** The machine's EJML DGEMM rate, for the ratio. */
    @Benchmark
    public double dgemmReference() {
        CommonOps_DDRM.mult(a, b, c);
        return c.get(0, 0);
    }
}
