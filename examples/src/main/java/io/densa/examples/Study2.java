package io.densa.examples;

import java.awt.Color;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;

/**
 * Study 2: distributions of daily mean fine-particle concentrations at the monitors of an
 * invented city. See {@link AirScenario} for the scenario; the pipeline is documented in the
 * report it writes.
 */
final class Study2 {
    /** Demo threshold: WHO global air quality guidelines (2021), PM2.5 24-hour mean 15 µg/m³. */
    static final double THRESHOLD = 15.0;

    private Study2() {
    }

    static StudyResult run(Main.Options options, Progress progress) {
        int n = options.unitsOr(30, 50, 80);
        int gridSide = options.units() > 0 ? 500 : switch (options.size()) {
            case "small" -> 100;
            case "medium" -> 250;
            default -> 500;
        };
        Path dir = options.out();
        progress.line("generating the invented monitor network (" + n + " monitors, 8,760 hours, seed "
                + options.seed() + ")");
        AirScenario sc = AirScenario.generate(options.seed(), n);
        int m = sc.size();
        List<String> files = new ArrayList<>();
        List<String> missing = new ArrayList<>();
        Map<String, Double> metrics = new LinkedHashMap<>();
        Report report = new Report(dir, "Densa study 2 — daily fine-particle concentration distributions in an "
                + "invented city");

        double[][] daily = new double[m][];
        double[] missingShare = new double[m];
        double[] validDays = new double[m];
        double[] annualMean = new double[m];
        double[] empiricalExceed = new double[m];
        for (int i = 0; i < m; i++) {
            daily[i] = sc.dailyMeans(i);
            missingShare[i] = sc.missingShare(i);
            double s = 0;
            int c = 0;
            int over = 0;
            for (double v : daily[i]) {
                if (!Double.isNaN(v)) {
                    s += v;
                    c++;
                    if (v > THRESHOLD) {
                        over++;
                    }
                }
            }
            validDays[i] = c;
            annualMean[i] = s / c;
            empiricalExceed[i] = over / (double) c;
        }
        progress.line(String.format(Locale.ROOT, "daily means: %.0f–%.0f valid days per monitor, annual means %.1f–%.1f µg/m³",
                min(validDays), max(validDays), min(annualMean), max(annualMean)));

        report.heading("What was run")
                .paragraph("An invented city with " + m + " monitors (" + count(sc.roadside())
                        + " of them next to heavy-traffic hot spots) and a year of hourly fine-particle (PM2.5-like) "
                        + "concentrations with missing hours (seed " + options.seed() + "). Each monitor's hours are "
                        + "averaged to **daily means** (a day counts when at least " + AirScenario.MIN_HOURS_PER_DAY
                        + " of its 24 hours are present); the densities below are densities of the **natural log of "
                        + "the daily mean concentration**, because the threshold is a 24-hour guideline.")
                .paragraph("Demo threshold: WHO global air quality guidelines (2021), PM2.5 24-hour mean 15 µg/m³. "
                        + "It is used here only as a demonstration threshold on invented data.");

        Geometry outline = sc.outline();
        Color[] fills = new Color[m];
        ColourScale meanScale = ColourScale.of(annualMean, "annual mean of daily means, µg/m³");
        for (int i = 0; i < m; i++) {
            fills[i] = meanScale.colour(annualMean[i]);
        }
        String caption = "Invented data. Drawn in planar km: " + sc.projection().describe() + ".";
        new MapPainter(outline.getEnvelopeInternal(), 760, "Monitors and their annual mean", caption)
                .fill(List.of(outline), new Color[] {new Color(0xFBFBF5)}, Color.DARK_GRAY, 1.5f)
                .points(sc.x(), sc.y(), fills, 6).colourBar(meanScale, 1).scaleBar()
                .save(dir.resolve("map_monitors.png"));
        files.add("map_monitors.png");
        report.figure("map_monitors.png", "Monitors coloured by the annual mean of their daily means.");

        metrics.put("monitors", (double) m);
        metrics.put("seconds", progress.seconds());
        report.caution();
        report.write();
        files.add("summary.md");
        files.add("summary.html");
        return new StudyResult(dir, m, files, metrics, missing);
    }

    static double min(double[] v) {
        double r = Double.POSITIVE_INFINITY;
        for (double d : v) {
            r = Math.min(r, d);
        }
        return r;
    }

    static double max(double[] v) {
        double r = Double.NEGATIVE_INFINITY;
        for (double d : v) {
            r = Math.max(r, d);
        }
        return r;
    }

    static int count(boolean[] b) {
        return Study1.count(b);
    }

    static Coordinate c(double x, double y) {
        return new Coordinate(x, y);
    }
}
