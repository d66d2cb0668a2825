package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Reference;
import java.util.Random;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.apache.commons.math3.analysis.polynomials.PolynomialFunction;
import org.apache.commons.math3.analysis.polynomials.PolynomialFunctionLagrangeForm;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;

class PenaltiesTest {
    private static double quad(double[] b, DMatrixRMaj r) {
        double s = 0;
        for (int i = 0; i < b.length; i++) {
            for (int j = 0; j < b.length; j++) {
                s += b[i] * r.get(i, j) * b[j];
            }
        }
        return s;
    }

    /** Coordinates of the clr function f (up to a constant) by least squares on a fine grid; exact when f is in the span. */
    private static double[] coordinatesOf(BayesSpace space, DoubleUnaryOperator f) {
        int m = 101;
        double[] xs = new double[m];
        double[] v = new double[m];
        for (int i = 0; i < m; i++) {
            xs[i] = space.lower() + (space.upper() - space.lower()) * i / (m - 1);
            v[i] = f.applyAsDouble(xs[i]);
        }
        return space.fromClr(xs, v).coordinates();
    }

    /**
     * Closed forms (derived here): f(x) = x² has f'' = 2, so ∫_a^b (f'')² dx = 4 (b − a);
     * f(x) = x³ has f'' = 6x, so ∫_a^b 36 x² dx = 12 (b³ − a³); a linear function has roughness 0.
     * Checked for polynomial and cubic/quintic spline spaces (uniform and non-uniform knots) and a
     * weighted reference (the penalty is ∫ dt whatever the reference).
     */
    @Test
    void closedFormsForQuadraticCubicAndLinearFunctions() {
        BayesSpace[] spaces = {
            BayesSpace.polynomials(-1, 2, 3),
            BayesSpace.polynomials(0, 5, 9),
            BayesSpace.splines(-1, 2, 4, 5),
            BayesSpace.splines(-1, 2, 4, new double[] {-0.9, -0.2, 0.05, 1.7}),
            BayesSpace.splines(0.5, 3, 6, 3),
            BayesSpace.splines(-1, 2, 4, 4).withReference(Reference.normal(0.3, 0.8)),
        };
        for (BayesSpace s : spaces) {
            double a = s.lower();
            double b = s.upper();
            DMatrixRMaj r = Penalties.secondDerivative(s);
            double scale = 12 * (b * b * b - a * a * a);
            assertEquals(4 * (b - a), quad(coordinatesOf(s, x -> x * x), r), 1e-9 * scale, s.toString());
            assertEquals(scale, quad(coordinatesOf(s, x -> x * x * x), r), 1e-9 * scale, s.toString());
            assertEquals(0.0, quad(coordinatesOf(s, x -> 3 * x - 1), r), 1e-9 * scale, s.toString());
            // symmetric
            for (int i = 0; i < r.numRows; i++) {
                for (int j = 0; j < r.numCols; j++) {
                    assertEquals(r.get(i, j), r.get(j, i), 0.0);
                }
            }
        }
        // a quadratic space: every clr function is c x² + linear, R has rank 1
        BayesSpace q = BayesSpace.polynomials(0, 3, 2);
        DMatrixRMaj r = Penalties.secondDerivative(q);
        assertEquals(12.0, quad(coordinatesOf(q, x -> x * x), r), 1e-10);
    }

    /**
     * Against Commons Math: for random clr functions of a cubic spline space with uneven knots and
     * of a polynomial space, interpolate β on each span with {@code PolynomialFunctionLagrangeForm}
     * at equally spaced points, differentiate twice with {@code PolynomialFunction}, and integrate
     * (β'')² with {@code IterativeLegendreGaussIntegrator} (all general-purpose Commons Math).
     */
    @Test
    void agreesWithCommonsMathInterpolationAndIntegration() {
        Random rnd = new Random(17);
        BayesSpace[] spaces = {
            BayesSpace.splines(0, 4, 4, new double[] {0.3, 1.1, 1.2, 2.5, 3.9}),
            BayesSpace.splines(-2, 1, 5, 6),
            BayesSpace.polynomials(-1, 1, 7),
        };
        for (BayesSpace s : spaces) {
            DMatrixRMaj r = Penalties.secondDerivative(s);
            int degree = s.basis().kind() == io.densa.core.Basis.Kind.SPLINE ? s.basis().order() - 1
                    : s.basis().order();
            double[] bp = s.basis().breakpoints();
            for (int rep = 0; rep < 3; rep++) {
                double[] c = new double[s.dimension()];
                for (int i = 0; i < c.length; i++) {
                    c[i] = rnd.nextGaussian();
                }
                double ref = 0;
                for (int span = 0; span + 1 < bp.length; span++) {
                    double lo = bp[span];
                    double hi = bp[span + 1];
                    double[] xs = new double[degree + 1];
                    for (int j = 0; j <= degree; j++) {
                        // interior points only, so the span's own polynomial piece is sampled
                        xs[j] = lo + (hi - lo) * (j + 0.5) / (degree + 1);
                    }
                    double[] ys = DenseAlgebra.clrAt(s, c, xs);
                    PolynomialFunction p = new PolynomialFunction(
                            new PolynomialFunctionLagrangeForm(xs, ys).getCoefficients());
                    PolynomialFunction p2 = p.polynomialDerivative().polynomialDerivative();
                    ref += new IterativeLegendreGaussIntegrator(8, 1e-13, 1e-13)
                            .integrate(100000, t -> p2.value(t) * p2.value(t), lo, hi);
                }
                double got = quad(c, r);
                assertEquals(ref, got, 1e-7 * ref, s + " replicate " + rep);
            }
        }
    }

    @Test
    void rejectsSpacesWithoutSquareIntegrableSecondDerivative() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Penalties.secondDerivative(BayesSpace.steps(0, 1, 5)));
        assertTrue(e.getMessage().contains("step space") && e.getMessage().contains("ridge"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> Penalties.secondDerivative(BayesSpace.splines(0, 1, 2, 4)));
        assertTrue(e.getMessage().contains("order >= 3"), e.getMessage());
        // degree-1 polynomials: every clr function is linear, the penalty is zero
        DMatrixRMaj z = Penalties.secondDerivative(BayesSpace.polynomials(0, 1, 1));
        assertEquals(0.0, z.get(0, 0), 0.0);
    }

    /** Gauss–Legendre rule: exact for monomials up to degree 2m − 1 (∫_{−1}^{1} x^j = 2/(j+1), j even). */
    @Test
    void gaussLegendreRuleIsExactToItsDegree() {
        for (int m = 1; m <= 12; m++) {
            double[][] g = Penalties.gaussLegendre(m);
            for (int j = 0; j <= 2 * m - 1; j++) {
                double s = 0;
                for (int i = 0; i < m; i++) {
                    s += g[1][i] * Math.pow(g[0][i], j);
                }
                assertEquals(j % 2 == 0 ? 2.0 / (j + 1) : 0.0, s, 1e-14, "m = " + m + ", degree " + j);
            }
        }
    }
}
