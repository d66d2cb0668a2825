package io.densa.spatial;

/**
 * A fitted variogram model with its diagnostics.
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
}
