package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.OptionalDouble;

/**
 * Configuration of the linear models with density predictors: function-on-function regression
 * (density response)
 *
 * <pre>
 *   clr Y_i(t) = β_0(t) + Σ_l γ_l(t) u_il + Σ_j ∫ β_j(s, t) clr X_ij(s) dP(s) + ε_i(t)
 * </pre>
 *
 * and scalar-on-function regression (scalar response y_i = β_0 + Σ_l γ_l u_il +
 * Σ_j ⟨β_j, X_ij⟩_B + ε_i), with optional scalar covariates u (a {@link Design}, which must
 * contain the intercept).
 *
 * <p>In orthonormal coordinates, β_j(s, t) = Σ_{k,m} G_j,km e_k(s) e_m(t) and the model is the
 * multivariate linear model c(Y_i) = β_0 + Γᵀu_i + Σ_j G_jᵀ c(X_ij) + ε_i. Two estimators:
 * <ul>
 * <li>{@link Method#TRUNCATION}: regression on the first m FPCA scores of each predictor (the
 * same m for every predictor), optionally keeping only the first m_Y FPCA components of the
 * response; G_j = V_j,m B̂_j (V_Y,m_Y V_Y,m_Yᵀ), i.e. β̂(s,t) = Σ_k Σ_m b̂_km φ̂_k(s) ψ̂_m(t) (Yao,
 * Müller, Wang (2005), Functional linear regression analysis for longitudinal data, Ann. Statist.
 * 33(6)).</li>
 * <li>{@link Method#RIDGE}: minimises (1/n) Σ_i ‖c(Y_i) − fit_i‖² + λ Σ_j ‖β_j‖², where
 * ‖β_j‖² = Σ G_j,km² is the squared L2(P ⊗ P) norm of the kernel (intercept and scalar
 * covariates unpenalised).</li>
 * </ul>
 * The tuning (m and m_Y, or λ) is chosen by k-fold cross-validation of the squared prediction
 * error ‖c(Y_i) − ĉ_i‖² (B2 distance for density responses), with seeded random folds; a single
 * candidate skips the cross-validation. Within each fold, the predictor FPCA is recomputed on
 * the training part.
 *
 * <p>Immutable and thread-safe.
 */
public final class FunctionalRegression {
    /** Estimation method. */
    public enum Method {
        /** Regression on leading FPCA scores. */
        TRUNCATION,
        /** Ridge penalty on the kernel's L2 norm. */
        RIDGE
    }

    /**
     * One tuning candidate and its cross-validated error.
     *
     * @param predictorComponents m (truncation), or 0 for ridge
     * @param responseComponents  m_Y (truncation; K_Y or 1 when the response is not truncated), 0 for ridge
     * @param lambda              λ (ridge), 0 for truncation
     * @param cvError             mean held-out squared prediction error per observation, empty
     *                            when no cross-validation was run (a single candidate)
     */
    public record Candidate(int predictorComponents, int responseComponents, double lambda, OptionalDouble cvError) {
        /** Canonical constructor: requires a non-null error (use {@link OptionalDouble#empty()}). */
        public Candidate {
            Objects.requireNonNull(cvError, "cvError");
        }
    }

    private final Method method;
    private final int minComponents;
    private final int maxComponents;
    private final int[] responseComponents; // null: no response truncation
    private final double[] lambdas;         // null: default grid
    private final int folds;
    private final long seed;
    private final ProgressListener progress;

    private FunctionalRegression(Method method, int minComponents, int maxComponents, int[] responseComponents,
            double[] lambdas, int folds, long seed) {
        this(method, minComponents, maxComponents, responseComponents, lambdas, folds, seed, ProgressListener.NONE);
    }

    private FunctionalRegression(Method method, int minComponents, int maxComponents, int[] responseComponents,
            double[] lambdas, int folds, long seed, ProgressListener progress) {
        this.method = method;
        this.minComponents = minComponents;
        this.maxComponents = maxComponents;
        this.responseComponents = responseComponents;
        this.lambdas = lambdas;
        this.folds = folds;
        this.seed = seed;
        this.progress = progress;
    }

