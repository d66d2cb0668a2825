package io.densa.io.tables;

import io.densa.io.Bins;
import io.densa.io.ReadLimits;
import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Objects;
import java.util.function.BiConsumer;
import java.util.function.Consumer;

/**
 * Raw observations in files too large for memory (10⁸ rows and more, CSV or Parquet), aggregated by
 * an embedded SQL engine (DuckDB, in-process, through JDBC) and streamed to the caller in batches of
 * units: per-unit histograms ({@link #histograms}) or per-unit samples ({@link #samples}), or fitted
 * batch by batch ({@link #fitHistograms}, {@link #fitSamples}). The events never enter the Java heap:
 * the engine bins and counts them ({@code GROUP BY} unit, period and bin into a temporary table) and
 * the Java side reads the small result ordered by unit.
 *
 * <p><b>Requires</b> the optional dependency {@code org.duckdb:duckdb_jdbc} on the class path (an
 * IllegalStateException says so otherwise).
 *
 * <p><b>Semantics.</b> Bins are [e_j, e_{j+1}) with the last closed, compared in double precision
 * exactly as {@link Bins#indexOf}; values outside [e_0, e_D] (for samples: outside the space's
 * domain) follow the {@link OutsidePolicy}, and infinite values count as outside. A missing unit, a
 * missing or NaN value and a missing, negative or non-finite weight are errors whatever the policy.
 * Units (unit–period pairs) are delivered in ascending order of the unit column (numeric order for
 * numeric columns, binary string order for text), then of the period; ids are the column values as
 * text. A unit all of whose values were dropped is not delivered. On a periodic space
 * ({@link BayesSpace#isPeriodic()}: {@link #samples}, {@link #fitSamples}, {@link #fitHistograms} and
 * {@link #histograms(Bins, BayesSpace, OutsidePolicy, Consumer)}) every finite value is reduced modulo
 * the period — into [a, a + P) for samples, into [e_0, e_0 + P) before binning, by the arithmetic of
 * {@link io.densa.io.CircularValues} — so the policy never applies there; an infinite value is then an
 * error. Samples are delivered sorted by
 * value (then weight), so results do not depend on the file's row order or the engine's threads.
 *
 * <p><b>All or nothing.</b> The whole file is checked before the first batch is delivered; a
 * problem ends the pass with an {@link IllegalArgumentException} naming the file, the data row
 * (counted from 1, header excluded), the column, the value and the accepted form, and the consumer
 * has then received nothing.
 *
 * <p><b>Safety.</b> The engine runs in a sandbox configured before the file is opened and then
 * locked: it may read only the given file (and write spill files only into its own temporary
 * directory), so paths inside a file cannot make it open others; extensions are neither installed
 * nor loaded. Memory is bounded by the engine's memory limit ({@link #withMemoryLimitMiB}, default
 * 1024 MiB, beyond which it spills to disk) and, on the Java side, by the batch size. Unit ids and
 * periods longer than {@link ReadLimits#maxFieldChars()} and more than {@link ReadLimits#maxUnits()}
 * units are refused; a CSV line longer than {@link ReadLimits#maxRecordChars()} is a malformed file.
 *
 * <p>Example:
 * <pre>{@code
 * BulkObservations file = BulkObservations.of(Path.of("events.parquet"), "station", "value");
 * BulkSummary s = file.fitHistograms(PenalizedLikelihoodEstimator.withDefaults(space), Bins.uniform(space, 50),
 *         OutsidePolicy.DROP, (counts, estimate) -> store(estimate.densities()));
 * }</pre>
 *
 * <p>Immutable; each call opens and closes its own in-memory engine.
 */
public final class BulkObservations {
    /** File formats the engine reads. */
    public enum Format {
        /** RFC 4180 CSV, UTF-8, first line the header. */
        CSV,
        /** Apache Parquet. */
        PARQUET
    }

    private static final String GLOB = "*?[{";

    final Path file;
    final Format format;
    final String unitColumn;
    final String valueColumn;
    final String weightColumn;
    final String periodColumn;
    final int batchUnits;
    final long memoryMiB;
    private final int threads;
    final ReadLimits limits;

    private BulkObservations(Path file, Format format, String unitColumn, String valueColumn, String weightColumn,
            String periodColumn, int batchUnits, long memoryMiB, int threads, ReadLimits limits) {
        this.file = file;
        this.format = format;
        this.unitColumn = unitColumn;
        this.valueColumn = valueColumn;
        this.weightColumn = weightColumn;
        this.periodColumn = periodColumn;
        this.batchUnits = batchUnits;
        this.memoryMiB = memoryMiB;
        this.threads = threads;
        this.limits = limits;
    }

