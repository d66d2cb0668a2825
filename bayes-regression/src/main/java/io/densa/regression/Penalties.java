package io.densa.regression;

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
     * Second-derivative roughness R_kl ≈ ∫ e_k''(t) e_l''(t) dt, so that bᵀ R b ≈ ∫ (β'')² dt for
     * the clr function β = Σ b_k e_k: second differences of the basis on {@code points} equally
     * spaced points of the domain; the second differences at the points − 2 interior points are
     * summed with equal weights (b − a)/(points − 2) (a finite-difference approximation, exact for
     * clr functions of degree ≤ 2 and accurate to O(h) otherwise; meant for spline and polynomial
     * spaces, not for step spaces whose clr functions jump).
     *
     * @param points grid size, at least 5
     */
    public static DMatrixRMaj secondDerivative(BayesSpace space, int points) {
        Objects.requireNonNull(space, "space");
        if (points < 5) {
            throw new IllegalArgumentException("need at least 5 grid points, got " + points);
        }
        int k = space.dimension();
        double a = space.lower();
        double b = space.upper();
        double h = (b - a) / (points - 1);
        double[] xs = new double[points];
        for (int i = 0; i < points; i++) {
            xs[i] = i == points - 1 ? b : a + i * h;
        }
        DMatrixRMaj e = space.basisMatrix(xs);
        double[] r = new double[k * k];
        double[] d = new double[k];
        double wq = (b - a) / (points - 2); // the interior points share the whole length
        for (int q = 1; q < points - 1; q++) {
            for (int j = 0; j < k; j++) {
                d[j] = (e.data[(q - 1) * k + j] - 2 * e.data[q * k + j] + e.data[(q + 1) * k + j]) / (h * h);
            }
            for (int j = 0; j < k; j++) {
                for (int l = 0; l < k; l++) {
                    r[j * k + l] += wq * d[j] * d[l];
                }
            }
        }
        return DMatrixRMaj.wrap(k, k, r);
    }
}
