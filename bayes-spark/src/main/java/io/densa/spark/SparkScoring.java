package io.densa.spark;

import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.AnomalyScoring;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.List;
import java.util.Objects;
import org.apache.spark.api.java.function.MapPartitionsFunction;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Encoders;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.apache.spark.storage.StorageLevel;

/**
 * Anomaly scoring of a Spark dataset against a broadcast {@link BaselineSpec}: per row the residual
 * density of the response against the baseline's prediction, its B2 norm, the split-conformal
 * p-value, the Benjamini–Hochberg adjusted p-value over all rows of the dataset, the flag
 * (adjusted p ≤ q) and, for flagged rows, the excursions of the residual clr outside the calibrated
 * band (excess or deficit of mass, see {@link AnomalyScoring}).
 *
 * <h2>How the adjustment is distributed</h2>
 * Conformal p-values take at most n_cal + 1 distinct values (1 + j)/(n_cal + 1), so the
 * Benjamini–Hochberg step-up needs only how many rows have each value: one aggregation counts them,
 * the driver computes p̃ = min over larger p of min(1, m p / R) (R the number of rows with a p-value
 * at most p, m the number of rows; ties share the adjusted value of the last of them, as
 * {@link io.densa.core.BenjaminiHochberg#adjust} gives them), and the table is broadcast. The
 * result is bit-identical to {@link AnomalyScoring.Calibrated#score} of all rows on one machine.
 *
 * <h2>Columns</h2>
 * Input: the response coordinates (array&lt;double&gt;), one coordinate column per predictor of the
 * baseline, one numeric column per covariate. Added: {@code residual_norm}, {@code p_value},
 * {@code adjusted_p_value}, {@code flagged} and {@code excursions} (array of struct from, to,
 * direction EXCESS or DEFICIT, extreme; empty unless flagged). The call runs the jobs at once and
 * returns the result persisted; {@code unpersist()} it when done.
 */
public final class SparkScoring {
    static final int BATCH = 1024;

    private SparkScoring() {
    }

    /**
     * Scores every row.
     *
     * @param data       rows to score
     * @param baseline   the fitted baseline
     * @param response   name of the response coordinate column
     * @param predictors names of the predictor coordinate columns, in the baseline's order
     * @param covariates names of the covariate columns, in the baseline's order (empty without covariates)
     * @throws IllegalArgumentException for missing columns, or with Densa's message for bad rows
     */
    public static Dataset<Row> score(Dataset<Row> data, BaselineSpec baseline, String response, String[] predictors,
            String[] covariates) {
        Objects.requireNonNull(data, "data");
        Objects.requireNonNull(baseline, "baseline");
        List<String> cols = Arrays.asList(data.columns());
        int ri = index(cols, response);
        if (predictors.length != baseline.predictorCount()) {
            throw new IllegalArgumentException(predictors.length + " predictor columns for the baseline's "
                    + baseline.predictorCount() + " predictors");
        }
        if (covariates.length != baseline.covariates().length) {
            throw new IllegalArgumentException(covariates.length + " covariate columns for the baseline's covariates "
                    + Arrays.toString(baseline.covariates()));
        }
        int[] pi = new int[predictors.length];
        for (int j = 0; j < pi.length; j++) {
            pi[j] = index(cols, predictors[j]);
        }
        int[] zi = new int[covariates.length];
        for (int j = 0; j < zi.length; j++) {
            zi[j] = index(cols, covariates[j]);
        }
        Broadcast<BaselineSpec> b = data.sparkSession().sparkContext().broadcast(baseline,
                scala.reflect.ClassTag$.MODULE$.apply(BaselineSpec.class));
        StructType first = data.schema().add("residual_norm", DataTypes.DoubleType, false)
                .add("p_value", DataTypes.DoubleType, false);
        Dataset<Row> pass1 = data.mapPartitions((MapPartitionsFunction<Row, Row>) it -> new Batched(it, b.value(), ri,
                pi, zi), Encoders.row(first)).persist(StorageLevel.MEMORY_AND_DISK());
        try {
            List<Row> counts = SparkErrors.run(() -> pass1.groupBy("p_value").count().collectAsList());
            double[][] table = adjustment(counts);
            Broadcast<double[][]> t = data.sparkSession().sparkContext().broadcast(table,
                    scala.reflect.ClassTag$.MODULE$.apply(double[][].class));
            StructType excursion = new StructType().add("from", DataTypes.DoubleType, false)
                    .add("to", DataTypes.DoubleType, false).add("direction", DataTypes.StringType, false)
                    .add("extreme", DataTypes.DoubleType, false);
            StructType second = first.add("adjusted_p_value", DataTypes.DoubleType, false)
                    .add("flagged", DataTypes.BooleanType, false)
                    .add("excursions", DataTypes.createArrayType(excursion, false), false);
            int pcol = first.fieldIndex("p_value");
            Dataset<Row> out = pass1.mapPartitions((MapPartitionsFunction<Row, Row>) it -> SparkDensities.map(it,
                    r -> flag(r, b.value(), t.value(), pcol, ri, pi, zi)), Encoders.row(second))
                    .persist(StorageLevel.MEMORY_AND_DISK());
            try {
                SparkErrors.run(out::count);
            } catch (RuntimeException e) {
                out.unpersist();
                throw e;
            }
            return out;
        } finally {
            pass1.unpersist();
        }
    }

