package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.BenjaminiHochberg;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.Design;
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
 * Scoring with a broadcast baseline against {@link AnomalyScoring.Calibrated#score} of all rows on one
 * machine: residual norms, conformal p-values, Benjamini–Hochberg adjusted p-values over the whole
 * dataset, flags and excursions bit for bit, for several partitionings.
 */
class SparkScoringTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 10, 3, 4); // K = 6
    static final int K = 6;

    /** Invented data: x random, y = x G + 0.3 z + noise; rows 5, 20, 40 of the scored set shifted far. */
    record Data(DensitySet y, DensitySet x, double[] z) {
        static Data of(int n, long seed, boolean anomalies) {
            SplittableRandom rnd = new SplittableRandom(seed);
            double[][] x = new double[n][K];
            double[][] y = new double[n][K];
            double[] z = new double[n];
            for (int i = 0; i < n; i++) {
                z[i] = rnd.nextDouble() * 2 - 1;
                for (int j = 0; j < K; j++) {
                    x[i][j] = (1.5 - 0.2 * j) * SparkDensitiesTest.gaussian(rnd);
                }
                for (int j = 0; j < K; j++) {
                    double s = 0.5 * x[i][j] + (j > 0 ? 0.3 * x[i][j - 1] : 0) + 0.3 * z[i] * (j == 0 ? 1 : 0);
                    y[i][j] = 1 - 0.1 * j + s + 0.2 * SparkDensitiesTest.gaussian(rnd);
                }
                if (anomalies && (i == 5 || i == 20 || i == 40)) {
                    y[i][1] += 4;
                }
            }
            return new Data(DensitySet.of(SPACE, y), DensitySet.of(SPACE, x), z);
        }
    }

    static final StructType SCHEMA = new StructType().add("id", DataTypes.StringType, false)
            .add("y", DataTypes.createArrayType(DataTypes.DoubleType, false), false)
            .add("x", DataTypes.createArrayType(DataTypes.DoubleType, false), false)
            .add("z", DataTypes.DoubleType, false);

    static Dataset<Row> frame(Data d, int partitions) {
        List<Row> rows = new ArrayList<>();
        for (int i = 0; i < d.y().size(); i++) {
            rows.add(RowFactory.create(String.format("s%04d", i), d.y().get(i).coordinates(),
                    d.x().get(i).coordinates(), d.z()[i]));
        }
        return SparkTestSession.get().createDataFrame(rows, SCHEMA).repartition(partitions);
    }

    @Test
    void scoresEqualTheSingleMachineReport() {
        Data train = Data.of(150, 1, false);
        Data cal = Data.of(1500, 2, false); // n_cal + 1 >= m / q: flags are possible
        Data test = Data.of(60, 3, true);
        double[] grid = new double[41];
        for (int q = 0; q < grid.length; q++) {
            grid[q] = 0.25 * q;
        }
        BaselineSpec spec = BaselineSpec.builder(SpaceSpec.of(SPACE)).predictor(SpaceSpec.of(SPACE)).covariates("z")
                .truncation(1, 4).crossValidation(5, 7)
                .training(train.y(), List.of(train.x()), new double[][] {train.z()})
                .calibration(cal.y(), List.of(cal.x()), new double[][] {cal.z()})
                .anomaly(0.05, 0.95, grid).build();

        BaselineSpec.Model m = spec.model();
        Design d = Design.builder().rows(60).numeric("z", test.z()).build();
        DensitySet residuals = m.fit().residuals(List.of(test.x()), d, test.y());
        AnomalyScoring.Report report = m.calibrated().score(residuals);
        assertTrue(report.flaggedCount() >= 3, "the shifted rows are flagged: " + report.flaggedCount());

        String[] preds = {"x"};
        String[] covs = {"z"};
        Dataset<Row> four = SparkScoring.score(frame(test, 4), spec, "y", preds, covs);
        List<Row> rows = four.orderBy("id").collectAsList();
        List<Row> one = SparkScoring.score(frame(test, 1), spec, "y", preds, covs).orderBy("id").collectAsList();
        four.unpersist();
        int flagged = 0;
        for (int i = 0; i < 60; i++) {
            Row r = rows.get(i);
            AnomalyScoring.UnitScore u = report.units().get(i);
            assertEquals(u.residualNorm(), r.getDouble(4), 0.0);
            assertEquals(u.pValue(), r.getDouble(5), 0.0);
            assertEquals(u.adjustedPValue(), r.getDouble(6), 0.0, "row " + i);
            assertEquals(u.flagged(), r.getBoolean(7));
            List<Row> ex = r.getList(8);
            assertEquals(u.excursions().size(), ex.size(), "row " + i);
            for (int e = 0; e < ex.size(); e++) {
                AnomalyScoring.Excursion x = u.excursions().get(e);
                assertEquals(x.from(), ex.get(e).getDouble(0), 0.0);
                assertEquals(x.to(), ex.get(e).getDouble(1), 0.0);
                assertEquals(x.direction().name(), ex.get(e).getString(2));
                assertEquals(x.extreme(), ex.get(e).getDouble(3), 0.0);
            }
            flagged += r.getBoolean(7) ? 1 : 0;
            assertEquals(r, one.get(i), "4 partitions against 1");
        }
        assertEquals(report.flaggedCount(), flagged);
        assertTrue(rows.get(5).getBoolean(7) && rows.get(20).getBoolean(7) && rows.get(40).getBoolean(7));
    }

    @Test
    void distributedAdjustmentIsBenjaminiHochbergWithTies() {
        // p-values with ties, as conformal p-values have them; reference: BenjaminiHochberg.adjust
        // (the step-up of Benjamini & Hochberg (1995), J. R. Stat. Soc. B 57(1))
        double[] p = {0.01, 0.04, 0.04, 0.2, 0.01, 0.5, 0.04, 1.0, 0.03, 0.2};
        double[] ref = BenjaminiHochberg.adjust(p);
        java.util.TreeMap<Double, Long> counts = new java.util.TreeMap<>();
        for (double v : p) {
            counts.merge(v, 1L, Long::sum);
        }
        List<Row> rows = new ArrayList<>();
        counts.forEach((v, c) -> rows.add(RowFactory.create(v, c)));
        java.util.Collections.reverse(rows);
        double[][] table = SparkScoring.adjustment(rows);
        for (int i = 0; i < p.length; i++) {
            assertEquals(ref[i], table[1][java.util.Arrays.binarySearch(table[0], p[i])], 0.0, "p = " + p[i]);
        }
    }
}
