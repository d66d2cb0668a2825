package io.densa.examples;

import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.regression.surveillance.AlertHistory;
import io.densa.regression.surveillance.BaselineMonitor;
import io.densa.regression.surveillance.DetectionSummary;
import io.densa.regression.surveillance.ExcessCounts;
import io.densa.regression.surveillance.Period;
import io.densa.regression.surveillance.PeriodReport;
import io.densa.report.Report;
import io.densa.report.Table;
import io.densa.report.chart.Axis;
import io.densa.report.chart.Chart;
import io.densa.report.chart.ChartGrid;
import io.densa.report.chart.Figures;
import io.densa.report.colour.ColourScale;
import io.densa.report.colour.Palette;
import io.densa.report.map.GridValues;
import io.densa.report.map.MapFrame;
import io.densa.report.map.Maps;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.CrossValidation;
import io.densa.spatial.spacetime.LagBins;
import io.densa.spatial.spacetime.SpaceTimeData;
import io.densa.spatial.spacetime.SpaceTimeFit;
import io.densa.spatial.spacetime.SpaceTimeFitOptions;
import io.densa.spatial.spacetime.SpaceTimeFitting;
import io.densa.spatial.spacetime.SpaceTimeKriging;
import io.densa.spatial.spacetime.SpaceTimeModel;
import io.densa.spatial.spacetime.SpaceTimeVariogram;
import io.densa.spatial.uncertainty.DerivedInterval;
import io.densa.spatial.uncertainty.EstimateUncertainty;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import io.densa.spatial.uncertainty.UnitUncertainty;
import java.awt.Color;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.prep.PreparedGeometry;
import org.locationtech.jts.geom.prep.PreparedGeometryFactory;

/** The report sections of study 3 (monitoring results, space–time kriging). */
final class Study3Report {
    /** Band edges (days of the year) of the displaced-event counts: twelve bands of 30 days, the last of 35. */
    static final double[] BANDS = {0, 30, 60, 90, 120, 150, 180, 210, 240, 270, 300, 330, 365};
    /** Grid cells per side of the kriged map. */
    static final int SIDE = 70;

    private Study3Report() {
    }

    static String weeks(double w) {
        return w == Math.rint(w) ? String.valueOf((long) w) : String.format(Locale.ROOT, "%.1f", w);
    }

    static Axis dayAxis() {
        return Axis.linear("day relative to 1 January, circle cut at 30 June", "days");
    }

    /** Points −185 … 179 of the unrolled axis and the days of the year they stand for. */
    static double[][] unrolledGrid() {
        int m = 365 * 2;
        double[] x = new double[m];
        double[] day = new double[m];
        for (int g = 0; g < m; g++) {
            x[g] = -185 + (g + 0.5) * 365.0 / m;
            day[g] = x[g] < 0 ? x[g] + 365 : x[g];
        }
        return new double[][] {x, day};
    }

    static Chart densityChart(String title, Density observed, Density expected, int[] counts) {
        double[][] g = unrolledGrid();
        Axis x = dayAxis();
        Chart c = Chart.of(title, x, Figures.densityAxis(x));
        long total = Arrays.stream(counts).asLongStream().sum();
        int bins = counts.length;
        double[] bx = new double[bins];
        double[] by = new double[bins];
        for (int b = 0; b < bins; b++) {
            double mid = SeasonWindows.EDGES[b] + SeasonWindows.BIN_DAYS / 2.0;
            bx[b] = SeasonWindows.unrolled(mid);
            by[b] = counts[b] / (double) total / SeasonWindows.BIN_DAYS;
        }
        int[] order = Study1.sortedBy(bins, b -> bx[b]);
        double[] sx = new double[bins];
        double[] sy = new double[bins];
        for (int k = 0; k < bins; k++) {
            sx[k] = bx[order[k]];
            sy[k] = by[order[k]];
        }
        return c.points("events of the trailing year per 5-day bin (" + total + ")", sx, sy)
                .with(new Chart.Series("estimated density", g[0], observed.pdf(g[1]), Chart.Style.LINE, Palette.INK))
                .with(new Chart.Series("baseline prediction", g[0], expected.pdf(g[1]), Chart.Style.DASHED,
                        Palette.BRICK));
    }

