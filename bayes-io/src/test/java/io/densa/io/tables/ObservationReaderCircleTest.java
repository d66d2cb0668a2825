package io.densa.io.tables;

import static io.densa.io.IoTestSupport.rejects;
import static io.densa.io.IoTestSupport.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.io.Bins;
import io.densa.io.CircularValues;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Raw observations on a circle: values are reduced modulo the period (x ≡ x + kP, the definition of
 * the circle ℝ/Pℤ) before they become samples or counts, so a bin that wraps around the cut point
 * receives values from both sides of it, and the estimate equals the one from the same values wrapped
 * by hand. The expected bins below are worked out by hand from that definition.
 */
class ObservationReaderCircleTest {
    @TempDir
    Path dir;

    private static final double P = 365;
    private static final BayesSpace CIRCLE = BayesSpace.periodicSplines(0, P, 4, 12);
    /** 10, 20, …, 360, then 375: the last bin [360, 375) wraps around the cut point 0 ≡ 365. */
    private static final Bins WRAPPING = wrappingBins();

    private static Bins wrappingBins() {
        double[] e = new double[37];
        for (int i = 0; i < 36; i++) {
            e[i] = 10 * (i + 1);
        }
        e[36] = 375;
        return Bins.of(e);
    }

    /** Raw values, most outside [0, 365), and the same values reduced by hand into [0, 365). */
    private static final String RAW = "unit,value\nA,-3\nA,370\nA,732\nA,2\nA,367\nB,100\nB,465\nB,-265\nA,365"
            + "\nB,0\nA,-730\nB,12.5\nB,742.5\n";
    private static final String BY_HAND = "unit,value\nA,362\nA,5\nA,2\nA,2\nA,2\nB,100\nB,100\nB,100\nA,0"
            + "\nB,0\nA,0\nB,12.5\nB,12.5\n";

    @Test
    void valuesLandInTheBinOfTheirWrappedValueAndTheWrappingBinTakesBothSides() {
        CountTable t = ObservationReader.of("unit", "value")
                .counts(TableSource.csv(write(dir, "raw.csv", RAW)), WRAPPING, CIRCLE, OutsidePolicy.REJECT);
        // by hand: A = {362, 5, 2, 2, 2, 0, 0} all in the wrapping bin [360, 375) (5, 2, 0 ≡ 370, 367, 365),
        // B = {100, 100, 100} in [100, 110), {0} in the wrapping bin, {12.5, 12.5} in [10, 20)
        double[] a = new double[36];
        a[35] = 7;
        double[] b = new double[36];
        b[9] = 3;
        b[35] = 1;
        b[0] = 2;
        assertArrayEquals(new String[] {"A", "B"}, t.ids());
        assertArrayEquals(a, t.counts()[0]);
        assertArrayEquals(b, t.counts()[1]);
        // the policy never applied: nothing outside, although REJECT was asked for
        assertEquals(13, t.outside().observations());
        assertEquals(0, t.outside().outside());
        CountTable hand = ObservationReader.of("unit", "value")
                .counts(TableSource.csv(write(dir, "hand.csv", BY_HAND)), WRAPPING, CIRCLE, OutsidePolicy.REJECT);
        assertArrayEquals(hand.counts(), t.counts());
    }

    @Test
    void countsEstimateEqualsTheOneFromValuesWrappedByHand() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(CIRCLE).withSmoothing(10);
        BatchEstimate raw = ObservationReader.of("unit", "value")
                .counts(TableSource.csv(write(dir, "raw.csv", RAW)), WRAPPING, CIRCLE, OutsidePolicy.DROP).fit(est);
        BatchEstimate hand = ObservationReader.of("unit", "value")
                .counts(TableSource.csv(write(dir, "hand.csv", BY_HAND)), WRAPPING, CIRCLE, OutsidePolicy.DROP)
                .fit(est);
        assertArrayEquals(hand.densities().coordinatesRowMajor(), raw.densities().coordinatesRowMajor(), 1e-12);
    }

    @Test
    void samplesAreWrappedIntoTheDomainAndFitAsWrappedByHand() {
        String raw = "unit,value\nA,-3\nA,370.25\nA,732\nA,100.1\nA,465.1\nA,-264.9\nA,200\n";
        SampleTable s = ObservationReader.of("unit", "value")
                .samples(TableSource.csv(write(dir, "s.csv", raw)), CIRCLE, OutsidePolicy.REJECT);
        double[] byHand = {362, 5.25, 2, 100.1, 100.1, 100.1, 200};
        // 465.1 − 365 and −264.9 + 365 differ from 100.1 by rounding only
        assertArrayEquals(byHand, s.values(0), 1e-12);
        assertEquals(0, s.outside().outside());
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(CIRCLE).withSmoothing(10);
        BatchEstimate fromFile = s.fit(est);
        BatchEstimate fromHand = est.fitAllSamples(new double[][] {byHand}, null, new String[] {"A"});
        assertArrayEquals(fromHand.densities().coordinatesRowMajor(), fromFile.densities().coordinatesRowMajor(),
                1e-9);
        // the estimator takes raw values modulo the period itself, with the same arithmetic: bit for bit
        BatchEstimate unwrapped = est.fitAllSamples(new double[][] {{-3, 370.25, 732, 100.1, 465.1, -264.9, 200}},
                null, new String[] {"A"});
        assertArrayEquals(unwrapped.densities().coordinatesRowMajor(), fromFile.densities().coordinatesRowMajor());
    }

    @Test
    void badValuesAreStillRejectedNamingLineAndColumn() {
        rejects(() -> ObservationReader.of("unit", "value").samples(
                TableSource.csv(write(dir, "b.csv", "unit,value\nA,1\nA,NaN\n")), CIRCLE, OutsidePolicy.DROP),
                "line 3, column 'value'", "is not a number");
        rejects(() -> ObservationReader.of("unit", "value").counts(
                TableSource.csv(write(dir, "i.csv", "unit,value\nA,1e400\n")), WRAPPING, CIRCLE, OutsidePolicy.CLAMP),
                "line 2, column 'value'", "overflows a double");
        rejects(() -> ObservationReader.of("unit", "value").counts(
                TableSource.csv(write(dir, "m.csv", "unit,value\nA,\n")), WRAPPING, CIRCLE, OutsidePolicy.CLAMP),
                "line 2, column 'value'", "missing");
        // bins that do not span one period are refused before reading
        rejects(() -> ObservationReader.of("unit", "value").counts(
                TableSource.csv(write(dir, "o.csv", RAW)), Bins.uniform(0, 360, 36), CIRCLE, OutsidePolicy.DROP),
                "must span one period 365.0");
        rejects(() -> CircularValues.wrap(Double.POSITIVE_INFINITY, CIRCLE), "cannot be placed on the circle");
    }

    @Test
    void onABoundedSpaceTheSpaceOverloadIsThePlainRead() {
        BayesSpace line = BayesSpace.splines(0, 365, 4, 8);
        Bins bins = Bins.uniform(0, 365, 73);
        for (OutsidePolicy p : new OutsidePolicy[] {OutsidePolicy.DROP, OutsidePolicy.CLAMP}) {
            CountTable plain = ObservationReader.of("unit", "value")
                    .counts(TableSource.csv(write(dir, "r.csv", RAW)), bins, p);
            CountTable given = ObservationReader.of("unit", "value")
                    .counts(TableSource.csv(write(dir, "r.csv", RAW)), bins, line, p);
            assertEquals(plain, given);
            assertEquals(p == OutsidePolicy.DROP ? 8 : 0, given.outside().dropped());
        }
    }
}
