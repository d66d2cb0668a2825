package io.densa.spark;

import io.densa.core.DensitySet;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.Locations;
import io.densa.spatial.variogram.VariogramPairBlocks;
import java.io.Serializable;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;

/**
 * The empirical trace-semivariogram of up to about 10⁶ locations with its pairs computed by Spark
 * tasks: the locations and coordinates are broadcast ({@link LocationData}, O(nK) numbers), the n / 64
 * pair blocks of {@link VariogramPairBlocks} are dealt to the tasks (in a snake order, since block b
 * holds about n − 64b pairs, so that every task gets a similar share of the n²/2 pairs), each task
 * rebuilds the blocks once per JVM and returns the per-bin totals of its blocks, and the driver merges
 * them in block order. The result is bit-identical to {@link EmpiricalVariogram#of} on one machine
 * for the same locations, densities (in the same order) and options.
 *
 * <p>Stateless.
 */
public final class SparkVariogram {
    private SparkVariogram() {
    }

    /**
     * The variogram of the densities at the locations, blocks spread over the given number of tasks.
     *
     * @throws IllegalArgumentException as {@link EmpiricalVariogram#of}
     */
    public static EmpiricalVariogram of(SparkSession spark, LocationData data, VariogramSpec options, int tasks) {
        Objects.requireNonNull(spark, "spark");
        Objects.requireNonNull(data, "data");
        Objects.requireNonNull(options, "options");
        if (tasks < 1) {
            throw new IllegalArgumentException("need at least 1 task, got " + tasks);
        }
        VariogramPairBlocks blocks = VariogramPairBlocks.of(data.locations(), data.densities(), options.options());
        int nb = blocks.blockCount();
        int p = Math.min(tasks, nb);
        List<Integer> order = new ArrayList<>(nb);
        for (int t = 0; t < p; t++) {
            // snake: task t takes blocks t, 2p − 1 − t, 2p + t, 4p − 1 − t, ...
            for (int r = 0; ; r++) {
                int b = r % 2 == 0 ? r * p + t : (r + 1) * p - 1 - t;
                if (r * p >= nb) {
                    break;
                }
                if (b < nb) {
                    order.add(b);
                }
            }
        }
        JavaSparkContext sc = JavaSparkContext.fromSparkContext(spark.sparkContext());
        Broadcast<Job> job = sc.broadcast(new Job(data, options));
        JavaRDD<Integer> ids = sc.parallelize(order, p);
        List<Totals> totals = SparkErrors.run(() -> ids.mapPartitions(it -> {
            VariogramPairBlocks vb = job.value().blocks();
            List<Totals> out = new ArrayList<>();
            while (it.hasNext()) {
                out.add(new Totals(vb.block(it.next())));
            }
            return out.iterator();
        }).collect());
        List<VariogramPairBlocks.BlockSums> sums = new ArrayList<>(totals.size());
        for (Totals t : totals) {
            sums.add(new VariogramPairBlocks.BlockSums(t.block, t.gamma, t.lag, t.count));
        }
        return blocks.merge(sums);
    }

    /**
     * The variogram of a dataset of locations: x, y and coordinate columns. The rows are sorted by the
     * id column first: the sums of {@link EmpiricalVariogram#of} run in the order of the locations, so
     * the last bits depend on that order, and sorting makes the result independent of the
     * partitioning (equal to {@code EmpiricalVariogram.of} of the rows in id order). The locations
     * are collected to the driver (n × (K + 2) numbers) and broadcast.
     */
    public static EmpiricalVariogram of(Dataset<Row> data, String id, String x, String y, String coordinates,
            boolean geographic, SpaceSpec space, VariogramSpec options, int tasks) {
        Objects.requireNonNull(data, "data");
        List<Row> rows = SparkErrors.run(() -> data.select(id, x, y, coordinates).orderBy(id).collectAsList());
        int n = rows.size();
        int k = space.dimension();
        double[] xs = new double[n];
        double[] ys = new double[n];
        double[] c = new double[n * k];
        for (int i = 0; i < n; i++) {
            Row r = rows.get(i);
            if (r.isNullAt(1) || r.isNullAt(2)) {
                throw new IllegalArgumentException("location '" + r.get(0) + "' has a null coordinate");
            }
            xs[i] = ((Number) r.get(1)).doubleValue();
            ys[i] = ((Number) r.get(2)).doubleValue();
            double[] v = SparkRows.doubles(r, 3);
            if (v.length != k) {
                throw new IllegalArgumentException("location '" + r.get(0) + "' has " + v.length
                        + " coordinates; the space has dimension " + k);
            }
            System.arraycopy(v, 0, c, i * k, k);
        }
        Locations loc = geographic ? Locations.geographic(xs, ys) : Locations.planar(xs, ys);
        LocationData d = LocationData.of(loc, DensitySet.ofRowMajor(space.space(), c, n, null), space);
        return of(data.sparkSession(), d, options, tasks);
    }

    /** What the tasks need: the data and the options; the blocks are prepared once per JVM. */
    private static final class Job implements Serializable {
        private static final long serialVersionUID = 1L;
        private final LocationData data;
        private final VariogramSpec options;
        private final PerJvm<VariogramPairBlocks> blocks = new PerJvm<>();

        Job(LocationData data, VariogramSpec options) {
            this.data = data;
            this.options = options;
        }

        VariogramPairBlocks blocks() {
            return blocks.get(() -> VariogramPairBlocks.of(data.locations(), data.densities(), options.options()));
        }
    }

    /** One block's totals on their way back to the driver. */
    private static final class Totals implements Serializable {
        private static final long serialVersionUID = 1L;
        final int block;
        final double[] gamma;
        final double[] lag;
        final long[] count;

        Totals(VariogramPairBlocks.BlockSums s) {
            this.block = s.block();
            this.gamma = s.squaredDistances();
            this.lag = s.lags();
            this.count = s.counts();
        }
    }
}
