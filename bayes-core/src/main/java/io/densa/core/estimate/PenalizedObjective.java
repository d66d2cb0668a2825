package io.densa.core.estimate;

import io.densa.core.estimate.EstimationSupport.SampleData;
import io.densa.core.internal.KernelPath;
import io.densa.core.internal.Kernels;
import java.util.Arrays;

/**
 * The penalised log-likelihood that {@link PenalizedNewton} maximises, in raw basis coefficients:
 * the unit's data (counts or a weighted sample), its value, gradient, observed and expected
 * information, and the empirical information of the data, with their working arrays (one
 * instance per engine; nothing is allocated in an evaluation). Internal.
 *
 * <p>With η(x) = φ(x)·β, A_j = ∫_{bin j} e^η dP and Z = Σ_j A_j (all by the layout's quadrature,
 * shifted by max η for log-sum-exp):
 * <ul>
 * <li>binned counts: ℓ(β) = Σ_j n_j log(A_j / Z) (the multinomial log-likelihood of the counts
 * given that an observation falls in the bins);</li>
 * <li>raw samples: ℓ(β) = Σ_i w_i η(x_i) − W log Z = t·β − W log Z with t = Σ_i w_i φ(x_i),
 * W = Σ_i w_i.</li>
 * </ul>
 * The objective is Φ(β) = ℓ(β) − λ β'Pβ − β'Qβ, Q the fixed reference prior (none when null).
 * Gradient ℓ' = t + Σ_q r_q φ_q with
 * r_q = w_q e^{η_q}(n_{j(q)}/A_{j(q)} − N/Z). Observed information (counts)
 * −ℓ'' = N(S/Z − m m') − Σ_j n_j (S_j/A_j − m_j m_j'), m and S the mean and second moment of φ
 * under the density, m_j, S_j within bin j; expected (Fisher) information
 * F = N (Σ_j π_j m_j m_j' − m m').
 */
final class PenalizedObjective {
    private final BinLayout lay;
    private final int k;
    private final int k1;
    private final double[] pen;
    /** Fixed quadratic prior β'Qβ subtracted from Φ (raw K × K), or null. */
    private final double[] prior;

    // unit data
    // unit data
    private double[] counts; // null: sample mode
    private double total;
    private double total2;
    private final double[] linear;
    /** Sample mode: the per-observation local basis values and weights (for the empirical information). */
    private SampleData sample;

    // the last evaluation and its derivatives
    final double[] grad;
    final double[] hess;
    private final double[] fisher;
    private final double[] eta;
    final double[] ex;
    final double[] mass;
    final double[] mvec;
    private final double[] uj;
    /** Bins with a positive count (increasing; the first occupiedCount entries) and their log masses. */
    private final int[] occupied;
    private int occupiedCount;
    private final double[] logMass;
    private double zScaled;
    private double shift;
    private double loglik;
    /**
     * The last observed pass's sums (grad, mvec, hess) while {@link #passKept}: at this evaluation
     * and data; a fit resumed where the last one stopped needs the pass again at another λ (it does
     * not depend on λ). Cleared by every evaluation and change of the data.
     */
    private final double[] keptPass;
    private boolean passKept;
    /** The penalty (banded) and the prior (null without one), with their row sums at the last coefficients. */
    private final Kernels.RowSums penSums;
    private final Kernels.RowSums priorSums;

    /** With a fixed quadratic prior term β'Qβ (raw K × K, already weighted; null for none). */
    PenalizedObjective(BinLayout lay, double[] rawPenalty, double[] prior) {
        this.prior = prior;
        this.lay = lay;
        this.k = lay.k;
        this.k1 = k + 1;
        this.pen = rawPenalty;
        linear = new double[k1];
        grad = new double[k1];
        hess = new double[k1 * k1];
        keptPass = new double[k1 * (k1 + 2)];
        fisher = new double[k * k];
        eta = new double[lay.nodes];
        ex = new double[lay.nodes];
        mass = new double[lay.bins];
        mvec = new double[k1];
        uj = new double[k1];
        occupied = new int[lay.bins];
        logMass = new double[lay.bins];
        penSums = new Kernels.RowSums(rawPenalty, k);
        priorSums = prior == null ? null : new Kernels.RowSums(prior, k);
    }

