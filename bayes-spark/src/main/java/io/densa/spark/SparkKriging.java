package io.densa.spark;

import io.densa.io.raster.Crs;
import io.densa.io.raster.GeoTiffOptions;
import io.densa.io.raster.GeoTiffWriter;
import io.densa.io.raster.RasterLayout;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridTile;
import io.densa.spatial.kriging.GridTiles;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.uncertainty.IntervalLayer;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import io.densa.spatial.uncertainty.UncertaintyTile;
import java.io.Serializable;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.NoSuchElementException;
import java.util.Objects;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.ArrayType;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;

/**
 * Grid kriging by tiles in a Spark job: the kriging model ({@link KrigingSpec}) and the grid
 * ({@link GridSpec}) are broadcast, the grid's tiles are split into contiguous ranges, one per task,
 * and each task rebuilds the model once per JVM and predicts its tiles with {@link GridTiles#predict},
 * sixteen tiles at a time — so a task holds at most sixteen tiles of cells and a 10⁸-cell grid never
 * reaches the driver. Each cell is predicted by the same code from the same model as
 * {@link Kriging#predictGrid} on one machine, so every number is bit-identical to it.
 *
 * <p>Outputs: {@link #cells} — a dataset of one row per predicted cell, to write as Parquet (or
 * anything Spark writes) by the tasks themselves — and {@link #writeGeoTiffTiles} — one GeoTIFF per
 * tile written by the task that predicted it through io's {@link GeoTiffWriter}, with the derived
 * maps as bands. Stateless.
 */
public final class SparkKriging {
    /** Tiles predicted per call inside a task (as {@link Kriging#predictGrid} batches them). */
    static final int TILE_BATCH = 16;

    private SparkKriging() {
    }

    /**
     * The cells of the grid as a dataset (lazy: the tiles are predicted when an action runs, e.g.
     * {@code cells(...).write().parquet(path)}; wrap it in {@link SparkErrors#run} to see Densa's
     * messages). Columns: {@code tile_column}, {@code tile_row}, {@code column}, {@code row} (0 = south),
     * {@code x}, {@code y} (cell centre), then as the grid spec asks: {@code coordinates}
     * (array&lt;double&gt;, when {@code withCoordinates}), {@code variance}, {@code mean},
     * {@code quantiles} (array, in the order given), {@code tail_probabilities} (array, in the order
     * given), {@code nearest_distance}.
     *
     * @param tasks number of tasks the tiles are split over (at most the number of tiles is used)
     */
    public static Dataset<Row> cells(SparkSession spark, KrigingSpec model, GridSpec grid, int tasks,
            boolean withCoordinates) {
        return cells(spark, model, grid, null, tasks, withCoordinates);
    }

    /**
     * {@link #cells(SparkSession, KrigingSpec, GridSpec, int, boolean)} with the Monte Carlo interval
     * of every quantile, tail probability and mean the grid spec asks for
     * ({@link PredictiveDistribution#summariseTiles}; bit for bit {@link PredictiveDistribution#summariseGrid}
     * on one machine). Further columns, after those of the plain call: {@code quantile_lower},
     * {@code quantile_upper}, {@code tail_probability_lower}, {@code tail_probability_upper} (arrays,
     * in the order of the grid spec), {@code mean_lower}, {@code mean_upper}, as the spec asks.
     *
     * @param intervals the draws' settings, or null for no intervals
     * @throws IllegalArgumentException if intervals are asked for and the grid spec has no quantity, or
     *                                  the covariance shape cannot be built (checked on the driver)
     */
    public static Dataset<Row> cells(SparkSession spark, KrigingSpec model, GridSpec grid, IntervalSpec intervals,
            int tasks, boolean withCoordinates) {
        Objects.requireNonNull(spark, "spark");
        Objects.requireNonNull(model, "model");
        Objects.requireNonNull(grid, "grid");
        Job j = new Job(model, grid, intervals);
        StructType schema = schema(grid, intervals != null, withCoordinates);
        Broadcast<Job> job = JavaSparkContext.fromSparkContext(spark.sparkContext()).broadcast(j);
        JavaRDD<int[]> ranges = ranges(spark, grid, tasks);
        JavaRDD<Row> rows = ranges.mapPartitions(it -> new TileRows(it, job.value(), withCoordinates));
        return spark.createDataFrame(rows, schema);
    }

