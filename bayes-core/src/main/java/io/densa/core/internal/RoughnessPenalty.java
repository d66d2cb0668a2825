package io.densa.core.internal;

import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.decomposition.eig.SymmetricQRAlgorithmDecomposition_DDRM;

/**
 * Roughness penalty matrices of a basis, in raw (pre-orthonormalisation) coefficients b with
 * clr(x) = φ(x)·b − const. Internal.
 *
 * <ul>
 * <li>Splines: P_ij = ∫_a^b φ_i^{(l)}(x) φ_j^{(l)}(x) dx, the l-th derivatives taken exactly from
 * the B-spline recurrence (de Boor (1978), A Practical Guide to Splines, Springer; the derivative
 * algorithm as in Piegl &amp; Tiller (1997), The NURBS Book, Springer, algorithm A2.3, from
 * memory), integrated per knot span by a Gauss–Legendre rule with k points, exact for the
 * piecewise polynomial of degree 2(k − 1 − l).</li>
 * <li>Polynomials: the same integral, with derivatives of the Legendre polynomials from
 * P'_{n+1} − P'_{n−1} = (2n + 1) P_n (Abramowitz &amp; Stegun 1964, 22.7.16, from memory) and a
 * rule with d + 1 points (exact).</li>
 * <li>Steps: the difference penalty Σ_i (Δ^l y)_i² on the bin clr values y = (b_1, …, b_{D−1}, 0)
 * (a difference penalty in the manner of Eilers &amp; Marx (1996), Flexible smoothing with
 * B-splines and penalties, Statistical Science 11(2), from memory).</li>
 * <li>Periodic splines: the same integral over the whole circle, without boundary: the derivatives
 * of the B-splines on the knots continued around the circle (the same recurrence), accumulated into
 * their raw index ({@link RawBasis#periodicIndex}) per knot span with a k-point rule (exact).</li>
 * <li>Fourier: cos(jωx) and sin(jωx), ω = 2π/P, have l-th derivatives (jω)^l times a cos or sin of the
 * same frequency, orthogonal over a period, so the penalty is diagonal with (jω)^{2l} P/2.</li>
 * </ul>
 * Because the basis is centred and orthonormalised by e = T(φ − φ̄), the penalty of coordinates c
 * is c'Ωc with Ω = T P T'.
 *
 * <p>Internal: not exported outside the Densa modules; may change without notice.
 */
public final class RoughnessPenalty {
    private RoughnessPenalty() {
    }

    /**
     * The penalty in coordinates, Ω = T P Tᵀ, for a symmetric K × K raw penalty P (row-major) and
     * the lower-triangular basis transform T of the space (coordinates c = (Tᵀ)⁻¹ b).
     *
     * @return a fresh symmetric K × K matrix, row-major
     */
    public static double[] inCoordinates(double[] t, double[] m, int k) {
        return Cholesky.lowerCongruence(t, m, k);
    }

    /** Largest admissible derivative order for a basis. */
    public static int maxOrder(RawBasis basis) {
        if (basis.isFourier()) {
            return 6;
        }
        if (basis.isSpline() || basis.isPeriodicSpline()) {
            return basis.order() - 1;
        }
        return basis.isPolynomial() ? basis.order() : basis.size();
    }

    /** The raw K × K penalty (row-major) for derivative / difference order l ≥ 1. */
    public static double[] raw(RawBasis basis, int l) {
        if (!(l >= 1 && l <= maxOrder(basis))) {
            throw new IllegalArgumentException("penalty order must be in [1, " + maxOrder(basis) + "] for " + basis
                    + " (derivatives of order >= the spline order vanish), got " + l);
        }
        if (basis.isSpline()) {
            return spline(basis, l);
        }
        if (basis.isPeriodicSpline()) {
            return periodicSpline(basis, l);
        }
        if (basis.isFourier()) {
            return fourier(basis, l);
        }
        return basis.isPolynomial() ? polynomial(basis, l) : steps(basis, l);
    }

