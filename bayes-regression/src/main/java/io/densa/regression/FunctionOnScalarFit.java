package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.core.TestResult;
import io.densa.core.SolveDiagnostics;
import io.densa.core.internal.Sorted;
import io.densa.core.internal.Seeds;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.SplittableRandom;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.QRDecomposition;

/**
 * A fitted function-on-scalar regression (see {@link FunctionOnScalarRegression}): the design,
 * the coefficient functions β_j, fitted and residual densities, functional R², bootstrap bands
 * and permutation tests.
 *
 * <p>Immutable and thread-safe: {@link #predict} and the resampling methods may be called
 * concurrently.
 */
public final class FunctionOnScalarFit {
    private final FunctionOnScalarRegression config;
    private final Design design;
    final DensitySet response;
    private final double[] weights; // null: unit; as given
    private final double[] unitWeights; // null: unit; weights × a power of two, the largest in [1, 2)
    private final double weightScale; // weights = unitWeights × weightScale
    private final double rss;
    private final BayesSpace space;
    final int n;
    final int p;
    final int k;
    final double[] u;          // K × K eigenvectors of R (null: unpenalised)
    final double[][] inverses; // per transformed column l (or one), for the scaled design
    final double[] scale;      // p powers of two: column j of the scaled design is f_j x_j
    final double[] xScaled;    // n × p design with scaled columns
    final double[] coefScaled; // p × K coefficients of the scaled design (row j = β_j / f_j)
    final double[] coef;       // p × K
    final double[] fitted;     // n × K
    final double[] resid;      // n × K
    private final double rSquared;
    private final double effectiveParameters;

    private FunctionOnScalarFit(FunctionOnScalarRegression config, Design design, DensitySet response,
            double[] c, double[] weights, double[] u, double[][] inverses, double[] scale, double[] xScaled, double[] coefScaled,
            double effectiveParameters) {
        this.effectiveParameters = effectiveParameters;
        this.config = config;
        this.design = design;
        this.response = response;
        this.weights = weights;
        this.unitWeights = weights == null ? null : weights.clone();
        this.weightScale = weights == null ? 1.0 : 1 / Design.scaleToUnit(unitWeights, 0, 1, weights.length);
        this.space = response.space();
        this.n = design.rows();
        this.p = design.columns();
        this.k = space.dimension();
        this.u = u;
        this.inverses = inverses;
        this.scale = scale;
        this.xScaled = xScaled;
        this.coefScaled = coefScaled;
        this.coef = unscaleRows(coefScaled, scale, k);
        for (int i = 0; i < coef.length; i++) {
            if (!Double.isFinite(coef[i])) {
                String col = design.columnNames().get(i / k);
                throw new IllegalArgumentException("the coefficient of column '" + col + "' is " + coef[i]
                        + ", beyond the double range: the column's values (largest |x| "
                        + (1 / scale[i / k]) + " within a factor 2) are too small for the response; express the"
                        + " covariate in smaller units");
            }
        }
        this.fitted = DenseAlgebra.mult(xScaled, n, p, coefScaled, k);
        this.resid = new double[n * k];
        for (int i = 0; i < n * k; i++) {
            resid[i] = c[i] - fitted[i];
        }
        double sw = 0;
        double[] wm = new double[k];
        for (int i = 0; i < n; i++) {
            double wi = w(i);
            sw += wi;
            for (int j = 0; j < k; j++) {
                wm[j] += wi * c[i * k + j];
            }
        }
        double tss = 0;
        double rss = 0;
        for (int i = 0; i < n; i++) {
            double wi = w(i);
            for (int j = 0; j < k; j++) {
                double d = c[i * k + j] - wm[j] / sw;
                tss += wi * d * d;
                rss += wi * resid[i * k + j] * resid[i * k + j];
            }
        }
        this.rSquared = tss > 0 ? 1 - rss / tss : 0.0;
        this.rss = rss * weightScale;
        if (!Double.isFinite(this.rss) || !Double.isFinite(rSquared)) {
            throw new IllegalArgumentException("the weighted residual sum of squares (" + this.rss + ") is beyond the"
                    + " double range: weights up to " + maxOf(weights) + " times squared residuals; rescale the"
                    + " weights (only their ratios matter for the estimates)");
        }
    }

