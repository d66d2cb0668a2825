package io.densa.core.estimate;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.ProgressCounter;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.function.IntFunction;
import java.util.function.IntToDoubleFunction;

/**
 * Per-unit detection limits of binned data: a unit with a lower limit L recorded every value below
 * L at L (so its counts at and below the bin that holds L are "some value in [a, L]"), a unit with
 * an upper limit U recorded every value above U at U. Such data are left- or right-censored; a
 * limit is a property of how the data were measured, not a tuning choice, and the estimators treat
 * the censored counts accordingly (see
 * {@link PenalizedLikelihoodEstimator#fitAll(double[], int[][], String[], DetectionLimits)}).
 * Without it, the values piled up at the limit read as a spike and the empty bins below it as a
 * region without mass: the estimated density then dives there and such units can rule every B2
 * distance.
 *
 * <p>Where the limits were not recorded with the data, {@link #suggested} names the units whose
 * counts show the signature of clipping (a run of empty bins at an end, then a spike).
 *
 * <p>{@code NaN} means "no limit" for that unit. Immutable; arrays are copied in and out.
 *
 * @param lower n lower limits (NaN: none)
 * @param upper n upper limits (NaN: none)
 */
public record DetectionLimits(double[] lower, double[] upper) {

    /**
     * Validates and copies.
     *
     * @throws IllegalArgumentException for arrays of different lengths, infinite limits, or a unit
     *                                  whose lower limit is not below its upper limit
     */
    public DetectionLimits {
        Objects.requireNonNull(lower, "lower");
        Objects.requireNonNull(upper, "upper");
        if (lower.length != upper.length) {
            throw new IllegalArgumentException("lower limits for " + lower.length + " units but upper limits for "
                    + upper.length);
        }
        lower = lower.clone();
        upper = upper.clone();
        for (int i = 0; i < lower.length; i++) {
            if (Double.isInfinite(lower[i]) || Double.isInfinite(upper[i])) {
                throw new IllegalArgumentException("unit row " + i + ": detection limits must be finite or NaN (no "
                        + "limit), got lower " + lower[i] + ", upper " + upper[i]);
            }
            if (!Double.isNaN(lower[i]) && !Double.isNaN(upper[i]) && !(lower[i] < upper[i])) {
                throw new IllegalArgumentException("unit row " + i + ": lower detection limit " + lower[i]
                        + " is not below the upper limit " + upper[i]);
            }
        }
    }

    /** Lower limits only (NaN: none for that unit). */
    public static DetectionLimits lower(double... limits) {
        Objects.requireNonNull(limits, "limits");
        double[] none = nans(limits.length);
        return new DetectionLimits(limits, none);
    }

    /** Upper limits only (NaN: none for that unit). */
    public static DetectionLimits upper(double... limits) {
        Objects.requireNonNull(limits, "limits");
        double[] none = nans(limits.length);
        return new DetectionLimits(none, limits);
    }

    /**
     * Significance level of the spike test of {@link #suggested}: 0.001 (a one-sided test applied to
     * each end of each unit, so that a network of hundreds of units sees few chance suggestions).
     */
    public static final double SPIKE_LEVEL = 0.001;

    /**
     * Limits that the counts themselves suggest, for units whose data look clipped: at an end of the
     * bin layout, a run of at least two empty bins followed by a first occupied bin that holds
     * significantly more events than its inner neighbour — the signature of values below a limit
     * recorded at the limit (a spike at the edge of an empty region, where a density rising out of
     * that region would put fewer events than one bin further in). The test conditions on the two
     * bins' total m: with c events in the edge bin, P(X ≥ c) for X ~ Binomial(m, ½) (the comparison
     * of two Poisson counts given their sum; common practice) must be at most {@link #SPIKE_LEVEL}.
     * The suggested limit is the lower edge of the spike's bin, so that declaring it censors that
     * bin and the empty ones beyond it. NaN where a unit's end shows no such signature.
     *
     * <p>A suggestion, not a fact: a quantity with a hard bound of its own inside the layout and
     * most of its values at that bound shows the same signature. Declare a limit where the data
     * were recorded that way ({@code fitAll(edges, counts, ids, limits)}).
     *
     * @param edges  D + 1 strictly increasing bin edges (not modified)
     * @param counts n rows of D non-negative counts (not modified)
     * @throws IllegalArgumentException for edges that are not finite and strictly increasing, a row
     *                                  of another length or a negative or non-finite count (naming the row)
     */
    public static DetectionLimits suggested(double[] edges, double[][] counts) {
        return ends(edges, counts, true);
    }

