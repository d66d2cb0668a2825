package io.densa.core.estimate;

import io.densa.core.BayesSpace;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.GaussLegendre;
import io.densa.core.internal.RawBasis;
import java.util.Arrays;

/**
 * Quadrature of a space's raw basis over a set of bins, prepared once and shared by every unit
 * with those bin edges. Internal.
 *
 * <p>Each bin [e_j, e_{j+1}] is cut at the basis breakpoints inside it and further into pieces no
 * wider than (b − a)/64; each piece carries an m-point Gauss–Legendre rule (m given, or, when 0
 * is given, 3 points for pieces at most (b − a)/200 wide and 4 otherwise: for a log-density whose
 * derivatives are of order 1/s, the 3-point rule's relative error on such a piece is of order
 * (η/(400 s))⁶, below 10⁻¹⁰ for s ≥ η/40). For node q the layout
 * stores the weight w_q = (GL weight) × (Lebesgue density of the reference P at x_q), so that
 * Σ_{q ∈ bin j} w_q exp(η(x_q)) ≈ ∫_{bin j} exp(η) dP, and the W = support-width raw basis values
 * that may be nonzero at x_q with the index of the first (local support of B-splines). Raw index
 * K (the basis function the space drops) is a sink: its coefficient is held at 0.
 *
 * <p>On a periodic space the edges e_0 &lt; … &lt; e_m span one period (e_m − e_0 = P) and may start
 * anywhere: they are shifted by a whole number of periods so that e_0 lies in [a, b), a bin that
 * reaches past b is cut at the knots shifted by P as well, and every node is evaluated modulo P
 * (the raw basis and the reference wrap), so a bin may wrap around the cut point a.
 */
final class BinLayout {
    private static final int MAX_PIECE_FRACTION = 64;

    final int bins;
    final boolean periodic;
    final int nodes;
    final int width;
    final int k;
    final double[] edges;
    final int[] binStart; // bins + 1
    final double[] weight; // nodes
    final double[] x; // nodes
    final int[] first; // nodes
    final double[] vals; // nodes × width
    final int[] binLo; // first raw index touched by bin j
    final int[] binHi; // one past the last raw index touched by bin j
    /**
     * Runs of consecutive nodes with the same first index: run r holds the nodes runStart[r] to
     * runStart[r + 1] − 1 (runs + 1 values).
     */
    final int[] runStart;
    /** The basis values column by column: column[i][q] = vals[q · width + i]. */
    final double[][] column;
    /**
     * Whether bin j lies inside one knot span of a cubic spline basis: width 4, binHi − binLo = 4
     * and every node with first index binLo (the bins whose four moments the passes keep in
     * registers).
     */
    final boolean[] oneSpan;

