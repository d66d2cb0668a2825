package io.densa.core.estimate;

import java.util.Objects;

/**
 * Replacement of count zeros in compositions, so that log-ratios (clr, ilr, log-histogram heights)
 * are defined. Immutable and thread-safe; input arrays are never modified.
 *
 * <h2>Bayesian-multiplicative replacement</h2>
 * Martín-Fernández, Hron, Templ, Filzmoser, Palarea-Albaladejo (2015), Bayesian-multiplicative
 * treatment of count zeros in compositional data sets, Statistical Modelling 15(2) (formulas from
 * memory of that paper). For counts c_1..c_D with total n = Σ c_j, a Dirichlet prior of strength s
 * and prior composition t_j = 1/D gives, for each part,
 * <pre>
 *   r_j = t_j s / (n + s)                                if c_j = 0,
 *   r_j = (c_j / n) (1 − Σ_{k: c_k = 0} t_k s / (n + s))  otherwise,
 * </pre>
 * so the zero parts receive their posterior expectation and the non-zero parts are shrunk
 * multiplicatively: ratios between non-zero parts are exactly those of the counts. The prior
 * strength is s = D/2 (Jeffreys), s = 1 (Perks), s = D (Bayes–Laplace) or s = √n (square root).
 *
 * <h2>Simple multiplicative replacement</h2>
 * Each zero of the closed composition x = c / n becomes δ and the non-zero parts become
 * x_j (1 − Z δ), Z the number of zeros (Martín-Fernández, Barceló-Vidal, Pawlowsky-Glahn (2003),
 * Dealing with zeros and missing values in compositional data sets using nonparametric
 * imputation, Math. Geol. 35(3); from memory). This too keeps the ratios of the non-zero parts.
 *
 * <p>Outputs are closed compositions (summing to 1) with every part &gt; 0.
 */
public final class ZeroReplacement {
    /** Prior strength of the Bayesian-multiplicative replacement. */
    public enum Prior {
        /** Jeffreys prior, s = D/2. */
        JEFFREYS,
        /** Perks prior, s = 1. */
        PERKS,
        /** Bayes–Laplace (uniform) prior, s = D. */
        BAYES_LAPLACE,
        /** Square-root prior, s = √n. */
        SQUARE_ROOT
    }

    private final Prior prior; // null for simple multiplicative
    private final double delta;

    private ZeroReplacement(Prior prior, double delta) {
        this.prior = prior;
        this.delta = delta;
    }

    /**
     * Bayesian-multiplicative replacement with the given prior and a uniform prior composition.
     *
     * @param prior the prior strength rule
     */
    public static ZeroReplacement bayesianMultiplicative(Prior prior) {
        return new ZeroReplacement(Objects.requireNonNull(prior, "prior"), 0.0);
    }

    /**
     * Simple multiplicative replacement: every zero becomes the proportion δ.
     *
     * @param delta the replacement proportion, 0 &lt; δ &lt; 1 (a common choice for counts is
     *              0.65 / n, 65 % of the detection limit 1/n; common practice)
     * @throws IllegalArgumentException if δ is not in (0, 1)
     */
    public static ZeroReplacement multiplicative(double delta) {
        if (!(delta > 0 && delta < 1)) {
            throw new IllegalArgumentException("replacement proportion delta must be in (0, 1), got " + delta);
        }
        return new ZeroReplacement(null, delta);
    }

    /** The prior, or null for simple multiplicative replacement. */
    public Prior prior() {
        return prior;
    }

    /** The replacement proportion δ of simple multiplicative replacement (0 for the Bayesian one). */
    public double delta() {
        return delta;
    }

    /**
     * Prior strength s for a composition of D parts with total n (0 for simple multiplicative
     * replacement).
     */
    public double priorStrength(int parts, double total) {
        if (prior == null) {
            return 0.0;
        }
        switch (prior) {
            case JEFFREYS:
                return parts / 2.0;
            case PERKS:
                return 1.0;
            case BAYES_LAPLACE:
                return parts;
            default:
                return Math.sqrt(total);
        }
    }

    /**
     * Replaces the zeros of one composition of counts.
     *
     * @param counts D ≥ 2 finite counts ≥ 0 with a positive total (not modified; need not be
     *               whole numbers)
     * @return a fresh closed composition, every part &gt; 0
     * @throws IllegalArgumentException for fewer than 2 parts, a negative or non-finite count, a
     *                                  zero total, or (multiplicative) Z·δ ≥ 1
     */
    public double[] replace(double[] counts) {
        Objects.requireNonNull(counts, "counts");
        double[] out = new double[counts.length];
        replace(counts, 0, counts.length, out, "composition");
        return out;
    }

