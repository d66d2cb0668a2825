package io.densa.spatial.kriging;

import io.densa.core.DensaException;
import io.densa.spatial.Locations;

/**
 * The drift functions of a kriging as its systems use them (package-private): monomials of the
 * coordinates centred on the data's bounding box and scaled by its half-width, and external
 * covariates standardised; their rows at the data locations, their values at a target, the check
 * that no drift column is a combination of the others, and the conversion of coefficients back
 * to the covariates' own units. Immutable.
 */
final class DriftDesign {
    private final Drift drift;
    private final int p;
    private final double[] fRows;
    private final double[] covShift;
    private final double[] covUnit;
    private final double[] covSpread;
    private final double cx;
    private final double cy;
    private final double scale;

    /**
     * @param drift the drift (null, or p = 0, for simple kriging)
     * @param p     number of drift functions (0 for simple kriging)
     * @param bb    the data's bounding box (minX, minY, maxX, maxY)
     * @throws IllegalArgumentException naming a constant covariate or a dependent drift function
     */
    DriftDesign(Drift drift, int p, Locations loc, double[] bb) {
        this.drift = drift;
        this.p = p;
        int n = loc.size();
        this.cx = 0.5 * (bb[0] + bb[2]);
        this.cy = 0.5 * (bb[1] + bb[3]);
        double s = 0.5 * Math.max(bb[2] - bb[0], bb[3] - bb[1]);
        this.scale = s > 0 ? s : 1;
        this.fRows = new double[n * p];
        int q = p > 0 ? drift.covariateCount() : 0;
        this.covShift = new double[q];
        this.covUnit = new double[q];
        this.covSpread = new double[q];
    }

    /** Evaluates the rows at the data locations; split from the constructor to keep the order of checks. */
    void evaluateRows(Locations loc) {
        int n = loc.size();
        int q = covUnit.length;
        standardiseCovariates(q, n);
        double[] cov = new double[q];
        for (int i = 0; i < n && p > 0; i++) {
            for (int j = 0; j < q; j++) {
                cov[j] = standardised(j, drift.covariate(i, j));
            }
            drift.evaluate((loc.x(i) - cx) / scale, (loc.y(i) - cy) / scale, cov, fRows, i * p);
        }
        if (p > 1) {
            int dep = dependentColumn(fRows, n, p, null);
            if (dep >= 0) {
                throw new IllegalArgumentException(dependentMessage(dep, n));
            }
        }
    }

    /** Half-width of the data's bounding box (1 if it is a point). */
    double scale() {
        return scale;
    }

    /** Number of drift functions. */
    int size() {
        return p;
    }

    /**
     * β in the covariates' own units from the coefficients of the standardised drift (p × k row-major;
     * a new p × k array).
     *
     * @throws DensaException if a covariate's coefficient overflows a double in its own units
     */
    double[][] inOwnUnits(double[] flat, int k, int n) {
        double[][] beta = new double[p][k];
        for (int j = 0; j < p; j++) {
            System.arraycopy(flat, j * k, beta[j], 0, k);
        }
        int mono = p - covUnit.length;
        for (int j = 0; j < covUnit.length; j++) {
            for (int c = 0; c < k; c++) {
                double b = beta[mono + j][c] / covSpread[j];
                beta[0][c] -= b * covShift[j];
                beta[mono + j][c] = b / covUnit[j];
                if (!Double.isFinite(beta[mono + j][c]) || !Double.isFinite(beta[0][c])) {
                    throw new DensaException("the coefficient of drift covariate " + j + " overflows a double in the"
                            + " covariate's units (values up to " + covUnit[j] + ")",
                            new KrigingDiagnostics(n, Double.NaN, new int[0], "drift coefficient overflow"));
                }
            }
        }
        return beta;
    }