    /** The schema of {@link #cells}. */
    static StructType schema(GridSpec grid, boolean withCoordinates) {
        return schema(grid, false, withCoordinates);
    }

    private static StructType schema(GridSpec grid, boolean intervals, boolean withCoordinates) {
        StructType s = new StructType().add("tile_column", DataTypes.IntegerType, false)
                .add("tile_row", DataTypes.IntegerType, false).add("column", DataTypes.IntegerType, false)
                .add("row", DataTypes.IntegerType, false).add("x", DataTypes.DoubleType, false)
                .add("y", DataTypes.DoubleType, false);
        if (withCoordinates) {
            s = s.add("coordinates", DataTypes.createArrayType(DataTypes.DoubleType, false), false);
        }
        if (grid.variance()) {
            s = s.add("variance", DataTypes.DoubleType, false);
        }
        if (grid.means()) {
            s = s.add("mean", DataTypes.DoubleType, false);
        }
        if (grid.probabilities().length > 0) {
            s = s.add("quantiles", DataTypes.createArrayType(DataTypes.DoubleType, false), false);
        }
        if (grid.thresholds().length > 0) {
            s = s.add("tail_probabilities", DataTypes.createArrayType(DataTypes.DoubleType, false), false);
        }
        if (grid.nearest()) {
            s = s.add("nearest_distance", DataTypes.DoubleType, false);
        }
        if (intervals) {
            ArrayType values = DataTypes.createArrayType(DataTypes.DoubleType, false);
            if (grid.probabilities().length > 0) {
                s = s.add("quantile_lower", values, false).add("quantile_upper", values, false);
            }
            if (grid.thresholds().length > 0) {
                s = s.add("tail_probability_lower", values, false).add("tail_probability_upper", values, false);
            }
            if (grid.means()) {
                s = s.add("mean_lower", DataTypes.DoubleType, false).add("mean_upper", DataTypes.DoubleType, false);
            }
        }
        return s;
    }

    /** Contiguous tile ranges [from, to), one per task. */
    private static JavaRDD<int[]> ranges(SparkSession spark, GridSpec grid, int tasks) {
        if (tasks < 1) {
            throw new IllegalArgumentException("need at least 1 task, got " + tasks);
        }
        int total = GridTiles.tileCount(grid.grid(), grid.options());
        int p = Math.min(tasks, total);
        List<int[]> r = new ArrayList<>(p);
        for (int t = 0; t < p; t++) {
            r.add(new int[] {(int) ((long) total * t / p), (int) ((long) total * (t + 1) / p)});
        }
        return JavaSparkContext.fromSparkContext(spark.sparkContext()).parallelize(r, p);
    }

    /**
     * One written GeoTIFF tile.
     *
     * @param tileColumn tile column
     * @param tileRow    tile row (0 = south)
     * @param cells      cells written (inside the mask)
     * @param file       the file's path as the executor saw it
     */
    public record TileFile(int tileColumn, int tileRow, long cells, String file) implements Serializable {
    }