    private static int index(List<String> cols, String name) {
        int i = cols.indexOf(Objects.requireNonNull(name, "column name"));
        if (i < 0) {
            throw new IllegalArgumentException("no column '" + name + "' among " + cols);
        }
        return i;
    }

    /**
     * The Benjamini–Hochberg table from (p-value, count) rows: sorted distinct p-values and their
     * adjusted values.
     */
    static double[][] adjustment(List<Row> counts) {
        int d = counts.size();
        double[] p = new double[d];
        long[] c = new long[d];
        Integer[] order = new Integer[d];
        for (int i = 0; i < d; i++) {
            p[i] = counts.get(i).getDouble(0);
            c[i] = counts.get(i).getLong(1);
            order[i] = i;
        }
        Arrays.sort(order, (x, y) -> Double.compare(p[x], p[y]));
        double[] ps = new double[d];
        long[] cs = new long[d];
        long m = 0;
        for (int i = 0; i < d; i++) {
            ps[i] = p[order[i]];
            cs[i] = c[order[i]];
            m += cs[i];
        }
        // as BenjaminiHochberg.adjust: from the largest rank down, run = min(run, min(1, m p / rank)); within
        // a group of ties the smallest value is at its last rank R (cumulative count)
        double[] adj = new double[d];
        long rank = m;
        double run = 1.0;
        for (int i = d - 1; i >= 0; i--) {
            run = Math.min(run, Math.min(1.0, (double) m * ps[i] / rank));
            adj[i] = run;
            rank -= cs[i];
        }
        return new double[][] {ps, adj};
    }

    private static Row flag(Row r, BaselineSpec spec, double[][] table, int pcol, int ri, int[] pi, int[] zi) {
        double p = r.getDouble(pcol);
        int at = Arrays.binarySearch(table[0], p);
        if (at < 0) {
            throw new IllegalStateException("p-value " + p + " is missing from the adjustment table");
        }
        double adj = table[1][at];
        BaselineSpec.Model model = spec.model();
        boolean flagged = adj <= model.fdr();
        List<Row> ex = new ArrayList<>();
        if (flagged) {
            Batch one = Batch.of(List.of(r), spec, ri, pi, zi);
            Density residual = one.residuals(spec).get(0);
            List<AnomalyScoring.BandPoint> band = model.calibrated().band();
            double[] grid = new double[band.size()];
            for (int q = 0; q < grid.length; q++) {
                grid[q] = band.get(q).x();
            }
            for (AnomalyScoring.Excursion e : excursions(residual.clr(grid), band)) {
                ex.add(RowFactory.create(e.from(), e.to(), e.direction().name(), e.extreme()));
            }
        }
        Object[] v = new Object[r.length() + 3];
        for (int j = 0; j < r.length(); j++) {
            v[j] = r.get(j);
        }
        v[r.length()] = adj;
        v[r.length() + 1] = flagged;
        v[r.length() + 2] = ex.toArray(new Row[0]);
        return RowFactory.create(v);
    }

