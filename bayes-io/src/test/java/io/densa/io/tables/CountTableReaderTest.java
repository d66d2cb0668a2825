package io.densa.io.tables;


import io.densa.io.Bins;
import static io.densa.io.IoTestSupport.rejects;
import static io.densa.io.IoTestSupport.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.Statement;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Long-format count tables from CSV and JDBC. The CSV texts are written out here by hand, so the
 * expected counts are the ones visible in the text; quoting follows RFC 4180 (Shafranovich 2005,
 * Common Format and MIME Type for CSV Files, §2: fields with commas, quotes or line breaks in double
 * quotes, a quote inside doubled, CRLF record ends).
 */
class CountTableReaderTest {
    @TempDir
    Path dir;

    private static final Bins FOUR = Bins.of(0, 10, 20, 40, 80);

    @Test
    void readsIndexedBinsWithRfc4180QuotingAndZeroForAbsentRows() {
        Path f = write(dir, "c.csv", "unit,bin,count\r\n"
                + "\"North, upper\",0,3\r\n"
                + "\"North, upper\",2,5\r\n"
                + "\"say \"\"hi\"\"\",1,7\r\n"
                + "\"two\r\nlines\",3,1\r\n"
                + "\"North, upper\",3,0\r\n");
        CountTable t = CountTableReader.of("unit", "count").withBinIndex("bin", FOUR).read(TableSource.csv(f));
        assertArrayEquals(new String[] {"North, upper", "say \"hi\"", "two\r\nlines"}, t.ids());
        assertNull(t.periods());
        assertArrayEquals(new double[] {3, 0, 5, 0}, t.counts(0));
        assertArrayEquals(new double[] {0, 7, 0, 0}, t.counts(1));
        assertArrayEquals(new double[] {0, 0, 0, 1}, t.counts(2));
        assertArrayEquals(FOUR.edges(), t.edges());
        assertEquals(0, t.outside().outside());
    }

    @Test
    void oneBasedIndexLabelsAndPeriods() {
        Path f = write(dir, "c.csv", "id,year,band,n\nA,2020,b,2\nA,2021,a,4\nB,2020,d,1\nA,2020,a,6\n");
        Bins labelled = FOUR.withLabels("a", "b", "c", "d");
        CountTable t = CountTableReader.of("id", "n").withPeriod("year").withBinLabel("band", labelled)
                .read(TableSource.csv(f));
        assertArrayEquals(new String[] {"A", "A", "B"}, t.ids());
        assertArrayEquals(new String[] {"2020", "2021", "2020"}, t.periods());
        assertArrayEquals(new double[] {6, 2, 0, 0}, t.counts(0));
        assertArrayEquals(new double[] {4, 0, 0, 0}, t.counts(1));
        assertArrayEquals(new String[] {"A@2020", "A@2021", "B@2020"}, t.keys());
        CountTable y2020 = t.forPeriod("2020");
        assertArrayEquals(new String[] {"A", "B"}, y2020.ids());
        assertArrayEquals(new double[] {0, 0, 0, 1}, y2020.counts(1));

        Path g = write(dir, "g.csv", "id,bin,n\nA,1,2\nA,4,3\n");
        CountTable one = CountTableReader.of("id", "n").withBinIndex("bin", FOUR, 1).read(TableSource.csv(g));
        assertArrayEquals(new double[] {2, 0, 0, 3}, one.counts(0));
    }

    @Test
    void derivesTheLayoutFromEdgeColumns() {
        Path f = write(dir, "e.csv", "unit,lo,hi,count\nA,20,40,5\nA,0,10,1\nB,10,20,2\nB,40,80,3\n");
        CountTable t = CountTableReader.of("unit", "count").withBinEdges("lo", "hi").read(TableSource.csv(f));
        assertArrayEquals(new double[] {0, 10, 20, 40, 80}, t.edges());
        assertArrayEquals(new double[] {1, 0, 5, 0}, t.counts(0));
        assertArrayEquals(new double[] {0, 2, 0, 3}, t.counts(1));
        CountTable given = CountTableReader.of("unit", "count").withBinEdges("lo", "hi", FOUR)
                .read(TableSource.csv(f));
        assertEquals(t.bins(), given.bins());
    }

    @Test
    void edgesThatDoNotTileAreRejectedNamingBothBins() {
        Path gap = write(dir, "gap.csv", "unit,lo,hi,count\nA,0,10,1\nA,12,20,1\n");
        rejects(() -> CountTableReader.of("unit", "count").withBinEdges("lo", "hi").read(TableSource.csv(gap)),
                "bin [0.0, 10.0) (line 2) is followed by bin [12.0, 20.0) (line 3), a gap");
        Path overlap = write(dir, "ov.csv", "unit,lo,hi,count\nA,0,10,1\nA,5,20,1\n");
        rejects(() -> CountTableReader.of("unit", "count").withBinEdges("lo", "hi").read(TableSource.csv(overlap)),
                "an overlap");
        Path foreign = write(dir, "fo.csv", "unit,lo,hi,count\nA,0,10,1\nA,10,30,1\n");
        rejects(() -> CountTableReader.of("unit", "count").withBinEdges("lo", "hi", FOUR)
                .read(TableSource.csv(foreign)), "line 3", "bin [10.0, 30.0) is not a bin of the layout");
    }

