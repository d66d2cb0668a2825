package io.densa.core.estimate;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Counts with detection limits: the censored cells of a unit are merged into one cell that
 * reaches the end of the domain, so the multinomial likelihood uses P(X ≤ e) for the mass below
 * the upper edge e of the bin holding the lower limit (and P(X ≥ e') above the lower edge e' of the
 * bin holding the upper limit) — the likelihood of interval-censored data (Turnbull (1976), The
 * empirical distribution function with arbitrarily grouped, censored and truncated data, J. R.
 * Stat. Soc. B 38(3)). Units without a limit are fitted together on the shared edges exactly as
 * without limits.
 */
final class CensoredCounts {
    private CensoredCounts() {
    }

    static BatchEstimate fitAll(PenalizedLikelihoodEstimator est, double[] edges, int[][] counts, String[] ids,
            DetectionLimits limits) {
        BayesSpace space = est.space();
        double[] e = EstimationSupport.checkEdges(space, edges);
        EstimationSupport.checkIds(ids, counts.length);
        if (limits.size() != counts.length) {
            throw new IllegalArgumentException("detection limits for " + limits.size() + " units but counts for "
                    + counts.length);
        }
        int n = counts.length;
        int d = e.length - 1;
        double[] lower = limits.lower();
        double[] upper = limits.upper();
        List<Integer> plainRows = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            if (!limits.censored(i)) {
                plainRows.add(i);
            }
        }
        int k = space.dimension();
        double[] out = new double[n * k];
        EstimationDiagnostics[] diag = new EstimationDiagnostics[n];
        if (!plainRows.isEmpty()) {
            int[][] sub = new int[plainRows.size()][];
            String[] subIds = new String[plainRows.size()];
            for (int r = 0; r < sub.length; r++) {
                int i = plainRows.get(r);
                sub[r] = counts[i];
                subIds[r] = EstimationSupport.id(ids, i);
            }
            BatchEstimate b = est.fitAll(e, sub, subIds);
            double[] rows = b.densities().coordinatesRowMajor();
            for (int r = 0; r < sub.length; r++) {
                int i = plainRows.get(r);
                System.arraycopy(rows, r * k, out, i * k, k);
                diag[i] = b.diagnostics().get(r);
            }
        }
        for (int i = 0; i < n; i++) {
            if (!limits.censored(i)) {
                continue;
            }
            String unit = EstimationSupport.unit(ids, i);
            if (counts[i] == null || counts[i].length != d) {
                throw new IllegalArgumentException(unit + ": " + (counts[i] == null ? "counts are null" : counts[i].length
                        + " counts for " + d + " bins"));
            }
            int lo = 0;
            int hi = d - 1;
            if (!Double.isNaN(lower[i])) {
                lo = binHolding(e, lower[i], unit, "lower");
            }
            if (!Double.isNaN(upper[i])) {
                hi = binHolding(e, upper[i], unit, "upper");
            }
            if (lo >= hi) {
                throw new IllegalArgumentException(unit + ": with the detection limits (lower " + lower[i] + ", upper "
                        + upper[i] + ") every bin is censored into one cell: no bin is left to estimate a density from");
            }
            // cells: [a, e_{lo+1}), bins lo+1 .. hi-1, [e_hi, b]; open ends reach the domain
            double[] me = new double[hi - lo + 2];
            int[] mc = new int[hi - lo + 1];
            me[0] = Double.isNaN(lower[i]) ? e[0] : space.lower();
            me[me.length - 1] = Double.isNaN(upper[i]) ? e[d] : space.upper();
            for (int j = lo + 1; j <= hi; j++) {
                me[j - lo] = e[j];
            }
            long first = 0;
            long last = 0;
            for (int j = 0; j < d; j++) {
                int c = counts[i][j];
                if (c < 0) {
                    throw new IllegalArgumentException(unit + ": count " + c + " in bin " + EstimationSupport.bin(e, j)
                            + " is negative; counts must be ≥ 0");
                }
                if (j <= lo) {
                    first += c;
                } else if (j >= hi) {
                    last += c;
                } else {
                    mc[j - lo] = c;
                }
            }
            if (first > Integer.MAX_VALUE || last > Integer.MAX_VALUE) {
                throw new IllegalArgumentException(unit + ": a censored cell holds more than " + Integer.MAX_VALUE
                        + " events; give the counts as doubles");
            }
            mc[0] = (int) first;
            mc[mc.length - 1] = (int) last;
            BatchEstimate b = est.fitAll(me, new int[][] {mc}, new String[] {EstimationSupport.id(ids, i)});
            System.arraycopy(b.densities().coordinatesRowMajor(), 0, out, i * k, k);
            diag[i] = b.diagnostics().get(0);
        }
        String[] idCopy = ids == null ? null : ids.clone();
        return new BatchEstimate(DensitySet.ofRowMajor(space, out, n, idCopy), Arrays.asList(diag));
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