    /** β'Pβ over the first K coefficients. */
    double penalty(double[] b) {
        return penSums.form(b);
    }

    /** β'Qβ of the prior (0 without one). */
    double priorPenalty(double[] b) {
        return prior == null ? 0.0 : priorSums.form(b);
    }

    /** Evaluates Φ at b, filling eta, ex, mass, zScaled, shift and loglik. */
    double evaluate(double[] b, double lambda) {
        final int nq = lay.nodes, w = lay.width;
        final double[] vals = lay.vals;
        final int[] first = lay.first;
        double max = Double.NEGATIVE_INFINITY;
        if (w == 4) {
            // cubic splines: the same sums in the same order, run by run of nodes that share their
            // four basis functions, so that the JIT vectorises across the nodes of a run
            final double[] c0 = lay.column[0], c1 = lay.column[1], c2 = lay.column[2], c3 = lay.column[3];
            final int[] runs = lay.runStart;
            for (int r = 0; r + 1 < runs.length; r++) {
                int q0 = runs[r], q1 = runs[r + 1], f = first[q0];
                double b0 = b[f], b1 = b[f + 1], b2 = b[f + 2], b3 = b[f + 3];
                for (int q = q0; q < q1; q++) {
                    double s = 0;
                    s += c0[q] * b0;
                    s += c1[q] * b1;
                    s += c2[q] * b2;
                    s += c3[q] * b3;
                    eta[q] = s;
                }
            }
            for (int q = 0; q < nq; q++) {
                double s = eta[q];
                max = s > max ? s : max;
            }
        } else {
            for (int q = 0; q < nq; q++) {
                int f = first[q], base = q * w;
                double s = 0;
                for (int i = 0; i < w; i++) {
                    s += vals[base + i] * b[f + i];
                }
                eta[q] = s;
                max = s > max ? s : max;
            }
        }
        final int[] start = lay.binStart;
        KernelPath.active().weightedExp(eta, 1.0, max, lay.weight, ex, nq);
        double z = 0;
        for (int j = 0; j < lay.bins; j++) {
            double s = 0;
            for (int q = start[j]; q < start[j + 1]; q++) {
                s += ex[q];
            }
            mass[j] = s;
            z += s;
        }
        double ll;
        if (counts != null) {
            double logZ = Math.log(z);
            ll = 0;
            if (KernelPath.active().lanes() == 1) {
                // the plain path as it was: this loop (an index list or a separate pass of
                // logarithms measured 4 % slower there)
                for (int j = 0; j < lay.bins; j++) {
                    double n = counts[j];
                    if (n > 0) {
                        ll += n * (Math.log(mass[j]) - logZ);
                    }
                }
            } else {
                final int[] occ = occupied;
                final double[] lm = logMass;
                KernelPath.active().logs(mass, occ, occupiedCount, lm);
                for (int i = 0; i < occupiedCount; i++) {
                    ll += counts[occ[i]] * (lm[i] - logZ);
                }
            }
        } else {
            double tb = 0;
            for (int i = 0; i < k; i++) {
                tb += linear[i] * b[i];
            }
            ll = tb - total * (max + Math.log(z));
        }
        return accept(z, max, ll, penalty(b), priorPenalty(b), lambda);
    }

    /**
     * Records an evaluation at b (Z and the shift of its exponentials, its log-likelihood ℓ) and
     * returns Φ(b) at λ from b'Pb and b'Qb ({@link #penalty}, {@link #priorPenalty}). {@link NewtonLanes}
     * calls it with a lane's values after writing the lane's exponentials and masses into
     * {@link #ex} and {@link #mass}.
     */
    double accept(double z, double shift, double ll, double pen, double priorPen, double lambda) {
        zScaled = z;
        this.shift = shift;
        loglik = ll;
        passKept = false;
        if (Double.isNaN(ll)) {
            ll = Double.NEGATIVE_INFINITY;
        }
        return ll - lambda * pen - priorPen;
    }