    /**
     * Shortest run of empty bins at an end of the layout that {@link #emptyEnds} reads as hiding
     * censored values: 2, as {@link #suggested} requires (a single empty edge bin is common
     * sampling noise at any density's tail).
     */
    public static final int EMPTY_END_RUN = 2;

    /**
     * Events per bin, on average over the layout, from which
     * {@link PenalizedLikelihoodEstimator.EmptyEnds#CENSORED_IF_DENSE} reads a unit's empty end
     * runs as censored: 10. Below it runs of empty bins are the routine sampling noise of sparse
     * units, where reading every bin as recorded gives calibrated covariances and the censored
     * reading over-reports them (measured, normal law over 50 bins, 400 replicates, λ fixed: reported
     * / empirical trace 1.27 at 2 events per bin against 0.96 counted, 1.16 against 0.95 at 4, 1.13
     * against 1.03 at 10, 1.10 against 1.08 at 40).
     */
    public static final double DENSE_EVENTS_PER_BIN = 10;

    /**
     * The limits under which every run of at least {@link #EMPTY_END_RUN} empty bins at an end of the
     * layout is read as censored: for a unit whose first occupied bin j has at least two empty bins
     * below it, the lower limit e_j (the lower edge of that bin), so the bins up to j form one cell
     * [a, e_{j+1}) whose count says only "this many values at or below e_{j+1}"; likewise an upper
     * limit at the lower edge of the last occupied bin when at least two empty bins lie above it.
     * A unit with a single occupied bin gets no limit. This is what
     * {@link PenalizedLikelihoodEstimator.EmptyEnds#CENSORED} (the estimator's default) applies
     * where no limit is declared: counts alone cannot tell a density that falls to nothing beyond
     * its last events from values beyond a limit recorded at the limit (see
     * {@link PenalizedLikelihoodEstimator#withEmptyEnds}). Unlike {@link #suggested}, no spike test.
     *
     * @param edges  D + 1 strictly increasing bin edges (not modified)
     * @param counts n rows of D non-negative counts (not modified)
     * @throws IllegalArgumentException as {@link #suggested}
     */
    public static DetectionLimits emptyEnds(double[] edges, double[][] counts) {
        return ends(edges, counts, false);
    }

    /** Whether bin j of unit i holds events (for {@link #emptyEndsOrNull}). */
    @FunctionalInterface
    interface Occupied {
        boolean test(int i, int j);
    }

    /**
     * {@link #emptyEnds} for the units among n with at least minTotal events whose counts the caller
     * has validated against the checked edges e; null if no such unit has an empty end run.
     */
    static DetectionLimits emptyEndsOrNull(double[] e, int n, Occupied occupied, double[] totals, double minTotal) {
        int d = e.length - 1;
        double[] lo = null;
        double[] hi = null;
        for (int i = 0; i < n; i++) {
            int[] run = totals[i] >= minTotal ? runBins(occupied, i, d) : null;
            if (run != null) {
                if (lo == null) {
                    lo = nans(n);
                    hi = nans(n);
                }
                lo[i] = run[0] >= 0 ? e[run[0]] : Double.NaN;
                hi[i] = run[1] < d ? e[run[1]] : Double.NaN;
            }
        }
        return lo == null ? null : new DetectionLimits(lo, hi);
    }

