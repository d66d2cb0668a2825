package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * {@link FunctionalRegression#withCrossValidation(int, long)} sets folds and seed together (the
 * core option name) and gives exactly the fit of {@code withFolds(k).withSeed(s)}; a different
 * seed changes the fold assignment (so the option is not ignored).
 */
class FunctionalRegressionOptionsTest {
    private final BayesSpace space = TestData.space8();

    @Test
    void crossValidationOptionSetsFoldsAndSeedTogether() {
        Random r = new Random(21);
        int n = 90;
        double[][] x = TestData.gaussian(r, n, space.dimension(), 1.0);
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            y[i] = x[i][0] - 0.5 * x[i][1] + 0.3 * r.nextGaussian();
        }
        List<DensitySet> preds = List.of(DensitySet.of(space, x));
        for (FunctionalRegression base : List.of(FunctionalRegression.truncation().withComponents(1, 6),
                FunctionalRegression.ridge())) {
            FunctionalRegression a = base.withCrossValidation(4, 9);
            FunctionalRegression b = base.withFolds(4).withSeed(9);
            assertEquals(4, a.folds());
            assertEquals(9L, a.seed());
            ScalarOnFunctionFit fa = a.fit(preds, null, y);
            ScalarOnFunctionFit fb = b.fit(preds, null, y);
            assertEquals(fb.chosen(), fa.chosen());
            assertArrayEquals(fb.fitted(), fa.fitted(), 0.0);
            assertEquals(fb.crossValidation(), fa.crossValidation());
            ScalarOnFunctionFit other = base.withCrossValidation(4, 10).fit(preds, null, y);
            assertTrue(!other.crossValidation().equals(fa.crossValidation()), "seed has no effect");
            ProgressListener l = (t, d, tot) -> { };
            assertTrue(base.withProgressListener(l).withCrossValidation(3, 1).progressListener() == l);
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> FunctionalRegression.ridge().withCrossValidation(1, 0));
        assertTrue(e.getMessage().contains("at least 2 folds, got 1"), e.getMessage());
    }
}
