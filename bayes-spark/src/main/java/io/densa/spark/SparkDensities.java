package io.densa.spark;

import static org.apache.spark.sql.functions.col;
import static org.apache.spark.sql.functions.collect_list;
import static org.apache.spark.sql.functions.count;
import static org.apache.spark.sql.functions.lit;
import static org.apache.spark.sql.functions.struct;
import static org.apache.spark.sql.functions.sum;

import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.BayesSpace;
import io.densa.io.Bins;
import io.densa.io.CircularValues;
import java.io.Serializable;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Objects;
import org.apache.spark.api.java.function.MapPartitionsFunction;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Encoders;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructField;
import org.apache.spark.sql.types.StructType;

/**
 * Density estimation in a Spark job: raw events (unit, value[, weight][, period]) or counts (unit, bin,
 * count[, period]) become one row per unit (and period) with the coordinates of its estimated
 * density and the estimation diagnostics.
 *
 * <h2>How</h2>
 * <ol>
 * <li>Each input row is checked (a null unit id, a value outside the bin layout, a negative or
 * non-finite count or weight, a bin outside [0, D) fail the job with a message naming the unit)
 * and events are binned ({@link Bins#indexOf}: e_j ≤ x &lt; e_{j+1}, the last bin closed). On a periodic
 * space every finite value is first reduced modulo the period into [e_0, e_0 + P)
 * ({@link CircularValues#binOf}), so a value is never outside the layout there and a bin that wraps
 * around the cut point receives values from both sides of it; NaN and ±∞ still fail.</li>
 * <li>A Spark aggregation sums counts per (unit, period, bin) — a unit with 10⁸ events becomes at
 * most D numbers before any unit is fitted, so a skewed unit cannot sink a task — and then gathers
 * each unit's D totals into one row.</li>
 * <li>Tasks fit their units in batches with {@link io.densa.core.estimate.PenalizedLikelihoodEstimator#fitAll}
 * from the broadcast {@link EstimatorSpec} (rebuilt once per executor JVM). A unit's fit depends
 * only on its own counts, so its coordinates and diagnostics are bit-identical to a single-machine
 * {@code fitAll} of the same counts, whatever the partitioning.</li>
 * </ol>
 * Counts are summed exactly for unweighted events and whole-number counts (long arithmetic); sums of
 * fractional weights depend on Spark's summation order in the last bits.
 *
 * <h2>Output</h2>
 * {@code unit} (string), {@code period} (string; only with a period column), {@code coordinates}
 * (array&lt;double&gt;, K entries), {@code status} (CONVERGED, NOT_CONVERGED, EMPTY_UNIT_REFERENCE),
 * {@code reason}, {@code smoothing}, {@code criterion_value}, {@code edf}, {@code log_likelihood},
 * {@code total}, {@code iterations}, {@code estimation_variance}, {@code extrapolation_share} and
 * {@code extrapolated} (see {@link EstimationDiagnostics}). The call runs the job at once and returns
 * the result persisted (memory and disk), so bad input fails here with Densa's message
 * ({@link SparkErrors}); {@code unpersist()} it when done.
 *
 * <p>Immutable configuration; column names default to unit, value, weight (none), period (none),
 * bin and count.
 */
public final class SparkDensities implements Serializable {
    private static final long serialVersionUID = 1L;
    /** Units fitted per call of the estimator inside a task. */
    static final int DEFAULT_BATCH = 256;

    private final EstimatorSpec spec;
    private final String unit;
    private final String value;
    private final String weight;
    private final String period;
    private final String bin;
    private final String countColumn;
    private final int batch;

    private SparkDensities(EstimatorSpec spec, String unit, String value, String weight, String period, String bin,
            String countColumn, int batch) {
        this.spec = spec;
        this.unit = unit;
        this.value = value;
        this.weight = weight;
        this.period = period;
        this.bin = bin;
        this.countColumn = countColumn;
        this.batch = batch;
    }

    /** Estimation with the given estimator settings and bin layout, default column names. */
    public static SparkDensities of(EstimatorSpec spec) {
        return new SparkDensities(Objects.requireNonNull(spec, "spec"), "unit", "value", null, null, "bin", "count",
                DEFAULT_BATCH);
    }

