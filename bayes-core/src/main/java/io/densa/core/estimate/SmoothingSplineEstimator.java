package io.densa.core.estimate;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.SolveDiagnostics;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.GoldenSection;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.ProgressCounter;
import io.densa.core.internal.RoughnessPenalty;
import java.util.Arrays;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * Compositional smoothing spline from binned counts: zero replacement, then a penalised
 * least-squares fit of the clr of the histogram at the bin midpoints by a zero-integral function
 * of the space, with the smoothing parameter chosen by generalised cross-validation (Machalová,
 * Talská, Hron, Gába (2021), Compositional splines for representation of density functions,
 * Computational Statistics 36, doi:10.1007/s00180-020-01042-7; GCV of Craven &amp; Wahba (1979),
 * from memory).
 *
 * <h2>Method</h2>
 * For counts n_1..n_D in bins with midpoints x_j and widths h_j, {@link ZeroReplacement} gives a
 * composition r with every part &gt; 0 (default: Bayesian-multiplicative, Jeffreys prior), and
 * y_j = ln(r_j / (h_j p(x_j))) the log histogram height relative to the reference density p.
 * The fit minimises
 * <pre>
 *   Σ_j (y_j − c_0 − Σ_k c_k e_k(x_j))² + λ c'Ωc,      c'Ωc = ∫_a^b (clr^{(l)})² dx,
 * </pre>
 * over the coordinates c of the space (zero-integral functions; for a spline space exactly the
 * span of the paper's ZB-splines) and an unpenalised constant c_0 that absorbs the difference
 * between the discrete centring of y and the continuous centring of the clr (our choice; the
 * paper centres the data discretely and fits without a constant). The paper's weight α on the
 * data term corresponds to λ = (1 − α)/α. λ minimises GCV(λ) = D·RSS(λ)/(D − tr H(λ))² (or is
 * fixed), found on a grid of log λ refined by golden-section search. The design is diagonalised
 * once per set of bin edges (Demmler–Reinsch form), so each unit and each λ costs O(D K) and
 * O(K).
 *
 * <h2>Covariance</h2>
 * The reported coordinate covariance is the least-squares one, σ̂² A X'X A with A = (X'X +
 * λΩ̃)⁻¹ and σ̂² = RSS/(D − tr H), treating the clr values as homoscedastic — a rough guide only:
 * it ignores the Poisson noise structure and the zero replacement; prefer
 * {@link PenalizedLikelihoodEstimator} when the precision matters. edf = tr H (including the
 * constant). The log-likelihood reported is the multinomial one of the counts under the fitted
 * density, for comparison with the penalised-likelihood estimator.
 *
 * <p>Immutable and thread-safe; inputs are not modified; {@code fitAll} is parallel and
 * bit-identical to the serial path.
 */
public final class SmoothingSplineEstimator implements CountEstimator {
    private static final int UNITS_PER_BLOCK = 64;
    private static final double GRID_STEP = 0.05;
    /** Task name of the progress reports of batch fits. */
    public static final String PROGRESS_TASK = "smoothing spline";

    private final BayesSpace space;
    private final ZeroReplacement zeros;
    private final int penaltyOrder;
    private final double fixedLambda;
    private final double gridLo;
    private final double gridHi;
    private final ZeroTotalPolicy zeroTotal;
    private final boolean parallel;
    private final ProgressListener progress;
    private final int k;
    private final double[] t;
    private final double[] rawPenalty;
    private final double[] omega;

    private SmoothingSplineEstimator(BayesSpace space, ZeroReplacement zeros, int penaltyOrder, double fixedLambda,
            double gridLo, double gridHi, ZeroTotalPolicy zeroTotal, boolean parallel,
            ProgressListener progress) {
        this.space = space;
        this.zeros = zeros;
        this.penaltyOrder = penaltyOrder;
        this.fixedLambda = fixedLambda;
        this.gridLo = gridLo;
        this.gridHi = gridHi;
        this.zeroTotal = zeroTotal;
        this.parallel = parallel;
        this.progress = progress;
        this.k = space.dimension();
        this.t = space.basisTransform();
        this.rawPenalty = RoughnessPenalty.raw(EstimationSupport.rawBasis(space.basis()), penaltyOrder);
        this.omega = RoughnessPenalty.inCoordinates(t, rawPenalty, k);
    }

