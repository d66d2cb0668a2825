package io.densa.core.internal;

/**
 * The density estimator's quadrature passes for several units at once, one unit in each lane of a
 * SIMD vector (eight doubles with AVX-512): the evaluation of the multinomial log-likelihood and
 * the node pass of its observed information, for cubic splines on a bin layout shared by the
 * units. Every lane performs the operations of the one-unit passes on the vector path in the same
 * order ({@code PenalizedObjective}'s loops, {@link KernelPath#weightedExp} and
 * {@link KernelPath#logs} of the vector path), so a unit gets the same bits in a lane as alone,
 * whatever the other lanes hold. Available only on the vector path ({@link #active()} is null
 * otherwise). Internal.
 *
 * <p>Arrays hold one value per lane side by side: entry x of lane l at {@code x · lanes() + l}.
 */
public abstract class UnitLanes {

    UnitLanes() {
    }

    /** The lanes of the active kernel path, or null when it is the scalar path. */
    public static UnitLanes active() {
        return KernelPath.active().unitLanes();
    }

    /** Units carried at once. */
    public abstract int lanes();

    /** Lane l of n entries of a lanes array a (stride lanes) into out[0..n). */
    public static void lane(double[] a, int lanes, int l, double[] out, int n) {
        for (int x = 0; x < n; x++) {
            out[x] = a[x * lanes + l];
        }
    }

    /** v[0..n) into lane l of the lanes array a (stride lanes). */
    public static void setLane(double[] v, int n, double[] a, int lanes, int l) {
        for (int x = 0; x < n; x++) {
            a[x * lanes + l] = v[x];
        }
    }

    /**
     * Lane l of a node pass ({@link #derivatives}: gradient, mvec and the band of the information)
     * into one unit's g, m and h (k1 × k1 row-major, zero outside the band).
     */
    public static void nodePassLane(double[] grad, double[] mvec, double[] hess, int[] bandLo, int k1, int lanes,
            int l, double[] g, double[] m, double[] h) {
        java.util.Arrays.fill(h, 0.0);
        for (int i = 0; i < k1; i++) {
            g[i] = grad[i * lanes + l];
            m[i] = mvec[i * lanes + l];
            int row = i * k1;
            for (int c = bandLo[i]; c <= i; c++) {
                h[row + c] = hess[(row + c) * lanes + l];
            }
        }
    }

    /** Whether v[0..n) equals lane l of the lanes array a (stride lanes), value for value. */
    public static boolean isLane(double[] v, int n, double[] a, int lanes, int l) {
        for (int x = 0; x < n; x++) {
            if (Double.doubleToLongBits(v[x]) != Double.doubleToLongBits(a[x * lanes + l])) {
                return false;
            }
        }
        return true;
    }

    /** Lane from of n entries of the lanes array src into lane to of dst (both stride lanes). */
    public static void copyLane(double[] src, int from, double[] dst, int to, int lanes, int n) {
        for (int x = 0; x < n; x++) {
            dst[x * lanes + to] = src[x * lanes + from];
        }
    }

    /**
     * A cubic-spline bin layout (the arrays of {@code BinLayout}, not copied).
     *
     * @param nodes    quadrature nodes
     * @param bins     bins
     * @param k1       raw basis functions
     * @param column   column[i][q]: the i-th nonzero basis function at node q (i &lt; 4)
     * @param runStart runs of nodes sharing their first basis index
     * @param first    first nonzero basis index at each node
     * @param weight   quadrature weight of each node
     * @param binStart first node of each bin (bins + 1 values)
     * @param binLo    first basis index touched by each bin
     * @param binHi    one past the last basis index touched by each bin
     * @param oneSpan  whether each bin lies inside one knot span
     * @param bandLo   the lowest column of each row of the information that a node pass touches
     *                 (its band: the passes write, and their callers read, row i from bandLo[i] to i)
     */
    public record Layout(int nodes, int bins, int k1, double[][] column, int[] runStart, int[] first,
            double[] weight, int[] binStart, int[] binLo, int[] binHi, boolean[] oneSpan, int[] bandLo) {
    }

