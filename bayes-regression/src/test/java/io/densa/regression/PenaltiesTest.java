package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Reference;
import java.util.Objects;
import java.util.Random;
import java.util.function.DoubleUnaryOperator;
import io.densa.core.Basis;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
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

    /**
     * Second derivation of the penalty: the library builds it from exact B-spline and Legendre
     * derivative recurrences (de Boor (1978); Abramowitz &amp; Stegun (1964), 22.7.16, from
     * memory); the oracle below interpolates the basis values instead. The two agree to rounding.
     */
    @Test
    void agreesWithBarycentricInterpolationOracle() {
        BayesSpace[] spaces = {
            BayesSpace.splines(0, 1, 4, 8), BayesSpace.splines(0, 100, 4, 8), BayesSpace.splines(-2, 3, 3, 5),
            BayesSpace.polynomials(-1, 1, 5), BayesSpace.polynomials(0, 10, 12), BayesSpace.splines(0, 1, 6, 20),
            BayesSpace.splines(0, 1, 4, 8).withReference(Reference.normal(0.5, 0.2))};
        for (BayesSpace s : spaces) {
            DMatrixRMaj r = Penalties.secondDerivative(s);
            DMatrixRMaj o = barycentricSecondDerivative(s);
            double max = 0;
            for (double v : o.data) {
                max = Math.max(max, Math.abs(v));
            }
            for (int i = 0; i < r.data.length; i++) {
                assertEquals(o.data[i], r.data[i], 1e-12 * max, s + ", entry " + i);
            }
        }
    }

    /**
     * Test-only oracle for {@link Penalties#secondDerivative}, by a different algorithm: on every
     * span each orthonormal basis function is a polynomial of degree d, determined by its values
     * at the d + 1 Chebyshev points of the second kind; its second derivative there is D² E with
     * D the barycentric differentiation matrix (Berrut and Trefethen (2004), Barycentric Lagrange
     * interpolation, SIAM Review 46(3), §9), carried by barycentric interpolation to the
     * max(1, d − 1) Gauss–Legendre points of Commons Math's rule, which integrate the degree
     * 2d − 4 product exactly. It uses only the public basis values of the space, not the B-spline
     * or Legendre derivative recurrences of the library.
     */
    private static DMatrixRMaj barycentricSecondDerivative(BayesSpace space) {
        Objects.requireNonNull(space, "space");
        Basis basis = space.basis();
        int degree;
        switch (basis.kind()) {
            case SPLINE:
                if (basis.order() < 3) {
                    throw new IllegalArgumentException("the second-derivative penalty needs splines of order >= 3;"
                            + " order " + basis.order() + " splines are piecewise linear, their second derivative"
                            + " is not square integrable (use order 4, cubic, or Penalties.ridge)");
                }
                degree = basis.order() - 1;
                break;
            case POLYNOMIAL:
                degree = basis.order();
                break;
            default:
                throw new IllegalArgumentException("the second-derivative penalty is undefined for the step space "
                        + space + ": its clr functions jump at the bin edges; use Penalties.ridge or a spline or"
                        + " polynomial space");
        }
        int k = space.dimension();
        double[] r = new double[k * k];
        if (degree < 2) {
            return DMatrixRMaj.wrap(k, k, r); // linear functions: β'' = 0
        }
        int np = degree + 1;
        double[] cheb = new double[np]; // on [−1, 1], increasing
        double[] bw = new double[np];   // barycentric weights of Chebyshev points of the second kind
        for (int j = 0; j < np; j++) {
            cheb[j] = -Math.cos(Math.PI * j / degree);
            bw[j] = ((j % 2 == 0) ? 1.0 : -1.0) * ((j == 0 || j == degree) ? 0.5 : 1.0);
        }
        cheb[0] = -1.0;
        cheb[degree] = 1.0;
        if (degree % 2 == 0) {
            cheb[degree / 2] = 0.0;
        }
        int ng = Math.max(1, degree - 1);
        GaussIntegrator rule = new GaussIntegratorFactory().legendreHighPrecision(ng, -1, 1);
        double[][] gl = new double[2][ng];
        for (int g = 0; g < ng; g++) {
            gl[0][g] = rule.getPoint(g);
            gl[1][g] = rule.getWeight(g);
        }
        // interpolation matrix from the Chebyshev points to the Gauss–Legendre points (on [−1, 1])
        double[] interp = new double[ng * np];
        for (int g = 0; g < ng; g++) {
            double t = gl[0][g];
            int hit = -1;
            double den = 0;
            for (int j = 0; j < np; j++) {
                if (t == cheb[j]) {
                    hit = j;
                    break;
                }
                den += bw[j] / (t - cheb[j]);
            }
            for (int j = 0; j < np; j++) {
                interp[g * np + j] = hit >= 0 ? (j == hit ? 1.0 : 0.0) : bw[j] / (t - cheb[j]) / den;
            }
        }
        double[] bp = basis.breakpoints();
        double[] xs = new double[np];
        double[] d1 = new double[np * np];
        double[] d2 = new double[np * np];
        double[] second = new double[np * k];
        double[] atGauss = new double[k];
        for (int s = 0; s + 1 < bp.length; s++) {
            double lo = bp[s];
            double hi = bp[s + 1];
            double half = 0.5 * (hi - lo);
            double mid = 0.5 * (hi + lo);
            for (int j = 0; j < np; j++) {
                xs[j] = j == 0 ? lo : j == degree ? hi : mid + half * cheb[j];
            }
            // differentiation matrix on the actual points:
            // D_ij = (w_j / w_i) / (x_i − x_j), D_ii = −Σ_{j≠i} D_ij
            for (int i = 0; i < np; i++) {
                double diag = 0;
                for (int j = 0; j < np; j++) {
                    if (j != i) {
                        double v = bw[j] / bw[i] / (xs[i] - xs[j]);
                        d1[i * np + j] = v;
                        diag -= v;
                    }
                }
                d1[i * np + i] = diag;
            }
            for (int i = 0; i < np; i++) {
                for (int j = 0; j < np; j++) {
                    double v = 0;
                    for (int m = 0; m < np; m++) {
                        v += d1[i * np + m] * d1[m * np + j];
                    }
                    d2[i * np + j] = v;
                }
            }
            DMatrixRMaj e = space.basisMatrix(xs);
            for (int i = 0; i < np; i++) {
                for (int c = 0; c < k; c++) {
                    double v = 0;
                    for (int j = 0; j < np; j++) {
                        v += d2[i * np + j] * e.data[j * k + c];
                    }
                    second[i * k + c] = v;
                }
            }
            for (int g = 0; g < ng; g++) {
                for (int c = 0; c < k; c++) {
                    double v = 0;
                    for (int j = 0; j < np; j++) {
                        v += interp[g * np + j] * second[j * k + c];
                    }
                    atGauss[c] = v;
                }
                double wq = half * gl[1][g];
                for (int i = 0; i < k; i++) {
                    double wi = wq * atGauss[i];
                    for (int l = i; l < k; l++) {
                        r[i * k + l] += wi * atGauss[l];
                    }
                }
            }
        }
        for (int i = 0; i < k; i++) {
            for (int l = 0; l < i; l++) {
                r[i * k + l] = r[l * k + i];
            }
        }
        return DMatrixRMaj.wrap(k, k, r);
    }
}
