package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
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
    private final DensitySet response;
    private final double[] weights; // null: unit
    private final BayesSpace space;
    private final int n;
    private final int p;
    private final int k;
    private final double[] u;          // K × K eigenvectors of R (null: unpenalised)
    private final double[][] inverses; // per transformed column l (or one)
    private final double[] coef;       // p × K
    private final double[] fitted;     // n × K
    private final double[] resid;      // n × K
    private final double rSquared;

    private FunctionOnScalarFit(FunctionOnScalarRegression config, Design design, DensitySet response,
            double[] weights, double[] u, double[][] inverses, double[] coef) {
        this.config = config;
        this.design = design;
        this.response = response;
        this.weights = weights;
        this.space = response.space();
        this.n = design.rows();
        this.p = design.columns();
        this.k = space.dimension();
        this.u = u;
        this.inverses = inverses;
        this.coef = coef;
        this.fitted = Linear.mult(design.internal(), n, p, coef, k);
        double[] c = response.coordinatesRowMajor();
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
    }

    private double w(int i) {
        return weights == null ? 1.0 : weights[i];
    }

    static FunctionOnScalarFit fit(FunctionOnScalarRegression cfg, Design design, DensitySet response, double[] w) {
        int n = design.rows();
        int p = design.columns();
        int k = response.dimension();
        double[] x = design.internal();
        double[] xw = x.clone();
        if (w != null) {
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < p; j++) {
                    xw[i * p + j] *= w[i];
                }
            }
        }
        double[] xtwx = Linear.multTransA(xw, n, p, x, p);
        double lambda = cfg.lambda();
        double[] u = null;
        double[][] inv;
        if (lambda > 0) {
            Linear.Eigen e = Linear.symmetricEigen(cfg.penalty().data, k);
            u = e.vectors();
            inv = new double[k][];
            boolean intercept = design.hasIntercept();
            for (int l = 0; l < k; l++) {
                double[] a = xtwx.clone();
                for (int j = 0; j < p; j++) {
                    if (!(intercept && j == 0)) {
                        a[j * p + j] += lambda * e.values()[l];
                    }
                }
                inv[l] = Linear.inverseSpd(a, p, "function-on-scalar regression");
            }
        } else {
            inv = new double[][] {Linear.inverseSpd(xtwx, p, "function-on-scalar regression")};
        }
        double[] xtwc = Linear.multTransA(xw, n, p, response.coordinatesRowMajor(), k);
        double[] coef = solve(xtwc, p, k, u, inv);
        return new FunctionOnScalarFit(cfg, design, response, w, u, inv, coef);
    }

    /** B = the solution of the (penalised) normal equations with right-hand side XᵀWC (p × K). */
    private static double[] solve(double[] rhs, int p, int k, double[] u, double[][] inv) {
        if (u == null) {
            return Linear.mult(inv[0], p, p, rhs, k);
        }
        double[] t = Linear.mult(rhs, p, k, u, k); // XᵀWC U
        double[] bt = new double[p * k];
        double[] col = new double[p];
        for (int l = 0; l < k; l++) {
            double[] a = inv[l];
            for (int j = 0; j < p; j++) {
                double s = 0;
                for (int m = 0; m < p; m++) {
                    s += a[j * p + m] * t[m * k + l];
                }
                col[j] = s;
            }
            for (int j = 0; j < p; j++) {
                bt[j * k + l] = col[j];
            }
        }
        // B = B̃ Uᵀ
        double[] b = new double[p * k];
        for (int j = 0; j < p; j++) {
            for (int c = 0; c < k; c++) {
                double s = 0;
                for (int l = 0; l < k; l++) {
                    s += bt[j * k + l] * u[c * k + l];
                }
                b[j * k + c] = s;
            }
        }
        return b;
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
        return Linear.clrAt(space, Arrays.copyOfRange(coef, j * k, (j + 1) * k), Linear.grid(xs, "points"));
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
     * Functional R² = 1 − Σ w_i ‖y_i ⊖ ŷ_i‖² / Σ w_i ‖y_i ⊖ ȳ_w‖², ȳ_w the weighted ⊕-mean.
     */
    public double rSquared() {
        return rSquared;
    }

    /** Weighted residual sum of squares Σ w_i ‖y_i ⊖ ŷ_i‖². */
    public double residualSumOfSquares() {
        double s = 0;
        for (int i = 0; i < n; i++) {
            double r = 0;
            for (int j = 0; j < k; j++) {
                r += resid[i * k + j] * resid[i * k + j];
            }
            s += w(i) * r;
        }
        return s;
    }

    /**
     * Fit diagnostics.
     *
     * @param observations       n
     * @param parameters         p (design columns)
     * @param residualDf         n − p
     * @param residualSumOfSquares Σ w_i ‖y_i ⊖ ŷ_i‖²
     * @param rSquared           functional R²
     * @param lambda             penalty weight (0 without penalty)
     * @param weighted           whether observation weights were used
     */
    public record Diagnostics(int observations, int parameters, int residualDf, double residualSumOfSquares,
            double rSquared, double lambda, boolean weighted) {
    }

    /** Fit diagnostics as a record. */
    public Diagnostics diagnostics() {
        return new Diagnostics(n, p, n - p, residualSumOfSquares(), rSquared, config.lambda(), weights != null);
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
        return DensitySet.ofRowMajor(space, Linear.mult(newDesign.internal(), newDesign.rows(), p, coef, k),
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
        Linear.sameSpace(space, newResponse.space(), "response");
        Linear.rows(newResponse, newDesign.rows(), "response");
        int m = newDesign.rows();
        double[] f = Linear.mult(newDesign.internal(), m, p, coef, k);
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
     */
    public record CoefficientBand(String column, double[] grid, double[] estimate, double[] pointwiseLower,
            double[] pointwiseUpper, double[] simultaneousLower, double[] simultaneousUpper, double[] standardError,
            double simultaneousCritical) {
    }

    /**
     * Bootstrap confidence bands for every coefficient function, by the residual bootstrap with
     * the design fixed: whole residual functions √w_i (y_i ⊖ ŷ_i), drawn with replacement and
     * divided by √w of the receiving row, are added to the fitted values and the model is
     * refitted (with the same penalty). Pointwise limits are basic bootstrap limits
     * 2β̂(t) − q*_{1−α/2}(t), 2β̂(t) − q*_{α/2}(t); the simultaneous band is β̂(t) ± c sd*(t) with c
     * the {@code level}-quantile of max_t |β*(t) − β̂(t)| / sd*(t) over replicates (a
     * studentised sup-band; Efron and Tibshirani (1993), An Introduction to the Bootstrap, for
     * the residual bootstrap and basic limits [from memory]). Residuals are not inflated for
     * leverage, so bands are slightly narrow when p is large relative to n.
     *
     * @param grid       evaluation points in the domain
     * @param replicates number of bootstrap replicates, ≥ 20
     * @param level      confidence level in (0, 1), e.g. 0.95
     * @param seed       random seed
     * @return one band per design column, in column order
     */
    public List<CoefficientBand> bootstrapBands(double[] grid, int replicates, double level, long seed) {
        double[] g = Linear.grid(grid, "grid");
        if (replicates < 20) {
            throw new IllegalArgumentException("need at least 20 bootstrap replicates, got " + replicates);
        }
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("level must be in (0, 1), got " + level);
        }
        int m = g.length;
        double[] et = basisTransposed(g); // K × m
        double[] est = Linear.mult(coef, p, k, et, m); // p × m
        double[][] deltas = new double[replicates][]; // each p × m
        double[] std = new double[n * k];
        for (int i = 0; i < n; i++) {
            double s = Math.sqrt(w(i));
            for (int j = 0; j < k; j++) {
                std[i * k + j] = resid[i * k + j] * s;
            }
        }
        SplittableRandom rnd = new SplittableRandom(seed);
        double[] x = design.internal();
        double[] rhs = new double[p * k];
        for (int b = 0; b < replicates; b++) {
            Arrays.fill(rhs, 0.0);
            for (int i = 0; i < n; i++) {
                int src = rnd.nextInt(n);
                // XᵀW r*: row i contributes w_i x_i (e_src / √w_i) = √w_i x_i e_src
                double sw = Math.sqrt(w(i));
                for (int j = 0; j < p; j++) {
                    double xij = x[i * p + j] * sw;
                    if (xij == 0) {
                        continue;
                    }
                    for (int l = 0; l < k; l++) {
                        rhs[j * k + l] += xij * std[src * k + l];
                    }
                }
            }
            double[] db = solve(rhs, p, k, u, inverses);
            deltas[b] = Linear.mult(db, p, k, et, m);
        }
        List<CoefficientBand> out = new ArrayList<>();
        double alpha = 1 - level;
        double[] col = new double[replicates];
        for (int j = 0; j < p; j++) {
            double[] e = Arrays.copyOfRange(est, j * m, (j + 1) * m);
            double[] pl = new double[m];
            double[] pu = new double[m];
            double[] sd = new double[m];
            for (int q = 0; q < m; q++) {
                double s = 0;
                double s2 = 0;
                for (int b = 0; b < replicates; b++) {
                    double d = deltas[b][j * m + q];
                    col[b] = d;
                    s += d;
                    s2 += d * d;
                }
                double mean = s / replicates;
                sd[q] = Math.sqrt(Math.max(0, (s2 - replicates * mean * mean) / (replicates - 1)));
                Arrays.sort(col);
                pl[q] = e[q] - Linear.quantileSorted(col, 1 - alpha / 2);
                pu[q] = e[q] - Linear.quantileSorted(col, alpha / 2);
            }
            double[] maxDev = new double[replicates];
            for (int b = 0; b < replicates; b++) {
                double mx = 0;
                for (int q = 0; q < m; q++) {
                    if (sd[q] > 0) {
                        mx = Math.max(mx, Math.abs(deltas[b][j * m + q]) / sd[q]);
                    }
                }
                maxDev[b] = mx;
            }
            Arrays.sort(maxDev);
            double c = Linear.quantileSorted(maxDev, level);
            double[] sl = new double[m];
            double[] su = new double[m];
            for (int q = 0; q < m; q++) {
                sl[q] = e[q] - c * sd[q];
                su[q] = e[q] + c * sd[q];
            }
            out.add(new CoefficientBand(design.columnNames().get(j), g.clone(), e, pl, pu, sl, su, sd, c));
        }
        return List.copyOf(out);
    }

    private double[] basisTransposed(double[] g) {
        DMatrixRMaj e = space.basisMatrix(g);
        int m = g.length;
        double[] t = new double[k * m];
        for (int q = 0; q < m; q++) {
            for (int j = 0; j < k; j++) {
                t[j * m + q] = e.data[q * k + j];
            }
        }
        return t;
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
            int permutations, long seed) {
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
     */
    public PermutationTest permutationTest(String term, int permutations, long seed) {
        Design.Term t = design.term(term);
        if (t.name().equals(Design.INTERCEPT)) {
            throw new IllegalArgumentException("the permutation test is for covariates, not the intercept");
        }
        if (permutations < 19) {
            throw new IllegalArgumentException("need at least 19 permutations, got " + permutations);
        }
        int df2 = n - p;
        if (df2 < 1) {
            throw new IllegalArgumentException("no residual degrees of freedom (n = " + n + ", p = " + p + ")");
        }
        Design reduced = design.without(term);
        double[] sw = new double[n];
        for (int i = 0; i < n; i++) {
            sw[i] = Math.sqrt(w(i));
        }
        double[] q1 = orthonormalColumns(design, sw);
        double[] q0 = reduced.columns() == 0 ? new double[0] : orthonormalColumns(reduced, sw);
        int p0 = reduced.columns();
        double[] c = response.coordinatesRowMajor();
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                c[i * k + j] *= sw[i];
            }
        }
        // reduced-model residuals e0 = (I − Q0 Q0ᵀ) C̃
        double[] e0 = residualise(q0, p0, c);
        int df1 = t.columns().size();
        double fObs = fStat(q0, p0, q1, e0, df1, df2);
        SplittableRandom rnd = new SplittableRandom(seed);
        double[] perm = new double[n * k];
        int exceed = 0;
        for (int b = 0; b < permutations; b++) {
            int[] pi = Linear.permutation(n, rnd);
            for (int i = 0; i < n; i++) {
                System.arraycopy(e0, pi[i] * k, perm, i * k, k);
            }
            double f = fStat(q0, p0, q1, perm, df1, df2);
            if (f >= fObs * (1 - 1e-12)) {
                exceed++;
            }
        }
        return new PermutationTest(term, fObs, (1.0 + exceed) / (permutations + 1.0), df1, df2, permutations, seed);
    }

    private double fStat(double[] q0, int p0, double[] q1, double[] e, int df1, int df2) {
        // (I − H0)(Ĉ0 + e*) = (I − H0) e*, (I − H1)(Ĉ0 + e*) = (I − H1) e*
        double tot = 0;
        for (double v : e) {
            tot += v * v;
        }
        double rss0 = tot - projectedSq(q0, p0, e);
        double rss1 = tot - projectedSq(q1, p, e);
        return ((rss0 - rss1) / df1) / (rss1 / df2);
    }

    private double projectedSq(double[] q, int cols, double[] e) {
        if (cols == 0) {
            return 0;
        }
        double[] qe = Linear.multTransA(q, n, cols, e, k);
        double s = 0;
        for (double v : qe) {
            s += v * v;
        }
        return s;
    }

    private double[] residualise(double[] q, int cols, double[] c) {
        if (cols == 0) {
            return c.clone();
        }
        double[] qc = Linear.multTransA(q, n, cols, c, k);
        double[] fit = Linear.mult(q, n, cols, qc, k);
        double[] r = new double[c.length];
        for (int i = 0; i < r.length; i++) {
            r[i] = c[i] - fit[i];
        }
        return r;
    }

    private static double[] orthonormalColumns(Design d, double[] sw) {
        int rows = d.rows();
        int cols = d.columns();
        double[] xw = d.internal().clone();
        for (int i = 0; i < rows; i++) {
            for (int j = 0; j < cols; j++) {
                xw[i * cols + j] *= sw[i];
            }
        }
        QRDecomposition<DMatrixRMaj> qr = DecompositionFactory_DDRM.qr(rows, cols);
        if (!qr.decompose(DMatrixRMaj.wrap(rows, cols, xw))) {
            throw new io.densa.core.DensaException("QR decomposition of the " + rows + " x " + cols + " design failed", null);
        }
        return qr.getQ(null, true).data;
    }

    @Override
    public String toString() {
        return "FunctionOnScalarFit[n=" + n + ", columns=" + design.columnNames() + ", R²=" + rSquared + "]";
    }
}
