package io.densa.spatial.kriging;

import java.util.Objects;

/**
 * The drift (trend) of universal kriging: m(s) = Σ_l f_l(s) β_l with functions f_l that are the
 * monomials x^a y^b, a + b ≤ degree, of the planar (or longitude/latitude) coordinates, plus
 * external covariates known at every data location and supplied at each target. Coordinates enter
 * the monomials centred and scaled by the data's bounding box, which changes the coefficients but
 * not the spanned space, hence not the predictions.
 *
 * <p>Degree 0 without covariates is the constant drift of ordinary kriging.
 *
 * <p>Immutable; arrays are copied.
 */
public final class Drift {
    private final int degree;
    private final double[][] covariates; // n × q or null

    private Drift(int degree, double[][] covariates) {
        this.degree = degree;
        this.covariates = covariates;
    }

    /** The constant drift (ordinary kriging). */
    public static Drift constant() {
        return new Drift(0, null);
    }

    /**
     * All monomials in the coordinates up to the given total degree (1 = linear, 2 = quadratic).
     *
     * @throws IllegalArgumentException unless 0 ≤ degree ≤ 4
     */
    public static Drift polynomial(int degree) {
        if (degree < 0 || degree > 4) {
            throw new IllegalArgumentException("drift degree must be in [0, 4], got " + degree);
        }
        return new Drift(degree, null);
    }

    /**
     * This drift plus external covariates: row i holds the q covariate values at data location i.
     *
     * @throws IllegalArgumentException on ragged rows or non-finite values (naming row and column)
     */
    public Drift withCovariates(double[][] valuesAtLocations) {
        Objects.requireNonNull(valuesAtLocations, "valuesAtLocations");
        int q = valuesAtLocations.length == 0 ? 0 : valuesAtLocations[0].length;
        double[][] c = new double[valuesAtLocations.length][];
        for (int i = 0; i < c.length; i++) {
            if (valuesAtLocations[i] == null || valuesAtLocations[i].length != q) {
                throw new IllegalArgumentException("covariate row " + i + " must have " + q + " values");
            }
            for (int j = 0; j < q; j++) {
                if (!Double.isFinite(valuesAtLocations[i][j])) {
                    throw new IllegalArgumentException("covariate at row " + i + ", column " + j + " is not finite: "
                            + valuesAtLocations[i][j]);
                }
            }
            c[i] = valuesAtLocations[i].clone();
        }
        return new Drift(degree, c);
    }

    /** Polynomial degree. */
    public int degree() {
        return degree;
    }

    /** Number of external covariates. */
    public int covariateCount() {
        return covariates == null || covariates.length == 0 ? 0 : covariates[0].length;
    }

    /** The external covariates at the data locations, n × q (fresh copies; empty when there are none). */
    public double[][] covariates() {
        if (covariates == null) {
            return new double[0][];
        }
        double[][] c = new double[covariates.length][];
        for (int i = 0; i < c.length; i++) {
            c[i] = covariates[i].clone();
        }
        return c;
    }

    /** Number of drift functions p (monomials plus covariates). */
    public int size() {
        return (degree + 1) * (degree + 2) / 2 + covariateCount();
    }

    int covariateRows() {
        return covariates == null ? -1 : covariates.length;
    }

    double covariate(int i, int j) {
        return covariates[i][j];
    }

    /** Number of monomials (degree + 1)(degree + 2) / 2; the covariates follow them. */
    int monomialCount() {
        return (degree + 1) * (degree + 2) / 2;
    }

    /**
     * The name of drift function col in the order of {@link #evaluate}: "1", "x", "y", "x^2",
     * "x*y", "y^2", ... (in the centred and scaled coordinates), then "covariate j".
     */
    String functionName(int col) {
        int c = 0;
        for (int d = 0; d <= degree; d++) {
            for (int b = 0; b <= d; b++) {
                if (c++ == col) {
                    return d == 0 ? "1" : power("x", d - b) + (d - b > 0 && b > 0 ? "*" : "") + power("y", b);
                }
            }
        }
        return "covariate " + (col - monomialCount());
    }

    private static String power(String var, int e) {
        return e == 0 ? "" : e == 1 ? var : var + "^" + e;
    }

    /**
     * Writes the p drift functions at scaled coordinates (u, v) and covariates cov into out[off..).
     */
    void evaluate(double u, double v, double[] cov, double[] out, int off) {
        int c = off;
        for (int d = 0; d <= degree; d++) {
            for (int b = 0; b <= d; b++) {
                out[c++] = Math.pow(u, d - b) * Math.pow(v, b);
            }
        }
        int q = covariateCount();
        for (int j = 0; j < q; j++) {
            out[c++] = cov[j];
        }
    }

    @Override
    public String toString() {
        return "Drift[degree " + degree + ", covariates " + covariateCount() + "]";
    }
}