    /**
     * Replaces the zeros of every row.
     *
     * @param counts rows of counts (not modified)
     * @return fresh closed compositions
     * @throws IllegalArgumentException as {@link #replace(double[])}, naming the row
     */
    public double[][] replaceAll(double[][] counts) {
        Objects.requireNonNull(counts, "counts");
        double[][] out = new double[counts.length][];
        for (int i = 0; i < counts.length; i++) {
            Objects.requireNonNull(counts[i], "row " + i);
            out[i] = new double[counts[i].length];
            replace(counts[i], 0, counts[i].length, out[i], "row " + i);
        }
        return out;
    }

    /**
     * Core: counts[off..off+d) to the closed composition out[0..d). The counts are scaled by their
     * largest value first, so that totals beyond the overflow limit stay finite. Every part is
     * &gt; 0 (possibly subnormal); a positive count so small relative to the total that its
     * proportion underflows to 0 is rejected.
     */
    void replace(double[] counts, int off, int d, double[] out, String where) {
        Scaled sc = scale(counts, off, d, where);
        double zeroPart = prior == null ? delta : Math.exp(sc.logZero);
        double shrink = 1 - sc.zeros * zeroPart;
        for (int j = 0; j < d; j++) {
            double c = counts[off + j];
            double q = c / sc.max;
            double r = c == 0 ? zeroPart : q >= Double.MIN_NORMAL ? q / sc.scaled * shrink
                    : Math.exp(Math.log(c) - sc.logTotal + Math.log1p(-sc.zeros * zeroPart));
            if (!(r > 0)) {
                throw new IllegalArgumentException(where + ", part " + j + ": count " + c
                        + " is too small relative to the total for its proportion to be a double > 0; rescale"
                        + " the counts or drop the part");
            }
            out[j] = r;
        }
    }

    /**
     * The natural logarithm of the replaced composition, counts[off..off+d) to outLog[0..d): finite
     * also where a proportion itself would underflow (log c_j − log n is used then).
     */
    void replaceLog(double[] counts, int off, int d, double[] outLog, String where) {
        Scaled sc = scale(counts, off, d, where);
        double logShrink = Math.log1p(-sc.zeros * (prior == null ? delta : Math.exp(sc.logZero)));
        for (int j = 0; j < d; j++) {
            double c = counts[off + j];
            double q = c / sc.max;
            outLog[j] = c == 0 ? sc.logZero : q >= Double.MIN_NORMAL ? Math.log(q / sc.scaled) + logShrink
                    : Math.log(c) - sc.logTotal + logShrink;
        }
    }

    /** Validated counts scaled by their maximum, with the log of the replacement of a zero. */
    private record Scaled(double max, double scaled, double logTotal, int zeros, double logZero) {
    }

    private Scaled scale(double[] counts, int off, int d, String where) {
        if (d < 2) {
            throw new IllegalArgumentException(where + ": a composition needs at least 2 parts, got " + d);
        }
        double s = 0;
        int zeros = 0;
        for (int j = 0; j < d; j++) {
            double c = counts[off + j];
            if (!(c >= 0 && Double.isFinite(c))) {
                throw new IllegalArgumentException(where + ", part " + j + ": count must be finite and >= 0, got " + c);
            }
            s = Math.max(s, c);
            if (c == 0) {
                zeros++;
            }
        }
        if (!(s > 0)) {
            throw new IllegalArgumentException(where + ": total count is 0; zero replacement needs at least one event");
        }
        double scaled = 0; // n / s, in [1, d]
        for (int j = 0; j < d; j++) {
            scaled += counts[off + j] / s;
        }
        double logS = Math.log(s);
        double logN = logS + Math.log(scaled);
        double logZero;
        if (prior != null) {
            // zero part t s_p / (n + s_p), t = 1/D, in logarithms: n + s_p = s (n/s + s_p/s)
            double logSp;
            double spOverS;
            if (prior == Prior.SQUARE_ROOT) {
                logSp = 0.5 * logN;
                spOverS = Math.exp(logSp - logS);
            } else {
                double sp = priorStrength(d, 0);
                logSp = Math.log(sp);
                spOverS = sp / s;
            }
            logZero = -Math.log(d) + logSp - (logS + Math.log(scaled + spOverS));
        } else {
            if (!(zeros * delta < 1)) {
                throw new IllegalArgumentException(where + ": " + zeros + " zeros times delta = " + delta
                        + " must stay below 1");
            }
            logZero = Math.log(delta);
        }
        return new Scaled(s, scaled, logN, zeros, logZero);
    }

    @Override
    public String toString() {
        return prior == null ? "multiplicative(delta " + delta + ")" : "bayesianMultiplicative(" + prior + ")";
    }
}