    /** FPCA truncation with m chosen from 1..20 (capped at each predictor's K) by 5-fold CV, seed 0. */
    public static FunctionalRegression truncation() {
        return new FunctionalRegression(Method.TRUNCATION, 1, 20, null, null, 5, 0L);
    }

    /**
     * Ridge with λ chosen by 5-fold CV (seed 0) from 10^−6 … 10^2 times the mean predictor
     * coordinate variance (17 values, half a decade apart) unless {@link #withLambdas} is given.
     */
    public static FunctionalRegression ridge() {
        return new FunctionalRegression(Method.RIDGE, 0, 0, null, null, 5, 0L);
    }

    /** The method. */
    public Method method() {
        return method;
    }

    /** Number of folds. */
    public int folds() {
        return folds;
    }

    /** Seed of the fold assignment. */
    public long seed() {
        return seed;
    }

    /** Smallest number of predictor components tried (truncation; 0 for ridge). */
    public int minComponents() {
        return minComponents;
    }

    /** Largest number of predictor components tried (truncation; 0 for ridge). */
    public int maxComponents() {
        return maxComponents;
    }

    /** Response component counts tried (fresh copy), or null without response truncation. */
    public int[] responseComponents() {
        return responseComponents == null ? null : responseComponents.clone();
    }

    /** The λ values tried (ridge; fresh copy), or null for the default grid. */
    public double[] lambdas() {
        return lambdas == null ? null : lambdas.clone();
    }

    boolean usesResponseTruncation() {
        return responseComponents != null;
    }

    /**
     * Candidate predictor component counts min..max (truncation only; min = max fixes m).
     *
     * @throws IllegalArgumentException unless 1 ≤ min ≤ max
     */
    public FunctionalRegression withComponents(int min, int max) {
        requireMethod(Method.TRUNCATION, "withComponents");
        if (!(min >= 1 && max >= min)) {
            throw new IllegalArgumentException("need 1 <= min <= max, got [" + min + ", " + max + "]");
        }
        return new FunctionalRegression(method, min, max, responseComponents, lambdas, folds, seed, progress);
    }

    /**
     * Also truncates a density response to its leading FPCA components, choosing m_Y among the
     * given counts by the same cross-validation (truncation only).
     *
     * @param counts positive counts (copied; capped at the response's K)
     */
    public FunctionalRegression withResponseComponents(int... counts) {
        requireMethod(Method.TRUNCATION, "withResponseComponents");
        Objects.requireNonNull(counts, "counts");
        if (counts.length == 0) {
            throw new IllegalArgumentException("give at least one response component count");
        }
        for (int c : counts) {
            if (c < 1) {
                throw new IllegalArgumentException("response component counts must be >= 1, got " + c);
            }
        }
        return new FunctionalRegression(method, minComponents, maxComponents, counts.clone(), lambdas, folds, seed,
                progress);
    }

    /**
     * Candidate ridge weights λ (ridge only).
     *
     * @param values positive finite values (copied)
     */
    public FunctionalRegression withLambdas(double... values) {
        requireMethod(Method.RIDGE, "withLambdas");
        Objects.requireNonNull(values, "values");
        if (values.length == 0) {
            throw new IllegalArgumentException("give at least one λ");
        }
        for (double v : values) {
            if (!(v > 0) || Double.isInfinite(v)) {
                throw new IllegalArgumentException("λ must be positive and finite, got " + v);
            }
        }
        return new FunctionalRegression(method, minComponents, maxComponents, responseComponents, values.clone(),
                folds, seed, progress);
    }

    /**
     * Chooses the tuning parameter by k-fold cross-validation with the given number of folds and
     * seed of the random fold assignment (the same option as
     * {@code PenalizedLikelihoodEstimator.withCrossValidation(k, seed)} in core); equivalent to
     * {@code withFolds(folds).withSeed(seed)}.
     *
     * @param folds number of folds, 2 or more (and at most the number of observations when fitting)
     * @param seed  seed of the random fold assignment
     * @throws IllegalArgumentException if {@code folds} &lt; 2
     */
    public FunctionalRegression withCrossValidation(int folds, long seed) {
        return withFolds(folds).withSeed(seed);
    }

