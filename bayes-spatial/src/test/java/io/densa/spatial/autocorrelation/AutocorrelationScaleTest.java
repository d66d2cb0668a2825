package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.rookLattice;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.SpatialWeights;
import org.junit.jupiter.api.Test;

/**
 * Moran's I, Geary's c and local Moran's I do not depend on the unit of the values, so values near
 * 1e300 or 1e-300 (whose sums of squares over- or underflow) give the statistics of the same
 * values near 1, and are not mistaken for a constant field.
 */
class AutocorrelationScaleTest {
    private static final double[] ONE_TO_NINE = {1, 2, 3, 4, 5, 6, 7, 8, 9};
    private static final double[] SCALES = {1, 1e300, 1.7e308 / 9, 1e-300, 1e-315}; // 1.7e308 · 45/9 overflows

    private static double[] scaled(double s) {
        double[] v = new double[9];
        for (int i = 0; i < 9; i++) {
            v[i] = ONE_TO_NINE[i] * s;
        }
        return v;
    }

    @Test
    void globalStatisticsOnTheRookGridAtEveryScale() {
        // 3 x 3 rook grid, binary weights, values 1..9 row-wise; by hand from the definitions
        // (Moran (1950), Biometrika 37; Geary (1954), The Incorporated Statistician 5 — from memory):
        // z = -4..4, Σz² = 60, S0 = 24; Σ w_ij z_i z_j = 2 (36 + 4) = 80 over the 12 rook pairs, so
        // I = (9/24)(80/60) = 0.5; Σ w_ij (x_i - x_j)² = 2 (6·1 + 6·9) = 120, so c = 8·120/(2·24·60) = 1/3
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        for (double s : SCALES) {
            double[] v = scaled(s);
            MoranI.Result mi = MoranI.test(w, v);
            assertEquals(0.5, mi.statistic(), 1e-12, "Moran's I at scale " + s);
            assertEquals(1.77, mi.kurtosis(), 1e-12, "b2 at scale " + s); // n Σz⁴/(Σz²)² = 9·708/3600
            assertEquals(0.5, MoranI.statistic(w, v), 1e-12);
            GearyC.Result gc = GearyC.test(w, v);
            assertEquals(1.0 / 3, gc.statistic(), 1e-12, "Geary's c at scale " + s);
        }
    }

    @Test
    void localMoranReportsDeviationsInTheValuesUnits() {
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        AutocorrelationOptions o = AutocorrelationOptions.withDefaults().withPermutations(99, 5);
        LocalMoran.Result ref = LocalMoran.test(w, ONE_TO_NINE, o);
        for (double s : new double[] {1e300, 1e-300}) {
            LocalMoran.Result r = LocalMoran.test(w, scaled(s), o);
            double[] stats = LocalMoran.statistics(w, scaled(s));
            for (int i = 0; i < 9; i++) {
                LocalMoran.Unit u = r.units().get(i);
                LocalMoran.Unit e = ref.units().get(i);
                // I_i = z_i Σ_j w_ij z_j / m2 is scale-free (Anselin (1995), Local indicators of spatial
                // association, Geogr. Anal. 27 — from memory); z_i = x_i − 5 in the values' units
                assertEquals(e.statistic(), u.statistic(), 1e-12, "I_" + i);
                assertEquals(e.statistic(), stats[i], 1e-12);
                assertEquals((ONE_TO_NINE[i] - 5) * s, u.deviation(), 1e-12 * 4 * s, "z_" + i);
                assertEquals(e.lag() * s, u.lag(), 1e-12 * 16 * s, "lag_" + i);
                if (i != 4) {
                    // the centre unit's deviation is 0 at scale 1 but rounding-sized at other scales,
                    // so its (degenerate) p-value is left out
                    assertEquals(e.pTwoSided(), u.pTwoSided(), 0);
                    assertEquals(e.quadrant(), u.quadrant());
                }
            }
        }
    }

    @Test
    void densityMoranAtExtremeCoordinateScales() {
        // with K = 1 the density form is the scalar Moran's I of the single coordinate (MoranI's
        // class comment), so coordinates s·(1..9) on the rook grid give I_B = 0.5 at every scale
        BayesSpace k1 = BayesSpace.polynomials(0, 1, 1);
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        for (double s : SCALES) {
            double[][] c = new double[9][];
            for (int i = 0; i < 9; i++) {
                c[i] = new double[] {ONE_TO_NINE[i] * s};
            }
            assertEquals(0.5, MoranI.statistic(w, DensitySet.of(k1, c)), 1e-12, "scale " + s);
        }
    }

    @Test
    void aFieldConstantToRoundingIsStillRejected() {
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        double[] flat = new double[9];
        java.util.Arrays.fill(flat, 1e300);
        flat[4] = 1e300 * (1 + 0x1p-52); // one ulp apart: rounding, not variation
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> MoranI.test(w, flat));
        assertEquals(true, e.getMessage().matches("the values are constant \\(zero variance, all equal to 1.0[0-9]*E300\\);"
                + " the Moran's I test is undefined"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> GearyC.test(w, new double[9]));
    }
}