    /**
     * Predicts the grid and writes one GeoTIFF per non-empty tile, {@code tile_r<row>_c<column>.tif} in
     * the directory (which every executor must reach, e.g. a shared file system), with one band per
     * derived map of the grid spec in the order variance, mean, quantiles, tail probabilities, nearest
     * distance (names {@code kriging_variance}, {@code mean}, {@code quantile_<p>}, {@code p_above_<t>},
     * {@code nearest_distance}). Each file is georeferenced on its own (tiles of a mosaic), written under
     * a temporary name and moved into place when complete.
     *
     * @param crs         the CRS code
     * @param geographic  whether the code is a geographic CRS (else projected)
     * @param compression compression of the files
     * @return one entry per file written (T small records for T tiles, never the cells)
     * @throws IllegalArgumentException if the grid spec derives no map, or with Densa's message
     */
    public static List<TileFile> writeGeoTiffTiles(SparkSession spark, KrigingSpec model, GridSpec grid, int tasks,
            String directory, int crs, boolean geographic, GeoTiffOptions.Compression compression) {
        return writeGeoTiffTiles(spark, model, grid, null, tasks, directory, crs, geographic, compression);
    }

    /**
     * {@link #writeGeoTiffTiles(SparkSession, KrigingSpec, GridSpec, int, String, int, boolean,
     * GeoTiffOptions.Compression)} with, after the plain call's bands, the two ends of each interval
     * ({@link #cells(SparkSession, KrigingSpec, GridSpec, IntervalSpec, int, boolean)}):
     * {@code quantile_<p>_lower}, {@code quantile_<p>_upper} per quantile, {@code p_above_<t>_lower},
     * {@code p_above_<t>_upper} per threshold, {@code mean_lower}, {@code mean_upper}.
     *
     * @param intervals the draws' settings, or null for no intervals
     */
    public static List<TileFile> writeGeoTiffTiles(SparkSession spark, KrigingSpec model, GridSpec grid,
            IntervalSpec intervals, int tasks, String directory, int crs, boolean geographic,
            GeoTiffOptions.Compression compression) {
        Objects.requireNonNull(directory, "directory");
        Objects.requireNonNull(compression, "compression");
        Objects.requireNonNull(model, "model");
        Objects.requireNonNull(grid, "grid");
        List<String> bands = bands(grid, intervals != null);
        if (bands.isEmpty()) {
            throw new IllegalArgumentException("the grid spec derives no map to write: ask for the variance, means,"
                    + " quantiles, tail probabilities or nearest distances");
        }
        if (geographic) {
            Crs.geographic(crs);
        } else {
            Crs.projected(crs);
        }
        Job driver = new Job(model, grid, intervals);
        Broadcast<Job> job = JavaSparkContext.fromSparkContext(spark.sparkContext()).broadcast(driver);
        JavaRDD<int[]> ranges = ranges(spark, grid, tasks);
        return SparkErrors.run(() -> ranges.mapPartitions(it -> {
            Job j = job.value();
            Crs c = geographic ? Crs.geographic(crs) : Crs.projected(crs);
            List<TileFile> out = new ArrayList<>();
            while (it.hasNext()) {
                int[] r = it.next();
                for (int s = r[0]; s < r[1]; s += TILE_BATCH) {
                    j.tiles(s, Math.min(r[1], s + TILE_BATCH),
                            (t, u) -> out.add(write(t, u, j.grid, directory, c, compression, bands)));
                }
            }
            return out.iterator();
        }).collect());
    }

    static List<String> bands(GridSpec grid) {
        return bands(grid, false);
    }

    private static List<String> bands(GridSpec grid, boolean intervals) {
        List<String> b = new ArrayList<>();
        if (grid.variance()) {
            b.add("kriging_variance");
        }
        if (grid.means()) {
            b.add("mean");
        }
        for (double p : grid.probabilities()) {
            b.add("quantile_" + p);
        }
        for (double t : grid.thresholds()) {
            b.add("p_above_" + t);
        }
        if (grid.nearest()) {
            b.add("nearest_distance");
        }
        if (intervals) {
            for (double p : grid.probabilities()) {
                b.add("quantile_" + p + "_lower");
                b.add("quantile_" + p + "_upper");
            }
            for (double t : grid.thresholds()) {
                b.add("p_above_" + t + "_lower");
                b.add("p_above_" + t + "_upper");
            }
            if (grid.means()) {
                b.add("mean_lower");
                b.add("mean_upper");
            }
        }
        return b;
    }

