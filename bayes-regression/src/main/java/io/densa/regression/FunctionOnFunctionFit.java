package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * A fitted function-on-function regression (see {@link FunctionalRegression}): intercept and
 * covariate coefficient functions, kernels β_j(s, t), the cross-validation record, fitted and
 * residual densities, functional R² and prediction.
 *
 * <p>Immutable and thread-safe.
 */
public final class FunctionOnFunctionFit extends FunctionalFit {
    private final BayesSpace space;
    private final DensitySet response;
    private final int k;

    FunctionOnFunctionFit(FunctionalRegression config, Design design, List<DensitySet> predictors,
            DensitySet response, LinearFunctionalEngine.Result res) {
        super(config, design, res);
        this.space = response.space();
        this.response = response;
        this.k = space.dimension();
    }

    /**
     * A fit from its saved parts: predictions, coefficients, kernels, fitted values and residuals
     * equal those of the fit they came from, bit for bit; nothing is refitted.
     *
     * @param config        the configuration ({@link #configuration()})
     * @param design        the training design ({@link #design()})
     * @param responseSpace the response space ({@link #space()})
     * @param ids           ids of the training rows, or null
     * @param state         the fitted state ({@link #state()})
     * @throws IllegalArgumentException when the parts do not fit together (naming the part)
     */
    public static FunctionOnFunctionFit restore(FunctionalRegression config, Design design, BayesSpace responseSpace,
            String[] ids, FunctionalFitState state) {
        Objects.requireNonNull(config, "config");
        Objects.requireNonNull(responseSpace, "responseSpace");
        Objects.requireNonNull(state, "state");
        LinearFunctionalEngine.Result res = state.toResult(design, responseSpace.dimension(), "function-on-function fit");
        DensitySet rows = DensitySet.ofRowMajor(responseSpace, res.fitted(), design.rows(), ids);
        return new FunctionOnFunctionFit(config, design, null, rows, res);
    }

    /** Response space. */
    public BayesSpace space() {
        return space;
    }

    /**
     * FPCA of predictor j on the full data (truncation only).
     *
     * @throws IllegalStateException    for a ridge fit
     * @throws IllegalArgumentException if j is not a predictor index
     */
    public Fpca predictorFpca(int j) {
        if (res.predictorFpca().isEmpty()) {
            throw new IllegalStateException("a ridge fit has no predictor FPCA");
        }
        checkPredictor(j);
        return res.predictorFpca().get(j);
    }

    /**
     * Coefficient function of a design column (the intercept β_0 is the prediction when every
     * predictor is the neutral element and every covariate 0).
     */
    public Density coefficient(String column) {
        int j = design.columnIndex(column);
        return space.density(Arrays.copyOfRange(res.beta(), j * k, (j + 1) * k));
    }

    /**
     * Coordinates G_j (K_X × K_Y) of the kernel of predictor j: β_j(s, t) = Σ_{k,m} G_km e_k(s) e_m(t).
     */
    public DMatrixRMaj kernelCoefficients(int j) {
        checkPredictor(j);
        int[] off = res.offsets();
        return DMatrixRMaj.wrap(off[j + 1] - off[j], k, Arrays.copyOfRange(res.beta(), off[j] * k, off[j + 1] * k));
    }

    /**
     * The kernel β_j(s, t) on a grid: E_X(s) G_j E_Y(t)ᵀ, a |s| × |t| matrix.
     *
     * @param s points of the predictor domain
     * @param t points of the response domain
     */
    public DMatrixRMaj kernel(int j, double[] s, double[] t) {
        DMatrixRMaj g = kernelCoefficients(j);
        DMatrixRMaj es = predictorSpaces.get(j).basisMatrix(Arguments.grid(predictorSpaces.get(j), s, "s"));
        DMatrixRMaj et = space.basisMatrix(Arguments.grid(space, t, "t"));
        double[] left = DenseAlgebra.mult(es.data, s.length, g.numRows, g.data, k);
        DMatrixRMaj out = new DMatrixRMaj(s.length, t.length);
        org.ejml.dense.row.CommonOps_DDRM.multTransB(DMatrixRMaj.wrap(s.length, k, left), et, out);
        return out;
    }

    /** Fitted densities (ids kept). */
    public DensitySet fitted() {
        return DensitySet.ofRowMajor(space, res.fitted(), response.size(), FunctionOnScalarFit.ids(response));
    }

    /** Residual densities Y_i ⊖ Ŷ_i (ids kept). */
    public DensitySet residuals() {
        return DensitySet.ofRowMajor(space, res.residuals(), response.size(), FunctionOnScalarFit.ids(response));
    }

    /** Residual B2 norms. */
    public double[] residualNorms() {
        return FunctionOnScalarFit.norms(res.residuals(), response.size(), k);
    }

    /**
     * Functional R² = 1 − Σ ‖Y_i ⊖ Ŷ_i‖² / Σ ‖Y_i ⊖ Ȳ‖² on the training data (0 when every
     * response equals the ⊕-mean Ȳ).
     */
    public double rSquared() {
        return res.rSquared();
    }

    /**
     * Predicted densities for new predictors.
     *
     * @param predictors densities of the model's predictor spaces, one row per new unit
     * @param covariates design with the model's columns, or null if it had none
     */
    public DensitySet predict(List<DensitySet> predictors, Design covariates) {
        double[] y = LinearFunctionalEngine.predict(res.beta(), res.pz(), k, res.offsets(), design, predictorSpaces,
                predictors, covariates);
        return DensitySet.ofRowMajor(space, y, y.length / k, null);
    }

    /** Residual densities of new observations (for anomaly scoring; ids of the response kept). */
    public DensitySet residuals(List<DensitySet> predictors, Design covariates, DensitySet newResponse) {
        Objects.requireNonNull(newResponse, "response");
        space.requireSame(newResponse.space(), "response");
        double[] y = LinearFunctionalEngine.predict(res.beta(), res.pz(), k, res.offsets(), design, predictorSpaces,
                predictors, covariates);
        Arguments.rows(newResponse, y.length / k, "response");
        double[] c = newResponse.coordinatesRowMajor();
        for (int i = 0; i < c.length; i++) {
            c[i] -= y[i];
        }
        return DensitySet.ofRowMajor(space, c, newResponse.size(), FunctionOnScalarFit.ids(newResponse));
    }

    @Override
    public String toString() {
        return "FunctionOnFunctionFit[" + config.method() + ", chosen=" + res.chosen() + ", R²=" + res.rSquared() + "]";
    }
}
