package io.densa.io.tables;


import io.densa.io.Bins;
import io.densa.io.ReadLimits;
import static io.densa.io.IoTestSupport.rejects;
import static io.densa.io.IoTestSupport.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The embedded SQL engine on CSV and Parquet files it writes itself (COPY). Every row is a closed
 * form of its index i: unit "u" + (i mod 7), value ((37 i) mod 1000) / 8 (a multiple of 1/8, exact
 * in binary, some exactly on bin edges), weight i mod 3, year 2020 + (i mod 2), so the expected
 * histograms are computed here by a plain loop over i.
 */
class BulkObservationsTest {
    @TempDir
    static Path dir;

    private static final int N = 20_000;
    private static final Bins BINS = Bins.of(0, 10, 25, 25.125, 50, 100);
    private static Path parquet;
    private static Path csv;

    @BeforeAll
    static void writeFiles() throws Exception {
        parquet = dir.resolve("events.parquet");
        csv = dir.resolve("events.csv");
        String rows = "SELECT 'u' || (i % 7) AS unit, ((i * 37) % 1000)::DOUBLE / 8 AS value, (i % 3)::DOUBLE AS w,"
                + " 2020 + (i % 2) AS year FROM range(" + N + ") t(i) ORDER BY i";
        try (Connection c = DriverManager.getConnection("jdbc:duckdb:"); Statement st = c.createStatement()) {
            st.execute("COPY (" + rows + ") TO '" + parquet + "' (FORMAT parquet)");
            st.execute("COPY (" + rows + ") TO '" + csv + "' (HEADER, DELIMITER ',')");
        }
    }

    private static double value(int i) {
        return ((i * 37L) % 1000) / 8.0;
    }

    /** Expected histograms by unit id: counts (weights summed when weighted), with the policy. */
    private static Map<String, double[]> expected(boolean weighted, OutsidePolicy policy) {
        Map<String, double[]> m = new TreeMap<>();
        for (int i = 0; i < N; i++) {
            int b = BINS.indexOf(value(i));
            if (b < 0 || b >= BINS.count()) {
                if (policy == OutsidePolicy.DROP) {
                    continue;
                }
                b = b < 0 ? 0 : BINS.count() - 1;
            }
            m.computeIfAbsent("u" + (i % 7), k -> new double[BINS.count()])[b] += weighted ? i % 3 : 1;
        }
        return m;
    }

    private static Map<String, double[]> collect(List<CountTable> batches) {
        Map<String, double[]> m = new TreeMap<>();
        for (CountTable t : batches) {
            for (int r = 0; r < t.size(); r++) {
                m.put(t.ids()[r], t.counts(r));
            }
        }
        return m;
    }

    @Test
    void parquetHistogramsMatchTheClosedFormInUnitOrderAndBatches() {
        List<CountTable> got = new ArrayList<>();
        BulkSummary s = BulkObservations.of(parquet, "unit", "value").withBatchUnits(3)
                .histograms(BINS, OutsidePolicy.DROP, got::add);
        assertEquals(List.of(3, 3, 1), got.stream().map(CountTable::size).toList());
        assertArrayEquals(new String[] {"u0", "u1", "u2"}, got.get(0).ids());
        Map<String, double[]> want = expected(false, OutsidePolicy.DROP);
        Map<String, double[]> have = collect(got);
        assertEquals(want.keySet(), have.keySet());
        want.forEach((k, v) -> assertArrayEquals(v, have.get(k), k));
        long outside = 0;
        for (int i = 0; i < N; i++) {
            outside += value(i) > 100 ? 1 : 0;
        }
        assertEquals(new OutsideReport(OutsidePolicy.DROP, 0, 100, N, outside, 0, 0), s.outside());
        assertEquals(7, s.units());
        assertEquals(3, s.batches());
        assertEquals(N - outside, s.observations());
    }

    @Test
    void csvWeightedAndClampedHistogramsMatchTheClosedForm() {
        List<CountTable> got = new ArrayList<>();
        BulkSummary s = BulkObservations.of(csv, "unit", "value").withWeight("w").withThreads(1)
                .histograms(BINS, OutsidePolicy.CLAMP, got::add);
        Map<String, double[]> want = expected(true, OutsidePolicy.CLAMP);
        Map<String, double[]> have = collect(got);
        want.forEach((k, v) -> assertArrayEquals(v, have.get(k), k));
        assertTrue(s.outside().clampedAbove() > 0);
        assertEquals(0, s.outside().clampedBelow());
    }