    /**
     * A file whose format follows from its name: {@code .parquet} or {@code .pq} for Parquet,
     * {@code .csv} (optionally {@code .gz}) for CSV.
     */
    public static BulkObservations of(Path file, String unitColumn, String valueColumn) {
        Objects.requireNonNull(file, "file");
        String n = file.getFileName() == null ? "" : file.getFileName().toString().toLowerCase(Locale.ROOT);
        Format f;
        if (n.endsWith(".parquet") || n.endsWith(".pq")) {
            f = Format.PARQUET;
        } else if (n.endsWith(".csv") || n.endsWith(".csv.gz")) {
            f = Format.CSV;
        } else {
            throw new IllegalArgumentException("cannot tell the format of " + file
                    + " from its name (.parquet, .pq, .csv, .csv.gz); give it with of(file, format, ...)");
        }
        return of(file, f, unitColumn, valueColumn);
    }

    /** A file of the given format. */
    public static BulkObservations of(Path file, Format format, String unitColumn, String valueColumn) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(format, "format");
        return new BulkObservations(file, format, Objects.requireNonNull(unitColumn, "unitColumn"),
                Objects.requireNonNull(valueColumn, "valueColumn"), null, null, 4096, 1024,
                Runtime.getRuntime().availableProcessors(), ReadLimits.defaults());
    }

    /** With a weight column (finite numbers ≥ 0; histograms then hold sums of weights). */
    public BulkObservations withWeight(String column) {
        return new BulkObservations(file, format, unitColumn, valueColumn, Objects.requireNonNull(column, "column"),
                periodColumn, batchUnits, memoryMiB, threads, limits);
    }

    /** With a period column; units are then unit–period pairs. */
    public BulkObservations withPeriod(String column) {
        return new BulkObservations(file, format, unitColumn, valueColumn, weightColumn,
                Objects.requireNonNull(column, "column"), batchUnits, memoryMiB, threads, limits);
    }

    /** Units per delivered batch, in [1, 10⁶] (default 4096). */
    public BulkObservations withBatchUnits(int units) {
        if (units < 1 || units > 1_000_000) {
            throw new IllegalArgumentException("batch size must be in [1, 1000000] units, got " + units);
        }
        return new BulkObservations(file, format, unitColumn, valueColumn, weightColumn, periodColumn, units,
                memoryMiB, threads, limits);
    }

    /** The engine's memory limit in MiB, at least 64 (default 1024); beyond it the engine spills to disk. */
    public BulkObservations withMemoryLimitMiB(long mib) {
        if (mib < 64) {
            throw new IllegalArgumentException("memory limit must be at least 64 MiB, got " + mib);
        }
        return new BulkObservations(file, format, unitColumn, valueColumn, weightColumn, periodColumn, batchUnits,
                mib, threads, limits);
    }

    /** The engine's worker threads, in [1, 256] (default: available processors). Results do not depend on it. */
    public BulkObservations withThreads(int n) {
        if (n < 1 || n > 256) {
            throw new IllegalArgumentException("threads must be in [1, 256], got " + n);
        }
        return new BulkObservations(file, format, unitColumn, valueColumn, weightColumn, periodColumn, batchUnits,
                memoryMiB, n, limits);
    }

    /** With other read limits (units, field and CSV line lengths, largest sample of one unit). */
    public BulkObservations withLimits(ReadLimits l) {
        return new BulkObservations(file, format, unitColumn, valueColumn, weightColumn, periodColumn, batchUnits,
                memoryMiB, threads, Objects.requireNonNull(l, "limits"));
    }

    // ------------------------------------------------------------------ histograms

    /**
     * Bins every observation and delivers the per-unit counts in batches of at most
     * {@link #withBatchUnits} units, in unit order; every batch carries the whole file's
     * {@link OutsideReport}. The bins are taken as a bounded layout (values outside [e_0, e_D] follow
     * the policy); for bins on a periodic space give the space
     * ({@link #histograms(Bins, BayesSpace, OutsidePolicy, Consumer)}).
     *
     * @param bins     the bin layout
     * @param policy   what to do with values outside [e_0, e_D]
     * @param consumer receives the batches, on the calling thread
     * @return the totals
     * @throws IllegalArgumentException for a missing column, a bad value (naming the data row), a value
     *                                  outside the bins under {@link OutsidePolicy#REJECT}, a malformed
     *                                  file or a limit exceeded; the consumer has then received nothing
     */
    public BulkSummary histograms(Bins bins, OutsidePolicy policy, Consumer<CountTable> consumer) {
        Objects.requireNonNull(bins, "bins");
        Objects.requireNonNull(policy, "policy");
        Objects.requireNonNull(consumer, "consumer");
        return histograms(bins, 0, policy, consumer);
    }

    /**
     * {@link #histograms(Bins, OutsidePolicy, Consumer)} for the given space: the same on a bounded
     * space; on a periodic space (bins spanning one period from any start, {@link Bins#checkAgainst})
     * every finite value is reduced modulo the period into [e_0, e_0 + P) before binning, so a bin that
     * wraps around the cut point receives values from both sides of it, and the policy never applies.
     *
     * @throws IllegalArgumentException if the bins do not fit the space, for an infinite value on a
     *                                  circle, or as {@link #histograms(Bins, OutsidePolicy, Consumer)}
     */
    public BulkSummary histograms(Bins bins, BayesSpace space, OutsidePolicy policy, Consumer<CountTable> consumer) {
        Objects.requireNonNull(bins, "bins").checkAgainst(Objects.requireNonNull(space, "space"));
        return histograms(bins, space.isPeriodic() ? space.period() : 0, policy, consumer);
    }

    private BulkSummary histograms(Bins bins, double circle, OutsidePolicy policy, Consumer<CountTable> consumer) {
        Objects.requireNonNull(bins, "bins");
        Objects.requireNonNull(policy, "policy");
        Objects.requireNonNull(consumer, "consumer");
        RowCursor.checkBinCount(bins, limits);
        try (BulkEngine e = open(threads)) {
            return e.histograms(bins, circle, policy, consumer);
        }
    }

    /**
     * {@link #histograms} with each batch fitted by {@link CountTable#fit}: the consumer receives the
     * counts and their estimate.
     */
    public BulkSummary fitHistograms(PenalizedLikelihoodEstimator estimator, Bins bins, OutsidePolicy policy,
            BiConsumer<CountTable, BatchEstimate> consumer) {
        Objects.requireNonNull(estimator, "estimator");
        Objects.requireNonNull(consumer, "consumer");
        return histograms(bins, estimator.space(), policy, t -> consumer.accept(t, t.fit(estimator)));
    }

    // ------------------------------------------------------------------ samples

    /**
     * Delivers the observations per unit, as samples inside the space's domain, in batches of at most
     * {@link #withBatchUnits} units (a batch also closes once it holds {@link ReadLimits#maxRows()}
     * observations; a single unit with more is refused).
     *
     * @throws IllegalArgumentException as {@link #histograms}
     */
    public BulkSummary samples(BayesSpace space, OutsidePolicy policy, Consumer<SampleTable> consumer) {
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(policy, "policy");
        Objects.requireNonNull(consumer, "consumer");
        try (BulkEngine e = open(threads)) {
            return e.samples(space.lower(), space.upper(), space.isPeriodic() ? space.period() : 0, policy, consumer);
        }
    }

    /** {@link #samples} with each batch fitted by {@link SampleTable#fit}. */
    public BulkSummary fitSamples(PenalizedLikelihoodEstimator estimator, OutsidePolicy policy,
            BiConsumer<SampleTable, BatchEstimate> consumer) {
        Objects.requireNonNull(estimator, "estimator");
        Objects.requireNonNull(consumer, "consumer");
        return samples(estimator.space(), policy, t -> consumer.accept(t, t.fit(estimator)));
    }

    // ------------------------------------------------------------------ engine

    String source() {
        return "file " + file;
    }

    private BulkEngine open(int nThreads) {
        Path abs = file.toAbsolutePath().normalize();
        String p = abs.toString();
        for (char c : GLOB.toCharArray()) {
            if (p.indexOf(c) >= 0) {
                throw new IllegalArgumentException(source() + ": the path contains '" + c
                        + "', which the SQL engine would read as a file pattern; rename or link the file");
            }
        }
        if (p.indexOf('\0') >= 0 || p.indexOf('\n') >= 0) {
            throw new IllegalArgumentException(source() + ": the path contains a control character");
        }
        if (!Files.isRegularFile(abs)) {
            throw new IllegalArgumentException(source() + " does not exist or is not a regular file");
        }
        return new BulkEngine(this, abs, nThreads);
    }

    static String literal(String s) {
        return "'" + s.replace("'", "''") + "'";
    }

    static String ident(String s) {
        return "\"" + s.replace("\"", "\"\"") + "\"";
    }

    /** Exact double literal: the shortest decimal that reads back as x, parsed by the engine as DOUBLE. */
    static String dbl(double x) {
        return "CAST('" + Double.toString(x) + "' AS DOUBLE)";
    }

    /** Whether the edges are exactly those of Bins.uniform(e0, eD, D). */
    static boolean uniformEdges(double[] e) {
        int d = e.length - 1;
        for (int j = 1; j < d; j++) {
            if (e[j] != e[0] + j * (e[d] - e[0]) / d) {
                return false;
            }
        }
        return true;
    }

    /** Edge k of a uniform layout in SQL, by the same operations as Bins.uniform: e0 + (k (eD − e0)) / D. */
    static String edgeSql(double e0, String range, int d, String k) {
        return "(" + dbl(e0) + " + ((" + k + ")::DOUBLE * " + range + ") / " + d + ")";
    }

    /** Nested CASE: binary search for the bin of v in [e[lo], e[hi]]. */
    static String binTree(double[] e, int lo, int hi) {
        if (hi - lo == 1) {
            return Integer.toString(lo);
        }
        int m = (lo + hi) >>> 1;
        return "CASE WHEN v < " + dbl(e[m]) + " THEN " + binTree(e, lo, m) + " ELSE " + binTree(e, m, hi) + " END";
    }
}