    private static double maxOf(double[] w) {
        double m = 1;
        if (w != null) {
            for (double v : w) {
                m = Math.max(m, v);
            }
        }
        return m;
    }

    /** The weight of row i relative to the largest (times a power of two): what every solve uses. */
    double w(int i) {
        return unitWeights == null ? 1.0 : unitWeights[i];
    }

    static FunctionOnScalarFit fit(FunctionOnScalarRegression cfg, Design design, DensitySet response, double[] w) {
        int n = design.rows();
        int p = design.columns();
        int k = response.dimension();
        // columns scaled by powers of two (exact): covariates near 1e300 or 1e-170 keep a well
        // scaled system, whose rank test and squares neither overflow nor underflow
        double[] x = design.internal().clone();
        double[] scale = new double[p];
        for (int j = 0; j < p; j++) {
            scale[j] = Design.scaleToUnit(x, j, p, n);
        }
        double[] c = response.coordinatesRowMajor();
        // whitened system √W X, √W C, solved by QR (accuracy governed by cond(√W X), not its square)
        // copies only when the weights scale them (the solves below read xs and cs, never write them)
        double[] xs = w != null ? x.clone() : x;
        double[] cs = w != null ? c.clone() : c;
        // weights w = s w̃ with the largest w̃ in [1, 2): Σ w r² + λ pen = s (Σ w̃ r² + (λ / s) pen), so
        // the solves use w̃ and λ / s and give the same estimates without under- or overflow
        double weightFactor = 1.0; // 1 / s
        if (w != null) {
            double[] wn = w.clone();
            weightFactor = Design.scaleToUnit(wn, 0, 1, n);
            for (int i = 0; i < n; i++) {
                double s = Math.sqrt(wn[i]);
                for (int j = 0; j < p; j++) {
                    xs[i * p + j] *= s;
                }
                for (int l = 0; l < k; l++) {
                    cs[i * k + l] *= s;
                }
            }
        }
        double[] xtwx = DenseAlgebra.multTransA(xs, n, p, xs, p);
        double lambda = cfg.lambda() * weightFactor;
        if (!Double.isFinite(lambda)) {
            throw new IllegalArgumentException("penalty weight λ = " + cfg.lambda() + " is too large for weights"
                    + " as small as these (λ divided by the largest weight exceeds the double range); scale the"
                    + " weights up or λ down by the same factor");
        }
        double[] u = null;
        double[][] inv;
        double[] coef;
        String what = "function-on-scalar regression";
        if (lambda > 0) {
            // column l of B U minimises ‖√W X b − (√W C U)_l‖² + λ Λ_l Σ_{j penalised} b_j²; with
            // √W X = Q R this is ‖R b − (Qᵀ√W C U)_l‖² + ‖√(λ Λ_l) D b‖² + const: a 2p × p least-squares
            // problem per direction l after one QR of the data
            DenseAlgebra.Eigen e = DenseAlgebra.symmetricEigen(cfg.penalty().data, k);
            u = e.vectors();
            inv = new double[k][];
            boolean intercept = design.hasIntercept();
            DenseAlgebra.Reduced red = DenseAlgebra.reduce(xs, n, p, cs, k, what);
            double[] qtcu = DenseAlgebra.mult(red.qtb(), p, k, u, k); // (Qᵀ√W C) U, p × K
            double[] aug = new double[2 * p * p];
            double[] rhs = new double[2 * p];
            double[] bt = new double[p * k];
            for (int l = 0; l < k; l++) {
                System.arraycopy(red.r(), 0, aug, 0, p * p);
                java.util.Arrays.fill(aug, p * p, 2 * p * p, 0.0);
                double root = Math.sqrt(lambda * e.values()[l]);
                for (int j = 0; j < p; j++) {
                    if (!(intercept && j == 0)) {
                        aug[(p + j) * p + j] = root * scale[j]; // λ Λ_l β_j² = λ Λ_l f_j² β̃_j²
                    }
                    rhs[j] = qtcu[j * k + l];
                    rhs[p + j] = 0.0;
                }
                DenseAlgebra.LeastSquares ls = DenseAlgebra.leastSquares(aug, 2 * p, p, rhs, 1, what);
                inv[l] = ls.inverseGram();
                for (int j = 0; j < p; j++) {
                    bt[j * k + l] = ls.solution()[j];
                }
            }
            coef = DenseAlgebra.multTransB(bt, p, k, u, k);
        } else {
            DenseAlgebra.LeastSquares ls = DenseAlgebra.leastSquares(xs, n, p, cs, k, what);
            inv = new double[][] {ls.inverseGram()};
            coef = ls.solution();
        }
        // effective number of parameters: mean over the K penalty directions of tr H_l,
        // H_l = X (XᵀWX + λ Λ_l D)⁻¹ XᵀW, so tr H_l = tr((XᵀWX + λ Λ_l D)⁻¹ XᵀWX)
        double edf = 0;
        for (double[] a : inv) {
            for (int i = 0; i < p; i++) {
                for (int j = 0; j < p; j++) {
                    edf += a[i * p + j] * xtwx[j * p + i];
                }
            }
        }
        edf /= inv.length;
        return new FunctionOnScalarFit(cfg, design, response, c, w, u, inv, scale, x, coef, edf);
    }