    /**
     * @param space  the space
     * @param edges  validated edges inside [a, b], strictly increasing, at least 2
     * @param points Gauss–Legendre points per piece, or 0 for automatic
     */
    BinLayout(BayesSpace space, double[] edges, int points) {
        RawBasis basis = EstimationSupport.rawBasis(space.basis());
        this.periodic = space.isPeriodic();
        edges = edges.clone();
        double[] br = basis.knotsView();
        if (periodic) {
            double period = space.period();
            double shift = basis.wrap(edges[0]) - edges[0];
            for (int i = 0; i < edges.length; i++) {
                edges[i] += shift;
            }
            double[] twice = Arrays.copyOf(br, 2 * br.length - 1); // the knots, then again one period on
            for (int i = 1; i < br.length; i++) {
                twice[br.length - 1 + i] = br[i] + period;
            }
            br = twice;
        }
        this.edges = edges;
        this.bins = edges.length - 1;
        this.k = space.dimension();
        this.width = basis.supportWidth();
        double narrow = (space.upper() - space.lower()) / 200;
        double[][] gxs = new double[17][];
        double[][] gws = new double[17][];
        for (int m = 2; m <= 16; m++) {
            gxs[m] = GaussLegendre.nodes(m);
            gws[m] = GaussLegendre.weights(m);
        }
        double maxPiece = (space.upper() - space.lower()) / MAX_PIECE_FRACTION;
        // count pieces
        int total = 0;
        double[] cuts = new double[br.length + 2];
        for (int j = 0; j < bins; j++) {
            int nc = cutsOf(edges[j], edges[j + 1], br, cuts);
            int pc = 0;
            for (int c = 0; c + 1 < nc; c++) {
                int sub = Math.max(1, (int) Math.ceil((cuts[c + 1] - cuts[c]) / maxPiece - 1e-9));
                pc += sub * pointsFor((cuts[c + 1] - cuts[c]) / sub, points, narrow);
            }
            total += pc;
        }
        nodes = total;
        binStart = new int[bins + 1];
        weight = new double[nodes];
        x = new double[nodes];
        first = new int[nodes];
        vals = new double[nodes * width];
        binLo = new int[bins];
        binHi = new int[bins];
        double[] scratch = new double[basis.scratchSize()];
        int q = 0;
        for (int j = 0; j < bins; j++) {
            binStart[j] = q;
            int nc = cutsOf(edges[j], edges[j + 1], br, cuts);
            int lo = Integer.MAX_VALUE, hi = 0;
            for (int c = 0; c + 1 < nc; c++) {
                double u = cuts[c], v = cuts[c + 1];
                int sub = Math.max(1, (int) Math.ceil((v - u) / maxPiece - 1e-9));
                for (int s = 0; s < sub; s++) {
                    double pu = s == 0 ? u : u + (v - u) * s / sub;
                    double pv = s == sub - 1 ? v : u + (v - u) * (s + 1) / sub;
                    double h = 0.5 * (pv - pu), mid = 0.5 * (pu + pv);
                    int m = pointsFor((v - u) / sub, points, narrow);
                    double[] gx = gxs[m], gw = gws[m];
                    for (int i = 0; i < m; i++) {
                        double xq = mid + h * gx[i];
                        x[q] = xq;
                        weight[q] = h * gw[i] * space.referenceDensity(xq);
                        int f = basis.evalLocal(xq, scratch);
                        first[q] = f;
                        for (int w = 0; w < width; w++) {
                            vals[q * width + w] = f + w < k ? scratch[w] : 0.0;
                        }
                        lo = Math.min(lo, f);
                        hi = Math.max(hi, Math.min(f + width, k + 1));
                        q++;
                    }
                }
            }
            binLo[j] = lo;
            binHi[j] = hi;
        }
        binStart[bins] = q;
        int runs = 0;
        for (int n = 0; n < nodes; n++) {
            runs += n == 0 || first[n] != first[n - 1] ? 1 : 0;
        }
        runStart = new int[runs + 1];
        for (int n = 0, r = 0; n < nodes; n++) {
            if (n == 0 || first[n] != first[n - 1]) {
                runStart[r++] = n;
            }
        }
        runStart[runs] = nodes;
        column = new double[width][nodes];
        for (int n = 0; n < nodes; n++) {
            for (int i = 0; i < width; i++) {
                column[i][n] = vals[n * width + i];
            }
        }
        oneSpan = new boolean[bins];
        for (int j = 0; j < bins; j++) {
            int lo = binLo[j], q0 = binStart[j], q1 = binStart[j + 1];
            oneSpan[j] = width == 4 && binHi[j] - lo == 4 && q1 > q0 && first[q0] == lo && first[q1 - 1] == lo;
        }
    }

    /** A view of base's nodes with merged bins (see {@link #merged}). */
    private BinLayout(BinLayout base, double[] cellEdges, int[] cellStart) {
        periodic = base.periodic;
        nodes = base.nodes;
        width = base.width;
        k = base.k;
        weight = base.weight;
        x = base.x;
        first = base.first;
        vals = base.vals;
        runStart = base.runStart;
        column = base.column;
        edges = cellEdges;
        bins = cellEdges.length - 1;
        binStart = new int[bins + 1];
        binLo = new int[bins];
        binHi = new int[bins];
        oneSpan = new boolean[bins];
        for (int c = 0; c < bins; c++) {
            int b0 = cellStart[c], b1 = cellStart[c + 1];
            binStart[c] = base.binStart[b0];
            int lo = Integer.MAX_VALUE, hi = 0;
            for (int j = b0; j < b1; j++) {
                lo = Math.min(lo, base.binLo[j]);
                hi = Math.max(hi, base.binHi[j]);
            }
            binLo[c] = lo;
            binHi[c] = hi;
            int q0 = base.binStart[b0], q1 = base.binStart[b1];
            oneSpan[c] = width == 4 && hi - lo == 4 && q1 > q0 && first[q0] == lo && first[q1 - 1] == lo;
        }
        binStart[bins] = base.binStart[cellStart[bins]];
    }

