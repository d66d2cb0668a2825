package io.densa.core.estimate;

import io.densa.core.Basis;
import io.densa.core.BayesSpace;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.RawBasis;

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
        if (ids == null) {
            return;
        }
        if (ids.length != n) {
            throw new IllegalArgumentException("ids has " + ids.length + " entries for " + n + " units");
        }
        for (int i = 0; i < n; i++) {
            if (ids[i] == null) {
                throw new IllegalArgumentException("id of unit row " + i + " is null; give every unit an id or pass"
                        + " ids = null (rows are then named #0, #1, …)");
            }
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
        if (space.isPeriodic()) {
            return checkCircularEdges(space, edges);
        }
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

    /**
     * Edges on a circle: finite, strictly increasing, spanning one period (e_m − e_0 = P within a
     * relative 1e-12), starting anywhere; a copy.
     */
    private static double[] checkCircularEdges(BayesSpace space, double[] edges) {
        double period = space.period();
        for (int i = 0; i < edges.length; i++) {
            double e = edges[i];
            if (!Double.isFinite(e)) {
                throw new IllegalArgumentException("bin edge " + i + " = " + e + " is not finite; edges on the circle of "
                        + space + " must be finite");
            }
            if (i > 0 && !(e > edges[i - 1])) {
                throw new IllegalArgumentException("bin edges must be strictly increasing: edge " + i + " = " + e
                        + " does not exceed edge " + (i - 1) + " = " + edges[i - 1]);
            }
        }
        double span = edges[edges.length - 1] - edges[0];
        if (!(Math.abs(span - period) <= 1e-12 * period)) {
            throw new IllegalArgumentException("bin edges " + edges[0] + " … " + edges[edges.length - 1] + " span "
                    + span + ", but on the circle of " + space + " they must span exactly one period " + period
                    + " (e.g. " + edges[0] + " … " + (edges[0] + period) + "; the last bin may wrap around the cut point "
                    + space.lower() + ")");
        }
        return edges.clone();
    }

    static String bin(double[] edges, int j) {
        return "bin " + j + " [" + edges[j] + ", " + edges[j + 1] + ")";
    }

    /**
     * Largest accepted total count (or total weight of a sample): 2⁵³ ≈ 9.0·10¹⁵. Beyond it a double
     * cannot tell N events from N + 1, and the log-likelihood and the criteria, sums of terms of
     * order N log N, lose every digit (at N near 10³⁰⁸ they overflow).
     */
    static final double MAX_TOTAL = 0x1p53;

    /** Rejects a total above {@link #MAX_TOTAL} (or an overflowing sum), naming the unit. */
    static void checkTotalRange(double total, String unit, String what) {
        if (!(total <= MAX_TOTAL)) {
            throw new IllegalArgumentException(unit + ": " + what + " " + total + " is too large; the total must be"
                    + " at most 2^53 = " + MAX_TOTAL + " (rescale the weights or counts)");
        }
    }

    /** Validates a row of counts (total at most {@link #MAX_TOTAL}); returns the total. */
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
        checkTotalRange(n, unit, "total count");
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

    /** The raw functions of a basis, rebuilt from its public description. */
    static RawBasis rawBasis(Basis b) {
        switch (b.kind()) {
            case SPLINE:
                return RawBasis.spline(b.order(), b.breakpoints());
            case POLYNOMIAL: {
                double[] ab = b.breakpoints();
                return RawBasis.polynomial(b.order(), ab[0], ab[1]);
            }
            case PERIODIC_SPLINE:
                return RawBasis.periodicSpline(b.order(), b.breakpoints());
            case FOURIER: {
                double[] ab = b.breakpoints();
                return RawBasis.fourier(b.order(), ab[0], ab[1]);
            }
            default:
                return RawBasis.step(b.breakpoints());
        }
    }

    /** U = (T')⁻¹, upper triangular, so that coordinates c = U b for raw coefficients b. */
    static double[] upperU(double[] t, int k) {
        // T' is upper triangular with (T')_ij = T_ji; invert column by column
        double[] u = new double[k * k];
        Cholesky.invertUpper(t, k, 1, k, u);
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

    /** The diagonal covariance v·I, K × K row-major. */
    static double[] diagonalCovariance(int k, double v) {
        double[] c = new double[k * k];
        for (int i = 0; i < k; i++) {
            c[i * k + i] = v;
        }
        return c;
    }

    /** XᵀX (p × p, row-major) of a row-major n × p matrix X, accumulated row by row. */
    static double[] crossProduct(double[] x, int n, int p) {
        double[] a = new double[p * p];
        for (int j = 0; j < n; j++) {
            for (int r = 0; r < p; r++) {
                double xr = x[j * p + r];
                for (int c = 0; c < p; c++) {
                    a[r * p + c] += xr * x[j * p + c];
                }
            }
        }
        return a;
    }

    static double trace(double[] m, int k) {
        double s = 0;
        for (int i = 0; i < k; i++) {
            s += m[i * k + i];
        }
        return s;
    }

    /** η(x_q) = φ(x_q)·β at node q of a layout (β of length K + 1, β[K] = 0). */
    private static double eta(BinLayout lay, int q, double[] beta) {
        int w = lay.width, f = lay.first[q], base = q * w;
        double s = 0;
        for (int i = 0; i < w; i++) {
            s += lay.vals[base + i] * beta[f + i];
        }
        return s;
    }

    /**
     * Share of the squared B2 norm of an estimate that lies deeper than its data can tell apart
     * (see {@link EstimationDiagnostics#extrapolationShare()}): with clr = φ·β − m (m the P-mean of
     * φ·β over the domain) and Z = ∫ e^{clr} dP, for each of the two extrapolated regions E (the
     * domain below the first bin with events, and above the last one) of reference mass P_E, the
     * detection level c* = log(Z / (N P_E)), at which a constant clr would give the region one
     * expected event,
     * <pre>
     *   share = Σ_E ∫_E (c* − clr)₊² dP / ‖c‖²,
     * </pre>
     * clamped to [0, 1]; 0 for the reference density (‖c‖ = 0). Integrals by the layouts'
     * quadrature (the domain layout's nodes outside the bins).
     *
     * @param domain layout of [a, b] (one bin)
     * @param bins   layout of the bins
     * @param first  first bin with events
     * @param last   last bin with events
     * @param beta   raw coefficients, length K + 1
     * @param normSq ‖c‖² of the estimate
     * @param total  number of events N (or total weight), &gt; 0
     */
    static double extrapolationShare(BinLayout domain, BinLayout bins, int first, int last, double[] beta,
            double normSq, double total) {
        if (!(normSq > 0)) {
            return 0.0;
        }
        int nq = domain.nodes;
        double lo = bins.edges[0], hi = bins.edges[bins.edges.length - 1];
        double[] sideMass = new double[2];
        for (int side = 0; side < 2; side++) {
            int b0 = side == 0 ? 0 : last + 1;
            int b1 = side == 0 ? first : bins.bins; // bins [b0, b1) without events on this side
            double mass = 0;
            for (int q = bins.binStart[b0]; q < bins.binStart[b1]; q++) {
                mass += bins.weight[q];
            }
            for (int q = 0; q < nq; q++) {
                if (!bins.periodic && (side == 0 ? domain.x[q] < lo : domain.x[q] > hi)) {
                    mass += domain.weight[q];
                }
            }
            sideMass[side] = mass;
        }
        if (!(sideMass[0] > 0) && !(sideMass[1] > 0)) {
            return 0.0; // events at both ends of a layout that covers the domain: nothing is extrapolated
        }
        double[] eta = new double[nq];
        double[] ml = centreAndLogZ(domain, beta, eta);
        double m = ml[0], logZ = ml[1];
        double deep = 0;
        for (int side = 0; side < 2; side++) {
            int b0 = side == 0 ? 0 : last + 1;
            int b1 = side == 0 ? first : bins.bins;
            double mass = sideMass[side];
            if (!(mass > 0)) {
                continue;
            }
            double level = logZ - Math.log(total * mass);
            for (int q = bins.binStart[b0]; q < bins.binStart[b1]; q++) {
                double d = level - (eta(bins, q, beta) - m);
                if (d > 0) {
                    deep += bins.weight[q] * d * d;
                }
            }
            for (int q = 0; q < nq; q++) {
                if (!bins.periodic && (side == 0 ? domain.x[q] < lo : domain.x[q] > hi)) {
                    double d = level - (eta[q] - m);
                    if (d > 0) {
                        deep += domain.weight[q] * d * d;
                    }
                }
            }
        }
        return Math.max(0.0, Math.min(1.0, deep / normSq));
    }

    /**
     * The P-mean m of φ·β over the domain and log Z = log ∫ e^{clr} dP (log-sum-exp), with η = φ·β at the
     * domain layout's nodes written into eta; returns {m, log Z}.
     */
    private static double[] centreAndLogZ(BinLayout domain, double[] beta, double[] eta) {
        int nq = domain.nodes;
        double sw = 0, se = 0;
        for (int q = 0; q < nq; q++) {
            eta[q] = eta(domain, q, beta);
            sw += domain.weight[q];
            se += domain.weight[q] * eta[q];
        }
        double m = se / sw;
        double max = Double.NEGATIVE_INFINITY;
        for (int q = 0; q < nq; q++) {
            max = Math.max(max, eta[q]);
        }
        double z = 0;
        for (int q = 0; q < nq; q++) {
            z += domain.weight[q] * Math.exp(eta[q] - max);
        }
        return new double[] {m, max - m + Math.log(z)}; // log ∫ e^{clr} dP
    }

    /**
     * The extrapolation share on a circle, whose bins span the whole period: there is nothing beyond
     * the bins, and the region beyond the data is the one arc the events leave out — the complement of
     * the smallest arc that holds every event (the circular range of Mardia &amp; Jupp (2000),
     * Directional Statistics, Wiley, from memory). Over the bins that is the longest circular run of
     * bins without events, by reference mass (the first such run from the first bin with events on a
     * tie); its detection level and share are those of {@link #extrapolationShare} with this single
     * region E. Other runs of empty bins lie between events and are interpolated, as on an interval.
     * 0 when every bin has events, or for the reference density; 1 (for ‖c‖ &gt; 0) when no bin has
     * any.
     *
     * @param domain layout of the circle (one bin)
     * @param bins   layout of the bins, spanning one period
     * @param counts count (or weight) per bin
     */
    static double circularExtrapolationShare(BinLayout domain, BinLayout bins, double[] counts, double[] beta,
            double normSq, double total) {
        if (!(normSq > 0)) {
            return 0.0;
        }
        int d = bins.bins;
        int start = -1;
        for (int j = 0; j < d && start < 0; j++) {
            if (counts[j] > 0) {
                start = j;
            }
        }
        if (start < 0) {
            return 1.0;
        }
        double[] mass = new double[d];
        for (int j = 0; j < d; j++) {
            for (int q = bins.binStart[j]; q < bins.binStart[j + 1]; q++) {
                mass[j] += bins.weight[q];
            }
        }
        int bestFrom = -1, bestLength = 0;
        double bestMass = 0;
        int from = -1, length = 0;
        double run = 0;
        for (int s = 1; s <= d; s++) { // once round the circle from the first bin with events, back to it
            int j = (start + s) % d;
            if (!(counts[j] > 0)) {
                if (length == 0) {
                    from = j;
                }
                length++;
                run += mass[j];
            } else if (length > 0) {
                if (run > bestMass) {
                    bestMass = run;
                    bestFrom = from;
                    bestLength = length;
                }
                length = 0;
                run = 0;
            }
        }
        if (bestLength == 0) {
            return 0.0;
        }
        double[] eta = new double[domain.nodes];
        double[] ml = centreAndLogZ(domain, beta, eta);
        double m = ml[0];
        double level = ml[1] - Math.log(total * bestMass);
        double deep = 0;
        for (int r = 0; r < bestLength; r++) {
            int j = (bestFrom + r) % d;
            for (int q = bins.binStart[j]; q < bins.binStart[j + 1]; q++) {
                double dq = level - (eta(bins, q, beta) - m);
                if (dq > 0) {
                    deep += bins.weight[q] * dq * dq;
                }
            }
        }
        return Math.max(0.0, Math.min(1.0, deep / normSq));
    }

    /**
     * Per-observation local basis values of one sample and its sufficient statistic, for the
     * penalised-likelihood fit of raw samples. Internal.
     */
    static final class SampleData {
        final int n;
        final int[] first;
        final double[] vals;
        final double[] w;
        final double[] linear;
        final int width;
        /** Smallest and largest value with positive weight. */
        final double min;
        final double max;
        /**
         * On a circle: the largest gap between circularly consecutive values with positive weight (taken
         * modulo the period), as its length (the period for a single distinct value) and the value that
         * ends it; 0 and NaN on an interval.
         */
        final double gapLength;
        final double gapEnd;
        /** Total weight. */
        final double total;

        SampleData(double[] v, double[] weights, RawBasis basis, int width, int k, double[] scratch) {
            n = v.length;
            double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < n; i++) {
                if (weights == null || weights[i] > 0) {
                    lo = Math.min(lo, v[i]);
                    hi = Math.max(hi, v[i]);
                }
            }
            min = lo;
            max = hi;
            if (basis.isPeriodic()) {
                double[] gap = largestGap(v, weights, basis);
                gapLength = gap[0];
                gapEnd = gap[1];
            } else {
                gapLength = 0;
                gapEnd = Double.NaN;
            }
            double tw = 0;
            for (int i = 0; i < n; i++) {
                tw += weights == null ? 1.0 : weights[i];
            }
            total = tw;
            this.width = width;
            first = new int[n];
            vals = new double[n * width];
            w = new double[n];
            linear = new double[k + 1];
            for (int i = 0; i < n; i++) {
                int f = basis.evalLocal(v[i], scratch);
                first[i] = f;
                w[i] = weights == null ? 1.0 : weights[i];
                for (int j = 0; j < width; j++) {
                    double val = f + j < k ? scratch[j] : 0.0;
                    vals[i * width + j] = val;
                    linear[f + j] += w[i] * val;
                }
            }
        }

        /**
         * {length, end} of the largest gap between circularly consecutive values with positive weight,
         * taken modulo the period; {period, v} for a single distinct value v, {period, NaN} for none.
         */
        private static double[] largestGap(double[] v, double[] weights, RawBasis basis) {
            double[] knots = basis.knotsView();
            double a = knots[0], period = knots[knots.length - 1] - a;
            double[] x = new double[v.length];
            int m = 0;
            for (int i = 0; i < v.length; i++) {
                if (weights == null || weights[i] > 0) {
                    x[m++] = basis.wrap(v[i]);
                }
            }
            if (m == 0) {
                return new double[] {period, Double.NaN};
            }
            java.util.Arrays.sort(x, 0, m);
            double length = x[0] + period - x[m - 1], end = x[0]; // the gap across the cut point
            for (int i = 1; i < m; i++) {
                if (x[i] - x[i - 1] > length) {
                    length = x[i] - x[i - 1];
                    end = x[i];
                }
            }
            return new double[] {x[0] == x[m - 1] ? period : length, end};
        }

        /**
         * The empirical information of a weighted sample: with φ_i the raw
         * functions at x_i, M = (Σ w_i²/W) Σ_i w_i (φ_i − φ̄)(φ_i − φ̄)', φ̄ = Σ_i w_i φ_i / W — the
         * score variance Σ w_i² Cov(φ) with Cov(φ) estimated from the sample instead of the fit.
         * Written into meat (K × K, row-major); mvec (K) is scratch.
         */
        void empiricalInformation(int k, double total, double total2, double[] mvec, double[] meat) {
            java.util.Arrays.fill(meat, 0.0);
            java.util.Arrays.fill(mvec, 0.0);
            final int n = first.length;
            for (int o = 0; o < n; o++) {
                double wo = w[o];
                if (wo == 0.0) {
                    continue;
                }
                int f = first[o], base = o * width;
                for (int i = 0; i < width && f + i < k; i++) {
                    double vi = wo * vals[base + i];
                    mvec[f + i] += vi;
                    int row = (f + i) * k + f;
                    for (int l = 0; l <= i; l++) {
                        meat[row + l] += vi * vals[base + l];
                    }
                }
            }
            double c = 1.0 / total;
            for (int i = 0; i < k; i++) {
                double mi = c * mvec[i];
                int row = i * k;
                for (int l = 0; l <= i; l++) {
                    meat[row + l] -= mi * mvec[l];
                }
            }
            double g = total2 / total;
            for (int i = 0; i < k; i++) {
                for (int l = 0; l <= i; l++) {
                    double v = g * meat[i * k + l];
                    meat[i * k + l] = v;
                    meat[l * k + i] = v;
                }
            }
        }
    }

    /** Copies the lower triangle of the k × k block of a (row stride s) to its upper triangle. */
    static void mirrorLower(double[] a, int s, int k) {
        for (int i = 0; i < k; i++) {
            for (int l = 0; l < i; l++) {
                a[l * s + i] = a[i * s + l];
            }
        }
    }

    /** Lower triangle of the k × k block of a (row stride s) minus c·m mᵀ, entry by entry as (c m_i) m_l. */
    static void subtractOuter(double[] a, int s, double c, double[] m, int k) {
        for (int i = 0; i < k; i++) {
            double mi = c * m[i];
            int row = i * s;
            for (int l = 0; l <= i; l++) {
                a[row + l] -= mi * m[l];
            }
        }
    }

    /** ‖U v‖∞ over the first K entries of v (‖v‖∞ when the coordinate map U is null). */
    static double coordinateNorm(double[] coordinateMap, double[] v, int k) {
        double m = 0;
        for (int i = 0; i < k; i++) {
            double s;
            if (coordinateMap == null) {
                s = v[i];
            } else {
                s = 0;
                int o = i * k;
                for (int j = i; j < k; j++) {
                    s += coordinateMap[o + j] * v[j];
                }
            }
            m = Math.max(m, Math.abs(s));
        }
        return m;
    }
}