    static void monitoring(Report report, SeasonScenario sc, String[] codes, String[] names, MapFrame frame,
            List<Period> periods, BatchEstimate lastEstimate, int[][] lastCounts, List<PeriodReport> reports, BaselineMonitor monitor, DetectionSummary summary,
            int[] flaggedShifted, int[] flaggedOther, int monitorFrom, int onsetWeek, int first) {
        int n = sc.size();
        int last = monitorFrom + reports.size() - 1;
        PeriodReport lastReport = reports.get(reports.size() - 1);
        Period lastPeriod = periods.get(last - first);
        DensitySet observed = lastPeriod.densities();
        DensitySet expected = lastReport.expected();
        double[] tObs = SeasonWindows.timing(observed);
        double[] tExp = SeasonWindows.timing(expected);
        double[] change = new double[n];
        for (int i = 0; i < n; i++) {
            double d = tObs[i] - tExp[i];
            change[i] = d - 365 * Math.rint(d / 365);
        }
        // 90 % intervals: of the observed circular mean day from each estimate's covariance (counting
        // noise); of the change from the covariance of the district's residual against the baseline in
        // weeks without change (the monitor's calibration residuals: counting noise and the baseline's
        // own error together)
        if (last - first != periods.size() - 1) {
            throw new IllegalStateException("the last report is for week " + last + ", the last estimate for week "
                    + (first + periods.size() - 1));
        }
        UncertaintyOptions meanDay = UncertaintyOptions.withSeed(7).withMean(true).withDraws(1000);
        List<UnitUncertainty> timing = EstimateUncertainty.summarise(lastEstimate, meanDay);
        List<double[][]> residualCovariances = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            residualCovariances.add(lastReport.residualCovariance(i));
        }
        List<UnitUncertainty> shifts = EstimateUncertainty.summarise(observed, residualCovariances, meanDay);
        double[][] timingInterval = new double[4][n];
        for (int i = 0; i < n; i++) {
            DerivedInterval t = timing.get(i).mean();
            DerivedInterval c = shifts.get(i).mean();
            timingInterval[0][i] = t.lower();
            timingInterval[1][i] = t.upper();
            timingInterval[2][i] = change[i] + (c.lower() - c.estimate());
            timingInterval[3][i] = change[i] + (c.upper() - c.estimate());
        }
        // recovery check against the invented truth, for the text: districts without a shift whose change
        // interval holds 0, whose observed day's interval holds the true peak day, and their number
        int[] coverage = new int[3];
        for (int i = 0; i < n; i++) {
            if (!sc.shifted()[i]) {
                double off = sc.peaks()[i] - tObs[i];
                double peak = tObs[i] + off - 365 * Math.rint(off / 365);
                coverage[0] += timingInterval[2][i] <= 0 && 0 <= timingInterval[3][i] ? 1 : 0;
                coverage[1] += timingInterval[0][i] <= peak && peak <= timingInterval[1][i] ? 1 : 0;
                coverage[2]++;
            }
        }
        List<AlertHistory> history = monitor.history();
        report.heading("Alerts week by week").paragraph(String.format(Locale.ROOT, "The loaded baseline scored weeks "
                + "%d–%d one at a time and absorbed each after scoring it (the moments of the seasonal regression are "
                + "updated and the week's out-of-sample residuals replace the oldest calibration week). The truth: "
                + "%d districts shifted from week %d (%d weeks of the monitored year before the onset, %d from it).",
                monitorFrom, last, summary.detected() + summary.missed(), onsetWeek, onsetWeek - monitorFrom,
                last - onsetWeek + 1));
        double[] wx = new double[flaggedShifted.length];
        double[] ys = new double[wx.length];
        double[] yo = new double[wx.length];
        for (int w = 0; w < wx.length; w++) {
            wx[w] = monitorFrom + w;
            ys[w] = flaggedShifted[w];
            yo[w] = flaggedOther[w];
        }
        report.figure("fig_alerts_per_week.png", Chart.of("Districts flagged per week", Axis.count("week of the "
                + "record", "weeks"), Axis.count("districts flagged", "")).yFromZero()
                .with(new Chart.Series("districts of the early-season group", wx, ys, Chart.Style.LINE, Palette.BRICK))
                .with(new Chart.Series("other districts (false alerts)", wx, yo, Chart.Style.DASHED, Palette.INK))
                .verticalLine("onset of the early season", onsetWeek), "Districts flagged at FDR " + Study3.FDR
                + " each monitored week, split by the injected truth; the dashed vertical line is the onset week.");
        report.paragraph(String.format(Locale.ROOT, "Against the injected truth: %d of %d shifted districts were "
                + "flagged at or after the onset (median detection delay %s weeks, delays %s), %d were not; flags "
                + "in %d district-weeks fell on districts that were not (yet) shifted, in %.1f unit-years at risk: "
                + "%.3f false alerts per "
                + "unit-year. The delay counts weeks from the onset week to the first flag (0: flagged in the onset "
                + "week).", summary.detected(), summary.detected() + summary.missed(),
                Double.isNaN(summary.medianDelay()) ? "–" : weeks(summary.medianDelay()),
                summary.delays().length == 0 ? "none" : Arrays.toString(sortedCopy(summary.delays())),
                summary.missed(), summary.falseAlerts(), summary.unitYearsAtRisk(), summary.falseAlertsPerUnitYear()));

