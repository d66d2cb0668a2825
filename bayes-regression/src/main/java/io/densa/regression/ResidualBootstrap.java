package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.ProgressListener;
import io.densa.core.internal.Sorted;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.SplittableRandom;
import org.ejml.data.DMatrixRMaj;

/**
 * The residual bootstrap behind {@link FunctionOnScalarFit#bootstrapBands}: whitened residual
 * functions resampled with replacement, the (penalised) solve repeated on each replicate, basic
 * percentile and simultaneous bands from the replicates. Stateless.
 */
final class ResidualBootstrap {
    private ResidualBootstrap() {
    }

    static List<FunctionOnScalarFit.CoefficientBand> bands(FunctionOnScalarFit fit, double[] grid, int replicates,
            double level, long seed, ProgressListener listener) {
        int n = fit.n;
        int p = fit.p;
        int k = fit.k;
        BayesSpace space = fit.space();
        Design design = fit.design();
        double[] coef = fit.coef;
        double[] resid = fit.resid;
        double[] u = fit.u;
        double[][] inverses = fit.inverses;
        double[] xScaled = fit.xScaled;
        double[] fitted = fit.fitted;
        double[] coefScaled = fit.coefScaled;
        double[] scale = fit.scale;
        Objects.requireNonNull(listener, "listener");
        double[] g = Arguments.grid(space, grid, "grid");
        if (replicates < 20) {
            throw new IllegalArgumentException("need at least 20 bootstrap replicates, got " + replicates);
        }
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("level must be in (0, 1), got " + level);
        }
        int m = g.length;
        double[] et = basisTransposed(space, k, g); // K × m
        double[] est = DenseAlgebra.mult(coef, p, k, et, m); // p × m
        double[][] deltas = new double[replicates][]; // each p × m
        double[] std = new double[n * k];
        for (int i = 0; i < n; i++) {
            double s = Math.sqrt(fit.w(i));
            for (int j = 0; j < k; j++) {
                std[i * k + j] = resid[i * k + j] * s;
            }
        }
        SplittableRandom rnd = new SplittableRandom(seed);
        double[] x = xScaled; // solves run on the scaled design; band widths are unscaled per column
        // β* − β̂ = [S(XᵀWŶ) − β̂] + S(XᵀW r*) with S the (penalised) solve: the first term is zero
        // without penalty and the shrinkage of the refit on the fitted values with one
        double[] shift = new double[p * m];
        if (u != null) {
            double[] xw = x.clone();
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < p; j++) {
                    xw[i * p + j] *= fit.w(i);
                }
            }
            double[] refit = solve(DenseAlgebra.multTransA(xw, n, p, fitted, k), p, k, u, inverses);
            for (int i = 0; i < refit.length; i++) {
                refit[i] -= coefScaled[i];
            }
            shift = DenseAlgebra.mult(refit, p, k, et, m);
        }
        double[] rhs = new double[p * k];
        for (int b = 0; b < replicates; b++) {
            Arrays.fill(rhs, 0.0);
            for (int i = 0; i < n; i++) {
                int src = rnd.nextInt(n);
                // XᵀW r*: row i contributes w_i x_i (e_src / √w_i) = √w_i x_i e_src
                double sw = Math.sqrt(fit.w(i));
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
            double[] dg = DenseAlgebra.mult(db, p, k, et, m); // in the scaled design's units: row j is δβ_j / f_j
            for (int q = 0; q < dg.length; q++) {
                dg[q] += shift[q];
            }
            deltas[b] = dg;
            listener.progress("bootstrap", b + 1, replicates);
        }
        List<FunctionOnScalarFit.CoefficientBand> out = new ArrayList<>();
        double alpha = 1 - level;
        double[] col = new double[replicates];
        for (int j = 0; j < p; j++) {
            // the deltas of column j are δβ_j / f_j (f_j a power of two): percentiles and standard
            // deviations are taken on them and multiplied by f_j, the critical value is scale-free
            double f = scale[j];
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
                pl[q] = e[q] - f * Sorted.quantile(col, 1 - alpha / 2);
                pu[q] = e[q] - f * Sorted.quantile(col, alpha / 2);
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
            double c = Sorted.quantile(maxDev, level);
            double[] sl = new double[m];
            double[] su = new double[m];
            for (int q = 0; q < m; q++) {
                sd[q] *= f;
                sl[q] = e[q] - c * sd[q];
                su[q] = e[q] + c * sd[q];
            }
            out.add(new FunctionOnScalarFit.CoefficientBand(design.columnNames().get(j), g.clone(), e, pl, pu, sl, su, sd, c));
        }
        return List.copyOf(out);
    }

    private static double[] basisTransposed(BayesSpace space, int k, double[] g) {
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

    /** B = the solution of the (penalised) normal equations with right-hand side XᵀWC (p × K). */
    private static double[] solve(double[] rhs, int p, int k, double[] u, double[][] inv) {
        if (u == null) {
            return DenseAlgebra.mult(inv[0], p, p, rhs, k);
        }
        double[] t = DenseAlgebra.mult(rhs, p, k, u, k); // XᵀWC U
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
        return DenseAlgebra.multTransB(bt, p, k, u, k);
    }
}