    /**
     * Evaluates every lane at its coefficients: η at the nodes, the shift max η, the weighted
     * exponentials e_q, the bin masses A_j, Z = Σ A_j and ℓ = Σ_{n_j &gt; 0} n_j (ln A_j − ln Z)
     * (all of the shifted exponentials).
     *
     * @param beta   k1 coefficients per lane
     * @param counts counts per bin per lane
     * @param eta    scratch, nodes per lane
     * @param ex     out: e_q per lane
     * @param mass   out: A_j per lane
     * @param res    out: Z, shift and ℓ of lane l at l, lanes() + l and 2 lanes() + l
     */
    public abstract void evaluate(Layout lay, double[] beta, double[] counts, double[] eta, double[] ex,
            double[] mass, double[] res);

    /**
     * The node pass of the observed information and the gradient at the last evaluation of every
     * lane: the sums over bins and nodes before the rank-one term −(N/Z²) m m' and the penalty.
     *
     * @param totals N per lane
     * @param z      Z per lane (the evaluation's)
     * @param grad   out: k1 per lane (overwritten)
     * @param hess   out: k1 × k1 per lane, lower triangle (overwritten)
     * @param mvec   out: k1 per lane (overwritten)
     * @param uj     scratch, k1 per lane
     */
    public abstract void derivatives(Layout lay, double[] counts, double[] totals, double[] ex, double[] mass,
            double[] z, double[] grad, double[] hess, double[] mvec, double[] uj);

    /**
     * The node pass of the expected (Fisher) information at the last evaluation of every lane, as
     * {@link #derivatives} for the observed one: hess and mvec as the one-unit pass leaves them
     * before the rank-one term (grad is not computed).
     */
    public abstract void expectedInformation(Layout lay, double[] totals, double[] ex, double[] mass, double[] z,
            double[] hess, double[] mvec, double[] uj);

    /**
     * The empirical (model-robust) information of every lane's counts at its last evaluation, as
     * the one-unit {@code BinLayout.empiricalInformation} with the same operations in the same
     * order: M = Σ_j n_j m_j m_jᵀ − t tᵀ/N over the occupied bins (m_j the bin's mean of the raw
     * functions, t = Σ_j n_j m_j), K × K per lane (K = k1 − 1), both triangles.
     *
     * @param mvec scratch, k1 per lane
     * @param uj   scratch, k1 per lane
     * @param meat out: K × K per lane
     */
    public abstract void empiricalInformation(Layout lay, double[] counts, double[] totals, double[] ex,
            double[] mass, double[] mvec, double[] uj, double[] meat);

    /**
     * The rest of the penalised derivatives after the observed-information node pass (as the
     * one-unit objective's {@code finishDerivatives} for counts, per lane with the same operations
     * in the same order): the Newton matrix's lower triangle (the pass's band, zero outside it,
     * minus c m_i m_j, plus 2Q, plus 2λP where those rows have entries) into factor (stride k1), and
     * the penalised gradient g_i + 0 − 2 (Qβ)_i − 2λ (Pβ)_i, i &lt; k, into rhs.
     *
     * @param bandLo    lowest column of row i the pass touches
     * @param grad      the pass's gradient, hess its information (band), mvec its moments (per lane)
     * @param c         per lane N / Z² (the rank-one term's factor)
     * @param beta      per lane β (the coefficients the pass is at)
     * @param prior     the prior Q (K × K, one for all lanes) or null; priorRows its rows' column ranges
     * @param pen       the penalty P (K × K), penRows its rows' column ranges
     * @param twoLambda per lane 2λ (no lane with λ = 0: there the one-unit code skips the penalty)
     */
    public abstract void finishDerivatives(int k, int k1, int[] bandLo, double[] grad, double[] hess,
            double[] mvec, double[] c, double[] beta, double[] prior, int[] priorRows, double[] pen, int[] penRows,
            double[] twoLambda, double[] factor, double[] rhs);

