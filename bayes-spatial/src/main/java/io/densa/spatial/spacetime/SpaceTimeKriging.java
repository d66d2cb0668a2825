package io.densa.spatial.spacetime;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.internal.Cholesky;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.CrossValidation;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * Ordinary space–time kriging of densities. The predictor X̂(s_0, t_0) = ⊕_i λ_i ⊙ X(s_i, t_i) has
 * clr coordinates Σ_i λ_i c_i; all K coordinates share the weights, which solve the scalar ordinary
 * kriging system of the trace-covariance C(h, u) of a {@link SpaceTimeModel}:
 * <pre>C λ + μ 1 = c_0,  1ᵀλ = 1,  σ² = C(0, 0) − λᵀc_0 − μ,</pre>
 * with C_ij = C(‖s_i − s_j‖, |t_i − t_j|) and c_0i = C(‖s_i − s_0‖, |t_i − t_0|) (Giraldo,
 * Delicado &amp; Mateu (2011), Ordinary kriging for function-valued spatial data, Environ. Ecol.
 * Stat. 18, with space–time lags as in Cressie &amp; Wikle (2011), Statistics for Spatio-Temporal
 * Data, Wiley, §4.2 — both from memory). σ² is the trace kriging variance
 * E‖X(s_0, t_0) ⊖ X̂(s_0, t_0)‖²_B. A unit's density for a missing period is
 * {@code predict(x_unit, y_unit, t_missing)}; next period's density at a location is
 * {@code predict(x, y, t_last + 1)}. At an observed (location, time) the predictor returns the
 * observation with variance 0 (the nugget is part of C(0, 0)).
 *
 * <p>The solve is C λ' = c_0 with the Cholesky factor of C (Golub &amp; Van Loan (2013), Matrix
 * Computations, §4.2), C⁻¹1 computed once: μ = (1ᵀC⁻¹c_0 − 1) / 1ᵀC⁻¹1 and λ = C⁻¹c_0 − μ C⁻¹1.
 * Covariances are divided by the power of two nearest the sill (exact). With a global
 * neighbourhood the factor of the n × n matrix is computed once, lazily (O(n³/3)); with at most m
 * neighbours each target uses the m observations of largest covariance with it (ties by row),
 * O(n + m³) per target.
 *
 * <p>Leave-one-out cross-validation uses Dubrule's identities for a global neighbourhood
 * (Dubrule (1983), Cross validation of kriging in a unique neighborhood, Math. Geol. 15(6) — from
 * memory): with Q = C⁻¹ − C⁻¹11ᵀC⁻¹ / 1ᵀC⁻¹1, the error is e_i = (Q Y)_i / Q_ii and the variance
 * 1 / Q_ii; with a local neighbourhood every observation is predicted from its neighbours among the
 * others.
 *
 * <p>Immutable after construction and safe to share between threads.
 */
public final class SpaceTimeKriging {
    private final SpaceTimeData data;
    private final SpaceTimeModel model;
    private final Locations loc;
    private final BayesSpace space;
    private final double[] times;
    private final double[] y;
    private final int n;
    private final int k;
    private final int maxNeighbours;
    private final int exponent;
    private final double c00;
    private volatile Global global;

    /** The global factor: L (n × n), C⁻¹1 and 1ᵀC⁻¹1. */
    private record Global(double[] l, double[] w1, double s) {
    }

    private SpaceTimeKriging(SpaceTimeData data, SpaceTimeModel model, int maxNeighbours) {
        this.data = Objects.requireNonNull(data, "data");
        this.model = Objects.requireNonNull(model, "model");
        this.loc = data.locations();
        this.space = data.space();
        this.times = data.times();
        this.y = data.densities().coordinatesRowMajor();
        this.n = data.size();
        this.k = data.densities().dimension();
        this.maxNeighbours = maxNeighbours <= 0 || maxNeighbours >= n ? n : maxNeighbours;
        this.exponent = Math.getExponent(model.sill());
        this.c00 = Math.scalb(model.sill(), -exponent);
    }

    /** Ordinary space–time kriging with a global neighbourhood (every observation). */
    public static SpaceTimeKriging ordinary(SpaceTimeData data, SpaceTimeModel model) {
        return new SpaceTimeKriging(data, model, 0);
    }

    /**
     * Ordinary space–time kriging with at most {@code maxNeighbours} observations per target, those
     * of largest covariance with it (0, or at least the number of observations: global).
     *
     * @throws IllegalArgumentException if maxNeighbours is negative
     */
    public static SpaceTimeKriging ordinary(SpaceTimeData data, SpaceTimeModel model, int maxNeighbours) {
        if (maxNeighbours < 0) {
            throw new IllegalArgumentException("maxNeighbours must be >= 0 (0: every observation), got "
                    + maxNeighbours);
        }
        return new SpaceTimeKriging(data, model, maxNeighbours);
    }