    /** Row j of a (p × cols) times f_j: coefficients of the scaled design back to the original columns. */
    private static double[] unscaleRows(double[] a, double[] f, int cols) {
        double[] out = a.clone();
        for (int j = 0; j < f.length; j++) {
            for (int l = 0; l < cols; l++) {
                out[j * cols + l] *= f[j];
            }
        }
        return out;
    }

    // ------------------------------------------------------------------ accessors

    /** The configuration that produced this fit. */
    public FunctionOnScalarRegression configuration() {
        return config;
    }

    /** The design. */
    public Design design() {
        return design;
    }

    /** The response space. */
    public BayesSpace space() {
        return space;
    }

    /** The weights (fresh copy), or null for unit weights. */
    public double[] weights() {
        return weights == null ? null : weights.clone();
    }

    /** Coefficient matrix B, p × K (row j = coordinates of β_j; fresh). */
    public DMatrixRMaj coefficients() {
        return DMatrixRMaj.wrap(p, k, coef.clone());
    }

    /**
     * The coefficient function of a design column as an element of B2 (for the intercept, the
     * mean response at x = 0; for a numeric covariate, the ⊕-change per unit; for a level, the
     * ⊕-difference to the reference level).
     */
    public Density coefficient(String column) {
        int j = design.columnIndex(column);
        return space.density(Arrays.copyOfRange(coef, j * k, (j + 1) * k));
    }

    /** clr β_j at the given points. */
    public double[] coefficientClr(String column, double... xs) {
        int j = design.columnIndex(column);
        return DenseAlgebra.clrAt(space, Arrays.copyOfRange(coef, j * k, (j + 1) * k), Arguments.grid(space, xs, "points"));
    }

    /** The training response densities (ids kept), as given to the fit. */
    public DensitySet response() {
        return response;
    }

    /** Fitted densities ŷ_i = ⊕_j x_ij ⊙ β_j (ids kept). */
    public DensitySet fitted() {
        return DensitySet.ofRowMajor(space, fitted, n, ids(response));
    }

    /** Residual densities y_i ⊖ ŷ_i (ids kept). */
    public DensitySet residuals() {
        return DensitySet.ofRowMajor(space, resid, n, ids(response));
    }

    /** Residual B2 norms ‖y_i ⊖ ŷ_i‖. */
    public double[] residualNorms() {
        return norms(resid, n, k);
    }

    /**
     * Functional R² = 1 − Σ w_i ‖y_i ⊖ ŷ_i‖² / Σ w_i ‖y_i ⊖ ȳ_w‖², ȳ_w the weighted ⊕-mean
     * (Talská et al. (2018), Compositional regression with functional response, Comput. Stat.
     * Data Anal. 123). Reported as 0 when every response equals ȳ_w (nothing to explain). With a
     * penalty or without an intercept it can be negative.
     */
    public double rSquared() {
        return rSquared;
    }