    /**
     * The same nodes with bins 0..lo merged into one cell (lo ≥ 0) and bins hi..D−1 into one
     * (hi &lt; D): the quadrature of a merged cell is the sum of its bins' rules. cellEdges: the
     * cells' edges (the outer ones of merged cells at the layout's own ends).
     */
    BinLayout merged(int lo, int hi, double[] cellEdges) {
        int from = Math.max(lo, 0);
        int to = Math.min(hi, bins - 1);
        int[] cellStart = new int[to - from + 2];
        for (int c = 1; c <= to - from; c++) {
            cellStart[c] = from + c;
        }
        cellStart[to - from + 1] = bins;
        return new BinLayout(this, cellEdges, cellStart);
    }

    /**
     * K × D map (row-major) from log(n_j + 1/2) to starting raw coefficients, with the constant
     * part for the bin widths and reference into constOut: the raw-coefficient part of the
     * least-squares fit of [1, φ(x_j)] to the log heights with penalty 10⁻³ tr(X'X)/tr(P) · P.
     */
    double[] startMap(BayesSpace space, RawBasis raw, double[] rawPenalty, double[] constOut) {
        int d = bins, p = k + 1;
        double[] x = new double[d * p];
        double[] off = new double[d];
        double[] row = new double[k];
        for (int j = 0; j < d; j++) {
            double mid = 0.5 * (edges[j] + edges[j + 1]);
            raw.evalDense(mid, row);
            x[j * p] = 1.0;
            System.arraycopy(row, 0, x, j * p + 1, k);
            off[j] = -Math.log((edges[j + 1] - edges[j]) * space.referenceDensity(mid));
        }
        double[] a = EstimationSupport.crossProduct(x, d, p);
        double trX = EstimationSupport.trace(a, p), trP = EstimationSupport.trace(rawPenalty, k);
        double mu = trP > 0 ? 1e-3 * trX / trP : 0.0;
        for (int r = 0; r < k; r++) {
            for (int c = 0; c < k; c++) {
                a[(r + 1) * p + c + 1] += mu * rawPenalty[r * k + c];
            }
        }
        for (int r = 0; r < p; r++) {
            a[r * p + r] += 1e-9 * trX / p;
        }
        if (Cholesky.factor(a, p, p, 0) >= 0) {
            return null; // zero start
        }
        double[] map = new double[k * d];
        double[] col = new double[p];
        for (int j = 0; j < d; j++) {
            System.arraycopy(x, j * p, col, 0, p);
            Cholesky.solve(a, p, p, col, 0);
            for (int i = 0; i < k; i++) {
                map[i * d + j] = col[i + 1];
                constOut[i] += col[i + 1] * off[j];
            }
        }
        return map;
    }

    private static int pointsFor(double width, int points, double narrow) {
        return points > 0 ? points : width <= narrow ? 3 : 4;
    }

    /** Breakpoints of the basis strictly inside (u, v), with u and v, into cuts; returns count. */
    private static int cutsOf(double u, double v, double[] br, double[] cuts) {
        int n = 0;
        cuts[n++] = u;
        for (double t : br) {
            if (t > u && t < v) {
                cuts[n++] = t;
            }
        }
        cuts[n++] = v;
        return n;
    }

