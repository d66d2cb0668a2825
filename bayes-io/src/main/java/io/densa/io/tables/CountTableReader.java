package io.densa.io.tables;

import io.densa.io.Bins;
import io.densa.io.ReadLimits;
import io.densa.core.BayesSpace;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Reads long-format count tables — one row per unit, (optional) period and bin, with the count —
 * into a {@link CountTable}. The bin of a row is given in one of three ways:
 * <ul>
 * <li>{@link #withBinIndex}: an integer column, bins numbered from 0 (or another base) in a layout
 * the caller gives;</li>
 * <li>{@link #withBinLabel}: a text column holding the labels of a labelled layout;</li>
 * <li>{@link #withBinEdges}: two numeric columns with the lower and upper edge of each bin; the
 * layout is taken from the distinct (lower, upper) pairs, which must tile an interval without gaps
 * or overlaps (the upper edge of each bin equal to the lower edge of the next), or must be bins of
 * a layout the caller gives.</li>
 * </ul>
 *
 * <p>Semantics: a unit–bin pair absent from the table has count 0; units (unit–period pairs when
 * there is a period column) are in order of first appearance; every count must be a finite number
 * ≥ 0, and a whole number unless {@link #withFractionalCounts} allows weights; a unit–bin pair may
 * appear only once. With {@link #withSpace} the layout is checked against the space's domain.
 *
 * <p>All or nothing: the first bad row ends the read with an {@link IllegalArgumentException}
 * naming the source, line or row, column and the accepted form; nothing is returned. Limits
 * ({@link ReadLimits}) are checked before anything is allocated for them.
 *
 * <p>Example:
 * <pre>{@code
 * CountTable t = CountTableReader.of("district", "count")
 *         .withBinEdges("age_from", "age_to")
 *         .withSpace(space)
 *         .read(TableSource.csv(Path.of("ages.csv")));
 * BatchEstimate est = t.fit(PenalizedLikelihoodEstimator.withDefaults(space));
 * }</pre>
 *
 * <p>Immutable and thread-safe.
 */
public final class CountTableReader {
    private enum Mode { NONE, INDEX, LABEL, EDGES }

    private final String unitColumn;
    private final String countColumn;
    private final String periodColumn;
    private final Mode mode;
    private final String binColumn;
    private final String upperColumn;
    private final Bins bins;
    private final int base;
    private final BayesSpace space;
    private final boolean fractional;
    private final ReadLimits limits;

    private CountTableReader(String unitColumn, String countColumn, String periodColumn, Mode mode,
            String binColumn, String upperColumn, Bins bins, int base, BayesSpace space, boolean fractional,
            ReadLimits limits) {
        this.unitColumn = unitColumn;
        this.countColumn = countColumn;
        this.periodColumn = periodColumn;
        this.mode = mode;
        this.binColumn = binColumn;
        this.upperColumn = upperColumn;
        this.bins = bins;
        this.base = base;
        this.space = space;
        this.fractional = fractional;
        this.limits = limits;
    }

    /**
     * A reader of the named unit-id and count columns; a bin mode must be chosen with
     * {@link #withBinIndex}, {@link #withBinLabel} or {@link #withBinEdges}.
     */
    public static CountTableReader of(String unitColumn, String countColumn) {
        Objects.requireNonNull(unitColumn, "unitColumn");
        Objects.requireNonNull(countColumn, "countColumn");
        return new CountTableReader(unitColumn, countColumn, null, Mode.NONE, null, null, null, 0, null, false,
                ReadLimits.defaults());
    }

    /** With a period column (text); rows are then unit–period pairs. */
    public CountTableReader withPeriod(String column) {
        return new CountTableReader(unitColumn, countColumn, Objects.requireNonNull(column, "column"), mode,
                binColumn, upperColumn, bins, base, space, fractional, limits);
    }

    /** Bins given by a 0-based integer index column into the layout. */
    public CountTableReader withBinIndex(String column, Bins layout) {
        return withBinIndex(column, layout, 0);
    }

    /** Bins given by an integer index column into the layout, numbered from {@code base} (0 or 1). */
    public CountTableReader withBinIndex(String column, Bins layout, int base) {
        if (base != 0 && base != 1) {
            throw new IllegalArgumentException("bin index base must be 0 or 1, got " + base);
        }
        return new CountTableReader(unitColumn, countColumn, periodColumn, Mode.INDEX,
                Objects.requireNonNull(column, "column"), null, Objects.requireNonNull(layout, "layout"), base,
                space, fractional, limits);
    }

    /** Bins given by a text column holding the labels of a labelled layout ({@link Bins#withLabels}). */
    public CountTableReader withBinLabel(String column, Bins labelledLayout) {
        Objects.requireNonNull(labelledLayout, "labelledLayout");
        if (!labelledLayout.hasLabels()) {
            throw new IllegalArgumentException("withBinLabel needs a layout with labels (Bins.withLabels)");
        }
        return new CountTableReader(unitColumn, countColumn, periodColumn, Mode.LABEL,
                Objects.requireNonNull(column, "column"), null, labelledLayout, 0, space, fractional, limits);
    }

    /** Bins given by lower- and upper-edge columns; the layout is derived from the table. */
    public CountTableReader withBinEdges(String lowerColumn, String upperColumn) {
        return new CountTableReader(unitColumn, countColumn, periodColumn, Mode.EDGES,
                Objects.requireNonNull(lowerColumn, "lowerColumn"), Objects.requireNonNull(upperColumn, "upperColumn"),
                null, 0, space, fractional, limits);
    }

    /** Bins given by lower- and upper-edge columns that must be bins of the given layout. */
    public CountTableReader withBinEdges(String lowerColumn, String upperColumn, Bins layout) {
        return new CountTableReader(unitColumn, countColumn, periodColumn, Mode.EDGES,
                Objects.requireNonNull(lowerColumn, "lowerColumn"), Objects.requireNonNull(upperColumn, "upperColumn"),
                Objects.requireNonNull(layout, "layout"), 0, space, fractional, limits);
    }

    /** Checks the layout against the space's domain [a, b] (every edge inside it). */
    public CountTableReader withSpace(BayesSpace s) {
        return new CountTableReader(unitColumn, countColumn, periodColumn, mode, binColumn, upperColumn, bins, base,
                Objects.requireNonNull(s, "space"), fractional, limits);
    }

    /** Whether counts may be fractional (weighted counts); by default they must be whole numbers. */
    public CountTableReader withFractionalCounts(boolean allow) {
        return new CountTableReader(unitColumn, countColumn, periodColumn, mode, binColumn, upperColumn, bins, base,
                space, allow, limits);
    }

    /** With other read limits. */
    public CountTableReader withLimits(ReadLimits l) {
        return new CountTableReader(unitColumn, countColumn, periodColumn, mode, binColumn, upperColumn, bins, base,
                space, fractional, Objects.requireNonNull(l, "limits"));
    }

    /**
     * Reads the whole source.
     *
     * @throws IllegalArgumentException for a missing column, a bad row (naming line or row, column
     *                                  and the accepted form), a duplicate unit–bin row (naming both
     *                                  lines), edges that do not form or match the layout, a layout
     *                                  outside the space's domain, or a limit exceeded
     */
    public CountTable read(TableSource source) {
        Objects.requireNonNull(source, "source");
        if (mode == Mode.NONE) {
            throw new IllegalStateException("choose how bins are given: withBinIndex, withBinLabel or withBinEdges");
        }
        if (bins != null) {
            RowCursor.checkBinCount(bins, limits);
        }
        try (RowCursor cur = RowCursor.open(source, limits)) {
            return read(cur);
        }
    }

    private CountTable read(RowCursor cur) {
        String src = cur.source;
        int cu = cur.column(unitColumn, "unit");
        int cc = cur.column(countColumn, "count");
        int cp = periodColumn == null ? -1 : cur.column(periodColumn, "period");
        int cb = cur.column(binColumn, mode == Mode.EDGES ? "lower-edge" : "bin");
        int ch = mode == Mode.EDGES ? cur.column(upperColumn, "upper-edge") : -1;
        UnitKeys units = new UnitKeys(cp >= 0, limits.maxUnits(), src);
        GrowableEntries entries = new GrowableEntries();
        Map<EdgePair, Integer> pairs = new HashMap<>();
        List<EdgePair> pairList = new ArrayList<>();
        List<Long> pairFirst = new ArrayList<>();
        String countForm = fractional ? "a finite number >= 0" : "a whole number >= 0";
        while (cur.next()) {
            String id = cur.text(cu, "unit id");
            String period = cp >= 0 ? cur.text(cp, "period") : null;
            int b;
            switch (mode) {
                case INDEX: {
                    String accepted = "a bin index from " + base + " to " + (bins.count() - 1 + base);
                    int k = cur.integer(cb, "bin index", accepted);
                    if (k < base || k > bins.count() - 1 + base) {
                        throw new IllegalArgumentException(cur.where() + ", column '" + binColumn + "': bin index "
                                + k + " is out of range; expected " + accepted);
                    }
                    b = k - base;
                    break;
                }
                case LABEL: {
                    String label = cur.text(cb, "bin label");
                    b = bins.indexOfLabel(label);
                    if (b < 0) {
                        throw new IllegalArgumentException(cur.where() + ", column '" + binColumn + "': bin label '"
                                + RowCursor.clip(label) + "' is not one of the layout's labels "
                                + abbreviated(bins.labels()));
                    }
                    break;
                }
                default: {
                    double lo = cur.requiredNumber(cb, "lower edge", "a finite number");
                    double hi = cur.requiredNumber(ch, "upper edge", "a finite number");
                    if (!(hi > lo)) {
                        throw new IllegalArgumentException(cur.where() + ": bin [" + lo + ", " + hi
                                + ") is empty; the upper edge must exceed the lower edge");
                    }
                    EdgePair e = new EdgePair(lo, hi);
                    Integer k = pairs.get(e);
                    if (k == null) {
                        if (pairs.size() >= limits.maxBins()) {
                            throw new IllegalArgumentException(src + " has more than " + limits.maxBins()
                                    + " distinct bins, the limit (ReadLimits.withMaxBins)");
                        }
                        k = pairs.size();
                        pairs.put(e, k);
                        pairList.add(e);
                        pairFirst.add(cur.position());
                    }
                    b = k;
                }
            }
            double n = cur.requiredNumber(cc, "count", countForm);
            if (!(n >= 0)) {
                throw new IllegalArgumentException(cur.where() + ", column '" + countColumn + "': count " + n
                        + " is negative; expected " + countForm);
            }
            if (!fractional && n != Math.rint(n)) {
                throw new IllegalArgumentException(cur.where() + ", column '" + countColumn + "': count " + n
                        + " is not a whole number; expected " + countForm
                        + " (CountTableReader.withFractionalCounts allows weighted counts)");
            }
            int u = units.indexOf(id, period);
            if (entries.size >= limits.maxCells()) {
                throw new IllegalArgumentException(src + " has more than " + limits.maxCells()
                        + " unit-bin rows, the cell limit (ReadLimits.withMaxCells)");
            }
            entries.add(u, b, n, cur.position());
        }
        Bins layout;
        int[] remap = null;
        if (mode == Mode.EDGES) {
            if (pairList.isEmpty()) {
                throw new IllegalArgumentException(src + " has no data rows");
            }
            remap = new int[pairList.size()];
            layout = edgeLayout(cur, pairList, pairFirst, remap);
        } else {
            layout = bins;
        }
        if (space != null) {
            try {
                layout.checkAgainst(space);
            } catch (IllegalArgumentException e) {
                throw new IllegalArgumentException(src + ": " + e.getMessage(), e);
            }
        }
        if (units.size() == 0) {
            throw new IllegalArgumentException(src + " has no data rows");
        }
        int d = layout.count();
        if ((long) units.size() * d > limits.maxCells()) {
            throw new IllegalArgumentException(src + ": " + units.size() + " units x " + d + " bins = "
                    + (long) units.size() * d + " cells, more than the limit of " + limits.maxCells()
                    + " (ReadLimits.withMaxCells)");
        }
        double[][] counts = new double[units.size()][d];
        long[][] first = new long[units.size()][];
        for (int e = 0; e < entries.size; e++) {
            int u = entries.unit[e];
            int b = remap == null ? entries.bin[e] : remap[entries.bin[e]];
            if (first[u] == null) {
                first[u] = new long[d];
                Arrays.fill(first[u], -1);
            }
            if (first[u][b] >= 0) {
                throw new IllegalArgumentException(cur.at(entries.position[e]) + ": duplicate row for "
                        + units.name(u) + ", bin " + b + " [" + layout.edge(b) + ", " + layout.edge(b + 1)
                        + "), first given at " + where(cur, first[u][b]) + "; each unit-bin pair may appear once");
            }
            first[u][b] = entries.position[e];
            counts[u][b] = entries.amount[e];
        }
        OutsideReport none = OutsideReport.none(layout.lower(), layout.upper());
        return new CountTable(layout, units.idArray(), units.periodArray(), counts, none, src);
    }

    private static String where(RowCursor cur, long pos) {
        String s = cur.at(pos);
        int i = s.lastIndexOf(", ");
        return i >= 0 ? s.substring(i + 2) : s;
    }

    private Bins edgeLayout(RowCursor cur, List<EdgePair> pairList, List<Long> pairFirst, int[] remap) {
        int p = pairList.size();
        Integer[] order = new Integer[p];
        for (int i = 0; i < p; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (x, y) -> Double.compare(pairList.get(x).lo, pairList.get(y).lo));
        if (bins != null) {
            for (int i = 0; i < p; i++) {
                EdgePair e = pairList.get(i);
                int j = Arrays.binarySearch(bins.edges(), e.lo);
                if (j < 0 || j >= bins.count() || bins.edge(j + 1) != e.hi) {
                    throw new IllegalArgumentException(cur.at(pairFirst.get(i)) + ": bin [" + e.lo + ", " + e.hi
                            + ") is not a bin of the layout; expected consecutive edges of "
                            + Arrays.toString(abbreviated(bins.edges())));
                }
                remap[i] = j;
            }
            return bins;
        }
        double[] edges = new double[p + 1];
        for (int r = 0; r < p; r++) {
            EdgePair e = pairList.get(order[r]);
            if (r > 0) {
                EdgePair prev = pairList.get(order[r - 1]);
                if (prev.hi != e.lo) {
                    throw new IllegalArgumentException(cur.source + ": bin edges do not form a layout: bin [" + prev.lo
                            + ", " + prev.hi + ") (" + where(cur, pairFirst.get(order[r - 1])) + ") is followed by bin ["
                            + e.lo + ", " + e.hi + ") (" + where(cur, pairFirst.get(order[r])) + "), "
                            + (prev.hi < e.lo ? "a gap" : "an overlap")
                            + "; each bin's upper edge must equal the next bin's lower edge");
                }
            }
            edges[r] = e.lo;
            remap[order[r]] = r;
        }
        edges[p] = pairList.get(order[p - 1]).hi;
        return Bins.of(edges);
    }

    private static String abbreviated(String[] labels) {
        if (labels.length <= 12) {
            return Arrays.toString(labels);
        }
        return Arrays.toString(Arrays.copyOf(labels, 12)).replace("]", ", ... (" + labels.length + " labels)]");
    }

    private static double[] abbreviated(double[] edges) {
        return edges.length <= 24 ? edges : Arrays.copyOf(edges, 24);
    }

    private record EdgePair(double lo, double hi) {
    }
}
