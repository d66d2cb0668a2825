package io.densa.regression;

import io.densa.core.DensitySet;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * Configuration of the function-on-scalar regression clr y_i = Σ_j x_ij clr β_j + clr ε_i, a
 * density response on scalar covariates (Talská et al. (2018), Compositional regression with
 * functional response, Comput. Stat. Data Anal. 123). In coordinates, with the n × K response
 * matrix C, the n × p design X, weights W = diag(w) and a K × K penalty matrix R, the
 * coefficient matrix B (p × K, row j = coordinates of β_j) minimises
 *
 * <pre>
 *   Σ_i w_i ‖c_i − Bᵀ x_i‖² + λ Σ_{j ≠ intercept} b_jᵀ R b_j .
 * </pre>
 *
 * <p>With λ = 0 this is B̂ = (XᵀWX)⁻¹ XᵀWC, per coordinate the (weighted) least-squares fit. With
 * λ &gt; 0 the normal equations XᵀWX B + λ D B R = XᵀWC (D the indicator of penalised columns)
 * decouple through R = U Λ Uᵀ: column l of B U solves (XᵀWX + λ Λ_l D) b̃_l = (XᵀWC U)_l. The
 * intercept is never penalised. Both are computed by Householder QR of the whitened design √W X
 * (augmented by the rows √(λ Λ_l) e_jᵀ of the penalised columns), never by forming XᵀWX, so the
 * accuracy depends on cond(√W X) rather than its square (Golub and Van Loan (2013), Matrix
 * Computations, 4th ed., §5.3). {@link Penalties#secondDerivative} gives a roughness penalty
 * ∫ (β'')², {@link Penalties#ridge} the B2 norm.
 *
 * <p>Weights are population sizes or inverse estimation variances (larger = more reliable);
 * they must be positive and finite.
 *
 * <p>Immutable and thread-safe.
 */
public final class FunctionOnScalarRegression {
    private final double lambda;
    private final DMatrixRMaj penalty;

    private FunctionOnScalarRegression(double lambda, DMatrixRMaj penalty) {
        this.lambda = lambda;
        this.penalty = penalty;
    }

    /** Unpenalised least squares. */
    public static FunctionOnScalarRegression withDefaults() {
        return new FunctionOnScalarRegression(0.0, null);
    }

    /**
     * With penalty λ bᵀ R b on every non-intercept coefficient.
     *
     * @param lambda  ≥ 0, finite
     * @param penalty K × K symmetric positive semi-definite matrix (copied)
     * @throws IllegalArgumentException if λ is negative or NaN, or R is not square, symmetric,
     *                                  finite and positive semi-definite (smallest eigenvalue ≥
     *                                  −10⁻¹⁰ times the largest)
     */
    public FunctionOnScalarRegression withPenalty(double lambda, DMatrixRMaj penalty) {
        if (!(lambda >= 0) || Double.isInfinite(lambda)) {
            throw new IllegalArgumentException("penalty weight λ must be finite and >= 0, got " + lambda);
        }
        Objects.requireNonNull(penalty, "penalty");
        int k = penalty.numRows;
        if (penalty.numCols != k) {
            throw new IllegalArgumentException("penalty matrix must be square, got " + penalty.numRows + " x "
                    + penalty.numCols);
        }
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                double v = penalty.get(i, j);
                if (!Double.isFinite(v) || Math.abs(v - penalty.get(j, i)) > 1e-10 * (1 + Math.abs(v))) {
                    throw new IllegalArgumentException("penalty matrix must be finite and symmetric; entry (" + i
                            + ", " + j + ") = " + v);
                }
            }
        }
        double[] range = DenseAlgebra.eigenvalueRange(penalty.data, k);
        if (!(range[0] >= -1e-10 * Math.max(Math.abs(range[1]), Double.MIN_NORMAL))) {
            throw new IllegalArgumentException("penalty matrix must be positive semi-definite; its smallest"
                    + " eigenvalue is " + range[0] + " (largest " + range[1] + "); a negative direction would"
                    + " reward roughness instead of penalising it");
        }
        return new FunctionOnScalarRegression(lambda, penalty.copy());
    }

    /** The penalty weight λ (0 without penalty). */
    public double lambda() {
        return lambda;
    }

    /** A copy of the penalty matrix, or null without penalty. */
    public DMatrixRMaj penalty() {
        return penalty == null ? null : penalty.copy();
    }

    /** Fits with unit weights. */
    public FunctionOnScalarFit fit(Design design, DensitySet response) {
        return fit(design, response, null);
    }

    /**
     * Fits the model.
     *
     * @param design   n × p design
     * @param response n densities
     * @param weights  n finite observation weights of at least {@link Double#MIN_NORMAL}, the largest
     *                 at most 1e300 times the smallest (only their ratios change the estimates), or
     *                 null for unit weights (copied)
     * @throws IllegalArgumentException on mismatched row counts, bad weights, a penalty of the
     *                                  wrong dimension, fewer observations than parameters or a
     *                                  rank-deficient design (naming the columns), or response
     *                                  coordinates above 1e150 / √(n·K) in magnitude (their
     *                                  squares would leave the double range)
     */
    public FunctionOnScalarFit fit(Design design, DensitySet response, double[] weights) {
        Objects.requireNonNull(design, "design");
        Objects.requireNonNull(response, "response");
        int n = design.rows();
        Arguments.rows(response, n, "response");
        Arguments.requireModerate(response, "response");
        if (penalty != null && penalty.numRows != response.dimension()) {
            throw new IllegalArgumentException("penalty matrix is " + penalty.numRows + " x " + penalty.numRows
                    + " but the response space has K = " + response.dimension());
        }
        double[] w = null;
        if (weights != null) {
            if (weights.length != n) {
                throw new IllegalArgumentException("weights has " + weights.length + " entries for " + n
                        + " observations");
            }
            w = weights.clone();
            double lo = Double.POSITIVE_INFINITY, hi = 0;
            for (int i = 0; i < n; i++) {
                if (!(w[i] >= Double.MIN_NORMAL) || Double.isInfinite(w[i])) {
                    throw new IllegalArgumentException("weight of row " + i + " (id " + response.id(i) + ") is "
                            + w[i] + "; weights must be finite and at least " + Double.MIN_NORMAL
                            + " (positive normal doubles)");
                }
                lo = Math.min(lo, w[i]);
                hi = Math.max(hi, w[i]);
            }
            if (!(hi / lo <= 1e300)) {
                throw new IllegalArgumentException("weights span from " + lo + " to " + hi + "; a ratio of the largest"
                        + " to the smallest weight up to 1e300 is accepted (only ratios matter)");
            }
        }
        design.requireFullRank(w, 0, "function-on-scalar regression");
        return FunctionOnScalarFit.fit(this, design, response, w);
    }

    @Override
    public String toString() {
        return "FunctionOnScalarRegression[λ=" + lambda + (penalty == null ? "" : ", K=" + penalty.numRows) + "]";
    }
}
