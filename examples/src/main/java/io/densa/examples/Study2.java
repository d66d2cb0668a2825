package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.kriging.CrossValidation;
import io.densa.spatial.kriging.Drift;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.UniversalFit;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import io.densa.spatial.uncertainty.AnisotropyTest;
import io.densa.spatial.uncertainty.DerivedInterval;
import io.densa.spatial.kriging.GridTile;
import io.densa.spatial.uncertainty.LocationUncertainty;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.ProportionalityCheck;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import io.densa.spatial.uncertainty.EstimateUncertainty;
import io.densa.spatial.uncertainty.UnitUncertainty;
import io.densa.report.chart.Axis;
import io.densa.report.chart.Chart;
import io.densa.report.chart.ChartGrid;
import io.densa.report.colour.ColourScale;
import io.densa.report.Describe;
import io.densa.report.chart.Figures;
import io.densa.report.Findings;
import io.densa.report.map.GridValues;
import io.densa.report.map.MapFigure;
import io.densa.report.map.MapFrame;
import io.densa.report.map.Maps;
import io.densa.report.Numbers;
import io.densa.report.chart.Observed;
import io.densa.report.Report;
import io.densa.report.ReportFiles;
import io.densa.report.Table;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.Point;

/**
 * Study 2: distributions of daily mean fine-particle concentrations at the monitors of an
 * invented city. See {@link AirScenario} for the scenario; the pipeline is documented in the
 * report it writes.
 */
final class Study2 {
    /**
     * Demo threshold: 15 µg/m³, the 24-hour PM2.5 guideline level published in "Global air quality
     * guidelines" (2021); cited as a source in the report's text, never used as a label.
     */
    static final double THRESHOLD = 15.0;
    /** Domain of the log daily mean: ln 1 to ln 150 µg/m³. */
    static final double LOG_LO = 0.0;
    static final double LOG_HI = Math.log(150);

    private Study2() {
    }

