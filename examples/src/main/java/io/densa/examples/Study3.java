package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.io.model.ModelFile;
import io.densa.regression.surveillance.BaselineMonitor;
import io.densa.regression.surveillance.DetectionSummary;
import io.densa.regression.surveillance.Period;
import io.densa.regression.surveillance.PeriodReport;
import io.densa.regression.surveillance.RollingBaseline;
import io.densa.report.Report;
import io.densa.report.ReportFiles;
import io.densa.report.map.MapFrame;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Study 3: prospective week-by-week surveillance of the timing of a season, on the invented
 * scenario of {@link SeasonScenario}.
 *
 * <p>Pipeline: (1) each week t the district's events of the trailing 365 days are binned by day of
 * the year (5-day bins) and turned into a density on the circle of days ({@link SeasonWindows}: a
 * Fourier Bayes space of period 365, so a season straddling 1 January is one density; one smoothing
 * parameter for all, the median of the default criterion's choices over the largest districts of
 * the first week). (2) A rolling baseline ({@link RollingBaseline}) is fitted on the first five
 * years with the seasonal lag set {52, 104, 156}: a week's density is predicted from the same
 * district's densities of the same week one, two and three years earlier (with a trailing window,
 * lag 1 would predict each week by the previous one, which differs by one week's events only and
 * absorbs a gradual shift; three years average the counting noise of the years before). The
 * residuals are standardised by the estimation variances, calibrated by the last
 * {@value #CALIBRATION} weeks' out-of-sample residuals (split-conformal p-values, flagged
 * residuals kept out of the calibration set so a lasting shift does not mask itself) and flagged at
 * FDR {@value #FDR} (Benjamini–Hochberg within a week). (3) The fitted baseline is saved through
 * bayes-io's {@link ModelFile}, loaded back, and the last year is monitored week by week: each week
 * is scored, then absorbed ({@link BaselineMonitor#step}). (4) Detection delay and false alerts per
 * unit-year are computed against the injected truth ({@link DetectionSummary}). (5) The last
 * {@value #KRIGING_WEEKS} weeks' densities are kriged in space and time (the best of three
 * space–time models fitted to the empirical space–time trace-variogram) to next week on a grid, and
 * the circular mean day of each kriged density is mapped.
 */
final class Study3 {
    static final double FDR = 0.02;
    static final int CALIBRATION = 26;
    static final int SEASONAL_LAG = 52;
    static final int[] LAGS = {SEASONAL_LAG, 2 * SEASONAL_LAG, 3 * SEASONAL_LAG};
    static final int KRIGING_WEEKS = 6;
    static final int NEIGHBOURS = 40;

    private Study3() {
    }

    static StudyResult run(Main.Options options, Progress progress) {
        int size = options.unitsOr(100, 150, 200);
        progress.line("generating the invented region (" + size + " districts, " + SeasonScenario.YEARS
                + " years of daily counts, seed " + options.seed() + ")");
        SeasonScenario sc = SeasonScenario.generate(options.seed(), size);
        Region region = sc.region();
        int n = sc.size();
        String[] codes = region.units().stream().map(Region.Unit::code).toArray(String[]::new);
        String[] names = region.units().stream().map(Region.Unit::name).toArray(String[]::new);
        Map<String, Double> metrics = new LinkedHashMap<>();
        List<String> missing = new ArrayList<>();
        Report report = Report.titled("Densa study 3 — weekly surveillance of seasonal timing in an invented region")
                .note(Main.INVENTED);
        MapFrame frame = MapFrame.km(Study1.shapes(region), region.outline(), Study1.caption(region));
        long total = 0;
        for (int[] c : sc.counts()) {
            for (int v : c) {
                total += v;
            }
        }
        int shiftedCount = Study1.count(sc.shifted());
        int onsetWeek = SeasonScenario.weekOf(sc.onsetDay());
        int first = SeasonWindows.firstWeek();
        int last = SeasonWindows.lastWeek(sc.days());
        int monitorFrom = ((SeasonScenario.YEARS - 1) * SeasonScenario.DAYS_PER_YEAR + 6) / 7;
        progress.line(String.format(Locale.ROOT, "%d districts, %,d events; %d districts shifted from week %d",
                n, total, shiftedCount, onsetWeek));
        report.keyNumber(String.format(Locale.ROOT, "%d invented districts, %d years, %,d events; an early season "
                + "injected in %d districts from week %d.", n, SeasonScenario.YEARS, total, shiftedCount, onsetWeek));
        report.heading("What was run").paragraph(String.format(Locale.ROOT, "An invented region of %d districts "
                + "(Voronoi cells of random sites clipped to an invented outline; seed %d) with daily event counts "
                + "over %d years of 365 days, %,d events in all (%.0f–%.0f expected per district and year). Each "
                + "district has a winter season: a bump on the circle of days around a peak day that drifts slowly "
                + "across the region (a west–east gradient of ±%.0f days plus a smooth random field), so that peaks "
                + "lie on both sides of 1 January. In the last year, from day %d of the year (week %d of the record), "
                + "a spatially clustered group of %d districts (a second random field above its %.0f %% quantile) has "
                + "its season %.0f days earlier. The generator records which districts were shifted and when, so the "
                + "report scores its own alerts.", n, options.seed(), SeasonScenario.YEARS, total,
                Study2.min(sc.yearly()), Study2.max(sc.yearly()), SeasonScenario.GRADIENT_DAYS,
                SeasonScenario.ONSET_DAY_OF_YEAR, onsetWeek, shiftedCount, 100 * SeasonScenario.SHIFT_QUANTILE,
                SeasonScenario.SHIFT_DAYS));

        // ---------------------------------------------------------------- weekly densities
        BayesSpace space = SeasonWindows.space();
        int[][][] weekly = SeasonWindows.trailingCounts(sc);
        double lambda = SeasonWindows.commonSmoothing(space, weekly[0]);
        SeasonWindows.Periods est = SeasonWindows.estimate(space, weekly, codes, lambda);
        List<Period> periods = est.periods();
        progress.line(String.format(Locale.ROOT, "estimated %,d weekly densities (weeks %d–%d, λ = %.3g; %d fits "
                + "did not converge)", periods.size() * n, first, last, lambda, est.notConverged().size()));
        report.heading("Weekly densities on the days of the year").paragraph(String.format(Locale.ROOT, "Each week "
                + "t (weeks of 7 days from the first day of the record) and district, the events of the trailing 365 "
                + "days — week t and the 358 days before it, so that every day of the year appears once — are counted "
                + "by day of the year in %d bins of %d days, and turned into a density on %s. The estimator is Densa's "
                + "penalised likelihood with one smoothing parameter for all district-weeks, λ = %.3g, the median of "
                + "the marginal-likelihood choices over the largest quarter of the districts in week %d. That gives "
                + "%,d densities (weeks %d–%d); %d fits did not converge%s.", SeasonWindows.BINS,
                SeasonWindows.BIN_DAYS, SeasonWindows.describeSpace(), lambda, first, periods.size() * n, first, last,
                est.notConverged().size(), est.notConverged().isEmpty() ? ""
                        : " (" + String.join("; ", est.notConverged().subList(0, Math.min(5, est.notConverged().size())))
                                + ")"));

        // ---------------------------------------------------------------- baseline, saved and loaded
        int split = monitorFrom - first;
        RollingBaseline config = RollingBaseline.withDefaults().withLagSet(LAGS)
                .withCalibrationPeriods(CALIBRATION).withFdr(FDR).withFlaggedKeptOutOfCalibration(true)
                .withDraws(199, options.seed());
        BaselineMonitor fitted = config.fit(periods.subList(0, split));
        BaselineMonitor monitor;
        long fileBytes;
        try {
            Path tmp = Files.createTempFile("densa-study3-baseline", ".densa.json");
            try {
                ModelFile.save(tmp, fitted);
                fileBytes = Files.size(tmp);
                monitor = ModelFile.load(tmp, BaselineMonitor.class);
            } finally {
                Files.deleteIfExists(tmp);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        boolean same = Arrays.equals(fitted.coefficients(), monitor.coefficients());
        progress.line(String.format(Locale.ROOT, "baseline fitted on weeks %d–%d, saved (%,d bytes), loaded back "
                + "(coefficients %s)", first, monitorFrom - 1, fileBytes, same ? "identical" : "DIFFERENT"));
        if (!same) {
            missing.add("The baseline read back from its model file differs from the fitted one; the monitor ran on "
                    + "the loaded baseline.");
        }
        report.heading("The baseline").paragraph(String.format(Locale.ROOT, "A rolling baseline on the first five "
                + "years (weeks %d–%d): in clr coordinates, each district's density in week t is predicted from its "
                + "own densities in weeks t − 52, t − 104 and t − 156 (the same week one, two and three years "
                + "earlier; the seasonal lag set {52, 104, 156}) by a linear function-on-function model with a full "
                + "coordinate kernel per lag and an intercept, fitted by least squares over every district and week "
                + "(%d coefficients per coordinate). Each residual is standardised by the estimation variances of the "
                + "densities it compares, so small districts are not flagged for their counting noise; the residuals "
                + "of the last %d weeks, each computed before its week was absorbed, calibrate split-conformal "
                + "p-values, and a district is flagged when its Benjamini–Hochberg adjusted p-value within the week "
                + "is at most %.2f. A flagged district's residual is kept out of the calibration set: otherwise a "
                + "lasting change (an early season goes on for weeks) fills the calibration set with its own large "
                + "residuals and masks itself after a few weeks. With a trailing window the lag-1 prediction would "
                + "differ from the observation by one week's events only, so a slow shift would be absorbed week "
                + "after week; the seasonal lags compare the year so far with the years before. The fitted baseline "
                + "was saved as a Densa model file (%,d bytes, `baseline-monitor` format), read back, and the loaded "
                + "monitor (coefficients %s to the fitted ones) ran the last year, as a backend would between weekly "
                + "runs.", first, monitorFrom - 1, 1 + LAGS.length * space.dimension(), CALIBRATION, FDR, fileBytes,
                same ? "bit-identical" : "NOT identical"));

        // ---------------------------------------------------------------- monitoring
        List<PeriodReport> reports = new ArrayList<>();
        int[] flaggedPerWeekShifted = new int[last - monitorFrom + 1];
        int[] flaggedPerWeekOther = new int[last - monitorFrom + 1];
        for (int t = monitorFrom; t <= last; t++) {
            Period p = periods.get(t - first);
            BaselineMonitor.Step step = monitor.step(p);
            PeriodReport r = step.report();
            reports.add(r);
            for (int i = 0; i < n; i++) {
                if (r.flagged(i)) {
                    if (sc.shifted()[i]) {
                        flaggedPerWeekShifted[t - monitorFrom]++;
                    } else {
                        flaggedPerWeekOther[t - monitorFrom]++;
                    }
                }
            }
            monitor = step.next();
        }
        int[] onsets = new int[n];
        for (int i = 0; i < n; i++) {
            onsets[i] = sc.shifted()[i] ? onsetWeek : -1;
        }
        DetectionSummary summary = DetectionSummary.evaluate(reports, onsets, 52);
        progress.line("monitored weeks " + monitorFrom + "–" + last + ": " + summary);
        metrics.put("detected", (double) summary.detected());
        metrics.put("missed", (double) summary.missed());
        metrics.put("shifted", (double) shiftedCount);
        metrics.put("medianDelayWeeks", summary.medianDelay());
        metrics.put("falseAlerts", (double) summary.falseAlerts());
        metrics.put("falseAlertsPerUnitYear", summary.falseAlertsPerUnitYear());
        report.keyNumber(String.format(Locale.ROOT, "Detected %d of %d shifted districts, median delay %s weeks after "
                + "the onset; %d false alert(s) (flagged district-weeks) in %.1f unit-years at risk (%.3f per "
                + "unit-year).", summary.detected(),
                shiftedCount, Double.isNaN(summary.medianDelay()) ? "–" : Study3Report.weeks(summary.medianDelay()),
                summary.falseAlerts(), summary.unitYearsAtRisk(), summary.falseAlertsPerUnitYear()));
        Study3Report.monitoring(report, sc, codes, names, frame, periods, est.last(), weekly[weekly.length - 1], reports,
                monitor, summary, flaggedPerWeekShifted, flaggedPerWeekOther, monitorFrom, onsetWeek, first);

        // ---------------------------------------------------------------- space–time kriging
        Study3Report.kriging(report, sc, frame, periods, last, first, metrics, progress, missing);

        metrics.put("seconds", progress.seconds());
        report.keyNumber(String.format(Locale.ROOT, "Run time: %.1f s.", progress.seconds()));
        report.heading("Timing").paragraph(String.format(Locale.ROOT, "The whole study took %.1f s on this machine "
                + "(%d processors available to the JVM).", progress.seconds(),
                Runtime.getRuntime().availableProcessors())).paragraph("The progress log of this run:")
                .bullets(progress.lines().stream().map(l -> "`" + l.strip() + "`").toList());
        if (!missing.isEmpty()) {
            report.heading("Steps not run").bullets(missing);
        }
        ReportFiles written = report.writeTo(options.out());
        return new StudyResult(options.out(), n, written.files(), Map.copyOf(metrics), List.copyOf(missing));
    }
}