    /** Weighted residual sum of squares Σ w_i ‖y_i ⊖ ŷ_i‖². */
    public double residualSumOfSquares() {
        return rss;
    }

    /**
     * Fit diagnostics.
     *
     * @param observations       n
     * @param parameters         p (design columns)
     * @param residualDf         n − p (the unpenalised count; see effectiveParameters)
     * @param residualSumOfSquares Σ w_i ‖y_i ⊖ ŷ_i‖²
     * @param rSquared           functional R²
     * @param lambda             penalty weight (0 without penalty)
     * @param weighted           whether observation weights were used
     * @param effectiveParameters the effective number of parameters per coordinate,
     *                           (1/K) Σ_l tr H_l with H_l = X (XᵀWX + λ Λ_l D)⁻¹ XᵀW the hat
     *                           matrix of penalty direction l (Λ, D as in
     *                           {@link FunctionOnScalarRegression}); p without penalty, smaller
     *                           with one (Hastie and Tibshirani (1990), Generalized Additive
     *                           Models, Chapman &amp; Hall, for tr H as degrees of freedom [from
     *                           memory])
     */
    public record Diagnostics(int observations, int parameters, int residualDf, double residualSumOfSquares,
            double rSquared, double lambda, boolean weighted, double effectiveParameters) {
    }

    /** Fit diagnostics as a record. */
    public Diagnostics diagnostics() {
        return new Diagnostics(n, p, n - p, residualSumOfSquares(), rSquared, config.lambda(), weights != null,
                effectiveParameters);
    }

    static String[] ids(DensitySet s) {
        return s.hasIds() ? s.ids().toArray(new String[0]) : null;
    }

