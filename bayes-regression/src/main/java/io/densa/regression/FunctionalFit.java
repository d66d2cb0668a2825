package io.densa.regression;

import io.densa.core.BayesSpace;
import java.util.List;

/**
 * What every fitted functional regression (see {@link FunctionalRegression}) shares: its
 * configuration, the covariate design, the predictor spaces and the cross-validation record.
 * {@link FunctionOnFunctionFit} (density response) and {@link ScalarOnFunctionFit} (scalar
 * response) are the two kinds.
 *
 * <p>Immutable and thread-safe.
 */
public abstract sealed class FunctionalFit permits FunctionOnFunctionFit, ScalarOnFunctionFit {
    final FunctionalRegression config;
    final Design design;
    final List<BayesSpace> predictorSpaces;
    final LinearFunctionalEngine.Result res;

    FunctionalFit(FunctionalRegression config, Design design, LinearFunctionalEngine.Result res) {
        this.config = config;
        this.design = design;
        this.predictorSpaces = res.predictorSpaces();
        this.res = res;
    }

    /** The configuration. */
    public FunctionalRegression configuration() {
        return config;
    }

    /** The covariate design (intercept-only when no covariates were given). */
    public Design design() {
        return design;
    }

    /** Spaces of the density predictors, in order. */
    public List<BayesSpace> predictorSpaces() {
        return predictorSpaces;
    }

    /** The tuning used for the final fit, with its cross-validated error. */
    public FunctionalRegression.Candidate chosen() {
        return res.chosen();
    }

    /** Every candidate with its cross-validated error, in the order tried. */
    public List<FunctionalRegression.Candidate> crossValidation() {
        return res.candidates();
    }

    /** The fitted state (see {@link FunctionalFitState}); the subclass's {@code restore} rebuilds the fit from it. */
    public FunctionalFitState state() {
        return FunctionalFitState.of(res);
    }

    /** Requires 0 ≤ j &lt; the number of predictors. */
    void checkPredictor(int j) {
        if (j < 0 || j >= predictorSpaces.size()) {
            throw new IllegalArgumentException("predictor index " + j + " outside [0, " + predictorSpaces.size() + ")");
        }
    }
}