    static StudyResult run(Main.Options options, Progress progress) {
        int n = options.unitsOr(30, 50, 80);
        int side = options.units() > 0 ? 500 : switch (options.size()) {
            case "small" -> 120;
            case "medium" -> 250;
            default -> 500;
        };
        Path dir = options.out();
        progress.line("generating the invented monitor network (" + n + " monitors, 8,760 hours, seed "
                + options.seed() + ")");
        AirScenario sc = AirScenario.generate(options.seed(), n);
        int m = sc.size();
        List<String> missing = new ArrayList<>();
        Map<String, Double> metrics = new LinkedHashMap<>();
        Report report = Report.titled("Densa study 2 — daily fine-particle concentration distributions in an "
                + "invented city").note(Main.INVENTED);
        String caption = "Invented data. Drawn in planar km: " + sc.projection().describe() + ".";
        MapFrame frame = MapFrame.km(List.of(), sc.outline(), caption);
        double logT = Math.log(THRESHOLD);

        // ---------------------------------------------------------------- daily means
        double[][] logDaily = new double[m][];
        double[] missingShare = new double[m];
        int[] validDays = new int[m];
        double[] annualMean = new double[m];
        double[] empiricalExceed = new double[m];
        int clipped = 0;
        for (int i = 0; i < m; i++) {
            double[] daily = sc.dailyMeans(i);
            missingShare[i] = sc.missingShare(i);
            double[] vals = new double[daily.length];
            int c = 0;
            double s = 0;
            int over = 0;
            for (double v : daily) {
                if (Double.isNaN(v)) {
                    continue;
                }
                s += v;
                if (v > THRESHOLD) {
                    over++;
                }
                double lv = Math.log(v);
                if (lv < LOG_LO || lv > LOG_HI) {
                    clipped++;
                    lv = Math.max(LOG_LO, Math.min(LOG_HI, lv));
                }
                vals[c++] = lv;
            }
            logDaily[i] = Arrays.copyOf(vals, c);
            validDays[i] = c;
            annualMean[i] = s / c;
            empiricalExceed[i] = over / (double) c;
        }
        progress.line(String.format(Locale.ROOT, "%d monitors: %d–%d valid days each, annual means %.1f–%.1f µg/m³",
                m, Arrays.stream(validDays).min().orElse(0), Arrays.stream(validDays).max().orElse(0),
                min(annualMean), max(annualMean)));
        report.keyNumber(String.format(Locale.ROOT, "%d invented monitors, a year of hourly values; %.1f %% of hours "
                + "missing; annual means %.1f–%.1f µg/m³.", m, 100 * mean(missingShare), min(annualMean),
                max(annualMean)));
        report.heading("What was run").paragraph("An invented city with " + m + " monitors (" + count(sc.roadside())
                + " of them next to heavy-traffic hot spots) and a year of hourly fine-particle (PM2.5-like) "
                + "concentrations with missing hours (outages and single hours; " + Numbers.fixed(100 * mean(missingShare), 1)
                + " % of hours missing on average; seed " + options.seed() + "). Each monitor's hours are averaged to "
                + "**daily means** (a day counts when at least " + AirScenario.MIN_HOURS_PER_DAY + " of its 24 hours "
                + "are present). **The densities in this report are densities of the natural log of the daily mean "
                + "concentration**, on [ln 1, ln 150] (ln µg/m³), because the threshold below is a 24-hour value; "
                + clipped + " daily values fell outside that range and were clipped to it.");
        report.paragraph("Threshold: 15 µg/m³ for the daily mean, the 24-hour PM2.5 guideline level published in "
                + "*Global air quality guidelines: particulate matter (PM2.5 and PM10), ozone, nitrogen dioxide, "
                + "sulfur dioxide and carbon monoxide* (2021). It serves here only as a demonstration on invented "
                + "data: P(daily mean > 15 µg/m³) is the share of days a monitor's (or a location's) density puts "
                + "above it, not a regulatory statistic.");
        report.paragraph("Coordinates: computations in planar kilometres (" + sc.projection().describe()
                + "); `monitors.geojson` is in WGS 84 longitude/latitude (RFC 7946). The invented city is placed over "
                + "open ocean so that it cannot be mistaken for a real place.");

        report.figure("map_monitors.png", Maps.points(frame, sc.x(), sc.y(), annualMean, ColourScale.of(annualMean,
                "annual mean of daily means", "µg/m³"), sc.roadside(), "next to a heavy-traffic hot spot",
                "other monitors", "Monitors and their annual mean"), "The invented monitors coloured by the annual "
                + "mean of their daily means; large dots are next to heavy-traffic hot spots.");

        // ---------------------------------------------------------------- densities
        BayesSpace space = BayesSpace.splines(LOG_LO, LOG_HI, 4, 8);
        String[] codes = sc.codes();
        Estimates est = SampleDensities.estimate(space, logDaily, codes);
        DensitySet dens = est.densities();
        double[] estVar = est.variances();
        double[] pExceed = dens.tailProbability(logT);
        double[] median = exp(dens.quantiles(0.5));
        // each monitor's P(> 15) and median with 90 % intervals from its estimate's covariance
        List<UnitUncertainty> perMonitor = EstimateUncertainty.summarise(est.batch(), UncertaintyOptions
                .withSeed(options.seed()).withDraws(1000).withQuantiles(0.5).withExceedances(logT)
                .withDataUnits(Math::exp));
        double[][] monitorIntervals = new double[4][m];
        for (int i = 0; i < m; i++) {
            DerivedInterval p = perMonitor.get(i).exceedances().get(0);
            DerivedInterval q = perMonitor.get(i).quantiles().get(0);
            monitorIntervals[0][i] = p.lower();
            monitorIntervals[1][i] = p.upper();
            monitorIntervals[2][i] = q.lower();
            monitorIntervals[3][i] = q.upper();
        }
        int notConverged = est.notConverged();
        progress.line("estimated " + m + " densities of log daily means (" + notConverged + " fits did not converge)");
        for (String problem : est.problems()) {
            progress.line("  not converged: " + problem);
        }
        report.heading("Densities per monitor").paragraph("Each monitor's log daily means are turned into a density in "
                + Describe.splineSpace(space, "8 equally spaced interior knots") + " by " + SampleDensities.describe() + "; " + notConverged + " fits did not converge. "
                + (estVar == null ? "No estimation variances are available, so the kriging below treats the densities "
                + "as exact." : "The estimator also reports each density's B2 estimation variance (trace of its "
                + "coordinate covariance), used below as the measurement-error variance of the kriging."));
        if (!est.problems().isEmpty()) {
            report.bullets(est.problems());
        }
        report.paragraph(Findings.extrapolated(est.extrapolated(), m, 10));
        metrics.put("extrapolatedEstimates", (double) est.extrapolated().size());
        report.figure("fig_densities.png", densityFigure(sc, logDaily, dens), "Four monitors (lowest, median and "
                + "highest mean, and a roadside one): histogram of the daily means (points) and the estimated "
                + "density (line) on a logarithmic axis labelled in µg/m³; the dashed line marks 15 µg/m³.");

        // ---------------------------------------------------------------- variogram
        Locations loc = Locations.planar(sc.x(), sc.y());
        Envelope env = sc.outline().getEnvelopeInternal();
        double maxLag = 0.5 * Math.hypot(env.getWidth(), env.getHeight());
        VariogramOptions vOpt = VariogramOptions.withDefaults().withBinCount(12).withMaxLag(maxLag);
        VariogramFitOptions fOpt = VariogramFitOptions.withDefaults().withFamily(VariogramModel.Family.EXPONENTIAL);
        EmpiricalVariogram raw = EmpiricalVariogram.of(loc, dens, vOpt);
        VariogramFit rawFit = VariogramFitting.fit(raw, fOpt);
        KrigingOptions kOpt = estVar == null ? KrigingOptions.withDefaults()
                : KrigingOptions.withDefaults().withErrorVariances(estVar);
        UniversalFit uk = UniversalFit.estimate(loc, dens, Drift.polynomial(1), vOpt, fOpt, kOpt, 10);
        VariogramModel model = uk.fit().model();
        progress.line("trace-variogram fitted: raw " + describe(rawFit.model()) + "; universal-kriging residuals "
                + describe(model)
                + " after " + uk.iterations() + " iterations" + (uk.converged() ? "" : " (not converged)"));
        report.heading("Trace-variogram").paragraph("Empirical trace-variogram γ̂(h) = (1/(2|N(h)|)) Σ ‖X_i ⊖ X_j‖²_B "
                + "(Giraldo, Delicado and Mateu 2011) in " + raw.binCount() + " bins up to " + Numbers.fixed(maxLag, 1)
                + " km (12 equal bins, empty ones merged into a neighbour), and an "
                + "exponential model (nugget + exponential, practical range) fitted by Cressie's (1985) weighted "
                + "least squares. Raw densities: " + describe(rawFit.model()) + ". For universal kriging with a linear "
                + "drift in the coordinates the variogram of the drift residuals was re-fitted with the GLS drift "
                + "until it settled (" + uk.iterations() + " fits" + (uk.converged() ? "" : ", not converged") + "): "
                + describe(model) + ".");
        List<String> fitNotes = new ArrayList<>(Findings.variogramFit("Raw densities", rawFit, "km"));
        fitNotes.addAll(Findings.variogramFit("Drift residuals", uk.fit(), "km"));
        metrics.put("variogramFitWarnings", (double) (rawFit.warnings().size() + uk.fit().warnings().size()));
        report.bullets(fitNotes);
        for (VariogramFit.Warning w : rawFit.warnings()) {
            progress.line("  variogram warning (raw densities): " + w.message());
        }
        for (VariogramFit.Warning w : uk.fit().warnings()) {
            progress.line("  variogram warning (drift residuals): " + w.message());
        }
        report.figure("fig_variogram.png", Figures.variogram("Trace-variogram of the monitor densities", "km",
                List.of(new Figures.VariogramLayer("densities", raw, rawFit.model()),
                    new Figures.VariogramLayer("drift residuals", uk.residualVariogram(), model))),
                "Empirical trace-variograms (points), fitted models (solid: densities; dashed: drift residuals) "
                        + "and the number of monitor pairs in each distance bin.");

        // ---------------------------------------------------------------- cross-validation
        CrossValidation cv = uk.kriging().crossValidate();
        double[][] c = dens.coordinates();
        int k = space.dimension();
        double[] meanAll = new double[k];
        for (double[] row : c) {
            for (int j = 0; j < k; j++) {
                meanAll[j] += row[j] / m;
            }
        }
        double[] baseErr = new double[m];
        double baseSq = 0;
        double[][] looCoords = new double[m][k];
        for (int i = 0; i < m; i++) {
            double s = 0;
            for (int j = 0; j < k; j++) {
                double other = (m * meanAll[j] - c[i][j]) / (m - 1);
                double e = c[i][j] - other;
                s += e * e;
                looCoords[i][j] = c[i][j] - cv.errors()[i][j];
            }
            baseErr[i] = Math.sqrt(s);
            baseSq += s / m;
        }
        DensitySet looPred = DensitySet.of(space, looCoords, codes);
        double[] looExceed = looPred.tailProbability(logT);
        double maeUk = 0;
        double maeBase = 0;
        double[] meanExceedOthers = new double[m];
        for (int i = 0; i < m; i++) {
            double[] mc = new double[k];
            for (int j = 0; j < k; j++) {
                mc[j] = (m * meanAll[j] - c[i][j]) / (m - 1);
            }
            meanExceedOthers[i] = space.density(mc).cdf(logT);
            meanExceedOthers[i] = 1 - meanExceedOthers[i];
            maeUk += Math.abs(looExceed[i] - empiricalExceed[i]) / m;
            maeBase += Math.abs(meanExceedOthers[i] - empiricalExceed[i]) / m;
        }
        metrics.put("looMseUniversal", cv.meanSquaredError());
        metrics.put("looMseMeanDensity", baseSq);
        metrics.put("looExceedanceMaeUniversal", maeUk);
        metrics.put("looExceedanceMaeMeanDensity", maeBase);
        report.keyNumber(String.format(Locale.ROOT, "Leave-one-out mean squared B2 error: %.3g by universal kriging "
                + "against %.3g by the mean density of the other monitors; mean absolute error of P(daily mean > 15 "
                + "µg/m³): %.3f against %.3f.", cv.meanSquaredError(), baseSq, maeUk, maeBase));
        progress.line(String.format(Locale.ROOT, "leave-one-out: mean squared B2 error %.4f (universal kriging) vs %.4f"
                + " (mean density of the other monitors)", cv.meanSquaredError(), baseSq));
        report.heading("Leave-one-out cross-validation").paragraph("Each monitor's density is predicted from the "
                + "others (fast leave-one-out of the global universal-kriging system, Dubrule 1983) and compared with "
                + "the simplest alternative, the ⊕-mean density of the other monitors. The last column compares the "
                + "predicted P(daily mean > 15 µg/m³) with the held-out monitor's observed share of days above it.");
        report.table(Table.of(2).text("predictor", new String[] {"universal kriging (linear drift)",
            "mean density of the other monitors"})
                .number("mean_error", "mean B2 error", new double[] {cv.meanError(), mean(baseErr)}, 4)
                .number("mean_squared_error", "mean squared B2 error", new double[] {cv.meanSquaredError(), baseSq}, 4)
                .number("mean_standardised_squared_error", "mean standardised squared error",
                        new double[] {cv.meanStandardisedSquaredError(), Double.NaN}, 3)
                .number("mae_p_over_15", "mean abs. error of P(> 15 µg/m³)", new double[] {maeUk, maeBase}, 4));
        report.paragraph(String.format(Locale.ROOT, "Kriging reduces the mean squared leave-one-out error by %.0f %% "
                + "against the mean density. A mean standardised squared error near 1 means the kriging variances "
                + "describe the errors well (%.2f here).", 100 * (1 - cv.meanSquaredError() / baseSq),
                cv.meanStandardisedSquaredError()));

        // ---------------------------------------------------------------- grid
        Grid grid = Grid.over(env.getMinX(), env.getMinY(), env.getMaxX(), env.getMaxY(), side, side)
                .withMask(sc.outline());
        double[] gP = new double[side * side];
        double[] gMed = new double[side * side];
        double[] gSd = new double[side * side];
        Arrays.fill(gP, Double.NaN);
        Arrays.fill(gMed, Double.NaN);
        Arrays.fill(gSd, Double.NaN);
        long t0 = System.nanoTime();
        int[] lastTenth = {0};
        GridOptions gOpt = GridOptions.withDefaults().withVariance(true).withTailProbabilities(logT)
                .withQuantiles(0.5).withProgressListener((task, done, total) -> {
                    int tenth = (int) (10L * done / total);
                    if (tenth > lastTenth[0]) {
                        lastTenth[0] = tenth;
                        progress.line("grid prediction " + 10 * tenth + " % (" + done + "/" + total + " tiles)");
                    }
                });
        int[] cells = {0};
        long[] exactDraws = {0};
        // predictive distribution (proportional covariance) and 90 % Monte Carlo intervals, same pass
        PredictiveDistribution pd = PredictiveDistribution.of(uk.kriging());
        // 100 draws per cell for the maps (a 90 % interval end then has a standard error of about 0.2
        // predictive SDs), 2,000 at the three locations of the table
        UncertaintyOptions uOpt = UncertaintyOptions.withSeed(options.seed()).withDraws(100).withQuantiles(0.5)
                .withExceedances(logT).withDataUnits(Math::exp);
        double[] gPLo = new double[side * side];
        double[] gPHi = new double[side * side];
        double[] gMedSd = new double[side * side];
        Arrays.fill(gPLo, Double.NaN);
        Arrays.fill(gPHi, Double.NaN);
        Arrays.fill(gMedSd, Double.NaN);
        pd.summariseGrid(grid, gOpt, uOpt, ut -> {
            GridTile tile = ut.tile();
            for (int q = 0; q < tile.size(); q++) {
                int idx = tile.rows()[q] * side + tile.columns()[q];
                gP[idx] = tile.tailProbabilities()[0][q];
                gMed[idx] = Math.exp(tile.quantiles()[0][q]);
                gSd[idx] = Math.sqrt(Math.max(0, tile.variances()[q]));
                gPLo[idx] = ut.exceedances().get(0).lowers()[q];
                gPHi[idx] = ut.exceedances().get(0).uppers()[q];
                gMedSd[idx] = ut.quantiles().get(0).sds()[q];
            }
            for (int e : ut.exactDraws()) {
                exactDraws[0] += e;
            }
            cells[0] += tile.size();
        });
        metrics.put("exactDrawShare", exactDraws[0] / (double) Math.max(1, cells[0]) / (uOpt.draws() + 1));
        double gridSeconds = (System.nanoTime() - t0) / 1e9;
        metrics.put("gridCells", (double) cells[0]);
        report.keyNumber(String.format(Locale.ROOT, "Kriged %,d cells of a %d × %d grid over the city in %.1f s; "
                + "P(daily mean > 15 µg/m³) ranges from %.2f to %.2f over the city.", cells[0], side,
                side, gridSeconds, min(gP), max(gP)));
        metrics.put("gridSeconds", gridSeconds);
        progress.line(String.format(Locale.ROOT, "kriged %,d grid cells (%d × %d over the city) in %.1f s", cells[0],
                side, side, gridSeconds));
        report.heading("Maps from universal kriging").paragraph(String.format(Locale.ROOT, "The monitors' densities "
                + "were kriged (universal kriging with a linear drift, the fitted residual variogram and each "
                + "density's estimation variance as measurement error) onto a %d × %d grid over the city's bounding "
                + "box; the %,d cells inside the outline were predicted in tiles, and from each predicted density "
                + "the probability of a daily mean above 15 µg/m³ and the median daily mean were computed in the same "
                + "pass (%.1f s). The kriging standard deviation is the square root of the trace kriging variance, "
                + "in units of the B2 norm of log-concentration densities.", side, side, cells[0], gridSeconds));
        report.figure("map_exceedance.png", gridMap(sc, frame, grid, gP, ColourScale.probability(
                "P(daily mean > 15 µg/m³)"), "Probability that a day's mean exceeds 15 µg/m³"),
                "P(daily mean > 15 µg/m³) from the kriged densities, on the fixed scale from 0 to 1; dots are the "
                + "monitors. A demonstration on invented data, not a regulatory assessment.");
        report.figure("map_median.png", gridMap(sc, frame, grid, gMed, ColourScale.of(gMed, "median daily mean",
                "µg/m³"), "Median daily mean concentration"), "Median daily mean: exp of the median of the kriged "
                + "density of the log daily mean (the median commutes with the monotone log).");
        report.figure("map_kriging_sd.png", gridMap(sc, frame, grid, gSd, ColourScale.of(gSd, "kriging standard "
                + "deviation", "B2 norm of log-concentration densities"), "Kriging standard deviation"),
                "Kriging standard deviation: small near monitors, large in gaps and at the edges.");
        uncertaintySection(report, sc, frame, pd, uOpt, side, gPLo, gP, gPHi, gMedSd, grid, metrics, progress);

        // ---------------------------------------------------------------- tables
        double[] lon = new double[m];
        double[] lat = new double[m];
        List<Geometry> points = new ArrayList<>();
        for (int i = 0; i < m; i++) {
            lon[i] = sc.projection().lon(sc.x()[i]);
            lat[i] = sc.projection().lat(sc.y()[i]);
            Point pt = Region.GEOMETRY.createPoint(new org.locationtech.jts.geom.Coordinate(sc.x()[i], sc.y()[i]));
            points.add(pt);
        }
        Table table = Table.of(m).text("code", codes).text("name", sc.names())
                .number("lon", "longitude (degrees)", lon, 4).number("lat", "latitude (degrees)", lat, 4)
                .flag("roadside", "roadside", sc.roadside())
                .percent("missing_hour_share", "missing hours", missingShare, 1)
                .integer("valid_days", "valid days", validDays)
                .number("annual_mean", "annual mean (µg/m³)", annualMean, 1)
                .percent("observed_share_over_15", "observed days > 15 µg/m³", empiricalExceed, 1)
                .percent("density_p_over_15", "density P(> 15 µg/m³)", pExceed, 1)
                .percent("density_p_over_15_lo90", "density P(> 15 µg/m³), 90 % interval from", monitorIntervals[0], 1)
                .percent("density_p_over_15_hi90", "density P(> 15 µg/m³), 90 % interval to", monitorIntervals[1], 1)
                .number("density_median", "density median (µg/m³)", median, 1)
                .number("density_median_lo90", "density median, 90 % interval from (µg/m³)", monitorIntervals[2], 1)
                .number("density_median_hi90", "density median, 90 % interval to (µg/m³)", monitorIntervals[3], 1)
                .number("loo_error_universal", "leave-one-out B2 error, kriging", cv.errorNorms(), 4)
                .number("loo_error_mean_density", "leave-one-out B2 error, mean density", baseErr, 4)
                .percent("loo_p_over_15", "leave-one-out P(> 15 µg/m³)", looExceed, 1);
        if (estVar != null) {
            table = table.number("estimation_variance", "estimation variance", estVar, 4);
        }
        table = table.number("extrapolation_share", "extrapolation share", est.extrapolationShares(), 3);
        report.csv("monitors.csv", table);
        report.geoJson("monitors.geojson", points.stream().map(sc.projection()::toLonLat).toList(),
                table.unitValues("code"));
        int[] order = Study1.sortedBy(m, i -> -pExceed[i]);
        report.heading("Monitors with the highest exceedance probability").table(table
                .select(Arrays.copyOf(order, Math.min(10, m))).columns("code", "name", "roadside", "annual_mean",
                        "observed_share_over_15", "density_p_over_15", "density_p_over_15_lo90",
                        "density_p_over_15_hi90", "loo_p_over_15"));
        report.heading("Files").bullets(List.of(
                "`monitors.csv` and `monitors.geojson` — one row / feature per monitor: location, missing hours, "
                        + "valid days, annual mean, observed and density-based share of days over 15 µg/m³, median, "
                        + "the last two with 90 % intervals (`_lo90`, `_hi90`: 1,000 draws from each estimate's "
                        + "coordinate covariance, which carries the sampling noise of its days taken as independent, so "
                        + "too narrow where consecutive days are correlated), estimation variance "
                        + "and leave-one-out errors.", "PNG figures shown above."));
        metrics.put("monitors", (double) m);
        metrics.put("seconds", progress.seconds());
        report.keyNumber(String.format(Locale.ROOT, "Run time: %.1f s.", progress.seconds()));
        report.heading("Timing").paragraph(String.format(Locale.ROOT, "The whole study took %.1f s on this machine "
                + "(%d processors available to the JVM).", progress.seconds(),
                Runtime.getRuntime().availableProcessors())).paragraph("The progress log of this run:")
                .bullets(progress.lines().stream().map(l -> "`" + l.strip() + "`").toList());
        if (!missing.isEmpty()) {
            report.heading("Steps not run").bullets(missing);
        }
        ReportFiles written = report.writeTo(dir);
        return new StudyResult(dir, m, written.files(), Map.copyOf(metrics), List.copyOf(missing));
    }