    static double[] norms(double[] r, int n, int k) {
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            double s = 0;
            for (int j = 0; j < k; j++) {
                s += r[i * k + j] * r[i * k + j];
            }
            out[i] = Math.sqrt(s);
        }
        return out;
    }

    private void requireSameColumns(Design other) {
        Objects.requireNonNull(other, "design");
        if (!other.columnNames().equals(design.columnNames())) {
            throw new IllegalArgumentException("new design has columns " + other.columnNames()
                    + " but the model was fitted with " + design.columnNames()
                    + " (for categorical covariates pass the full list of levels)");
        }
    }

    /**
     * Predicted densities for new covariate rows.
     *
     * @param newDesign a design with the same column names
     */
    public DensitySet predict(Design newDesign) {
        requireSameColumns(newDesign);
        return DensitySet.ofRowMajor(space, DenseAlgebra.mult(newDesign.internal(), newDesign.rows(), p, coef, k),
                newDesign.rows(), null);
    }

    /**
     * Residual densities y ⊖ ŷ of new observations (for anomaly scoring).
     *
     * @throws IllegalArgumentException if the rows do not match or the space differs
     */
    public DensitySet residuals(Design newDesign, DensitySet newResponse) {
        requireSameColumns(newDesign);
        Objects.requireNonNull(newResponse, "response");
        space.requireSame(newResponse.space(), "response");
        Arguments.rows(newResponse, newDesign.rows(), "response");
        int m = newDesign.rows();
        double[] f = DenseAlgebra.mult(newDesign.internal(), m, p, coef, k);
        double[] c = newResponse.coordinatesRowMajor();
        for (int i = 0; i < c.length; i++) {
            c[i] -= f[i];
        }
        return DensitySet.ofRowMajor(space, c, m, ids(newResponse));
    }

    // ------------------------------------------------------------------ bootstrap bands

    /**
     * Pointwise and simultaneous confidence band of one coefficient function on a grid.
     *
     * @param column              design column
     * @param grid                evaluation points
     * @param estimate            clr β̂_j on the grid
     * @param pointwiseLower      pointwise lower limit (bootstrap basic percentile)
     * @param pointwiseUpper      pointwise upper limit
     * @param simultaneousLower   simultaneous lower limit β̂ − c·sd
     * @param simultaneousUpper   simultaneous upper limit β̂ + c·sd
     * @param standardError       bootstrap standard deviation sd(t)
     * @param simultaneousCritical the critical value c (level-quantile of max_t |β* − β̂| / sd)
     *
     * <p>A value: arrays are copied in and out, and {@code equals} compares their contents.
     */
    public record CoefficientBand(String column, double[] grid, double[] estimate, double[] pointwiseLower,
            double[] pointwiseUpper, double[] simultaneousLower, double[] simultaneousUpper, double[] standardError,
            double simultaneousCritical) {
        /** Canonical constructor: copies the arrays, which must all have the grid's length. */
        public CoefficientBand {
            Objects.requireNonNull(column, "column");
            grid = grid.clone();
            estimate = estimate.clone();
            pointwiseLower = pointwiseLower.clone();
            pointwiseUpper = pointwiseUpper.clone();
            simultaneousLower = simultaneousLower.clone();
            simultaneousUpper = simultaneousUpper.clone();
            standardError = standardError.clone();
            int m = grid.length;
            if (estimate.length != m || pointwiseLower.length != m || pointwiseUpper.length != m
                    || simultaneousLower.length != m || simultaneousUpper.length != m || standardError.length != m) {
                throw new IllegalArgumentException("every band array must have the grid's " + m + " points");
            }
        }

        /** The evaluation points (fresh). */
        @Override
        public double[] grid() {
            return grid.clone();
        }

        /** clr β̂_j on the grid (fresh). */
        @Override
        public double[] estimate() {
            return estimate.clone();
        }

        /** Pointwise lower limit (fresh). */
        @Override
        public double[] pointwiseLower() {
            return pointwiseLower.clone();
        }

        /** Pointwise upper limit (fresh). */
        @Override
        public double[] pointwiseUpper() {
            return pointwiseUpper.clone();
        }

        /** Simultaneous lower limit (fresh). */
        @Override
        public double[] simultaneousLower() {
            return simultaneousLower.clone();
        }

        /** Simultaneous upper limit (fresh). */
        @Override
        public double[] simultaneousUpper() {
            return simultaneousUpper.clone();
        }

        /** Bootstrap standard deviation (fresh). */
        @Override
        public double[] standardError() {
            return standardError.clone();
        }

        /** Equal column, critical value and array contents ({@link Arrays#equals(double[], double[])}). */
        @Override
        public boolean equals(Object o) {
            return o instanceof CoefficientBand b && column.equals(b.column)
                    && Double.compare(simultaneousCritical, b.simultaneousCritical) == 0
                    && Arrays.equals(grid, b.grid) && Arrays.equals(estimate, b.estimate)
                    && Arrays.equals(pointwiseLower, b.pointwiseLower) && Arrays.equals(pointwiseUpper, b.pointwiseUpper)
                    && Arrays.equals(simultaneousLower, b.simultaneousLower)
                    && Arrays.equals(simultaneousUpper, b.simultaneousUpper)
                    && Arrays.equals(standardError, b.standardError);
        }

        @Override
        public int hashCode() {
            return Objects.hash(column, simultaneousCritical, Arrays.hashCode(grid), Arrays.hashCode(estimate),
                    Arrays.hashCode(pointwiseLower), Arrays.hashCode(pointwiseUpper));
        }

        @Override
        public String toString() {
            return "CoefficientBand[" + column + ", " + grid.length + " points, c=" + simultaneousCritical + "]";
        }
    }

    /**
     * Bootstrap confidence bands for every coefficient function, by the residual bootstrap with
     * the design fixed: whole residual functions √w_i (y_i ⊖ ŷ_i), drawn with replacement and
     * divided by √w of the receiving row, are added to the fitted values and the model is
     * refitted (with the same penalty). Pointwise limits are basic bootstrap limits
     * 2β̂(t) − q*_{1−α/2}(t), 2β̂(t) − q*_{α/2}(t); the simultaneous band is β̂(t) ± c sd*(t) with c
     * the {@code level}-quantile of max_t |β*(t) − β̂(t)| / sd*(t) over replicates, sd*(t) the
     * bootstrap standard deviation at t and the maximum taken over the grid (a studentised
     * sup-band: the maximum-|t| calibration of simultaneous bands from resampling draws is common
     * practice; no specific source is claimed for it). The residual bootstrap and the basic
     * limits follow Efron and Tibshirani (1993), An Introduction to the Bootstrap [from memory].
     * Residuals are not inflated for
     * leverage, so bands are slightly narrow when p is large relative to n. With a penalty the
     * refit shrinks the fitted values once more, so β* − β̂ = [S(XᵀWŶ) − β̂] + S(XᵀW r*) (S the
     * penalised solve) carries that deterministic shift, and the basic limits correct for it.
     *
     * @param grid       evaluation points in the domain
     * @param replicates number of bootstrap replicates, ≥ 20
     * @param level      confidence level in (0, 1), e.g. 0.95
     * @param seed       random seed
     * @return one band per design column, in column order
     */
    public List<CoefficientBand> bootstrapBands(double[] grid, int replicates, double level, long seed) {
        return bootstrapBands(grid, replicates, level, seed, ProgressListener.NONE);
    }

    /**
     * {@link #bootstrapBands(double[], int, double, long)} reporting progress to a listener: task
     * {@code "bootstrap"}, one unit per replicate, from the calling thread; the count reaches
     * {@code replicates}. The listener does not change the result.
     *
     * @param listener progress listener, or {@link ProgressListener#NONE}
     */
    public List<CoefficientBand> bootstrapBands(double[] grid, int replicates, double level, long seed,
            ProgressListener listener) {
        return ResidualBootstrap.bands(this, grid, replicates, level, seed, listener);
    }


    // ------------------------------------------------------------------ permutation F-test

    /**
     * Result of a permutation F-test of one covariate.
     *
     * @param term         covariate tested
     * @param fStatistic   observed F = ((RSS₀ − RSS₁)/df₁) / (RSS₁/df₂), RSS summed over all
     *                     coordinates (the functional F of the global test)
     * @param pValue       (1 + #{F* ≥ F}) / (permutations + 1)
     * @param df1          number of columns of the term
     * @param df2          n − p
     * @param permutations number of permutations
     * @param seed         random seed
     */
    public record PermutationTest(String term, double fStatistic, double pValue, int df1, int df2,
            int permutations, long seed) implements TestResult {
        /** The observed F, {@link #fStatistic()}. */
        @Override
        public double statistic() {
            return fStatistic;
        }

        @Override
        public String method() {
            return "Freedman-Lane permutation (" + permutations + " permutations, seed " + seed + "), upper tail";
        }
    }

    /**
     * Permutation F-test of H₀: all coefficient functions of one covariate (all its columns) are
     * the neutral element, by the Freedman–Lane procedure (Freedman and Lane (1983), A
     * nonstochastic interpretation of reported significance levels, J. Bus. Econ. Stat. 1(4)
     * [from memory]): the residuals of the reduced model without the covariate are permuted
     * (as whole functions, after whitening by √w), added to the reduced fit, and F is recomputed.
     * The test uses the weighted least-squares fit without penalty, whatever the configuration.
     *
     * @param term         covariate name (not the intercept)
     * @param permutations number of permutations, ≥ 19
     * @param seed         random seed
     * @throws IllegalArgumentException for the intercept or an unknown term, fewer than 19
     *                                  permutations, no residual degrees of freedom, or a response
     *                                  that the full model fits exactly (F undefined)
     */
    public PermutationTest test(String term, int permutations, long seed) {
        return test(term, permutations, seed, ProgressListener.NONE);
    }

    /**
     * {@link #test(String, int, long)} reporting progress to a listener: task
     * {@code "permutation test"}, one unit per permutation, from the calling thread; the count
     * reaches {@code permutations}. The listener does not change the result.
     *
     * @param listener progress listener, or {@link ProgressListener#NONE}
     */
    public PermutationTest test(String term, int permutations, long seed, ProgressListener listener) {
        return FreedmanLaneTest.test(this, term, permutations, seed, listener);
    }


    @Override
    public String toString() {
        return "FunctionOnScalarFit[n=" + n + ", columns=" + design.columnNames() + ", R²=" + rSquared + "]";
    }
}