        int[] category = new int[n];
        for (int i = 0; i < n; i++) {
            boolean everFlagged = history.get(i).firstFlagged() >= 0;
            boolean flaggedAfterOnset = sc.shifted()[i] && history.get(i).lastFlagged() >= onsetWeek;
            category[i] = sc.shifted()[i] ? (flaggedAfterOnset ? 0 : 1) : (everFlagged ? 2 : 3);
        }
        report.figure("map_alerts.png", Maps.categories(frame, category, new String[] {"early season, flagged",
            "early season, never flagged", "flagged without an early season", "quiet"}, new Color[] {Palette.BRICK,
                Palette.OCHRE, Palette.PLUM, Palette.QUIET}, "alerts in the monitored year", "Alerts against the "
                + "injected truth"), "Every district by what the monitor said over the monitored year and what the "
                + "generator did.");
        double lim = Math.max(5, Arrays.stream(change).map(Math::abs).max().orElse(5));
        report.figure("map_timing_change.png", Maps.choropleth(frame, change, ColourScale.diverging(lim,
                "circular mean day, observed − baseline prediction", "days"), "Change of timing in week " + last)
                .withFlagged(sc.shifted(), "early-season group (injected truth)"),
                "Circular mean day of each district's trailing-year density in the last week minus that of the "
                + "baseline's prediction for it; negative: earlier than expected. The early-season group is outlined.");

        // densities: two flagged shifted districts, the quiet district with the earliest and one with the latest timing
        int[] pick = pickDistricts(sc, history, tObs);
        List<Chart> charts = new ArrayList<>();
        for (int k = 0; k < pick.length; k++) {
            int i = pick[k];
            String role = sc.shifted()[i] ? " (early season)" : k == pick.length - 1 && pick.length == 4
                    ? " (quiet, latest season)" : " (quiet, earliest season)";
            charts.add(densityChart(codes[i] + " " + names[i] + role, observed.get(i), expected.get(i),
                    lastCounts[i]));
        }
        report.figure("fig_densities.png", ChartGrid.of("Trailing-year densities of the day of the year, week " + last,
                charts, 2).withCellSize(560, 380), "Densities of the day of the year of the events in the 365 days "
                + "ending with week " + last + " (solid), the baseline's prediction from the same week in the three "
                + "years before (dashed), and the events per 5-day bin on the density scale (points): two districts of "
                + "the early-season group, and the quiet districts (never flagged) with the earliest and the latest "
                + "season. The circle of days is drawn unrolled, cut at day 180 (30 June): negative days are the second half of the year before "
                + "1 January.");

