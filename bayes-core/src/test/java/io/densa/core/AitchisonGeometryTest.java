package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Step densities on D equal bins reproduce the Aitchison geometry of D-part compositions up to
 * the bin-width factor η/D (Lebesgue reference) or 1/D (uniform probability reference). Inner
 * product definition (Aitchison (1986), The Statistical Analysis of Compositional Data, Chapman &amp;
 * Hall — from memory; Pawlowsky-Glahn, Egozcue, Tolosana-Delgado (2007), Lecture Notes on
 * Compositional Data Analysis, Def. 3.3): ⟨x, y⟩_a = (1/(2D)) Σ_i Σ_j ln(x_i/x_j) ln(y_i/y_j)
 * = clr(x) · clr(y) (both forms are checked). The worked example x = (.1, .3, .4, .2),
 * y = (.2, .4, .2, .2) on [0, 2] and its numbers (written to 6–10 digits and compared to their last
 * digit) were derived from these definitions, and are recomputed in this test to 1e-12.
 */
class AitchisonGeometryTest {
    private static final double[] X = {.1, .3, .4, .2};
    private static final double[] Y = {.2, .4, .2, .2};
    private static final BayesSpace S = BayesSpace.steps(0, 2, 4);
    private static final double[] MID = {0.25, 0.75, 1.25, 1.75};

    /** The step density with bin probabilities p (pdf p_i / width on bin i). */
    static Density composition(BayesSpace s, double[] p) {
        double[] e = s.basis().breakpoints();
        Projection pr = s.project(x -> {
            for (int i = e.length - 2; i >= 0; i--) {
                if (x >= e[i]) {
                    return p[i] / (e[i + 1] - e[i]);
                }
            }
            return p[0] / (e[1] - e[0]);
        });
        assertTrue(pr.relativeError() < 1e-13, "step density lies in the space");
        return pr.density();
    }

    static double[] binProbabilities(Density f) {
        double[] e = f.space().basis().breakpoints();
        double[] p = new double[e.length - 1];
        for (int i = 0; i < p.length; i++) {
            p[i] = f.cdf(e[i + 1]) - f.cdf(e[i]);
        }
        return p;
    }

    static double[] clr(double[] x) {
        double g = 0;
        for (double v : x) {
            g += Math.log(v) / x.length;
        }
        double[] c = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            c[i] = Math.log(x[i]) - g;
        }
        return c;
    }

    /** The Aitchison inner product (Aitchison 1986, from memory), summed as written. */
    static double aitchisonInner(double[] x, double[] y) {
        int d = x.length;
        double s = 0;
        for (int i = 0; i < d; i++) {
            for (int j = 0; j < d; j++) {
                s += Math.log(x[i] / x[j]) * Math.log(y[i] / y[j]);
            }
        }
        return s / (2 * d);
    }

    @Test
    void clrOnBinsIsClrOfComposition() {
        Density x = composition(S, X);
        double[] listed = {-0.794513, 0.304099, 0.591781, -0.101366}; // clr(X), derived by hand
        double[] listedY = {-0.173287, 0.519860, -0.173287, -0.173287};
        assertArrayEquals(listed, x.clr(MID), 1e-6);
        assertArrayEquals(clr(X), x.clr(MID), 1e-12);
        assertArrayEquals(listedY, composition(S, Y).clr(MID), 1e-6);
    }

    @Test
    void innerProductNormAndDistance() {
        Density x = composition(S, X), y = composition(S, Y);
        assertEquals(0.2107852474, aitchisonInner(X, Y), 1e-10);
        // the second form of the definition: ⟨x, y⟩_a = clr(x) · clr(y)
        double dot = 0;
        for (int i = 0; i < X.length; i++) {
            dot += clr(X)[i] * clr(Y)[i];
        }
        assertEquals(aitchisonInner(X, Y), dot, 1e-12);
        // Lebesgue reference: η/D = 0.5 times the Aitchison inner product (0.1053926)
        assertEquals(0.1053926, x.inner(y), 1e-7);
        assertEquals(0.5 * aitchisonInner(X, Y), x.inner(y), 1e-12);
        assertEquals(1.041253 * Math.sqrt(0.5), x.norm(), 1e-6);
        assertEquals(1.011423 * Math.sqrt(0.5), x.distance(y), 1e-6);
        // uniform probability reference: 1/D (0.0526963)
        BayesSpace u = S.withReference(Reference.uniform());
        assertEquals(0.0526963, composition(u, X).inner(composition(u, Y)), 1e-7);
        assertEquals(aitchisonInner(X, Y) / 4, composition(u, X).inner(composition(u, Y)), 1e-12);
    }

    @Test
    void perturbationAndPoweringOfCompositions() {
        Density x = composition(S, X), y = composition(S, Y);
        assertArrayEquals(new double[] {.076923, .461538, .307692, .153846}, binProbabilities(x.perturb(y)), 1e-6);
        assertArrayEquals(new double[] {.033333, .3, .533333, .133333}, binProbabilities(x.power(2)), 1e-6);
        // closure of the products and powers (Aitchison (1986), from memory), to 1e-12
        double[] prod = new double[4], pow = new double[4];
        double sp = 0, sq = 0;
        for (int i = 0; i < 4; i++) {
            prod[i] = X[i] * Y[i];
            pow[i] = X[i] * X[i];
            sp += prod[i];
            sq += pow[i];
        }
        for (int i = 0; i < 4; i++) {
            prod[i] /= sp;
            pow[i] /= sq;
        }
        assertArrayEquals(prod, binProbabilities(x.perturb(y)), 1e-12);
        assertArrayEquals(pow, binProbabilities(x.power(2)), 1e-12);
        assertArrayEquals(X, binProbabilities(x), 1e-12);
    }

    /** Step densities are right-continuous at interior edges; the last bin is closed at b. */
    @Test
    void stepDensitiesAtBinEdges() {
        Density x = composition(S, X);
        assertEquals(X[0] / 0.5, x.pdf(0.0), 1e-12);
        assertEquals(X[1] / 0.5, x.pdf(0.5), 1e-12);
        assertEquals(X[0] / 0.5, x.pdf(Math.nextDown(0.5)), 1e-12);
        assertEquals(X[2] / 0.5, x.pdf(1.0), 1e-12);
        assertEquals(X[3] / 0.5, x.pdf(2.0), 1e-12);
        assertEquals(0.0, x.pdf(Math.nextUp(2.0)));
        assertEquals(0.0, x.pdf(Math.nextDown(0.0)));
        assertEquals(X[0] + X[1], x.cdf(1.0), 1e-14);
        assertEquals(1.0, x.quantile(X[0] + X[1]), 1e-12);
        assertEquals(0.5 + 0.5 * 0.5, x.quantile(X[0] + 0.5 * X[1]), 1e-12);
    }
}