    /** Intervals in the analyst's units: the 90 % interval of P(> 15) mapped, the SD of the median in µg/m³. */
    static void uncertaintySection(Report report, AirScenario sc, MapFrame frame, PredictiveDistribution pd,
            UncertaintyOptions uOpt, int side, double[] gPLo, double[] gP, double[] gPHi, double[] gMedSd, Grid grid,
            Map<String, Double> metrics, Progress progress) {
        double[] width = new double[gP.length];
        for (int i = 0; i < width.length; i++) {
            width[i] = gPHi[i] - gPLo[i];
        }
        double[] sds = Arrays.stream(gMedSd).filter(v -> !Double.isNaN(v)).sorted().toArray();
        double sdMedian = sds[sds.length / 2];
        metrics.put("medianSdMicrograms", sdMedian);
        metrics.put("exceedanceIntervalWidthMax", max(width));
        ProportionalityCheck pc = pd.checkProportionality(VariogramOptions.withDefaults().withBinCount(8),
                Math.min(2, pd.rank()), 99, 2);
        AnisotropyTest at = AnisotropyTest.of(pd.kriging(), VariogramOptions.withDefaults().withBinCount(12)
                .withDirections(22.5, 0, 45, 90, 135), 99, 3);
        metrics.put("proportionalityP", pc.pValue());
        metrics.put("anisotropyP", at.pValue());
        progress.line(String.format(Locale.ROOT, "90 %% intervals per cell (%d draws): SD of the median %.2f–%.2f µg/m³;"
                + " proportional covariance p = %.2f, anisotropy p = %.2f", uOpt.draws(), sds[0], sds[sds.length - 1],
                pc.pValue(), at.pValue()));
        report.keyNumber(String.format(Locale.ROOT, "Standard deviation of the predicted median daily mean: %.2f µg/m³ "
                + "at the median cell (%.2f–%.2f over the city); the 90 %% interval of P(daily mean > 15 µg/m³) is "
                + "at most %.2f wide.", sdMedian, sds[0], sds[sds.length - 1], max(width)));
        report.heading("Uncertainty in µg/m³ and in days").paragraph(String.format(Locale.ROOT, "The kriging variance "
                + "says how far the predicted density may be from the true one, in B2 units. To state that in the units "
                + "of the data, the coordinates of the density at a location are given a Gaussian predictive law: "
                + "mean the kriged coordinates, covariance the kriging variance times Σ/tr Σ, where Σ is the covariance "
                + "of the coordinates (estimated from the drift residuals). This holds when all coordinates share one "
                + "spatial correlation (the proportional covariance, or intrinsic correlation, model). From %d seeded "
                + "draws of that law per cell (2,000 at the locations of the table below), each quantity is computed on "
                + "every draw and the 5 %% and 95 %% points of the draws give its 90 %% interval. The standard deviation "
                + "of the predicted median daily mean is %.2f µg/m³ at the median cell of the city (%.2f–%.2f µg/m³).",
                uOpt.draws(), sdMedian, sds[0], sds[sds.length - 1]));
        report.paragraph(String.format(Locale.ROOT, "Checks of the model on these data (Monte Carlo tests, 99 simulated "
                + "fields each): the variograms of the two leading principal directions of the coordinates were compared "
                + "in shape with the trace-variogram (statistic %.3f, p = %.2f: %s); the directional trace-variograms of "
                + "the residuals at 0°, 45°, 90° and 135° (±22.5°) differ by a factor of %.2f at short lags "
                + "(anisotropy: p = %.2f; %s).", pc.statistic(), pc.pValue(), pc.rejects(0.05)
                ? "evidence against the proportional covariance model at the 5 % level, so the intervals are "
                + "approximate" : "no evidence against the proportional covariance model", Math.exp(at.statistic()),
                at.pValue(), at.anisotropic(0.05) ? "anisotropic at the 5 % level: the isotropic variogram smooths "
                + "across the direction of greatest continuity, " + at.majorDirection() + "°" : "no evidence of "
                + "anisotropy, so the isotropic variogram is kept"));
        report.figure("map_exceedance_interval.png", Maps.interval(frame, GridValues.of(grid, gPLo),
                GridValues.of(grid, gP), GridValues.of(grid, gPHi), ColourScale.probability("P(daily mean > 15 µg/m³)"),
                "90 % interval of P(daily mean > 15 µg/m³)", new String[] {"lower end (5 %)", "estimate",
                    "upper end (95 %)"}),
                "The 90 % interval of the exceedance probability per cell, on the fixed scale from 0 to 1: the "
                + "interval is narrow where the outer panels agree (near monitors) and wide where they differ (gaps "
                + "between monitors, edges); speckle is the Monte Carlo error of " + uOpt.draws() + " draws per cell.");
        report.figure("map_median_sd.png", gridMap(sc, frame, grid, gMedSd, ColourScale.of(gMedSd,
                "SD of the median daily mean", "µg/m³"), "Uncertainty of the median daily mean"),
                "Standard deviation of the predicted median daily mean, in µg/m³, from the predictive law.");
        // three locations: the city centre, the cell with the highest P(> 15) and the one with the widest interval
        int hi = 0, wide = 0;
        for (int i = 0; i < gP.length; i++) {
            if (!Double.isNaN(gP[i]) && (Double.isNaN(gP[hi]) || gP[i] > gP[hi])) {
                hi = i;
            }
            if (!Double.isNaN(width[i]) && (Double.isNaN(width[wide]) || width[i] > width[wide])) {
                wide = i;
            }
        }
        Point centre = sc.outline().getInteriorPoint();
        double[] xs = {centre.getX(), grid.x(hi % side), grid.x(wide % side)};
        double[] ys = {centre.getY(), grid.y(hi / side), grid.y(wide / side)};
        List<LocationUncertainty> at3 = pd.summarise(xs, ys, null, uOpt.withDraws(2000));
        double[][] c = new double[12][3];
        for (int i = 0; i < 3; i++) {
            DerivedInterval med = at3.get(i).quantiles().get(0);
            DerivedInterval p = at3.get(i).exceedances().get(0);
            DerivedInterval days = p.scaled(365);
            double[] row = {med.estimate(), med.sd(), med.lower(), med.upper(), p.estimate(), p.lower(), p.upper(),
                days.estimate(), days.lower(), days.upper(), xs[i], ys[i]};
            for (int j = 0; j < row.length; j++) {
                c[j][i] = row[j];
            }
        }
        report.table(Table.of(3).text("location", new String[] {"city centre", "highest P(> 15 µg/m³)",
            "widest interval of P"})
                .number("x_km", "x (km)", c[10], 1).number("y_km", "y (km)", c[11], 1)
                .number("median", "median daily mean (µg/m³)", c[0], 1)
                .number("median_sd", "SD of the median (µg/m³)", c[1], 2)
                .number("median_lo90", "median 5 %", c[2], 1).number("median_hi90", "median 95 %", c[3], 1)
                .number("p_over_15", "P(> 15 µg/m³)", c[4], 3)
                .number("p_lo90", "P 5 %", c[5], 3).number("p_hi90", "P 95 %", c[6], 3)
                .number("days_over_15", "expected days > 15 µg/m³ per year", c[7], 0)
                .number("days_lo90", "days 5 %", c[8], 0).number("days_hi90", "days 95 %", c[9], 0),
                "uncertainty_locations.csv");
        report.paragraph("Expected days per year are 365 × P(daily mean > 15 µg/m³) (demo threshold; a share of days, "
                + "not a regulatory count); each interval is the central 90 % interval of the quantity under the "
                + "predictive law (2,000 draws).");
    }