        // alert history table and displaced events in the last week
        long[][] counts = new long[n][];
        for (int i = 0; i < n; i++) {
            counts[i] = Arrays.stream(lastCounts[i]).asLongStream().toArray();
        }
        ExcessCounts.Result excess = ExcessCounts.withDefaults().withDraws(199, 7).estimate(expected,
                counts, SeasonWindows.EDGES, BANDS, lastReport.baselineError());
        int[] firstF = new int[n];
        int[] flaggedWeeks = new int[n];
        int[] consecutive = new int[n];
        double[] delay = new double[n];
        double[] displaced = new double[n];
        double[] dispLo = new double[n];
        double[] dispHi = new double[n];
        double[] dispNoise = new double[n];
        double[] dispP = new double[n];
        double[] pLast = new double[n];
        for (int i = 0; i < n; i++) {
            AlertHistory h = history.get(i);
            firstF[i] = h.firstFlagged();
            flaggedWeeks[i] = h.flaggedPeriods();
            consecutive[i] = h.consecutive();
            delay[i] = sc.shifted()[i] && h.lastFlagged() >= onsetWeek ? firstAt(reports, i, onsetWeek) - onsetWeek
                    : Double.NaN;
            ExcessCounts.Displaced d = excess.units().get(i).displaced();
            displaced[i] = d.value();
            dispLo[i] = d.lower();
            dispHi[i] = d.upper();
            dispNoise[i] = d.noiseMean();
            dispP[i] = d.pValue();
            pLast[i] = lastReport.scores().units().get(i).adjustedPValue();
        }
        Table table = Table.of(n).text("code", codes).text("name", names)
                .flag("early_season", "early season (truth)", sc.shifted())
                .integer("first_flagged_week", "first flagged week (−1: never)", firstF)
                .integer("flagged_weeks", "weeks flagged", flaggedWeeks)
                .integer("consecutive_at_end", "consecutive flagged weeks at the end", consecutive)
                .number("detection_delay_weeks", "detection delay (weeks)", delay, 0)
                .number("timing_observed", "circular mean day, last week", tObs, 1)
                .number("timing_observed_lo90", "circular mean day, 90 % interval from", timingInterval[0], 1)
                .number("timing_observed_hi90", "circular mean day, 90 % interval to", timingInterval[1], 1)
                .number("timing_expected", "circular mean day, baseline", tExp, 1)
                .number("timing_change_days", "change of timing (days)", change, 1)
                .number("timing_change_days_lo90", "change of timing, 90 % interval from", timingInterval[2], 1)
                .number("timing_change_days_hi90", "change of timing, 90 % interval to", timingInterval[3], 1)
                .number("displaced_events", "displaced events, last week", displaced, 0)
                .number("displaced_lo90", "displaced 5 %", dispLo, 0).number("displaced_hi90", "displaced 95 %", dispHi, 0)
                .number("displaced_noise", "displaced without change (mean: counting noise and baseline error)", dispNoise, 0)
                .probability("displaced_p", "p, displaced against no change (counting noise and baseline error)", dispP)
                .probability("displaced_q", "BH-adjusted p, displaced", excess.displacedAdjustedPValues())
                .probability("adjusted_p_last_week", "BH-adjusted p, last week", pLast)
                .number("yearly_events_expected", "expected events per year", sc.yearly(), 0)
                .number("peak_day_truth", "peak day of the season (truth; before any shift)", sc.peaks(), 1);
        report.csv("districts.csv", table);
        List<Geometry> shapes = new ArrayList<>();
        for (Region.Unit u : sc.region().units()) {
            shapes.add(sc.region().projection().toLonLat(u.shape()));
        }
        report.geoJson("districts.geojson", shapes, table.unitValues("code"));
        int[] ever = java.util.stream.IntStream.range(0, n).filter(i -> firstF[i] >= 0).toArray();
        int[] order = Study1.sortedBy(ever.length, k -> firstF[ever[k]] * 1000.0 + ever[k]);
        int[] rows = new int[Math.min(25, ever.length)];
        for (int k = 0; k < rows.length; k++) {
            rows[k] = ever[order[k]];
        }
        report.subheading("Alert history").paragraph("Districts flagged at least once in the monitored year, by the "
                + "week of their first flag (" + ever.length + " in all; at most 25 shown, every district in "
                + "`districts.csv`). Displaced events: how many of the trailing year's events would have to move to "
                + "another 30-day band of the year for the observed band counts to match the baseline's prediction, "
                + "with a 90 % parametric-bootstrap interval (Poisson counting noise and the baseline's own error, "
                + "the monitor's law of it); a sum of positive parts, it is never 0, so `districts.csv` also gives "
                + "what a district without change would displace against the same baseline — counting noise and the "
                + "baseline's error together (`displaced_noise`, a mean) — and a p-value against that "
                + "(`displaced_p`; adjusted for testing every district, Benjamini–Hochberg: `displaced_q`). The change "
                + "of timing (days) "
                + "comes with a 90 % interval from 1,000 draws of the observed density with the covariance of the "
                + "district's residual against the baseline in weeks without change (from the monitor's rolling "
                + "calibration residuals, scaled by the district's estimation variance): it carries the counting "
                + "noise and the baseline's own error together (days from the circular mean unrolled around the "
                + "estimate). The observed mean day's interval in `districts.csv` carries the counting noise "
                + "alone. Against the invented truth: " + coverage[0] + " of " + coverage[2] + " districts without a "
                + "shift have 0 inside the change's interval and " + coverage[1] + " their true peak day inside the "
                + "observed day's interval (nominal 90 %). The monitor's weekly periods carry densities only, so its "
                + "own excess counts are not computed; the displaced events above are those of the last week's "
                + "trailing year against the monitor's prediction and its law of the baseline's error. Counted "
                + "against each district's own total, an early season moves events in time without adding any.")
                .table(table.select(rows).columns("code", "name", "early_season", "first_flagged_week", "flagged_weeks",
                        "consecutive_at_end", "detection_delay_weeks", "timing_change_days", "timing_change_days_lo90",
                        "timing_change_days_hi90", "displaced_events", "displaced_lo90", "displaced_hi90",
                        "displaced_noise"));
        String[] labels = new String[n];
        for (int i = 0; i < n; i++) {
            labels[i] = codes[i] + " " + names[i];
        }
        // a false discovery rate of 0.10 here, not the monitor's weekly 0.02: one test per district on 199
        // draws, whose smallest p-value (0.005) could not pass 0.02 across 200 districts
        report.paragraph(io.densa.report.Findings.displaced(excess, labels, "districts", "events", 0.10, 15));
    }

    /** A fitted space–time model in words (distances in km, time lags in weeks). */
    static String describe(SpaceTimeModel m) {
        String nugget = "space–time nugget " + io.densa.report.Numbers.significant(m.nugget(), 3);
        return switch (m.kind()) {
            case SEPARABLE -> "separable: " + io.densa.report.Describe.variogram(m.spatial(), "km") + " in space × "
                    + io.densa.report.Describe.variogram(m.temporal(), "weeks") + " in time, " + nugget;
            case PRODUCT_SUM -> "product-sum: " + io.densa.report.Describe.variogram(m.spatial(), "km")
                    + " in space, " + io.densa.report.Describe.variogram(m.temporal(), "weeks") + " in time, k = "
                    + io.densa.report.Numbers.significant(m.productSumK(), 3) + ", " + nugget;
            case GNEITING -> "Gneiting class: sill " + io.densa.report.Numbers.significant(m.sill(), 3) + ", " + nugget;
        };
    }

    static int firstAt(List<PeriodReport> reports, int i, int from) {
        for (PeriodReport r : reports) {
            if (r.period() >= from && r.flagged(i)) {
                return r.period();
            }
        }
        return -1;
    }

    static int[] sortedCopy(int[] a) {
        int[] s = a.clone();
        Arrays.sort(s);
        return s;
    }

    static int[] pickDistricts(SeasonScenario sc, List<AlertHistory> history, double[] timing) {
        int n = sc.size();
        List<Integer> out = new ArrayList<>();
        for (int i = 0; i < n && out.size() < 2; i++) {
            if (sc.shifted()[i] && history.get(i).firstFlagged() >= 0) {
                out.add(i);
            }
        }
        for (int i = 0; i < n && out.size() < 2; i++) {
            if (sc.shifted()[i] && !out.contains(i)) {
                out.add(i);
            }
        }
        int early = -1;
        int late = -1;
        for (int i = 0; i < n; i++) {
            if (sc.shifted()[i] || history.get(i).firstFlagged() >= 0) {
                continue;
            }
            double u = SeasonWindows.unrolled(timing[i]);
            if (early < 0 || u < SeasonWindows.unrolled(timing[early])) {
                early = i;
            }
            if (late < 0 || u > SeasonWindows.unrolled(timing[late])) {
                late = i;
            }
        }
        if (early >= 0) {
            out.add(early);
        }
        if (late >= 0 && late != early) {
            out.add(late);
        }
        return out.stream().mapToInt(Integer::intValue).toArray();
    }

    static void kriging(Report report, SeasonScenario sc, MapFrame frame, List<Period> periods, int last, int first,
            Map<String, Double> metrics, Progress progress, List<String> missing) {
        int n = sc.size();
        int weeks = Study3.KRIGING_WEEKS;
        double[] x = sc.region().xs();
        double[] y = sc.region().ys();
        double[] xs = new double[n * weeks];
        double[] ys = new double[n * weeks];
        double[] ts = new double[n * weeks];
        DensitySet all = null;
        for (int w = 0; w < weeks; w++) {
            int t = last - weeks + 1 + w;
            DensitySet d = periods.get(t - first).densities();
            all = all == null ? d : all.concat(d);
            for (int i = 0; i < n; i++) {
                xs[w * n + i] = x[i];
                ys[w * n + i] = y[i];
                ts[w * n + i] = t;
            }
        }
        SpaceTimeData data = SpaceTimeData.of(Locations.planar(xs, ys), ts, all);
        Envelope env = sc.region().outline().getEnvelopeInternal();
        double diag = Math.hypot(env.getWidth(), env.getHeight());
        LagBins spatial = new LagBins(diag / 2 / 12, 12);
        LagBins temporal = new LagBins(1, weeks - 1);
        SpaceTimeVariogram empirical = SpaceTimeVariogram.of(data, spatial, temporal);
        progress.line("space-time variogram of " + data.size() + " district-weeks");
        SpaceTimeFit best = null;
        List<String> fits = new ArrayList<>();
        for (SpaceTimeModel.Kind kind : SpaceTimeModel.Kind.values()) {
            try {
                SpaceTimeFit f = SpaceTimeFitting.fit(empirical, kind,
                        SpaceTimeFitOptions.withDefaults().withMaxEvaluations(600).withSpatialNugget(true));
                fits.add(String.format(Locale.ROOT, "%s: weighted criterion %.4g, RMSE %.3g%s",
                        kind.name().toLowerCase(Locale.ROOT).replace('_', '-'), f.criterion(), f.rmse(),
                        f.atBound().isEmpty() ? "" : " (on a bound: " + String.join(", ", f.atBound()) + ")"));
                if (best == null || f.criterion() < best.criterion()) {
                    best = f;
                }
            } catch (RuntimeException e) {
                fits.add(kind + ": not fitted (" + e.getMessage() + ")");
            }
        }
        if (best == null) {
            missing.add("Space–time kriging: no space–time model could be fitted (" + String.join("; ", fits) + ").");
            return;
        }
        progress.line("space-time models fitted");
        SpaceTimeKriging kriging = SpaceTimeKriging.ordinary(data, best.model(), Study3.NEIGHBOURS);
        CrossValidation cv = kriging.crossValidate();
        progress.line("leave-one-out done");
        double mse = 0;
        for (double e : cv.errorNorms()) {
            mse += e * e;
        }
        mse /= cv.errorNorms().length;
        // persistence: the district's density of the week before, as the naive predictor of the same observations
        double persistence = 0;
        int counted = 0;
        for (int w = 1; w < weeks; w++) {
            for (int i = 0; i < n; i++) {
                persistence += Math.pow(all.get(w * n + i).distance(all.get((w - 1) * n + i)), 2);
                counted++;
            }
        }
        persistence /= counted;
        io.densa.core.Density regional = all.mean();
        double meanDensity = 0;
        for (int j = 0; j < all.size(); j++) {
            meanDensity += Math.pow(all.get(j).distance(regional), 2);
        }
        meanDensity /= all.size();
        // the grid, next week
        double pad = 0.02 * Math.max(env.getWidth(), env.getHeight());
        double minX = env.getMinX() - pad;
        double maxX = env.getMaxX() + pad;
        double minY = env.getMinY() - pad;
        double maxY = env.getMaxY() + pad;
        double cw = (maxX - minX) / SIDE;
        int rowsY = (int) Math.ceil((maxY - minY) / cw);
        // every cell whose centre lies within one cell diagonal of the outline; the map clips to the outline
        PreparedGeometry inside = PreparedGeometryFactory.prepare(sc.region().outline().buffer(1.5 * cw));
        double[] values = new double[SIDE * rowsY];
        double[] sd = new double[SIDE * rowsY];
        List<Density> predicted = new ArrayList<>();
        int[] cell = new int[SIDE * rowsY];
        int m = 0;
        for (int r = 0; r < rowsY; r++) {
            for (int c = 0; c < SIDE; c++) {
                double cx = minX + (c + 0.5) * cw;
                double cy = minY + (r + 0.5) * cw;
                int k = r * SIDE + c;
                values[k] = Double.NaN;
                sd[k] = Double.NaN;
                if (!inside.contains(Region.GEOMETRY.createPoint(new Coordinate(cx, cy)))) {
                    continue;
                }
                var p = kriging.predict(cx, cy, last + 1);
                predicted.add(p.density());
                sd[k] = Math.sqrt(p.variance());
                cell[m++] = k;
            }
        }
        double[] timing = SeasonWindows.timing(DensitySet.of(predicted));
        for (int j = 0; j < m; j++) {
            values[cell[j]] = SeasonWindows.unrolled(timing[j]);
        }
        double maxY2 = minY + rowsY * cw;
        metrics.put("krigingCells", (double) m);
        metrics.put("spaceTimeLooMse", mse);
        metrics.put("persistenceMse", persistence);
        metrics.put("meanDensityMse", meanDensity);
        progress.line(String.format(Locale.ROOT, "space-time kriging: %s model, %d observations, LOO mean squared B2 "
                + "error %.4g (persistence %.4g); %d grid cells for week %d", best.model().kind(), data.size(), mse,
                persistence, m, last + 1));
        report.heading("Expected timing next week: space–time kriging").paragraph(String.format(Locale.ROOT,
                "The densities of the last %d weeks (%d district-weeks at the district sites) are treated as one "
                + "space–time field of densities. The empirical space–time trace-variogram (spatial classes of "
                + "%.1f km up to %.0f km, temporal classes of one week) was fitted by weighted least squares (Cressie's weights, "
                + "at most 600 optimiser evaluations per starting point) with the separable, the product-sum (De "
                + "Cesare, Myers & Posa 2001) and the Gneiting-class (Gneiting 2002) models, the separable and "
                + "product-sum ones with a nugget in the spatial margin as well as the space–time nugget (%s): a "
                + "district's own effect lasts from week to week, so two districts differ by a jump that the same "
                + "district in two weeks does not show, and without the spatial nugget that jump would be taken for "
                + "week-to-week noise. The one with the smallest criterion, %s, drives ordinary space–time kriging "
                + "with the %d observations of largest covariance per target. Leave-one-out cross-validation: mean "
                + "squared B2 error %.4g, against %.4g for the regional mean density and %.4g for carrying each "
                + "district's density of the week before forward (consecutive trailing-year windows share 51 of "
                + "their 52 weeks, so that naive forecast is already close); %s Each grid cell inside the region "
                + "(cells of %.2f km) gets the kriged density for week %d, and the map shows its circular mean day — "
                + "the expected timing of the trailing year's events.", weeks, data.size(), spatial.width(),
                spatial.maxLag(), String.join("; ", fits), describe(best.model()), Study3.NEIGHBOURS, mse, meanDensity,
                persistence, mse < persistence ? "kriging does better still, combining a district's own recent weeks "
                        + "with its neighbours', and it also gives a density between the sites."
                        : "at the district sites that forecast does better; kriging is what gives a density between "
                        + "the sites.", cw, last + 1));
        report.figure("map_expected_timing.png", Maps.grid(frame, GridValues.of(minX, minY, maxX, maxY2, SIDE, rowsY,
                values), ColourScale.of(values, "circular mean day of the kriged density", "days from 1 January"),
                "Expected timing in week " + (last + 1)).withUnitBorders().withFlagged(sc.shifted(),
                        "early-season group (injected truth)"),
                "Circular mean day of the space–time kriged density of the trailing year for week " + (last + 1)
                + ", in days from 1 January (negative: before it), with the district borders; the early-season group "
                + "is outlined. The west–east drift of the season dominates; the early season moves a district's "
                + "trailing-year mean by a few days only (see the change of timing above).");
        report.figure("map_kriging_sd.png", Maps.grid(frame, GridValues.of(minX, minY, maxX, maxY2, SIDE, rowsY, sd),
                ColourScale.of(sd, "kriging standard deviation", "B2 norm"), "Space–time kriging standard deviation, "
                + "week " + (last + 1)).withSites(x, y, "district sites"), "Square root of the trace kriging variance "
                + "of the prediction one week ahead.");
    }
}