    private static TileFile write(GridTile t, UncertaintyTile u, GridSpec spec, String directory, Crs crs,
            GeoTiffOptions.Compression compression, List<String> bands) {
        Grid g = spec.grid();
        int ts = GridTiles.tileSize(spec.options());
        int c0 = t.tileColumn() * ts;
        int r0 = t.tileRow() * ts;
        int cols = Math.min(ts, g.columns() - c0);
        int rows = Math.min(ts, g.rows() - r0);
        double w = g.cellWidth();
        double h = g.cellHeight();
        RasterLayout layout = new RasterLayout(cols, rows, g.x(c0) - 0.5 * w, g.y(r0 + rows - 1) + 0.5 * h, w, h, crs,
                bands);
        int n = t.size();
        int[] lc = new int[n];
        int[] lr = new int[n];
        for (int i = 0; i < n; i++) {
            lc[i] = t.columns()[i] - c0;
            lr[i] = t.rows()[i] - r0;
        }
        double[][] values = new double[bands.size()][];
        int b = 0;
        if (spec.variance()) {
            values[b++] = t.variances();
        }
        if (spec.means()) {
            values[b++] = t.means();
        }
        for (double[] q : t.quantiles()) {
            values[b++] = q;
        }
        for (double[] p : t.tailProbabilities()) {
            values[b++] = p;
        }
        if (spec.nearest()) {
            values[b++] = t.nearestDistances();
        }
        if (u != null) {
            List<IntervalLayer> layers = new ArrayList<>(u.quantiles());
            layers.addAll(u.exceedances());
            if (u.mean() != null) {
                layers.add(u.mean());
            }
            for (IntervalLayer l : layers) {
                values[b++] = l.lowers();
                values[b++] = l.uppers();
            }
        }
        Path file = Paths.get(directory, "tile_r" + t.tileRow() + "_c" + t.tileColumn() + ".tif");
        try {
            Files.createDirectories(file.getParent());
        } catch (java.io.IOException e) {
            throw new IllegalArgumentException("cannot create the directory " + file.getParent() + ": "
                    + e.getMessage(), e);
        }
        int fileTile = Math.max(16, Math.min(1024, (ts + 15) / 16 * 16));
        try (GeoTiffWriter wr = GeoTiffWriter.create(file, layout, GeoTiffOptions.defaults().withTileSize(fileTile)
                .withCompression(compression))) {
            wr.writeCells(n, lc, lr, values);
            wr.finish();
        }
        return new TileFile(t.tileColumn(), t.tileRow(), n, file.toString());
    }

    /** What a tile's result is handed to: the kriged tile and its intervals (null without). */
    private interface TileSink {
        void accept(GridTile tile, UncertaintyTile intervals);
    }

    /** What the tasks need. */
    private static final class Job implements Serializable {
        private static final long serialVersionUID = 1L;
        final KrigingSpec model;
        final GridSpec grid;
        final IntervalSpec intervals;
        private final PerJvm<PredictiveDistribution> predictive = new PerJvm<>();
        private final PerJvm<UncertaintyOptions> options = new PerJvm<>();

        /** Checks on the driver what the tasks will build (the intervals' quantities and shape). */
        Job(KrigingSpec model, GridSpec grid, IntervalSpec intervals) {
            this.model = model;
            this.grid = grid;
            this.intervals = intervals;
            if (intervals != null) {
                options();
                predictive();
            }
        }

        private UncertaintyOptions options() {
            return options.get(() -> intervals.options(grid));
        }

        private PredictiveDistribution predictive() {
            return predictive.get(() -> intervals.predictive(model.kriging()));
        }

