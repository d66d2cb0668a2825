package io.densa.io.tables;

import io.densa.io.Bins;
import io.densa.io.CircularValues;
import io.densa.io.ReadLimits;
import io.densa.core.BayesSpace;
import java.util.Arrays;
import java.util.Objects;

/**
 * Reads raw observations — one row per event with unit id, value, optional weight and optional
 * period — from a {@link TableSource} into memory, either kept as samples ({@link #samples}) or
 * binned into counts ({@link #counts}). For files too large for memory use {@link BulkObservations}.
 *
 * <p>Semantics: a row's value must be a number (a missing or non-numeric value is an error, whatever
 * the policy); a value outside the accepted range — the space's domain [a, b] for samples, the bins'
 * range [e_0, e_D] for counts — is handled by the {@link OutsidePolicy}, and the result reports how
 * many were dropped or clamped. Weights must be finite and ≥ 0; binned counts are then sums of
 * weights. Units (unit–period pairs) are in order of first appearance.
 *
 * <p>On a periodic space ({@link BayesSpace#isPeriodic()}: {@link #samples}, and {@link #counts(TableSource,
 * Bins, BayesSpace, OutsidePolicy)} given the space) every finite value is a point of the circle: it is
 * reduced modulo the period into [a, a + P) for samples, into [e_0, e_0 + P) before binning (so a bin
 * that wraps around the cut point receives both 2 and 367 on a circle of period 365), by
 * {@link CircularValues}. The outside-range policy then never applies (the report counts no value
 * outside); a value that is missing or not a finite number is still an error naming the line and column.
 *
 * <p>All or nothing: the first bad row ends the read with an {@link IllegalArgumentException}
 * naming the source, line or row, column, the value and the accepted form (for a value outside the
 * range: the policy that applies and how to choose another).
 *
 * <p>Example:
 * <pre>{@code
 * SampleTable s = ObservationReader.of("monitor", "pm25")
 *         .samples(TableSource.csv(Path.of("readings.csv")), space, OutsidePolicy.DROP);
 * BatchEstimate est = s.fit(PenalizedLikelihoodEstimator.withDefaults(space));
 * }</pre>
 *
 * <p>Immutable and thread-safe.
 */
public final class ObservationReader {
    private final String unitColumn;
    private final String valueColumn;
    private final String weightColumn;
    private final String periodColumn;
    private final ReadLimits limits;

    private ObservationReader(String unitColumn, String valueColumn, String weightColumn, String periodColumn,
            ReadLimits limits) {
        this.unitColumn = unitColumn;
        this.valueColumn = valueColumn;
        this.weightColumn = weightColumn;
        this.periodColumn = periodColumn;
        this.limits = limits;
    }

    /** A reader of the named unit-id and value columns. */
    public static ObservationReader of(String unitColumn, String valueColumn) {
        return new ObservationReader(Objects.requireNonNull(unitColumn, "unitColumn"),
                Objects.requireNonNull(valueColumn, "valueColumn"), null, null, ReadLimits.defaults());
    }

    /** With a weight column (finite numbers ≥ 0). */
    public ObservationReader withWeight(String column) {
        return new ObservationReader(unitColumn, valueColumn, Objects.requireNonNull(column, "column"), periodColumn,
                limits);
    }

    /** With a period column; rows are then unit–period pairs. */
    public ObservationReader withPeriod(String column) {
        return new ObservationReader(unitColumn, valueColumn, weightColumn, Objects.requireNonNull(column, "column"),
                limits);
    }

    /** With other read limits. */
    public ObservationReader withLimits(ReadLimits l) {
        return new ObservationReader(unitColumn, valueColumn, weightColumn, periodColumn,
                Objects.requireNonNull(l, "limits"));
    }

