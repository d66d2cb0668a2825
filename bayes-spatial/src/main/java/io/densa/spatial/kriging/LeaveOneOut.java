package io.densa.spatial.kriging;

import io.densa.core.ProgressListener;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.ProgressCounter;
import java.util.Objects;

/** Leave-one-out cross-validation of a {@link Kriging} ({@link Kriging#crossValidate}; package-private). */
final class LeaveOneOut {
    private LeaveOneOut() {
    }

    /** The fast formulas for the global neighbourhood, refitting per location otherwise. */
    static CrossValidation crossValidate(Kriging kr, ProgressListener listener) {
        Objects.requireNonNull(listener, "listener");
        int n = kr.size();
        ProgressCounter progress = new ProgressCounter(listener, "cross-validation", n);
        if (kr.options().neighbourhood().isGlobal()) {
            CrossValidation cv = fast(kr);
            progress.advance(n);
            return cv;
        }
        return bruteForce(kr, progress);
    }

    /**
     * Fast leave-one-out for the global neighbourhood from one inverse of the kriging matrix
     * (Dubrule (1983), Cross validation of kriging in a unique neighborhood, Math. Geol. 15(6) —
     * from memory): with A the (bordered) kriging matrix, B = A⁻¹ and α the dual weights
     * B [Y; 0], the leave-one-out error at i is e_i = α_i / B_ii and the variance of predicting
     * the datum is 1 / B_ii (= σ²_{−i} + v_i). Here B_ii = (C⁻¹)_ii − u_iᵀ S⁻¹ u_i with U = C⁻¹F
     * and S = FᵀC⁻¹F, all from the one Cholesky factor of C.
     *
     * @throws IllegalArgumentException if the neighbourhood is not global
     */
    static CrossValidation fast(Kriging kr) {
        KrigingOptions options = kr.options();
        int n = kr.size(), p = kr.driftSize(), k = kr.dimension();
        if (!options.neighbourhood().isGlobal()) {
            throw new IllegalArgumentException("fast leave-one-out needs the global neighbourhood"
                    + " (Neighbourhood.global()), got " + options.neighbourhood()
                    + "; use crossValidate() for local neighbourhoods");
        }
        requireEnough(n, p);
        LocalSystem g = kr.globalSystem();
        double[] b = g.borderedInverseDiagonal();
        // beta = S^{-1} Gᵀ LY (p × k), alpha = L^{-T}(LY − G beta)
        double[] alpha = g.dualWeights(g.driftCoefficients());
        double[][] err = new double[n][k];
        double[] var = new double[n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(alpha, i * k, err[i], 0, k);
        }
        for (int i = 0; i < n; i++) {
            for (int c = 0; c < k; c++) {
                err[i][c] /= b[i];
            }
            var[i] = kr.inDataUnits(Math.max(0, 1 / b[i] - kr.diagonalExtra(i)));
        }
        return CrossValidation.of(err, var, kr.errorAndNuggetVariances());
    }

    /**
     * Leave-one-out by refitting: for each location, kriging from the others (within this
     * neighbourhood) at its position. Locations are processed in parallel, each writing its own row.
     */
    static CrossValidation bruteForce(Kriging kr, ProgressCounter progress) {
        int n = kr.size(), p = kr.driftSize(), k = kr.dimension();
        requireEnough(n, p);
        double[][] err = new double[n][k];
        double[] var = new double[n];
        Drift drift = kr.drift();
        double[] y = kr.dataCoordinates();
        int q = drift == null ? 0 : drift.covariateCount();
        Kernels.forEachBlock(n, kr.options().parallel() && n >= 32, i -> {
            double[] cov = new double[q];
            for (int j = 0; j < q; j++) {
                cov[j] = drift.covariate(i, j);
            }
            KrigingPrediction pr = kr.predictAt(kr.locations().x(i), kr.locations().y(i), q > 0 ? cov : null, i,
                    false);
            double[] c = pr.density().coordinates();
            for (int j = 0; j < k; j++) {
                err[i][j] = y[i * k + j] - c[j];
            }
            var[i] = pr.variance();
            progress.advance(1);
        });
        return CrossValidation.of(err, var, kr.errorAndNuggetVariances());
    }

    private static void requireEnough(int n, int p) {
        if (n < p + 2) {
            throw new IllegalArgumentException("leave-one-out with " + p + " drift function(s) needs at least "
                    + (p + 2) + " locations, got " + n);
        }
    }
}