    static String describe(VariogramModel model) {
        return Describe.variogram(model, "km");
    }

    static ChartGrid densityFigure(AirScenario sc, double[][] logDaily, DensitySet dens) {
        int m = sc.size();
        int[] order = Study1.sortedBy(m, i -> mean(logDaily[i]));
        int road = order[3 * m / 4];
        for (int i = 0; i < m; i++) {
            if (sc.roadside()[i] && i != order[m - 1] && i != order[m / 2] && i != order[0]) {
                road = i;
                break;
            }
        }
        int[] pick = {order[0], order[m / 2], order[m - 1], road};
        Axis daily = Axis.loggedData("daily mean", "µg/m³");
        List<Chart> charts = new ArrayList<>();
        for (int i : pick) {
            Observed histogram = Observed.sample("histogram of daily means", logDaily[i], 0.5, 4.5, 40);
            charts.add(Figures.density(sc.codes()[i] + " " + sc.names()[i] + " — " + logDaily[i].length + " days",
                    dens.get(i), histogram, daily).verticalLine("15 µg/m³", Math.log(THRESHOLD)));
        }
        return ChartGrid.of("Densities of the daily mean concentration (log scale)", charts, 2).withCellSize(560, 380);
    }

    /** A grid map of the city with the monitors marked. */
    static MapFigure gridMap(AirScenario sc, MapFrame frame, Grid grid, double[] values, ColourScale scale,
            String title) {
        return Maps.grid(frame, GridValues.of(grid, values), scale, title).withSites(sc.x(), sc.y(), "monitors");
    }

    static double[] exp(double[] v) {
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = Math.exp(v[i]);
        }
        return out;
    }

    static double mean(double[] v) {
        double s = 0;
        for (double d : v) {
            s += d;
        }
        return s / v.length;
    }

    static double min(double[] v) {
        double r = Double.POSITIVE_INFINITY;
        for (double d : v) {
            if (!Double.isNaN(d)) {
                r = Math.min(r, d);
            }
        }
        return r;
    }

    static double max(double[] v) {
        double r = Double.NEGATIVE_INFINITY;
        for (double d : v) {
            if (!Double.isNaN(d)) {
                r = Math.max(r, d);
            }
        }
        return r;
    }

    static int count(boolean[] b) {
        return Study1.count(b);
    }
}
