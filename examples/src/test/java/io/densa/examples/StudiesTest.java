package io.densa.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Runs each study at its small size and checks the report folder: summary.md and summary.html
 * exist and carry the caution; every CSV has one row per unit; every GeoJSON parses (with Gson,
 * an independent JSON parser) as an RFC 7946 FeatureCollection with one feature per unit and
 * longitude/latitude positions; every PNG decodes with ImageIO. Study 1 also scores its flags
 * against the injected truth, and the recall must reach the bound stated below.
 */
class StudiesTest {
    /**
     * Lowest acceptable recall of study 1's flags at the small size with the default seed (our own
     * acceptance bound for the demo, not a published value).
     */
    static final double RECALL_BOUND = 0.5;

    /** The rows of a report's CSV table, by column name (Commons CSV; the first line is the header). */
    static List<org.apache.commons.csv.CSVRecord> rows(Path csv) throws IOException {
        try (var parser = org.apache.commons.csv.CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true)
                .build().parse(Files.newBufferedReader(csv, StandardCharsets.UTF_8))) {
            return parser.getRecords();
        }
    }

    /** Every row's value lies in its 90 % interval, all three finite. */
    static void valuesInTheirIntervals(Path csv, String value) throws IOException {
        for (org.apache.commons.csv.CSVRecord r : rows(csv)) {
            double v = Double.parseDouble(r.get(value));
            double lo = Double.parseDouble(r.get(value + "_lo90"));
            double hi = Double.parseDouble(r.get(value + "_hi90"));
            assertTrue(Double.isFinite(lo) && lo <= v && v <= hi && Double.isFinite(hi),
                    csv.getFileName() + " row " + r.getRecordNumber() + ": " + value + " " + v + " not in [" + lo + ", "
                            + hi + "]");
        }
    }

    static StudyResult run(Path dir, String... args) {
        ByteArrayOutputStream buffer = new ByteArrayOutputStream();
        String[] all = Stream.concat(Stream.of(args), Stream.of("--out", dir.toString(), "--size", "small"))
                .toArray(String[]::new);
        StudyResult result = Main.run(Main.Options.parse(all), new PrintStream(buffer, true, StandardCharsets.UTF_8));
        String log = buffer.toString(StandardCharsets.UTF_8);
        assertTrue(log.lines().count() >= 3, "expected progress lines, got: " + log);
        return result;
    }

    static void checkFolder(StudyResult result) throws IOException {
        Path dir = result.folder();
        try (Stream<Path> all = Files.list(dir)) {
            List<String> present = all.map(p -> p.getFileName().toString()).filter(n -> !n.startsWith("."))
                    .sorted().toList();
            assertEquals(result.files().stream().sorted().toList(), present, "the folder holds this run's files");
        }
        String md = Files.readString(dir.resolve("summary.md"));
        String html = Files.readString(dir.resolve("summary.html"));
        assertTrue(md.contains("not diagnoses") && html.contains("not diagnoses"), "caution missing");
        assertTrue(html.contains("data:image/png;base64,"), "HTML must inline its pictures");
        assertTrue(!html.contains("src=\"map_") && !html.contains("src=\"fig_"), "HTML must not link PNG files");
        int csv = 0;
        int geo = 0;
        int png = 0;
        try (Stream<Path> files = Files.list(dir)) {
            for (Path f : files.toList()) {
                String name = f.getFileName().toString();
                if (name.endsWith(".png")) {
                    BufferedImage img = ImageIO.read(f.toFile());
                    assertNotNull(img, name + " does not decode");
                    assertTrue(img.getWidth() >= 400 && img.getHeight() >= 300, name + " is too small");
                    assertTrue(md.contains("(" + name + ")"), name + " is not shown in summary.md");
                    png++;
                } else if (name.equals("districts.csv") || name.equals("monitors.csv")) {
                    List<String> lines = Files.readAllLines(f);
                    assertEquals(result.units() + 1, lines.size(), name + ": header plus one row per unit");
                    csv++;
                } else if (name.endsWith(".csv")) {
                    assertTrue(Files.readAllLines(f).size() >= 2, name + " is empty");
                    csv++;
                } else if (name.endsWith(".geojson")) {
                    checkGeoJson(f, result.units());
                    geo++;
                }
            }
        }
        assertTrue(png >= 3, "expected at least three figures, found " + png);
        assertTrue(csv >= 1, "expected CSV tables");
        assertTrue(geo >= 1, "expected GeoJSON");
    }

    static void checkGeoJson(Path file, int units) throws IOException {
        JsonObject root = JsonParser.parseString(Files.readString(file)).getAsJsonObject();
        assertEquals("FeatureCollection", root.get("type").getAsString());
        JsonArray features = root.getAsJsonArray("features");
        assertEquals(units, features.size(), file.getFileName() + ": one feature per unit");
        for (JsonElement e : features) {
            JsonObject f = e.getAsJsonObject();
            assertEquals("Feature", f.get("type").getAsString());
            assertTrue(f.get("properties").isJsonObject());
            JsonObject g = f.getAsJsonObject("geometry");
            String type = g.get("type").getAsString();
            JsonArray first = switch (type) {
                case "Point" -> g.getAsJsonArray("coordinates");
                case "Polygon" -> g.getAsJsonArray("coordinates").get(0).getAsJsonArray().get(0).getAsJsonArray();
                case "MultiPolygon" -> g.getAsJsonArray("coordinates").get(0).getAsJsonArray().get(0)
                        .getAsJsonArray().get(0).getAsJsonArray();
                default -> throw new AssertionError("unexpected geometry " + type);
            };
            double lon = first.get(0).getAsDouble();
            double lat = first.get(1).getAsDouble();
            // RFC 7946 section 3.1.1: positions are [longitude, latitude] in WGS 84.
            assertTrue(lon >= -180 && lon <= 180 && lat >= -90 && lat <= 90, "position out of range: " + first);
        }
    }

    @Test
    void study1WritesItsReportAndFindsTheInjectedShift(@TempDir Path dir) throws IOException {
        StudyResult r = run(dir, "study1");
        checkFolder(r);
        Double recall = r.metrics().get("recall");
        assertNotNull(recall, "study 1 must score its flags; missing steps: " + r.missing());
        assertTrue(recall >= RECALL_BOUND, "recall " + recall + " below " + RECALL_BOUND);
        assertTrue(r.metrics().get("precision") > 0, "no true flag at all");
        // the clustering sentence follows the permutation test at the study's level
        String md = Files.readString(r.folder().resolve("summary.md"));
        boolean significant = r.metrics().get("moranPermutationP") <= Study1.ALPHA;
        assertEquals(significant, md.contains("Departures from the baseline cluster in space:"), "clustering claim");
        assertEquals(!significant, md.contains("Departures from the baseline show no clustering in space"));
        // CSV headers are ASCII, excess and deficit ages have their own columns
        String header = Files.readAllLines(r.folder().resolve("districts.csv")).get(0);
        assertTrue(header.chars().allMatch(c -> c < 128), "non-ASCII header: " + header);
        assertTrue(header.contains(",excess_ages,deficit_ages,"), header);
        assertTrue(header.contains(",excess_0_14,excess_0_14_lo90,excess_0_14_hi90,") && header.contains(
                ",displaced,displaced_lo90,displaced_hi90"), header);
        // every district's median age comes with its interval
        valuesInTheirIntervals(r.folder().resolve("districts.csv"), "median_age");
        // displaced visits against a season without change (counting noise and the baseline's error): a valid
        // p-value, P(p <= 0.1) <= 0.1 up to sampling (about 110 quiet districts: binomial SD 0.03), for the
        // districts the invented truth leaves alone; the shifted ones stand out
        int quiet = 0;
        int quietSmall = 0;
        int shifted = 0;
        int shiftedFound = 0;
        for (org.apache.commons.csv.CSVRecord row : rows(r.folder().resolve("districts.csv"))) {
            double p = Double.parseDouble(row.get("displaced_p"));
            if (Boolean.parseBoolean(row.get("truth_shifted"))) {
                shifted++;
                shiftedFound += p <= 0.05 ? 1 : 0;
            } else {
                quiet++;
                quietSmall += p <= 0.1 ? 1 : 0;
            }
        }
        assertTrue(quietSmall <= 0.16 * quiet, quietSmall + " of " + quiet + " quiet districts with p <= 0.1");
        assertTrue(shiftedFound >= 0.8 * shifted, shiftedFound + " of " + shifted + " shifted districts with p <= 0.05");
        assertTrue(r.files().contains("map_median_age_sd.png"), "uncertainty map: " + r.files());
        // the scan's cluster statement follows its Monte Carlo test at the study's level
        boolean cluster = r.metrics().get("scanP") <= Study1.ALPHA;
        assertEquals(cluster, md.contains("Visits at ages 0–24 against the baseline: a cluster of raised counts"));
        assertEquals(!cluster, md.contains("Visits at ages 0–24 against the baseline: no cluster of raised counts"));
        // the injected shift is spatially clustered, so the scan must find a cluster of shifted districts
        assertTrue(cluster && r.metrics().get("scanClusterShifted") >= 1, "scan: " + r.metrics());
        assertTrue(md.contains("Benjamini–Hochberg"), "wording");
    }

    @Test
    void study1IsReproducibleFromItsSeed(@TempDir Path dir) throws IOException {
        Path a = dir.resolve("a");
        Path b = dir.resolve("b");
        run(a, "study1", "--seed", "5");
        run(b, "study1", "--seed", "5");
        assertEquals(Files.readString(a.resolve("districts.csv")), Files.readString(b.resolve("districts.csv")),
                "same seed, same results");
        run(dir.resolve("c"), "study1", "--seed", "6");
        assertTrue(!Files.readString(a.resolve("districts.csv")).equals(
                Files.readString(dir.resolve("c").resolve("districts.csv"))), "another seed, another scenario");
    }

    @Test
    void study2WritesItsReport(@TempDir Path dir) throws IOException {
        StudyResult r = run(dir, "study2");
        checkFolder(r);
        // The invented field is spatially correlated by construction (AirScenario), so kriging must
        // predict held-out monitors better than the mean density of the others (simulation recovery).
        assertTrue(r.metrics().get("looMseUniversal") < r.metrics().get("looMseMeanDensity"),
                "kriging should beat the mean-density baseline: " + r.metrics());
        assertTrue(r.metrics().get("gridCells") > 1000, "grid prediction missing: " + r.metrics());
        // the variogram fits' warnings (or their absence) are said in the report
        String md = Files.readString(r.folder().resolve("summary.md"));
        double warnings = r.metrics().get("variogramFitWarnings");
        long said = md.lines().filter(l -> l.startsWith("- Raw densities (lags in km):")
                || l.startsWith("- Drift residuals (lags in km):")).count();
        assertEquals(warnings, said, "one line per variogram warning");
        long quiet = md.lines().filter(l -> l.contains("no parameter ended on a bound")).count();
        assertTrue(warnings == 0 ? quiet == 2 : quiet <= 1, "each fit without warnings says so (" + quiet + ")");
        // no real organisation is named; the threshold is cited beside the number
        assertTrue(md.contains("guideline level published in *Global air quality guidelines"), "threshold citation");
        // per monitor, the exceedance probability and the median come with their intervals
        valuesInTheirIntervals(r.folder().resolve("monitors.csv"), "density_p_over_15");
        valuesInTheirIntervals(r.folder().resolve("monitors.csv"), "density_median");
    }

    @Test
    void helpGoesToStandardOutputAndBadFoldersGetAMessage(@TempDir Path dir) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        assertEquals(0, Main.main(new String[] {"--help"}, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8)));
        assertTrue(out.toString(StandardCharsets.UTF_8).contains("small    study1 120 districts"), "size presets");
        assertEquals("", err.toString(StandardCharsets.UTF_8));
        Path file = dir.resolve("existing.txt");
        Files.writeString(file, "x");
        for (String target : new String[] {file.toString(), file.resolve("sub").toString()}) {
            err.reset();
            assertEquals(2, Main.main(new String[] {"--out", target, "--size", "small"}, new PrintStream(out, true,
                    StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8)));
            String message = err.toString(StandardCharsets.UTF_8);
            assertTrue(message.startsWith("densa examples: --out " + target + ": "), message);
            assertTrue(!message.contains("Exception") && !message.contains("\tat "), "no stack trace: " + message);
        }
        Path foreign = dir.resolve("foreign");
        Files.createDirectories(foreign);
        Files.writeString(foreign.resolve("notes.txt"), "mine");
        err.reset();
        assertEquals(2, Main.main(new String[] {"--out", foreign.toString()}, new PrintStream(out, true,
                StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8)));
        assertTrue(err.toString(StandardCharsets.UTF_8).contains("holds no report written by Densa"));
        assertEquals("mine", Files.readString(foreign.resolve("notes.txt")));
    }

    @Test
    void optionsAreParsedAndBadOnesExplained() {
        Main.Options o = Main.Options.parse("study2", "--seed", "7", "--size", "40", "--out", "x");
        assertEquals("study2", o.study());
        assertEquals(7, o.seed());
        assertEquals(40, o.unitsOr(1, 2, 3));
        assertEquals(Path.of("x"), o.out());
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> Main.Options.parse("--size", "huge"));
        assertTrue(e.getMessage().contains("small, medium, full"));
    }
}
