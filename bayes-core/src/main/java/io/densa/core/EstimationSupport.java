package io.densa.core;

/** Validation and coordinate transforms shared by the estimators. Internal. */
final class EstimationSupport {
    private EstimationSupport() {
    }

    /** "unit 'id' (row i)" or "unit row i". */
    static String unit(String[] ids, int i) {
        return ids == null ? "unit row " + i : "unit '" + ids[i] + "' (row " + i + ")";
    }

    static String id(String[] ids, int i) {
        return ids == null ? "#" + i : ids[i];
    }

    static void checkIds(String[] ids, int n) {
        if (ids != null && ids.length != n) {
            throw new IllegalArgumentException("ids has " + ids.length + " entries for " + n + " units");
        }
    }

    /** Validates bin edges against the domain of the space; returns a copy. */
    static double[] checkEdges(BayesSpace space, double[] edges) {
        if (edges == null) {
            throw new IllegalArgumentException("bin edges are null");
        }
        if (edges.length < 2) {
            throw new IllegalArgumentException("need at least 2 bin edges (1 bin), got " + edges.length);
        }
        double a = space.lower(), b = space.upper();
        for (int i = 0; i < edges.length; i++) {
            double e = edges[i];
            if (!(e >= a && e <= b)) {
                throw new IllegalArgumentException("bin edge " + i + " = " + e + " lies outside the domain [" + a
                        + ", " + b + "] of the space; edges must be finite and inside the domain");
            }
            if (i > 0 && !(e > edges[i - 1])) {
                throw new IllegalArgumentException("bin edges must be strictly increasing: edge " + i + " = " + e
                        + " does not exceed edge " + (i - 1) + " = " + edges[i - 1]);
            }
        }
        return edges.clone();
    }

    static String bin(double[] edges, int j) {
        return "bin " + j + " [" + edges[j] + ", " + edges[j + 1] + ")";
    }

    /** Validates a row of counts; returns the total. */
    static double checkCounts(double[] row, double[] edges, String unit, boolean wholeNumbers) {
        int d = edges.length - 1;
        if (row == null) {
            throw new IllegalArgumentException(unit + ": counts are null");
        }
        if (row.length != d) {
            throw new IllegalArgumentException(unit + ": " + row.length + " counts for " + d + " bins");
        }
        double n = 0;
        for (int j = 0; j < d; j++) {
            double c = row[j];
            if (!(c >= 0) || !Double.isFinite(c)) {
                throw new IllegalArgumentException(unit + ", " + bin(edges, j) + ": count " + c
                        + " is not allowed; counts must be finite and >= 0");
            }
            if (wholeNumbers && c != Math.rint(c)) {
                throw new IllegalArgumentException(unit + ", " + bin(edges, j) + ": count " + c
                        + " is not a whole number; counts must be integers (allow fractional counts in the"
                        + " options for weighted counts)");
            }
            n += c;
        }
        return n;
    }

    static long checkCounts(int[] row, double[] edges, String unit) {
        int d = edges.length - 1;
        if (row == null) {
            throw new IllegalArgumentException(unit + ": counts are null");
        }
        if (row.length != d) {
            throw new IllegalArgumentException(unit + ": " + row.length + " counts for " + d + " bins");
        }
        long n = 0;
        for (int j = 0; j < d; j++) {
            if (row[j] < 0) {
                throw new IllegalArgumentException(unit + ", " + bin(edges, j) + ": count " + row[j]
                        + " is negative; counts must be >= 0");
            }
            n += row[j];
        }
        return n;
    }

    /** T (K × K lower triangular, row-major) with e = T(φ − φ̄), from the space. */
    static double[] lowerT(BayesSpace space) {
        int k = space.dimension();
        double[] t = new double[k * k];
        double[] unit = new double[k];
        double[] row = new double[k];
        for (int i = 0; i < k; i++) {
            unit[i] = 1.0;
            space.rawCoefficients(unit, 0, row);
            System.arraycopy(row, 0, t, i * k, k);
            unit[i] = 0.0;
        }
        return t;
    }

    /** U = (T')⁻¹, upper triangular, so that coordinates c = U b for raw coefficients b. */
    static double[] upperU(double[] t, int k) {
        // T' is upper triangular with (T')_ij = T_ji; invert column by column
        double[] u = new double[k * k];
        for (int c = 0; c < k; c++) {
            for (int i = c; i >= 0; i--) {
                double s = i == c ? 1.0 : 0.0;
                for (int m = i + 1; m <= c; m++) {
                    s -= t[m * k + i] * u[m * k + c];
                }
                u[i * k + c] = s / t[i * k + i];
            }
        }
        return u;
    }

    /** out = U b (first K entries of b). */
    static void toCoordinates(double[] u, int k, double[] b, double[] out, int off) {
        for (int i = 0; i < k; i++) {
            double s = 0;
            int o = i * k;
            for (int j = i; j < k; j++) {
                s += u[o + j] * b[j];
            }
            out[off + i] = s;
        }
    }

    /** Returns T M T' for a symmetric K × K raw matrix M (T lower triangular). */
    static double[] congruenceLower(double[] t, double[] m, int k) {
        double[] tmp = new double[k * k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                double s = 0;
                for (int p = 0; p <= i; p++) {
                    s += t[i * k + p] * m[p * k + j];
                }
                tmp[i * k + j] = s;
            }
        }
        double[] out = new double[k * k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j <= i; j++) {
                double s = 0;
                for (int p = 0; p <= j; p++) {
                    s += tmp[i * k + p] * t[j * k + p];
                }
                out[i * k + j] = s;
                out[j * k + i] = s;
            }
        }
        return out;
    }

    /** Covariance for a unit without information: +∞ on the diagonal, 0 elsewhere. */
    static double[] infiniteCovariance(int k) {
        double[] c = new double[k * k];
        for (int i = 0; i < k; i++) {
            c[i * k + i] = Double.POSITIVE_INFINITY;
        }
        return c;
    }

    static double trace(double[] m, int k) {
        double s = 0;
        for (int i = 0; i < k; i++) {
            s += m[i * k + i];
        }
        return s;
    }
}
