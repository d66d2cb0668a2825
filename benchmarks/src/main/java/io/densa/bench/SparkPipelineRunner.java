package io.densa.bench;

import static org.apache.spark.sql.functions.col;
import static org.apache.spark.sql.functions.collect_list;
import static org.apache.spark.sql.functions.floor;
import static org.apache.spark.sql.functions.greatest;
import static org.apache.spark.sql.functions.least;
import static org.apache.spark.sql.functions.lit;
import static org.apache.spark.sql.functions.pmod;
import static org.apache.spark.sql.functions.randn;
import static org.apache.spark.sql.functions.struct;
import static org.apache.spark.sql.functions.xxhash64;

import io.densa.core.estimate.BatchEstimate;
import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.Fpca;
import io.densa.spark.EstimatorSpec;
import io.densa.spark.FpcaSpec;
import io.densa.spark.SparkDensities;
import io.densa.spark.SparkFpca;
import io.densa.spark.SpaceSpec;
import java.util.List;
import java.util.Locale;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;

/**
 * Runner (a plain main, not JMH: a Spark local session needs the JVM options of the bayes-spark module
 * and a class path of some 200 jars that JMH's forked, shaded-jar runs do not carry) of the pipeline
 * events → densities → FPCA → scores in Spark local mode, and of the same work on one machine without
 * Spark from the same counts, for the per-unit overhead.
 *
 * <p>Events are invented in Spark: event i goes to unit hash(i) mod U and has value clamp(μ_u + σ_u
 * N(0, 1), 0, 10) with μ_u, σ_u from the unit number and N from Spark's seeded {@code randn} over a
 * fixed 16 partitions, so local[1] and local[2] see identical data. Space: cubic splines on [0, 10]
 * with 8 interior knots (K = 11); 20 bins; the estimator's defaults (λ per unit by the marginal
 * likelihood).
 *
 * <p>Arguments: master (local[1] or local[2]), events, units, rounds. Prints one line per stage and
 * round with wall times; run it with the bayes-spark module's JVM options (see benchmarks/RESULTS.md).
 */
public final class SparkPipelineRunner {
    private SparkPipelineRunner() {
    }

