package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.AnomalyScoring;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** Results print readably (JShell) and the Scores value agrees with its matrix view. */
class ReadableOutputTest {
    private static DensitySet data(int n) {
        BayesSpace s = BayesSpace.cubicSplines(0, 1, 4);
        Random r = new Random(3);
        List<io.densa.core.Density> d = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            double[] c = new double[s.dimension()];
            for (int j = 0; j < c.length; j++) {
                c[j] = r.nextGaussian() / (j + 1);
            }
            d.add(s.density(c));
        }
        return DensitySet.of(d);
    }

    @Test
    void scoresPrintAFewRowsAndAgreeWithTheMatrixView() {
        DensitySet set = data(40);
        Fpca f = Fpca.fit(set);
        Scores z = f.scores(set, 7);
        assertEquals(40, z.rows());
        assertEquals(7, z.components());
        String text = z.toString();
        assertTrue(text.startsWith("Scores[40 × 7]"), text);
        assertTrue(text.contains("… (35 more rows)"), text);
        assertEquals(1 + 5 + 1, text.split("\n").length, text);
        assertArrayEquals(z.values(), z.matrix().data, 0.0);
        for (int i = 0; i < 40; i += 13) {
            for (int j = 0; j < 7; j++) {
                assertEquals(z.matrix().get(i, j), z.get(i, j), 0.0);
                assertEquals(z.get(i, j), z.row(i)[j], 0.0);
                assertEquals(z.get(i, j), z.column(j)[i], 0.0);
            }
        }
    }

    @Test
    void settingsPrintTheirValues() {
        assertEquals("AnomalyScoring[fdr=0.1, bandLevel=0.95]", AnomalyScoring.withDefaults().withFdr(0.1).toString());
        BayesSpace s = BayesSpace.cubicSplines(0, 1, 4);
        String ple = io.densa.core.estimate.PenalizedLikelihoodEstimator.withDefaults(s).withSmoothing(2.5).toString();
        assertTrue(ple.startsWith("PenalizedLikelihoodEstimator[" + s + ", penalty order 2, lambda 2.5"), ple);
        String sse = io.densa.core.estimate.SmoothingSplineEstimator.withDefaults(s).toString();
        assertTrue(sse.startsWith("SmoothingSplineEstimator[" + s + ", zeros "), sse);
        assertTrue(sse.contains("lambda by GCV"), sse);
    }
}
