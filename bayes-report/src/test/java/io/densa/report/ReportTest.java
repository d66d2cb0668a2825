package io.densa.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;

/** The report's files against the formats they claim, its folder rules and its tables. */
class ReportTest {
    static final Figure SMALL = () -> new BufferedImage(40, 30, BufferedImage.TYPE_INT_RGB);

    static Table table() {
        return Table.of(3).text("code", "code", new String[] {"A1", "B,2", "C \"3\""})
                .number("mean", "mean (µg/m³)", new double[] {1.5, Double.NaN, 12.25}, 1)
                .probability("p", "p", new double[] {0.0012, 0.0013, 0.5})
                .percent("share", "share", new double[] {0.125, 0.5, 1}, 1)
                .integer("days", "days", new int[] {300, 301, 365})
                .flag("flagged", "flagged", new boolean[] {true, false, true});
    }

    @Test
    void tablesRightAlignNumbersInMarkdownAndHtml() {
        Report r = Report.titled("T <&>").paragraph("**bold** and `code` < 3").table(table());
        String md = r.markdown();
        assertTrue(md.contains("| code | mean (µg/m³) | p | share | days | flagged |\n|---|---:|---:|---:|---:|---|"), md);
        assertTrue(md.contains("| A1 | 1.5 | 0.0012 | 12.5 % | 300 | yes |"), md);
        assertTrue(md.contains("| B,2 | n/a | 0.0013 | 50.0 % | 301 | no |"), md);
        String html = r.html();
        assertTrue(html.contains("<strong>bold</strong> and <code>code</code> &lt; 3"));
        assertTrue(html.contains("<title>T &lt;&amp;&gt;</title>"));
        assertFalse(html.contains("T <&>"));
        assertTrue(html.contains("<th class=\"num\">mean (µg/m³)</th>"));
        assertTrue(html.contains("<td class=\"num\">12.3</td>") || html.contains("<td class=\"num\">12.2</td>"));
        assertTrue(html.contains("<td>C &quot;3&quot;</td>"));
    }

    @Test
    void everyReportSaysItsCaution() {
        Report r = Report.titled("T");
        assertTrue(r.markdown().contains("not diagnoses or regulatory assessments"));
        assertTrue(r.markdown().contains("## Caution\n\n" + Report.CAUTION));
        r.caution("Signals only; decisions follow the authorities.");
        assertTrue(r.html().contains("<p class=\"caution\">Signals only; decisions follow the authorities.</p>"));
        assertThrows(IllegalArgumentException.class, () -> r.caution(" "));
    }

    @Test
    void columnNamesAreAsciiAndLengthsChecked() {
        assertThrows(IllegalArgumentException.class, () -> Table.of(1).text("excess–ages", new String[] {"x"}));
        assertThrows(IllegalArgumentException.class, () -> Table.of(1).text("Excess", new String[] {"x"}));
        assertThrows(IllegalArgumentException.class, () -> Table.of(2).text("a", new String[] {"x"}));
        assertThrows(IllegalArgumentException.class, () -> Table.of(1).probability("p", "p", new double[] {1.5}));
        assertThrows(IllegalArgumentException.class, () -> Table.of(1).number("x", "x",
                new double[] {Double.POSITIVE_INFINITY}, 1));
        Table t = table().select(new int[] {2, 0}).columns("days", "code");
        assertEquals(List.of("days", "code"), t.names());
        assertEquals("365", t.displayRows().get(0)[0]);
    }