    public static void main(String[] args) {
        if (args.length > 0 && (args[0].equals("grid") || args[0].equals("intervals") || args[0].equals("variogram"))) {
            spatial(args);
            return;
        }
        String master = args.length > 0 ? args[0] : "local[2]";
        long events = args.length > 1 ? Long.parseLong(args[1]) : 10_000_000L;
        int units = args.length > 2 ? Integer.parseInt(args[2]) : 100_000;
        int rounds = args.length > 3 ? Integer.parseInt(args[3]) : 2;
        int cores = Integer.parseInt(master.replaceAll("\\D", ""));
        SparkSession spark = SparkSession.builder().master(master).appName("densa-bench")
                .config("spark.ui.enabled", "false").config("spark.sql.shuffle.partitions", String.valueOf(4 * cores))
                .config("spark.driver.host", "127.0.0.1").config("spark.driver.bindAddress", "127.0.0.1")
                .config("spark.sql.adaptive.enabled", "false").getOrCreate();
        spark.sparkContext().setLogLevel("ERROR");
        BayesSpace space = BayesSpace.splines(0, 10, 4, 8);
        double[] edges = new double[21];
        for (int j = 0; j <= 20; j++) {
            edges[j] = 0.5 * j;
        }
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(space), edges);
        System.out.printf(Locale.ROOT, "machine: %s; master %s; %d events, %d units, K = %d, %d bins%n",
                BenchConfig.machine(), master, events, units, space.dimension(), edges.length - 1);
        Dataset<Row> ev = spark.range(0, events, 1, 16)
                .withColumn("unit", pmod(xxhash64(col("id")), lit(units)))
                .withColumn("mu", lit(2.0).plus(lit(6.0).multiply(pmod(col("unit").multiply(0.6180339887), lit(1.0)))))
                .withColumn("sigma", lit(0.7).plus(lit(0.1).multiply(pmod(col("unit"), lit(13)))))
                .withColumn("value", least(lit(10.0), greatest(lit(0.0),
                        col("mu").plus(col("sigma").multiply(randn(7))))))
                .select("unit", "value");
        for (int r = 0; r < rounds; r++) {
            long c0 = cpu();
            long t0 = System.nanoTime();
            Dataset<Row> dens = SparkDensities.of(spec).fromEvents(ev);
            long t1 = System.nanoTime();
            FpcaSpec fpca = SparkFpca.fit(dens, "coordinates", spec.space());
            long t2 = System.nanoTime();
            SparkFpca.scores(dens, "coordinates", fpca, 3, "scores").write().format("noop").mode("overwrite").save();
            long t3 = System.nanoTime();
            long c3 = cpu();
            System.out.printf(Locale.ROOT, "spark round %d: densities %.2f s, fpca %.2f s, scores %.2f s, total %.2f s;"
                    + " %.1f us/unit; process CPU %.2f s (%.2f cores used)%n", r, s(t1 - t0), s(t2 - t1), s(t3 - t2),
                    s(t3 - t0), 1e-3 * (t3 - t0) / units, s(c3 - c0), (double) (c3 - c0) / (t3 - t0));
            if (r == rounds - 1) {
                single(spec, ev, dens, cores);
            }
            dens.unpersist();
        }
        spark.stop();
    }

    /**
     * The same work from the same counts on one machine, without Spark: the counts per unit are made
     * by Spark (not timed; floor(2x) is the bin of x for edges 0, 0.5, …, 10, as Bins.indexOf) and
     * collected, then fitted, analysed and scored by the library alone; the Spark coordinates of the
     * first units are checked against the single-machine ones.
     */
    private static void single(EstimatorSpec spec, Dataset<Row> events, Dataset<Row> dens, int cores) {
        long ac = cpu();
        long a0 = System.nanoTime();
        List<Row> rows = events.withColumn("bin", least(lit(19L), floor(col("value").multiply(2))))
                .groupBy("unit", "bin").count().groupBy("unit")
                .agg(collect_list(struct(col("bin"), col("count"))).as("cells")).orderBy("unit").collectAsList();
        long a1 = System.nanoTime();
        System.out.printf(Locale.ROOT, "spark events -> counts alone (generate, bin, two aggregations, collect): %.2f s;"
                + " process CPU %.2f s%n", s(a1 - a0), s(cpu() - ac));
        int n = rows.size();
        double[][] c = new double[n][20];
        String[] ids = new String[n];
        for (int i = 0; i < n; i++) {
            ids[i] = String.valueOf(rows.get(i).getLong(0));
            for (Row cell : rows.get(i).<Row>getList(1)) {
                c[i][(int) cell.getLong(0)] = cell.getLong(1);
            }
        }
        long c0 = cpu();
        long t0 = System.nanoTime();
        BatchEstimate est = spec.estimator().withParallel(cores > 1).fitAll(spec.edges(), c, ids);
        long t1 = System.nanoTime();
        DensitySet set = est.densities();
        Fpca f = Fpca.fit(set);
        long t2 = System.nanoTime();
        double z = f.scores(set, 3).get(0, 0);
        long t3 = System.nanoTime();
        long c3 = cpu();
        List<Row> first = dens.orderBy("unit").limit(3).collectAsList();
        for (Row r : first) {
            int i = java.util.Arrays.asList(ids).indexOf(r.getString(0));
            List<Double> l = r.getList(1);
            for (int j = 0; j < l.size(); j++) {
                if (l.get(j) != set.coordinate(i, j)) {
                    throw new IllegalStateException("unit " + ids[i] + ": Spark and single-machine coordinates differ");
                }
            }
        }
        System.out.printf(Locale.ROOT, "single machine (%s): densities %.2f s, fpca %.3f s, scores %.3f s, total %.2f s;"
                + " %.1f us/unit; process CPU %.2f s (%.2f cores used) (first score %.4f; Spark coordinates of 3"
                + " units checked equal)%n", cores > 1 ? "common pool" : "serial", s(t1 - t0), s(t2 - t1), s(t3 - t2),
                s(t3 - t0), 1e-3 * (t3 - t0) / n, s(c3 - c0), (double) (c3 - c0) / (t3 - t0), z);
    }

    /**
     * Per-task rates of the spatial operations: {@code grid master side stations} kriges a side × side
     * grid (ordinary, exponential model, 32 nearest, variance and P(X &gt; t) per cell, tiles of 64) from
     * invented stations into Spark's no-op sink, and the same grid with {@code Kriging.predictGrid}
     * on one machine; {@code intervals master side stations} the same grid with the median, P(X &gt; t)
     * and the mean, each with its 90 % Monte Carlo interval from 200 draws per cell
     * ({@code SparkKriging.cells} with an {@code IntervalSpec}; on one machine
     * {@code PredictiveDistribution.summariseGrid}); {@code variogram master n} the variogram of n
     * invented locations by pair blocks and on one machine. K = 11 in all.
     */
    private static void spatial(String[] args) {
        String master = args[1];
        int cores = Integer.parseInt(master.replaceAll("\\D", ""));
        SparkSession spark = SparkSession.builder().master(master).appName("densa-bench")
                .config("spark.ui.enabled", "false").config("spark.driver.host", "127.0.0.1")
                .config("spark.driver.bindAddress", "127.0.0.1").getOrCreate();
        spark.sparkContext().setLogLevel("ERROR");
        BayesSpace space = BayesSpace.splines(0, 10, 4, 8);
        boolean gridLike = args[0].equals("grid") || args[0].equals("intervals");
        int n = Integer.parseInt(args[gridLike ? 3 : 2]);
        java.util.SplittableRandom rnd = new java.util.SplittableRandom(5);
        double[] x = new double[n];
        double[] y = new double[n];
        double[][] c = new double[n][space.dimension()];
        for (int i = 0; i < n; i++) {
            x[i] = 100 * rnd.nextDouble();
            y[i] = 100 * rnd.nextDouble();
            for (int j = 0; j < c[i].length; j++) {
                c[i][j] = Math.sin(x[i] / (10 + j)) + Math.cos(y[i] / 15) + 0.3 * (rnd.nextDouble() - 0.5);
            }
        }
        io.densa.spatial.Locations loc = io.densa.spatial.Locations.planar(x, y);
        DensitySet set = DensitySet.of(space, c);
        io.densa.spark.LocationData data = io.densa.spark.LocationData.of(loc, set);
        System.out.printf(Locale.ROOT, "machine: %s; master %s; %s%n", BenchConfig.machine(), master,
                String.join(" ", args));
        if (gridLike) {
            boolean withIntervals = args[0].equals("intervals");
            int side = Integer.parseInt(args[2]);
            io.densa.spark.KrigingSpec model = io.densa.spark.KrigingSpec.ordinary(data,
                    io.densa.spatial.variogram.VariogramModel.exponential(0.5, 30).withNugget(0.02),
                    io.densa.spatial.kriging.KrigingOptions.withDefaults().withNeighbourhood(
                            io.densa.spatial.kriging.Neighbourhood.nearest(32)));
            io.densa.spark.GridSpec grid = io.densa.spark.GridSpec.over(0, 0, 100, 100, side, side)
                    .withTailProbabilities(5.0);
            if (withIntervals) {
                grid = grid.withVariance(false).withQuantiles(0.5).withMeans(true);
            }
            io.densa.spark.IntervalSpec intervals = withIntervals ? io.densa.spark.IntervalSpec.withSeed(3) : null;
            long c0 = cpu();
            long t0 = System.nanoTime();
            io.densa.spark.SparkKriging.cells(spark, model, grid, intervals, 4 * cores, false).write().format("noop")
                    .mode("overwrite").save();
            long t1 = System.nanoTime();
            long c1 = cpu();
            long[] cells = new long[1];
            io.densa.spatial.kriging.GridOptions go = grid.options().withParallel(cores > 1);
            if (withIntervals) {
                io.densa.spatial.uncertainty.PredictiveDistribution.of(model.kriging()).summariseGrid(grid.grid(), go,
                        io.densa.spatial.uncertainty.UncertaintyOptions.withSeed(3).withQuantiles(0.5)
                                .withExceedances(5.0).withMean(true), t -> cells[0] += t.size());
            } else {
                model.kriging().predictGrid(grid.grid(), go, t -> cells[0] += t.size());
            }
            long t2 = System.nanoTime();
            long c2 = cpu();
            double cellsTotal = (double) side * side;
            System.out.printf(Locale.ROOT, "%s %d x %d: spark %.2f s (%.0f cells/s; CPU %.2f s), single machine %.2f s"
                    + " (%.0f cells/s; CPU %.2f s)%n", args[0], side, side, s(t1 - t0), cellsTotal / s(t1 - t0),
                    s(c1 - c0), s(t2 - t1), cells[0] / s(t2 - t1), s(c2 - c1));
        } else {
            io.densa.spark.VariogramSpec opt = io.densa.spark.VariogramSpec.withDefaults();
            long c0 = cpu();
            long t0 = System.nanoTime();
            io.densa.spatial.variogram.EmpiricalVariogram v = io.densa.spark.SparkVariogram.of(spark, data, opt, 4 * cores);
            long t1 = System.nanoTime();
            long c1 = cpu();
            io.densa.spatial.variogram.EmpiricalVariogram w = io.densa.spatial.variogram.EmpiricalVariogram.of(loc, set,
                    opt.options().withParallel(cores > 1));
            long t2 = System.nanoTime();
            long c2 = cpu();
            double pairs = 0.5 * n * (n - 1.0);
            System.out.printf(Locale.ROOT, "variogram n=%d: spark %.2f s (%.3g pairs/s; CPU %.2f s), single machine %.2f s"
                    + " (%.3g pairs/s; CPU %.2f s); equal: %b%n", n, s(t1 - t0), pairs / s(t1 - t0), s(c1 - c0),
                    s(t2 - t1), pairs / s(t2 - t1), s(c2 - c1), java.util.Arrays.equals(v.semivariances(),
                    w.semivariances()));
        }
        spark.stop();
    }

    /** CPU time of the whole process (all threads, including Spark's and the JIT's), in nanoseconds. */
    private static long cpu() {
        return ((com.sun.management.OperatingSystemMXBean) java.lang.management.ManagementFactory
                .getOperatingSystemMXBean()).getProcessCpuTime();
    }

    private static double s(long nanos) {
        return nanos * 1e-9;
    }
}
