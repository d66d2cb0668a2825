package io.densa.core;

/** What an estimator does with a unit that has no events (zero total count or empty sample). */
public enum ZeroTotalPolicy {
    /** Throw an {@link IllegalArgumentException} naming the unit (the default). */
    REJECT,
    /**
     * Return the reference density (the neutral element), flagged in the diagnostics with status
     * {@link EstimationDiagnostics.Status#EMPTY_UNIT_REFERENCE} and infinite estimation variance,
     * so that downstream weighting gives the unit no weight.
     */
    REFERENCE
}