    @Test
    void filesFollowRfc4180AndRfc7946(@TempDir Path dir) throws IOException {
        List<Geometry> points = new ArrayList<>();
        for (int i = 0; i < 3; i++) {
            points.add(Fixtures.GEOMETRY.createPoint(new Coordinate(-20.5 + i * 0.01, -30.25)));
        }
        Table t = table();
        ReportFiles files = Report.titled("Files").table(t, "units.csv").geoJson("units.geojson", points,
                t.unitValues("code")).figure("fig.png", SMALL, "A small figure.").writeTo(dir);
        assertEquals(List.of("units.csv", "units.geojson", "fig.png", "summary.md", "summary.html"), files.files());
        // RFC 4180, read back by Commons CSV
        try (Reader in = Files.newBufferedReader(dir.resolve("units.csv"))) {
            List<CSVRecord> rows = CSVFormat.RFC4180.parse(in).getRecords();
            assertEquals(List.of("code", "mean", "p", "share", "days", "flagged"), rows.get(0).toList());
            assertEquals(List.of("C \"3\"", "12.25", "0.5", "1", "365", "true"), rows.get(3).toList());
            assertEquals("", rows.get(2).get(1), "NaN is an empty cell");
            assertEquals("B,2", rows.get(2).get(0));
        }
        assertTrue(Files.readString(dir.resolve("units.csv")).contains("\r\n"), "RFC 4180 line breaks are CRLF");
        // RFC 7946, read back by Gson
        JsonObject root = JsonParser.parseString(Files.readString(dir.resolve("units.geojson"))).getAsJsonObject();
        assertEquals("FeatureCollection", root.get("type").getAsString());
        JsonArray features = root.getAsJsonArray("features");
        assertEquals(3, features.size());
        JsonObject props = features.get(2).getAsJsonObject().getAsJsonObject("properties");
        assertEquals("C \"3\"", props.get("id").getAsString());
        assertEquals(365, props.get("days").getAsDouble());
        assertEquals("true", props.get("flagged").getAsString());
        assertTrue(features.get(1).getAsJsonObject().getAsJsonObject("properties").get("mean").isJsonNull());
        JsonArray xy = features.get(0).getAsJsonObject().getAsJsonObject("geometry").getAsJsonArray("coordinates");
        assertEquals(-20.5, xy.get(0).getAsDouble(), 1e-7, "longitude first");
        assertTrue(Files.readString(dir.resolve("summary.md")).contains("Table as CSV: `units.csv`"));
    }

    @Test
    void theFolderHoldsOnlyTheLastReportAndNoFileOfTheUser(@TempDir Path dir) throws IOException {
        Path out = dir.resolve("report");
        Report.titled("First").figure("a.png", SMALL, "a").figure("b.png", SMALL, "b").writeTo(out);
        assertTrue(Files.exists(out.resolve("a.png")) && Files.exists(out.resolve("b.png")));
        Files.writeString(out.resolve("notes.txt"), "mine");
        Report.titled("Second").figure("b.png", SMALL, "b").figure("c.png", SMALL, "c").writeTo(out);
        assertFalse(Files.exists(out.resolve("a.png")), "a file of the previous report must go");
        assertTrue(Files.exists(out.resolve("b.png")) && Files.exists(out.resolve("c.png")));
        assertEquals("mine", Files.readString(out.resolve("notes.txt")), "a file the report did not write stays");
        // a manifest naming a path outside the folder is ignored
        Path outside = dir.resolve("outside.png");
        Files.writeString(outside, "keep");
        Files.writeString(out.resolve(ReportFolder.MANIFEST), "../outside.png\nc.png\n");
        Report.titled("Third").figure("d.png", SMALL, "d").writeTo(out);
        assertTrue(Files.exists(outside));
        assertFalse(Files.exists(out.resolve("c.png")));
    }

    @Test
    void unusableFoldersAreRefusedWithAClearMessage(@TempDir Path dir) throws IOException {
        Path file = dir.resolve("file.txt");
        Files.writeString(file, "x");
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Report.checkFolder(file));
        assertTrue(e.getMessage().contains("is an existing file"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> Report.checkFolder(file.resolve("sub")));
        assertTrue(e.getMessage().startsWith("cannot create the report folder"), e.getMessage());
        Path foreign = dir.resolve("foreign");
        Files.createDirectories(foreign);
        Files.writeString(foreign.resolve("thesis.docx"), "precious");
        e = assertThrows(IllegalArgumentException.class, () -> Report.titled("T").writeTo(foreign));
        assertTrue(e.getMessage().contains("holds no report written by Densa") && e.getMessage().contains("thesis"),
                e.getMessage());
        assertEquals("precious", Files.readString(foreign.resolve("thesis.docx")));
        assertThrows(IllegalArgumentException.class, () -> Report.titled("T").figure("../x.png", SMALL, "x"));
        assertThrows(IllegalArgumentException.class, () -> Report.titled("T").figure("x.png", SMALL, "x")
                .figure("x.png", SMALL, "again"));
    }
}
