package io.densa.spatial.spacetime;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import org.junit.jupiter.api.Test;

/**
 * Recovery of known parameters from simulated space–time Gaussian fields of densities (40 sites
 * in the unit square × 15 periods, K = 10 independent coordinate fields, Cholesky simulation with
 * fixed seeds), fitted by Cressie's weighted least squares (Cressie (1985), Math. Geol. 17(5)).
 * Tolerances: about twice the largest deviation from the truth over seeds 1–4 of this design
 * (measured once when the test was written: separable sill −4%..+10%, spatial range −4%..+21%,
 * temporal range −7%..0%, nugget ±0.075; Gneiting sill −4%..+11%, ranges up to 22%, β up to 0.2;
 * product-sum sills up to 13%, spatial range −23%..+34%, k / k_max ±0.09, nugget ±0.12).
 */
class SpaceTimeFittingTest {
    private static final LagBins SPACE = new LagBins(0.08, 8);
    private static final LagBins TIME = new LagBins(1, 8);

    private static SpaceTimeFit fit(SpaceTimeModel truth, long seed) {
        double[][] p = SpaceTimeFields.panel(40, 15, 100 + seed);
        SpaceTimeData d = SpaceTimeFields.field(SpaceTimeFields.K10, p, truth, 200 + seed);
        return SpaceTimeFitting.fit(SpaceTimeVariogram.of(d, SPACE, TIME), truth.kind(),
                SpaceTimeFitOptions.withDefaults());
    }

    @Test
    void separableParametersAreRecovered() {
        SpaceTimeModel truth = SpaceTimeModel.separable(VariogramModel.exponential(1.5, 0.4),
                VariogramModel.exponential(1, 5), 0.1);
        SpaceTimeFit f = fit(truth, 3);
        assertEquals(1.5, f.parameter("partial sill"), 0.3, f.toString());
        assertEquals(0.4, f.parameter("spatial range"), 0.16, f.toString());
        assertEquals(5, f.parameter("temporal range"), 1, f.toString());
        assertEquals(0.1, f.parameter("nugget"), 0.15, f.toString());
        assertTrue(f.atBound().isEmpty(), f.toString());
        assertEquals(VariogramFitOptions.Method.WEIGHTED_CRESSIE, f.method());
        // the fitted curve follows the classes: rmse well below the sill
        assertTrue(f.rmse() < 0.1 * f.model().sill(), f.toString());
    }

    /**
     * A temporal margin of another family, asked for: the fitted temporal structure has that family,
     * its range is recovered, and the curve follows the classes more closely than with the default
     * (exponential) temporal family (measured once: range 4.89 for 5, rmse 0.048 against 0.086).
     */
    @Test
    void aGaussianTemporalMarginIsFittedWhenAskedFor() {
        SpaceTimeModel truth = SpaceTimeModel.separable(VariogramModel.exponential(1.5, 0.4),
                VariogramModel.gaussian(1, 5), 0.1);
        double[][] p = SpaceTimeFields.panel(40, 15, 103);
        SpaceTimeVariogram ev = SpaceTimeVariogram.of(SpaceTimeFields.field(SpaceTimeFields.K10, p, truth, 203), SPACE,
                TIME);
        SpaceTimeFit gaussian = SpaceTimeFitting.fit(ev, SpaceTimeModel.Kind.SEPARABLE,
                SpaceTimeFitOptions.withDefaults().withTemporalFamily(VariogramModel.Family.GAUSSIAN, 0));
        SpaceTimeFit exponential = SpaceTimeFitting.fit(ev, SpaceTimeModel.Kind.SEPARABLE,
                SpaceTimeFitOptions.withDefaults());
        assertEquals(VariogramModel.Family.GAUSSIAN, gaussian.model().temporal().structures().get(0).family());
        assertEquals(VariogramModel.Family.EXPONENTIAL, exponential.model().temporal().structures().get(0).family());
        assertEquals(5, gaussian.parameter("temporal range"), 1.5, gaussian.toString());
        assertTrue(gaussian.rmse() < exponential.rmse(), gaussian + " against " + exponential);
    }

    @Test
    void gneitingParametersAreRecovered() {
        SpaceTimeModel truth = SpaceTimeModel.gneiting(1.5, 0.4, 5, 0.8, 0.5, 0.5, 0.1);
        SpaceTimeFit f = fit(truth, 4);
        assertEquals(1.5, f.parameter("sill"), 0.3, f.toString());
        assertEquals(0.4, f.parameter("spatial range"), 0.16, f.toString());
        assertEquals(5, f.parameter("temporal range"), 2, f.toString());
        assertEquals(0.8, f.parameter("beta"), 0.4, f.toString());
        assertEquals(0.1, f.parameter("nugget"), 0.15, f.toString());
    }

    @Test
    void productSumParametersAreRecovered() {
        // truth k = 0.6 = 0.6 k_max (k_max = 1 / max(1, 0.8)); the temporal range is left unchecked:
        // over seeds 1-4 it ranged from 3.8 to 9.8 for a truth of 5, traded against the temporal sill
        // over only 8 temporal lags
        SpaceTimeModel truth = SpaceTimeModel.productSum(VariogramModel.exponential(1, 0.4),
                VariogramModel.exponential(0.8, 5), 0.6, 0.1);
        SpaceTimeFit f = fit(truth, 2);
        assertEquals(1, f.parameter("spatial sill"), 0.25, f.toString());
        assertEquals(0.8, f.parameter("temporal sill"), 0.2, f.toString());
        assertEquals(0.4, f.parameter("spatial range"), 0.28, f.toString());
        assertEquals(0.6, f.parameter("k fraction"), 0.2, f.toString());
        assertEquals(0.1, f.parameter("nugget"), 0.25, f.toString());
        assertEquals(SpaceTimeModel.Kind.PRODUCT_SUM, f.model().kind());
    }

