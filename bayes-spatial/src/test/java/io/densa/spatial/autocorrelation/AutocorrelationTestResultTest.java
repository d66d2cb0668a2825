package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.rookLattice;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.TestResult;
import io.densa.spatial.SpatialWeights;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The autocorrelation results share {@link TestResult}: the p-value they report is the one their
 * own components hold (permutation when requested, else the normal approximation under
 * randomisation), so that results of different tests can be listed and adjusted alike.
 */
class AutocorrelationTestResultTest {
    private static final SpatialWeights GRID = SpatialWeights.fromNeighbours(rookLattice(4, 4));
    private static final double[] VALUES = {1, 2, 4, 3, 2, 5, 6, 4, 3, 6, 8, 7, 5, 7, 9, 8};

    @Test
    void globalTestsReportTheRandomisationOrPermutationPValue() {
        MoranI.Result m = MoranI.test(GRID, VALUES);
        assertEquals(m.randomisation().pTwoSided(), m.pValue());
        assertEquals("randomisation (normal approximation), two-sided", m.method());
        GearyC.Result g = GearyC.test(GRID, VALUES, AutocorrelationOptions.withDefaults().withPermutations(99, 5));
        assertEquals(g.permutation().orElseThrow().pTwoSided(), g.pValue());
        assertEquals("permutation (99 permutations, seed 5), two-sided", g.method());
        List<TestResult> all = List.of(m, g);
        for (TestResult r : all) {
            assertTrue(r.pValue() >= 0 && r.pValue() <= 1, r.method());
        }
    }

    @Test
    void localUnitsReportTheirConditionalPermutationPValue() {
        LocalMoran.Result r = LocalMoran.test(GRID, VALUES, AutocorrelationOptions.withDefaults()
                .withPermutations(99, 3));
        for (LocalMoran.Unit u : r.units()) {
            assertEquals(u.pTwoSided(), u.pValue());
            assertEquals(u.statistic(), ((TestResult) u).statistic());
        }
    }

    @Test
    void densityMoranHasAPValueOnlyByPermutation() {
        double[][] coords = new double[16][1];
        for (int i = 0; i < 16; i++) {
            coords[i][0] = VALUES[i];
        }
        DensitySet d = DensitySet.of(BayesSpace.polynomials(0, 1, 1), coords);
        MoranI.DensityResult none = MoranI.test(GRID, d, AutocorrelationOptions.withDefaults());
        IllegalStateException e = assertThrows(IllegalStateException.class, none::pValue);
        assertTrue(e.getMessage().contains("withPermutations"), e.getMessage());
        MoranI.DensityResult some = MoranI.test(GRID, d, AutocorrelationOptions.withDefaults().withPermutations(49, 1));
        assertEquals(some.permutation().orElseThrow().pTwoSided(), some.pValue());
    }
}
