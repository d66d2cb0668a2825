package io.densa.spark;

import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.surveillance.ExcessCounts;
import java.io.Serializable;
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
 *
 * <h2>Excess counts</h2>
 * {@link #excessCounts} adds {@link ExcessCounts} to every row (a unit's counts against its baseline
 * coordinates: excess per band and displaced events with intervals and a p-value, adjusted over all
 * rows as above), each unit on streams of its own seed ({@link #unitSeed}), so the numbers do not
 * depend on the partitioning and equal those of the unit alone on one machine.
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
            return SparkErrors.materialise(pass1.mapPartitions((MapPartitionsFunction<Row, Row>) it ->
                    SparkDensities.map(it, r -> flag(r, b.value(), t.value(), pcol, ri, pi, zi)), Encoders.row(second)));
        } finally {
            pass1.unpersist();
        }
    }

    /**
     * What {@link #excessCounts} computes: the space of the baseline coordinates, the count bins and
     * the bands, the interval level, the draws, the seed and optionally a common covariance of the
     * baseline's error ({@link ExcessCounts.BaselineError#common}). Immutable and serialisable
     * (numbers only).
     */
    public static final class Excess implements Serializable {
        private static final long serialVersionUID = 1L;
        private final SpaceSpec space;
        private final double[] binEdges;
        private final double[] bandEdges;
        private final double level;
        private final int draws;
        private final long seed;
        private final double[][] covariance;

        private Excess(SpaceSpec space, double[] binEdges, double[] bandEdges, double level, int draws, long seed,
                double[][] covariance) {
            this.space = space;
            this.binEdges = binEdges;
            this.bandEdges = bandEdges;
            this.level = level;
            this.draws = draws;
            this.seed = seed;
            this.covariance = covariance;
        }

        /**
         * Excess counts in the bands over the count bins (both as {@link ExcessCounts#estimate}
         * takes them; the arrays are copied), 90 % intervals from 999 draws, seed 1, the baseline
         * taken as exact.
         */
        public static Excess of(SpaceSpec space, double[] binEdges, double[] bandEdges) {
            return new Excess(Objects.requireNonNull(space, "space"), Objects.requireNonNull(binEdges, "binEdges").clone(),
                    Objects.requireNonNull(bandEdges, "bandEdges").clone(), 0.9, 999, 1, null);
        }

        /** The interval level in (0, 1). */
        public Excess withLevel(double l) {
            ExcessCounts.withDefaults().withLevel(l); // validates
            return new Excess(space, binEdges, bandEdges, l, draws, seed, covariance);
        }

        /** The draws per unit (at least 99) and the seed of every unit's streams. */
        public Excess withDraws(int count, long randomSeed) {
            ExcessCounts.withDefaults().withDraws(count, randomSeed); // validates
            return new Excess(space, binEdges, bandEdges, level, count, randomSeed, covariance);
        }

        /** A covariance of the baseline's error, the same for every unit (K × K, copied; checked as ExcessCounts does). */
        public Excess withBaselineCovariance(double[][] cov) {
            ExcessCounts.BaselineError.common(Objects.requireNonNull(cov, "cov")); // validates
            double[][] c = new double[cov.length][];
            for (int i = 0; i < c.length; i++) {
                c[i] = cov[i].clone();
            }
            return new Excess(space, binEdges, bandEdges, level, draws, seed, c);
        }

        ExcessCounts.BaselineError error() {
            return covariance == null ? ExcessCounts.BaselineError.none() : ExcessCounts.BaselineError.common(covariance);
        }

        /** The bootstrap of one unit: its own seed (see {@link #unitSeed}), so partitions do not matter. */
        ExcessCounts.UnitExcess unit(String id, long[] counts, double[] coordinates, ExcessCounts.BaselineError error) {
            DensitySet one = DensitySet.of(space.space(), new double[][] {coordinates}, new String[] {id});
            return ExcessCounts.withDefaults().withLevel(level).withDraws(draws, unitSeed(seed, id))
                    .estimate(one, new long[][] {counts}, binEdges, bandEdges, error).units().get(0);
        }
    }

    /**
     * The seed of a unit's streams in {@link #excessCounts}: a 64-bit FNV-1a hash (Fowler, Noll &amp;
     * Vo; common practice) of the seed's eight bytes and the unit id's UTF-16 code units, finished by
     * the 64-bit mixer of MurmurHash3 (common practice), so that a unit's draws depend on its id and
     * the seed only. {@code ExcessCounts.withDraws(draws, unitSeed(seed, id))} on that unit alone
     * gives the same numbers on one machine.
     */
    public static long unitSeed(long seed, String id) {
        Objects.requireNonNull(id, "id");
        long h = 0xcbf29ce484222325L;
        for (int b = 0; b < 8; b++) {
            h ^= (seed >>> (8 * b)) & 0xff;
            h *= 0x100000001b3L;
        }
        for (int i = 0; i < id.length(); i++) {
            h ^= id.charAt(i);
            h *= 0x100000001b3L;
        }
        h ^= h >>> 33;
        h *= 0xff51afd7ed558ccdL;
        h ^= h >>> 33;
        h *= 0xc4ceb9fe1a85ec53L;
        h ^= h >>> 33;
        return h;
    }

    /**
     * Excess counts of every row against its baseline ({@link ExcessCounts}, each unit's own total as
     * the denominator): per band the observed and expected events and the excess with its interval,
     * and the displaced events with their interval, their mean under no change and a p-value.
     * A row's numbers depend on its id, counts and baseline only (its own seed, {@link #unitSeed}).
     *
     * <p>Columns added: {@code band_observed}, {@code band_expected}, {@code band_excess},
     * {@code band_excess_lower}, {@code band_excess_upper} (array&lt;double&gt;, one entry per band),
     * {@code displaced}, {@code displaced_lower}, {@code displaced_upper}, {@code displaced_noise},
     * {@code displaced_p} and {@code displaced_q}, the p-value adjusted over all rows (Benjamini–Hochberg,
     * distributed as for scoring above; equal to {@link ExcessCounts.Result#displacedAdjustedPValues} of
     * all rows on one machine).
     *
     * @param data     rows, one per unit (and period)
     * @param spec     bins, bands and bootstrap settings
     * @param unit     name of the unit id column (any type; its string form is the id)
     * @param counts   name of the counts column (array of numbers, one whole count per bin)
     * @param baseline name of the baseline coordinates column (array&lt;double&gt;)
     * @throws IllegalArgumentException for missing columns or bad settings, or with Densa's message
     *                                  naming the unit for a bad row
     */
    public static Dataset<Row> excessCounts(Dataset<Row> data, Excess spec, String unit, String counts,
            String baseline) {
        Objects.requireNonNull(data, "data");
        Objects.requireNonNull(spec, "spec");
        List<String> cols = Arrays.asList(data.columns());
        int ui = index(cols, unit);
        int ci = index(cols, counts);
        int bi = index(cols, baseline);
        // the settings on the driver first: a unit without events against the reference density
        spec.unit("check", new long[Math.max(0, spec.binEdges.length - 1)], new double[spec.space.dimension()],
                spec.error());
        StructType out = data.schema();
        for (String name : new String[] {"band_observed", "band_expected", "band_excess", "band_excess_lower",
            "band_excess_upper"}) {
            out = out.add(name, DataTypes.createArrayType(DataTypes.DoubleType, false), false);
        }
        for (String name : new String[] {"displaced", "displaced_lower", "displaced_upper", "displaced_noise",
            "displaced_p"}) {
            out = out.add(name, DataTypes.DoubleType, false);
        }
        Broadcast<Excess> b = data.sparkSession().sparkContext().broadcast(spec,
                scala.reflect.ClassTag$.MODULE$.apply(Excess.class));
        Dataset<Row> pass1 = SparkErrors.materialise(data.mapPartitions((MapPartitionsFunction<Row, Row>) it -> {
            Excess e = b.value();
            ExcessCounts.BaselineError error = e.error();
            return SparkDensities.map(it, r -> excessRow(r, e, error, ui, ci, bi));
        }, Encoders.row(out)));
        try {
            // Monte Carlo p-values take at most draws + 1 values: the Benjamini–Hochberg table as for scoring
            double[][] table = adjustment(SparkErrors.run(() -> pass1.groupBy("displaced_p").count().collectAsList()));
            Broadcast<double[][]> t = data.sparkSession().sparkContext().broadcast(table,
                    scala.reflect.ClassTag$.MODULE$.apply(double[][].class));
            int pcol = out.fieldIndex("displaced_p");
            StructType second = out.add("displaced_q", DataTypes.DoubleType, false);
            return SparkErrors.materialise(pass1.mapPartitions((MapPartitionsFunction<Row, Row>) it ->
                    SparkDensities.map(it, r -> withAdjusted(r, t.value(), pcol)), Encoders.row(second)));
        } finally {
            pass1.unpersist();
        }
    }

    /** The row with the adjusted value of its p-value (column pcol) from the table appended. */
    private static Row withAdjusted(Row r, double[][] table, int pcol) {
        int at = Arrays.binarySearch(table[0], r.getDouble(pcol));
        if (at < 0) {
            throw new IllegalStateException("p-value " + r.getDouble(pcol) + " is missing from the adjustment table");
        }
        Object[] v = new Object[r.length() + 1];
        for (int j = 0; j < r.length(); j++) {
            v[j] = r.get(j);
        }
        v[r.length()] = table[1][at];
        return RowFactory.create(v);
    }

    private static Row excessRow(Row r, Excess spec, ExcessCounts.BaselineError error, int ui, int ci, int bi) {
        if (r.isNullAt(ui)) {
            throw new IllegalArgumentException("a row has a null unit id; every row needs one");
        }
        String id = String.valueOf(r.get(ui));
        double[] c;
        double[] coords;
        try {
            c = SparkRows.doubles(r, ci);
            coords = SparkRows.doubles(r, bi);
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("unit '" + id + "': " + e.getMessage(), e);
        }
        long[] n = new long[c.length];
        for (int j = 0; j < c.length; j++) {
            if (!(c[j] >= 0) || c[j] != Math.rint(c[j]) || c[j] > Long.MAX_VALUE / 2) {
                throw new IllegalArgumentException("unit '" + id + "', bin " + j + ": count " + c[j]
                        + " is not a whole number >= 0");
            }
            n[j] = (long) c[j];
        }
        if (coords.length != spec.space.dimension()) {
            throw new IllegalArgumentException("unit '" + id + "': baseline coordinates have " + coords.length
                    + " entries; the space has dimension " + spec.space.dimension());
        }
        ExcessCounts.UnitExcess u;
        try {
            u = spec.unit(id, n, coords, error);
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("unit '" + id + "': " + e.getMessage(), e);
        }
        int nb = u.bands().size();
        double[][] band = new double[5][nb];
        for (int t = 0; t < nb; t++) {
            ExcessCounts.BandExcess x = u.bands().get(t);
            band[0][t] = x.observed();
            band[1][t] = x.expected();
            band[2][t] = x.excess();
            band[3][t] = x.lower();
            band[4][t] = x.upper();
        }
        Object[] v = new Object[r.length() + 10];
        for (int j = 0; j < r.length(); j++) {
            v[j] = r.get(j);
        }
        for (int q = 0; q < 5; q++) {
            v[r.length() + q] = band[q];
        }
        ExcessCounts.Displaced d = u.displaced();
        v[r.length() + 5] = d.value();
        v[r.length() + 6] = d.lower();
        v[r.length() + 7] = d.upper();
        v[r.length() + 8] = d.noiseMean();
        v[r.length() + 9] = d.pValue();
        return RowFactory.create(v);
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
