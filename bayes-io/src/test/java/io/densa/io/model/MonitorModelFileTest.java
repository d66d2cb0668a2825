package io.densa.io.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.BaselineMonitor;
import io.densa.regression.surveillance.Period;
import io.densa.regression.surveillance.PeriodReport;
import io.densa.regression.surveillance.RollingBaseline;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * A surveillance monitor saved and loaded scores, updates and records alerts exactly as the one
 * saved: compared on raw IEEE 754 bits. Invented data (seeded).
 */
class MonitorModelFileTest {
    static final BayesSpace SPACE = BayesSpace.polynomials(0, 1, 3);

    static List<Period> periods(int count, long seed, boolean withCounts) {
        Random r = new Random(seed);
        int n = 25;
        int k = SPACE.dimension();
        String[] ids = new String[n];
        Arrays.setAll(ids, i -> "d" + i);
        double[][] u = new double[n][1];
        for (double[] row : u) {
            row[0] = r.nextGaussian();
        }
        double[][] prev = new double[n][k];
        double[] edges = {0, 0.25, 0.5, 0.75, 1};
        List<Period> out = new ArrayList<>();
        for (int t = 0; t < count; t++) {
            double[][] y = new double[n][k];
            double[] v = new double[n];
            long[][] counts = new long[n][4];
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < k; j++) {
                    y[i][j] = 0.5 * prev[i][j] + 0.3 * u[i][0] + 0.3 * r.nextGaussian() + (t == count - 1 && i < 3 ? 2 : 0);
                }
                v[i] = 0.01 + 0.05 * r.nextDouble();
                for (int b = 0; b < 4; b++) {
                    counts[i][b] = 20 + r.nextInt(40);
                }
            }
            out.add(new Period(t, DensitySet.of(SPACE, y, ids), u, v, withCounts ? counts : null,
                    withCounts ? edges : null));
            prev = y;
        }
        return out;
    }

    static void assertSameReport(PeriodReport a, PeriodReport b) {
        for (int i = 0; i < a.scores().units().size(); i++) {
            assertEquals(Double.doubleToRawLongBits(a.scores().units().get(i).pValue()),
                    Double.doubleToRawLongBits(b.scores().units().get(i).pValue()), "p-value " + i);
            assertEquals(a.flagged(i), b.flagged(i));
            assertEquals(Double.doubleToRawLongBits(a.displacedEvents(i)), Double.doubleToRawLongBits(b.displacedEvents(i)));
            if (a.excess() != null) {
                assertEquals(a.excess().units().get(i), b.excess().units().get(i), "excess counts " + i);
            }
        }
        double[] ea = a.expected().coordinatesRowMajor();
        double[] eb = b.expected().coordinatesRowMajor();
        for (int j = 0; j < ea.length; j++) {
            assertEquals(Double.doubleToRawLongBits(ea[j]), Double.doubleToRawLongBits(eb[j]), "expected " + j);
        }
    }

    @Test
    void monitorRoundTripsBitForBit() {
        List<Period> all = periods(16, 11, true);
        for (RollingBaseline cfg : List.of(RollingBaseline.withDefaults().withDraws(199, 3),
                RollingBaseline.withDefaults().withWindow(4).withLags(2).withDraws(199, 4),
                RollingBaseline.withDefaults().withForgetting(0.9).withCalibrationPeriods(3).withDraws(199, 5),
                RollingBaseline.withDefaults().withLagSet(4, 1).withCalibrationPeriods(2).withDraws(199, 6),
                RollingBaseline.withDefaults().withFlaggedKeptOutOfCalibration(true).withCalibrationPeriods(3)
                        .withDraws(199, 8),
                RollingBaseline.withDefaults().withExcessBands(0, 0.5, 1).withDraws(199, 9))) {
            BaselineMonitor m = cfg.fit(all.subList(0, 10)).absorb(all.get(10)).absorb(all.get(11));
            BaselineMonitor back = ModelFile.fromBytes(ModelFile.toBytes(m), BaselineMonitor.class, ModelLimits.defaults(),
                    "test");
            assertEquals(m.history(), back.history());
            assertEquals(m.configuration().toString(), back.configuration().toString());
            for (int t = 12; t < 16; t++) {
                assertSameReport(m.score(all.get(t)), back.score(all.get(t)));
                m = m.absorb(all.get(t));
                back = back.absorb(all.get(t));
                assertEquals(m.history(), back.history());
            }
            double[] a = m.coefficients();
            double[] b = back.coefficients();
            for (int j = 0; j < a.length; j++) {
                assertEquals(Double.doubleToRawLongBits(a[j]), Double.doubleToRawLongBits(b[j]));
            }
        }
    }

    /**
     * A file written before lag sets, left-out calibration residuals, excess bands and displaced
     * events existed (no {@code lagSet}, {@code flaggedKeptOutOfCalibration}, {@code excessBands},
     * {@code calibrationKept} member; {@code cumulativeExcess} in place of {@code cumulativeDisplaced})
     * reads as lags 1..L with every calibration residual used, one excess band per bin and the old
     * history's values, as docs/model-format.md specifies; a {@code lags} that is not the longest lag
     * of {@code lagSet} is refused.
     */
    @Test
    void lagSetMemberIsOptionalAndChecked() throws Exception {
        List<Period> all = periods(12, 13, true);
        BaselineMonitor m = RollingBaseline.withDefaults().withLags(2).withDraws(199, 7).fit(all.subList(0, 10));
        String payload = new String(HostileModelFileTest.payloadOf(ModelFile.toBytes(m)), StandardCharsets.UTF_8);
        assertTrue(payload.contains("\"lags\":2,\"lagSet\":{"), payload.substring(0, 200));
        String old = payload.replaceFirst("\"lagSet\":\\{[^}]*\\},", "")
                .replaceFirst(",\"flaggedKeptOutOfCalibration\":false", "").replaceFirst(",\"excessBands\":null", "")
                .replaceFirst("\"cumulativeDisplaced\"", "\"cumulativeExcess\"")
                .replaceFirst(",\"calibrationKept\":\\{[^}]*\\}", "");
        assertTrue(!old.contains("lagSet") && !old.contains("Kept") && !old.contains("excessBands")
                && old.contains("cumulativeExcess") && !old.contains("Displaced"), old.substring(0, 300));
        BaselineMonitor back = ModelFile.fromBytes(HostileModelFileTest.envelope("baseline-monitor", old),
                BaselineMonitor.class, ModelLimits.defaults(), "test");
        assertArrayEquals(new int[] {1, 2}, back.configuration().lagSet());
        assertEquals(null, back.configuration().excessBands());
        assertEquals(m.history(), back.history());
        assertSameReport(m.score(all.get(10)), back.score(all.get(10)));
        String bad = payload.replaceFirst("\"lags\":2,", "\"lags\":3,");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ModelFile.fromBytes(HostileModelFileTest.envelope("baseline-monitor", bad), BaselineMonitor.class,
                        ModelLimits.defaults(), "test"));
        assertTrue(e.getMessage().contains("longest lag"), e.getMessage());
    }

    /**
     * The estimator's reading of empty ends is stored; a file written before the setting existed
     * (no {@code emptyEnds} member) reads as {@code COUNTED}, the reading it was fitted with, as
     * docs/model-format.md specifies.
     */
    @Test
    void emptyEndsMemberIsOptional() throws Exception {
        BayesSpace space = BayesSpace.splines(0, 10, 4, 6);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.CENSORED);
        String payload = new String(HostileModelFileTest.payloadOf(ModelFile.toBytes(est)), StandardCharsets.UTF_8);
        assertTrue(payload.contains("\"emptyEnds\":\"CENSORED\""), payload);
        PenalizedLikelihoodEstimator back = ModelFile.fromBytes(
                HostileModelFileTest.envelope("penalized-likelihood-estimator", payload),
                PenalizedLikelihoodEstimator.class, ModelLimits.defaults(), "test");
        assertEquals(est.settings(), back.settings());
        String old = payload.replaceFirst(",\"emptyEnds\":\"CENSORED\"", "");
        assertTrue(!old.contains("emptyEnds"), old);
        PenalizedLikelihoodEstimator before = ModelFile.fromBytes(
                HostileModelFileTest.envelope("penalized-likelihood-estimator", old),
                PenalizedLikelihoodEstimator.class, ModelLimits.defaults(), "test");
        assertEquals(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED, before.emptyEnds());
        assertEquals(est.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED).settings(), before.settings());
    }

    /** A re-signed file whose members do not fit together is refused, naming the problem. */
    @Test
    void inconsistentMonitorFileIsRefused() throws Exception {
        List<Period> all = periods(10, 12, false);
        BaselineMonitor m = RollingBaseline.withDefaults().fit(all);
        String payload = new String(HostileModelFileTest.payloadOf(ModelFile.toBytes(m)), StandardCharsets.UTF_8);
        // one covariate more than the moments were built for
        String bad = payload.replaceFirst("\"covariates\":1", "\"covariates\":2");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ModelFile.fromBytes(HostileModelFileTest.envelope("baseline-monitor", bad), BaselineMonitor.class,
                        ModelLimits.defaults(), "test"));
        assertTrue(e.getMessage().contains("momentsZZ"), e.getMessage());
    }
}