    private double cov(double h, double u) {
        return Math.scalb(model.covarianceUnchecked(h, u), -exponent);
    }

    private double covTo(int i, double x, double yy, double t) {
        return cov(loc.distanceTo(i, x, yy), Math.abs(times[i] - t));
    }

    /** The covariance matrix of the given rows (scaled), row-major. */
    private double[] matrix(int[] rows) {
        int m = rows.length;
        double[] a = new double[m * m];
        for (int i = 0; i < m; i++) {
            a[i * m + i] = c00;
            for (int j = 0; j < i; j++) {
                double c = cov(data.spatialLag(rows[i], rows[j]), data.temporalLag(rows[i], rows[j]));
                a[i * m + j] = c;
                a[j * m + i] = c;
            }
        }
        return a;
    }

    private Global factor(int[] rows) {
        int m = rows.length;
        double[] a = matrix(rows);
        double[] l;
        if (m >= Cholesky.LARGE) {
            l = Cholesky.factorLarge(DMatrixRMaj.wrap(m, m, a));
            if (l == null) {
                throw new DensaException("the space-time covariance matrix of " + m + " observations is not positive"
                        + " definite (Cholesky breakdown) under " + model + "; with geographic locations the"
                        + " model may not be valid on the sphere", new SpaceTimeDiagnostics(
                                "space-time covariance matrix", -1, Double.NaN));
            }
        } else {
            int bad = Cholesky.factor(a, m, m, 1e-12);
            if (bad >= 0) {
                throw new DensaException("the space-time covariance matrix of " + m + " observations is not positive"
                        + " definite at observation " + rows[bad] + " (pivot " + a[bad * m + bad] + " in units of 2^"
                        + exponent + ") under " + model + ": observations at (nearly) the same place and time"
                        + " without a nugget, or a model not valid for these locations", new SpaceTimeDiagnostics(
                                "space-time covariance matrix", rows[bad], a[bad * m + bad]));
            }
            l = a;
        }
        double[] w1 = new double[m];
        java.util.Arrays.fill(w1, 1.0);
        Cholesky.solve(l, m, m, w1, 0);
        double s = 0;
        for (double v : w1) {
            s += v;
        }
        return new Global(l, w1, s);
    }

    private Global global() {
        Global g = global;
        if (g == null) {
            synchronized (this) {
                g = global;
                if (g == null) {
                    int[] all = new int[n];
                    for (int i = 0; i < n; i++) {
                        all[i] = i;
                    }
                    g = factor(all);
                    global = g;
                }
            }
        }
        return g;
    }

    /**
     * Predicts the density at location (x, y) and time t.
     *
     * @throws IllegalArgumentException if the point fails {@link Locations#requirePoint} or t is not
     *                                  finite
     * @throws DensaException           if the covariance matrix is not positive definite
     */
    public SpaceTimePrediction predict(double x, double yy, double t) {
        loc.requirePoint(x, yy, "target");
        if (!Double.isFinite(t)) {
            throw new IllegalArgumentException("target time must be finite, got " + t);
        }
        return predict(x, yy, t, -1);
    }

    /** The prediction without observation {@code exclude} (−1: none). */
    private SpaceTimePrediction predict(double x, double yy, double t, int exclude) {
        int[] rows;
        double[] c0;
        Global g;
        if (maxNeighbours >= n && exclude < 0) {
            rows = null;
            c0 = new double[n];
            for (int i = 0; i < n; i++) {
                c0[i] = covTo(i, x, yy, t);
            }
            g = global();
        } else {
            rows = nearest(x, yy, t, exclude);
            c0 = new double[rows.length];
            for (int i = 0; i < rows.length; i++) {
                c0[i] = covTo(rows[i], x, yy, t);
            }
            g = factor(rows);
        }
        int m = c0.length;
        double[] z = c0.clone();
        Cholesky.solve(g.l, m, m, z, 0);
        double sz = 0;
        for (double v : z) {
            sz += v;
        }
        double mu = (sz - 1) / g.s;
        double[] lambda = new double[m];
        double var = c00 - mu;
        for (int i = 0; i < m; i++) {
            lambda[i] = z[i] - mu * g.w1[i];
            var -= lambda[i] * c0[i];
        }
        if (var < 0) {
            if (var < -1e-8 * c00) {
                throw new DensaException("the kriging variance at (" + x + ", " + yy + ", " + t + ") is negative ("
                        + Math.scalb(var, exponent) + "): the system is too ill-conditioned under " + model,
                        new SpaceTimeDiagnostics("space-time kriging variance", exclude, var));
            }
            var = 0; // rounding at an observed location and time
        }
        double[] coords = new double[k];
        int[] used = new int[m];
        for (int i = 0; i < m; i++) {
            int r = rows == null ? i : rows[i];
            used[i] = r;
            double w = lambda[i];
            for (int q = 0; q < k; q++) {
                coords[q] += w * y[r * k + q];
            }
        }
        return new SpaceTimePrediction(space.density(coords), Math.scalb(var, exponent), used, lambda);
    }

