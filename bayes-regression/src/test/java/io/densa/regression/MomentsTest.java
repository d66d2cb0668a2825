package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.internal.Seeds;
import java.util.Random;
import org.junit.jupiter.api.Test;

class MomentsTest {
    /**
     * The per-fold moment pass gives bit-identical results on the parallel and the serial path
     * (fixed row blocks combined in order), and agrees with a naive double loop.
     */
    @Test
    void parallelEqualsSerialBitForBitAndMatchesNaiveSums() {
        int n = 40_000;
        int w = 7;
        Random r = new Random(3);
        double[] x = new double[n * w];
        for (int i = 0; i < x.length; i++) {
            x[i] = 5 + r.nextGaussian();
        }
        int[] fold = Seeds.folds(n, 5, 9L);
        boolean[] centre = {false, true, true, true, true, true, true};
        Moments par = Moments.of(x, n, w, fold, 5, centre, true);
        Moments ser = Moments.of(x, n, w, fold, 5, centre, false);
        for (int f = -1; f < 5; f++) {
            assertArrayEquals(ser.cross(f), par.cross(f));
            assertArrayEquals(ser.sum(f), par.sum(f));
        }
        // naive reference for fold 2, in original units: Σ x xᵀ over the fold
        double[] naive = new double[w * w];
        int cnt = 0;
        for (int i = 0; i < n; i++) {
            if (fold[i] != 2) {
                continue;
            }
            cnt++;
            for (int j = 0; j < w; j++) {
                for (int l = 0; l < w; l++) {
                    naive[j * w + l] += x[i * w + j] * x[i * w + l];
                }
            }
        }
        assertEquals(cnt, par.count(2));
        double[] mean = new double[w]; // centre 0 → scatter about 0 is the raw cross product
        double[] got = par.foldScatterAbout(2, mean);
        for (int j = 0; j < w * w; j++) {
            assertEquals(naive[j], got[j], 1e-9 * Math.abs(naive[j]) + 1e-6);
        }
    }
}
