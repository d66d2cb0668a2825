package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Rank check of the QR basis used by the permutation F-test: a rank-deficient weighted design must
 * be rejected naming the column (otherwise the test's degrees of freedom would be wrong), a full-rank
 * one gives orthonormal columns spanning the weighted design (QᵀQ = I and QQᵀ(√W X) = √W X, the
 * definition of a thin QR, checked directly; Golub &amp; Van Loan (2013), Matrix Computations, 4th
 * ed., §5.2).
 */
class OrthonormalColumnsTest {
    private static final int N = 30;

    private static double[] ones() {
        double[] sw = new double[N];
        Arrays.fill(sw, 1.0);
        return sw;
    }

    private static double[] random(long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        double[] v = new double[N];
        for (int i = 0; i < N; i++) {
            v[i] = r.nextDouble(-1, 1);
        }
        return v;
    }

    @Test
    void collinearColumnIsRejectedByName() {
        double[] a = random(1);
        double[] b = new double[N];
        for (int i = 0; i < N; i++) {
            b[i] = 2 * a[i] - 3; // b = 2a − 3·intercept
        }
        Design d = Design.builder().numeric("a", a).numeric("b", b).numeric("c", random(2)).build();
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> FreedmanLaneTest.orthonormalColumns(d, ones()));
        assertTrue(e.getMessage().contains("column 'b'") && e.getMessage().contains("index 2"), e.getMessage());
    }

    @Test
    void columnZeroAfterWeightingIsRejectedByName() {
        double[] flag = new double[N];
        double[] sw = ones();
        for (int i = 0; i < 4; i++) {
            flag[i] = 1;
            sw[i] = 0; // rows that carry the flag get weight zero
        }
        Design d = Design.builder().numeric("x", random(3)).numeric("flag", flag).build();
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> FreedmanLaneTest.orthonormalColumns(d, sw));
        assertTrue(e.getMessage().contains("column 'flag'"), e.getMessage());
    }

    @Test
    void fullRankDesignGivesOrthonormalBasisOfItsColumns() {
        Design d = Design.builder().numeric("a", random(4)).numeric("b", random(5)).build();
        double[] sw = random(6);
        for (int i = 0; i < N; i++) {
            sw[i] = 0.5 + Math.abs(sw[i]);
        }
        int p = d.columns();
        double[] q = FreedmanLaneTest.orthonormalColumns(d, sw);
        assertEquals(N * p, q.length);
        double[] x = d.internal();
        for (int j = 0; j < p; j++) {
            for (int l = 0; l < p; l++) {
                double s = 0;
                for (int i = 0; i < N; i++) {
                    s += q[i * p + j] * q[i * p + l];
                }
                assertEquals(j == l ? 1.0 : 0.0, s, 1e-12, "QᵀQ[" + j + "][" + l + "]");
            }
            // projection of column j of √W X onto span Q reproduces it
            double[] c = new double[N];
            for (int i = 0; i < N; i++) {
                c[i] = x[i * p + j] * sw[i];
            }
            for (int i = 0; i < N; i++) {
                double proj = 0;
                for (int l = 0; l < p; l++) {
                    double qc = 0;
                    for (int m = 0; m < N; m++) {
                        qc += q[m * p + l] * c[m];
                    }
                    proj += q[i * p + l] * qc;
                }
                assertEquals(c[i], proj, 1e-12, "column " + j + " row " + i);
            }
        }
    }
}