    @Test
    void layoutIsCheckedAgainstTheDomain() {
        Path f = write(dir, "e.csv", "unit,bin,count\nA,0,1\n");
        BayesSpace space = BayesSpace.splines(0, 50, 4, 5);
        rejects(() -> CountTableReader.of("unit", "count").withBinIndex("bin", FOUR).withSpace(space)
                .read(TableSource.csv(f)), "e.csv", "bin edge 4 = 80.0 lies outside the domain [0.0, 50.0]");
    }

    @Test
    void badRowsNameFileLineColumnAndAcceptedForm() {
        CountTableReader r = CountTableReader.of("unit", "count").withBinIndex("bin", FOUR);
        rejects(() -> r.read(TableSource.csv(write(dir, "m.csv", "unit,bin,n\nA,0,1\n"))),
                "m.csv", "missing count column 'count'", "[unit, bin, n]");
        rejects(() -> r.read(TableSource.csv(write(dir, "x.csv", "unit,bin,count\nA,0,1\nA,1,abc\n"))),
                "x.csv, line 3, column 'count'", "'abc' is not a number", "a whole number >= 0");
        rejects(() -> r.read(TableSource.csv(write(dir, "n.csv", "unit,bin,count\nA,0,-2\n"))),
                "line 2", "count -2.0 is negative");
        rejects(() -> r.read(TableSource.csv(write(dir, "f.csv", "unit,bin,count\nA,0,2.5\n"))),
                "line 2", "not a whole number", "withFractionalCounts");
        rejects(() -> r.read(TableSource.csv(write(dir, "d.csv", "unit,bin,count\nA,0,1\nB,0,1\nA,0,4\n"))),
                "line 4: duplicate row for unit 'A', bin 0 [0.0, 10.0), first given at line 2");
        rejects(() -> r.read(TableSource.csv(write(dir, "i.csv", "unit,bin,count\nA,4,1\n"))),
                "line 2, column 'bin'", "bin index 4 is out of range; expected a bin index from 0 to 3");
        rejects(() -> r.read(TableSource.csv(write(dir, "u.csv", "unit,bin,count\n,0,1\n"))),
                "line 2, column 'unit'", "unit id is missing");
        rejects(() -> r.read(TableSource.csv(write(dir, "s.csv", "unit,bin,count\nA,0\n"))),
                "line 2: 2 fields for 3 columns");
        rejects(() -> r.read(TableSource.csv(write(dir, "h.csv", "unit,bin,count\nA,0,0x10\n"))),
                "'0x10' is not a number");
        rejects(() -> r.read(TableSource.csv(write(dir, "e.csv", "unit,bin,count\n"))), "no data rows");
        rejects(() -> r.read(TableSource.csv(dir.resolve("absent.csv"))), "absent.csv does not exist");
        assertEquals(2.5, r.withFractionalCounts(true)
                .read(TableSource.csv(write(dir, "w.csv", "unit,bin,count\nA,0,2.5\n"))).counts(0)[0]);
    }

    @Test
    void jdbcSourceGivesTheSameTableAsCsvAndFeedsTheEstimator() throws Exception {
        Path f = write(dir, "c.csv", "unit,bin,count\nA,0,3\nA,1,9\nA,2,4\nB,1,2\nB,3,6\nB,2,5\n");
        CountTableReader r = CountTableReader.of("unit", "count").withBinIndex("bin", FOUR);
        CountTable fromCsv = r.read(TableSource.csv(f));
        try (Connection c = DriverManager.getConnection("jdbc:duckdb:"); Statement st = c.createStatement()) {
            st.execute("CREATE TABLE t(unit VARCHAR, bin INTEGER, count BIGINT)");
            st.execute("INSERT INTO t VALUES ('A',0,3),('A',1,9),('A',2,4),('B',1,2),('B',3,6),('B',2,5)");
            CountTable fromSql = r.read(TableSource.query(c, "SELECT unit AS UNIT, bin, count FROM t ORDER BY rowid"));
            assertArrayEquals(fromCsv.ids(), fromSql.ids());
            assertArrayEquals(fromCsv.counts(), fromSql.counts());
            try (ResultSet rs = st.executeQuery("SELECT * FROM t WHERE unit = 'B' ORDER BY rowid")) {
                CountTable b = r.read(TableSource.of(rs, "table t"));
                assertArrayEquals(fromCsv.counts(1), b.counts(0));
            }
            st.execute("INSERT INTO t VALUES ('C', 1, -1)");
            rejects(() -> r.read(TableSource.query(c, "SELECT * FROM t ORDER BY rowid")),
                    "query 'SELECT * FROM t ORDER BY rowid', row 7, column 'count'", "negative");
            rejects(() -> r.read(TableSource.query(c, "SELECT * FROM nowhere")), "query 'SELECT * FROM nowhere'",
                    "failed");
        }
        BayesSpace space = BayesSpace.splines(0, 80, 3, 3);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space).withSmoothing(0.5);
        BatchEstimate viaTable = fromCsv.fit(est);
        BatchEstimate direct = est.fitAll(FOUR.edges(), new int[][] {{3, 9, 4, 0}, {0, 2, 5, 6}}, new String[] {"A", "B"});
        assertArrayEquals(direct.densities().coordinatesRowMajor(), viaTable.densities().coordinatesRowMajor());
        assertEquals(direct.densities().ids(), viaTable.densities().ids());
        assertArrayEquals(new int[][] {{3, 9, 4, 0}, {0, 2, 5, 6}}, fromCsv.wholeCounts());
    }
}
