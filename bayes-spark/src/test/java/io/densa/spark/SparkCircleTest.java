package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import java.util.List;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.junit.jupiter.api.Test;

/**
 * Events on a circle in a Spark job: raw values are reduced modulo the period (x ≡ x + kP, the
 * definition of the circle ℝ/Pℤ) before binning, so values far outside the layout land in the bin of
 * their wrapped value and the wrapping bin receives values from both sides of the cut point; the
 * estimate equals the single-machine fit of the counts worked out by hand, bit for bit.
 */
class SparkCircleTest {
    private static final BayesSpace CIRCLE = BayesSpace.periodicSplines(0, 365, 4, 8);
    /** 10, 40, …, 340, then 375: twelve bins, the last [340, 375) wraps around the cut point 0 ≡ 365. */
    private static final double[] EDGES = {10, 40, 70, 100, 130, 160, 190, 220, 250, 280, 310, 340, 375};

    @Test
    void rawValuesAreWrappedBeforeBinningAndFitAsCountedByHand() {
        List<Row> rows = List.of(
                RowFactory.create("a", -3.0, null), RowFactory.create("a", 370.0, null),
                RowFactory.create("a", 732.0, null), RowFactory.create("a", 2.0, null),
                RowFactory.create("a", 367.0, null), RowFactory.create("a", 100.0, null),
                RowFactory.create("a", 465.0, null), RowFactory.create("a", 200.0, null),
                RowFactory.create("b", -265.0, null), RowFactory.create("b", 12.5, null),
                RowFactory.create("b", 742.5, null), RowFactory.create("b", 350.0, null),
                RowFactory.create("b", -1460.0, null), RowFactory.create("b", 190.0, null));
        // by hand: a = {362, 5, 2, 2, 2, 100, 100, 200}: five in [340, 375), two in [100, 130), one in [190, 220);
        // b = {100, 12.5, 12.5, 350, 0, 190}: one in [100, 130), two in [10, 40), two in [340, 375), one in [190, 220)
        double[][] byHand = new double[2][12];
        byHand[0][11] = 5;
        byHand[0][3] = 2;
        byHand[0][6] = 1;
        byHand[1][3] = 1;
        byHand[1][0] = 2;
        byHand[1][11] = 2;
        byHand[1][6] = 1;
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(CIRCLE), EDGES).withSmoothing(5);
        BatchEstimate local = spec.estimator().fitAll(EDGES, byHand, new String[] {"a", "b"});
        List<Row> out = SparkDensities.of(spec).fromEvents(SparkDensitiesTest.frame(rows, SparkDensitiesTest.EVENTS, 2))
                .orderBy("unit").collectAsList();
        assertEquals(2, out.size());
        for (int i = 0; i < 2; i++) {
            assertArrayEquals(local.densities().get(i).coordinates(), SparkRows.doubles(out.get(i), 1), 0.0);
            assertEquals(local.diagnostics().get(i).total(), out.get(i).getDouble(8), 0.0);
        }
    }

    @Test
    void aNonFiniteValueFailsNamingTheUnit() {
        EstimatorSpec spec = EstimatorSpec.of(SpaceSpec.of(CIRCLE), EDGES).withSmoothing(5);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SparkDensities.of(spec)
                .fromEvents(SparkTestSession.get().createDataFrame(List.of(RowFactory.create("a", 1.0, null),
                        RowFactory.create("c4", Double.NaN, null)), SparkDensitiesTest.EVENTS)));
        assertTrue(e.getMessage().startsWith("unit 'c4': value NaN cannot be placed on the circle of period 365.0"),
                e.getMessage());
    }
}