    /**
     * Φ at b at another λ, when the last {@link #evaluate} was at b for the current data: the value
     * {@link #evaluate} would return (the same expression), without the quadrature pass.
     */
    double objectiveAtLastEvaluation(double[] b, double lambda) {
        double ll = Double.isNaN(loglik) ? Double.NEGATIVE_INFINITY : loglik;
        return ll - lambda * penalty(b) - priorPenalty(b);
    }

    /** {@link BinLayout#countsLogLikelihood} of the counts at b (for reporting; {@link #evaluate} is the fast path). */
    double logLikelihoodPerBinShift(double[] b) {
        return lay.countsLogLikelihood(b, counts);
    }

    /**
     * Gradient of Φ and the information matrix (+ 2λP + 2Q) at the last evaluated point, which
     * must be beta, into grad and hess (stride k1); observed information, or the expected (Fisher)
     * one when {@code expected}; without the penalty and prior when not {@code penalised} (beta is
     * then not read). The lower triangle is the matrix (what the Cholesky factor reads); the upper
     * triangle holds only the penalty's band, except without the penalty, where hess is full
     * symmetric (for {@link #fisherInformation}).
     */
    void derivatives(double lambda, boolean expected, boolean penalised, double[] beta) {
        if (!expected && passKept) { // the observed pass at this evaluation is kept: its sums, not the pass again
            System.arraycopy(keptPass, 0, grad, 0, k1);
            System.arraycopy(keptPass, k1, mvec, 0, k1);
            System.arraycopy(keptPass, 2 * k1, hess, 0, k1 * k1);
            finishDerivatives(lambda, penalised, beta);
            return;
        }
        Arrays.fill(grad, 0.0);
        Arrays.fill(hess, 0.0);
        Arrays.fill(mvec, 0.0);
        final int w = lay.width;
        final double[] vals = lay.vals;
        final int[] first = lay.first;
        final int[] start = lay.binStart;
        final boolean[] oneSpan = lay.oneSpan;
        final double z = zScaled;
        final double nz = total / z;
        final boolean countsMode = counts != null;
        final boolean sTerm = !expected || !countsMode;
        // cubic splines: running sums, in registers, of the current knot span's terms (bins whose
        // nodes all lie in the span with first basis index fcur): its 4 × 4 block of the
        // information (second-moment and rank-one terms), its four gradient entries and its four
        // moments; added to hess, grad and mvec when the span changes (flushSpan). Accumulating
        // bin after bin in memory instead made every bin wait for the previous bin's stores.
        int fcur = -1;
        double h00 = 0, h10 = 0, h11 = 0, h20 = 0, h21 = 0, h22 = 0, h30 = 0, h31 = 0, h32 = 0, h33 = 0;
        double g0 = 0, g1 = 0, g2 = 0, g3 = 0, s0 = 0, s1 = 0, s2 = 0, s3 = 0;
        for (int j = 0; j < lay.bins; j++) {
            double a = mass[j];
            double nj = countsMode ? counts[j] : 0.0;
            double cj = nj > 0 ? nj / a : 0.0;
            double coefR = cj - nz; // r_q = e_q coefR
            int lo = lay.binLo[j], hi = lay.binHi[j];
            int q0 = start[j], q1 = start[j + 1];
            if (oneSpan[j]) {
                // a bin inside one knot span (most bins): the general loops below, with the bin's
                // four moments and the span's sums in registers (the 10-term second-moment block
                // repeats the one below on purpose: one loop for both measured 3–8 % slower)
                if (lo != fcur) {
                    if (fcur >= 0) {
                        flushSpan(fcur, g0, g1, g2, g3, s0, s1, s2, s3, h00, h10, h11, h20, h21, h22, h30, h31, h32,
                                h33);
                    }
                    fcur = lo;
                    h00 = h10 = h11 = h20 = h21 = h22 = h30 = h31 = h32 = h33 = 0;
                    g0 = g1 = g2 = g3 = s0 = s1 = s2 = s3 = 0;
                }
                double u0 = 0.0, u1 = 0.0, u2 = 0.0, u3 = 0.0;
                for (int q = q0; q < q1; q++) {
                    double e = ex[q];
                    int base = q << 2;
                    double v0 = vals[base], v1 = vals[base + 1], v2 = vals[base + 2], v3 = vals[base + 3];
                    u0 = Math.fma(e, v0, u0);
                    u1 = Math.fma(e, v1, u1);
                    u2 = Math.fma(e, v2, u2);
                    u3 = Math.fma(e, v3, u3);
                    if (sTerm) {
                        double m0 = -e * coefR * v0, m1 = -e * coefR * v1, m2 = -e * coefR * v2;
                        double m3 = -e * coefR * v3;
                        h00 = Math.fma(m0, v0, h00);
                        h10 = Math.fma(m1, v0, h10);
                        h11 = Math.fma(m1, v1, h11);
                        h20 = Math.fma(m2, v0, h20);
                        h21 = Math.fma(m2, v1, h21);
                        h22 = Math.fma(m2, v2, h22);
                        h30 = Math.fma(m3, v0, h30);
                        h31 = Math.fma(m3, v1, h31);
                        h32 = Math.fma(m3, v2, h32);
                        h33 = Math.fma(m3, v3, h33);
                    }
                }
                g0 = Math.fma(coefR, u0, g0);
                g1 = Math.fma(coefR, u1, g1);
                g2 = Math.fma(coefR, u2, g2);
                g3 = Math.fma(coefR, u3, g3);
                s0 += u0;
                s1 += u1;
                s2 += u2;
                s3 += u3;
                if (countsMode && (expected ? a > 0 : nj > 0)) {
                    double coef = expected ? total / (z * a) : nj / (a * a);
                    double c0 = coef * u0, c1 = coef * u1, c2 = coef * u2, c3 = coef * u3;
                    h00 = Math.fma(c0, u0, h00);
                    h10 = Math.fma(c1, u0, h10);
                    h11 = Math.fma(c1, u1, h11);
                    h20 = Math.fma(c2, u0, h20);
                    h21 = Math.fma(c2, u1, h21);
                    h22 = Math.fma(c2, u2, h22);
                    h30 = Math.fma(c3, u0, h30);
                    h31 = Math.fma(c3, u1, h31);
                    h32 = Math.fma(c3, u2, h32);
                    h33 = Math.fma(c3, u3, h33);
                }
                continue;
            }
            for (int i = lo; i < hi; i++) {
                uj[i] = 0.0; // a loop: Arrays.fill's call costs more than these four or five stores
            }
            if (w == 4) {
                for (int q = q0; q < q1; q++) {
                    double e = ex[q];
                    int f = first[q], base = q << 2;
                    double v0 = vals[base], v1 = vals[base + 1], v2 = vals[base + 2], v3 = vals[base + 3];
                    uj[f] = Math.fma(e, v0, uj[f]);
                    uj[f + 1] = Math.fma(e, v1, uj[f + 1]);
                    uj[f + 2] = Math.fma(e, v2, uj[f + 2]);
                    uj[f + 3] = Math.fma(e, v3, uj[f + 3]);
                    if (sTerm) {
                        if (f != fcur) {
                            if (fcur >= 0) {
                                flushSpan(fcur, g0, g1, g2, g3, s0, s1, s2, s3, h00, h10, h11, h20, h21, h22, h30,
                                        h31, h32, h33);
                            }
                            fcur = f;
                            h00 = h10 = h11 = h20 = h21 = h22 = h30 = h31 = h32 = h33 = 0;
                            g0 = g1 = g2 = g3 = s0 = s1 = s2 = s3 = 0;
                        }
                        double m0 = -e * coefR * v0, m1 = -e * coefR * v1, m2 = -e * coefR * v2;
                        double m3 = -e * coefR * v3;
                        h00 = Math.fma(m0, v0, h00);
                        h10 = Math.fma(m1, v0, h10);
                        h11 = Math.fma(m1, v1, h11);
                        h20 = Math.fma(m2, v0, h20);
                        h21 = Math.fma(m2, v1, h21);
                        h22 = Math.fma(m2, v2, h22);
                        h30 = Math.fma(m3, v0, h30);
                        h31 = Math.fma(m3, v1, h31);
                        h32 = Math.fma(m3, v2, h32);
                        h33 = Math.fma(m3, v3, h33);
                    }
                }
            } else {
                for (int q = q0; q < q1; q++) {
                    double e = ex[q];
                    if (e == 0.0) {
                        continue;
                    }
                    int f = first[q], base = q * w;
                    for (int i = 0; i < w; i++) {
                        uj[f + i] += e * vals[base + i];
                    }
                    if (sTerm) {
                        double mr = -e * coefR;
                        for (int i = 0; i < w; i++) {
                            double vi = mr * vals[base + i];
                            int row = (f + i) * k1 + f;
                            for (int l = 0; l <= i; l++) {
                                hess[row + l] += vi * vals[base + l];
                            }
                        }
                    }
                }
            }
            for (int i = lo; i < hi; i++) {
                grad[i] += coefR * uj[i];
                mvec[i] += uj[i];
            }
            boolean rank = countsMode && (expected ? a > 0 : nj > 0);
            if (rank) {
                double coef = expected ? total / (z * a) : nj / (a * a);
                for (int i = lo; i < hi; i++) {
                    double ui = coef * uj[i];
                    int row = i * k1;
                    for (int l = lo; l <= i; l++) {
                        hess[row + l] += ui * uj[l];
                    }
                }
            }
        }
        if (fcur >= 0) {
            flushSpan(fcur, g0, g1, g2, g3, s0, s1, s2, s3, h00, h10, h11, h20, h21, h22, h30, h31, h32, h33);
        }
        if (!expected) {
            System.arraycopy(grad, 0, keptPass, 0, k1);
            System.arraycopy(mvec, 0, keptPass, k1, k1);
            System.arraycopy(hess, 0, keptPass, 2 * k1, k1 * k1);
            passKept = true;
        }
        finishDerivatives(lambda, penalised, beta);
    }

