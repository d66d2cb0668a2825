package io.densa.spatial.spacetime;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensaException;
import io.densa.spatial.kriging.CrossValidation;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.spatial.variogram.VariogramModel;
import java.util.stream.IntStream;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/** Space–time kriging against spatial kriging, its own definition and Dubrule's identities. */
class SpaceTimeKrigingTest {
    private static final SpaceTimeModel SEPARABLE = SpaceTimeModel.separable(VariogramModel.exponential(1.5, 0.4),
            VariogramModel.exponential(1, 5), 0.1);

    private static SpaceTimeData field(int sites, int periods, SpaceTimeModel m, long seed) {
        return SpaceTimeFields.field(SpaceTimeFields.K10, SpaceTimeFields.panel(sites, periods, seed), m, seed + 1);
    }

    private static int[] rowsAtTime(SpaceTimeData d, double t) {
        return IntStream.range(0, d.size()).filter(i -> d.time(i) == t).toArray();
    }

    private static void assertSameCoordinates(double[] expected, double[] actual, double tol, String what) {
        for (int q = 0; q < expected.length; q++) {
            assertEquals(expected[q], actual[q], tol, what + " coordinate " + q);
        }
    }

    @Test
    void theObservationIsReproducedAtItsLocationAndTime() {
        // kriging is an exact interpolator when the nugget is part of C(0, 0) (Cressie (1993),
        // Statistics for Spatial Data, §3.2.1 — from memory): a unit's observed period comes back
        // with variance 0
        SpaceTimeData d = field(20, 6, SEPARABLE, 11);
        SpaceTimeKriging k = SpaceTimeKriging.ordinary(d, SEPARABLE);
        for (int i : new int[] {0, 37, 119}) {
            SpaceTimePrediction p = k.predict(d.locations().x(i), d.locations().y(i), d.time(i));
            assertSameCoordinates(d.densities().get(i).coordinates(), p.density().coordinates(), 1e-9, "row " + i);
            assertEquals(0, p.variance(), 1e-9, "row " + i);
            assertEquals(1, p.weights()[i], 1e-9);
        }
    }

    @Test
    void oneObservedPeriodGivesSpatialOrdinaryKriging() {
        // with every observation in one period the space-time system is the spatial one with
        // C(h, 0); for the Gneiting class with gamma = 1/2 that is the exponential covariance
        // (Gneiting (2002), JASA 97(458), eq. (14) at u = 0), checked against io.densa.spatial.kriging
        SpaceTimeModel g = SpaceTimeModel.gneiting(1.5, 0.4, 5, 0.7, 0.5, 0.5, 0.1);
        SpaceTimeData d = field(30, 3, g, 21);
        SpaceTimeData one = d.subset(rowsAtTime(d, 1));
        Kriging spatial = Kriging.ordinary(one.locations(), one.densities(),
                VariogramModel.exponential(1.5, 0.4).withNugget(0.1));
        SpaceTimeKriging st = SpaceTimeKriging.ordinary(one, g);
        for (double[] xy : new double[][] {{0.3, 0.6}, {0.9, 0.1}, {1.4, -0.2}}) {
            KrigingPrediction s = spatial.predict(xy[0], xy[1]);
            SpaceTimePrediction p = st.predict(xy[0], xy[1], 1);
            assertSameCoordinates(s.density().coordinates(), p.density().coordinates(), 1e-10, "target " + xy[0]);
            assertEquals(s.variance(), p.variance(), 1e-10 * s.variance());
        }
    }