    /** The smallest accepted engine memory limit gives the same counts; a smaller one is refused. */
    @Test
    void memoryLimitChangesNothingButIsChecked() {
        List<CountTable> got = new ArrayList<>();
        BulkObservations.of(csv, "unit", "value").withWeight("w").withMemoryLimitMiB(64)
                .histograms(BINS, OutsidePolicy.CLAMP, got::add);
        Map<String, double[]> want = expected(true, OutsidePolicy.CLAMP);
        Map<String, double[]> have = collect(got);
        want.forEach((k, v) -> assertArrayEquals(v, have.get(k), k));
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> BulkObservations.of(csv, "unit", "value").withMemoryLimitMiB(63));
        assertTrue(e.getMessage().contains("at least 64 MiB"), e.getMessage());
    }

    @Test
    void periodsSplitUnits() {
        List<CountTable> got = new ArrayList<>();
        BulkObservations.of(parquet, "unit", "value").withPeriod("year").histograms(BINS, OutsidePolicy.DROP,
                got::add);
        CountTable t = got.get(0);
        assertEquals(14, t.size());
        assertArrayEquals(new String[] {"u0", "u0", "u1"}, Arrays.copyOf(t.ids(), 3));
        assertArrayEquals(new String[] {"2020", "2021", "2020"}, Arrays.copyOf(t.periods(), 3));
        double[] u0y2021 = new double[BINS.count()];
        for (int i = 0; i < N; i++) {
            int b = BINS.indexOf(value(i));
            if (i % 7 == 0 && i % 2 == 1 && b < BINS.count()) {
                u0y2021[b]++;
            }
        }
        assertArrayEquals(u0y2021, t.counts(1));
    }

    @Test
    void rejectNamesTheFirstRowOutsideTheBinsAndDeliversNothing() {
        int first = 0;
        while (value(first) <= 100) {
            first++;
        }
        List<CountTable> got = new ArrayList<>();
        rejects(() -> BulkObservations.of(parquet, "unit", "value").histograms(BINS, OutsidePolicy.REJECT, got::add),
                "events.parquet, data row " + (first + 1) + ", column 'value' ('" + value(first) + "')",
                "outside the range of the bins [0.0, 100.0] and the policy is REJECT", "OutsidePolicy.DROP or CLAMP");
        assertTrue(got.isEmpty());
    }

    @Test
    void samplesMatchTheInMemoryReaderAndFitIdentically() {
        BayesSpace space = BayesSpace.splines(0, 125, 3, 4);
        Map<String, double[]> bulk = new HashMap<>();
        Map<String, double[]> weights = new HashMap<>();
        BulkSummary s = BulkObservations.of(parquet, "unit", "value").withWeight("w").withBatchUnits(2)
                .samples(space, OutsidePolicy.REJECT, t -> {
                    for (int r = 0; r < t.size(); r++) {
                        bulk.put(t.ids()[r], t.values(r));
                        weights.put(t.ids()[r], t.weights()[r]);
                    }
                });
        assertEquals(4, s.batches());
        SampleTable mem = ObservationReader.of("unit", "value").withWeight("w")
                .samples(TableSource.csv(csv), space, OutsidePolicy.REJECT);
        for (int r = 0; r < mem.size(); r++) {
            double[] v = mem.values(r);
            double[] sorted = v.clone();
            Arrays.sort(sorted);
            assertArrayEquals(sorted, bulk.get(mem.ids()[r]), mem.ids()[r]);
            double[] b = bulk.get(mem.ids()[r]);
            for (int j = 1; j < b.length; j++) {
                assertTrue(b[j - 1] <= b[j], "samples are delivered sorted by value");
            }
        }
        assertEquals(N, s.observations());

        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space).withSmoothing(1);
        List<BatchEstimate> fits = new ArrayList<>();
        List<CountTable> tables = new ArrayList<>();
        BulkObservations.of(parquet, "unit", "value").withBatchUnits(4)
                .fitHistograms(est, BINS, OutsidePolicy.DROP, (t, e) -> {
                    tables.add(t);
                    fits.add(e);
                });
        assertArrayEquals(tables.get(0).fit(est).densities().coordinatesRowMajor(),
                fits.get(0).densities().coordinatesRowMajor());
        CountTable memCounts = ObservationReader.of("unit", "value").counts(TableSource.csv(csv), BINS,
                OutsidePolicy.DROP);
        Map<String, double[]> viaMemory = collect(List.of(memCounts));
        collect(tables).forEach((k, v) -> assertArrayEquals(viaMemory.get(k), v, k));
    }

    @Test
    void valuesOnAndNextToEdgesFallInTheBinsOfBinsIndexOf() throws Exception {
        // uniform layouts take the arithmetic path, others the comparison tree; both must agree with
        // Bins.indexOf bit for bit, including values exactly on an edge and one ulp either side of it
        for (Bins bins : List.of(Bins.uniform(0.1, 0.7, 6), Bins.of(0.1, 0.15, 0.3, 0.30000000000000004, 0.7))) {
            StringBuilder rows = new StringBuilder();
            Map<String, double[]> want = new TreeMap<>();
            double[] e = bins.edges();
            for (double edge : e) {
                for (double x : new double[] {Math.nextDown(edge), edge, Math.nextUp(edge)}) {
                    rows.append(rows.length() == 0 ? "" : ", ").append("('A', CAST('").append(x).append("' AS DOUBLE))");
                    int b = bins.indexOf(x);
                    if (b >= 0 && b < bins.count()) {
                        want.computeIfAbsent("A", k -> new double[bins.count()])[b]++;
                    }
                }
            }
            Path f = dir.resolve("edges-" + bins.count() + ".parquet");
            try (Connection c = DriverManager.getConnection("jdbc:duckdb:"); Statement st = c.createStatement()) {
                st.execute("COPY (SELECT * FROM (VALUES " + rows + ") t(unit, value)) TO '" + f + "' (FORMAT parquet)");
            }
            List<CountTable> got = new ArrayList<>();
            BulkSummary s = BulkObservations.of(f, "unit", "value").histograms(bins, OutsidePolicy.DROP, got::add);
            assertArrayEquals(want.get("A"), got.get(0).counts(0), bins.toString());
            assertEquals(2, s.outside().dropped());
        }
    }

    @Test
    void badFilesAndBadRowsAreNamed() throws Exception {
        rejects(() -> BulkObservations.of(parquet, "unit", "reading").histograms(BINS, OutsidePolicy.DROP, t -> { }),
                "missing value column 'reading'", "[unit, value, w, year]");
        rejects(() -> BulkObservations.of(parquet, "unit", "unit").histograms(BINS, OutsidePolicy.DROP, t -> { }),
                "column 'unit': the value column has type VARCHAR; expected a numeric column");
        Path holes = write(dir, "holes.csv", "unit,value,w\nA,1,1\nB,2,1\nA,,1\nB,3,-1\n");
        rejects(() -> BulkObservations.of(holes, "unit", "value").histograms(BINS, OutsidePolicy.DROP, t -> { }),
                "holes.csv, data row 3, column 'value' (empty): the value is missing or NaN");
        Path negative = write(dir, "negative.csv", "unit,value,w\nA,1,1\nB,2,1\nA,3,1\nB,3,-1\n");
        rejects(() -> BulkObservations.of(negative, "unit", "value").withWeight("w")
                .histograms(BINS, OutsidePolicy.DROP, t -> { }), "data row 4, column 'w' ('-1.0')",
                "weight is missing, negative or not finite");
        Path text = write(dir, "text.csv", "unit,value\nA,1\nB,2\nC,abc\n");
        rejects(() -> BulkObservations.of(text, "unit", "value").histograms(BINS, OutsidePolicy.DROP, t -> { }),
                "text.csv: the SQL engine could not read it as RFC 4180 CSV", "abc");
        Path cut = dir.resolve("cut.parquet");
        byte[] all = Files.readAllBytes(parquet);
        Files.write(cut, Arrays.copyOf(all, all.length / 2));
        rejects(() -> BulkObservations.of(cut, "unit", "value").histograms(BINS, OutsidePolicy.DROP, t -> { }),
                "cut.parquet: the SQL engine could not read it as Parquet");
        Path junk = dir.resolve("junk.parquet");
        byte[] noise = new byte[10_000];
        new java.util.SplittableRandom(3).nextBytes(noise);
        Files.write(junk, noise);
        rejects(() -> BulkObservations.of(junk, "unit", "value").histograms(BINS, OutsidePolicy.DROP, t -> { }),
                "junk.parquet: the SQL engine could not read it as Parquet");
        rejects(() -> BulkObservations.of(dir.resolve("a*.parquet"), "unit", "value")
                .histograms(BINS, OutsidePolicy.DROP, t -> { }), "the path contains '*'");
        rejects(() -> BulkObservations.of(dir.resolve("none.parquet"), "unit", "value")
                .histograms(BINS, OutsidePolicy.DROP, t -> { }), "none.parquet does not exist");
        List<CountTable> got = new ArrayList<>();
        rejects(() -> BulkObservations.of(parquet, "unit", "value").withLimits(ReadLimits.defaults().withMaxUnits(5))
                .histograms(BINS, OutsidePolicy.DROP, got::add), "7 units, more than the limit of 5");
        assertTrue(got.isEmpty());
    }
}