    /**
     * The multinomial log-likelihood Σ_j n_j log(A_j / Z) of the counts at b, with a log-sum-exp
     * shift per bin instead of one for the whole domain: finite whenever η is, also where a bin's
     * mass underflows relative to the largest (raw coefficients b, K + 1 values; counts per bin).
     */
    double countsLogLikelihood(double[] b, double[] counts) {
        final int w = width;
        final double[] wt = weight;
        double[] eta = new double[nodes];
        double[] logA = new double[bins];
        double top = Double.NEGATIVE_INFINITY;
        for (int j = 0; j < bins; j++) {
            int q0 = binStart[j], q1 = binStart[j + 1];
            double m = Double.NEGATIVE_INFINITY;
            for (int q = q0; q < q1; q++) {
                double s = 0;
                for (int i = 0; i < w; i++) {
                    s += vals[q * w + i] * b[first[q] + i];
                }
                eta[q] = s;
                m = Math.max(m, s);
            }
            double sum = 0;
            for (int q = q0; q < q1; q++) {
                sum += wt[q] * Math.exp(eta[q] - m);
            }
            logA[j] = m + Math.log(sum);
            top = Math.max(top, logA[j]);
        }
        double z = 0;
        for (int j = 0; j < bins; j++) {
            z += Math.exp(logA[j] - top);
        }
        double logZ = top + Math.log(z);
        double ll = 0;
        for (int j = 0; j < bins; j++) {
            if (counts[j] > 0) {
                ll += counts[j] * (logA[j] - logZ);
            }
        }
        return ll;
    }

    /**
     * The empirical (model-robust) information of counts at evaluated node weights ex and bin
     * masses (see {@link PenalizedObjective#empiricalInformation}); uj and mvec are scratch (K + 1).
     */
    void empiricalInformation(double[] ex, double[] mass, double[] counts, double total, int k, double[] uj,
            double[] mvec, double[] meat) {
        Arrays.fill(meat, 0.0);
        Arrays.fill(mvec, 0.0);
        final int w = width;
        final int[] start = binStart;
        // one-span bins: the span's sums in registers, added once per span (as in the derivative pass)
        int fcur = -1;
        double s0 = 0, s1 = 0, s2 = 0, s3 = 0;
        double h00 = 0, h10 = 0, h11 = 0, h20 = 0, h21 = 0, h22 = 0, h30 = 0, h31 = 0, h32 = 0, h33 = 0;
        for (int j = 0; j < bins; j++) {
            double nj = counts[j];
            int lo = binLo[j], hi = Math.min(binHi[j], k);
            int q0 = start[j], q1 = start[j + 1];
            if (oneSpan[j] && lo + 4 <= k) {
                // a bin inside one knot span: the loops below with its four moments and the span's
                // sums in registers (the ten-term block repeats the derivative pass's on purpose: a
                // shared helper would have to return the ten sums through memory). The sums are
                // added where the layout's span changes, occupied bin or not (adding a span without
                // events adds zeros), so that the lanes (UnitLanes#empiricalInformation) add in this order
                if (lo != fcur) {
                    if (fcur >= 0) {
                        addSpan(meat, mvec, k, fcur, s0, s1, s2, s3, h00, h10, h11, h20, h21, h22, h30, h31, h32, h33);
                    }
                    fcur = lo;
                    s0 = s1 = s2 = s3 = 0;
                    h00 = h10 = h11 = h20 = h21 = h22 = h30 = h31 = h32 = h33 = 0;
                }
                if (!(nj > 0)) {
                    continue;
                }
                double u0 = 0.0, u1 = 0.0, u2 = 0.0, u3 = 0.0;
                for (int q = q0; q < q1; q++) {
                    double e = ex[q];
                    int base = q << 2;
                    u0 += e * vals[base];
                    u1 += e * vals[base + 1];
                    u2 += e * vals[base + 2];
                    u3 += e * vals[base + 3];
                }
                double inv = 1.0 / mass[j];
                u0 *= inv;
                u1 *= inv;
                u2 *= inv;
                u3 *= inv;
                double c0 = nj * u0, c1 = nj * u1, c2 = nj * u2, c3 = nj * u3;
                s0 += c0;
                s1 += c1;
                s2 += c2;
                s3 += c3;
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
                continue;
            }
            if (!(nj > 0)) {
                continue;
            }
            Arrays.fill(uj, lo, hi, 0.0);
            for (int q = q0; q < q1; q++) {
                double e = ex[q];
                int f = first[q], base = q * w;
                for (int i = 0; i < w && f + i < k; i++) {
                    uj[f + i] += e * vals[base + i];
                }
            }
            double inv = 1.0 / mass[j];
            for (int i = lo; i < hi; i++) {
                uj[i] *= inv;
                mvec[i] += nj * uj[i];
            }
            for (int i = lo; i < hi; i++) {
                double ui = nj * uj[i];
                int row = i * k;
                for (int l = lo; l <= i; l++) {
                    meat[row + l] += ui * uj[l];
                }
            }
        }
        if (fcur >= 0) {
            addSpan(meat, mvec, k, fcur, s0, s1, s2, s3, h00, h10, h11, h20, h21, h22, h30, h31, h32, h33);
        }
        EstimationSupport.subtractOuter(meat, k, 1.0 / total, mvec, k);
        EstimationSupport.mirrorLower(meat, k, k);
    }