    /**
     * The bins holding the limits of unit i's empty end runs over d bins, {lo, hi}: lo the first
     * occupied bin if at least {@link #EMPTY_END_RUN} empty bins lie below it, else −1; hi the last
     * occupied bin if at least that many lie above it, else d. Null when neither end has a run or
     * the unit has fewer than two occupied bins.
     */
    static int[] runBins(Occupied occupied, int i, int d) {
        int first = 0;
        while (first < d && !occupied.test(i, first)) {
            first++;
        }
        int last = d - 1;
        while (last >= 0 && !occupied.test(i, last)) {
            last--;
        }
        boolean two = first < last;
        int lo = two && first >= EMPTY_END_RUN ? first : -1;
        int hi = two && d - 1 - last >= EMPTY_END_RUN ? last : d;
        return lo < 0 && hi >= d ? null : new int[] {lo, hi};
    }

    private static double[] nans(int n) {
        double[] a = new double[n];
        Arrays.fill(a, Double.NaN);
        return a;
    }

    /** {@link #suggested} (spikeTest) or {@link #emptyEnds}. */
    private static DetectionLimits ends(double[] edges, double[][] counts, boolean spikeTest) {
        Objects.requireNonNull(edges, "edges");
        Objects.requireNonNull(counts, "counts");
        int d = edges.length - 1;
        if (d < 1) {
            throw new IllegalArgumentException("edges needs at least 2 values, got " + edges.length);
        }
        for (int j = 0; j <= d; j++) {
            if (!Double.isFinite(edges[j]) || (j > 0 && !(edges[j] > edges[j - 1]))) {
                throw new IllegalArgumentException("edges must be finite and strictly increasing; edges[" + j + "] = "
                        + edges[j]);
            }
        }
        int n = counts.length;
        double[] lo = new double[n];
        double[] hi = new double[n];
        for (int i = 0; i < n; i++) {
            double[] c = counts[i];
            if (c == null || c.length != d) {
                throw new IllegalArgumentException("counts row " + i + " has " + (c == null ? "no" : c.length)
                        + " bins, expected " + d);
            }
            for (int j = 0; j < d; j++) {
                if (!(c[j] >= 0) || Double.isInfinite(c[j])) {
                    throw new IllegalArgumentException("counts row " + i + ", bin " + j + " is " + c[j]
                            + "; counts must be finite and >= 0");
                }
            }
            if (!spikeTest) {
                int[] run = runBins((u, j) -> c[j] > 0, i, d);
                lo[i] = run != null && run[0] >= 0 ? edges[run[0]] : Double.NaN;
                hi[i] = run != null && run[1] < d ? edges[run[1]] : Double.NaN;
                continue;
            }
            int first = 0;
            while (first < d && !(c[first] > 0)) {
                first++;
            }
            int last = d - 1;
            while (last >= 0 && !(c[last] > 0)) {
                last--;
            }
            lo[i] = first >= 2 && first + 1 < d && spike(c[first], c[first + 1]) ? edges[first] : Double.NaN;
            hi[i] = last >= 1 && last <= d - 3 && spike(c[last], c[last - 1]) ? edges[last] : Double.NaN;
            if (!Double.isNaN(lo[i]) && !Double.isNaN(hi[i]) && !(lo[i] < hi[i])) {
                hi[i] = Double.NaN; // both ends in one bin: keep the lower suggestion only
            }
        }
        return new DetectionLimits(lo, hi);
    }

    /** {@link #suggested(double[], double[][])} for integer counts. */
    public static DetectionLimits suggested(double[] edges, int[][] counts) {
        Objects.requireNonNull(counts, "counts");
        double[][] c = new double[counts.length][];
        for (int i = 0; i < counts.length; i++) {
            if (counts[i] != null) {
                c[i] = new double[counts[i].length];
                for (int j = 0; j < c[i].length; j++) {
                    c[i][j] = counts[i][j];
                }
            }
        }
        return suggested(edges, c);
    }

