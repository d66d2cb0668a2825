package io.densa.spatial;

/**
 * A fitted variogram model with its diagnostics. Immutable: the array is copied on construction
 * and by its accessor; equality is by content.
 *
 * @param model        the fitted model (structure plus nugget if fitted and positive)
 * @param method       the criterion minimised
 * @param criterion    the minimised criterion value
 * @param rmse         root mean squared difference γ̂(h_j) − γ(h_j; θ̂) over the bins used
 * @param fitted       γ(h_j; θ̂) at the mean lag of every bin (NaN for empty bins)
 * @param binsUsed     number of non-empty bins used
 * @param evaluations  criterion evaluations
 * @param converged    whether the optimiser stopped on its own criterion (not the budget)
 * @param rangeAtBound whether the range (or exponent) ended within 0.1% of a bound
 */
public record VariogramFit(VariogramModel model, VariogramFitOptions.Method method, double criterion, double rmse,
        double[] fitted, int binsUsed, int evaluations, boolean converged, boolean rangeAtBound) {

    /** Copies the array components (the caller keeps its arrays). */
    public VariogramFit {
        fitted = RecordArrays.copy(fitted);
    }

    /** A copy of the {@code fitted} component. */
    @Override
    public double[] fitted() {
        return RecordArrays.copy(fitted);
    }

    private Object[] parts() {
        return new Object[] {model, method, criterion, rmse, fitted, binsUsed, evaluations, converged, rangeAtBound};
    }

    /** Equality by content of every component (arrays element by element). */
    @Override
    public boolean equals(Object o) {
        return o instanceof VariogramFit other && RecordArrays.equal(parts(), other.parts());
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(parts());
    }

    /** The components, arrays printed by content. */
    @Override
    public String toString() {
        return RecordArrays.describe("VariogramFit", new String[] {"model", "method", "criterion", "rmse", "fitted", "binsUsed", "evaluations", "converged", "rangeAtBound"}, parts());
    }
}