    /** Name of the unit id column (any type; used as its string form). */
    public SparkDensities withUnitColumn(String name) {
        return new SparkDensities(spec, Objects.requireNonNull(name, "name"), value, weight, period, bin, countColumn,
                batch);
    }

    /** Name of the event value column (numeric). */
    public SparkDensities withValueColumn(String name) {
        return new SparkDensities(spec, unit, Objects.requireNonNull(name, "name"), weight, period, bin, countColumn,
                batch);
    }

    /** Name of an event weight column (numeric, finite, ≥ 0), or null for unit weights. */
    public SparkDensities withWeightColumn(String name) {
        return new SparkDensities(spec, unit, value, name, period, bin, countColumn, batch);
    }

    /** Name of a period column (any type; used as its string form), or null: one density per unit. */
    public SparkDensities withPeriodColumn(String name) {
        return new SparkDensities(spec, unit, value, weight, name, bin, countColumn, batch);
    }

    /** Names of the bin index (integer, 0-based) and count (numeric) columns of count input. */
    public SparkDensities withCountColumns(String binName, String countName) {
        return new SparkDensities(spec, unit, value, weight, period, Objects.requireNonNull(binName, "binName"),
                Objects.requireNonNull(countName, "countName"), batch);
    }

    /** Units per estimator call inside a task (default 256; results do not depend on it). */
    public SparkDensities withBatchSize(int units) {
        if (units < 1 || units > 1_000_000) {
            throw new IllegalArgumentException("batch size must be in [1, 1000000], got " + units);
        }
        return new SparkDensities(spec, unit, value, weight, period, bin, countColumn, units);
    }

    /** The estimator settings. */
    public EstimatorSpec spec() {
        return spec;
    }

    /**
     * Estimates one density per unit (and period) from raw events.
     *
     * @throws IllegalArgumentException with Densa's message naming the unit for bad input
     */
    public Dataset<Row> fromEvents(Dataset<Row> events) {
        Objects.requireNonNull(events, "events");
        SparkSession spark = events.sparkSession();
        Column w = weight == null ? lit(1.0) : col(weight).cast(DataTypes.DoubleType);
        Dataset<Row> raw = events.select(col(unit).cast(DataTypes.StringType).as("unit"),
                period == null ? lit(null).cast(DataTypes.StringType).as("period")
                        : col(period).cast(DataTypes.StringType).as("period"),
                col(value).cast(DataTypes.DoubleType).as("value"), w.as("weight"));
        StructType binned = new StructType()
                .add("unit", DataTypes.StringType, false)
                .add("period", DataTypes.StringType, true)
                .add("bin", DataTypes.IntegerType, false)
                .add("weight", DataTypes.DoubleType, false);
        Broadcast<EstimatorSpec> bs = broadcast(spark);
        boolean weighted = weight != null;
        Dataset<Row> rows = raw.mapPartitions((MapPartitionsFunction<Row, Row>) it -> {
            Bins bins = bs.value().layout();
            BayesSpace space = bs.value().estimator().space();
            double circle = space.isPeriodic() ? space.period() : 0;
            return map(it, r -> binEvent(r, bins, circle, weighted));
        }, Encoders.row(binned));
        Dataset<Row> counts = weighted
                ? rows.groupBy("unit", "period", "bin").agg(sum("weight").as("count"))
                : rows.groupBy("unit", "period", "bin").agg(count(lit(1)).cast(DataTypes.DoubleType).as("count"));
        return fit(counts, bs);
    }