    /** Above this many events in the two bins the spike test uses the normal approximation. */
    static final double EXACT_LIMIT = 1e5;

    /**
     * Whether an edge bin with {@code edge} events holds significantly more than its inner neighbour
     * with {@code inner}: P(X ≥ edge) ≤ {@link #SPIKE_LEVEL} for X ~ Binomial(edge + inner, ½), by
     * the regularised incomplete beta function, P(X ≥ k) = I_½(k, m − k + 1) (counts rounded to
     * whole events); above {@link #EXACT_LIMIT} events by the normal approximation with continuity
     * correction, P ≈ ½ erfc(z / √2), z = (k − inner − 1) / √(k + inner) (where the continued
     * fraction of the beta function fails to converge, e.g. at 10³⁰⁰ events, and the approximation's
     * error is far below the level).
     */
    static boolean spike(double edge, double inner) {
        double k = Math.rint(edge);
        double in = Math.rint(inner);
        if (!(k >= 1)) {
            return false;
        }
        if (k + in <= EXACT_LIMIT) {
            return org.apache.commons.math3.special.Beta.regularizedBeta(0.5, k, in + 1) <= SPIKE_LEVEL;
        }
        double z = (k - in - 1) / (Math.sqrt(k) * Math.sqrt(1 + in / k)); // √(k + in) without overflow
        return 0.5 * org.apache.commons.math3.special.Erf.erfc(z / Math.sqrt(2)) <= SPIKE_LEVEL;
    }

    /** Number of units. */
    public int size() {
        return lower.length;
    }

    /** Whether unit i has a lower or an upper limit. */
    public boolean censored(int i) {
        return !Double.isNaN(lower[i]) || !Double.isNaN(upper[i]);
    }

    @Override
    public double[] lower() {
        return lower.clone();
    }

    @Override
    public double[] upper() {
        return upper.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof DetectionLimits d && Arrays.equals(lower, d.lower) && Arrays.equals(upper, d.upper);
    }

    @Override
    public int hashCode() {
        return 31 * Arrays.hashCode(lower) + Arrays.hashCode(upper);
    }

    @Override
    public String toString() {
        int c = 0;
        for (int i = 0; i < lower.length; i++) {
            c += censored(i) ? 1 : 0;
        }
        return "DetectionLimits[" + lower.length + " units, " + c + " with a limit]";
    }

    /**
     * Counts with detection limits: the censored cells of a unit are merged into one cell that
     * reaches the end of the domain, so the multinomial likelihood uses P(X ≤ e) for the mass below
     * the upper edge e of the bin holding the lower limit (and P(X ≥ e') above the lower edge e' of the
     * bin holding the upper limit) — the likelihood of interval-censored data (Turnbull (1976), The
     * empirical distribution function with arbitrarily grouped, censored and truncated data, J. R.
     * Stat. Soc. B 38(3)). Units without a limit are fitted together on the shared edges exactly as
     * without limits.
     */
    static final class CensoredCounts {
        private CensoredCounts() {
        }

        /** Fits the plain rows (given by index) every bin as recorded, in one batch. */
        @FunctionalInterface
        private interface PlainFit {
            BatchEstimate fit(double[] e, int[] rows, String[] ids, ProgressCounter done);
        }

        /** Units with empty end runs read as censored where the estimator's setting says so. */
        static BatchEstimate emptyEnds(PenalizedLikelihoodEstimator est, PenalizedFit fit, double[] edges, int[][] counts,
                String[] ids) {
            double[] e = EstimationSupport.checkEdges(est.space(), edges);
            double[] totals = fit.checkCounts(e, counts, ids);
            DetectionLimits runs = DetectionLimits.emptyEndsOrNull(e, counts.length, (i, j) -> counts[i][j] != 0, totals,
                    est.emptyEndMinTotal(e.length - 1));
            return runs == null ? fit.checked(fit.prepare(e), counts, ids, totals, null) : fitAll(est, e, counts, ids, runs);
        }

