package io.densa.regression;

import io.densa.core.BayesSpace;
import java.util.List;
import java.util.Objects;

/**
 * The fitted state of a {@link FunctionOnFunctionFit} or {@link ScalarOnFunctionFit}: everything
 * their predictions, coefficients, kernels, fitted values and cross-validation record are computed
 * from, as plain arrays and values (what a saved model file stores). A fit restored from its state
 * predicts exactly as the original, bit for bit; nothing is refitted.
 *
 * @param coefficients     stacked coefficients, {@code offsets[last]} rows × r columns, row-major: the
 *                         design columns first, then the coordinates of each predictor's kernel
 * @param offsets          row offsets of the blocks: offsets[0] = number of design columns,
 *                         offsets[j + 1] − offsets[j] = dimension of predictor j
 * @param chosen           the tuning of the final fit
 * @param candidates       every candidate tried, in order
 * @param fitted           n × r fitted values (row-major)
 * @param residuals        n × r residuals (row-major)
 * @param rSquared         the training R²
 * @param predictorFpca    FPCA of each predictor (truncation), or empty (ridge)
 * @param predictorSpaces  the space of each predictor
 */
public record FunctionalFitState(double[] coefficients, int[] offsets,
        FunctionalRegression.Candidate chosen, List<FunctionalRegression.Candidate> candidates, double[] fitted,
        double[] residuals, double rSquared, List<Fpca> predictorFpca, List<BayesSpace> predictorSpaces) {

    /** Copies the arrays and lists; checks for nulls. */
    public FunctionalFitState {
        coefficients = Objects.requireNonNull(coefficients, "coefficients").clone();
        offsets = Objects.requireNonNull(offsets, "offsets").clone();
        Objects.requireNonNull(chosen, "chosen");
        candidates = List.copyOf(Objects.requireNonNull(candidates, "candidates"));
        fitted = Objects.requireNonNull(fitted, "fitted").clone();
        residuals = Objects.requireNonNull(residuals, "residuals").clone();
        predictorFpca = List.copyOf(Objects.requireNonNull(predictorFpca, "predictorFpca"));
        predictorSpaces = List.copyOf(Objects.requireNonNull(predictorSpaces, "predictorSpaces"));
    }

    /** Fresh copy. */
    @Override
    public double[] coefficients() {
        return coefficients.clone();
    }

    /** Fresh copy. */
    @Override
    public int[] offsets() {
        return offsets.clone();
    }

    /** Fresh copy. */
    @Override
    public double[] fitted() {
        return fitted.clone();
    }

    /** Fresh copy. */
    @Override
    public double[] residuals() {
        return residuals.clone();
    }

    static FunctionalFitState of(LinearFunctionalEngine.Result res) {
        return new FunctionalFitState(res.beta(), res.offsets(), res.chosen(), res.candidates(),
                res.fitted(), res.residuals(), res.rSquared(), res.predictorFpca(), res.predictorSpaces());
    }

    /** Checks this state against a design of n rows and an r-column response; returns the engine's result. */
    LinearFunctionalEngine.Result toResult(Design design, int r, String what) {
        Objects.requireNonNull(design, "design");
        int n = design.rows();
        int np = predictorSpaces.size();
        if (np < 1) {
            throw new IllegalArgumentException(what + ": at least one predictor space is required");
        }
        if (offsets.length != np + 1 || offsets[0] != design.columns()) {
            throw new IllegalArgumentException(what + ": offsets " + java.util.Arrays.toString(offsets)
                    + " do not match " + design.columns() + " design column(s) and " + np + " predictor(s)");
        }
        for (int j = 0; j < np; j++) {
            BayesSpace s = Objects.requireNonNull(predictorSpaces.get(j), "predictor space");
            if (offsets[j + 1] - offsets[j] != s.dimension()) {
                throw new IllegalArgumentException(what + ": block " + j + " spans " + (offsets[j + 1] - offsets[j])
                        + " rows but predictor " + j + " has dimension " + s.dimension());
            }
            if (!predictorFpca.isEmpty() && !predictorFpca.get(j).space().equals(s)) {
                throw new IllegalArgumentException(what + ": the FPCA of predictor " + j + " is of another space");
            }
        }
        if (!predictorFpca.isEmpty() && predictorFpca.size() != np) {
            throw new IllegalArgumentException(what + ": " + predictorFpca.size() + " predictor FPCAs for " + np
                    + " predictors");
        }
        Arguments.finiteArray(coefficients, offsets[np] * r, what + " coefficients");
        Arguments.finiteArray(fitted, n * r, what + " fitted values");
        Arguments.finiteArray(residuals, n * r, what + " residuals");
        if (!Double.isFinite(rSquared)) {
            throw new IllegalArgumentException(what + ": R² is not finite: " + rSquared);
        }
        return new LinearFunctionalEngine.Result(coefficients.clone(), offsets[np], r, offsets.clone(), chosen,
                candidates, fitted.clone(), residuals.clone(), rSquared, predictorFpca, predictorSpaces);
    }
}
