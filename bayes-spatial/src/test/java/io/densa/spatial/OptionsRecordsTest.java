package io.densa.spatial;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.ProgressListener;
import io.densa.spatial.autocorrelation.AutocorrelationOptions;
import io.densa.spatial.autocorrelation.IslandPolicy;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

/**
 * The options records: their canonical constructors accept exactly what the with-methods accept
 * (with the same messages), copy arrays in and out, and compare by content.
 */
class OptionsRecordsTest {

    private static void rejects(String fragment, Executable e) {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, e);
        assertTrue(ex.getMessage().contains(fragment), ex.getMessage());
    }

    @Test
    void krigingOptionsCheckAndCopyLikeTheWithMethods() {
        rejects("error variance at location 1 must be finite and >= 0",
                () -> new KrigingOptions(Neighbourhood.global(), new double[] {0, -1}, 0, 1e12, true));
        rejects("error variance at location 1 must be finite and >= 0",
                () -> KrigingOptions.withDefaults().withErrorVariances(0, -1));
        rejects("condition limit must be > 1", () -> KrigingOptions.withDefaults().withConditionLimit(1));
        double[] v = {1, 2};
        KrigingOptions o = KrigingOptions.withDefaults().withErrorVariances(v);
        v[0] = 99;
        assertArrayEquals(new double[] {1, 2}, o.errorVariances());
        o.errorVariances()[1] = 99;
        assertArrayEquals(new double[] {1, 2}, o.errorVariances());
        assertEquals(o, KrigingOptions.withDefaults().withErrorVariances(1, 2));
        assertEquals(o.hashCode(), KrigingOptions.withDefaults().withErrorVariances(1, 2).hashCode());
        assertNotEquals(o, KrigingOptions.withDefaults().withErrorVariances(1, 3));
    }

    @Test
    void gridOptionsCheckAndCopy() {
        rejects("tile size must be in [1, 1024]", () -> GridOptions.withDefaults().withTileSize(0));
        rejects("quantile probability 1 must be in (0, 1)", () -> new GridOptions(64, true, new double[0],
                new double[] {0.5, 1}, false, List.of(), true, ProgressListener.NONE, false));
        GridOptions g = GridOptions.withDefaults().withTailProbabilities(3, 4);
        g.thresholds()[0] = -1;
        assertArrayEquals(new double[] {3, 4}, g.thresholds());
        assertEquals(g, GridOptions.withDefaults().withTailProbabilities(3, 4));
    }

    @Test
    void fitAndAutocorrelationOptionsCheckTheirComponents() {
        rejects("fit a structured family", () -> VariogramFitOptions.withDefaults()
                .withFamily(VariogramModel.Family.NUGGET));
        rejects("range bounds must satisfy 0 < min < max < inf",
                () -> VariogramFitOptions.withDefaults().withRangeBounds(Double.NaN, 2));
        rejects("evaluation budget must be >= 100", () -> new VariogramFitOptions(VariogramModel.Family.SPHERICAL,
                true, VariogramFitOptions.Method.ORDINARY, 0.5, Double.NaN, Double.NaN, 99));
        rejects("permutation count -1 must be in 0..10000000",
                () -> new AutocorrelationOptions(-1, 0, IslandPolicy.ERROR, true, ProgressListener.NONE));
        assertEquals(AutocorrelationOptions.withDefaults().withPermutations(99, 1),
                AutocorrelationOptions.withDefaults().withPermutations(99, 1));
    }
}
