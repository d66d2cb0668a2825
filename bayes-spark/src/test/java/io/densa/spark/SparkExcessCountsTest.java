package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.ExcessCounts;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.junit.jupiter.api.Test;

/**
 * Excess counts in Spark against {@link ExcessCounts} on one machine: each unit's bands, intervals,
 * displaced events and p-value bit for bit when the unit is estimated alone with its own seed
 * ({@link SparkScoring#unitSeed}), for several partitionings, with and without a baseline error;
 * bad rows fail naming the unit.
 */
class SparkExcessCountsTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 10, 4, 4);
    static final double[] EDGES = {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
    static final double[] BANDS = {0, 3, 6, 10};
    static final StructType SCHEMA = new StructType().add("district", DataTypes.StringType, false)
            .add("counts", DataTypes.createArrayType(DataTypes.LongType, false), false)
            .add("baseline", DataTypes.createArrayType(DataTypes.DoubleType, false), false);

    /** Invented units: baselines are smooth bumps, counts drawn from slightly moved bumps (20–400 events). */
    static List<Row> rows(int n, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        List<Row> out = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            double mu = 3 + 4 * rnd.nextDouble();
            double[] c = SPACE.projectLogPdf(x -> -(x - mu) * (x - mu) / 8).density().coordinates();
            double moved = mu + (i % 5 == 0 ? 1.5 : 0);
            long[] counts = new long[10];
            int events = 20 + rnd.nextInt(381);
            for (int e = 0; e < events; e++) {
                double v;
                do {
                    v = moved + 2 * SparkDensitiesTest.gaussian(rnd);
                } while (v < 0 || v >= 10);
                counts[(int) v]++;
            }
            Long[] boxed = new Long[10];
            for (int j = 0; j < 10; j++) {
                boxed[j] = counts[j];
            }
            Double[] b = new Double[c.length];
            for (int j = 0; j < c.length; j++) {
                b[j] = c[j];
            }
            out.add(RowFactory.create("d" + i, java.util.Arrays.asList(boxed), java.util.Arrays.asList(b)));
        }
        return out;
    }

    static double[][] covariance() {
        int k = SPACE.dimension();
        double[][] s = new double[k][k];
        for (int a = 0; a < k; a++) {
            s[a][a] = 0.02;
        }
        return s;
    }

    @Test
    void everyUnitEqualsItsSingleMachineBootstrap() {
        List<Row> data = rows(40, 3);
        for (boolean withError : new boolean[] {false, true}) {
            SparkScoring.Excess spec = SparkScoring.Excess.of(SpaceSpec.of(SPACE), EDGES, BANDS).withDraws(199, 11);
            if (withError) {
                spec = spec.withBaselineCovariance(covariance());
            }
            List<Row> four = SparkScoring.excessCounts(SparkTestSession.get().createDataFrame(data, SCHEMA)
                    .repartition(4), spec, "district", "counts", "baseline").orderBy("district").collectAsList();
            List<Row> one = SparkScoring.excessCounts(SparkTestSession.get().createDataFrame(data, SCHEMA)
                    .repartition(1), spec, "district", "counts", "baseline").orderBy("district").collectAsList();
            assertEquals(40, four.size());
            int small = 0;
            for (int r = 0; r < 40; r++) {
                Row row = four.get(r);
                assertEquals(row, one.get(r), "4 partitions against 1");
                String id = row.getString(0);
                long[] counts = row.getList(1).stream().mapToLong(o -> (Long) o).toArray();
                double[] base = SparkRows.doubles(row, 2);
                ExcessCounts.UnitExcess u = ExcessCounts.withDefaults().withDraws(199, SparkScoring.unitSeed(11, id))
                        .estimate(DensitySet.of(SPACE, new double[][] {base}, new String[] {id}), new long[][] {counts},
                                EDGES, BANDS, withError ? ExcessCounts.BaselineError.common(covariance())
                                        : ExcessCounts.BaselineError.none()).units().get(0);
                for (int t = 0; t < 3; t++) {
                    ExcessCounts.BandExcess b = u.bands().get(t);
                    assertEquals(b.observed(), SparkRows.doubles(row, 3)[t], 0.0);
                    assertEquals(b.expected(), SparkRows.doubles(row, 4)[t], 0.0);
                    assertEquals(b.excess(), SparkRows.doubles(row, 5)[t], 0.0);
                    assertEquals(b.lower(), SparkRows.doubles(row, 6)[t], 0.0);
                    assertEquals(b.upper(), SparkRows.doubles(row, 7)[t], 0.0);
                }
                assertArrayEquals(new double[] {u.displaced().value(), u.displaced().lower(), u.displaced().upper(),
                    u.displaced().noiseMean(), u.displaced().pValue()}, new double[] {row.getDouble(8),
                    row.getDouble(9), row.getDouble(10), row.getDouble(11), row.getDouble(12)}, 0.0, id);
                int i = Integer.parseInt(id.substring(1));
                small += i % 5 == 0 && row.getDouble(12) <= 0.05 ? 1 : 0;
            }
            // the moved units (every fifth) stand out against their baselines
            assertTrue(small >= 6, small + " of 8 moved units with p <= 0.05");
            // the adjusted p-values over all rows are those of Benjamini–Hochberg on one machine
            double[] p = new double[40];
            for (int r = 0; r < 40; r++) {
                p[r] = four.get(r).getDouble(12);
            }
            double[] q = io.densa.core.BenjaminiHochberg.adjust(p);
            for (int r = 0; r < 40; r++) {
                assertEquals(q[r], four.get(r).getDouble(13), 0.0, four.get(r).getString(0));
            }
        }
        assertNotEquals(SparkScoring.unitSeed(11, "d1"), SparkScoring.unitSeed(11, "d2"));
        assertNotEquals(SparkScoring.unitSeed(11, "d1"), SparkScoring.unitSeed(12, "d1"));
    }

    @Test
    void badRowsAndSettingsFailNamingTheUnit() {
        SparkScoring.Excess spec = SparkScoring.Excess.of(SpaceSpec.of(SPACE), EDGES, BANDS).withDraws(99, 1);
        List<Row> data = new ArrayList<>(rows(3, 4));
        data.add(RowFactory.create("d9", java.util.Arrays.asList(1L, 2L, 3L), data.get(0).get(2)));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SparkScoring.excessCounts(
                SparkTestSession.get().createDataFrame(data, SCHEMA), spec, "district", "counts", "baseline"));
        assertTrue(e.getMessage().startsWith("unit 'd9': counts row 0 (d9) has 3 bins, expected 10"), e.getMessage());
        IllegalArgumentException bands = assertThrows(IllegalArgumentException.class, () -> SparkScoring.excessCounts(
                SparkTestSession.get().createDataFrame(rows(2, 5), SCHEMA), SparkScoring.Excess.of(SpaceSpec.of(SPACE),
                        EDGES, new double[] {0, 3.5, 10}), "district", "counts", "baseline"));
        assertTrue(bands.getMessage().contains("bandEdges[1] = 3.5 is not one of the bin edges"), bands.getMessage());
        assertThrows(IllegalArgumentException.class, () -> SparkScoring.excessCounts(
                SparkTestSession.get().createDataFrame(rows(2, 5), SCHEMA), spec, "unit", "counts", "baseline"));
        IllegalArgumentException edges = assertThrows(IllegalArgumentException.class, () -> SparkScoring.excessCounts(
                SparkTestSession.get().createDataFrame(rows(2, 5), SCHEMA), SparkScoring.Excess.of(SpaceSpec.of(SPACE),
                        new double[] {0}, BANDS), "district", "counts", "baseline"));
        assertTrue(edges.getMessage().contains("binEdges needs at least 2 edges"), edges.getMessage());
    }
}