    /**
     * Number of cross-validation folds (see {@link #withCrossValidation(int, long)}, which sets the
     * folds and the seed together).
     *
     * @param k 2 or more
     */
    public FunctionalRegression withFolds(int k) {
        if (k < 2) {
            throw new IllegalArgumentException("need at least 2 folds, got " + k);
        }
        return new FunctionalRegression(method, minComponents, maxComponents, responseComponents, lambdas, k, seed,
                progress);
    }

    /** Seed of the random fold assignment (see {@link #withCrossValidation(int, long)}). */
    public FunctionalRegression withSeed(long s) {
        return new FunctionalRegression(method, minComponents, maxComponents, responseComponents, lambdas, folds, s,
                progress);
    }

    /**
     * With a listener that receives the progress of the cross-validation: task
     * {@code "cross-validation"}, one unit per fold, from the calling thread; the count reaches the
     * number of folds. No calls when a single candidate skips the cross-validation. The listener
     * does not change the fit.
     *
     * @param listener progress listener, or {@link ProgressListener#NONE} (the default)
     */
    public FunctionalRegression withProgressListener(ProgressListener listener) {
        return new FunctionalRegression(method, minComponents, maxComponents, responseComponents, lambdas, folds,
                seed, Objects.requireNonNull(listener, "listener"));
    }

    /** The progress listener ({@link ProgressListener#NONE} by default). */
    public ProgressListener progressListener() {
        return progress;
    }

    private void requireMethod(Method m, String what) {
        if (method != m) {
            throw new IllegalArgumentException(what + " applies to " + m + ", this configuration is " + method);
        }
    }

    List<Candidate> candidates(List<DensitySet> predictors, int r) {
        List<Candidate> out = new ArrayList<>();
        if (method == Method.RIDGE) {
            double[] ls = lambdas;
            if (ls == null) {
                double var = 0;
                int cols = 0;
                for (DensitySet s : predictors) {
                    double[] c = s.covariance().data;
                    for (int i = 0; i < s.dimension(); i++) {
                        var += c[i * s.dimension() + i];
                    }
                    cols += s.dimension();
                }
                var = Math.max(var / cols, Double.MIN_NORMAL);
                ls = new double[17];
                for (int i = 0; i < 17; i++) {
                    ls[i] = var * Math.pow(10, -6 + 0.5 * i);
                }
            }
            for (double l : ls) {
                out.add(new Candidate(0, 0, l, OptionalDouble.empty()));
            }
            return out;
        }
        int maxK = 0;
        for (DensitySet s : predictors) {
            maxK = Math.max(maxK, s.dimension());
        }
        int hi = Math.min(maxComponents, maxK);
        int lo = Math.min(minComponents, hi);
        int[] ry = responseComponents == null ? new int[] {r}
                : Arrays.stream(responseComponents).map(c -> Math.min(c, r)).distinct().sorted().toArray();
        for (int m = lo; m <= hi; m++) {
            for (int my : ry) {
                out.add(new Candidate(m, my, 0.0, OptionalDouble.empty()));
            }
        }
        return out;
    }

    private int largestModel(List<DensitySet> predictors, Design d) {
        int p = d.columns();
        for (DensitySet s : predictors) {
            p += method == Method.RIDGE ? 0 : Math.min(s.dimension(), Math.min(maxComponents, s.dimension()));
        }
        return p;
    }

