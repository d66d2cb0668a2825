package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The core progress listener in the empirical variogram and in cross-validation: one task name,
 * a non-decreasing count reaching the total, and identical results with and without a listener
 * (common practice: a listener is an observer only).
 */
class SpatialProgressTest {
    static final class Recorder implements ProgressListener {
        final List<long[]> calls = new ArrayList<>();
        final List<String> tasks = new ArrayList<>();

        @Override
        public synchronized void progress(String task, long done, long total) {
            tasks.add(task);
            calls.add(new long[] {done, total});
        }

        void check(String task, long total) {
            assertTrue(!calls.isEmpty(), "no progress reported");
            long prev = 0;
            for (int c = 0; c < calls.size(); c++) {
                assertEquals(task, tasks.get(c));
                assertEquals(total, calls.get(c)[1]);
                assertTrue(calls.get(c)[0] >= prev, "progress decreased at call " + c);
                prev = calls.get(c)[0];
            }
            assertEquals(total, prev);
        }
    }

    @Test
    void variogramReportsTilesAndResultsAreUnchanged() {
        Locations loc = TestData.uniformSquare(300, 1, 4);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 300, 5);
        VariogramOptions o = VariogramOptions.withDefaults().withBinCount(8);
        Recorder rec = new Recorder();
        EmpiricalVariogram a = EmpiricalVariogram.of(loc, d, o);
        EmpiricalVariogram b = EmpiricalVariogram.of(loc, d, o.withProgressListener(rec));
        assertArrayEquals(a.semivariances(), b.semivariances(), 0);
        rec.check("variogram tiles", (300 + 63) / 64);
        assertThrows(NullPointerException.class, () -> o.withProgressListener(null));
    }

    @Test
    void crossValidationReportsLocations() {
        Locations loc = TestData.uniformSquare(40, 1, 11);
        DensitySet data = TestData.independentCoordinates(TestData.K3, 40, 12);
        VariogramModel model = VariogramModel.spherical(1, 0.7).withNugget(0.1);
        for (Neighbourhood nb : new Neighbourhood[] {Neighbourhood.global(), Neighbourhood.nearest(10)}) {
            Kriging k = Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults().withNeighbourhood(nb));
            Recorder rec = new Recorder();
            CrossValidation with = k.crossValidate(rec);
            rec.check("cross-validation", 40);
            CrossValidationTest.assertSame(k.crossValidate(), with);
        }
    }

    @Test
    void gridProgressComesInFixedBatchesOfSixteenTiles() {
        Locations loc = TestData.uniformSquare(30, 1, 13);
        DensitySet data = TestData.independentCoordinates(TestData.K3, 30, 14);
        Kriging k = Kriging.ordinary(loc, data, VariogramModel.exponential(1, 0.5), KrigingOptions.withDefaults());
        Recorder rec = new Recorder();
        // 28 × 20 cells in tiles of 4 × 4: 7 × 5 = 35 tiles, reported after 16, 32 and 35
        k.predictGrid(Grid.over(0, 0, 1, 1, 28, 20), GridOptions.withDefaults().withTileSize(4).withVariance(false)
                .withProgressListener(rec), t -> { });
        rec.check("grid tiles", 35);
        assertEquals(3, rec.calls.size());
        assertEquals(16, rec.calls.get(0)[0]);
        assertEquals(32, rec.calls.get(1)[0]);
    }
}