    /**
     * The rest of {@link #derivatives} after its node pass (grad, hess and mvec hold the pass's
     * sums): the rank-one term, the sample's linear term, and the penalty and prior, or the mirror
     * of hess when not penalised. {@link NewtonLanes} calls it after copying a lane's pass in.
     */
    void finishDerivatives(double lambda, boolean penalised, double[] beta) {
        final double z = zScaled;
        EstimationSupport.subtractOuter(hess, k1, total / (z * z), mvec, k);
        for (int i = 0; i < k; i++) {
            grad[i] += linear[i];
        }
        if (!penalised) {
            EstimationSupport.mirrorLower(hess, k1, k);
            return;
        }
        if (prior != null) {
            priorSums.subtractTerm(1.0, beta, grad, hess, k1);
        }
        if (lambda != 0.0) {
            penSums.subtractTerm(lambda, beta, grad, hess, k1);
        }
    }

    /**
     * Adds a span's sums, from basis index f: its four gradient terms to grad, its four moments to
     * mvec and its 4 × 4 information block (lower triangle) to hess.
     */
    private void flushSpan(int f, double g0, double g1, double g2, double g3, double s0, double s1, double s2,
            double s3, double h00, double h10, double h11, double h20, double h21, double h22, double h30,
            double h31, double h32, double h33) {
        grad[f] += g0;
        grad[f + 1] += g1;
        grad[f + 2] += g2;
        grad[f + 3] += g3;
        BinLayout.addSpan(hess, mvec, k1, f, s0, s1, s2, s3, h00, h10, h11, h20, h21, h22, h30, h31, h32, h33);
    }