    private Design check(List<DensitySet> predictors, Design covariates, int n, BayesSpace responseSpace) {
        Objects.requireNonNull(predictors, "predictors");
        if (predictors.isEmpty()) {
            throw new IllegalArgumentException("give at least one density predictor");
        }
        for (int j = 0; j < predictors.size(); j++) {
            DensitySet s = Objects.requireNonNull(predictors.get(j), "predictor " + j);
            if (s.size() != n) {
                throw new IllegalArgumentException("predictor " + j + " has " + s.size() + " rows but the response has "
                        + n + "; every predictor needs one density per observation");
            }
            Arguments.requireModerate(s, "predictor " + j);
            if (responseSpace != null && !s.space().equals(responseSpace)
                    && s.space().lower() == responseSpace.lower() && s.space().upper() == responseSpace.upper()
                    && s.dimension() == responseSpace.dimension()) {
                // same domain and dimension but another basis or reference: almost surely a mistake
                throw new IllegalArgumentException("predictor " + j + " lives in " + s.space()
                        + " and the response in " + responseSpace + ": the spaces have the same domain and"
                        + " dimension but differ; project one onto the other's space (BayesSpace.project) first");
            }
        }
        Design d = covariates == null ? Design.interceptOnly(n) : covariates;
        if (d.rows() != n) {
            throw new IllegalArgumentException("covariate design has " + d.rows() + " rows but the response has " + n);
        }
        if (!d.hasIntercept()) {
            throw new IllegalArgumentException("the covariate design must contain the intercept β_0; build it"
                    + " without withoutIntercept()");
        }
        d.requireFullRank(null, 0, "functional regression");
        int need = largestModel(predictors, d);
        int ntr = n - (n + folds - 1) / folds;
        if (ntr < need + 1) {
            throw new IllegalArgumentException("functional regression: " + n + " observations (" + ntr
                    + " per training fold) for up to " + need
                    + " parameters; need more observations than parameters (lower the component range or use ridge)");
        }
        return d;
    }

    /**
     * Fits a function-on-function regression (density response).
     *
     * @param predictors one or more density sets with one row per observation (any spaces)
     * @param covariates scalar covariates with intercept, or null for the intercept alone
     * @param response   n densities
     * @throws IllegalArgumentException on mismatched rows, a predictor whose space has the
     *                                  response's domain and dimension but differs from it, a
     *                                  design without intercept or rank deficient, or too few
     *                                  observations for the largest candidate model, or
     *                                  coordinates of a predictor or the response above
     *                                  1e150 / √(n·K) in magnitude
     */
    public FunctionOnFunctionFit fit(List<DensitySet> predictors, Design covariates, DensitySet response) {
        Objects.requireNonNull(response, "response");
        Arguments.requireModerate(response, "response");
        Design d = check(predictors, covariates, response.size(), response.space());
        LinearFunctionalEngine.Result res = LinearFunctionalEngine.fit(this, d, predictors,
                response.coordinatesRowMajor(), response.dimension());
        return new FunctionOnFunctionFit(this, d, predictors, response, res);
    }

    /**
     * Fits a scalar-on-function regression.
     *
     * @param predictors one or more density sets with one row per observation
     * @param covariates scalar covariates with intercept, or null
     * @param response   n finite values (copied)
     * @throws IllegalArgumentException as {@link #fit(java.util.List, io.densa.regression.Design, io.densa.core.DensitySet)}, or on a non-finite
     *                                  response (naming the row)
     */
    public ScalarOnFunctionFit fit(List<DensitySet> predictors, Design covariates, double[] response) {
        Objects.requireNonNull(response, "response");
        for (int i = 0; i < response.length; i++) {
            if (!Double.isFinite(response[i])) {
                throw new IllegalArgumentException("response row " + i + " is not finite: " + response[i]);
            }
        }
        if (responseComponents != null) {
            throw new IllegalArgumentException("response truncation applies to density responses only");
        }
        Arguments.requireModerate(response, 1, "response value");
        Design d = check(predictors, covariates, response.length, null);
        LinearFunctionalEngine.Result res = LinearFunctionalEngine.fit(this, d, predictors, response.clone(), 1);
        return new ScalarOnFunctionFit(this, d, predictors, response, res);
    }

    /**
     * Fits a function-on-function regression with the intercept as the only scalar covariate:
     * {@code fit(predictors, null, response)}.
     */
    public FunctionOnFunctionFit fit(List<DensitySet> predictors, DensitySet response) {
        return fit(predictors, null, response);
    }

    /**
     * Fits a scalar-on-function regression with the intercept as the only scalar covariate:
     * {@code fit(predictors, null, response)}.
     */
    public ScalarOnFunctionFit fit(List<DensitySet> predictors, double[] response) {
        return fit(predictors, null, response);
    }

    @Override
    public String toString() {
        return "FunctionalRegression[" + method + (method == Method.TRUNCATION ? ", m in [" + minComponents + ", "
                + maxComponents + "]" : "") + ", folds=" + folds + ", seed=" + seed + "]";
    }
}
