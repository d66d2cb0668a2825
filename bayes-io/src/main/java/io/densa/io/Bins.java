package io.densa.io;

import io.densa.core.BayesSpace;
import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;
import java.util.Objects;

/**
 * A bin layout: D bins given by D + 1 strictly increasing finite edges, bin j = [e_j, e_{j+1})
 * and the last bin closed, [e_{D−1}, e_D]; optionally a label per bin (as a table names its bins,
 * e.g. {@code "20-24"}).
 *
 * <p>Immutable; arrays are copied in and out.
 */
public final class Bins {
    private final double[] edges;
    private final String[] labels; // null when none
    private final Map<String, Integer> byLabel;

    private Bins(double[] edges, String[] labels) {
        this.edges = edges;
        this.labels = labels;
        if (labels == null) {
            byLabel = Map.of();
        } else {
            Map<String, Integer> m = new HashMap<>();
            for (int j = 0; j < labels.length; j++) {
                Integer prev = m.put(labels[j], j);
                if (prev != null) {
                    throw new IllegalArgumentException("bin labels must be distinct: bins " + prev + " and " + j
                            + " are both labelled '" + labels[j] + "'");
                }
            }
            byLabel = m;
        }
    }

    /**
     * Bins with the given edges.
     *
     * @param edges D + 1 ≥ 2 finite, strictly increasing edges (not modified)
     * @throws IllegalArgumentException naming the first bad edge
     */
    public static Bins of(double... edges) {
        Objects.requireNonNull(edges, "edges");
        if (edges.length < 2) {
            throw new IllegalArgumentException("a bin layout needs at least 2 edges (1 bin), got " + edges.length);
        }
        for (int i = 0; i < edges.length; i++) {
            if (!Double.isFinite(edges[i])) {
                throw new IllegalArgumentException("bin edge " + i + " is " + edges[i] + "; edges must be finite");
            }
            if (i > 0 && !(edges[i] > edges[i - 1])) {
                throw new IllegalArgumentException("bin edges must be strictly increasing: edge " + i + " = "
                        + edges[i] + " does not exceed edge " + (i - 1) + " = " + edges[i - 1]);
            }
        }
        return new Bins(edges.clone(), null);
    }

    /**
     * n equal bins over [lower, upper]: e_j = lower + j (upper − lower)/n, with e_n = upper exactly.
     *
     * @throws IllegalArgumentException unless lower &lt; upper are finite and n ≥ 1
     */
    public static Bins uniform(double lower, double upper, int n) {
        if (!(Double.isFinite(lower) && Double.isFinite(upper) && lower < upper) || n < 1) {
            throw new IllegalArgumentException("uniform bins need finite lower < upper and n >= 1, got [" + lower
                    + ", " + upper + "], n = " + n);
        }
        double[] e = new double[n + 1];
        for (int j = 0; j < n; j++) {
            e[j] = lower + j * (upper - lower) / n;
        }
        e[n] = upper;
        return of(e);
    }

    /** The bins of a space's domain [a, b] cut into n equal bins. */
    public static Bins uniform(BayesSpace space, int n) {
        Objects.requireNonNull(space, "space");
        return uniform(space.lower(), space.upper(), n);
    }

    /**
     * The same bins with a label per bin.
     *
     * @param labels D distinct non-null labels (copied)
     */
    public Bins withLabels(String... labels) {
        Objects.requireNonNull(labels, "labels");
        if (labels.length != count()) {
            throw new IllegalArgumentException(labels.length + " labels for " + count() + " bins");
        }
        for (int j = 0; j < labels.length; j++) {
            if (labels[j] == null) {
                throw new IllegalArgumentException("label of bin " + j + " is null");
            }
        }
        return new Bins(edges, labels.clone());
    }

    /** Number of bins D. */
    public int count() {
        return edges.length - 1;
    }

    /** The D + 1 edges (a copy). */
    public double[] edges() {
        return edges.clone();
    }

    /** Edge i, 0 ≤ i ≤ D. */
    public double edge(int i) {
        return edges[i];
    }

    /** Lower end e_0 of the range. */
    public double lower() {
        return edges[0];
    }

    /** Upper end e_D of the range. */
    public double upper() {
        return edges[edges.length - 1];
    }

    /** Whether the bins carry labels. */
    public boolean hasLabels() {
        return labels != null;
    }

    /** The labels (a copy), or null. */
    public String[] labels() {
        return labels == null ? null : labels.clone();
    }

    /** The index of the bin with this label, or −1 (also when the bins have no labels). */
    public int indexOfLabel(String label) {
        Integer j = byLabel.get(label);
        return j == null ? -1 : j;
    }

    /**
     * The bin of a value: j with e_j ≤ x &lt; e_{j+1}, or D − 1 for x = e_D; −1 below the range
     * (or NaN), D above it. Binary search, O(log D).
     */
    public int indexOf(double x) {
        int d = edges.length - 1;
        if (!(x >= edges[0])) {
            return -1;
        }
        if (x >= edges[d]) {
            return x == edges[d] ? d - 1 : d;
        }
        int lo = 0, hi = d; // edges[lo] <= x < edges[hi]
        while (hi - lo > 1) {
            int mid = (lo + hi) >>> 1;
            if (x < edges[mid]) {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        return lo;
    }

    /**
     * Checks the layout against a space: every edge must lie in the domain [a, b] (the bins need not
     * cover it; the estimators then condition on [e_0, e_D]). On a periodic space
     * ({@link BayesSpace#isPeriodic()}) the edges must instead span one period, e_D − e_0 = P within a
     * relative 1e-12, from any start, so that a bin may wrap around the cut point (as the estimators
     * accept them).
     *
     * @throws IllegalArgumentException naming the first edge outside the domain, or the span on a circle
     */
    public Bins checkAgainst(BayesSpace space) {
        Objects.requireNonNull(space, "space");
        double a = space.lower(), b = space.upper();
        if (space.isPeriodic()) {
            double span = upper() - lower(), period = space.period();
            if (!(Math.abs(span - period) <= 1e-12 * period)) {
                throw new IllegalArgumentException("the bin layout [" + lower() + ", " + upper() + "] spans " + span
                        + ", but on the circle of " + space + " it must span one period " + period + " (any start; a"
                        + " bin may wrap around the cut point " + a + ")");
            }
            return this;
        }
        for (int i = 0; i < edges.length; i++) {
            if (!(edges[i] >= a && edges[i] <= b)) {
                throw new IllegalArgumentException("bin edge " + i + " = " + edges[i] + " lies outside the domain ["
                        + a + ", " + b + "] of the space; the bin layout must lie inside the domain");
            }
        }
        return this;
    }

    /** Exact equality of edges and labels. */
    @Override
    public boolean equals(Object o) {
        return o instanceof Bins && Arrays.equals(edges, ((Bins) o).edges) && Arrays.equals(labels, ((Bins) o).labels);
    }

    @Override
    public int hashCode() {
        return 31 * Arrays.hashCode(edges) + Arrays.hashCode(labels);
    }

    @Override
    public String toString() {
        return "Bins[" + count() + " over [" + lower() + ", " + upper() + "]" + (labels != null ? ", labelled" : "")
                + "]";
    }
}
