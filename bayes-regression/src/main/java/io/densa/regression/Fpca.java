package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.Seeds;
import java.util.List;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * Simplicial functional principal component analysis of a {@link DensitySet} (Hron et al.
 * (2016), Simplicial principal component analysis for density functions in Bayes spaces,
 * Comput. Stat. Data Anal. 94).
 *
 * <p>Because the densities are stored in an orthonormal basis of the clr space, simplicial FPCA
 * is the PCA of the n × K coordinate matrix C: with the ⊕-mean c̄ (column means) and the sample
 * covariance S = (C − 1c̄ᵀ)ᵀ(C − 1c̄ᵀ) / (n − 1) = V Λ Vᵀ,
 * <ul>
 * <li>the eigenvalues λ_1 ≥ … ≥ λ_K are the variances of the scores, and λ_j / Σ λ the
 * explained-variance fractions;</li>
 * <li>the j-th principal component is the unit-norm element ξ_j of B2 whose coordinates are the
 * j-th column v_j of V; its clr function is ξ_j(t) = Σ_k v_kj e_k(t);</li>
 * <li>the scores are z_ij = ⟨f_i ⊖ f̄, ξ_j⟩_B = (c_i − c̄)ᵀ v_j;</li>
 * <li>the reconstruction with m components is f̄ ⊕ ⊕_{j ≤ m} z_ij ⊙ ξ_j;</li>
 * <li>the modes of variation are f̄ ⊕ (t √λ_j) ⊙ ξ_j, usually for t = ±1, ±2.</li>
 * </ul>
 *
 * <p>Cost: one blocked K × K cross-product pass over the data ({@link DensitySet#crossProducts})
 * and a K × K symmetric eigenproblem; scores are one n × K by K × m product. Eigenvector signs are
 * fixed so that each vector's entry of largest magnitude is positive.
 *
 * <p>Immutable and thread-safe.
 */
public final class Fpca {
    private final BayesSpace space;
    private final int n;
    private final int k;
    private final double[] mean;
    private final double[] values;
    private final double[] vectors; // K × K, column j = v_j
    private final double total;

    private Fpca(BayesSpace space, int n, double[] mean, DenseAlgebra.Eigen eig) {
        this.space = space;
        this.n = n;
        this.k = space.dimension();
        this.mean = mean;
        this.values = eig.values();
        this.vectors = eig.vectors();
        double t = 0;
        for (double v : values) {
            t += v;
        }
        this.total = t;
    }

    /**
     * Fits the FPCA.
     *
     * @param data at least 2 densities
     * @throws IllegalArgumentException if the set has fewer than 2 densities
     */
    public static Fpca fit(DensitySet data) {
        Objects.requireNonNull(data, "data");
        if (data.size() < 2) {
            throw new IllegalArgumentException("FPCA needs at least 2 densities, got " + data.size());
        }
        DMatrixRMaj cov = data.covariance();
        return new Fpca(data.space(), data.size(), data.mean().coordinates(),
                DenseAlgebra.symmetricEigen(cov.data, data.dimension()));
    }

    /**
     * Fits the FPCA of estimated densities, corrected for their estimation error. An estimate is
     * the unit's density plus an estimation error with (approximately) the covariance Σ̂_i that its
     * diagnostics report, independent across units, so the sample covariance S of the estimates
     * overstates the covariance of the densities by the mean error covariance (the classical
     * measurement-error relation, Fuller (1987), Measurement Error Models, Wiley, §1.2): the
     * components come from C = S − (1/n) Σ_i Σ̂_i, with eigenvalues below 0 (possible when the
     * errors are a large part of the spread) set to 0. Estimation noise spreads variance over every
     * direction, so without the correction the leading components explain less than they do for the
     * densities themselves; on a simulated network of 56 units with 1,000–4,000 events each it moved
     * the first component's share by 0.01–0.04 (examples' ClippedNetworkTest).
     *
     * <p>Units without events (returned as the reference density, a fixed value) contribute no
     * estimation error. Means, scores and reconstructions use the estimates as they are;
     * {@link #fit(DensitySet)} of {@code estimates.densities()} gives the uncorrected analysis.
     *
     * @throws IllegalArgumentException if there are fewer than 2 densities
     */
    public static Fpca fit(BatchEstimate estimates) {
        Objects.requireNonNull(estimates, "estimates");
        DensitySet data = estimates.densities();
        if (data.size() < 2) {
            throw new IllegalArgumentException("FPCA needs at least 2 densities, got " + data.size());
        }
        int k = data.dimension();
        double[] cov = data.covariance().data.clone();
        double[] err = new double[k * k];
        for (EstimationDiagnostics d : estimates.diagnostics()) {
            if (d.status() == EstimationDiagnostics.Status.EMPTY_UNIT_REFERENCE) {
                continue;
            }
            double[] c = d.covariance();
            for (int j = 0; j < k * k; j++) {
                err[j] += c[j];
            }
        }
        int n = data.size();
        for (int j = 0; j < k * k; j++) {
            cov[j] -= err[j] / n;
        }
        DenseAlgebra.Eigen eig = DenseAlgebra.symmetricEigen(cov, k);
        double[] values = eig.values().clone();
        for (int j = 0; j < values.length; j++) {
            values[j] = Math.max(0, values[j]);
        }
        return new Fpca(data.space(), n, data.mean().coordinates(), new DenseAlgebra.Eigen(values, eig.vectors(), k));
    }

    /**
     * An FPCA from its saved state (what {@link #sampleSize()}, {@link #mean()},
     * {@link #eigenvalues()} and {@link #componentCoordinates(int)} return): scores,
     * reconstructions and modes of the result equal those of the fit the state came from, bit for
     * bit. Nothing is refitted.
     *
     * @param space        the space of the analysed densities
     * @param sampleSize   n ≥ 2
     * @param mean         K mean coordinates (copied)
     * @param eigenvalues  K finite eigenvalues (copied)
     * @param eigenvectors K × K row-major, column j = coordinates of component j (copied)
     * @throws IllegalArgumentException on a wrong length or a value that is not finite
     */
    public static Fpca restore(BayesSpace space, int sampleSize, double[] mean, double[] eigenvalues,
            double[] eigenvectors) {
        Objects.requireNonNull(space, "space");
        int k = space.dimension();
        if (sampleSize < 2) {
            throw new IllegalArgumentException("FPCA sample size must be >= 2, got " + sampleSize);
        }
        Arguments.finiteArray(mean, k, "FPCA mean");
        Arguments.finiteArray(eigenvalues, k, "FPCA eigenvalues");
        Arguments.finiteArray(eigenvectors, k * k, "FPCA eigenvectors");
        return new Fpca(space, sampleSize, mean.clone(),
                new DenseAlgebra.Eigen(eigenvalues.clone(), eigenvectors.clone(), k));
    }

    /** FPCA from precomputed moments (mean and covariance of n rows); used by the regressions. */
    static Fpca fromMoments(BayesSpace space, int n, double[] mean, double[] covariance) {
        return new Fpca(space, n, mean.clone(), DenseAlgebra.symmetricEigen(covariance, space.dimension()));
    }

    /** The space of the analysed densities. */
    public BayesSpace space() {
        return space;
    }

    /** Number of densities analysed. */
    public int sampleSize() {
        return n;
    }

    /** Number of components K (the dimension of the space). */
    public int componentCount() {
        return k;
    }

    /** The ⊕-mean f̄. */
    public Density mean() {
        return space.density(mean);
    }

    /** Eigenvalues λ_1 ≥ … ≥ λ_K (variances of the scores, divisor n − 1; fresh array). */
    public double[] eigenvalues() {
        return values.clone();
    }

    /** Total variance Σ λ_j = (1/(n − 1)) Σ_i ‖f_i ⊖ f̄‖²_B. */
    public double totalVariance() {
        return total;
    }

    /** Explained-variance fractions λ_j / Σ λ (fresh array; all 0 if the data have no variance). */
    public double[] explainedVariance() {
        double[] f = new double[k];
        for (int j = 0; j < k; j++) {
            f[j] = total > 0 ? values[j] / total : 0.0;
        }
        return f;
    }

    /** Cumulative explained-variance fractions (fresh array). */
    public double[] cumulativeVariance() {
        double[] f = explainedVariance();
        for (int j = 1; j < k; j++) {
            f[j] += f[j - 1];
        }
        return f;
    }

    /**
     * Smallest m whose cumulative explained-variance fraction reaches {@code fraction}.
     *
     * @param fraction in (0, 1]
     * @throws IllegalArgumentException if fraction is outside (0, 1] or NaN
     */
    public int componentsForVariance(double fraction) {
        if (!(fraction > 0 && fraction <= 1)) {
            throw new IllegalArgumentException("variance fraction must be in (0, 1], got " + fraction);
        }
        double[] c = cumulativeVariance();
        for (int j = 0; j < k; j++) {
            if (c[j] >= fraction - 1e-12) {
                return j + 1;
            }
        }
        return k;
    }

    private void checkComponent(int j) {
        if (j < 0 || j >= k) {
            throw new IllegalArgumentException("component index " + j + " outside [0, " + k + ")");
        }
    }

    private void checkCount(int m) {
        if (m < 0 || m > k) {
            throw new IllegalArgumentException("component count " + m + " outside [0, " + k + "]");
        }
    }

    /** Coordinates v_j of component j (0-based; a unit vector; fresh array). */
    public double[] componentCoordinates(int j) {
        checkComponent(j);
        double[] v = new double[k];
        for (int i = 0; i < k; i++) {
            v[i] = vectors[i * k + j];
        }
        return v;
    }

    /** Component j as an element of B2 (unit B2 norm). */
    public Density component(int j) {
        return space.density(componentCoordinates(j));
    }

    /** The clr function ξ_j(t) = Σ_k v_kj e_k(t) of component j at the given points. */
    public double[] componentClr(int j, double... xs) {
        return DenseAlgebra.clrAt(space, componentCoordinates(j), Arguments.grid(space, xs, "points"));
    }

    /** K × m matrix of the first m eigenvectors (row-major; fresh). */
    double[] loadings(int m) {
        return DenseAlgebra.columns(vectors, k, k, 0, m);
    }

    double[] meanInternal() {
        return mean;
    }

    double eigenvalue(int j) {
        return values[j];
    }

    /**
     * Scores z_ij = (c_i − c̄)ᵀ v_j of the given densities on the first m components: one n × K by
     * K × m product, then subtraction of c̄ᵀV_m.
     *
     * @return the n × m scores, with the set's ids
     * @throws IllegalArgumentException if the set is of another space or m is outside [0, K]
     */
    public Scores scores(DensitySet data, int m) {
        double[] z = scoreValues(data, m);
        return new Scores(data.size(), m, z, data.hasIds() ? data.ids() : List.of());
    }

    private double[] scoreValues(DensitySet data, int m) {
        Objects.requireNonNull(data, "data");
        space.requireSame(data.space(), "data");
        checkCount(m);
        int rows = data.size();
        double[] directions = new double[m * k]; // component j's coordinates v_j in row j
        double[] shift = new double[m];          // c̄ᵀ v_j
        for (int j = 0; j < m; j++) {
            double s = 0;
            for (int i = 0; i < k; i++) {
                directions[j * k + i] = vectors[i * k + j];
                s += mean[i] * vectors[i * k + j];
            }
            shift[j] = s;
        }
        // the data are not copied and the shift is subtracted in place: at 10⁶ × 32 each copy of the
        // n × K or n × m values is a fresh 256 MB array
        double[] out = data.innerProducts(DensitySet.ofRowMajor(space, directions, m, null)).data;
        Kernels.subtractRow(out, rows, m, shift, out, true);
        return out;
    }

    /**
     * Reconstruction f̄ ⊕ ⊕_{j ≤ m} z_ij ⊙ ξ_j of every density from its first m scores (ids kept).
     */
    public DensitySet reconstruct(DensitySet data, int m) {
        double[] z = scoreValues(data, m);
        double[] vt = new double[m * k];
        for (int j = 0; j < m; j++) {
            for (int i = 0; i < k; i++) {
                vt[j * k + i] = vectors[i * k + j];
            }
        }
        int rows = data.size();
        double[] out = new double[rows * k];
        Kernels.multiply(z, rows, m, vt, k, out, true);
        double[] neg = new double[k];
        for (int i = 0; i < k; i++) {
            neg[i] = -mean[i];
        }
        double[] res = new double[rows * k];
        Kernels.subtractRow(out, rows, k, neg, res, true);
        return DensitySet.ofRowMajor(space, res, rows, data.hasIds() ? data.ids().toArray(new String[0]) : null);
    }

    /**
     * Mode of variation f̄ ⊕ (t √λ_j) ⊙ ξ_j.
     *
     * @param j component (0-based)
     * @param t multiple of the standard deviation, finite
     */
    public Density modeOfVariation(int j, double t) {
        checkComponent(j);
        if (!Double.isFinite(t)) {
            throw new IllegalArgumentException("multiple t must be finite, got " + t);
        }
        double s = t * Math.sqrt(values[j]);
        double[] c = new double[k];
        for (int i = 0; i < k; i++) {
            c[i] = mean[i] + s * vectors[i * k + j];
        }
        return space.density(c);
    }

    /**
     * Chooses the number of components by k-fold cross-validated reconstruction error: for every
     * fold, an FPCA of the other folds reconstructs the held-out densities with m = 0..maxM
     * components, and the held-out squared B2 errors ‖f_i ⊖ f̂_i^{(m)}‖² are averaged. Since the
     * error falls with m, the rule picks the smallest m whose cross-validated error is at most
     * (1 − fraction) times the error with no component (the cross-validated analogue of the
     * variance-fraction rule; fraction 0.9 keeps the components that predict 90 % of held-out
     * variability).
     *
     * <p>Cost: one pass for per-fold cross products, then per fold a K × K eigenproblem.
     *
     * @param data      at least {@code folds} densities, at least 2 per training set
     * @param selection the largest count, the fraction, the folds and their seed, a progress
     *                  listener ({@link ComponentSelection#withDefaults()})
     * @throws IllegalArgumentException if the largest count exceeds K, a training set has fewer
     *                                  than 2 densities, or the folds exceed the densities
     */
    public static ComponentChoice chooseComponents(DensitySet data, ComponentSelection selection) {
        Objects.requireNonNull(data, "data");
        Objects.requireNonNull(selection, "selection");
        return crossValidate(data, selection.maxFor(data.dimension()), selection.fraction(), selection.folds(),
                selection.seed(), selection.progress());
    }

    private static ComponentChoice crossValidate(DensitySet data, int maxM, double fraction, int folds, long seed,
            ProgressListener listener) {
        Objects.requireNonNull(data, "data");
        Objects.requireNonNull(listener, "listener");
        int kk = data.dimension();
        if (maxM < 1 || maxM > kk) {
            throw new IllegalArgumentException("maxM must be in [1, K = " + kk + "], got " + maxM);
        }
        if (!(fraction > 0 && fraction < 1)) {
            throw new IllegalArgumentException("fraction must be in (0, 1), got " + fraction);
        }
        Arguments.requireModerate(data, "density");
        int n = data.size();
        int[] fold = Seeds.folds(n, folds, seed);
        double[] x = data.coordinatesRowMajor();
        Moments mom = Moments.of(x, n, kk, fold, folds);
        double[] err = new double[maxM + 1];
        for (int f = 0; f < folds; f++) {
            int ntr = n - mom.count(f);
            if (ntr < 2) {
                throw new IllegalArgumentException("fold " + f + " leaves " + ntr + " training densities; need 2");
            }
            double[] mu = mom.trainingMean(f);
            Fpca p = fromMoments(data.space(), ntr, mu, mom.trainingCovariance(f, mu));
            // held-out moments about the training mean: S = Σ (x − μ)(x − μ)ᵀ
            double[] s = mom.foldScatterAbout(f, mu);
            double tr = 0;
            for (int i = 0; i < kk; i++) {
                tr += s[i * kk + i];
            }
            double explained = 0;
            err[0] += tr;
            for (int m = 1; m <= maxM; m++) {
                double q = 0;
                for (int i = 0; i < kk; i++) {
                    double vi = p.vectors[i * kk + m - 1];
                    for (int l = 0; l < kk; l++) {
                        q += vi * s[i * kk + l] * p.vectors[l * kk + m - 1];
                    }
                }
                explained += q;
                err[m] += tr - explained;
            }
            listener.progress("cross-validation", f + 1, folds);
        }
        for (int m = 0; m <= maxM; m++) {
            err[m] /= n;
        }
        int chosen = maxM;
        for (int m = 1; m <= maxM; m++) {
            if (err[m] <= (1 - fraction) * err[0]) {
                chosen = m;
                break;
            }
        }
        return new ComponentChoice(chosen, err, folds, seed);
    }

    /**
     * Result of {@link #chooseComponents}.
     *
     * @param components the chosen m
     * @param meanError  mean held-out squared B2 reconstruction error for m = 0..maxM (index m)
     * @param folds      number of folds
     * @param seed       seed of the fold assignment
     *
     * <p>A value: the error array is copied in and out, and {@code equals} compares its contents.
     */
    public record ComponentChoice(int components, double[] meanError, int folds, long seed) {
        /** Canonical constructor: copies the error array. */
        public ComponentChoice {
            meanError = meanError.clone();
        }

        /** Mean held-out squared errors for m = 0..maxM (fresh). */
        @Override
        public double[] meanError() {
            return meanError.clone();
        }

        /** Equal fields and error contents. */
        @Override
        public boolean equals(Object o) {
            return o instanceof ComponentChoice c && components == c.components && folds == c.folds && seed == c.seed
                    && java.util.Arrays.equals(meanError, c.meanError);
        }

        @Override
        public int hashCode() {
            return java.util.Objects.hash(components, folds, seed, java.util.Arrays.hashCode(meanError));
        }

        @Override
        public String toString() {
            return "ComponentChoice[components=" + components + ", meanError=" + java.util.Arrays.toString(meanError)
                    + ", folds=" + folds + ", seed=" + seed + "]";
        }
    }

    @Override
    public String toString() {
        return "Fpca[n=" + n + ", K=" + k + ", total variance=" + total + "]";
    }
}
