package io.densa.bench;

import io.densa.io.Bins;
import io.densa.io.tables.BulkObservations;
import io.densa.io.tables.BulkSummary;
import io.densa.io.raster.Crs;
import io.densa.io.raster.GeoTiffOptions;
import io.densa.io.raster.GeoTiffWriter;
import io.densa.io.tables.OutsidePolicy;
import io.densa.io.raster.RasterLayout;
import io.densa.io.raster.RasterSummary;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;

/**
 * bayes-io at scale (sizes through {@link BenchConfig#size}; quick mode shrinks them):
 * <ul>
 * <li>{@link #histogramsFromParquet}: {@code rows} raw observations of {@code units} units in a Parquet
 *     file → per-unit histograms of 50 bins streamed in batches ({@link BulkObservations}); target
 *     10⁸ rows → 10⁵ histograms under 20 s on 2 cores. The file is generated once by the embedded
 *     engine's own SQL and kept in {@code java.io.tmpdir/densa-bench/} (reused if present): unit =
 *     hash(i, 1) mod units (an INTEGER column, or the text "u" + zero-padded number with
 *     {@code unitType = VARCHAR}), value = 20 + 60 (unit mod 97)/97 + 10 (U₁ + U₂ + U₃ − 1.5) with
 *     U_k = (hash(i, k + 1) &gt;&gt; 11)/2⁵³, i = 0 .. rows − 1 (deterministic for a given engine
 *     version).</li>
 * <li>{@link #geoTiffWrite}: a {@code cells}-cell GeoTIFF with 4 float32 bands written in strips of 64
 *     rows through {@link GeoTiffWriter} (values a cheap closed form; prediction excluded); target 10⁷
 *     cells under 10 s with heap under 512 MB (the fork runs with -Xmx512m).</li>
 * </ul>
 */
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 1)
@Measurement(iterations = 3)
@Fork(value = 1, jvmArgsAppend = "-Xmx512m")
public class IoBenchmark {
    /** The observation file, generated once. */
    @State(Scope.Benchmark)
    public static class Events {
        @Param({"100000000"})
        public long rows;

        @Param({"100000"})
        public int units;

        @Param({"INTEGER"})
        public String unitType;

        Path parquet;

        @Setup
        public void setUp() throws IOException, SQLException {
            long nRows = BenchConfig.quick() ? Math.min(rows, 20_000) : rows;
            int nUnits = BenchConfig.size(units, 100);
            Path dir = Path.of(System.getProperty("java.io.tmpdir"), "densa-bench");
            Files.createDirectories(dir);
            parquet = dir.resolve("events-" + nRows + "-" + nUnits + "-" + unitType + ".parquet");
            if (!Files.exists(parquet)) {
                String unit = unitType.equals("VARCHAR")
                        ? "'u' || lpad((hash(i, 1) % " + nUnits + ")::VARCHAR, 6, '0')"
                        : "(hash(i, 1) % " + nUnits + ")::INTEGER";
                String u = "(hash(i, %d) >> 11)::DOUBLE / 9007199254740992";
                String sql = "COPY (SELECT " + unit + " AS unit, 20 + 60 * ((hash(i, 1) % " + nUnits + ") % 97)::DOUBLE / 97"
                        + " + 10 * (" + String.format(u, 2) + " + " + String.format(u, 3) + " + " + String.format(u, 4)
                        + " - 1.5) AS value FROM range(" + nRows + ") t(i)) TO '" + parquet + ".tmp' (FORMAT parquet)";
                try (Connection c = DriverManager.getConnection("jdbc:duckdb:"); Statement st = c.createStatement()) {
                    st.execute(sql);
                }
                Files.move(Path.of(parquet + ".tmp"), parquet);
            }
        }
    }

    /** The output directory of the GeoTIFF benchmark. */
    @State(Scope.Benchmark)
    public static class Raster {
        @Param({"10000000"})
        public int cells;

        Path dir;
        int side;

        @Setup
        public void setUp() throws IOException {
            dir = Files.createTempDirectory("densa-tiff");
            side = (int) Math.round(Math.sqrt(BenchConfig.quick() ? Math.min(cells, 10_000) : cells));
        }

        @TearDown
        public void tearDown() throws IOException {
            try (var s = Files.list(dir)) {
                for (Path p : (Iterable<Path>) s::iterator) {
                    Files.deleteIfExists(p);
                }
            }
            Files.deleteIfExists(dir);
        }
    }

    @Benchmark
    public long histogramsFromParquet(Events ev) {
        long[] seen = {0};
        BulkSummary s = BulkObservations.of(ev.parquet, "unit", "value").withBatchUnits(8192)
                .histograms(Bins.uniform(0, 100, 50), OutsidePolicy.DROP, t -> seen[0] += t.size());
        if (s.units() != seen[0]) {
            throw new IllegalStateException("units delivered " + seen[0] + " != " + s.units());
        }
        return s.observations();
    }

    @Benchmark
    public long geoTiffWrite(Raster r) {
        int side = r.side;
        int strip = 64;
        RasterLayout lay = new RasterLayout(side, side, 500_000, 5_000_000, 10, 10, Crs.projected(32633),
                List.of("median", "q90", "p_exceed", "kriging_sd"));
        int[] cs = new int[side * strip];
        int[] js = new int[side * strip];
        double[][] v = new double[4][side * strip];
        try (GeoTiffWriter w = GeoTiffWriter.create(r.dir.resolve("bench.tif"), lay, GeoTiffOptions.defaults())) {
            for (int j0 = 0; j0 < side; j0 += strip) {
                int n = 0;
                for (int j = j0; j < Math.min(side, j0 + strip); j++) {
                    for (int c = 0; c < side; c++) {
                        cs[n] = c;
                        js[n] = j;
                        double base = 0.001 * c + 0.002 * j;
                        v[0][n] = base;
                        v[1][n] = base + 1;
                        v[2][n] = (c ^ j) * 0x1p-20;
                        v[3][n] = 0.5 + base * 0.01;
                        n++;
                    }
                }
                w.writeCells(n, cs, js, v);
                w.finishRowsBelow(j0 + strip);
            }
            RasterSummary s = w.finish();
            return s.bytes();
        } catch (UncheckedIOException e) {
            throw e;
        }
    }
}
