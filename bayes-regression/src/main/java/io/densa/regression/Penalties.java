package io.densa.regression;

import io.densa.core.Basis;
import io.densa.core.BayesSpace;
import io.densa.core.internal.RawBasis;
import io.densa.core.internal.RoughnessPenalty;
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
     * <p>The orthonormal basis is e = T(φ − φ̄) for the raw functions φ (centred B-splines or
     * Legendre polynomials) and a lower-triangular T, so R = T P Tᵀ with the raw roughness
     * P_ij = ∫ φ_i'' φ_j'' dt. P is computed exactly, per span between breakpoints, from the
     * B-spline or Legendre derivative recurrences and a Gauss–Legendre rule exact for the
     * piecewise polynomial (de Boor (1978), A Practical Guide to Splines, Springer); it is the
     * same penalty the density estimators use.
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
        double[] bp = basis.breakpoints();
        RawBasis raw;
        switch (basis.kind()) {
            case SPLINE:
                if (basis.order() < 3) {
                    throw new IllegalArgumentException("the second-derivative penalty needs splines of order >= 3;"
                            + " order " + basis.order() + " splines are piecewise linear, their second derivative"
                            + " is not square integrable (use order 4, cubic, or Penalties.ridge)");
                }
                raw = RawBasis.spline(basis.order(), bp);
                break;
            case POLYNOMIAL:
                raw = RawBasis.polynomial(basis.order(), bp[0], bp[bp.length - 1]);
                break;
            case PERIODIC_SPLINE:
                if (basis.order() < 3) {
                    throw new IllegalArgumentException("the second-derivative penalty needs periodic splines of order"
                            + " >= 3; order " + basis.order() + " is piecewise linear (use order 4 or Penalties.ridge)");
                }
                raw = RawBasis.periodicSpline(basis.order(), bp);
                break;
            case FOURIER:
                raw = RawBasis.fourier(basis.order(), bp[0], bp[1]);
                break;
            default:
                throw new IllegalArgumentException("the second-derivative penalty is undefined for the step space "
                        + space + ": its clr functions jump at the bin edges; use Penalties.ridge or a spline or"
                        + " polynomial space");
        }
        int k = space.dimension();
        if (RoughnessPenalty.maxOrder(raw) < 2) {
            return new DMatrixRMaj(k, k); // linear functions: β'' = 0
        }
        return DMatrixRMaj.wrap(k, k,
                RoughnessPenalty.inCoordinates(space.basisTransform(), RoughnessPenalty.raw(raw, 2), k));
    }
}
