package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import org.junit.jupiter.api.Test;

/** Each kind of bad input fails with a clear message (regexes), numerical failures with diagnostics. */
class BadInputTest {
    final DensitySet data = TestData.independentCoordinates(TestData.K3, 6, 1);
    final VariogramModel model = VariogramModel.exponential(1, 1);

    static void matches(String regex, Throwable e) {
        assertTrue(e.getMessage().matches(regex), "message was: " + e.getMessage());
    }

    @Test
    void coincidentLocationsAreNamedUnlessAllowed() {
        Locations loc = Locations.planar(new double[] {0, 1, 2, 0.5, 1, 3}, new double[] {0, 1, 0, 2, 1, 3});
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults()));
        matches("locations 1 and 4 coincide at \\(1.0, 1.0\\) \\(1 coincident pair\\(s\\) in total\\).*"
                + "withCoincidentNugget", e);
        Kriging k = Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults().withCoincidentNugget(0.01));
        assertTrue(k.predict(1, 1).variance() > 0);
        double[] v = {0, 0.1, 0, 0, 0, 0};
        Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults().withErrorVariances(v)).predict(0.3, 0.3);
    }

    @Test
    void tooFewLocationsForTheDriftOrNeighbourhood() {
        Locations loc = TestData.uniformSquare(6, 1, 2);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Kriging.universal(loc, data, Drift.polynomial(2), model, KrigingOptions.withDefaults()));
        matches("UNIVERSAL kriging with 6 drift function\\(s\\) needs at least 7 locations, got 6", e);
        e = assertThrows(IllegalArgumentException.class, () -> Kriging.universal(loc, data, Drift.polynomial(1),
                model, KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(3))));
        matches("a neighbourhood of at most 3 locations cannot support UNIVERSAL kriging with 3 drift.*need at least 4",
                e);
        Locations one = Locations.planar(new double[] {0}, new double[] {0});
        DensitySet d1 = TestData.independentCoordinates(TestData.K3, 1, 1);
        matches("ORDINARY kriging with 1 drift function\\(s\\) needs at least 2 locations, got 1",
                assertThrows(IllegalArgumentException.class,
                    () -> Kriging.ordinary(one, d1, model, KrigingOptions.withDefaults())));
    }

    @Test
    void nonFiniteCoordinatesAndTargets() {
        matches("location 2 has a non-finite coordinate \\(NaN, 1.0\\)", assertThrows(IllegalArgumentException.class,
                () -> Locations.planar(new double[] {0, 1, Double.NaN}, new double[] {0, 1, 1})));
        Kriging k = Kriging.ordinary(TestData.uniformSquare(6, 1, 3), data, model, KrigingOptions.withDefaults());
        matches("target must be finite, got \\(NaN, 0.0\\)", assertThrows(IllegalArgumentException.class,
                () -> k.predict(Double.NaN, 0)));
    }

    @Test
    void mismatchedSizes() {
        Locations loc = TestData.uniformSquare(7, 1, 4);
        matches("locations \\(7\\) and densities \\(6\\) differ in number", assertThrows(IllegalArgumentException.class,
                () -> Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults())));
        Locations six = TestData.uniformSquare(6, 1, 4);
        matches("error variances have 2 entries but there are 6 locations", assertThrows(
                IllegalArgumentException.class, () -> Kriging.ordinary(six, data, model,
                        KrigingOptions.withDefaults().withErrorVariances(0.1, 0.2))));
        matches("error variance at location 1 must be finite and >= 0, got NaN", assertThrows(
                IllegalArgumentException.class, () -> KrigingOptions.withDefaults().withErrorVariances(0, Double.NaN)));
        matches("drift covariates have 2 rows but there are 6 locations", assertThrows(IllegalArgumentException.class,
                () -> Kriging.universal(six, data, Drift.constant().withCovariates(new double[][] {{1}, {2}}), model,
                        KrigingOptions.withDefaults())));
        Kriging uk = Kriging.universal(six, data, Drift.constant().withCovariates(new double[][] {{1}, {2}, {3}, {4},
            {5}, {6.5}}), model, KrigingOptions.withDefaults());
        matches("the drift has 1 covariate\\(s\\); the target supplies none", assertThrows(
                IllegalArgumentException.class, () -> uk.predict(0.5, 0.5)));
        BayesSpace other = BayesSpace.polynomials(0, 2, 3);
        matches("the mean density lives in .* but .* is required; use space.project.*", assertThrows(
                IllegalArgumentException.class, () -> Kriging.simple(six, data, other.neutral(), model,
                        KrigingOptions.withDefaults())));
        matches("simple kriging needs a bounded variogram model, got .*power.*", assertThrows(
                IllegalArgumentException.class, () -> Kriging.simple(six, data, TestData.K3.neutral(),
                        VariogramModel.power(1, 1), KrigingOptions.withDefaults())));
    }

    @Test
    void illConditionedSystemReportsTheConditionEstimate() {
        // two locations 1e-7 apart under a very smooth Gaussian model: numerically singular
        Locations loc = Locations.planar(new double[] {0, 1e-7, 1, 2, 0.5, 3}, new double[] {0, 0, 1, 0, 2, 3});
        Kriging k = Kriging.ordinary(loc, data, VariogramModel.gaussian(1, 10), KrigingOptions.withDefaults());
        DensaException e = assertThrows(DensaException.class, () -> k.predict(0.5, 0.5));
        assertTrue(e.getMessage().matches("kriging .*of 6 locations is (ill-conditioned \\(condition estimate .*|not"
                + " positive definite).*"), e.getMessage());
        KrigingDiagnostics d = e.diagnostics(KrigingDiagnostics.class).orElseThrow();
        assertEquals(6, d.systemSize());
        assertTrue(d.conditionEstimate() > 1e12, "condition " + d.conditionEstimate());
        Kriging radius = Kriging.ordinary(TestData.uniformSquare(6, 1, 5), data, model,
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.radius(0.01, 5)));
        DensaException few = assertThrows(DensaException.class, () -> radius.predict(5, 5));
        matches("only 0 data location\\(s\\) within radius 0.01 of target \\(5.0, 5.0\\); ORDINARY kriging needs 2", few);
    }
}
