package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.Seeds;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * Shared estimation engine of the functional linear models with density predictors: response
 * (n × r) on [design | X_1 | … | X_J], by FPCA truncation of the predictors (and optionally of
 * the response) or by ridge, with the tuning chosen by k-fold cross-validation. All folds are
 * served by one blocked pass that accumulates per-fold cross products of the combined matrix;
 * every candidate of every fold is then a small solve from those moments, and its held-out error
 * Σ_{i∈f} ‖y_i − z_iᵀβ‖² = tr M_yy − 2 tr βᵀM_zy + tr βᵀM_zz β comes from the fold's moments.
 */
final class LinearFunctionalEngine {
    private LinearFunctionalEngine() {
    }

    /** Output of {@link #fit}. */
    record Result(double[] beta, int pz, int r, int[] offsets, FunctionalRegression.Candidate chosen,
            List<FunctionalRegression.Candidate> candidates, double[] fitted, double[] residuals, double rSquared,
            List<Fpca> predictorFpca, List<BayesSpace> predictorSpaces) {
    }

    static Result fit(FunctionalRegression cfg, Design design, List<DensitySet> predictors, double[] y, int r) {
        int n = design.rows();
        int q = design.columns();
        int np = predictors.size();
        int[] off = new int[np + 1];
        off[0] = q;
        for (int j = 0; j < np; j++) {
            off[j + 1] = off[j] + predictors.get(j).dimension();
        }
        int pz = off[np];
        int w = pz + r;
        double[] z = new double[n * w];
        double[] d = design.internal();
        List<double[]> xs = new ArrayList<>();
        for (DensitySet s : predictors) {
            xs.add(s.coordinatesRowMajor());
        }
        int blocks = (n + Kernels.BLOCK - 1) / Kernels.BLOCK;
        Kernels.forEachBlock(blocks, Kernels.parallelWorth((long) n * w), blk -> {
            int r0 = blk * Kernels.BLOCK, r1 = Math.min(n, r0 + Kernels.BLOCK);
            for (int i = r0; i < r1; i++) {
                System.arraycopy(d, i * q, z, i * w, q);
                for (int j = 0; j < np; j++) {
                    int kj = off[j + 1] - off[j];
                    System.arraycopy(xs.get(j), i * kj, z, i * w + off[j], kj);
                }
                System.arraycopy(y, i * r, z, i * w + pz, r);
            }
        });
        // every column but the intercept (column 0; the design always has one) is shifted by its
        // mean before the cross products are accumulated, so a covariate like a calendar year does
        // not square its offset into the normal equations
        boolean[] centre = new boolean[w];
        for (int j = 1; j < w; j++) {
            centre[j] = true;
        }
        int folds = cfg.folds();
        List<FunctionalRegression.Candidate> cands = cfg.candidates(predictors, r);
        FunctionalRegression.Candidate chosen;
        List<FunctionalRegression.Candidate> scored = new ArrayList<>();
        boolean cv = cands.size() > 1;
        Moments mom = cv ? Moments.of(z, n, w, Seeds.folds(n, folds, cfg.seed()), folds, centre)
                : Moments.of(z, n, w, null, 1, centre);
        Fold all = new Fold(cfg, mom, -1, off, pz, r, predictors);
        if (cfg.method() == FunctionalRegression.Method.TRUNCATION) {
            FunctionalRegression.Candidate largest = cands.get(0);
            for (FunctionalRegression.Candidate c : cands) {
                if (c.predictorComponents() > largest.predictorComponents()) {
                    largest = c;
                }
            }
            all.requireIndependentScores(largest.predictorComponents(), design.columnNames());
        }
        if (cv) {
            double[] err = new double[cands.size()];
            for (int f = 0; f < folds; f++) {
                Fold fd = new Fold(cfg, mom, f, off, pz, r, predictors);
                double[] mf = mom.cross(f);
                for (int c = 0; c < cands.size(); c++) {
                    double[] beta = fd.solve(cands.get(c));
                    err[c] += heldOutError(mf, w, pz, r, beta);
                }
                cfg.progressListener().progress("cross-validation", f + 1, folds);
            }
            int best = 0;
            for (int c = 0; c < cands.size(); c++) {
                FunctionalRegression.Candidate cd = cands.get(c);
                scored.add(new FunctionalRegression.Candidate(cd.predictorComponents(), cd.responseComponents(),
                        cd.lambda(), java.util.OptionalDouble.of(err[c] / n)));
                if (err[c] < err[best]) {
                    best = c;
                }
            }
            chosen = scored.get(best);
        } else {
            chosen = cands.get(0);
            scored.add(chosen);
        }
        double[] beta = all.solve(chosen);
        // back to original units: ŷ = shift_y + β_0 + Σ_{j ≥ 1} (z_j − shift_j) β_j
        int ic = 0;
        for (int c = 0; c < r; c++) {
            double adj = mom.shift[pz + c];
            for (int j = 1; j < pz; j++) {
                adj -= mom.shift[j] * beta[j * r + c];
            }
            beta[ic * r + c] += adj;
        }
        double[] fitted = new double[n * r];
        Kernels.multiply(z, n, w, extend(beta, pz, r, w), r, fitted, true);
        double[] res = new double[n * r];
        double rss = 0;
        for (int i = 0; i < n; i++) {
            for (int c = 0; c < r; c++) {
                double e = y[i * r + c] - fitted[i * r + c];
                res[i * r + c] = e;
                rss += e * e;
            }
        }
        double[] mt = mom.cross(-1);
        double[] st = mom.sum(-1);
        double tss = 0;
        for (int c = 0; c < r; c++) {
            int jj = pz + c;
            tss += mt[jj * w + jj] - st[jj] * st[jj] / n;
        }
        double r2 = tss > 0 ? 1 - rss / tss : 0.0;
        List<BayesSpace> spaces = new ArrayList<>();
        for (DensitySet s : predictors) {
            spaces.add(s.space());
        }
        return new Result(beta, pz, r, off, chosen, List.copyOf(scored), fitted, res, r2, all.fpcaList(),
                List.copyOf(spaces));
    }