        /** See {@link #emptyEnds(PenalizedLikelihoodEstimator, PenalizedFit, double[], int[][], String[])}. */
        static BatchEstimate emptyEnds(PenalizedLikelihoodEstimator est, PenalizedFit fit, double[] edges,
                double[][] counts, String[] ids) {
            double[] e = EstimationSupport.checkEdges(est.space(), edges);
            double[] totals = fit.checkCounts(e, counts, ids);
            DetectionLimits runs = DetectionLimits.emptyEndsOrNull(e, counts.length, (i, j) -> counts[i][j] > 0, totals,
                    est.emptyEndMinTotal(e.length - 1));
            return runs == null ? fit.checked(fit.prepare(e), counts, ids, totals, null) : fitAll(est, e, counts, ids, runs);
        }

        /** Units of whole-number counts, with declared limits (or the limits of their empty ends). */
        static BatchEstimate fitAll(PenalizedLikelihoodEstimator est, double[] edges, int[][] counts, String[] ids,
                DetectionLimits limits) {
            return fit(est, edges, counts.length, ids, limits, i -> {
                int[] r = counts[i];
                if (r == null) {
                    return null;
                }
                double[] c = new double[r.length];
                for (int j = 0; j < r.length; j++) {
                    c[j] = r[j];
                }
                return c;
            }, i -> {
                long t = 0;
                for (int v : counts[i]) {
                    t += v;
                }
                return t;
            }, (i, j) -> counts[i][j] != 0, (e, rows, sub, done) -> {
                int[][] part = new int[rows.length][];
                for (int r = 0; r < rows.length; r++) {
                    part[r] = counts[rows[r]];
                }
                return est.penalizedFit().counts(e, part, sub, done);
            });
        }

        /** Units of counts given as doubles; see {@link #fitAll(PenalizedLikelihoodEstimator, double[], int[][], String[], DetectionLimits)}. */
        static BatchEstimate fitAll(PenalizedLikelihoodEstimator est, double[] edges, double[][] counts, String[] ids,
                DetectionLimits limits) {
            return fit(est, edges, counts.length, ids, limits, i -> counts[i], i -> {
                double t = 0;
                for (double v : counts[i]) {
                    t += v;
                }
                return t;
            }, (i, j) -> counts[i][j] > 0, (e, rows, sub, done) -> {
                double[][] part = new double[rows.length][];
                for (int r = 0; r < rows.length; r++) {
                    part[r] = counts[rows[r]];
                }
                return est.penalizedFit().counts(e, part, sub, done);
            });
        }