    /**
     * Defaults: Bayesian-multiplicative zero replacement with the Jeffreys prior, second-derivative
     * penalty (first for linear splines), λ by GCV over λ = s 10^g, g ∈ [−12, 6] (s = tr(X'X)/tr(Ω)),
     * zero-total units rejected, parallel batches.
     */
    public static SmoothingSplineEstimator withDefaults(BayesSpace space) {
        Objects.requireNonNull(space, "space");
        return new SmoothingSplineEstimator(space, ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.JEFFREYS),
                Math.min(2, RoughnessPenalty.maxOrder(EstimationSupport.rawBasis(space.basis()))), Double.NaN, -12, 6, ZeroTotalPolicy.REJECT,
                true, ProgressListener.NONE);
    }

    /** Uses the given zero replacement. */
    public SmoothingSplineEstimator withZeroReplacement(ZeroReplacement z) {
        return new SmoothingSplineEstimator(space, Objects.requireNonNull(z, "zero replacement"), penaltyOrder,
                fixedLambda, gridLo, gridHi, zeroTotal, parallel, progress);
    }

    /** Penalises the l-th derivative of the clr (l-th differences for step bases). */
    public SmoothingSplineEstimator withPenaltyOrder(int l) {
        return new SmoothingSplineEstimator(space, zeros, l, fixedLambda, gridLo, gridHi, zeroTotal, parallel,
                progress);
    }

    /** Uses a fixed λ ≥ 0 (GCV is still reported). */
    public SmoothingSplineEstimator withSmoothing(double lambda) {
        if (!(lambda >= 0 && Double.isFinite(lambda))) {
            throw new IllegalArgumentException("smoothing parameter must be finite and >= 0, got " + lambda);
        }
        return new SmoothingSplineEstimator(space, zeros, penaltyOrder, lambda, gridLo, gridHi, zeroTotal, parallel,
                progress);
    }

    /** Chooses λ by GCV over λ = s 10^g, g ∈ [log10Lo, log10Hi] (undoes {@link #withSmoothing}). */
    public SmoothingSplineEstimator withGcv(double log10Lo, double log10Hi) {
        if (!(Double.isFinite(log10Lo) && Double.isFinite(log10Hi) && log10Hi - log10Lo >= 2 * GRID_STEP)) {
            throw new IllegalArgumentException("GCV range needs finite lo < hi (at least 0.1 apart), got " + log10Lo
                    + ", " + log10Hi);
        }
        return new SmoothingSplineEstimator(space, zeros, penaltyOrder, Double.NaN, log10Lo, log10Hi, zeroTotal,
                parallel, progress);
    }

    /**
     * What to do with units without events: only {@link ZeroTotalPolicy#REJECT} (the default). The
     * least-squares smoothing spline has no prior, so a unit without events has no finite
     * covariance to report; {@link PenalizedLikelihoodEstimator} with its reference prior accepts
     * {@link ZeroTotalPolicy#REFERENCE}.
     *
     * @throws IllegalArgumentException for {@link ZeroTotalPolicy#REFERENCE}
     */
    public SmoothingSplineEstimator withZeroTotal(ZeroTotalPolicy policy) {
        if (policy == ZeroTotalPolicy.REFERENCE) {
            throw new IllegalArgumentException("the smoothing spline cannot return units without events: it has no"
                    + " prior, so their covariance would be infinite; accepted: ZeroTotalPolicy.REJECT, or use"
                    + " PenalizedLikelihoodEstimator (reference prior) with ZeroTotalPolicy.REFERENCE");
        }
        return new SmoothingSplineEstimator(space, zeros, penaltyOrder, fixedLambda, gridLo, gridHi,
                Objects.requireNonNull(policy, "policy"), parallel, progress);
    }

    /**
     * Every setting of this estimator except the space and the progress listener (what a saved
     * model file stores; see {@link #withSettings}).
     *
     * @param zeroReplacement the zero replacement
     * @param penaltyOrder    derivative order l of the roughness penalty
     * @param smoothing       the fixed λ, or NaN when λ is chosen by GCV
     * @param gcvLog10Lo      lower end of the GCV range
     * @param gcvLog10Hi      upper end of the GCV range
     * @param zeroTotal       what happens to units without events
     * @param parallel        whether batches use the common pool
     */
    public record Settings(ZeroReplacement zeroReplacement, int penaltyOrder, double smoothing, double gcvLog10Lo,
            double gcvLog10Hi, ZeroTotalPolicy zeroTotal, boolean parallel) {
    }

    /** The settings of this estimator (see {@link Settings}). */
    public Settings settings() {
        return new Settings(zeros, penaltyOrder, fixedLambda, gridLo, gridHi, zeroTotal, parallel);
    }

    /**
     * This estimator's space and progress listener with every other setting taken from
     * {@code s}, each checked as its {@code with…} method checks it.
     *
     * @throws IllegalArgumentException naming the first setting that its {@code with…} method refuses
     */
    public SmoothingSplineEstimator withSettings(Settings s) {
        Objects.requireNonNull(s, "settings");
        Objects.requireNonNull(s.zeroReplacement(), "settings.zeroReplacement");
        if (!Double.isNaN(s.smoothing())) {
            withSmoothing(s.smoothing());
        }
        withGcv(s.gcvLog10Lo(), s.gcvLog10Hi());
        withZeroTotal(s.zeroTotal());
        return new SmoothingSplineEstimator(space, s.zeroReplacement(), s.penaltyOrder(), s.smoothing(), s.gcvLog10Lo(),
                s.gcvLog10Hi(), s.zeroTotal(), s.parallel(), progress);
    }

    /** Whether {@code fitAll} may use the common pool (results are identical either way). */
    public SmoothingSplineEstimator withParallel(boolean p) {
        return new SmoothingSplineEstimator(space, zeros, penaltyOrder, fixedLambda, gridLo, gridHi, zeroTotal, p,
                progress);
    }

    /**
     * Reports the units finished by {@code fitAll} (task {@value #PROGRESS_TASK}, after each block
     * of units; {@code done} is non-decreasing and reaches the number of units). Calls may come
     * from worker threads of the common pool, one at a time. The default is
     * {@link ProgressListener#NONE}; results do not depend on the listener.
     */
    public SmoothingSplineEstimator withProgressListener(ProgressListener listener) {
        Objects.requireNonNull(listener, "listener");
        return new SmoothingSplineEstimator(space, zeros, penaltyOrder, fixedLambda, gridLo, gridHi, zeroTotal,
                parallel, listener);
    }

    /** The penalty matrix Ω in the space's coordinates, K × K. */
    public DMatrixRMaj penalty() {
        return new DMatrixRMaj(k, k, true, omega);
    }

    /** The space. */
    @Override
    public BayesSpace space() {
        return space;
    }

    /**
     * The GCV criterion D·RSS(λ)/(D − tr H(λ))² of one unit at a given λ (for inspection and
     * plotting; +∞ where tr H ≥ D).
     */
    public double gcv(double[] edges, double[] counts, double lambda) {
        double[] e = EstimationSupport.checkEdges(space, edges);
        EstimationSupport.checkCounts(counts, e, "unit row 0", false);
        Design des = new Design(e);
        double[] z = new double[k + 1];
        double yy = des.transform(counts, e, "unit row 0", z);
        return des.gcv(z, yy, lambda)[0];
    }

    /** Fits many units sharing bin edges; see {@link PenalizedLikelihoodEstimator#fitAll(double[], int[][], String[])}. */
    @Override
    public BatchEstimate fitAll(double[] edges, int[][] counts, String[] ids) {
        Objects.requireNonNull(counts, "counts");
        double[] e = EstimationSupport.checkEdges(space, edges);
        EstimationSupport.checkIds(ids, counts.length);
        double[][] rows = new double[counts.length][];
        for (int i = 0; i < counts.length; i++) {
            EstimationSupport.checkCounts(counts[i], e, EstimationSupport.unit(ids, i));
            rows[i] = new double[counts[i].length];
            for (int j = 0; j < rows[i].length; j++) {
                rows[i][j] = counts[i][j];
            }
        }
        return run(e, rows, ids);
    }

    /** Fits many units of counts given as doubles (finite, ≥ 0, may be fractional). */
    @Override
    public BatchEstimate fitAll(double[] edges, double[][] counts, String[] ids) {
        Objects.requireNonNull(counts, "counts");
        double[] e = EstimationSupport.checkEdges(space, edges);
        EstimationSupport.checkIds(ids, counts.length);
        for (int i = 0; i < counts.length; i++) {
            EstimationSupport.checkCounts(counts[i], e, EstimationSupport.unit(ids, i), false);
        }
        return run(e, counts, ids);
    }

    private BatchEstimate run(double[] edges, double[][] counts, String[] ids) {
        int n = counts.length;
        double[] totals = new double[n];
        for (int i = 0; i < n; i++) {
            double s = 0;
            for (double c : counts[i]) {
                s += c;
            }
            totals[i] = s;
            if (!(s > 0)) {
                throw new IllegalArgumentException(EstimationSupport.unit(ids, i) + ": total count is 0 (every bin"
                        + " empty); give the unit at least one event or choose ZeroTotalPolicy.REFERENCE");
            }
        }
        Design des = new Design(edges);
        BinLayout lay = new BinLayout(space, edges, 4);
        BinLayout whole = new BinLayout(space, new double[] {space.lower(), space.upper()}, 4);
        double[] out = new double[n * k];
        EstimationDiagnostics[] diag = new EstimationDiagnostics[n];
        int blocks = (n + UNITS_PER_BLOCK - 1) / UNITS_PER_BLOCK;
        ProgressCounter done = new ProgressCounter(progress, PROGRESS_TASK, n);
        Kernels.forEachBlock(blocks, parallel && n > 1, blk -> {
            PenalizedNewton eng = new PenalizedNewton(lay, rawPenalty);
            double[] z = new double[k + 1];
            double[] coef = new double[k + 1];
            double[] raw = new double[k];
            int i1 = Math.min(n, (blk + 1) * UNITS_PER_BLOCK);
            for (int i = blk * UNITS_PER_BLOCK; i < i1; i++) {
                String id = EstimationSupport.id(ids, i);
                double yy = des.transform(counts[i], edges, EstimationSupport.unit(ids, i), z);
                boolean choose = Double.isNaN(fixedLambda);
                double lambda = choose ? des.choose(z, yy) : fixedLambda;
                double[] g = des.gcv(z, yy, lambda);
                double[] cov = des.fitted(z, lambda, g[1], coef);
                NewtonCovariance.projectPsd(cov, k);
                System.arraycopy(coef, 1, out, i * k, k);
                // multinomial log-likelihood of the counts under the fit
                Cholesky.transposeTimes(t, k, out, i * k, raw);
                eng.setRawCoefficients(raw);
                eng.setCounts(counts[i], totals[i]);
                double loglik = eng.objective().logLikelihoodPerBinShift(eng.betaView());
                int first = 0, last = lay.bins - 1;
                while (first < last && !(counts[i][first] > 0)) {
                    first++;
                }
                while (last > first && !(counts[i][last] > 0)) {
                    last--;
                }
                double normSq = 0;
                for (int c = 0; c < k; c++) {
                    normSq += out[i * k + c] * out[i * k + c];
                }
                double share = lay.periodic
                        ? EstimationSupport.circularExtrapolationShare(whole, lay, counts[i], eng.coefficients(), normSq,
                                totals[i])
                        : EstimationSupport.extrapolationShare(whole, lay, first, last, eng.coefficients(), normSq,
                                totals[i]);
                diag[i] = new EstimationDiagnostics(id, EstimationDiagnostics.Status.CONVERGED, "", lambda, choose,
                        SmoothingCriterion.GCV, g[0], g[2], loglik, totals[i], 0, cov,
                        EstimationSupport.trace(cov, k), share);
            }
            done.advance(i1 - blk * UNITS_PER_BLOCK);
        });
        return new BatchEstimate(DensitySet.ofRowMajor(space, out, n, ids == null ? null : ids.clone()),
                Arrays.asList(diag));
    }

    /** The design of one set of bin edges in Demmler–Reinsch form. */
    private final class Design {
        final int d;
        final int p; // K + 1
        final double[] mid;
        final double[] logWidthRef; // ln(h_j p(x_j))
        final double[] ut; // p × d: rows of Ũ'
        final double[] m; // p × p: coefficient map L^{-T} V
        final double[] eig; // p
        final double scale;

        Design(double[] edges) {
            d = edges.length - 1;
            p = k + 1;
            if (d < p + 1) {
                throw new IllegalArgumentException("the smoothing spline needs at least K + 2 = " + (p + 1)
                        + " bins for K = " + k + ", got " + d + " bins; use a smaller space or the penalized"
                        + " likelihood estimator");
            }
            mid = new double[d];
            logWidthRef = new double[d];
            for (int j = 0; j < d; j++) {
                mid[j] = 0.5 * (edges[j] + edges[j + 1]);
                logWidthRef[j] = Math.log((edges[j + 1] - edges[j]) * space.referenceDensity(mid[j]));
            }
            DMatrixRMaj e = space.basisMatrix(mid);
            double[] x = new double[d * p];
            for (int j = 0; j < d; j++) {
                x[j * p] = 1.0;
                for (int c = 0; c < k; c++) {
                    x[j * p + c + 1] = e.get(j, c);
                }
            }
            double[] xtx = EstimationSupport.crossProduct(x, d, p);
            double trX = EstimationSupport.trace(xtx, p);
            if (Cholesky.factor(xtx, p, p, 0) >= 0) {
                throw new IllegalArgumentException("the bin midpoints do not determine the " + k
                        + " coordinates (singular design); use more or better spread bins");
            }
            // L^{-1} explicitly (lower)
            double[] linv = new double[p * p];
            Cholesky.invertLower(xtx, p, linv);
            // B = L^{-1} Ω̃ L^{-T}, Ω̃ = blockdiag(0, Ω)
            double[] om = new double[p * p];
            for (int a = 0; a < k; a++) {
                for (int b = 0; b < k; b++) {
                    om[(a + 1) * p + b + 1] = omega[a * k + b];
                }
            }
            double trO = EstimationSupport.trace(om, p);
            DMatrixRMaj bm = new DMatrixRMaj(p, p, true, Cholesky.lowerCongruence(linv, om, p));
            EigenDecomposition_F64<DMatrixRMaj> eigd = DecompositionFactory_DDRM.eig(p, true, true);
            if (!eigd.decompose(bm)) {
                throw new DensaException("eigen decomposition of the penalised design failed",
                        new SolveDiagnostics("eigen-decomposition of the penalised design", p, Double.NaN));
            }
            eig = new double[p];
            double[] v = new double[p * p]; // columns = eigenvectors
            for (int i = 0; i < p; i++) {
                eig[i] = Math.max(0.0, eigd.getEigenvalue(i).real);
                DMatrixRMaj vec = eigd.getEigenVector(i);
                for (int a = 0; a < p; a++) {
                    v[a * p + i] = vec.get(a, 0);
                }
            }
            // m = L^{-T} V
            m = new double[p * p];
            for (int a = 0; a < p; a++) {
                for (int i = 0; i < p; i++) {
                    double s = 0;
                    for (int q = a; q < p; q++) {
                        s += linv[q * p + a] * v[q * p + i];
                    }
                    m[a * p + i] = s;
                }
            }
            // Ũ' = (X m)'
            ut = new double[p * d];
            for (int j = 0; j < d; j++) {
                for (int i = 0; i < p; i++) {
                    double s = 0;
                    for (int a = 0; a < p; a++) {
                        s += x[j * p + a] * m[a * p + i];
                    }
                    ut[i * d + j] = s;
                }
            }
            scale = trO > 0 ? trX / trO : 1.0;
        }

        /** Zero replacement and clr heights; z = Ũ'y; returns ‖y‖². */
        double transform(double[] counts, double[] edges, String unit, double[] z) {
            double[] logR = new double[d];
            zeros.replaceLog(counts, 0, d, logR, unit);
            double[] y = new double[d];
            double mean = 0;
            for (int j = 0; j < d; j++) {
                y[j] = logR[j] - logWidthRef[j];
                mean += y[j];
            }
            mean /= d;
            double yy = 0;
            for (int j = 0; j < d; j++) {
                y[j] -= mean;
                yy += y[j] * y[j];
            }
            for (int i = 0; i < p; i++) {
                double s = 0;
                int o = i * d;
                for (int j = 0; j < d; j++) {
                    s += ut[o + j] * y[j];
                }
                z[i] = s;
            }
            return yy;
        }

        /** {GCV, σ̂², tr H} at λ. */
        double[] gcv(double[] z, double yy, double lambda) {
            double zz = 0, rss = 0, tr = 0;
            for (int i = 0; i < p; i++) {
                double s = 1.0 / (1.0 + lambda * eig[i]);
                zz += z[i] * z[i];
                rss += (1 - s) * (1 - s) * z[i] * z[i];
                tr += s;
            }
            rss += Math.max(0.0, yy - zz);
            double den = d - tr;
            double g = den > 0 ? d * rss / (den * den) : Double.POSITIVE_INFINITY;
            double sigma2 = den > 0 ? rss / den : Double.POSITIVE_INFINITY;
            return new double[] {g, sigma2, tr};
        }

        double choose(double[] z, double yy) {
            int steps = (int) Math.floor((gridHi - gridLo) / GRID_STEP + 1e-9);
            double bestG = gridLo, best = Double.POSITIVE_INFINITY;
            for (int s = 0; s <= steps; s++) {
                double g = gridLo + s * GRID_STEP;
                double c = gcv(z, yy, scale * Math.pow(10, g))[0];
                if (c < best) {
                    best = c;
                    bestG = g;
                }
            }
            double lo = Math.max(gridLo, bestG - GRID_STEP), hi = Math.min(gridHi, bestG + GRID_STEP);
            double g = GoldenSection.minimise(x -> gcv(z, yy, scale * Math.pow(10, x))[0], lo, hi, 30, bestG, best);
            return scale * Math.pow(10, g);
        }

        /** Coefficients (c_0, c) into coef; returns the K × K coordinate covariance. */
        double[] fitted(double[] z, double lambda, double sigma2, double[] coef) {
            double[] sz = new double[p];
            double[] s2 = new double[p];
            for (int i = 0; i < p; i++) {
                double s = 1.0 / (1.0 + lambda * eig[i]);
                sz[i] = s * z[i];
                s2[i] = s * s;
            }
            for (int a = 0; a < p; a++) {
                double s = 0;
                for (int i = 0; i < p; i++) {
                    s += m[a * p + i] * sz[i];
                }
                coef[a] = s;
            }
            double[] cov = new double[k * k];
            for (int a = 0; a < k; a++) {
                for (int b = 0; b <= a; b++) {
                    double s = 0;
                    for (int i = 0; i < p; i++) {
                        s += m[(a + 1) * p + i] * s2[i] * m[(b + 1) * p + i];
                    }
                    cov[a * k + b] = sigma2 * s;
                    cov[b * k + a] = sigma2 * s;
                }
            }
            return cov;
        }
    }

    /** The space and every setting, e.g. for a log or a JShell session. */
    @Override
    public String toString() {
        return "SmoothingSplineEstimator[" + space + ", zeros " + zeros + ", penalty order " + penaltyOrder
                + (Double.isNaN(fixedLambda) ? ", lambda by GCV over log10 in [" + gridLo + ", " + gridHi + "]"
                        : ", lambda " + fixedLambda) + ", zero totals " + zeroTotal + (parallel ? ", parallel" : "") + "]";
    }
}
