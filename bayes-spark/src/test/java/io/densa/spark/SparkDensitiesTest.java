package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.BayesSpace;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.io.Bins;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.TreeMap;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.junit.jupiter.api.Test;

/**
 * Density estimation in Spark against the single-machine estimator: every unit's coordinates and
 * diagnostics bit for bit (a unit's fit depends only on its own counts), for several partitionings,
 * for events and for counts, with a skewed unit; bad input fails with Densa's message.
 */
class SparkDensitiesTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 10, 4, 5);
    static final double[] EDGES = Bins.uniform(0, 10, 20).edges();

    /** Invented events: 30 units with 20–200 events each from normals truncated to [0, 10], one unit with 20,000. */
    static List<Row> events(long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        List<Row> rows = new ArrayList<>();
        for (int u = 0; u < 31; u++) {
            int n = u == 30 ? 20_000 : 20 + rnd.nextInt(181);
            double mu = 2 + 6 * rnd.nextDouble();
            double sd = 0.8 + 1.5 * rnd.nextDouble();
            for (int i = 0; i < n; i++) {
                double v;
                do {
                    v = mu + sd * gaussian(rnd);
                } while (!(v >= 0 && v <= 10));
                rows.add(RowFactory.create("u" + u, v, u % 3 == 0 ? "2025" : "2026"));
            }
        }
        return rows;
    }

    static double gaussian(SplittableRandom rnd) {
        return Math.sqrt(-2 * Math.log(1 - rnd.nextDouble())) * Math.cos(2 * Math.PI * rnd.nextDouble());
    }

    static final StructType EVENTS = new StructType().add("unit", DataTypes.StringType, true)
            .add("value", DataTypes.DoubleType, true).add("period", DataTypes.StringType, true);

    static Dataset<Row> frame(List<Row> rows, StructType schema, int partitions) {
        return SparkTestSession.get().createDataFrame(rows, schema).repartition(partitions);
    }

    /** The single-machine counts of the same events: unit → D counts. */
    static TreeMap<String, double[]> counts(List<Row> rows) {
        Bins bins = Bins.of(EDGES);
        TreeMap<String, double[]> m = new TreeMap<>();
        for (Row r : rows) {
            m.computeIfAbsent(r.getString(0), k -> new double[bins.count()])[bins.indexOf(r.getDouble(1))] += 1;
        }
        return m;
    }

    @Test
    void eventsGiveTheSingleMachineFitsBitForBit() {
        List<Row> rows = events(11);
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(SPACE), EDGES);
        TreeMap<String, double[]> counts = counts(rows);
        String[] ids = counts.keySet().toArray(new String[0]);
        BatchEstimate local = spec.estimator().fitAll(EDGES, counts.values().toArray(new double[0][]), ids);

        SparkDensities sd = SparkDensities.of(spec).withBatchSize(7);
        List<Row> five = sd.fromEvents(frame(rows, EVENTS, 5)).orderBy("unit").collectAsList();
        List<Row> one = SparkDensities.of(spec).fromEvents(frame(rows, EVENTS, 1)).orderBy("unit").collectAsList();
        assertEquals(ids.length, five.size());
        for (int i = 0; i < ids.length; i++) {
            Row r = five.get(i);
            assertEquals(ids[i], r.getString(0));
            EstimationDiagnostics g = local.diagnostics().get(i);
            assertArrayEquals(local.densities().get(i).coordinates(), SparkRows.doubles(r, 1), 0.0, ids[i]);
            assertEquals(g.status().name(), r.getString(2));
            assertEquals(g.smoothing(), r.getDouble(4), 0.0);
            assertEquals(g.effectiveDegreesOfFreedom(), r.getDouble(6), 0.0);
            assertEquals(g.total(), r.getDouble(8), 0.0);
            assertEquals(g.iterations(), r.getInt(9));
            assertEquals(g.estimationVariance(), r.getDouble(10), 0.0);
            assertEquals(g.extrapolationShare(), r.getDouble(11), 0.0);
            assertEquals(r, one.get(i), "5 partitions against 1");
        }
        // the skewed unit: 20,000 events aggregated to 20 counts before its fit
        assertEquals(20_000.0, five.get(java.util.Arrays.asList(ids).indexOf("u30")).getDouble(8), 0.0);
    }

    @Test
    void periodsGiveOneDensityPerUnitAndPeriod() {
        List<Row> rows = events(12);
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(SPACE), EDGES);
        List<Row> out = SparkDensities.of(spec).withPeriodColumn("period").fromEvents(frame(rows, EVENTS, 3))
                .orderBy("unit").collectAsList();
        assertEquals(31, out.size());
        for (Row r : out) {
            int u = Integer.parseInt(r.getString(0).substring(1));
            assertEquals(u % 3 == 0 ? "2025" : "2026", r.getString(1));
        }
    }

    static final StructType COUNTS = new StructType().add("unit", DataTypes.StringType, true)
            .add("bin", DataTypes.IntegerType, true).add("count", DataTypes.LongType, true);

    @Test
    void countsGiveTheSingleMachineFitsBitForBit() {
        TreeMap<String, double[]> counts = counts(events(13));
        List<Row> rows = new ArrayList<>();
        for (var e : counts.entrySet()) {
            for (int j = 0; j < e.getValue().length; j++) {
                long c = (long) e.getValue()[j];
                if (c > 0) {
                    // split each count over two rows: the aggregation adds them back
                    rows.add(RowFactory.create(e.getKey(), j, c / 2));
                    rows.add(RowFactory.create(e.getKey(), j, c - c / 2));
                }
            }
        }
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(SPACE), EDGES).withSmoothing(0.5);
        String[] ids = counts.keySet().toArray(new String[0]);
        BatchEstimate local = spec.estimator().fitAll(EDGES, counts.values().toArray(new double[0][]), ids);
        List<Row> out = SparkDensities.of(spec).fromCounts(frame(rows, COUNTS, 4)).orderBy("unit").collectAsList();
        for (int i = 0; i < ids.length; i++) {
            assertArrayEquals(local.densities().get(i).coordinates(), SparkRows.doubles(out.get(i), 1), 0.0, ids[i]);
        }
    }

    /**
     * The reading of empty end runs travels with the spec: a dense unit with empty ends (censored by
     * default) and a sparse one, bit for bit the single-machine fits under the default and under
     * {@code COUNTED}, and the two readings differ for the dense unit.
     */
    @Test
    void emptyEndsReadingTravelsWithTheSpec() {
        double[][] c = new double[2][20];
        for (int j = 4; j < 15; j++) {
            c[0][j] = 100 + 40 * (j % 3); // 1,540 events, 4 empty bins below and 5 above
            c[1][j] = j % 2; // 5 events: sparse
        }
        String[] ids = {"dense", "sparse"};
        List<Row> rows = new ArrayList<>();
        for (int u = 0; u < 2; u++) {
            for (int j = 0; j < 20; j++) {
                if (c[u][j] > 0) {
                    rows.add(RowFactory.create(ids[u], j, (long) c[u][j]));
                }
            }
        }
        EstimatorSpec byDefault = EstimatorSpec.of(SpaceSpec.of(SPACE), EDGES).withSmoothing(0.5);
        EstimatorSpec counted = byDefault.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED);
        double[][] got = new double[2][];
        for (EstimatorSpec spec : new EstimatorSpec[] {byDefault, counted}) {
            BatchEstimate local = spec.estimator().fitAll(EDGES, c, ids);
            List<Row> out = SparkDensities.of(spec).fromCounts(frame(rows, COUNTS, 2)).orderBy("unit").collectAsList();
            for (int i = 0; i < 2; i++) {
                assertArrayEquals(local.densities().get(i).coordinates(), SparkRows.doubles(out.get(i), 1), 0.0, ids[i]);
            }
            got[spec == byDefault ? 0 : 1] = local.densities().get(0).coordinates();
        }
        double gap = 0;
        for (int k = 0; k < got[0].length; k++) {
            gap = Math.max(gap, Math.abs(got[0][k] - got[1][k]));
        }
        org.junit.jupiter.api.Assertions.assertTrue(gap > 0.01, "the readings differ for the dense unit by " + gap);
    }

    @Test
    void badInputFailsWithDensasMessageNamingTheUnit() {
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(SPACE), EDGES);
        SparkSession s = SparkTestSession.get();
        IllegalArgumentException nullUnit = assertThrows(IllegalArgumentException.class, () -> SparkDensities.of(spec)
                .fromEvents(s.createDataFrame(List.of(RowFactory.create("a", 1.0, null),
                        RowFactory.create(null, 2.5, null)), EVENTS)));
        assertTrue(nullUnit.getMessage().startsWith("an event has a null unit id (value 2.5)"), nullUnit.getMessage());

        IllegalArgumentException outside = assertThrows(IllegalArgumentException.class, () -> SparkDensities.of(spec)
                .fromEvents(s.createDataFrame(List.of(RowFactory.create("a", 1.0, null),
                        RowFactory.create("b7", 10.5, null)), EVENTS)));
        assertTrue(outside.getMessage().startsWith("unit 'b7': value 10.5 lies outside the bin layout [0.0, 10.0]"),
                outside.getMessage());

        IllegalArgumentException negative = assertThrows(IllegalArgumentException.class, () -> SparkDensities.of(spec)
                .fromCounts(s.createDataFrame(List.of(RowFactory.create("a", 1, 3L),
                        RowFactory.create("c3", 4, -2L)), COUNTS)));
        assertTrue(negative.getMessage().startsWith("unit 'c3', bin 4: count -2.0 is negative"), negative.getMessage());

        IllegalArgumentException bin = assertThrows(IllegalArgumentException.class, () -> SparkDensities.of(spec)
                .fromCounts(s.createDataFrame(List.of(RowFactory.create("d9", 20, 1L)), COUNTS)));
        assertTrue(bin.getMessage().startsWith("unit 'd9': bin 20 lies outside the layout; its 20 bins are numbered"
                + " 0..19"), bin.getMessage());
    }

    static final StructType NAMED_EVENTS = new StructType().add("district", DataTypes.StringType, true)
            .add("age", DataTypes.DoubleType, true).add("w", DataTypes.DoubleType, true);
    static final StructType NAMED_COUNTS = new StructType().add("district", DataTypes.StringType, true)
            .add("age_band", DataTypes.IntegerType, true).add("n", DataTypes.LongType, true);

    /**
     * Columns named as the caller's table names them, and event weights: the weighted bin sums
     * (weights 0.5, 1, 1.5, 2, whose sums are exact in any order) fitted on one machine are the
     * Spark fits bit for bit; counts under other column names likewise; a negative weight fails
     * naming the unit.
     */
    @Test
    void namedColumnsAndWeightsGiveTheSingleMachineFits() {
        List<Row> plain = events(14);
        List<Row> rows = new ArrayList<>();
        Bins bins = Bins.of(EDGES);
        TreeMap<String, double[]> weighted = new TreeMap<>();
        for (int i = 0; i < plain.size(); i++) {
            Row r = plain.get(i);
            double w = 0.5 * (1 + i % 4);
            rows.add(RowFactory.create(r.getString(0), r.getDouble(1), w));
            weighted.computeIfAbsent(r.getString(0), k -> new double[bins.count()])[bins.indexOf(r.getDouble(1))] += w;
        }
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(SPACE), EDGES);
        String[] ids = weighted.keySet().toArray(new String[0]);
        BatchEstimate local = spec.estimator().fitAll(EDGES, weighted.values().toArray(new double[0][]), ids);
        SparkDensities named = SparkDensities.of(spec).withUnitColumn("district").withValueColumn("age")
                .withWeightColumn("w");
        List<Row> out = named.fromEvents(frame(rows, NAMED_EVENTS, 3)).orderBy("unit").collectAsList();
        assertEquals(ids.length, out.size());
        for (int i = 0; i < ids.length; i++) {
            assertEquals(ids[i], out.get(i).getString(0));
            assertArrayEquals(local.densities().get(i).coordinates(), SparkRows.doubles(out.get(i), 1), 0.0, ids[i]);
            assertEquals(local.diagnostics().get(i).total(), out.get(i).getDouble(8), 0.0);
        }

        TreeMap<String, double[]> counts = counts(plain);
        List<Row> countRows = new ArrayList<>();
        for (var e : counts.entrySet()) {
            for (int j = 0; j < e.getValue().length; j++) {
                countRows.add(RowFactory.create(e.getKey(), j, (long) e.getValue()[j]));
            }
        }
        BatchEstimate localCounts = spec.estimator().fitAll(EDGES, counts.values().toArray(new double[0][]), ids);
        List<Row> fromCounts = SparkDensities.of(spec).withUnitColumn("district").withCountColumns("age_band", "n")
                .fromCounts(frame(countRows, NAMED_COUNTS, 2)).orderBy("unit").collectAsList();
        for (int i = 0; i < ids.length; i++) {
            assertArrayEquals(localCounts.densities().get(i).coordinates(), SparkRows.doubles(fromCounts.get(i), 1), 0.0,
                    ids[i]);
        }

        IllegalArgumentException negative = assertThrows(IllegalArgumentException.class, () -> named.fromEvents(
                SparkTestSession.get().createDataFrame(List.of(RowFactory.create("a", 1.0, 1.0),
                        RowFactory.create("e5", 2.0, -1.0)), NAMED_EVENTS)));
        assertTrue(negative.getMessage().startsWith("unit 'e5': event with value 2.0 has weight -1.0"),
                negative.getMessage());
    }
}