    /**
     * The Fisher information F and the penalised information J of every lane after the
     * expected-information node pass, with the operations of the one-unit code in the same order
     * ({@code PenalizedObjective.fisherInformation} for counts, then {@code NewtonCovariance}'s
     * J): F_ij = h_ij − (c m_i) m_j on the lower triangle (h zero outside the pass's band), c =
     * N/Z², mirrored; J_ij = ((F_ij + 2λ P_ij) + 2 Q_ij) + 0 (Q's term 0 without a prior). Both
     * n × n per lane, n = k1 − 1.
     *
     * @param hess      the pass's band (k1 × k1 per lane), mvec its moments (k1 per lane)
     * @param twoLambda per lane 2λ
     * @param pen       the penalty P (n × n, one for all lanes); prior Q likewise, or null
     */
    public abstract void fisherInformation(int k1, int[] bandLo, double[] hess, double[] mvec, double[] totals,
            double[] z, double[] twoLambda, double[] pen, double[] prior, double[] fisher, double[] j);

    /**
     * The sandwich's meat of every lane: M·scale where scale is finite (the robust meat M, scaled
     * by N/(N − edf)), else F (n × n per lane; meat overwritten).
     */
    public abstract void meat(int n, double[] meat, double[] fisher, double[] scale);

    /**
     * Starting coefficients of every lane, as the one-unit {@code BinLayout.start} (the same
     * operations in the same order): β_i = c_i + Σ_j M_ij l_j, summed over the bins in order, and
     * β_K = 0.
     *
     * @param map      M, K × D row-major (one for all lanes); constant c (K values)
     * @param logs     l_j = log(n_j + 1/2), D per lane
     * @param beta     out: K + 1 per lane
     */
    public abstract void start(double[] map, double[] constant, int k, double[] logs, double[] beta);

    /**
     * ‖U v‖∞ of every lane's first K entries of v into out[o + l], with the operations of the
     * one-unit {@code EstimationSupport.coordinateNorm} in the same order (U: K × K upper
     * triangular, row-major, one for all lanes).
     */
    public abstract void coordinateNorm(double[] u, int k, double[] v, double[] out, int o);

    /**
     * b'Mb of every lane's first K coefficients into out[o + l], as {@link Kernels.RowSums#form} (the
     * same operations in the same order: each row's sum over its columns rows[2i] … rows[2i+1] − 1).
     */
    public abstract void quadraticForm(double[] m, int[] rows, int k, double[] b, double[] out, int o);

    /**
     * {@link Cholesky#factor} of every lane's matrix (n × n, row stride s, lower triangle read and
     * overwritten), with the same operations in the same order per lane. A lane whose pivot fails
     * gets its column in {@code failed} (−1 where the factor is complete) and a meaningless matrix.
     */
    public abstract void cholesky(double[] a, int n, int s, double minRelativePivot, int[] failed);

    /**
     * Solves L Lᵀ x = b for every lane in place (b in x, {@code x[i·L + l]}), L the lower factor
     * {@link #cholesky} left in a (row stride s): the same operations in the same order as
     * {@link Cholesky#solve} on each lane, so the same bits.
     */
    public abstract void solve(double[] a, int n, int s, double[] x);

    /**
     * The first half of the sandwich covariance of every lane ({@code NewtonCovariance.sandwich},
     * the same operations in the same order): the Cholesky factor L of J (n × n, overwritten; a lane
     * whose factorisation fails gets its column in {@code failed}, else −1), L⁻¹ into linv,
     * L⁻¹F into t1 and edf = tr(L⁻¹FL⁻ᵀ).
     */
    public abstract void covarianceStart(int n, double[] j, double[] fisher, double[] linv, double[] t1,
            double[] edf, int[] failed);

    /**
     * The second half: W = L⁻¹ M L⁻ᵀ for each lane's meat M, then cov = (U L⁻ᵀ) W (U L⁻ᵀ)ᵀ with the
     * coordinate map U (n × n upper triangular, shared by the lanes, one value per entry).
     */
    public abstract void covarianceFinish(int n, double[] linv, double[] meat, double[] u, double[] t1,
            double[] wm, double[] m, double[] t2, double[] cov);
}