    /** Y − F β (a new n × k row-major array). */
    double[] residuals(double[] y, double[] beta, int n, int k) {
        double[] r = y.clone();
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < p; j++) {
                double f = fRows[i * p + j];
                for (int c = 0; c < k; c++) {
                    r[i * k + c] -= f * beta[j * k + c];
                }
            }
        }
        return r;
    }

    /**
     * Drift covariates enter the drift standardised, (c / u − shift) / spread with u the power of two
     * of the column's largest |value| and shift, spread the mean and largest deviation of c / u
     * (columns near 1e300 or 1e-300 neither overflow nor underflow F'C⁻¹F): with the constant term
     * always in the drift this spans the same functions, so predictions are unchanged, and
     * {@link #inOwnUnits} converts the coefficients back to the covariates' own units.
     *
     * @throws IllegalArgumentException naming a covariate that is constant over the data locations
     */
    private void standardiseCovariates(int q, int n) {
        for (int j = 0; j < q; j++) {
            double max = 0;
            for (int i = 0; i < n; i++) {
                max = Math.max(max, Math.abs(drift.covariate(i, j)));
            }
            double u = max > 0 ? Math.scalb(1.0, Math.getExponent(max)) : 1;
            double mean = 0;
            for (int i = 0; i < n; i++) {
                mean += drift.covariate(i, j) / u;
            }
            mean /= n;
            double spread = 0;
            for (int i = 0; i < n; i++) {
                spread = Math.max(spread, Math.abs(drift.covariate(i, j) / u - mean));
            }
            if (!(spread > 1e-13)) {
                throw new IllegalArgumentException("drift covariate " + j + " is constant over the " + n + " data"
                        + " locations (every value is " + drift.covariate(0, j) + "): it duplicates the constant term"
                        + " of the drift, so its coefficient is not identifiable; drop it");
            }
            covUnit[j] = u;
            covShift[j] = mean;
            covSpread[j] = spread;
        }
    }

    double standardised(int j, double value) {
        return (value / covUnit[j] - covShift[j]) / covSpread[j];
    }

    /**
     * The first drift column (of the m × p row-major f, rows idx or all) that is a linear combination
     * of the earlier ones, by modified Gram–Schmidt with reorthogonalisation on the columns: column
     * j is dependent when its component orthogonal to the earlier columns has norm at most 10⁻⁹ of
     * its own; −1 if none. The columns are monomials of coordinates scaled to [−1, 1] and
     * standardised covariates, so the threshold is relative to columns of comparable size. A work
     * array of at least m·p entries receives the orthonormalised columns (all p of them when −1 is
     * returned); f is not modified.
     */
    static int dependentColumn(double[] f, int m, int p, double[] work) {
        double[] qm = work != null && work.length >= m * p ? work : new double[m * p];
        for (int j = 0; j < p; j++) {
            double norm0 = 0;
            for (int r = 0; r < m; r++) {
                double v = f[r * p + j];
                qm[r * p + j] = v;
                norm0 += v * v;
            }
            norm0 = Math.sqrt(norm0);
            for (int pass = 0; pass < 2; pass++) {
                for (int i = 0; i < j; i++) {
                    double d = 0;
                    for (int r = 0; r < m; r++) {
                        d += qm[r * p + i] * qm[r * p + j];
                    }
                    for (int r = 0; r < m; r++) {
                        qm[r * p + j] -= d * qm[r * p + i];
                    }
                }
            }
            double norm = 0;
            for (int r = 0; r < m; r++) {
                norm += qm[r * p + j] * qm[r * p + j];
            }
            norm = Math.sqrt(norm);
            if (!(norm > 1e-9 * norm0)) {
                return j;
            }
            for (int r = 0; r < m; r++) {
                qm[r * p + j] /= norm;
            }
        }
        return -1;
    }

    /** The message for a drift column that the others determine over m locations. */
    String dependentMessage(int col, int m) {
        String name = drift.functionName(col);
        int q = col - drift.monomialCount();
        if (q >= 0) {
            return "drift covariate " + q + " is a linear combination of the earlier drift functions (" + earlier(col)
                    + ") over the " + m + " data locations, so its coefficient is not identifiable; drop it";
        }
        return "drift function " + name + " (column " + col + ") is a linear combination of the earlier drift"
                + " functions (" + earlier(col) + ") over the " + m + " data locations (for instance all of them on a"
                + " line), so its coefficient is not identifiable; use a lower drift degree or more locations";
    }

    private String earlier(int col) {
        StringBuilder sb = new StringBuilder();
        for (int j = 0; j < col; j++) {
            sb.append(j == 0 ? "" : ", ").append(drift.functionName(j));
        }
        return sb.toString();
    }

    void driftRow(int i, double[] out, int off) {
        System.arraycopy(fRows, i * p, out, off, p);
    }

    /** Drift vector at a target into out[0..p). */
    void driftAt(double x, double yy, double[] cov, double[] out) {
        if (p == 0) {
            return;
        }
        int q = drift.covariateCount();
        double[] sc = cov;
        if (q > 0) {
            if (cov == null || cov.length != q) {
                throw new IllegalArgumentException("the drift has " + q + " covariate(s); the target supplies "
                        + (cov == null ? "none" : cov.length));
            }
            sc = new double[q];
            for (int j = 0; j < q; j++) {
                if (!Double.isFinite(cov[j])) {
                    throw new IllegalArgumentException("target covariate " + j + " is not finite: " + cov[j]);
                }
                sc[j] = standardised(j, cov[j]);
            }
        }
        drift.evaluate((x - cx) / scale, (yy - cy) / scale, sc, out, 0);
        for (int j = 0; j < p; j++) {
            if (!Double.isFinite(out[j])) {
                throw new IllegalArgumentException("drift function " + drift.functionName(j) + " is not finite at"
                        + " target (" + x + ", " + yy + ") (" + out[j] + "): the target is too far from the data"
                        + " locations (their centre (" + cx + ", " + cy + "), half-width " + scale + ")");
            }
        }
    }

    /** max_j |Σ_r λ_r F_{idx[r], j} − f0_j| / max(1, |f0_j|) for the reported weights. */
    double weightResidual(int[] idx, double[] w, double[] f0) {
        double worst = 0;
        for (int j = 0; j < p; j++) {
            double s = -f0[j];
            for (int r = 0; r < idx.length; r++) {
                s += fRows[idx[r] * p + j] * w[r];
            }
            worst = Math.max(worst, Math.abs(s) / Math.max(1, Math.abs(f0[j])));
        }
        return Double.isNaN(worst) ? Double.POSITIVE_INFINITY : worst;
    }
}