    /**
     * Reads the observations as samples inside the space's domain; on a periodic space every finite
     * value, reduced modulo the period into [a, a + P) (the policy then never applies).
     *
     * @throws IllegalArgumentException for a missing column, a bad row, a value outside the domain
     *                                  under {@link OutsidePolicy#REJECT}, or a limit exceeded
     */
    public SampleTable samples(TableSource source, BayesSpace space, OutsidePolicy policy) {
        Objects.requireNonNull(source, "source");
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(policy, "policy");
        Acc acc = new Acc(weightColumn != null);
        try (RowCursor cur = RowCursor.open(source, limits)) {
            OutsideReport rep = scan(cur, space.lower(), space.upper(), policy, "the domain of the space", acc,
                    null, space.isPeriodic() ? space.period() : 0);
            int n = acc.keys.size();
            double[][] v = new double[n][];
            double[][] w = weightColumn == null ? null : new double[n][];
            for (int u = 0; u < n; u++) {
                v[u] = Arrays.copyOf(acc.values[u], acc.sizes[u]);
                if (w != null) {
                    w[u] = Arrays.copyOf(acc.weights[u], acc.sizes[u]);
                }
            }
            return new SampleTable(acc.keys.idArray(), acc.keys.periodArray(), v, w, rep, cur.source);
        }
    }

    /**
     * Reads the observations and bins them: counts (sums of weights with a weight column) per unit
     * and bin. The bins are taken as a bounded layout: a value outside [e_0, e_D] follows the policy,
     * also when the bins are meant for a periodic space; for those give the space
     * ({@link #counts(TableSource, Bins, BayesSpace, OutsidePolicy)}).
     *
     * @throws IllegalArgumentException for a missing column, a bad row, a value outside the bins'
     *                                  range under {@link OutsidePolicy#REJECT}, or a limit exceeded
     */
    public CountTable counts(TableSource source, Bins bins, OutsidePolicy policy) {
        return counts(source, bins, 0, policy);
    }

    /**
     * Reads the observations and bins them for the given space: on a bounded space exactly as
     * {@link #counts(TableSource, Bins, OutsidePolicy)}; on a periodic space (bins spanning one period
     * from any start, {@link Bins#checkAgainst}) every finite value is reduced modulo the period into
     * [e_0, e_0 + P) before binning, so −3, 362 and 727 land in one bin on a circle of period 365 and a
     * bin that wraps around the cut point receives values on both sides of it; the policy then never
     * applies.
     *
     * @throws IllegalArgumentException if the bins do not fit the space, or as
     *                                  {@link #counts(TableSource, Bins, OutsidePolicy)}
     */
    public CountTable counts(TableSource source, Bins bins, BayesSpace space, OutsidePolicy policy) {
        Objects.requireNonNull(bins, "bins").checkAgainst(Objects.requireNonNull(space, "space"));
        return counts(source, bins, space.isPeriodic() ? space.period() : 0, policy);
    }

    private CountTable counts(TableSource source, Bins bins, double period, OutsidePolicy policy) {
        Objects.requireNonNull(source, "source");
        Objects.requireNonNull(bins, "bins");
        Objects.requireNonNull(policy, "policy");
        RowCursor.checkBinCount(bins, limits);
        Acc acc = new Acc(false);
        acc.bins = bins;
        acc.maxCells = limits.maxCells();
        try (RowCursor cur = RowCursor.open(source, limits)) {
            OutsideReport rep = scan(cur, bins.lower(), bins.upper(), policy, "the range of the bins", acc, bins,
                    period);
            int n = acc.keys.size();
            double[][] c = Arrays.copyOf(acc.counts, n);
            return new CountTable(bins, acc.keys.idArray(), acc.keys.periodArray(), c, rep, cur.source);
        }
    }

