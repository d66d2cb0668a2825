package io.densa.io.tables;


import io.densa.io.Bins;
import io.densa.io.ReadLimits;
import static io.densa.io.IoTestSupport.rejects;
import static io.densa.io.IoTestSupport.write;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Truncated, oversized, malformed and adversarial CSV files: each must end in a clear
 * IllegalArgumentException, quickly and without allocating what the file asks for.
 */
class HostileCsvTest {
    @TempDir
    Path dir;

    private static final Bins BINS = Bins.of(0, 1, 2);
    private static final CountTableReader COUNTS = CountTableReader.of("unit", "count").withBinIndex("bin", BINS);
    private static final Duration QUICK = Duration.ofSeconds(10);

    @Test
    void fileLargerThanTheLimitIsRefusedBeforeReading() {
        Path f = write(dir, "big.csv", "unit,bin,count\n" + "A,0,1\n".repeat(1000));
        rejects(() -> COUNTS.withLimits(ReadLimits.defaults().withMaxFileBytes(1000)).read(TableSource.csv(f)),
                "big.csv has 6015 bytes, more than the limit of 1000 (ReadLimits.withMaxFileBytes)");
    }

    @Test
    void unterminatedQuoteAtTheEndIsAMalformedFile() {
        Path f = write(dir, "t.csv", "unit,bin,count\nA,0,1\n\"B,1,2\n");
        rejects(() -> COUNTS.read(TableSource.csv(f)), "t.csv", "malformed CSV", "EOF reached before encapsulated"
                + " token finished", "RFC 4180");
    }

    @Test
    void truncatedRowIsNamed() {
        Path f = write(dir, "t.csv", "unit,bin,count\nA,0,1\nA,1");
        rejects(() -> COUNTS.read(TableSource.csv(f)), "t.csv, line 3: 2 fields for 3 columns");
    }

    @Test
    void hugeQuotedFieldStopsAtTheRecordLimitWithoutBufferingTheFile() throws IOException {
        Path f = dir.resolve("q.csv");
        try (OutputStream out = Files.newOutputStream(f)) {
            out.write("unit,bin,count\n\"".getBytes(StandardCharsets.US_ASCII));
            byte[] block = "x".repeat(1 << 16).getBytes(StandardCharsets.US_ASCII);
            for (int i = 0; i < 800; i++) { // 50 MiB inside one quoted field
                out.write(block);
            }
        }
        assertTimeoutPreemptively(QUICK, () -> rejects(() -> COUNTS.read(TableSource.csv(f)),
                "q.csv", "a record is longer than the limit of 1048576 characters"));
    }

    @Test
    void longIdIsRefusedAtTheFieldLimit() {
        Path f = write(dir, "l.csv", "unit,bin,count\n" + "u".repeat(5000) + ",0,1\n");
        rejects(() -> COUNTS.read(TableSource.csv(f)), "line 2, column 'unit'", "unit id has 5000 characters",
                "limit of 1024");
    }

    @Test
    void rowUnitAndCellLimits() {
        StringBuilder sb = new StringBuilder("unit,bin,count\n");
        for (int i = 0; i < 50; i++) {
            sb.append("u").append(i).append(",0,1\n");
        }
        Path f = write(dir, "m.csv", sb.toString());
        rejects(() -> COUNTS.withLimits(ReadLimits.defaults().withMaxRows(20)).read(TableSource.csv(f)),
                "more than 20 data rows");
        rejects(() -> COUNTS.withLimits(ReadLimits.defaults().withMaxUnits(10)).read(TableSource.csv(f)),
                "more than 10 units");
        rejects(() -> COUNTS.withLimits(ReadLimits.defaults().withMaxCells(60)).read(TableSource.csv(f)),
                "50 units x 2 bins = 100 cells, more than the limit of 60");
        rejects(() -> COUNTS.withLimits(ReadLimits.defaults().withMaxBins(1)).read(TableSource.csv(f)),
                "2 bins, more than the limit of 1");
    }

    @Test
    void manyDistinctEdgePairsStopAtTheBinLimit() {
        StringBuilder sb = new StringBuilder("unit,lo,hi,count\n");
        for (int i = 0; i < 300; i++) {
            sb.append("A,").append(i).append(',').append(i + 1).append(",1\n");
        }
        Path f = write(dir, "e.csv", sb.toString());
        rejects(() -> CountTableReader.of("unit", "count").withBinEdges("lo", "hi")
                .withLimits(ReadLimits.defaults().withMaxBins(100)).read(TableSource.csv(f)),
                "more than 100 distinct bins");
    }

    @Test
    void invalidUtf8AndBinaryGarbageAreMalformed() throws IOException {
        Path f = dir.resolve("b.csv");
        byte[] head = "unit,bin,count\nA,0,".getBytes(StandardCharsets.US_ASCII);
        byte[] bad = {(byte) 0xC3, (byte) 0x28, '\n'};
        byte[] all = new byte[head.length + bad.length];
        System.arraycopy(head, 0, all, 0, head.length);
        System.arraycopy(bad, 0, all, head.length, bad.length);
        Files.write(f, all);
        rejects(() -> COUNTS.read(TableSource.csv(f)), "b.csv", "malformed CSV");
        Path g = dir.resolve("g.csv");
        byte[] junk = new byte[4096];
        new java.util.SplittableRandom(7).nextBytes(junk);
        Files.write(g, junk);
        assertTimeoutPreemptively(QUICK, () -> rejects(() -> COUNTS.read(TableSource.csv(g)), "g.csv"));
    }

    @Test
    void numbersThatOverflowOrAreSpelledOddlyAreNotNumbers() {
        rejects(() -> COUNTS.read(TableSource.csv(write(dir, "o.csv", "unit,bin,count\nA,0,1e400\n"))),
                "1e400 overflows a double");
        rejects(() -> COUNTS.read(TableSource.csv(write(dir, "i.csv", "unit,bin,count\nA,0,Infinity\n"))),
                "'Infinity' is not a number");
        rejects(() -> COUNTS.read(TableSource.csv(write(dir, "n.csv", "unit,bin,count\nA,0,NaN\n"))),
                "'NaN' is not a number");
        rejects(() -> COUNTS.read(TableSource.csv(write(dir, "d.csv", "unit,bin,count\nA,0,1d\n"))),
                "'1d' is not a number");
        rejects(() -> COUNTS.read(TableSource.csv(write(dir, "x.csv", "unit,bin,count\nA,99999999999,1\n"))),
                "'99999999999' is not an integer");
    }

    @Test
    void duplicateHeaderNamesAreRefused() {
        rejects(() -> COUNTS.read(TableSource.csv(write(dir, "h.csv", "unit,bin,count,count\nA,0,1,2\n"))),
                "h.csv", "header");
    }
}
