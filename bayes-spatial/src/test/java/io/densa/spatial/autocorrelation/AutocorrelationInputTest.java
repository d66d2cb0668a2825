package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.rookLattice;
import static io.densa.spatial.Lattices.squareLattice;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.GeometryFactory;

/** Bad input fails fast with a message that says what, where and what would be accepted. */
class AutocorrelationInputTest {
    private static final SpatialWeights GRID = SpatialWeights.fromNeighbours(rookLattice(3, 3));
    private static final AutocorrelationOptions PERM = AutocorrelationOptions.withDefaults().withPermutations(9, 1);

    private static void fails(String regex, Executable e) {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, e);
        assertTrue(ex.getMessage().matches(regex), "message was: " + ex.getMessage());
    }

    @Test
    void nanValueIsNamedByUnit() {
        double[] v = {1, 2, 3, Double.NaN, 5, 6, 7, 8, 9};
        String re = "value of unit 3 is NaN; every value must be finite";
        fails(re, () -> MoranI.test(GRID, v));
        fails(re, () -> MoranI.statistic(GRID, v));
        fails(re, () -> GearyC.test(GRID, v));
        fails(re, () -> LocalMoran.test(GRID, v, PERM));
        double[] inf = {1, 2, 3, 4, 5, 6, 7, Double.POSITIVE_INFINITY, 9};
        fails("value of unit 7 is Infinity.*", () -> GearyC.statistic(GRID, inf));
    }

    @Test
    void sizeMismatch() {
        String re = "values has 8 entries but the weights have 9 units.*";
        double[] v = {1, 2, 3, 4, 5, 6, 7, 8};
        fails(re, () -> MoranI.test(GRID, v));
        fails(re, () -> GearyC.test(GRID, v));
        fails(re, () -> LocalMoran.test(GRID, v, PERM));
        DensitySet d = DensitySet.of(BayesSpace.polynomials(0, 1, 1), new double[][] {{1}, {2}, {3}});
        fails("the density set has 3 densities but the weights have 9 units.*", () -> MoranI.test(GRID, d, PERM));
    }

    @Test
    void constantField() {
        double[] v = new double[9];
        java.util.Arrays.fill(v, 0.1);
        String re = "the values are constant \\(zero variance.*\\); .* is undefined";
        fails(re, () -> MoranI.test(GRID, v));
        fails(re, () -> GearyC.test(GRID, v));
        fails(re, () -> LocalMoran.test(GRID, v, PERM));
        double[][] same = new double[9][];
        for (int i = 0; i < 9; i++) {
            same[i] = new double[] {0.3, -0.2};
        }
        DensitySet d = DensitySet.of(BayesSpace.polynomials(0, 1, 2), same);
        fails("all densities are equal \\(zero B2 variance\\).*", () -> MoranI.test(GRID, d, PERM));
    }

    @Test
    void tooFewUnits() {
        SpatialWeights three = SpatialWeights.fromNeighbours(new int[][] {{1}, {0, 2}, {1}});
        double[] v = {1, 2, 4};
        fails("the Moran's I test needs at least 4 units, got 3", () -> MoranI.test(three, v));
        fails("the Geary's c test needs at least 4 units, got 3", () -> GearyC.test(three, v));
        SpatialWeights two = SpatialWeights.fromNeighbours(new int[][] {{1}, {0}});
        fails("local Moran's I needs at least 3 units, got 2", () -> LocalMoran.test(two, new double[] {1, 2}, PERM));
        fails("spatial weights need at least 2 units, got 1", () -> SpatialWeights.fromMatrix(new double[][] {{0}}));
    }

    @Test
    void islandsNamedAndPolicyOffered() {
        SpatialWeights w = SpatialWeights.fromNeighbours(new int[][] {{1}, {0}, {}, {4}, {3}, {}});
        fails("units 2, 5 have no neighbours \\(islands\\); .*withIslandPolicy\\(EXCLUDE\\)",
                () -> MoranI.test(w, new double[] {1, 2, 3, 4, 5, 6}));
    }

    @Test
    void localMoranNeedsPermutations() {
        fails("local Moran's I needs permutations.*withPermutations\\(999, seed\\)",
                () -> LocalMoran.test(GRID, new double[] {1, 2, 3, 4, 5, 6, 7, 8, 9},
                        AutocorrelationOptions.withDefaults()));
        fails("permutation count -1 must be in 0..10000000",
                () -> AutocorrelationOptions.withDefaults().withPermutations(-1, 0));
    }

    @Test
    void badWeights() {
        fails("diagonal weight \\(1, 1\\) = 2.0; .*", () -> SpatialWeights.fromMatrix(new double[][] {{0, 1}, {1, 2}}));
        fails("weight \\(0, 1\\) = -1.0; weights must be finite and >= 0",
                () -> SpatialWeights.fromMatrix(new double[][] {{0, -1}, {1, 0}}));
        fails("weight \\(1, 0\\) = NaN; .*", () -> SpatialWeights.fromMatrix(new double[][] {{0, 1}, {Double.NaN, 0}}));
        fails("weights matrix row 1 has 1 entries; a square 2 x 2 matrix is required",
                () -> SpatialWeights.fromMatrix(new double[][] {{0, 1}, {1}}));
        fails("unit 0 lists neighbour 5, outside 0..2", () -> SpatialWeights.fromNeighbours(new int[][] {{5}, {}, {}}));
        fails("unit 1 lists itself as a neighbour.*", () -> SpatialWeights.fromNeighbours(new int[][] {{1}, {1}}));
        fails("unit 0 lists neighbour 1 more than once", () -> SpatialWeights.fromNeighbours(new int[][] {{1, 1}, {0}}));
        fails("weight of link 0 -> 1 is 0.0; weights must be finite and positive",
                () -> SpatialWeights.fromNeighbours(new int[][] {{1}, {0}}, new double[][] {{0.0}, {1.0}}));
        SpatialWeights zero = SpatialWeights.fromMatrix(new double[][] {{0, 0, 0, 0}, {0, 0, 0, 0}, {0, 0, 0, 0},
            {0, 0, 0, 0}});
        fails("units 0, 1, 2, 3 have no neighbours.*", () -> MoranI.test(zero, new double[] {1, 2, 3, 4}));
    }

    @Test
    void degenerateNullDistributionIsANumericalFailure() {
        // Every pair linked with equal weight: Σ_ij w_ij z_i z_j = -Σ z², so I = -1/(n-1) for every
        // arrangement and both null variances are 0 (by hand from the Cliff & Ord formulas).
        int n = 6;
        double[][] all = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                all[i][j] = i == j ? 0 : 1;
            }
        }
        io.densa.core.DensaException e = assertThrows(io.densa.core.DensaException.class,
                () -> MoranI.test(SpatialWeights.fromMatrix(all), new double[] {1, 2, 3, 5, 8, 13}));
        assertTrue(e.getMessage().matches("the variance of Moran's I under normality is .* degenerate.*"),
                e.getMessage());
        AutocorrelationDiagnostics d = e.diagnostics(AutocorrelationDiagnostics.class).orElseThrow();
        assertEquals("Moran's I", d.statistic());
        assertEquals("normality", d.assumption());
        assertEquals(n, d.units());
    }

    @Test
    void badBuilderArguments() {
        Locations loc = Locations.planar(new double[] {0, 1, 2, 2}, new double[] {0, 0, 0, 0});
        fails("k = 4 nearest neighbours requested for 4 units; k must be in 1..3",
                () -> SpatialWeights.nearestNeighbours(loc, 4, SpatialWeights.Symmetry.UNION));
        fails("k = 0 .*", () -> SpatialWeights.nearestNeighbours(loc, 0, SpatialWeights.Symmetry.UNION));
        fails("distance band NaN must be finite and positive", () -> SpatialWeights.distanceBand(loc, Double.NaN));
        fails("inverse-distance power -1.0 must be finite and positive",
                () -> SpatialWeights.inverseDistance(loc, -1, 5));
        fails("units 2 and 3 are coincident; inverse-distance weight is infinite.*",
                () -> SpatialWeights.inverseDistance(loc, 1, Double.POSITIVE_INFINITY));
        fails("contiguity tolerance -1.0E-6 must be finite and >= 0",
                () -> SpatialWeights.contiguity(squareLattice(2, 2, 0), SpatialWeights.Contiguity.ROOK, -1e-6));
        Geometry point = new GeometryFactory().createPoint(new Coordinate(0, 0));
        List<Geometry> mixed = List.of(squareLattice(1, 1, 0).get(0), point);
        fails("unit 1 is a Point; contiguity needs a non-empty Polygon or MultiPolygon per unit",
                () -> SpatialWeights.contiguity(mixed, SpatialWeights.Contiguity.QUEEN, 0));
    }
}
