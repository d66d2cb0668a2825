package io.densa.regression;

import io.densa.core.ProgressListener;
import io.densa.core.SolveDiagnostics;
import io.densa.core.internal.Seeds;
import java.util.Objects;
import java.util.SplittableRandom;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.QRDecomposition;

/**
 * The Freedman–Lane permutation F-test behind {@link FunctionOnScalarFit#test}: reduced-model
 * residuals permuted as whole functions, F recomputed through orthonormal bases of the full and
 * reduced weighted designs. Holds only the sizes n, p, K.
 */
record FreedmanLaneTest(int n, int p, int k) {

    static FunctionOnScalarFit.PermutationTest test(FunctionOnScalarFit fit, String term, int permutations, long seed,
            ProgressListener listener) {
        return new FreedmanLaneTest(fit.n, fit.p, fit.k).run(fit, term, permutations, seed, listener);
    }

    private FunctionOnScalarFit.PermutationTest run(FunctionOnScalarFit fit, String term, int permutations, long seed,
            ProgressListener listener) {
        Design design = fit.design();
        io.densa.core.DensitySet response = fit.response;
        Objects.requireNonNull(listener, "listener");
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
            sw[i] = Math.sqrt(fit.w(i));
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
        double tot = 0;
        for (double v : e0) {
            tot += v * v;
        }
        double rss1 = tot - projectedSq(q1, p, e0);
        if (!(rss1 > 1e-20 * tot)) {
            // F = 0/0 or x/0: NaN or ∞ would give a meaningless p-value of 1/(permutations + 1)
            throw new IllegalArgumentException("permutation test of '" + term + "': the full model fits the"
                    + " response exactly (residual sum of squares " + rss1 + " of " + tot + " for the reduced"
                    + " model), so the F statistic is undefined; the test needs residual variation");
        }
        double fObs = fStat(q0, p0, q1, e0, df1, df2);
        SplittableRandom rnd = new SplittableRandom(seed);
        double[] perm = new double[n * k];
        int exceed = 0;
        for (int b = 0; b < permutations; b++) {
            int[] pi = Seeds.permutation(n, rnd);
            for (int i = 0; i < n; i++) {
                System.arraycopy(e0, pi[i] * k, perm, i * k, k);
            }
            double f = fStat(q0, p0, q1, perm, df1, df2);
            if (f >= fObs * (1 - 1e-12)) {
                exceed++;
            }
            listener.progress("permutation test", b + 1, permutations);
        }
        return new FunctionOnScalarFit.PermutationTest(term, fObs, (1.0 + exceed) / (permutations + 1.0), df1, df2, permutations, seed);
    }

    double fStat(double[] q0, int p0, double[] q1, double[] e, int df1, int df2) {
        // (I − H0)(Ĉ0 + e*) = (I − H0) e*, (I − H1)(Ĉ0 + e*) = (I − H1) e*
        double tot = 0;
        for (double v : e) {
            tot += v * v;
        }
        double rss0 = tot - projectedSq(q0, p0, e);
        double rss1 = tot - projectedSq(q1, p, e);
        return ((rss0 - rss1) / df1) / (rss1 / df2);
    }

    double projectedSq(double[] q, int cols, double[] e) {
        if (cols == 0) {
            return 0;
        }
        double[] qe = DenseAlgebra.multTransA(q, n, cols, e, k);
        double s = 0;
        for (double v : qe) {
            s += v * v;
        }
        return s;
    }

    double[] residualise(double[] q, int cols, double[] c) {
        if (cols == 0) {
            return c.clone();
        }
        double[] qc = DenseAlgebra.multTransA(q, n, cols, c, k);
        double[] fit = DenseAlgebra.mult(q, n, cols, qc, k);
        double[] r = new double[c.length];
        for (int i = 0; i < r.length; i++) {
            r[i] = c[i] - fit[i];
        }
        return r;
    }

    /**
     * Relative tolerance on |R_jj| / ‖column j‖ below which a column of the weighted design counts
     * as zero or a combination of earlier columns (the squared-norm tolerance 10⁻²⁰ of
     * {@code Design.requireFullRank}).
     */
    static final double RANK_TOLERANCE = 1e-10;

    /**
     * Orthonormal basis Q (n × p, row-major) of the columns of √W X by Householder QR. Without a
     * rank check a rank-deficient design would give p columns of which some are arbitrary, and so
     * wrong degrees of freedom: |R_jj| is the norm of column j after projecting out the columns
     * before it, so each |R_jj| must exceed {@link #RANK_TOLERANCE} times the norm of column j.
     *
     * @throws IllegalArgumentException naming the first column that is zero or a linear
     *                                  combination of earlier columns
     */
    static double[] orthonormalColumns(Design d, double[] sw) {
        int rows = d.rows();
        int cols = d.columns();
        double[] xw = d.internal().clone();
        double[] norms = new double[cols];
        for (int i = 0; i < rows; i++) {
            for (int j = 0; j < cols; j++) {
                xw[i * cols + j] *= sw[i];
            }
        }
        // columns scaled by powers of two (Q does not change): covariates near 1e300 or 1e-170
        // would otherwise overflow or underflow their squared norms and look rank deficient
        for (int j = 0; j < cols; j++) {
            Design.scaleToUnit(xw, j, cols, rows);
        }
        for (int i = 0; i < rows; i++) {
            for (int j = 0; j < cols; j++) {
                norms[j] += xw[i * cols + j] * xw[i * cols + j];
            }
        }
        if (rows < cols) {
            throw new IllegalArgumentException("the weighted design has " + rows + " rows for " + cols
                    + " columns " + d.columnNames() + "; need at least as many rows as columns");
        }
        for (int j = 0; j < cols; j++) {
            if (!(norms[j] > 0)) {
                throw rankDeficient(d, j, 0.0, Math.sqrt(norms[j]));
            }
        }
        QRDecomposition<DMatrixRMaj> qr = DecompositionFactory_DDRM.qr(rows, cols);
        if (!qr.decompose(DMatrixRMaj.wrap(rows, cols, xw.clone()))) {
            throw new io.densa.core.DensaException("QR decomposition of the " + rows + " x " + cols + " design failed",
                    new SolveDiagnostics("QR of the weighted design", cols, Double.NaN));
        }
        DMatrixRMaj r = qr.getR(null, true);
        for (int j = 0; j < cols; j++) {
            double norm = Math.sqrt(norms[j]);
            if (!(Math.abs(r.get(j, j)) > RANK_TOLERANCE * norm)) {
                throw rankDeficient(d, j, Math.abs(r.get(j, j)), norm);
            }
        }
        return qr.getQ(null, true).data;
    }

    private static IllegalArgumentException rankDeficient(Design d, int j, double rjj, double norm) {
        return new IllegalArgumentException("the weighted design is rank deficient: column '"
                + d.columnNames().get(j) + "' (index " + j + ", |R_jj| = " + rjj + ", weighted column norm "
                + norm + ") is zero or a linear combination of earlier columns of " + d.columnNames()
                + "; drop or recode it");
    }
}
