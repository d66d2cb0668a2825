package io.densa.spatial.variogram;

import io.densa.core.internal.RecordArrays;
import java.util.List;
import java.util.Objects;

/**
 * A fitted variogram model with its diagnostics. Immutable: the array is copied on construction
 * and by its accessor, the warning list is unmodifiable; equality is by content.
 *
 * @param model        the fitted model (structure plus nugget if fitted and positive)
 * @param method       the criterion minimised
 * @param criterion    the minimised criterion value
 * @param rmse         root mean squared difference γ̂(h_j) − γ(h_j; θ̂) over the bins used
 * @param fitted       γ(h_j; θ̂) at the mean lag of every bin (every bin of an
 *                     {@link EmpiricalVariogram} holds at least one pair, so none is NaN)
 * @param binsUsed     number of bins used
 * @param evaluations  criterion evaluations, all optimiser runs together
 * @param converged    whether the optimiser run that gave the result stopped on its own criterion
 *                     (not the budget)
 * @param rangeAtBound whether the range (or exponent) ended within 0.1% of a bound that was not
 *                     widened (a bound the caller set, the lower bound, or the widest default)
 * @param largestLag   the largest mean lag of the bins used, against which the range is judged
 * @param warnings     what a reader of the fit should know (empty when nothing is to report), in
 *                     a fixed order; reports print them
 */
public record VariogramFit(VariogramModel model, VariogramFitOptions.Method method, double criterion, double rmse,
        double[] fitted, int binsUsed, int evaluations, boolean converged, boolean rangeAtBound, double largestLag,
        List<Warning> warnings) {

    /** What a warning is about. */
    public enum WarningKind {
        /**
         * The fitted practical range (the lag where the structure reaches 95% of its partial sill;
         * the range itself for the spherical) lies beyond the largest lag of the empirical
         * variogram: the sill and the range are extrapolated beyond the lags observed, over which a
         * longer range and a larger sill are hard to tell apart.
         */
        RANGE_BEYOND_LAGS,
        /** A parameter ended on a bound that was not widened (the message names it and the bound). */
        PARAMETER_AT_BOUND,
        /**
         * The optimiser (BOBYQA) failed and the fit was completed by a compass search from the best
         * point it had found.
         */
        OPTIMISER_FALLBACK,
        /** The evaluation budget was spent before the optimiser converged. */
        NOT_CONVERGED
    }

    /**
     * One warning: its kind and a sentence with the numbers, fit to print.
     *
     * @param kind    what it is about
     * @param message the explanation
     */
    public record Warning(WarningKind kind, String message) {
        /** Checks both components. */
        public Warning {
            Objects.requireNonNull(kind, "kind");
            Objects.requireNonNull(message, "message");
        }
    }

    /** Copies the array component and the list (the caller keeps its own). */
    public VariogramFit {
        fitted = RecordArrays.copy(fitted);
        warnings = List.copyOf(Objects.requireNonNull(warnings, "warnings"));
    }

    /** A copy of the {@code fitted} component. */
    @Override
    public double[] fitted() {
        return RecordArrays.copy(fitted);
    }

    /** Whether a warning of this kind was issued. */
    public boolean hasWarning(WarningKind kind) {
        for (Warning w : warnings) {
            if (w.kind() == kind) {
                return true;
            }
        }
        return false;
    }

    /** Equality by content of every component (arrays element by element). */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    /** The components, arrays printed by content. */
    @Override
    public String toString() {
        return RecordArrays.describe(this);
    }
}
