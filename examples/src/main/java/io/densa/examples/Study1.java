package io.densa.examples;

import java.awt.Color;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Study 1: age-profile surveillance in the districts of an invented region. See
 * {@link AgeScenario} for the scenario; the pipeline is documented in the report it writes.
 */
final class Study1 {
    private Study1() {
    }

    static StudyResult run(Main.Options options, Progress progress) {
        int n = options.unitsOr(60, 150, 300);
        int seasons = 6;
        Path dir = options.out();
        progress.line("generating the invented region (" + n + " districts, " + seasons + " seasons, seed "
                + options.seed() + ")");
        AgeScenario sc = AgeScenario.generate(options.seed(), n, seasons);
        Region region = sc.region();
        int m = region.size();
        List<String> files = new ArrayList<>();
        List<String> missing = new ArrayList<>();
        Map<String, Double> metrics = new LinkedHashMap<>();
        Report report = new Report(dir, "Densa study 1 — age profiles of emergency visits in an invented region");

        int latest = seasons - 1;
        double[] visits = new double[m];
        int minVisits = Integer.MAX_VALUE;
        int maxVisits = 0;
        long totalVisits = 0;
        for (int i = 0; i < m; i++) {
            int t = sc.total(i, latest);
            visits[i] = t;
            minVisits = Math.min(minVisits, t);
            maxVisits = Math.max(maxVisits, t);
            for (int s = 0; s < seasons; s++) {
                totalVisits += sc.total(i, s);
            }
        }
        progress.line(String.format(java.util.Locale.ROOT,
                "%d districts, %,d visits in all; latest season %d to %d visits per district", m, totalVisits,
                minVisits, maxVisits));

        report.heading("What was run")
                .paragraph("An invented region of " + m + " districts (Voronoi cells of random sites clipped to an "
                        + "invented outline, seed " + options.seed() + ") with " + seasons + " seasons of emergency-visit "
                        + "counts by single year of age 0–99. In the latest season a spatially clustered group of "
                        + count(sc.shifted()) + " districts moves part of its visits toward children and young adults; "
                        + "the generator records which, so the report scores its own flags.");

        // --- figures of the scenario
        double[] logVisits = new double[m];
        for (int i = 0; i < m; i++) {
            logVisits[i] = Math.log10(Math.max(1, visits[i]));
        }
        Maps.choropleth(region, logVisits, ColourScale.of(logVisits, "log10 visits in the latest season"), 1,
                "Visits in the latest season (log10)", dir.resolve("map_visits.png"));
        files.add("map_visits.png");
        int[] truthCat = new int[m];
        for (int i = 0; i < m; i++) {
            truthCat[i] = sc.shifted()[i] ? 1 : 0;
        }
        Maps.categories(region, truthCat, new String[] {"not shifted", "shifted (truth)"},
                new Color[] {Maps.NO_FLAG, Maps.TRUTH_ONLY}, "Injected shift", "Districts with an injected shift",
                dir.resolve("map_truth.png"));
        files.add("map_truth.png");
        report.figure("map_visits.png", "Visits per district in the latest season (log10 scale): the "
                + "populations differ by two orders of magnitude.");

        metrics.put("districts", (double) m);
        metrics.put("seconds", progress.seconds());
        report.caution();
        report.write();
        files.add("summary.md");
        files.add("summary.html");
        return new StudyResult(dir, m, files, metrics, missing);
    }

    static int count(boolean[] b) {
        int c = 0;
        for (boolean v : b) {
            if (v) {
                c++;
            }
        }
        return c;
    }
}