    @Test
    void aNearZeroTemporalRangeGivesSpatialKrigingOfThatPeriod() {
        // with a temporal range of 1e-6 periods only same-period observations correlate (e^{-3/1e-6}
        // is 0 in double precision), so C is block diagonal by period; ordinary kriging is then simple
        // kriging of the target's period about the GLS mean m = (1'C^-1 Y) / (1'C^-1 1) of all periods,
        // with variance σ²_SK + (1 − 1'λ_SK)² / (1'C^-1 1) (Cressie (1993), Statistics for Spatial
        // Data, §3.2 — from memory; Goldberger (1962), Best linear unbiased prediction in the
        // generalized linear regression model, JASA 57 — from memory). The GLS mean is computed with
        // EJML and the simple kriging by io.densa.spatial.kriging.Kriging.
        SpaceTimeModel m = SpaceTimeModel.separable(VariogramModel.exponential(1.5, 0.4),
                VariogramModel.exponential(1, 1e-6), 0.1);
        SpaceTimeData d = field(15, 5, SEPARABLE, 31);
        int n = d.size(), k = SpaceTimeFields.K10.dimension();
        DMatrixRMaj c = SpaceTimeFields.covariance(m, d.locations(), d.times());
        DMatrixRMaj ones = new DMatrixRMaj(n, 1);
        CommonOps_DDRM.fill(ones, 1);
        DMatrixRMaj w = new DMatrixRMaj(n, 1);
        assertTrue(CommonOps_DDRM.solve(c, ones, w));
        double s = CommonOps_DDRM.elementSum(w);
        double[] mean = new double[k];
        for (int i = 0; i < n; i++) {
            for (int q = 0; q < k; q++) {
                mean[q] += w.get(i) * d.densities().coordinate(i, q) / s;
            }
        }
        SpaceTimeData period = d.subset(rowsAtTime(d, 2));
        Kriging sk = Kriging.simple(period.locations(), period.densities(), SpaceTimeFields.K10.density(mean),
                VariogramModel.exponential(1.5, 0.4).withNugget(0.1));
        SpaceTimeKriging st = SpaceTimeKriging.ordinary(d, m);
        for (double[] xy : new double[][] {{0.25, 0.5}, {0.8, 0.85}}) {
            KrigingPrediction p = sk.predictWithWeights(xy[0], xy[1]);
            double sum = 0;
            for (double l : p.weights()) {
                sum += l;
            }
            SpaceTimePrediction q = st.predict(xy[0], xy[1], 2);
            assertSameCoordinates(p.density().coordinates(), q.density().coordinates(), 1e-9, "target " + xy[0]);
            assertEquals(p.variance() + (1 - sum) * (1 - sum) / s, q.variance(), 1e-9, "variance");
        }
    }

    @Test
    void dubruleLeaveOneOutEqualsRefittingWithoutEachObservation() {
        // Dubrule (1983), Cross validation of kriging in a unique neighborhood, Math. Geol. 15(6):
        // the fast global formulas equal predicting each observation from all the others, done here
        // by a neighbourhood of n − 1 observations that leaves the target out
        SpaceTimeModel g = SpaceTimeModel.gneiting(1.5, 0.4, 3, 0.6, 0.5, 1, 0.1);
        SpaceTimeData d = field(12, 6, g, 41);
        CrossValidation fast = SpaceTimeKriging.ordinary(d, g).crossValidate();
        CrossValidation slow = SpaceTimeKriging.ordinary(d, g, d.size() - 1).crossValidate();
        double[][] ef = fast.errors(), es = slow.errors();
        for (int i = 0; i < d.size(); i++) {
            assertSameCoordinates(es[i], ef[i], 1e-8, "observation " + i);
            assertEquals(slow.krigingVariances()[i], fast.krigingVariances()[i], 1e-9, "variance " + i);
        }
        assertEquals(slow.meanStandardisedSquaredError(), fast.meanStandardisedSquaredError(), 1e-8);
    }