    private static double[] extend(double[] beta, int pz, int r, int w) {
        double[] e = new double[w * r];
        System.arraycopy(beta, 0, e, 0, pz * r);
        return e;
    }

    private static double heldOutError(double[] m, int w, int pz, int r, double[] beta) {
        double s = 0;
        for (int c = 0; c < r; c++) {
            int yc = pz + c;
            s += m[yc * w + yc];
            double cross = 0;
            for (int j = 0; j < pz; j++) {
                cross += beta[j * r + c] * m[j * w + yc];
            }
            s -= 2 * cross;
            double quad = 0;
            for (int j = 0; j < pz; j++) {
                double bj = beta[j * r + c];
                if (bj == 0) {
                    continue;
                }
                double t = 0;
                for (int l = 0; l < pz; l++) {
                    t += m[j * w + l] * beta[l * r + c];
                }
                quad += bj * t;
            }
            s += quad;
        }
        return s;
    }

    /** Training quantities of one fold (f = −1: all data), in shifted units. */
    private static final class Fold {
        final FunctionalRegression cfg;
        final int pz;
        final int r;
        final int w;
        final int q;
        final int[] off;
        final double[] mzz; // pz × pz training cross products
        final double[] mzy; // pz × r
        final int ntr;
        final double[] tfull; // pz × pz block-diagonal rotation (truncation only)
        final double[] azz;   // Tᵀ Mzz T
        final double[] azy;   // Tᵀ Mzy
        final double[] vy;    // r × r response eigenvectors (when response truncation is used)
        final double[] ybar;  // training mean of shifted y
        final List<Fpca> fpcas = new ArrayList<>();