    /**
     * Estimates one density per unit (and period) from counts per bin; several rows of one unit and bin
     * are added.
     *
     * @throws IllegalArgumentException with Densa's message naming the unit for bad input
     */
    public Dataset<Row> fromCounts(Dataset<Row> counts) {
        Objects.requireNonNull(counts, "counts");
        SparkSession spark = counts.sparkSession();
        Dataset<Row> raw = counts.select(col(unit).cast(DataTypes.StringType).as("unit"),
                period == null ? lit(null).cast(DataTypes.StringType).as("period")
                        : col(period).cast(DataTypes.StringType).as("period"),
                col(bin).cast(DataTypes.LongType).as("bin"), col(countColumn).cast(DataTypes.DoubleType).as("count"));
        StructType checked = new StructType()
                .add("unit", DataTypes.StringType, false)
                .add("period", DataTypes.StringType, true)
                .add("bin", DataTypes.IntegerType, false)
                .add("count", DataTypes.DoubleType, false);
        Broadcast<EstimatorSpec> bs = broadcast(spark);
        Dataset<Row> rows = raw.mapPartitions((MapPartitionsFunction<Row, Row>) it -> {
            int d = bs.value().bins();
            return map(it, r -> checkCount(r, d));
        }, Encoders.row(checked));
        return fit(rows.groupBy("unit", "period", "bin").agg(sum("count").as("count")), bs);
    }

    private Broadcast<EstimatorSpec> broadcast(SparkSession spark) {
        spec.estimator(); // fail on the driver first
        return spark.sparkContext().broadcast(spec, scala.reflect.ClassTag$.MODULE$.apply(EstimatorSpec.class));
    }

    private static String where(String unit, String period) {
        return "unit '" + unit + "'" + (period == null ? "" : " (period '" + period + "')");
    }

    /** circle: the period on a periodic space (values are wrapped onto the circle), 0 on a bounded one. */
    private static Row binEvent(Row r, Bins bins, double circle, boolean weighted) {
        String u = r.isNullAt(0) ? null : r.getString(0);
        String p = r.isNullAt(1) ? null : r.getString(1);
        Double v = r.isNullAt(2) ? null : r.getDouble(2);
        if (u == null) {
            throw new IllegalArgumentException("an event has a null unit id (value " + v
                    + (p == null ? "" : ", period '" + p + "'") + "); every event needs a unit id");
        }
        if (v == null) {
            throw new IllegalArgumentException(where(u, p) + ": an event has a null value; values must be finite and"
                    + " inside the bin layout [" + bins.lower() + ", " + bins.upper() + "]");
        }
        if (circle > 0 && !Double.isFinite(v)) {
            throw new IllegalArgumentException(where(u, p) + ": value " + v + " cannot be placed on the circle of"
                    + " period " + circle + "; values must be finite (any finite value is taken modulo the period)");
        }
        int j = circle > 0 ? CircularValues.binOf(bins, v, circle) : bins.indexOf(v);
        if (j < 0 || j >= bins.count()) {
            throw new IllegalArgumentException(where(u, p) + ": value " + v + " lies outside the bin layout ["
                    + bins.lower() + ", " + bins.upper() + "]; values must be finite and inside it");
        }
        double w = 1.0;
        if (weighted) {
            if (r.isNullAt(3) || !(r.getDouble(3) >= 0) || Double.isInfinite(r.getDouble(3))) {
                throw new IllegalArgumentException(where(u, p) + ": event with value " + v + " has weight "
                        + (r.isNullAt(3) ? "null" : r.getDouble(3)) + "; weights must be finite and >= 0");
            }
            w = r.getDouble(3);
        }
        return RowFactory.create(u, p, j, w);
    }

    private static Row checkCount(Row r, int d) {
        String u = r.isNullAt(0) ? null : r.getString(0);
        String p = r.isNullAt(1) ? null : r.getString(1);
        if (u == null) {
            throw new IllegalArgumentException("a count row has a null unit id (bin " + (r.isNullAt(2) ? "null"
                    : r.getLong(2)) + (p == null ? "" : ", period '" + p + "'") + "); every row needs a unit id");
        }
        if (r.isNullAt(2)) {
            throw new IllegalArgumentException(where(u, p) + ": a count row has a null bin; bins 0.." + (d - 1)
                    + " are accepted");
        }
        long b = r.getLong(2);
        if (b < 0 || b >= d) {
            throw new IllegalArgumentException(where(u, p) + ": bin " + b + " lies outside the layout; its " + d
                    + " bins are numbered 0.." + (d - 1));
        }
        double c = r.isNullAt(3) ? Double.NaN : r.getDouble(3);
        if (!(c >= 0) || Double.isInfinite(c)) {
            throw new IllegalArgumentException(where(u, p) + ", bin " + b + ": count " + (r.isNullAt(3) ? "null" : c)
                    + (c < 0 ? " is negative" : " is not allowed") + "; counts must be finite and >= 0");
        }
        return RowFactory.create(u, p, (int) b, c);
    }