    /**
     * A unit effect that lasts in time: the spatial margin has a nugget of its own (0.5, structured
     * part exponential(1, 1.2)), the space–time nugget is small (0.05). Fitted with the spatial
     * nugget the fit recovers both and γ(0, u) — how much one site changes from one period to the
     * next — stays near the truth; fitted without it the classes are matched clearly worse (the
     * jump between sites has to go into the space–time nugget or a shortened range). Truth:
     * product-sum of De Cesare, Myers &amp; Posa (2001) with a marginal nugget, simulated with this
     * class's design (seed 5). Measured once: spatial nugget 0.37, nugget 0.067, γ(0, 1) 0.405
     * against 0.411, criterion 52 with against 92 without.
     */
    @Test
    void aLastingUnitEffectGoesIntoTheSpatialNugget() {
        SpaceTimeModel truth = SpaceTimeModel.productSum(VariogramModel.exponential(1, 1.2).withNugget(0.5),
                VariogramModel.exponential(0.8, 5), 0.4, 0.05);
        double[][] p = SpaceTimeFields.panel(40, 15, 105);
        SpaceTimeData d = SpaceTimeFields.field(SpaceTimeFields.K10, p, truth, 205);
        SpaceTimeVariogram ev = SpaceTimeVariogram.of(d, SPACE, TIME);
        SpaceTimeFit with = SpaceTimeFitting.fit(ev, SpaceTimeModel.Kind.PRODUCT_SUM,
                SpaceTimeFitOptions.withDefaults().withSpatialNugget(true));
        SpaceTimeFit without = SpaceTimeFitting.fit(ev, SpaceTimeModel.Kind.PRODUCT_SUM,
                SpaceTimeFitOptions.withDefaults());
        assertEquals(0.5, with.parameter("spatial nugget"), 0.2, with.toString());
        assertEquals(0.05, with.parameter("nugget"), 0.1, with.toString());
        double truth01 = truth.gamma(0, 1);
        assertEquals(truth01, with.model().gamma(0, 1), 0.25 * truth01, with.toString());
        assertTrue(with.criterion() < 0.8 * without.criterion(), with + " vs " + without);
        assertEquals(without.parameters().length + 1, with.parameters().length);
        // the Gneiting class has no spatial margin of its own: the flag changes nothing there
        SpaceTimeFit g1 = SpaceTimeFitting.fit(ev, SpaceTimeModel.Kind.GNEITING,
                SpaceTimeFitOptions.withDefaults().withSpatialNugget(true));
        SpaceTimeFit g0 = SpaceTimeFitting.fit(ev, SpaceTimeModel.Kind.GNEITING, SpaceTimeFitOptions.withDefaults());
        assertEquals(g0.criterion(), g1.criterion(), 0.0);
    }

    @Test
    void aRangeBeyondTheLagsEndsOnItsBoundAndSaysSo() {
        // a spatial practical range of 100 over lags up to 0.64: the classes cannot place it, so the
        // fit runs to the range bound (10 x the largest mean lag) and names it
        SpaceTimeModel truth = SpaceTimeModel.separable(VariogramModel.exponential(1.5, 100),
                VariogramModel.exponential(1, 5), 0.1);
        SpaceTimeFit f = fit(truth, 0);
        assertTrue(f.isAtBound("spatial range"), f.toString());
        assertFalse(f.isAtBound("temporal range"), f.toString());
        assertThrows(IllegalArgumentException.class, () -> f.parameter("no such"));
    }

    @Test
    void tooFewClassesOrNoTemporalLagsAreRejected() {
        double[][] p = SpaceTimeFields.panel(6, 2, 7);
        SpaceTimeData d = SpaceTimeFields.field(SpaceTimeFields.K10, p, SpaceTimeModel.gneiting(1, 0.5, 2, 0.5, 0.5,
                0.5, 0), 8);
        IllegalArgumentException few = assertThrows(IllegalArgumentException.class, () -> SpaceTimeFitting.fit(
                SpaceTimeVariogram.of(d, new LagBins(1, 1), new LagBins(1, 1)), SpaceTimeModel.Kind.PRODUCT_SUM,
                SpaceTimeFitOptions.withDefaults()));
        assertTrue(few.getMessage().contains("at least 7 non-empty lag classes"), few.getMessage());
        SpaceTimeData oneTime = d.subset(0, 1, 2, 3, 4, 5);
        IllegalArgumentException none = assertThrows(IllegalArgumentException.class, () -> SpaceTimeFitting.fit(
                SpaceTimeVariogram.of(oneTime, new LagBins(0.1, 12), new LagBins(1, 1)),
                SpaceTimeModel.Kind.SEPARABLE, SpaceTimeFitOptions.withDefaults()));
        assertTrue(none.getMessage().contains("distinct times"), none.getMessage());
        assertThrows(IllegalArgumentException.class, () -> SpaceTimeFitOptions.withDefaults()
                .withSpatialFamily(VariogramModel.Family.POWER, Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> SpaceTimeFitOptions.withDefaults()
                .withGneitingShapes(0.5, 1.5));
    }
}
