package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.List;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

/**
 * Coordinates near the ends of the double range: results are exact to rounding when they are
 * representable and an {@link IllegalArgumentException} saying so when they are not; never ±∞
 * or NaN. Expected values come from exact decimal arithmetic ({@link BigDecimal}, 34 digits), not
 * from the code under test.
 */
class ValueRangeTest {
    private static final BayesSpace S = BayesSpace.steps(0, 1, 5); // K = 4
    private static final MathContext MC = MathContext.DECIMAL128;

    private static double exactNorm(double[] x, double[] y) {
        BigDecimal s = BigDecimal.ZERO;
        for (int i = 0; i < x.length; i++) {
            BigDecimal d = new BigDecimal(x[i]).subtract(y == null ? BigDecimal.ZERO : new BigDecimal(y[i]));
            s = s.add(d.multiply(d));
        }
        return s.sqrt(MC).doubleValue();
    }

    private static void close(double expected, double actual, String what) {
        assertEquals(expected, actual, 4 * Math.ulp(expected), what);
    }

    private static void outOfRange(Executable call) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, call);
        assertTrue(e.getMessage().contains("beyond the double range") || e.getMessage().contains("exceeds the largest"),
                e.getMessage());
    }

    @Test
    void normsOfHugeAndTinyCoordinates() {
        double[][] cases = {{1e300, -2e300, 3e300, 1e300}, {1e-170, 2e-170, -3e-170, 0}, {4.9e-324, 0, 0, 4.9e-324},
            {1e154, 1e154, 1e154, 1e154}, {1.5, -2.5, 0, 1e-3}};
        for (double[] c : cases) {
            Density f = S.density(c);
            close(exactNorm(c, null), f.norm(), "norm of " + java.util.Arrays.toString(c));
            Density g = S.density(new double[] {-c[3], c[2], -c[1], c[0]});
            close(exactNorm(c, g.coordinates()), f.distance(g), "distance");
            double[] norms = DensitySet.of(List.of(f, g)).norms();
            close(f.norm(), norms[0], "set norm");
            close(g.norm(), norms[1], "set norm");
        }
        // the squares themselves are beyond the range: the squared forms say so
        Density big = S.density(1e300, 0, 0, 0);
        outOfRange(big::normSq);
        outOfRange(() -> big.inner(big));
        outOfRange(() -> big.distanceSq(S.neutral()));
        // differences beyond the largest double: the distance itself is not representable
        Density plus = S.density(1.7e308, 0, 0, 0), minus = S.density(-1.7e308, 0, 0, 0);
        outOfRange(() -> plus.distance(minus));
        assertEquals(false, plus.equalsWithin(minus, 1e300));
        outOfRange(() -> S.density(1.7e308, 1.7e308, 0, 0).norm());
        // results of algebra that leave the range name the coordinate
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> plus.perturb(plus));
        assertTrue(e.getMessage().startsWith("coordinate 0 of the result is Infinity: the operation leaves the double"
                + " range"), e.getMessage());
    }

    @Test
    void meanOfRowsNearTheLargestDouble() {
        double[][] rows = {{1e308, -1.7e308, 0, 1}, {1.5e308, -1.7e308, 0, 2}, {1.7e308, -1.7e308, 5e-324, 3}};
        DensitySet set = DensitySet.of(S, rows);
        double[] mean = set.mean().coordinates();
        for (int j = 0; j < 4; j++) {
            BigDecimal s = BigDecimal.ZERO;
            for (double[] r : rows) {
                s = s.add(new BigDecimal(r[j]));
            }
            double expected = s.divide(BigDecimal.valueOf(rows.length), MC).doubleValue();
            close(expected, mean[j], "mean coordinate " + j);
        }
        // centring stays representable here (|c − mean| ≤ 3.5e307); crossProducts are not
        DensitySet c = set.centred();
        close(1e308 - mean[0], c.coordinate(0, 0), "centred");
        outOfRange(() -> set.crossProducts(true));
        DensitySet far = DensitySet.of(S, new double[][] {{1.7e308, 0, 0, 0}, {-1.7e308, 0, 0, 0}});
        assertEquals(0.0, far.mean().coordinate(0));
        assertEquals(-1.7e308, far.centred().coordinate(1, 0)); // the mean is 0: representable
        DensitySet lopsided = DensitySet.of(S, new double[][] {{1.7e308, 0, 0, 0}, {-1.7e308, 0, 0, 0},
            {-1.7e308, 0, 0, 0}});
        outOfRange(lopsided::centred); // 1.7e308 − (−5.7e307) is beyond the range
        outOfRange(() -> far.perturb(S.density(1e308, 0, 0, 0)));
    }

    @Test
    void gramBeyondTheRangeThrowsDistancesScale() {
        double[][] rows = {{1e200, 2e200, 0, 0}, {-1e200, 0, 3e200, 1e200}, {0, 0, 0, 1e200}};
        DensitySet set = DensitySet.of(S, rows);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, set::gram);
        assertTrue(e.getMessage().startsWith("the n × n Gram matrix has entry 0 = Infinity: beyond the double range"),
                e.getMessage());
        DMatrixRMaj d = set.distances();
        for (int i = 0; i < 3; i++) {
            for (int j = 0; j < 3; j++) {
                close(i == j ? 0 : exactNorm(rows[i], rows[j]), d.get(i, j), "distance " + i + ", " + j);
            }
        }
        // tiny coordinates: the Gram identity would underflow to 0, the scaled path does not
        DensitySet tiny = DensitySet.of(S, new double[][] {{1e-170, 0, 0, 0}, {0, 3e-170, 0, 0}});
        close(exactNorm(new double[] {1e-170, 0, 0, 0}, new double[] {0, 3e-170, 0, 0}), tiny.distances().get(0, 1),
                "tiny distance");
        // moderate coordinates keep the fast path and its values
        DensitySet moderate = DensitySet.of(S, new double[][] {{1, 2, 3, 4}, {-1, 0, 2, 1}});
        assertEquals(1 * -1 + 0 + 6 + 4, moderate.gram().get(0, 1));
    }
}
