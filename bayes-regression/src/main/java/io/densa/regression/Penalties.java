package io.densa.regression;

import io.densa.core.Basis;
import io.densa.core.BayesSpace;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * Penalty matrices on coordinates for the penalised regressions. A penalty matrix R (K × K,
 * symmetric, positive semi-definite) defines the roughness of a clr function with coordinates b
 * as bᵀ R b.
 */
public final class Penalties {
    private Penalties() {
    }

    /**
     * The ridge penalty R = I: bᵀ R b = ‖b‖² is the squared B2 norm of the coefficient
     * function (the basis is orthonormal).
     *
     * @param k dimension K, at least 1
     * @return a fresh K × K identity matrix
     */
    public static DMatrixRMaj ridge(int k) {
        if (k < 1) {
            throw new IllegalArgumentException("dimension must be >= 1, got " + k);
        }
        DMatrixRMaj r = new DMatrixRMaj(k, k);
        for (int i = 0; i < k; i++) {
            r.data[i * k + i] = 1.0;
        }
        return r;
    }

    /**
     * The exact second-derivative roughness matrix R_kl = ∫_a^b e_k''(t) e_l''(t) dt (Lebesgue
     * measure, whatever the reference), so that bᵀ R b = ∫ (β'')² dt for the clr function
     * β = Σ b_k e_k.
     *
     * <p>On every span [t_s, t_{s+1}] between consecutive breakpoints of the basis
     * ({@link Basis#breakpoints()}) each orthonormal basis function is a polynomial of degree d
     * (d = order − 1 for splines, the degree for polynomials: it is a fixed linear combination of
     * centred B-splines or Legendre polynomials). Its values at the d + 1 Chebyshev points of the
     * second kind of the span determine it exactly; the second derivative at those points is
     * D² E with D the barycentric differentiation matrix (Berrut and Trefethen (2004),
     * Barycentric Lagrange interpolation, SIAM Review 46(3), §9), and it is carried to
     * max(1, d − 1) Gauss–Legendre points of the span by barycentric interpolation. Because
     * (e_k'')(e_l'') has degree 2d − 4 ≤ 2 max(1, d − 1) − 1, the Gauss–Legendre rule is exact:
     * the matrix is exact up to rounding (relative error about d⁴ times the machine epsilon).
     *
     * <p>Cost: per span one evaluation of the basis at d + 1 points and O(d² K + d K²) work.
     *
     * @param space a spline space of order ≥ 3 or a polynomial space
     * @return a fresh symmetric positive semi-definite K × K matrix; clr functions that are
     *         linear on the whole domain are in its null space
     * @throws IllegalArgumentException for a step space (its clr functions jump at the bin edges,
     *                                  so ∫ (β'')² is not defined; use {@link #ridge}) or for
     *                                  splines of order 2 (piecewise linear: β' jumps at the knots)
     */
    public static DMatrixRMaj secondDerivative(BayesSpace space) {
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
        double[][] gl = gaussLegendre(ng);
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

    /**
     * Nodes (row 0, increasing) and weights (row 1) of the m-point Gauss–Legendre rule on [−1, 1],
     * by Newton's method on the three-term recurrence of the Legendre polynomials (Golub and Welsch
     * (1969), Calculation of Gauss quadrature rules, Math. Comp. 23, for the rule; the Newton
     * iteration from the Chebyshev-like initial guesses is common practice).
     */
    static double[][] gaussLegendre(int m) {
        double[] x = new double[m];
        double[] w = new double[m];
        for (int i = 0; i < (m + 1) / 2; i++) {
            double z = Math.cos(Math.PI * (i + 0.75) / (m + 0.5));
            double dp = 0;
            for (int it = 0; it < 100; it++) {
                double p0 = 1.0;
                double p1 = 0.0;
                for (int j = 1; j <= m; j++) {
                    double p2 = p1;
                    p1 = p0;
                    p0 = ((2 * j - 1) * z * p1 - (j - 1) * p2) / j;
                }
                dp = m * (z * p0 - p1) / (z * z - 1);
                double z1 = z;
                z = z1 - p0 / dp;
                if (Math.abs(z - z1) <= 1e-16) {
                    break;
                }
            }
            // recompute the derivative at the converged node
            double p0 = 1.0;
            double p1 = 0.0;
            for (int j = 1; j <= m; j++) {
                double p2 = p1;
                p1 = p0;
                p0 = ((2 * j - 1) * z * p1 - (j - 1) * p2) / j;
            }
            dp = m * (z * p0 - p1) / (z * z - 1);
            x[i] = -z;
            x[m - 1 - i] = z;
            w[i] = 2 / ((1 - z * z) * dp * dp);
            w[m - 1 - i] = w[i];
        }
        if (m % 2 == 1) {
            x[m / 2] = 0.0;
        }
        return new double[][] {x, w};
    }
}
