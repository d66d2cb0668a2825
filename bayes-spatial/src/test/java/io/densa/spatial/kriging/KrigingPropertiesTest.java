package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.IntRange;

/**
 * Properties of kriging that hold for any configuration (common practice; Cressie (1993),
 * Statistics for Spatial Data, §3.2 — from memory): unbiasedness constraint, exact interpolation,
 * non-negative variance, invariance under rigid motions, closure in the data's space.
 */
class KrigingPropertiesTest {
    static VariogramModel model(int which, double range) {
        switch (which) {
            case 0: return VariogramModel.exponential(1.5, range);
            case 1: return VariogramModel.spherical(1.5, range);
            case 2: return VariogramModel.gaussian(1.5, range).withNugget(0.1);
            default: return VariogramModel.matern(1.5, range, 1.5);
        }
    }

    static Kriging ok(Locations loc, DensitySet d, VariogramModel m, Neighbourhood hood) {
        return Kriging.ordinary(loc, d, m, KrigingOptions.withDefaults().withNeighbourhood(hood));
    }

    @Property(tries = 40, seed = "20261201")
    void ordinaryWeightsSumToOneAndVarianceIsNonNegative(@ForAll @IntRange(min = 3, max = 40) int n,
            @ForAll @IntRange(min = 0, max = 3) int which, @ForAll @DoubleRange(min = 0.1, max = 2) double range,
            @ForAll @DoubleRange(min = -0.5, max = 1.5) double tx, @ForAll @DoubleRange(min = -0.5, max = 1.5) double ty,
            @ForAll long seed) {
        Locations loc = TestData.uniformSquare(n, 1, seed);
        DensitySet d = TestData.independentCoordinates(TestData.K3, n, seed + 1);
        for (Neighbourhood hood : new Neighbourhood[] {Neighbourhood.global(), Neighbourhood.nearest(Math.max(2, n / 2))}) {
            KrigingPrediction p = ok(loc, d, model(which, range), hood).predictWithWeights(tx, ty);
            double s = 0;
            for (double w : p.weights()) {
                s += w;
            }
            assertEquals(1, s, 1e-9);
            assertTrue(p.variance() >= 0, "variance " + p.variance());
            assertEquals(TestData.K3, p.density().space());
            // the prediction is Σ λ_i c_i
            double[] c = new double[3];
            for (int r = 0; r < p.neighbours().length; r++) {
                for (int j = 0; j < 3; j++) {
                    c[j] += p.weights()[r] * d.coordinate(p.neighbours()[r], j);
                }
            }
            for (int j = 0; j < 3; j++) {
                assertEquals(c[j], p.density().coordinate(j), 1e-9);
            }
        }
    }

    @Property(tries = 30, seed = "777")
    void exactInterpolationWithoutNugget(@ForAll @IntRange(min = 2, max = 30) int n,
            @ForAll @IntRange(min = 0, max = 1) int which, @ForAll @IntRange(min = 0, max = 2) int kind,
            @ForAll long seed) {
        Locations loc = TestData.uniformSquare(n, 1, seed);
        DensitySet d = TestData.independentCoordinates(TestData.K3, n, seed + 1);
        VariogramModel m = which == 0 ? VariogramModel.exponential(1, 0.7) : VariogramModel.spherical(1, 0.9);
        Kriging kr;
        if (kind == 0) {
            kr = ok(loc, d, m, Neighbourhood.global());
        } else if (kind == 1) {
            kr = Kriging.simple(loc, d, TestData.K3.neutral(), m, KrigingOptions.withDefaults());
        } else {
            kr = n >= 4 ? Kriging.universal(loc, d, Drift.polynomial(1), m, KrigingOptions.withDefaults())
                : ok(loc, d, m, Neighbourhood.nearest(2));
        }
        int i = (int) Math.floorMod(seed, (long) n);
        KrigingPrediction p = kr.predict(loc.x(i), loc.y(i));
        assertTrue(p.density().equalsWithin(d.get(i), 1e-7), "prediction at datum " + i);
        assertEquals(0, p.variance(), 1e-8);
    }

    @Property(tries = 30, seed = "4242")
    void invariantUnderTranslationAndRotation(@ForAll @IntRange(min = 4, max = 25) int n,
            @ForAll @DoubleRange(min = 0, max = 6.28) double angle, @ForAll @DoubleRange(min = -50, max = 50) double dx,
            @ForAll @DoubleRange(min = -50, max = 50) double dy, @ForAll long seed) {
        Locations loc = TestData.uniformSquare(n, 1, seed);
        DensitySet d = TestData.independentCoordinates(TestData.K3, n, seed + 1);
        double c = Math.cos(angle), s = Math.sin(angle);
        double[] x = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = c * loc.x(i) - s * loc.y(i) + dx;
            y[i] = s * loc.x(i) + c * loc.y(i) + dy;
        }
        Locations moved = Locations.planar(x, y);
        double px = 0.3, py = 0.6;
        double qx = c * px - s * py + dx, qy = s * px + c * py + dy;
        VariogramModel m = VariogramModel.exponential(1, 0.8).withNugget(0.05);
        for (int kind = 0; kind < 2; kind++) {
            KrigingPrediction a = kind == 0 ? ok(loc, d, m, Neighbourhood.global()).predict(px, py)
                : Kriging.universal(loc, d, Drift.polynomial(1), m, KrigingOptions.withDefaults()).predict(px, py);
            KrigingPrediction b = kind == 0 ? ok(moved, d, m, Neighbourhood.global()).predict(qx, qy)
                : Kriging.universal(moved, d, Drift.polynomial(1), m, KrigingOptions.withDefaults()).predict(qx, qy);
            assertTrue(a.density().equalsWithin(b.density(), 1e-8), "kind " + kind);
            assertEquals(a.variance(), b.variance(), 1e-8);
        }
    }

    @Property(tries = 20, seed = "99")
    void universalWeightsReproduceTheDrift(@ForAll @IntRange(min = 8, max = 30) int n, @ForAll long seed) {
        Locations loc = TestData.uniformSquare(n, 1, seed);
        DensitySet d = TestData.independentCoordinates(TestData.K3, n, seed + 1);
        KrigingPrediction p = Kriging.universal(loc, d, Drift.polynomial(2), VariogramModel.exponential(1, 0.5),
                KrigingOptions.withDefaults()).predictWithWeights(0.41, 0.77);
        double sx = 0, sy = 0, sxy = 0;
        for (int r = 0; r < n; r++) {
            int i = p.neighbours()[r];
            sx += p.weights()[r] * loc.x(i);
            sy += p.weights()[r] * loc.y(i);
            sxy += p.weights()[r] * loc.x(i) * loc.y(i);
        }
        assertEquals(0.41, sx, 1e-8);
        assertEquals(0.77, sy, 1e-8);
        assertEquals(0.41 * 0.77, sxy, 1e-8);
    }
}