        /** Tiles [from, to) in tile order into the sink, with their intervals when asked for. */
        void tiles(int from, int to, TileSink sink) {
            if (intervals == null) {
                GridTiles.predict(model.kriging(), grid.grid(), grid.options(), from, to, t -> sink.accept(t, null));
            } else {
                predictive().summariseTiles(grid.grid(), null, grid.options(), options(), from, to,
                        u -> sink.accept(u.tile(), u));
            }
        }
    }

    /** The rows of a task's tiles, sixteen tiles at a time. */
    private static final class TileRows implements Iterator<Row> {
        private final Iterator<int[]> ranges;
        private final Job job;
        private final boolean coordinates;
        private final List<Row> ready = new ArrayList<>();
        private int next;
        private int from;
        private int to;

        TileRows(Iterator<int[]> ranges, Job job, boolean coordinates) {
            this.ranges = ranges;
            this.job = job;
            this.coordinates = coordinates;
        }

        @Override
        public boolean hasNext() {
            while (next >= ready.size()) {
                ready.clear();
                next = 0;
                if (from >= to) {
                    if (!ranges.hasNext()) {
                        return false;
                    }
                    int[] r = ranges.next();
                    from = r[0];
                    to = r[1];
                    continue;
                }
                int end = Math.min(to, from + TILE_BATCH);
                Grid g = job.grid.grid();
                job.tiles(from, end, (t, u) -> rows(t, u, g));
                from = end;
            }
            return true;
        }

        private void rows(GridTile t, UncertaintyTile u, Grid g) {
            int k = t.predictions().dimension();
            double[] c = coordinates ? t.predictions().coordinatesRowMajor() : null;
            int nq = t.quantiles().length;
            int nt = t.tailProbabilities().length;
            GridSpec spec = job.grid;
            for (int i = 0; i < t.size(); i++) {
                List<Object> v = new ArrayList<>(18);
                v.add(t.tileColumn());
                v.add(t.tileRow());
                v.add(t.columns()[i]);
                v.add(t.rows()[i]);
                v.add(g.x(t.columns()[i]));
                v.add(g.y(t.rows()[i]));
                if (coordinates) {
                    v.add(java.util.Arrays.copyOfRange(c, i * k, i * k + k));
                }
                if (spec.variance()) {
                    v.add(t.variances()[i]);
                }
                if (spec.means()) {
                    v.add(t.means()[i]);
                }
                if (nq > 0) {
                    double[] q = new double[nq];
                    for (int j = 0; j < nq; j++) {
                        q[j] = t.quantiles()[j][i];
                    }
                    v.add(q);
                }
                if (nt > 0) {
                    double[] p = new double[nt];
                    for (int j = 0; j < nt; j++) {
                        p[j] = t.tailProbabilities()[j][i];
                    }
                    v.add(p);
                }
                if (spec.nearest()) {
                    v.add(t.nearestDistances()[i]);
                }
                if (u != null) {
                    if (nq > 0) {
                        v.add(ends(u.quantiles(), i, true));
                        v.add(ends(u.quantiles(), i, false));
                    }
                    if (nt > 0) {
                        v.add(ends(u.exceedances(), i, true));
                        v.add(ends(u.exceedances(), i, false));
                    }
                    if (spec.means()) {
                        v.add(u.mean().lowers()[i]);
                        v.add(u.mean().uppers()[i]);
                    }
                }
                ready.add(RowFactory.create(v.toArray()));
            }
        }

        private static double[] ends(List<IntervalLayer> layers, int cell, boolean lower) {
            double[] out = new double[layers.size()];
            for (int j = 0; j < out.length; j++) {
                out[j] = lower ? layers.get(j).lowers()[cell] : layers.get(j).uppers()[cell];
            }
            return out;
        }

        @Override
        public Row next() {
            if (!hasNext()) {
                throw new NoSuchElementException();
            }
            return ready.get(next++);
        }
    }
}
