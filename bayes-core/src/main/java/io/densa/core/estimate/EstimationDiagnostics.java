package io.densa.core.estimate;

import io.densa.core.NumericalDiagnostics;
import io.densa.core.internal.RecordArrays;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * Diagnostics of one estimated density.
 *
 * <p>The coordinate covariance is a K × K row-major matrix in the space's orthonormal
 * coordinates; because B2 is Euclidean in those coordinates, its trace is the expected squared B2
 * distance between the estimate and its own mean, reported as {@link #estimationVariance()}.
 * Which approximation it is depends on the estimator (see its documentation). It is positive
 * semi-definite (a sandwich that rounding leaves slightly indefinite is projected onto the nearest
 * positive semi-definite matrix). For a unit without events returned as the reference density (only
 * the penalised likelihood with its reference prior of weight w) it is the prior's, (P(I)/w) I.
 *
 * <p>Every number is finite. Inputs outside the estimators' accepted range are rejected with an
 * {@link IllegalArgumentException} instead: a total count or total sample weight above 2⁵³, a
 * criterion that is undefined at every λ it could choose (e.g. AICc with N ≤ 1), units without
 * events where no prior gives them a covariance.
 *
 * <p>Equality compares the covariance by content.
 *
 * @param id                        the unit's id, or "#i" for row i when no ids were given
 * @param status                    outcome of the fit
 * @param reason                    human-readable explanation when the status is not
 *                                  {@link Status#CONVERGED}; for a converged fit empty, or a note
 *                                  that the requested criterion is undefined at the user's fixed λ
 *                                  (AICc with N ≤ edf + 1, GCV with edf ≥ the number of bins, the
 *                                  marginal likelihood at λ = 0 without the reference prior) and
 *                                  AIC is reported instead (see {@link #criterion()}), or a note
 *                                  that the chosen λ is weakly determined by the data (the
 *                                  marginal likelihood flat or not convex there; the covariance's
 *                                  λ-uncertainty term then comes from the bound of the plausible
 *                                  range of λ, see {@code PenalizedLikelihoodEstimator}); when the
 *                                  penalised information is singular (possible only without the
 *                                  reference prior) the status is {@link Status#NOT_CONVERGED} and
 *                                  the reason says that edf, covariance and criterion were computed
 *                                  with the default reference prior added; a unit whose counts were
 *                                  read as censored (a declared detection limit, or a run of empty end
 *                                  bins under the estimator's reading of empty ends) says so and
 *                                  names the censored cells
 * @param smoothing                 the smoothing parameter λ used (0 for a unit without events)
 * @param smoothingChosen           whether λ was chosen by the criterion (false: fixed by the
 *                                  user, or a unit without events)
 * @param criterion                 the criterion used to choose (or reported at fixed) λ; AIC
 *                                  when the requested one is undefined at a fixed λ (see reason)
 * @param criterionValue            its value at λ (smaller is better); 0 for a unit without events
 *                                  (−2 log of the marginal likelihood of no data)
 * @param effectiveDegreesOfFreedom edf = tr(J⁻¹F) (penalised likelihood) or tr(hat matrix)
 *                                  (least squares)
 * @param logLikelihood             the log-likelihood at the estimate (multinomial without the
 *                                  constant, or Σ w_i log f(x_i) w.r.t. the reference); for the
 *                                  least-squares smoothing spline the multinomial log-likelihood of
 *                                  the counts under its estimate
 * @param total                     total count, or total weight of the sample
 * @param iterations                Newton iterations of the final fit (0 for closed forms)
 * @param covariance                K × K coordinate covariance, row-major (copied in and out)
 * @param estimationVariance        trace of the covariance: the B2 estimation variance
 * @param extrapolationShare        share of the squared B2 norm of the estimate that lies deeper than
 *                                  its data can tell apart where it extrapolates, in [0, 1]: for each
 *                                  of the two regions E beyond the data (the domain below the first
 *                                  and above the last bin with events, for counts; below the
 *                                  smallest and above the largest observation with positive weight,
 *                                  for samples) with reference mass P_E, the detection level
 *                                  c*_E = log(Z / (N P_E)), Z = ∫ e^{clr} dP and N the number of
 *                                  events (total weight), is the clr at which the region would
 *                                  expect one event; the share is
 *                                  Σ_E ∫_E (c*_E − clr)₊² dP / ‖f‖²_B. Below c*_E an empty region is
 *                                  already what the data lead one to expect, so how much lower the
 *                                  estimate goes is set by extrapolation and the prior, not by the
 *                                  data. Empty bins between events are interpolated and do not
 *                                  count. 0 for an estimate equal to the reference, 1 for a unit
 *                                  without events. (The plain share of ‖f‖²_B over empty bins does
 *                                  not single such units out: on a simulated network it was
 *                                  0.45–0.65 for ordinary units whose normal tails had no events and
 *                                  0.6–0.85 for units whose clr dived to −70.) On a periodic
 *                                  space the bins span the whole circle, so nothing lies beyond
 *                                  them, and the two regions become one: the arc the data leave
 *                                  out, i.e. the longest circular run of bins without events (by
 *                                  reference mass), or the largest gap between circularly
 *                                  consecutive observations (taken modulo the period) for samples;
 *                                  shorter runs and gaps lie between events and do not count. It
 *                                  does not depend on where the bins start. See
 *                                  {@link #extrapolated()}
 */
public record EstimationDiagnostics(String id, Status status, String reason, double smoothing,
        boolean smoothingChosen, SmoothingCriterion criterion, double criterionValue,
        double effectiveDegreesOfFreedom, double logLikelihood, double total, int iterations,
        double[] covariance, double estimationVariance, double extrapolationShare) implements NumericalDiagnostics {

    /**
     * Threshold of {@link #extrapolated()}: a unit is flagged when more than this share of its
     * squared B2 norm lies below the detection level of the regions beyond its data. On three of
     * the simulated clipped networks of the examples (56 units, 1,000–4,000 events over 40 bins) units
     * whose clr dived (to −20 … −270, reference prior 0) had 0.19–0.98, the same units with the
     * default reference prior at most 0.08 and the other units at most 0.05 (our choice of
     * threshold, not a published value).
     */
    public static final double EXTRAPOLATION_THRESHOLD = 0.1;

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

    /**
     * Whether the estimate is carried by extrapolation: {@link #extrapolationShare()} above
     * {@value #EXTRAPOLATION_THRESHOLD}, i.e. most of the unit's squared B2 norm lies deeper, in
     * regions without events, than those regions' data can tell apart.
     * Such a unit's distances to others say more about how the estimator fills empty regions than
     * about the data; check it before it dominates a variogram, FPCA or kriging.
     */
    public boolean extrapolated() {
        return extrapolationShare > EXTRAPOLATION_THRESHOLD;
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

    /** Equality by content of every component (the covariance element by element). */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    @Override
    public String toString() {
        return "EstimationDiagnostics[" + id + ", " + status + (reason.isEmpty() ? "" : " (" + reason + ")")
                + ", lambda=" + smoothing + (smoothingChosen ? " by " + criterion : " fixed") + ", " + criterion
                + "=" + criterionValue + ", edf=" + effectiveDegreesOfFreedom + ", iterations=" + iterations
                + ", variance=" + estimationVariance + ", extrapolationShare=" + extrapolationShare + "]";
    }

    /** These diagnostics with the note added to the reason (after a "; " when it has one). */
    EstimationDiagnostics withNote(String note) {
        return new EstimationDiagnostics(id, status, reason.isEmpty() ? note : reason + "; " + note, smoothing,
                smoothingChosen, criterion, criterionValue, effectiveDegreesOfFreedom, logLikelihood, total, iterations,
                covariance, estimationVariance, extrapolationShare);
    }
}
