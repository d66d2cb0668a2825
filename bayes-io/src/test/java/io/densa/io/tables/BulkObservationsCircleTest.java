package io.densa.io.tables;

import static io.densa.io.IoTestSupport.rejects;
import static io.densa.io.IoTestSupport.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.io.Bins;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The embedded SQL engine on a circle: raw values are reduced modulo the period (x ≡ x + kP, the
 * definition of the circle ℝ/Pℤ) before binning or collecting, giving the counts worked out by hand
 * and the same samples and estimates as the in-memory reader.
 */
class BulkObservationsCircleTest {
    @TempDir
    Path dir;

    private static final BayesSpace CIRCLE = BayesSpace.periodicSplines(0, 365, 4, 8);
    /** 10, 40, …, 340, then 375: twelve bins, the last [340, 375) wraps around the cut point 0 ≡ 365. */
    private static final Bins WRAPPING = Bins.of(10, 40, 70, 100, 130, 160, 190, 220, 250, 280, 310, 340, 375);
    private static final String RAW = "unit,value\na,-3\na,370\na,732\na,2\na,367\na,100\na,465\na,200\n"
            + "b,-265\nb,12.5\nb,742.5\nb,350\nb,-1460\nb,190\nb,100.1\nb,465.1\n";

    @Test
    void histogramsWrapValuesIntoTheBinsAsCountedByHand() {
        Path f = write(dir, "raw.csv", RAW);
        List<CountTable> got = new ArrayList<>();
        BulkSummary s = BulkObservations.of(f, "unit", "value").histograms(WRAPPING, CIRCLE, OutsidePolicy.REJECT,
                got::add);
        assertEquals(1, got.size());
        CountTable t = got.get(0);
        // by hand: a = {362, 5, 2, 2, 2, 100, 100, 200}: five in [340, 375), two in [100, 130), one in [190, 220);
        // b = {100, 12.5, 12.5, 350, 0, 190, 100.1, 100.1}: three in [100, 130), two in [10, 40), two in [340, 375),
        // one in [190, 220)
        double[] a = new double[12];
        a[11] = 5;
        a[3] = 2;
        a[6] = 1;
        double[] b = new double[12];
        b[3] = 3;
        b[0] = 2;
        b[11] = 2;
        b[6] = 1;
        assertArrayEquals(new double[][] {a, b}, t.counts());
        assertEquals(16, s.outside().observations());
        assertEquals(0, s.outside().outside());
        CountTable inMemory = ObservationReader.of("unit", "value").counts(TableSource.csv(f), WRAPPING, CIRCLE,
                OutsidePolicy.REJECT);
        assertArrayEquals(inMemory.counts(), t.counts());
    }

    @Test
    void samplesAreWrappedAsByTheInMemoryReaderAndFitTheSame() {
        Path f = write(dir, "raw.csv", RAW);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(CIRCLE).withSmoothing(5);
        List<SampleTable> got = new ArrayList<>();
        List<BatchEstimate> fits = new ArrayList<>();
        BulkObservations.of(f, "unit", "value").fitSamples(est, OutsidePolicy.DROP, (t, e) -> {
            got.add(t);
            fits.add(e);
        });
        SampleTable mem = ObservationReader.of("unit", "value").samples(TableSource.csv(f), CIRCLE,
                OutsidePolicy.DROP);
        for (int u = 0; u < 2; u++) {
            double[] sorted = mem.values(u);
            Arrays.sort(sorted); // the engine delivers samples sorted by value
            assertArrayEquals(sorted, got.get(0).values(u), 0.0);
        }
        assertArrayEquals(mem.fit(est).densities().coordinatesRowMajor(),
                fits.get(0).densities().coordinatesRowMajor(), 1e-10);
    }

    @Test
    void anInfiniteValueIsAnErrorNamingTheRowWhateverThePolicy() {
        Path f = write(dir, "inf.csv", "unit,value\na,1\na,2\nb,inf\n");
        rejects(() -> BulkObservations.of(f, "unit", "value").histograms(WRAPPING, CIRCLE, OutsidePolicy.DROP, t -> {
        }), "data row 3, column 'value'", "infinite", "every finite value is accepted");
        rejects(() -> BulkObservations.of(f, "unit", "value").samples(CIRCLE, OutsidePolicy.CLAMP, t -> {
        }), "data row 3, column 'value'", "infinite");
    }
}