        Fold(FunctionalRegression cfg, Moments mom, int f, int[] off, int pz, int r, List<DensitySet> preds) {
            this.cfg = cfg;
            this.pz = pz;
            this.r = r;
            this.w = pz + r;
            this.off = off;
            this.q = off[0];
            double[] m = mom.trainingCross(f);
            this.ntr = mom.trainingCount(f);
            mzz = new double[pz * pz];
            mzy = new double[pz * r];
            for (int j = 0; j < pz; j++) {
                System.arraycopy(m, j * w, mzz, j * pz, pz);
                System.arraycopy(m, j * w + pz, mzy, j * r, r);
            }
            double[] mean = mom.trainingMean(f);
            double[] cov = mom.trainingCovariance(f, mean);
            ybar = new double[r];
            for (int c = 0; c < r; c++) {
                ybar[c] = mean[pz + c] - mom.shift[pz + c];
            }
            if (cfg.method() == FunctionalRegression.Method.TRUNCATION) {
                tfull = new double[pz * pz];
                for (int j = 0; j < q; j++) {
                    tfull[j * pz + j] = 1.0;
                }
                for (int p = 0; p < off.length - 1; p++) {
                    int a = off[p];
                    int kp = off[p + 1] - a;
                    double[] mu = new double[kp];
                    double[] cv = new double[kp * kp];
                    for (int i = 0; i < kp; i++) {
                        mu[i] = mean[a + i];
                        for (int l = 0; l < kp; l++) {
                            cv[i * kp + l] = cov[(a + i) * w + a + l];
                        }
                    }
                    Fpca fp = Fpca.fromMoments(preds.get(p).space(), ntr, mu, cv);
                    fpcas.add(fp);
                    double[] v = fp.loadings(kp);
                    for (int i = 0; i < kp; i++) {
                        System.arraycopy(v, i * kp, tfull, (a + i) * pz + a, kp);
                    }
                }
                azz = DenseAlgebra.mult(DenseAlgebra.multTransA(tfull, pz, pz, mzz, pz), pz, pz, tfull, pz);
                azy = DenseAlgebra.multTransA(tfull, pz, pz, mzy, r);
                if (cfg.usesResponseTruncation()) {
                    double[] cy = new double[r * r];
                    for (int i = 0; i < r; i++) {
                        for (int l = 0; l < r; l++) {
                            cy[i * r + l] = cov[(pz + i) * w + pz + l];
                        }
                    }
                    vy = DenseAlgebra.symmetricEigen(cy, r).vectors();
                } else {
                    vy = null;
                }
            } else {
                tfull = null;
                azz = null;
                azy = null;
                vy = null;
            }
        }

        /**
         * Requires the columns of the largest truncated model (design columns, then the first m
         * scores of each predictor) to be linearly independent on the full data: modified
         * Cholesky of their cross-product matrix in column order; a column whose pivot is at
         * most 1e-12 times its own sum of squares (or whose sum of squares is 0) is named.
         *
         * @throws IllegalArgumentException naming the dependent columns
         */
        void requireIndependentScores(int m, List<String> designColumns) {
            List<Integer> keep = keep(m);
            List<String> names = new ArrayList<>();
            for (int i : keep) {
                if (i < q) {
                    names.add(designColumns.get(i));
                } else {
                    int pr = 0;
                    while (off[pr + 1] <= i) {
                        pr++;
                    }
                    names.add("predictor " + pr + " component " + (i - off[pr] + 1));
                }
            }
            int s = keep.size();
            double[] l = new double[s * s];
            List<String> bad = new ArrayList<>();
            boolean[] ok = new boolean[s];
            double scale = 0;
            for (int i = 0; i < s; i++) {
                scale = Math.max(scale, azz[keep.get(i) * pz + keep.get(i)]);
            }
            for (int i = 0; i < s; i++) {
                int ki = keep.get(i);
                double own = azz[ki * pz + ki];
                // row i of L over the accepted columns: L_ij = (A_ij − Σ_{h<j} L_ih L_jh) / L_jj
                double d = own;
                for (int j = 0; j < i; j++) {
                    if (!ok[j]) {
                        continue;
                    }
                    double v = azz[ki * pz + keep.get(j)];
                    for (int h = 0; h < j; h++) {
                        if (ok[h]) {
                            v -= l[i * s + h] * l[j * s + h];
                        }
                    }
                    v /= l[j * s + j];
                    l[i * s + j] = v;
                    d -= v * v;
                }
                if (!(own > 1e-14 * scale) || !(d > 1e-12 * own)) {
                    bad.add(names.get(i));
                } else {
                    ok[i] = true;
                    l[i * s + i] = Math.sqrt(d);
                }
            }
            if (!bad.isEmpty()) {
                throw new IllegalArgumentException("truncated functional regression with up to " + m
                        + " components per predictor: column(s) " + bad + " have no variance or are linear"
                        + " combinations of earlier columns of " + names + "; remove duplicate or collinear"
                        + " predictors and covariates, or lower the component range (withComponents)");
            }
        }

        /** Indices kept by a truncated model with m components: design columns, then m per predictor. */
        private List<Integer> keep(int m) {
            List<Integer> keep = new ArrayList<>();
            for (int j = 0; j < q; j++) {
                keep.add(j);
            }
            for (int p = 0; p < off.length - 1; p++) {
                int kp = off[p + 1] - off[p];
                for (int l = 0; l < Math.min(m, kp); l++) {
                    keep.add(off[p] + l);
                }
            }
            return keep;
        }