    private static double[] spline(RawBasis basis, int l) {
        int k = basis.order();
        int p = k - 1;
        int size = basis.size();
        int m = size + 1; // number of B-splines
        double[] br = basis.knotsView();
        int g = br.length - 2;
        double[] u = new double[g + 2 * k];
        for (int i = 0; i < k; i++) {
            u[i] = br[0];
            u[g + k + i] = br[g + 1];
        }
        System.arraycopy(br, 1, u, k, g);
        double[] gx = GaussLegendre.nodes(k);
        double[] gw = GaussLegendre.weights(k);
        double[] pen = new double[size * size];
        double[][] ders = new double[l + 1][k];
        for (int s = p; s < m; s++) {
            double lo = u[s], hi = u[s + 1];
            if (!(hi > lo)) {
                continue;
            }
            double h = 0.5 * (hi - lo), c = 0.5 * (hi + lo);
            for (int q = 0; q < k; q++) {
                double x = c + h * gx[q];
                derivatives(s, x, p, l, u, ders);
                double w = h * gw[q];
                double[] d = ders[l];
                for (int i = 0; i <= p; i++) {
                    int ri = s - p + i;
                    if (ri >= size) {
                        continue;
                    }
                    double wi = w * d[i];
                    for (int j = 0; j <= p; j++) {
                        int rj = s - p + j;
                        if (rj < size) {
                            pen[ri * size + rj] += wi * d[j];
                        }
                    }
                }
            }
        }
        return pen;
    }

    private static double[] periodicSpline(RawBasis basis, int l) {
        int k = basis.order();
        int p = k - 1;
        int size = basis.size();
        int n = basis.knotsView().length - 1; // knots on the circle
        double[] u = RawBasis.periodicKnots(k, basis.knotsView());
        double[] gx = GaussLegendre.nodes(k);
        double[] gw = GaussLegendre.weights(k);
        double[] pen = new double[size * size];
        double[][] ders = new double[l + 1][k];
        for (int s = p; s < p + n; s++) {
            double lo = u[s], hi = u[s + 1];
            double h = 0.5 * (hi - lo), c = 0.5 * (hi + lo);
            for (int q = 0; q < k; q++) {
                derivatives(s, c + h * gx[q], p, l, u, ders);
                double w = h * gw[q];
                double[] d = ders[l];
                for (int i = 0; i <= p; i++) {
                    int ri = basis.periodicIndex(Math.floorMod(s - p + i - p, n));
                    if (ri >= size) {
                        continue;
                    }
                    for (int j = 0; j <= p; j++) {
                        int rj = basis.periodicIndex(Math.floorMod(s - p + j - p, n));
                        if (rj < size) {
                            pen[ri * size + rj] += w * d[i] * d[j];
                        }
                    }
                }
            }
        }
        return pen;
    }

    private static double[] fourier(RawBasis basis, int l) {
        int size = basis.size();
        double[] br = basis.knotsView();
        double period = br[1] - br[0];
        double[] pen = new double[size * size];
        for (int j = 1; 2 * j <= size; j++) {
            double v = Math.pow(2 * Math.PI * j / period, 2.0 * l) * period / 2;
            pen[(2 * j - 2) * size + 2 * j - 2] = v;
            pen[(2 * j - 1) * size + 2 * j - 1] = v;
        }
        return pen;
    }

    /**
     * Derivatives 0..n of the p + 1 B-splines of degree p nonzero on span s at x:
     * ders[d][j] = d-th derivative of B_{s−p+j}. Piegl &amp; Tiller (1997), A2.3 (from memory).
     */
    static void derivatives(int s, double x, int p, int n, double[] u, double[][] ders) {
        double[][] ndu = new double[p + 1][p + 1];
        double[] left = new double[p + 1];
        double[] right = new double[p + 1];
        ndu[0][0] = 1.0;
        for (int j = 1; j <= p; j++) {
            left[j] = x - u[s + 1 - j];
            right[j] = u[s + j] - x;
            double saved = 0.0;
            for (int r = 0; r < j; r++) {
                ndu[j][r] = right[r + 1] + left[j - r];
                double temp = ndu[r][j - 1] / ndu[j][r];
                ndu[r][j] = saved + right[r + 1] * temp;
                saved = left[j - r] * temp;
            }
            ndu[j][j] = saved;
        }
        for (int j = 0; j <= p; j++) {
            ders[0][j] = ndu[j][p];
        }
        double[][] a = new double[2][p + 1];
        for (int r = 0; r <= p; r++) {
            int s1 = 0, s2 = 1;
            a[0][0] = 1.0;
            for (int k = 1; k <= n; k++) {
                double d = 0.0;
                int rk = r - k, pk = p - k;
                if (r >= k) {
                    a[s2][0] = a[s1][0] / ndu[pk + 1][rk];
                    d = a[s2][0] * ndu[rk][pk];
                }
                int j1 = rk >= -1 ? 1 : -rk;
                int j2 = r - 1 <= pk ? k - 1 : p - r;
                for (int j = j1; j <= j2; j++) {
                    a[s2][j] = (a[s1][j] - a[s1][j - 1]) / ndu[pk + 1][rk + j];
                    d += a[s2][j] * ndu[rk + j][pk];
                }
                if (r <= pk) {
                    a[s2][k] = -a[s1][k - 1] / ndu[pk + 1][r];
                    d += a[s2][k] * ndu[r][pk];
                }
                ders[k][r] = d;
                int tmp = s1;
                s1 = s2;
                s2 = tmp;
            }
        }
        double f = p;
        for (int k = 1; k <= n; k++) {
            for (int j = 0; j <= p; j++) {
                ders[k][j] *= f;
            }
            f *= p - k;
        }
    }

