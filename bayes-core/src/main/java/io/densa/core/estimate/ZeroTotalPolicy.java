package io.densa.core.estimate;

/** What an estimator does with a unit that has no events (zero total count or empty sample). */
public enum ZeroTotalPolicy {
    /** Throw an {@link IllegalArgumentException} naming the unit (the default). */
    REJECT,
    /**
     * Return the reference density (the neutral element), flagged in the diagnostics with status
     * {@link EstimationDiagnostics.Status#EMPTY_UNIT_REFERENCE}; with the penalised likelihood's
     * reference prior of weight w the covariance is the prior's, (P(I)/w) I, large against any unit
     * with data, so that downstream weighting gives the unit little weight. Estimators without a
     * proper prior (the smoothing spline, the penalised likelihood with reference prior 0) reject
     * units without events instead: they have no finite covariance.
     */
    REFERENCE
}