    /** circle &gt; 0, the period: values are wrapped onto the circle (samples into [lo, hi), bins from e_0); 0: bounded. */
    private OutsideReport scan(RowCursor cur, double lo, double hi, OutsidePolicy policy, String range, Acc acc,
            Bins bins, double circle) {
        int cu = cur.column(unitColumn, "unit");
        int cv = cur.column(valueColumn, "value");
        int cw = weightColumn == null ? -1 : cur.column(weightColumn, "weight");
        int cp = periodColumn == null ? -1 : cur.column(periodColumn, "period");
        acc.keys = new UnitKeys(cp >= 0, limits.maxUnits(), cur.source);
        long seen = 0, dropped = 0, below = 0, above = 0;
        while (cur.next()) {
            String id = cur.text(cu, "unit id");
            String period = cp >= 0 ? cur.text(cp, "period") : null;
            double x = cur.requiredNumber(cv, "value", "a finite number");
            double w = 1;
            if (cw >= 0) {
                w = cur.requiredNumber(cw, "weight", "a finite number >= 0");
                if (!(w >= 0)) {
                    throw new IllegalArgumentException(cur.where() + ", column '" + weightColumn + "': weight " + w
                            + " is negative; expected a finite number >= 0");
                }
            }
            seen++;
            if (circle > 0) {
                int u = acc.keys.indexOf(id, period);
                if (bins != null) {
                    acc.addCount(u, CircularValues.binOf(bins, x, circle), w, cur.source);
                } else {
                    acc.addValue(u, CircularValues.wrap(x, lo, hi), w);
                }
                continue;
            }
            if (!(x >= lo && x <= hi)) {
                switch (policy) {
                    case REJECT:
                        throw new IllegalArgumentException(cur.where() + ", column '" + valueColumn + "': value " + x
                                + " of unit '" + id + "' lies outside " + range + " [" + lo + ", " + hi
                                + "] and the policy is REJECT; choose OutsidePolicy.DROP or CLAMP to accept such"
                                + " values, or widen the range");
                    case DROP:
                        dropped++;
                        continue;
                    default:
                        if (x < lo) {
                            below++;
                            x = lo;
                        } else {
                            above++;
                            x = hi;
                        }
                }
            }
            int u = acc.keys.indexOf(id, period);
            if (bins != null) {
                acc.addCount(u, bins.indexOf(x), w, cur.source);
            } else {
                acc.addValue(u, x, w);
            }
        }
        return new OutsideReport(policy, lo, hi, seen, dropped, below, above);
    }

    /** Per-unit accumulators. */
    private static final class Acc {
        UnitKeys keys;
        Bins bins;
        long maxCells;
        double[][] values = new double[16][];
        double[][] weights;
        int[] sizes = new int[16];
        double[][] counts = new double[16][];

        Acc(boolean weighted) {
            weights = weighted ? new double[16][] : null;
        }

        private void grow(int u) {
            if (u >= sizes.length) {
                int n = Math.max(u + 1, sizes.length * 2);
                values = Arrays.copyOf(values, n);
                sizes = Arrays.copyOf(sizes, n);
                counts = Arrays.copyOf(counts, n);
                if (weights != null) {
                    weights = Arrays.copyOf(weights, n);
                }
            }
        }

        void addValue(int u, double x, double w) {
            grow(u);
            if (values[u] == null) {
                values[u] = new double[4];
                if (weights != null) {
                    weights[u] = new double[4];
                }
            }
            int s = sizes[u];
            if (s == values[u].length) {
                values[u] = Arrays.copyOf(values[u], s * 2);
                if (weights != null) {
                    weights[u] = Arrays.copyOf(weights[u], s * 2);
                }
            }
            values[u][s] = x;
            if (weights != null) {
                weights[u][s] = w;
            }
            sizes[u] = s + 1;
        }

        void addCount(int u, int b, double w, String source) {
            grow(u);
            if (counts[u] == null) {
                if ((long) (u + 1) * bins.count() > maxCells) {
                    throw new IllegalArgumentException(source + ": " + (u + 1) + " units x " + bins.count()
                            + " bins exceed the cell limit of " + maxCells + " (ReadLimits.withMaxCells)");
                }
                counts[u] = new double[bins.count()];
            }
            counts[u][b] += w;
        }
    }
}