    private static double[] polynomial(RawBasis basis, int l) {
        int deg = basis.order();
        double a = basis.knotsView()[0], b = basis.knotsView()[1];
        int npts = deg + 1;
        double[] gx = GaussLegendre.nodes(npts);
        double[] gw = GaussLegendre.weights(npts);
        double scale = Math.pow(2.0 / (b - a), l);
        double[] pen = new double[deg * deg];
        double[][] dv = new double[l + 1][deg + 1];
        for (int q = 0; q < npts; q++) {
            double t = gx[q];
            // level 0: Legendre values
            dv[0][0] = 1;
            if (deg >= 1) {
                dv[0][1] = t;
            }
            for (int n = 1; n < deg; n++) {
                dv[0][n + 1] = ((2.0 * n + 1) * t * dv[0][n] - n * dv[0][n - 1]) / (n + 1);
            }
            for (int mm = 1; mm <= l; mm++) {
                dv[mm][0] = 0;
                dv[mm][1] = mm == 1 ? 1 : 0;
                for (int n = 1; n < deg; n++) {
                    dv[mm][n + 1] = dv[mm][n - 1] + (2.0 * n + 1) * dv[mm - 1][n];
                }
            }
            double w = gw[q] * 0.5 * (b - a) * scale * scale;
            for (int i = 0; i < deg; i++) {
                double di = dv[l][i + 1];
                for (int j = 0; j < deg; j++) {
                    pen[i * deg + j] += w * di * dv[l][j + 1];
                }
            }
        }
        return pen;
    }

    private static double[] steps(RawBasis basis, int l) {
        int bins = basis.size() + 1;
        int size = basis.size();
        // difference matrix of order l on `bins` values, rows = bins − l
        double[] coef = new double[l + 1]; // coefficients of (1 − z)^l
        coef[0] = 1;
        for (int o = 1; o <= l; o++) {
            for (int i = o; i >= 1; i--) {
                coef[i] = coef[i] - coef[i - 1];
            }
        }
        double[] pen = new double[size * size];
        for (int r = 0; r + l < bins; r++) {
            for (int i = 0; i <= l; i++) {
                int ci = r + i;
                if (ci >= size) {
                    continue;
                }
                for (int j = 0; j <= l; j++) {
                    int cj = r + j;
                    if (cj < size) {
                        pen[ci * size + cj] += coef[i] * coef[j];
                    }
                }
            }
        }
        return pen;
    }

    /** Numerical rank of a symmetric positive semi-definite K × K matrix (eigenvalues above 10⁻⁹ max). */
    public static int rank(double[] m, int k) {
        SymmetricQRAlgorithmDecomposition_DDRM eig = new SymmetricQRAlgorithmDecomposition_DDRM(false);
        if (!eig.decompose(new DMatrixRMaj(k, k, true, m))) {
            return k;
        }
        double max = 0;
        for (int i = 0; i < k; i++) {
            max = Math.max(max, Math.abs(eig.getEigenvalue(i).getReal()));
        }
        int r = 0;
        for (int i = 0; i < k; i++) {
            if (eig.getEigenvalue(i).getReal() > 1e-9 * max) {
                r++;
            }
        }
        return r;
    }
}