    /**
     * The unpenalised Fisher information F (K × K, row-major, into {@link #fisher}) at the last
     * evaluated point: expected multinomial information for counts, (Σw²/W) times the
     * observed information for samples.
     */
    void fisherInformation() {
        derivatives(0.0, true, false, null); // (the lanes: UnitLanes.fisherInformation, the same bits)
        double f = counts == null ? total2 / total : 1.0;
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                fisher[i * k + j] = f * hess[i * k1 + j];
            }
        }
    }

    /**
     * The empirical (model-robust) information of the counts at the last evaluated point:
     * with m_j = ∫_{bin j} φ e^η dP / A_j the within-bin mean of the raw functions,
     * M = Σ_j n_j m_j m_j' − t t'/N, t = Σ_j n_j m_j, i.e. N times the covariance of the per-event
     * scores m_{j(i)} − m over the observed events (centred at their own mean, which absorbs the
     * penalty gradient). Written into meat (K × K, row-major).
     */
    void empiricalInformation(double[] meat) {
        lay.empiricalInformation(ex, mass, counts, total, k, uj, mvec, meat);
    }

    // ---------------------------------------------------------------- state, owned here

    /** Counts mode: the unit's counts (not copied; not modified here) and total N, with Σw² = N and no sample. */
    void useCounts(double[] c, double n) {
        setCounts(c, n);
        total2 = n;
        Arrays.fill(linear, 0.0);
    }

    /**
     * Replaces the counts and the total only (the training part of a fold, or a unit of the
     * smoothing spline). The occupied bins (count &gt; 0) are read here, increasing, into
     * {@link #occupied}: the array must not change while it is in use.
     */
    void setCounts(double[] c, double n) {
        passKept = false;
        counts = c;
        total = n;
        int m = 0;
        if (counts != null) {
            for (int j = 0; j < lay.bins; j++) {
                if (counts[j] > 0) {
                    occupied[m++] = j;
                }
            }
        }
        occupiedCount = m;
    }

    /** Sample mode: the sample (its sufficient statistic copied) and the totals. */
    void useSample(SampleData s, double n, double n2) {
        passKept = false;
        counts = null;
        total = n;
        total2 = n2;
        System.arraycopy(s.linear, 0, linear, 0, k + 1);
        sample = s;
    }

    /** The empirical information of the sample ({@link SampleData#empiricalInformation}) into meat. */
    void empiricalInformationSample(double[] meat) {
        sample.empiricalInformation(k, total, total2, mvec, meat);
    }

    /** Replaces the sample statistic (K + 1 values, copied) and the totals (a fold's training part). */
    void setSampleStatistics(double[] lin, double n, double n2) {
        passKept = false;
        System.arraycopy(lin, 0, linear, 0, k + 1);
        total = n;
        total2 = n2;
    }

    /** Restores counts (may be null), totals and the sample statistic (copied) saved before a cross-validation. */
    void restoreData(double[] c, double n, double n2, double[] lin) {
        setCounts(c, n);
        total2 = n2;
        System.arraycopy(lin, 0, linear, 0, k + 1);
    }

    /** A fresh copy of the sample statistic (K + 1 values). */
    double[] sampleStatistics() {
        return linear.clone();
    }

    /** The current counts (null in sample mode); the array given to {@link #useCounts}, not to be modified. */
    double[] counts() {
        return counts;
    }

    boolean hasCounts() {
        return counts != null;
    }

    /** Whether a sample's per-observation arrays are set (for its empirical information). */
    boolean hasSample() {
        return sample != null;
    }

    /** Total weight N of the current data. */
    double total() {
        return total;
    }

    /** Σw² of the current data (N for counts). */
    double total2() {
        return total2;
    }

    /** The bin layout of the unit. */
    BinLayout bins() {
        return lay;
    }

    /** Z / e^shift of the last evaluation. */
    double zScaled() {
        return zScaled;
    }

    /** Bin mass A_j / e^shift of the last evaluation. */
    double mass(int j) {
        return mass[j];
    }

    /** The log-sum-exp shift of the last evaluation. */
    double shift() {
        return shift;
    }

    /** Log-likelihood at the last evaluated point. */
    double logLikelihood() {
        return loglik;
    }

    /** The K × K Fisher information of the last {@link #fisherInformation} (not a copy). */
    double[] fisher() {
        return fisher;
    }

    /** Trace of the K × K Fisher information (after {@link #fisherInformation}). */
    double fisherTrace() {
        return EstimationSupport.trace(fisher, k);
    }
}
