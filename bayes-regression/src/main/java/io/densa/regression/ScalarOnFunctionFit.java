package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * A fitted scalar-on-function regression y_i = β_0 + Σ_l γ_l u_il + Σ_j ⟨β_j, X_ij⟩_B + ε_i (see
 * {@link FunctionalRegression}): coefficient functions β_j, the cross-validation record and
 * prediction.
 *
 * <p>Immutable and thread-safe.
 */
public final class ScalarOnFunctionFit extends FunctionalFit {
    private final int n;

    ScalarOnFunctionFit(FunctionalRegression config, Design design, List<DensitySet> predictors, double[] y,
            LinearFunctionalEngine.Result res) {
        super(config, design, res);
        this.n = y.length;
    }

    /**
     * A fit from its saved parts: predictions, coefficients and fitted values equal those of the
     * fit they came from, bit for bit; nothing is refitted.
     *
     * @param config the configuration ({@link #configuration()})
     * @param design the training design ({@link #design()})
     * @param state  the fitted state ({@link #state()})
     * @throws IllegalArgumentException when the parts do not fit together (naming the part)
     */
    public static ScalarOnFunctionFit restore(FunctionalRegression config, Design design, FunctionalFitState state) {
        Objects.requireNonNull(config, "config");
        Objects.requireNonNull(state, "state");
        LinearFunctionalEngine.Result res = state.toResult(design, 1, "scalar-on-function fit");
        return new ScalarOnFunctionFit(config, design, null, new double[design.rows()], res);
    }

    /**
     * Cross-validated mean squared prediction error (1/n) Σ_i (y_i − ŷ_i^(−fold(i)))² of the chosen
     * tuning; empty when a single candidate was fitted without cross-validation.
     */
    public java.util.OptionalDouble crossValidatedError() {
        return res.chosen().cvError();
    }

    /** Coefficient of a design column (intercept or scalar covariate). */
    public double coefficient(String column) {
        return res.beta()[design.columnIndex(column)];
    }

    /** The coefficient function β_j as an element of the predictor's space. */
    public Density coefficientFunction(int j) {
        checkPredictor(j);
        int[] off = res.offsets();
        return predictorSpaces.get(j).density(Arrays.copyOfRange(res.beta(), off[j], off[j + 1]));
    }

    /** clr β_j at the given points. */
    public double[] coefficientClr(int j, double... xs) {
        double[] c = coefficientFunction(j).coordinates(); // checks j
        BayesSpace s = predictorSpaces.get(j);
        return DenseAlgebra.clrAt(s, c, Arguments.grid(s, xs, "points"));
    }

    /** Fitted values (fresh). */
    public double[] fitted() {
        return res.fitted().clone();
    }

    /** Residuals y_i − ŷ_i (fresh). */
    public double[] residuals() {
        return res.residuals().clone();
    }

    /**
     * R² = 1 − Σ (y_i − ŷ_i)² / Σ (y_i − ȳ)² on the training data (0 for a constant response).
     */
    public double rSquared() {
        return res.rSquared();
    }

    /** Number of training observations. */
    public int sampleSize() {
        return n;
    }

    /**
     * Predictions for new predictors.
     *
     * @param predictors densities of the model's predictor spaces
     * @param covariates design with the model's columns, or null if it had none
     */
    public double[] predict(List<DensitySet> predictors, Design covariates) {
        Objects.requireNonNull(predictors, "predictors");
        return LinearFunctionalEngine.predict(res.beta(), res.pz(), 1, res.offsets(), design, predictorSpaces,
                predictors, covariates);
    }

    @Override
    public String toString() {
        return "ScalarOnFunctionFit[" + config.method() + ", chosen=" + res.chosen() + ", R²=" + res.rSquared() + "]";
    }
}
