package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * Progress listeners of the resampling and cross-validation methods: the count is
 * non-decreasing and reaches the total, and the results are the same with and without a
 * listener.
 */
class ProgressTest {
    private final BayesSpace space = TestData.space8();

    /** Records every call (thread-safe). */
    static final class Recorder implements ProgressListener {
        final List<long[]> calls = new ArrayList<>();
        final List<String> tasks = new ArrayList<>();

        @Override
        public synchronized void progress(String task, long done, long total) {
            tasks.add(task);
            calls.add(new long[] {done, total});
        }

        synchronized void assertCompleteMonotone(String task, long total) {
            assertTrue(!calls.isEmpty(), "no progress reported");
            long prev = 0;
            for (int i = 0; i < calls.size(); i++) {
                assertEquals(task, tasks.get(i));
                assertEquals(total, calls.get(i)[1]);
                assertTrue(calls.get(i)[0] >= prev, "done decreased");
                prev = calls.get(i)[0];
            }
            assertEquals(total, prev, "done must reach total");
        }
    }

    private FunctionOnScalarFit fosFit() {
        Random r = new Random(8);
        int n = 40;
        double[] dose = new double[n];
        double[][] c = TestData.gaussian(r, n, space.dimension(), 0.5);
        for (int i = 0; i < n; i++) {
            dose[i] = r.nextDouble();
            c[i][0] += dose[i];
        }
        Design d = Design.builder().numeric("dose", dose).build();
        return FunctionOnScalarRegression.withDefaults().fit(d, DensitySet.of(space, c));
    }

    @Test
    void bootstrapBandsReportEveryReplicate() {
        FunctionOnScalarFit fit = fosFit();
        double[] grid = {0, 0.25, 0.5, 0.75, 1};
        Recorder rec = new Recorder();
        List<FunctionOnScalarFit.CoefficientBand> a = fit.bootstrapBands(grid, 50, 0.9, 3L);
        List<FunctionOnScalarFit.CoefficientBand> b = fit.bootstrapBands(grid, 50, 0.9, 3L, rec);
        rec.assertCompleteMonotone("bootstrap", 50);
        assertEquals(a.size(), b.size());
        assertEquals(a, b); // bands are values: equal contents compare equal
        // and they do not leak their arrays
        double[] leaked = b.get(0).estimate();
        leaked[0] += 1;
        assertEquals(a.get(0), b.get(0));
        assertThrows(NullPointerException.class, () -> fit.bootstrapBands(grid, 50, 0.9, 3L, null));
    }

    @Test
    void permutationTestReportsEveryPermutation() {
        FunctionOnScalarFit fit = fosFit();
        Recorder rec = new Recorder();
        FunctionOnScalarFit.PermutationTest a = fit.test("dose", 99, 4L);
        FunctionOnScalarFit.PermutationTest b = fit.test("dose", 99, 4L, rec);
        rec.assertCompleteMonotone("permutation test", 99);
        assertEquals(a, b);
    }

    @Test
    void fpcaCrossValidationReportsEveryFold() {
        DensitySet data = DensitySet.of(space, TestData.gaussian(new Random(5), 60, space.dimension(), 1.0));
        Recorder rec = new Recorder();
        Fpca.ComponentChoice a = Fpca.chooseComponents(data, ComponentSelection.withDefaults().withMaxComponents(5).withFraction(0.8).withCrossValidation(6, 1L));
        Fpca.ComponentChoice b = Fpca.chooseComponents(data, ComponentSelection.withDefaults().withMaxComponents(5).withFraction(0.8).withCrossValidation(6, 1L).withProgressListener(rec));
        rec.assertCompleteMonotone("cross-validation", 6);
        assertEquals(a, b);
        b.meanError()[0] = -1;
        assertEquals(a, b);
    }

    @Test
    void functionalRegressionCrossValidationReportsEveryFold() {
        Random r = new Random(12);
        int n = 120;
        double[][] x = TestData.gaussian(r, n, space.dimension(), 1.0);
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            y[i] = x[i][0] - 0.5 * x[i][1] + 0.3 * r.nextGaussian();
        }
        List<DensitySet> preds = List.of(DensitySet.of(space, x));
        for (FunctionalRegression cfg : List.of(FunctionalRegression.truncation().withComponents(1, 6).withFolds(4),
                FunctionalRegression.ridge().withFolds(4))) {
            Recorder rec = new Recorder();
            ScalarOnFunctionFit a = cfg.fit(preds, null, y);
            ScalarOnFunctionFit b = cfg.withProgressListener(rec).fit(preds, null, y);
            rec.assertCompleteMonotone("cross-validation", 4);
            assertEquals(a.chosen(), b.chosen());
            assertArrayEquals(a.fitted(), b.fitted(), 0.0);
            // the listener survives the other with-methods
            assertTrue(cfg.withProgressListener(rec).withSeed(9).progressListener() == rec);
        }
        assertTrue(FunctionalRegression.ridge().progressListener() == ProgressListener.NONE);
    }
}