    private Dataset<Row> fit(Dataset<Row> counts, Broadcast<EstimatorSpec> bs) {
        Dataset<Row> units = counts.groupBy("unit", "period")
                .agg(collect_list(struct(col("bin"), col("count"))).as("cells"));
        StructType schema = outputSchema();
        int size = batch;
        Dataset<Row> out = units.mapPartitions((MapPartitionsFunction<Row, Row>) it -> new Batches(it, bs.value(),
                size), Encoders.row(schema));
        if (period == null) {
            out = out.drop("period");
        }
        return SparkErrors.materialise(out);
    }

    /** The output schema (with the period column). */
    static StructType outputSchema() {
        return new StructType(new StructField[] {
            DataTypes.createStructField("unit", DataTypes.StringType, false),
            DataTypes.createStructField("period", DataTypes.StringType, true),
            DataTypes.createStructField("coordinates", DataTypes.createArrayType(DataTypes.DoubleType, false), false),
            DataTypes.createStructField("status", DataTypes.StringType, false),
            DataTypes.createStructField("reason", DataTypes.StringType, false),
            DataTypes.createStructField("smoothing", DataTypes.DoubleType, false),
            DataTypes.createStructField("criterion_value", DataTypes.DoubleType, false),
            DataTypes.createStructField("edf", DataTypes.DoubleType, false),
            DataTypes.createStructField("log_likelihood", DataTypes.DoubleType, false),
            DataTypes.createStructField("total", DataTypes.DoubleType, false),
            DataTypes.createStructField("iterations", DataTypes.IntegerType, false),
            DataTypes.createStructField("estimation_variance", DataTypes.DoubleType, false),
            DataTypes.createStructField("extrapolation_share", DataTypes.DoubleType, false),
            DataTypes.createStructField("extrapolated", DataTypes.BooleanType, false)});
    }

    /** Fits the units of a partition batch by batch. */
    private static final class Batches extends BufferedRows {
        private final EstimatorSpec spec;
        private final int size;

        Batches(Iterator<Row> in, EstimatorSpec spec, int size) {
            super(in);
            this.spec = spec;
            this.size = size;
        }


        @Override
        protected void fill() {
            int d = spec.bins();
            List<String> units = new ArrayList<>();
            List<String> periods = new ArrayList<>();
            List<double[]> rows = new ArrayList<>();
            while (in.hasNext() && units.size() < size) {
                Row r = in.next();
                String u = r.getString(0);
                String p = r.isNullAt(1) ? null : r.getString(1);
                double[] c = new double[d];
                List<Row> cells = r.getList(2);
                for (Row cell : cells) {
                    c[cell.getInt(0)] = cell.getDouble(1);
                }
                units.add(u);
                periods.add(p);
                rows.add(c);
            }
            int n = units.size();
            String[] ids = new String[n];
            for (int i = 0; i < n; i++) {
                ids[i] = periods.get(i) == null ? units.get(i) : units.get(i) + " / period " + periods.get(i);
            }
            BatchEstimate est = spec.estimator().fitAll(spec.edgesInternal(), rows.toArray(new double[0][]), ids);
            for (int i = 0; i < n; i++) {
                EstimationDiagnostics g = est.diagnostics().get(i);
                ready.add(RowFactory.create(units.get(i), periods.get(i), est.densities().get(i).coordinates(),
                        g.status().name(), g.reason(), g.smoothing(), g.criterionValue(),
                        g.effectiveDegreesOfFreedom(), g.logLikelihood(), g.total(), g.iterations(),
                        g.estimationVariance(), g.extrapolationShare(), g.extrapolated()));
            }
        }
    }

    /** A lazily mapped iterator. */
    interface RowMap extends Serializable {
        Row apply(Row r);
    }

    static Iterator<Row> map(Iterator<Row> it, RowMap f) {
        return new Iterator<Row>() {
            @Override
            public boolean hasNext() {
                return it.hasNext();
            }

            @Override
            public Row next() {
                return f.apply(it.next());
            }
        };
    }
}
