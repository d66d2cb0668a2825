package io.densa.io.tables;


import io.densa.io.Bins;
import static io.densa.io.IoTestSupport.rejects;
import static io.densa.io.IoTestSupport.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Raw observations from CSV: samples, binning and the outside-the-range policies. */
class ObservationReaderTest {
    @TempDir
    Path dir;

    private static final String TEXT = "unit,value,w\nA,1.5,1\nB,9.5,2\nA,-3,1\nA,12,0.5\nB,10,1\nA,0,1\n";
    private static final BayesSpace SPACE = BayesSpace.splines(0, 10, 3, 2);

    @Test
    void samplesKeepValuesInFileOrderPerUnit() {
        SampleTable s = ObservationReader.of("unit", "value").withWeight("w")
                .samples(TableSource.csv(write(dir, "o.csv", TEXT)), SPACE, OutsidePolicy.DROP);
        assertArrayEquals(new String[] {"A", "B"}, s.ids());
        assertArrayEquals(new double[] {1.5, 0}, s.values(0));
        assertArrayEquals(new double[] {9.5, 10}, s.values(1));
        assertArrayEquals(new double[][] {{1, 1}, {2, 1}}, s.weights());
        assertEquals(new OutsideReport(OutsidePolicy.DROP, 0, 10, 6, 2, 0, 0), s.outside());
        BatchEstimate est = s.fit(PenalizedLikelihoodEstimator.withDefaults(SPACE).withSmoothing(1));
        BatchEstimate direct = PenalizedLikelihoodEstimator.withDefaults(SPACE).withSmoothing(1)
                .fitAllSamples(new double[][] {{1.5, 0}, {9.5, 10}}, new double[][] {{1, 1}, {2, 1}},
                        new String[] {"A", "B"});
        assertArrayEquals(direct.densities().coordinatesRowMajor(), est.densities().coordinatesRowMajor());
    }

    @Test
    void clampMovesValuesToTheEndsAndCountsThem() {
        SampleTable s = ObservationReader.of("unit", "value")
                .samples(TableSource.csv(write(dir, "o.csv", TEXT)), SPACE, OutsidePolicy.CLAMP);
        assertArrayEquals(new double[] {1.5, 0, 10, 0}, s.values(0));
        assertNull(s.weights());
        assertEquals(1, s.outside().clampedBelow());
        assertEquals(1, s.outside().clampedAbove());
        assertEquals(6, s.outside().kept());
    }

    @Test
    void rejectNamesLineUnitValueAndPolicy() {
        rejects(() -> ObservationReader.of("unit", "value")
                .samples(TableSource.csv(write(dir, "o.csv", TEXT)), SPACE, OutsidePolicy.REJECT),
                "o.csv, line 4, column 'value': value -3.0 of unit 'A' lies outside the domain of the space [0.0,"
                        + " 10.0] and the policy is REJECT", "OutsidePolicy.DROP or CLAMP");
        rejects(() -> ObservationReader.of("unit", "value").withWeight("w")
                .samples(TableSource.csv(write(dir, "n.csv", "unit,value,w\nA,1,-1\n")), SPACE, OutsidePolicy.DROP),
                "line 2, column 'w': weight -1.0 is negative");
        rejects(() -> ObservationReader.of("unit", "value")
                .samples(TableSource.csv(write(dir, "m.csv", "unit,value\nA,\n")), SPACE, OutsidePolicy.DROP),
                "line 2, column 'value': value is missing");
    }

    @Test
    void binningSumsWeightsAndClampsIntoTheEdgeBins() {
        Bins bins = Bins.of(0, 2, 5, 10);
        CountTable t = ObservationReader.of("unit", "value").withWeight("w")
                .counts(TableSource.csv(write(dir, "o.csv", TEXT)), bins, OutsidePolicy.CLAMP);
        // A: 1.5 -> bin 0 (w 1), -3 clamped -> bin 0 (w 1), 12 clamped -> bin 2 (w 0.5), 0 -> bin 0 (w 1)
        assertArrayEquals(new double[] {3, 0, 0.5}, t.counts(0));
        // B: 9.5 -> bin 2 (w 2), 10 = e_D -> last bin, closed (w 1)
        assertArrayEquals(new double[] {0, 0, 3}, t.counts(1));
        assertEquals(1, t.outside().clampedBelow());
        assertEquals(1, t.outside().clampedAbove());
        CountTable dropped = ObservationReader.of("unit", "value")
                .counts(TableSource.csv(write(dir, "o.csv", TEXT)), bins, OutsidePolicy.DROP);
        assertArrayEquals(new double[] {2, 0, 0}, dropped.counts(0));
        assertEquals(2, dropped.outside().dropped());
        rejects(() -> ObservationReader.of("unit", "value")
                .counts(TableSource.csv(write(dir, "o.csv", TEXT)), bins, OutsidePolicy.REJECT),
                "line 4", "outside the range of the bins [0.0, 10.0]", "REJECT");
    }

    @Test
    void binIndexFollowsHalfOpenBinsWithTheLastClosed() {
        Bins b = Bins.of(0, 1, 2.5, 4);
        assertEquals(-1, b.indexOf(-0.0001));
        assertEquals(0, b.indexOf(0));
        assertEquals(0, b.indexOf(Math.nextDown(1.0)));
        assertEquals(1, b.indexOf(1));
        assertEquals(2, b.indexOf(2.5));
        assertEquals(2, b.indexOf(4));
        assertEquals(3, b.indexOf(Math.nextUp(4.0)));
        assertEquals(-1, b.indexOf(Double.NaN));
        // e_j = 0 + j (1 - 0)/10 is one correctly rounded division, so it is the double nearest j/10,
        // the same double as the literal (IEEE 754-2008, §4.3; from memory); the last edge is 1 exactly
        assertArrayEquals(new double[] {0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1},
                Bins.uniform(0, 1, 10).edges());
    }
}