    @Test
    void leaveOneOutResidualsMatchTheirVariancesUnderTheTrueModel() {
        // under the model that generated the field E ||e_i||² = σ²_{-i} (the kriging variance is the
        // error's expected squared norm; Cressie (1993), §3.2 — from memory), so the mean standardised
        // squared error is near 1: with K = 10 each term has variance about 2/K = 0.2, over 600
        // observations the mean's standard deviation is below 0.05 even with correlation: tolerance 0.15
        SpaceTimeData d = field(40, 15, SEPARABLE, 51);
        CrossValidation cv = SpaceTimeKriging.ordinary(d, SEPARABLE).crossValidate();
        assertEquals(1, cv.meanStandardisedSquaredError(), 0.15, cv.toString());
        // scaling every covariance by 2 leaves the weights, so the errors, unchanged and doubles every
        // variance: the standardised error halves (exact up to rounding)
        SpaceTimeModel doubled = SpaceTimeModel.separable(VariogramModel.exponential(3, 0.4),
                VariogramModel.exponential(1, 5), 0.2);
        CrossValidation cv2 = SpaceTimeKriging.ordinary(d, doubled).crossValidate();
        assertEquals(cv.meanSquaredError(), cv2.meanSquaredError(), 1e-10 * cv.meanSquaredError());
        assertEquals(cv.meanStandardisedSquaredError() / 2, cv2.meanStandardisedSquaredError(), 1e-10);
        // a model with ten times too short ranges ignores useful neighbours: larger errors
        SpaceTimeModel short_ = SpaceTimeModel.separable(VariogramModel.exponential(1.5, 0.04),
                VariogramModel.exponential(1, 0.5), 0.1);
        assertTrue(SpaceTimeKriging.ordinary(d, short_).crossValidate().meanSquaredError() > cv.meanSquaredError());
    }

    @Test
    void nextPeriodAtAUnitIsForecastFromItsOwnPast() {
        // a unit's forecast one period ahead weighs its own last observation most when the temporal
        // correlation is strong (the largest covariance C(0, 1) among the data), and its variance lies
        // between 0 (observed) and twice the sill (2 C(0,0): prediction from uncorrelated data)
        SpaceTimeData d = field(20, 8, SEPARABLE, 61);
        SpaceTimeKriging st = SpaceTimeKriging.ordinary(d, SEPARABLE);
        int last = 7 * 20 + 4; // site 4 in period 7
        SpaceTimePrediction p = st.predict(d.locations().x(last), d.locations().y(last), 8);
        double[] w = p.weights();
        int argmax = 0;
        for (int i = 1; i < w.length; i++) {
            if (w[i] > w[argmax]) {
                argmax = i;
            }
        }
        assertEquals(last, argmax);
        assertTrue(p.variance() > 0 && p.variance() < 2 * SEPARABLE.sill(), p.toString());
        double sum = 0;
        for (double l : w) {
            sum += l;
        }
        assertEquals(1, sum, 1e-12);
        // a local neighbourhood of the 30 most correlated observations keeps that weight first
        SpaceTimePrediction local = SpaceTimeKriging.ordinary(d, SEPARABLE, 30).predict(d.locations().x(last),
                d.locations().y(last), 8);
        assertEquals(30, local.neighbours().length);
        assertTrue(IntStream.of(local.neighbours()).anyMatch(i -> i == last));
    }

    @Test
    void badInputAndBreakdownsAreNamed() {
        SpaceTimeData d = field(6, 3, SEPARABLE, 71);
        SpaceTimeKriging st = SpaceTimeKriging.ordinary(d, SEPARABLE);
        assertTrue(assertThrows(IllegalArgumentException.class, () -> st.predict(0.5, 0.5, Double.NaN))
                .getMessage().contains("time"));
        assertThrows(IllegalArgumentException.class, () -> st.predict(Double.NaN, 0.5, 1));
        assertThrows(IllegalArgumentException.class, () -> SpaceTimeKriging.ordinary(d, SEPARABLE, -1));
        // Gaussian margins with ranges far beyond the data and no nugget: numerically singular
        SpaceTimeModel flat = SpaceTimeModel.separable(VariogramModel.gaussian(1, 1e4), VariogramModel.gaussian(1, 1e4),
                0);
        DensaException e = assertThrows(DensaException.class, () -> SpaceTimeKriging.ordinary(d, flat).predict(0.5,
                0.5, 1));
        assertTrue(e.diagnostics(SpaceTimeDiagnostics.class).isPresent());
        assertTrue(e.getMessage().contains("not positive definite"), e.getMessage());
        // inputs are not modified
        double[] before = d.densities().coordinatesRowMajor();
        st.crossValidate();
        assertSameCoordinates(before, d.densities().coordinatesRowMajor(), 0, "data");
    }
}