    /** Adds a span's four moment sums to m and its 4 × 4 block (lower triangle) to a (stride s), from index f. */
    static void addSpan(double[] a, double[] m, int s, int f, double s0, double s1, double s2, double s3,
            double h00, double h10, double h11, double h20, double h21, double h22, double h30, double h31,
            double h32, double h33) {
        m[f] += s0;
        m[f + 1] += s1;
        m[f + 2] += s2;
        m[f + 3] += s3;
        int r0 = f * s + f, r1 = r0 + s, r2 = r1 + s, r3 = r2 + s;
        a[r0] += h00;
        a[r1] += h10;
        a[r1 + 1] += h11;
        a[r2] += h20;
        a[r2 + 1] += h21;
        a[r2 + 2] += h22;
        a[r3] += h30;
        a[r3 + 1] += h31;
        a[r3 + 2] += h32;
        a[r3 + 3] += h33;
    }


    /** The arrays the passes of {@link io.densa.core.internal.UnitLanes} read (cubic splines: width 4). */
    io.densa.core.internal.UnitLanes.Layout lanes() {
        int[] bandLo = new int[k + 1];
        for (int i = 0; i <= k; i++) {
            bandLo[i] = i;
        }
        for (int j = 0; j < bins; j++) {
            for (int i = binLo[j]; i < binHi[j]; i++) {
                bandLo[i] = Math.min(bandLo[i], binLo[j]);
            }
        }
        for (int q = 0; q < nodes; q++) {
            for (int i = first[q]; i < first[q] + 4; i++) {
                bandLo[i] = Math.min(bandLo[i], first[q]);
            }
        }
        return new io.densa.core.internal.UnitLanes.Layout(nodes, bins, k + 1, column, runStart, first, weight,
                binStart, binLo, binHi, oneSpan, bandLo);
    }

    /**
     * Starting coefficients from counts (d bins): β = c + M log(n + 1/2), M (K × d) and c the
     * start map and constant of {@link #startMap}, into beta (K + 1 values, β_K = 0); logs is
     * scratch of d values.
     */
    static void start(double[] counts, double[] map, double[] constant, int k, double[] logs, double[] beta) {
        int d = logs.length;
        for (int j = 0; j < d; j++) {
            logs[j] = logHalf(counts[j]);
        }
        // four coefficients at a time, each summed in registers over the bins in order (the same
        // sums as bin by bin into β, without a store and reload per bin)
        int i = 0;
        for (; i + 3 < k; i += 4) {
            int o0 = i * d, o1 = o0 + d, o2 = o1 + d, o3 = o2 + d;
            double b0 = constant[i], b1 = constant[i + 1], b2 = constant[i + 2], b3 = constant[i + 3];
            for (int j = 0; j < d; j++) {
                double lj = logs[j];
                b0 += map[o0 + j] * lj;
                b1 += map[o1 + j] * lj;
                b2 += map[o2 + j] * lj;
                b3 += map[o3 + j] * lj;
            }
            beta[i] = b0;
            beta[i + 1] = b1;
            beta[i + 2] = b2;
            beta[i + 3] = b3;
        }
        for (; i < k; i++) {
            double b = constant[i];
            for (int j = 0, o = i * d; j < d; j++) {
                b += map[o + j] * logs[j];
            }
            beta[i] = b;
        }
        beta[k] = 0.0;
    }

    /** log(n + 1/2), the start's transform of a count. */
    static double logHalf(double n) {
        int c = (int) n;
        return c == n && c >= 0 && c < LOG_HALF.length ? LOG_HALF[c] : Math.log(n + 0.5);
    }

    /** log(n + 1/2) for the counts n = 0 … 4095 (the same values as computing them each time). */
    private static final double[] LOG_HALF = new double[4096];

    static {
        for (int n = 0; n < LOG_HALF.length; n++) {
            LOG_HALF[n] = Math.log(n + 0.5);
        }
    }
}
