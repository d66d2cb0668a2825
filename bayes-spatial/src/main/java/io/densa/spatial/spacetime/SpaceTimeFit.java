package io.densa.spatial.spacetime;

import io.densa.core.internal.RecordArrays;
import io.densa.spatial.variogram.VariogramFitOptions;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * A space–time variogram model fitted by {@link SpaceTimeFitting}.
 *
 * <p>Immutable: arrays and lists are copied in and out.
 *
 * @param model             the fitted model
 * @param method            the criterion
 * @param criterion         the criterion at the fit: Σ N (γ̂/γ − 1)² for Cressie's weights,
 *                          Σ (γ̂ − γ)² for ordinary least squares
 * @param rmse              root mean squared difference γ̂ − γ over the classes used
 * @param classesUsed       number of lag classes fitted (non-empty, other than lag (0, 0))
 * @param parameterNames    names of the fitted parameters, in the order of {@code parameters}
 * @param parameters        the fitted parameters
 * @param atBound           names of the parameters that ended on a bound of the search box (a
 *                          nugget on 0 or β on 0 or 1 may be genuine; a range on its bound
 *                          means the lags observed cannot place it)
 * @param optimiserFallback true when BOBYQA failed or used up its evaluation budget on the start that
 *                          gave the fit, and a compass search finished it from the best point seen
 * @param evaluations       criterion evaluations by BOBYQA over all starting points
 */
public record SpaceTimeFit(SpaceTimeModel model, VariogramFitOptions.Method method, double criterion, double rmse,
        int classesUsed, List<String> parameterNames, double[] parameters, List<String> atBound,
        boolean optimiserFallback, int evaluations) {

    /** Validates and copies. */
    public SpaceTimeFit {
        Objects.requireNonNull(model, "model");
        Objects.requireNonNull(method, "method");
        parameterNames = List.copyOf(parameterNames);
        parameters = RecordArrays.copy(parameters);
        atBound = List.copyOf(atBound);
        if (parameters.length != parameterNames.size()) {
            throw new IllegalArgumentException(parameters.length + " parameters but " + parameterNames.size()
                    + " names");
        }
    }

    /** A copy of the {@code parameters} component. */
    @Override
    public double[] parameters() {
        return RecordArrays.copy(parameters);
    }

    /**
     * The fitted value of the named parameter.
     *
     * @throws IllegalArgumentException naming the accepted names
     */
    public double parameter(String name) {
        int i = parameterNames.indexOf(name);
        if (i < 0) {
            throw new IllegalArgumentException("no parameter '" + name + "'; accepted are " + parameterNames);
        }
        return parameters[i];
    }

    /** True when the named parameter ended on a bound. */
    public boolean isAtBound(String name) {
        return atBound.contains(name);
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof SpaceTimeFit)) {
            return false;
        }
        SpaceTimeFit f = (SpaceTimeFit) o;
        return model.equals(f.model) && method == f.method && Double.compare(criterion, f.criterion) == 0
                && Double.compare(rmse, f.rmse) == 0 && classesUsed == f.classesUsed
                && parameterNames.equals(f.parameterNames) && Arrays.equals(parameters, f.parameters)
                && atBound.equals(f.atBound) && optimiserFallback == f.optimiserFallback
                && evaluations == f.evaluations;
    }

    @Override
    public int hashCode() {
        return Objects.hash(model, method, criterion, rmse, classesUsed, parameterNames, Arrays.hashCode(parameters),
                atBound, optimiserFallback, evaluations);
    }

    @Override
    public String toString() {
        return "SpaceTimeFit[" + model + ", " + method + ", criterion " + criterion + ", rmse " + rmse + ", classes "
                + classesUsed + ", at bound " + atBound + (optimiserFallback ? ", compass-search fallback" : "") + ", "
                + evaluations + " evaluations]";
    }
}