        /**
         * row(i): unit i's counts as doubles (a copy for integer counts; called for units with a
         * declared limit and for censored units only); totalOf and occupied: its total and whether a
         * bin holds events, read only for rows already checked (every row when empty ends may be
         * censored: the estimator checks them all first).
         */
        private static BatchEstimate fit(PenalizedLikelihoodEstimator est, double[] edges, int n, String[] ids,
                DetectionLimits limits, IntFunction<double[]> row, IntToDoubleFunction totalOf, Occupied occupied,
                PlainFit plain) {
            PenalizedFit fit = est.penalizedFit();
            BayesSpace space = est.space();
            if (space.isPeriodic()) {
                throw new IllegalArgumentException("detection limits cut the domain at a lower or upper limit, but "
                        + space + " is a circle, which has neither; fit the counts without limits");
            }
            double[] e = EstimationSupport.checkEdges(space, edges);
            EstimationSupport.checkIds(ids, n);
            if (limits.size() != n) {
                throw new IllegalArgumentException("detection limits for " + limits.size() + " units but counts for "
                        + n);
            }
            int d = e.length - 1;
            double[] lower = limits.lower();
            double[] upper = limits.upper();
            double minTotal = est.emptyEndMinTotal(d);
            // per unit: the censored cells' bins lo and hi (-1 and d: none), grouped by (lo, hi)
            Map<Long, List<Integer>> groups = new LinkedHashMap<>();
            List<Integer> plainRows = new ArrayList<>();
            double[][] rows = new double[n][];
            for (int i = 0; i < n; i++) {
                boolean declared = limits.censored(i);
                if (!declared && minTotal == Double.POSITIVE_INFINITY) {
                    plainRows.add(i);
                    continue;
                }
                String unit = EstimationSupport.unit(ids, i);
                double[] c = declared ? row.apply(i) : null;
                if (declared) {
                    checkRow(c, d, e, unit);
                }
                int lo = Double.isNaN(lower[i]) ? -1 : binHolding(e, lower[i], unit, "lower");
                int hi = Double.isNaN(upper[i]) ? d : binHolding(e, upper[i], unit, "upper");
                if (declared && lo >= 0 && hi < d && lo >= hi) {
                    throw new IllegalArgumentException(unit + ": with the detection limits (lower " + lower[i] + ", upper "
                            + upper[i] + ") every bin is censored into one cell: no bin is left to estimate a density from");
                }
                int[] run = totalOf.applyAsDouble(i) >= minTotal ? runBins(occupied, i, d) : null;
                if (run != null && lo < 0 && run[0] >= 0 && run[0] < hi) {
                    lo = run[0]; // an end without a declared limit, read as the setting says
                }
                if (run != null && hi >= d && run[1] < d && run[1] > lo) {
                    hi = run[1];
                }
                if (lo < 0 && hi >= d) {
                    plainRows.add(i);
                    continue;
                }
                rows[i] = c != null ? c : row.apply(i);
                groups.computeIfAbsent((long) (lo + 1) * (d + 2) + hi, g -> new ArrayList<>()).add(i);
            }
            int k = space.dimension();
            double[] out = new double[n * k];
            EstimationDiagnostics[] diag = new EstimationDiagnostics[n];
            PenalizedFit.Prepared shared = groups.isEmpty() ? null : fit.prepare(e);
            ProgressCounter done = fit.progressOf(n); // one task over every batch
            if (!plainRows.isEmpty()) {
                int[] idx = plainRows.stream().mapToInt(Integer::intValue).toArray();
                String[] subIds = new String[idx.length];
                for (int r = 0; r < idx.length; r++) {
                    subIds[r] = EstimationSupport.id(ids, idx[r]);
                }
                collect(plain.fit(e, idx, subIds, done), idx, k, out, diag);
            }
            // groups in parallel (each writes its own rows), each group's batch as the plain batch
            List<Map.Entry<Long, List<Integer>>> list = new ArrayList<>(groups.entrySet());
            Kernels.forEachBlock(list.size(), est.settings().parallel(), gi -> {
                Map.Entry<Long, List<Integer>> g = list.get(gi);
                int lo = (int) (g.getKey() / (d + 2)) - 1;
                int hi = (int) (g.getKey() % (d + 2));
                // cells: [a, e_{lo+1}) if lo >= 0, bins lo+1 .. hi-1, [e_hi, b] if hi < d; open ends reach the domain
                int from = Math.max(lo, 0);
                int to = Math.min(hi, d - 1);
                double[] me = new double[to - from + 2];
                me[0] = lo >= 0 ? space.lower() : e[0];
                me[me.length - 1] = hi < d ? space.upper() : e[d];
                for (int j = from + 1; j <= to; j++) {
                    me[j - from] = e[j];
                }
                int[] idx = g.getValue().stream().mapToInt(Integer::intValue).toArray();
                double[][] cells = new double[idx.length][];
                String[] subIds = new String[idx.length];
                for (int r = 0; r < idx.length; r++) {
                    double[] c = rows[idx[r]];
                    double[] mc = new double[to - from + 1];
                    for (int j = 0; j < d; j++) {
                        mc[Math.min(Math.max(j, from), to) - from] += c[j];
                    }
                    cells[r] = mc;
                    subIds[r] = EstimationSupport.id(ids, idx[r]);
                }
                // the merged cells of the shared layout where its bins reach the censored ends, else own cells
                boolean view = (lo < 0 || e[0] == space.lower()) && (hi >= d || e[d] == space.upper());
                collect(view ? fit.countsOn(merged(shared, k, lo, hi, me), cells, subIds, done)
                        : fit.counts(me, cells, subIds, done),
                        idx, k, out, diag);
                String note = "counts read as censored in " + (lo >= 0 ? "[" + me[0] + ", " + me[1] + ")" : "")
                        + (lo >= 0 && hi < d ? " and " : "") + (hi < d ? "[" + me[me.length - 2] + ", "
                        + me[me.length - 1] + "]" : "") + " (a detection limit or a run of empty end bins)";
                for (int i : idx) {
                    diag[i] = diag[i].withNote(note);
                }
            });
            String[] idCopy = ids == null ? null : ids.clone();
            return new BatchEstimate(DensitySet.ofRowMajor(space, out, n, idCopy), Arrays.asList(diag));
        }

