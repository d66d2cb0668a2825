package io.densa.core.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Golden-section search (Kiefer (1953), Sequential minimax search for a maximum, Proc. Amer. Math.
 * Soc. 4(3); the recursion as in Press et al. (2007), Numerical Recipes, 3rd ed., §10.2; from
 * memory): each step keeps the side of the smaller interior value and shrinks the interval by
 * r = (√5 − 1)/2, so after n steps the minimum of a unimodal function lies within r^n of the
 * starting width of the points returned. The steps form ({@link GoldenSection.Steps}) asks for
 * the points the textbook recursion evaluates, in its order.
 */
class GoldenSectionTest {
    private static final double R = 0.5 * (Math.sqrt(5) - 1);

    /** The textbook recursion, written out here: the points it evaluates, in order. */
    private static List<Double> textbook(java.util.function.DoubleUnaryOperator f, double lo, double hi, int n) {
        List<Double> xs = new ArrayList<>();
        double x1 = hi - R * (hi - lo), x2 = lo + R * (hi - lo);
        xs.add(x1);
        xs.add(x2);
        double f1 = f.applyAsDouble(x1), f2 = f.applyAsDouble(x2);
        for (int i = 0; i < n; i++) {
            if (f1 <= f2) {
                hi = x2;
                x2 = x1;
                f2 = f1;
                x1 = hi - R * (hi - lo);
                xs.add(x1);
                f1 = f.applyAsDouble(x1);
            } else {
                lo = x1;
                x1 = x2;
                f1 = f2;
                x2 = lo + R * (hi - lo);
                xs.add(x2);
                f2 = f.applyAsDouble(x2);
            }
        }
        return xs;
    }

    @Test
    void findsTheMinimumOfAParabolaWithinTheShrunkenInterval() {
        for (double c : new double[] {0.3, -1.7, 2.9}) {
            java.util.function.DoubleUnaryOperator f = x -> (x - c) * (x - c) + 1;
            for (int n : new int[] {0, 5, 30}) {
                double g = GoldenSection.minimise(f, -2, 3, n, 3, f.applyAsDouble(3));
                assertTrue(Math.abs(g - c) <= Math.pow(R, n) * 5 + 1e-12, "c " + c + ", n " + n + ": " + g);
            }
        }
    }

    @Test
    void stepsAskForTheTextbookPointsInOrder() {
        java.util.function.DoubleUnaryOperator f = x -> Math.cos(3 * x) + 0.1 * x * x;
        List<Double> expected = textbook(f, -1, 2.5, 12);
        GoldenSection.Steps s = new GoldenSection.Steps(-1, 2.5, 12, 2.5, f.applyAsDouble(2.5));
        List<Double> asked = new ArrayList<>();
        while (!s.done()) {
            asked.add(s.point());
            s.accept(f.applyAsDouble(s.point()));
        }
        assertEquals(expected, asked);
        assertEquals(14, asked.size());
    }

    /** On a flat function every value ties with the grid's best point, which is returned. */
    @Test
    void tiesKeepTheGridPoint() {
        assertEquals(0.7, GoldenSection.minimise(x -> 1.0, 0, 1, 7, 0.7, 1.0), 0.0);
    }
}