    /** Rows of the maxNeighbours observations of largest covariance with the target, in row order. */
    private int[] nearest(double x, double yy, double t, int exclude) {
        int m = Math.min(maxNeighbours, exclude >= 0 ? n - 1 : n);
        int[] idx = new int[m];
        double[] val = new double[m];
        int kept = 0;
        for (int i = 0; i < n; i++) {
            if (i == exclude) {
                continue;
            }
            double c = covTo(i, x, yy, t);
            if (kept == m && !(c > val[m - 1])) {
                continue;
            }
            int p = kept < m ? kept++ : m - 1;
            while (p > 0 && val[p - 1] < c) {
                val[p] = val[p - 1];
                idx[p] = idx[p - 1];
                p--;
            }
            val[p] = c;
            idx[p] = i;
        }
        java.util.Arrays.sort(idx);
        return idx;
    }

    /**
     * Leave-one-out cross-validation (see the class description).
     *
     * @throws DensaException           if a covariance matrix is not positive definite
     * @throws IllegalArgumentException with fewer than 2 observations
     */
    public CrossValidation crossValidate() {
        if (n < 2) {
            throw new IllegalArgumentException("cross-validation needs at least 2 observations, got " + n);
        }
        double[][] err = new double[n][k];
        double[] var = new double[n];
        if (maxNeighbours < n) {
            for (int i = 0; i < n; i++) {
                SpaceTimePrediction p = predict(loc.x(i), loc.y(i), times[i], i);
                double[] c = p.density().coordinates();
                for (int q = 0; q < k; q++) {
                    err[i][q] = y[i * k + q] - c[q];
                }
                var[i] = p.variance();
            }
            return CrossValidation.of(err, var);
        }
        Global g = global();
        // diag(C⁻¹)_c = Σ_{i ≥ c} (L⁻¹)_ic², one column of L⁻¹ at a time (O(n³/6))
        double[] col = new double[n];
        double[] qy = new double[n * k];
        for (int c = 0; c < n; c++) {
            Cholesky.invertLowerColumn(g.l, n, c, col);
            double d = 0;
            for (int i = c; i < n; i++) {
                d += col[i] * col[i];
            }
            var[c] = d - g.w1[c] * g.w1[c] / g.s; // Q_cc
        }
        // Q Y = C⁻¹Y − C⁻¹1 (1ᵀC⁻¹Y) / 1ᵀC⁻¹1, one coordinate at a time
        double[] z = new double[n];
        for (int q = 0; q < k; q++) {
            double oneZ = 0;
            for (int i = 0; i < n; i++) {
                z[i] = y[i * k + q];
            }
            Cholesky.solve(g.l, n, n, z, 0);
            for (int i = 0; i < n; i++) {
                oneZ += z[i];
            }
            for (int i = 0; i < n; i++) {
                qy[i * k + q] = z[i] - g.w1[i] * oneZ / g.s;
            }
        }
        for (int i = 0; i < n; i++) {
            double qii = var[i];
            for (int q = 0; q < k; q++) {
                err[i][q] = qy[i * k + q] / qii;
            }
            var[i] = Math.scalb(1 / qii, exponent);
            if (!(var[i] > 0 && var[i] < Double.POSITIVE_INFINITY)) {
                throw new DensaException("the leave-one-out variance of observation " + i + " is " + var[i]
                        + ": the system is too ill-conditioned under " + model,
                        new SpaceTimeDiagnostics("leave-one-out variance", i, var[i]));
            }
        }
        return CrossValidation.of(err, var);
    }

    /** The data. */
    public SpaceTimeData data() {
        return data;
    }

    /** The model. */
    public SpaceTimeModel model() {
        return model;
    }

    /** The neighbourhood size per target (the number of observations when global). */
    public int maxNeighbours() {
        return maxNeighbours;
    }

    @Override
    public String toString() {
        return "SpaceTimeKriging[" + data + ", " + model + ", neighbours " + maxNeighbours + "]";
    }
}
