package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Least-squares construction from clr values: well-posed designs of any dimension are accepted
 * and reproduce a density of the space exactly (the fit of an exact member of the span has zero
 * residual — a property of least squares, common practice); points that cannot determine the
 * coordinates are rejected.
 */
class FromClrTest {
    @Test
    void cubicSplinesWithManyKnotsRoundTripFromOneHundredPoints() {
        // reported failure: splines(0, 100, 4, 10) (K = 13) from 100 points was called rank-deficient
        for (int knots : new int[] {10, 20, 40}) {
            BayesSpace s = BayesSpace.splines(0, 100, 4, knots);
            double[] c = new double[s.dimension()];
            for (int k = 0; k < c.length; k++) {
                c[k] = Math.sin(1.3 * k + 0.2) * 3;
            }
            Density f = s.density(c);
            int m = Math.max(100, 3 * s.dimension());
            double[] xs = new double[m];
            for (int i = 0; i < m; i++) {
                xs[i] = 100.0 * (i + 0.5) / m;
            }
            Density g = s.fromClr(xs, f.clr(xs));
            assertTrue(f.distance(g) < 1e-9 * (1 + f.norm()), "knots " + knots + ": distance " + f.distance(g));
            Density h = s.fromGrid(xs, f.pdf(xs));
            assertTrue(f.distance(h) < 1e-9 * (1 + f.norm()), "knots " + knots + ": fromGrid distance " + f.distance(h));
        }
    }

    @Test
    void pointsInOneKnotSpanCannotDetermineASplineDensity() {
        BayesSpace s = BayesSpace.splines(0, 100, 4, 10);
        double[] xs = new double[40];
        double[] v = new double[40];
        for (int i = 0; i < 40; i++) {
            xs[i] = 1 + 0.1 * i; // all inside the first span [0, 9.09)
            v[i] = Math.sin(xs[i]);
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> s.fromClr(xs, v));
        assertTrue(e.getMessage().matches("the 40 points do not determine the 13 coordinates of .*rank-deficient.*"),
                e.getMessage());
    }
}
