package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.Fpca;
import io.densa.regression.Scores;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.commons.math3.stat.correlation.Covariance;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;

/**
 * FPCA by tree aggregation against Commons Math's sample covariance and the single-machine
 * {@link Fpca#fit} (within 1e-12 relative), several partitions against one, and scores bit for bit
 * against {@link Fpca#scores} with the same fit.
 */
class SparkFpcaTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 4); // K = 7
    static final StructType SCHEMA = new StructType().add("id", DataTypes.StringType, false)
            .add("coordinates", DataTypes.createArrayType(DataTypes.DoubleType, false), false);

    /** Invented coordinates: 800 rows, a mean far from 0 and standard deviations 3, 2, 1.3, 0.8, 0.5, 0.3, 0.2. */
    static double[][] coordinates() {
        SplittableRandom rnd = new SplittableRandom(21);
        double[] sd = {3, 2, 1.3, 0.8, 0.5, 0.3, 0.2};
        double[][] c = new double[800][7];
        for (double[] row : c) {
            for (int j = 0; j < 7; j++) {
                row[j] = 5 - j + sd[j] * SparkDensitiesTest.gaussian(rnd);
            }
        }
        return c;
    }

    static Dataset<Row> frame(double[][] c, int partitions) {
        List<Row> rows = new ArrayList<>();
        for (int i = 0; i < c.length; i++) {
            rows.add(RowFactory.create(String.format("r%04d", i), c[i]));
        }
        return SparkTestSession.get().createDataFrame(rows, SCHEMA).repartition(partitions);
    }

    static double maxAbs(double[] a) {
        double m = 0;
        for (double v : a) {
            m = Math.max(m, Math.abs(v));
        }
        return m;
    }

    @Test
    void momentsAgreeWithCommonsMathAndTheSingleMachineFpca() {
        double[][] c = coordinates();
        FpcaSpec five = SparkFpca.fit(frame(c, 5), "coordinates", SpaceSpec.of(SPACE));
        FpcaSpec one = SparkFpca.fit(frame(c, 1), "coordinates", SpaceSpec.of(SPACE));
        assertEquals(800, five.size());
        // reference: Apache Commons Math 3.6.1, Covariance (bias-corrected sample covariance)
        double[][] ref = new Covariance(c).getCovarianceMatrix().getData();
        double[] cov = five.covariance();
        double scale = maxAbs(cov);
        for (int a = 0; a < 7; a++) {
            for (int b = 0; b < 7; b++) {
                assertEquals(ref[a][b], cov[a * 7 + b], 1e-12 * scale, "(" + a + ", " + b + ")");
                assertEquals(cov[a * 7 + b], one.covariance()[a * 7 + b], 1e-12 * scale, "5 against 1 partition");
            }
        }
        DensitySet set = DensitySet.of(SPACE, c);
        Fpca local = Fpca.fit(set);
        double[] mean = local.mean().coordinates();
        assertArrayEquals(mean, five.mean(), 1e-12 * maxAbs(mean));
        assertArrayEquals(mean, one.mean(), 1e-12 * maxAbs(mean));
        double[] ev = local.eigenvalues();
        assertArrayEquals(ev, five.fpca().eigenvalues(), 1e-12 * ev[0]);
        // components of separated eigenvalues (ratios ≥ 1.5): the same up to 1e-12 relative
        for (int j = 0; j < 7; j++) {
            assertArrayEquals(local.componentCoordinates(j), five.fpca().componentCoordinates(j), 1e-11, "component " + j);
        }
    }

    @Test
    void scoresAreTheSingleMachineScoresBitForBit() {
        double[][] c = coordinates();
        FpcaSpec fit = SparkFpca.fit(frame(c, 3), "coordinates", SpaceSpec.of(SPACE));
        List<Row> rows = SparkErrors.run(() -> SparkFpca.scores(frame(c, 3), "coordinates", fit, 3, "scores")
                .orderBy("id").collectAsList());
        Scores z = fit.fpca().scores(DensitySet.of(SPACE, c), 3);
        Scores zLocal = Fpca.fit(DensitySet.of(SPACE, c)).scores(DensitySet.of(SPACE, c), 3);
        for (int i = 0; i < c.length; i++) {
            double[] s = SparkRows.doubles(rows.get(i), 2);
            for (int j = 0; j < 3; j++) {
                assertEquals(z.get(i, j), s[j], 0.0);
                assertEquals(zLocal.get(i, j), s[j], 1e-11 * 10);
            }
            assertArrayEquals(c[i], SparkRows.doubles(rows.get(i), 1), 0.0, "input columns are kept");
        }
    }

    @Test
    void badRowsFailWithAMessage() {
        double[][] c = coordinates();
        c[17] = new double[] {1, 2, 3};
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SparkFpca.fit(frame(c, 2), "coordinates", SpaceSpec.of(SPACE)));
        assertTrue(e.getMessage().startsWith("a coordinate row has 3 entries; the space has dimension 7"), e.getMessage());
    }
}