    /**
     * Maximal runs of grid points where the residual clr leaves the band, as
     * {@link AnomalyScoring.Calibrated#score} reports them for a flagged unit.
     */
    static List<AnomalyScoring.Excursion> excursions(double[] clr, List<AnomalyScoring.BandPoint> band) {
        List<AnomalyScoring.Excursion> ex = new ArrayList<>();
        int m = band.size();
        int q = 0;
        while (q < m) {
            AnomalyScoring.Direction d = clr[q] > band.get(q).upper() ? AnomalyScoring.Direction.EXCESS
                    : clr[q] < band.get(q).lower() ? AnomalyScoring.Direction.DEFICIT : null;
            if (d == null) {
                q++;
                continue;
            }
            int start = q;
            double extreme = clr[q];
            while (q < m && (d == AnomalyScoring.Direction.EXCESS ? clr[q] > band.get(q).upper()
                    : clr[q] < band.get(q).lower())) {
                extreme = d == AnomalyScoring.Direction.EXCESS ? Math.max(extreme, clr[q]) : Math.min(extreme, clr[q]);
                q++;
            }
            ex.add(new AnomalyScoring.Excursion(band.get(start).x(), band.get(q - 1).x(), d, extreme));
        }
        return ex;
    }

    /** The rows of one batch as density sets and a design. */
    private record Batch(List<Row> rows, DensitySet response, List<DensitySet> predictors, double[][] covariates) {
        static Batch of(List<Row> rows, BaselineSpec spec, int ri, int[] pi, int[] zi) {
            int n = rows.size();
            int k = spec.response().dimension();
            double[] y = new double[n * k];
            double[][] x = new double[pi.length][];
            for (int j = 0; j < pi.length; j++) {
                x[j] = new double[n * spec.predictor(j).dimension()];
            }
            double[][] z = new double[zi.length][n];
            for (int i = 0; i < n; i++) {
                Row r = rows.get(i);
                copy(SparkRows.doubles(r, ri), y, i, k, "response");
                for (int j = 0; j < pi.length; j++) {
                    copy(SparkRows.doubles(r, pi[j]), x[j], i, spec.predictor(j).dimension(), "predictor " + j);
                }
                for (int c = 0; c < zi.length; c++) {
                    if (r.isNullAt(zi[c])) {
                        throw new IllegalArgumentException("covariate " + spec.covariates()[c] + " is null in a row");
                    }
                    z[c][i] = ((Number) r.get(zi[c])).doubleValue();
                }
            }
            List<DensitySet> preds = spec.predictorSets(x, n);
            return new Batch(rows, DensitySet.ofRowMajor(spec.response().space(), y, n, null), preds, z);
        }

        private static void copy(double[] v, double[] dst, int i, int k, String what) {
            if (v.length != k) {
                throw new IllegalArgumentException(what + " coordinates of a row have " + v.length
                        + " entries; its space has dimension " + k);
            }
            System.arraycopy(v, 0, dst, i * k, k);
        }

        DensitySet residuals(BaselineSpec spec) {
            return spec.model().fit().residuals(predictors, spec.design(covariates, rows.size()), response);
        }
    }

    private static final class Batched extends BufferedRows {
        private final BaselineSpec spec;
        private final int ri;
        private final int[] pi;
        private final int[] zi;

        Batched(Iterator<Row> in, BaselineSpec spec, int ri, int[] pi, int[] zi) {
            super(in);
            this.spec = spec;
            this.ri = ri;
            this.pi = pi;
            this.zi = zi;
        }

        @Override
        protected void fill() {
            List<Row> rows = new ArrayList<>();
            while (in.hasNext() && rows.size() < BATCH) {
                rows.add(in.next());
            }
            BaselineSpec.Model model = spec.model();
            DensitySet res = Batch.of(rows, spec, ri, pi, zi).residuals(spec);
            double[] norms = res.norms();
            double[] p = model.calibrated().pValues(norms);
            for (int i = 0; i < rows.size(); i++) {
                Row r = rows.get(i);
                Object[] v = new Object[r.length() + 2];
                for (int j = 0; j < r.length(); j++) {
                    v[j] = r.get(j);
                }
                v[r.length()] = norms[i];
                v[r.length() + 1] = p[i];
                ready.add(RowFactory.create(v));
            }
        }
    }
}