        List<Fpca> fpcaList() {
            return List.copyOf(fpcas);
        }

        /** β (pz × r, shifted units) for one candidate. */
        double[] solve(FunctionalRegression.Candidate c) {
            if (cfg.method() == FunctionalRegression.Method.RIDGE) {
                double[] a = mzz.clone();
                for (int j = q; j < pz; j++) {
                    a[j * pz + j] += ntr * c.lambda();
                }
                return DenseAlgebra.solveSpd(a, pz, mzy, r, "ridge functional regression");
            }
            // indices kept: design columns, first m components of each predictor
            List<Integer> keep = keep(c.predictorComponents());
            int s = keep.size();
            double[] a = new double[s * s];
            double[] b = new double[s * r];
            for (int i = 0; i < s; i++) {
                int ki = keep.get(i);
                for (int l = 0; l < s; l++) {
                    a[i * s + l] = azz[ki * pz + keep.get(l)];
                }
                System.arraycopy(azy, ki * r, b, i * r, r);
            }
            double[] g = DenseAlgebra.solveSpd(a, s, b, r, "truncated functional regression");
            // β = T_keep g
            double[] beta = new double[pz * r];
            for (int j = 0; j < pz; j++) {
                for (int i = 0; i < s; i++) {
                    double t = tfull[j * pz + keep.get(i)];
                    if (t == 0) {
                        continue;
                    }
                    for (int cc = 0; cc < r; cc++) {
                        beta[j * r + cc] += t * g[i * r + cc];
                    }
                }
            }
            int my = c.responseComponents();
            if (vy != null && my < r) {
                // β P + e_ic ȳᵀ (I − P), P = V_my V_myᵀ (intercept column 0)
                double[] vmy = DenseAlgebra.columns(vy, r, r, 0, my);
                double[] pm = DenseAlgebra.multTransB(vmy, r, my, vmy, r);
                double[] out = DenseAlgebra.mult(beta, pz, r, pm, r);
                for (int l = 0; l < r; l++) {
                    double sum = ybar[l];
                    for (int i = 0; i < r; i++) {
                        sum -= ybar[i] * pm[i * r + l];
                    }
                    out[l] += sum;
                }
                return out;
            }
            return beta;
        }
    }

    /** ŷ (n × r) for new rows: dᵀβ_d + Σ_j x_jᵀ G_j, checking rows, spaces and design columns. */
    static double[] predict(double[] beta, int pz, int r, int[] off, Design fitDesign, List<BayesSpace> spaces,
            List<DensitySet> predictors, Design covariates) {
        Objects.requireNonNull(predictors, "predictors");
        if (predictors.size() != spaces.size()) {
            throw new IllegalArgumentException("model has " + spaces.size() + " density predictors, got "
                    + predictors.size());
        }
        int n = predictors.get(0).size();
        for (int j = 0; j < spaces.size(); j++) {
            DensitySet s = Objects.requireNonNull(predictors.get(j), "predictor " + j);
            spaces.get(j).requireSame(s.space(), "predictor " + j);
            if (s.size() != n) {
                throw new IllegalArgumentException("predictor " + j + " has " + s.size() + " rows, predictor 0 has " + n);
            }
        }
        Design d = covariates == null ? Design.interceptOnly(n) : covariates;
        if (!d.columnNames().equals(fitDesign.columnNames())) {
            throw new IllegalArgumentException("covariates have columns " + d.columnNames()
                    + " but the model was fitted with " + fitDesign.columnNames());
        }
        if (d.rows() != n) {
            throw new IllegalArgumentException("covariates have " + d.rows() + " rows, predictors " + n);
        }
        int q = d.columns();
        double[] out = DenseAlgebra.mult(d.internal(), n, q, Arrays.copyOfRange(beta, 0, q * r), r);
        for (int j = 0; j < spaces.size(); j++) {
            int kj = off[j + 1] - off[j];
            double[] part = new double[n * r];
            Kernels.multiply(predictors.get(j).coordinatesRowMajor(), n, kj,
                    Arrays.copyOfRange(beta, off[j] * r, off[j + 1] * r), r, part, true);
            for (int i = 0; i < out.length; i++) {
                out[i] += part[i];
            }
        }
        return out;
    }
}
