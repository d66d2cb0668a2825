package io.densa.core;

import java.util.Arrays;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * Diagnostics of one estimated density.
 *
 * <p>The coordinate covariance is a K × K row-major matrix in the space's orthonormal
 * coordinates; because B2 is Euclidean in those coordinates, its trace is the expected squared B2
 * distance between the estimate and its own mean, reported as {@link #estimationVariance()}.
 * Which approximation it is depends on the estimator (see its documentation). For a unit without
 * events returned as the reference density the diagonal is +∞ (no information) and the
 * off-diagonal entries 0.
 *
 * <p>Equality compares the covariance by content.
 *
 * @param id                        the unit's id, or "#i" for row i when no ids were given
 * @param status                    outcome of the fit
 * @param reason                    human-readable explanation when the status is not
 *                                  {@link Status#CONVERGED}, else empty
 * @param smoothing                 the smoothing parameter λ used
 * @param smoothingChosen           whether λ was chosen by the criterion (false: fixed by the
 *                                  user)
 * @param criterion                 the criterion used to choose (or reported at fixed) λ
 * @param criterionValue            its value at λ (smaller is better)
 * @param effectiveDegreesOfFreedom edf = tr(J⁻¹F) (penalised likelihood) or tr(hat matrix)
 *                                  (least squares)
 * @param logLikelihood             the log-likelihood at the estimate (multinomial without the
 *                                  constant, or Σ w_i log f(x_i) w.r.t. the reference); NaN
 *                                  for the least-squares smoothing spline
 * @param total                     total count, or total weight of the sample
 * @param iterations                Newton iterations of the final fit (0 for closed forms)
 * @param covariance                K × K coordinate covariance, row-major (copied in and out)
 * @param estimationVariance        trace of the covariance: the B2 estimation variance
 */
public record EstimationDiagnostics(String id, Status status, String reason, double smoothing,
        boolean smoothingChosen, SmoothingCriterion criterion, double criterionValue,
        double effectiveDegreesOfFreedom, double logLikelihood, double total, int iterations,
        double[] covariance, double estimationVariance) {

    /** Outcome of fitting one unit. */
    public enum Status {
        /** The optimiser converged. */
        CONVERGED,
        /** The optimiser stopped without convergence; {@link #reason()} says why. */
        NOT_CONVERGED,
        /** The unit had no events and the reference density was returned. */
        EMPTY_UNIT_REFERENCE
    }

    /** Validates and copies. */
    public EstimationDiagnostics {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(status, "status");
        Objects.requireNonNull(reason, "reason");
        Objects.requireNonNull(criterion, "criterion");
        Objects.requireNonNull(covariance, "covariance");
        covariance = covariance.clone();
    }

    /** True when the status is {@link Status#CONVERGED}. */
    public boolean converged() {
        return status == Status.CONVERGED;
    }

    /** The covariance, row-major (a fresh copy). */
    @Override
    public double[] covariance() {
        return covariance.clone();
    }

    /** The covariance as a fresh K × K matrix. */
    public DMatrixRMaj covarianceMatrix() {
        int k = (int) Math.round(Math.sqrt(covariance.length));
        return new DMatrixRMaj(k, k, true, covariance);
    }

    @Override
    public boolean equals(Object o) {
        if (this == o) {
            return true;
        }
        if (!(o instanceof EstimationDiagnostics)) {
            return false;
        }
        EstimationDiagnostics d = (EstimationDiagnostics) o;
        return id.equals(d.id) && status == d.status && reason.equals(d.reason)
                && Double.compare(smoothing, d.smoothing) == 0 && smoothingChosen == d.smoothingChosen
                && criterion == d.criterion && Double.compare(criterionValue, d.criterionValue) == 0
                && Double.compare(effectiveDegreesOfFreedom, d.effectiveDegreesOfFreedom) == 0
                && Double.compare(logLikelihood, d.logLikelihood) == 0 && Double.compare(total, d.total) == 0
                && iterations == d.iterations && Arrays.equals(covariance, d.covariance)
                && Double.compare(estimationVariance, d.estimationVariance) == 0;
    }

    @Override
    public int hashCode() {
        return Objects.hash(id, status, smoothing, criterionValue, iterations, Arrays.hashCode(covariance));
    }

    @Override
    public String toString() {
        return "EstimationDiagnostics[" + id + ", " + status + (reason.isEmpty() ? "" : " (" + reason + ")")
                + ", lambda=" + smoothing + (smoothingChosen ? " by " + criterion : " fixed") + ", " + criterion
                + "=" + criterionValue + ", edf=" + effectiveDegreesOfFreedom + ", iterations=" + iterations
                + ", variance=" + estimationVariance + "]";
    }
}