        /**
         * p's layout with bins merged ({@link BinLayout#merged}); the start map keeps the column of
         * the bin holding the limit (lo, hi) for its merged cell and folds the other merged bins' columns
         * into the constant at log ½, the start of an empty bin: a censored unit whose merged bins
         * beyond that one are empty starts where it would without the merge (the same sums, in
         * another order).
         */
        static PenalizedFit.Prepared merged(PenalizedFit.Prepared p, int k, int lo, int hi, double[] cellEdges) {
            BinLayout m = p.lay().merged(lo, hi, cellEdges);
            double[] map = p.startMap();
            if (map == null) {
                return new PenalizedFit.Prepared(m, null, p.startConst());
            }
            int d = p.lay().bins, cells = m.bins;
            int from = Math.max(lo, 0);
            double half = Math.log(0.5);
            double[] startConst = p.startConst().clone();
            double[] cellMap = new double[k * cells];
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < d; j++) {
                    int c = Math.min(Math.max(j, from), from + cells - 1) - from;
                    if (j >= lo && j <= hi) { // lo = −1, hi = D: no merge at that end
                        cellMap[i * cells + c] = map[i * d + j];
                    } else {
                        startConst[i] += map[i * d + j] * half;
                    }
                }
            }
            return new PenalizedFit.Prepared(m, cellMap, startConst);
        }

        /** A declared unit's row: D counts ≥ 0. */
        private static void checkRow(double[] c, int d, double[] e, String unit) {
            if (c == null || c.length != d) {
                throw new IllegalArgumentException(unit + ": " + (c == null ? "counts are null" : c.length
                        + " counts for " + d + " bins"));
            }
            for (int j = 0; j < d; j++) {
                if (!(c[j] >= 0)) {
                    throw new IllegalArgumentException(unit + ": count " + c[j] + " in bin " + EstimationSupport.bin(e, j)
                            + " is negative; counts must be ≥ 0");
                }
            }
        }

        /** Copies the batch's coordinates and diagnostics to the rows idx of out and diag. */
        private static void collect(BatchEstimate b, int[] idx, int k, double[] out, EstimationDiagnostics[] diag) {
            double[] c = b.densities().coordinatesRowMajor();
            for (int r = 0; r < idx.length; r++) {
                System.arraycopy(c, r * k, out, idx[r] * k, k);
                diag[idx[r]] = b.diagnostics().get(r);
            }
        }

        /** The bin j with e_j ≤ limit < e_{j+1} (the last bin for limit = e_D). */
        private static int binHolding(double[] e, double limit, String unit, String which) {
            int d = e.length - 1;
            if (!(limit >= e[0] && limit <= e[d])) {
                throw new IllegalArgumentException(unit + ": the " + which + " detection limit " + limit + " is outside the"
                        + " binned range [" + e[0] + ", " + e[d] + "]; give a limit inside it or NaN for none");
            }
            int j = Arrays.binarySearch(e, limit);
            j = j >= 0 ? j : -j - 2;
            return Math.min(j, d - 1);
        }
    }
}
