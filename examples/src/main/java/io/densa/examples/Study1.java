package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.Design;
import io.densa.regression.surveillance.ExcessCounts;
import io.densa.regression.Fpca;
import io.densa.regression.Scores;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionalRegression;
import io.densa.spatial.autocorrelation.AutocorrelationOptions;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import io.densa.spatial.autocorrelation.LocalMoran;
import io.densa.spatial.autocorrelation.MoranI;
import io.densa.spatial.scan.SpatialScan;
import io.densa.spatial.kriging.GridTile;
import io.densa.spatial.uncertainty.EstimateUncertainty;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import io.densa.spatial.uncertainty.UnitUncertainty;
import io.densa.spatial.SpatialWeights;
import io.densa.report.chart.Axis;
import io.densa.report.chart.Chart;
import io.densa.report.chart.ChartGrid;
import io.densa.report.colour.ColourScale;
import io.densa.report.Describe;
import io.densa.report.chart.Figures;
import io.densa.report.Findings;
import io.densa.report.map.GridValues;
import io.densa.report.map.MapFrame;
import io.densa.report.map.Maps;
import io.densa.report.Numbers;
import io.densa.report.chart.Observed;
import io.densa.report.colour.Palette;
import io.densa.report.Report;
import io.densa.report.ReportFiles;
import io.densa.report.Table;
import java.awt.Color;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Polygon;

/**
 * Study 1: age-profile surveillance in the districts of an invented region. See
 * {@link AgeScenario} for the scenario; the pipeline is documented in the report it writes.
 */
final class Study1 {
    /** False discovery rate of the flags. */
    static final double FDR = 0.10;
    /** Level of the global test of spatial clustering. */
    static final double ALPHA = 0.05;
    /** Age ticks: single years 0..99, bin midpoints. */
    static final double[] AGE_MID = new double[AgeScenario.AGES];

    static {
        for (int a = 0; a < AGE_MID.length; a++) {
            AGE_MID[a] = a + 0.5;
        }
    }

    private Study1() {
    }

    /** State shared by the steps of one run. */
    static final class Run {
        final Main.Options options;
        final Progress progress;
        final AgeScenario sc;
        final Region region;
        final int n;
        final Path dir;
        final Report report;
        final MapFrame frame;
        final List<String> missing = new ArrayList<>();
        final Map<String, Double> metrics = new LinkedHashMap<>();
        Table table;
        String clustering;
        BayesSpace space;
        DensitySet[] seasons;
        /** The latest season's estimates with their covariances (for the median's interval). */
        BatchEstimate latestEstimate;
        double[][] estimationVariance;

        Run(Main.Options options, Progress progress, AgeScenario sc) {
            this.options = options;
            this.progress = progress;
            this.sc = sc;
            this.region = sc.region();
            this.n = region.size();
            this.dir = options.out();
            this.report = Report.titled("Densa study 1 — age profiles of emergency visits in an invented region")
                    .note(Main.INVENTED);
            this.table = Table.of(n);
            this.frame = MapFrame.km(shapes(region), region.outline(), caption(region));
        }
    }

    static List<org.locationtech.jts.geom.Geometry> shapes(Region region) {
        return region.units().stream().map(Region.Unit::shape).toList();
    }

    static String caption(Region region) {
        return "Invented data. Drawn in planar km: " + region.projection().describe() + ".";
    }

    static StudyResult run(Main.Options options, Progress progress) {
        int size = options.unitsOr(120, 200, 300);
        int seasons = 8;
        progress.line("generating the invented region (" + size + " districts, " + seasons + " seasons, seed "
                + options.seed() + ")");
        Run run = new Run(options, progress, AgeScenario.generate(options.seed(), size, seasons));
        describeScenario(run);
        estimateDensities(run);
        Baseline baseline = baseline(run);
        Excess excess = excessCounts(run, baseline);
        Flags flags = flag(run, baseline, excess);
        autocorrelation(run, baseline);
        scan(run, excess);
        residualFpca(run, baseline);
        variogramAndSurface(run, baseline);
        writeTables(run, baseline, flags, excess);
        run.metrics.put("seconds", run.progress.seconds());
        run.report.keyNumber(String.format(Locale.ROOT, "Run time: %.1f s.", run.progress.seconds()));
        run.report.heading("Timing").paragraph(String.format(Locale.ROOT,
                "The whole study took %.1f s on this machine (%d processors available to the JVM).",
                run.progress.seconds(), Runtime.getRuntime().availableProcessors())).paragraph("The progress log of this run:")
                .bullets(run.progress.lines().stream().map(l -> "`" + l.strip() + "`").toList());
        if (!run.missing.isEmpty()) {
            run.report.heading("Steps not run").bullets(run.missing);
        }
        ReportFiles written = run.report.writeTo(run.dir);
        return new StudyResult(run.dir, run.n, written.files(), Map.copyOf(run.metrics), List.copyOf(run.missing));
    }

    // ------------------------------------------------------------------ scenario

    static void describeScenario(Run run) {
        AgeScenario sc = run.sc;
        int n = run.n;
        int latest = sc.seasons() - 1;
        double[] visits = new double[n];
        long total = 0;
        int small = 0;
        for (int i = 0; i < n; i++) {
            visits[i] = sc.total(i, latest);
            if (visits[i] < 100) {
                small++;
            }
            for (int s = 0; s < sc.seasons(); s++) {
                total += sc.total(i, s);
            }
        }
        run.progress.line(String.format(Locale.ROOT, "%d districts, %,d visits in all; latest season %.0f to %.0f "
                + "visits per district", n, total, Study2.min(visits), Study2.max(visits)));
        run.report.keyNumber(String.format(Locale.ROOT, "%d invented districts, %d seasons, %,d visits; the latest "
                + "season's districts have %.0f to %.0f visits.", n, sc.seasons(), total, Study2.min(visits),
                Study2.max(visits)));
        run.report.heading("What was run").paragraph("An invented region of " + n + " districts (Voronoi cells of "
                + "random sites clipped to an invented outline; seed " + run.options.seed() + ") with "
                + sc.seasons() + " seasons of emergency-visit counts by single year of age 0–99, "
                + String.format(Locale.ROOT, "%,d", total) + " visits in all. District sizes differ by two orders of "
                + "magnitude: in the latest season the smallest district has " + (int) Study2.min(visits)
                + " visits and " + small + " districts have fewer than 100. Profiles vary smoothly from district to "
                + "district (urbanity, share of older residents, smooth random fields) and drift slowly over the "
                + "seasons. In the latest season a spatially clustered group of " + count(sc.shifted())
                + " districts (a simulated Gaussian random field above its 92 % quantile) moves 30–45 % of its "
                + "visits to a child and young-adult profile (normal, mean " + (int) AgeScenario.SHIFT_MEAN + ", sd "
                + (int) AgeScenario.SHIFT_SD + " years). The generator records "
                + "which districts were shifted, so the report scores its own flags.");
        run.report.paragraph("Coordinates: computations use planar kilometres (" + run.region.projection().describe()
                + "); the GeoJSON is in WGS 84 longitude/latitude as RFC 7946 requires. The invented region is "
                + "placed over open ocean so that it cannot be mistaken for a real place.");
        run.report.figure("map_visits.png", Maps.choropleth(run.frame, visits, ColourScale.log(visits,
                "visits in the latest season", ""), "Visits per district, latest season"),
                "Visits per district in the latest season, on a logarithmic colour scale labelled in visits.");
        int[] latestVisits = new int[n];
        for (int i = 0; i < n; i++) {
            latestVisits[i] = sc.total(i, latest);
        }
        run.table = run.table.text("code", codes(run.region)).text("name", names(run.region))
                .number("lon", "longitude (degrees)", lon(run.region), 4)
                .number("lat", "latitude (degrees)", lat(run.region), 4)
                .number("area_km2", "area (km²)", areas(run.region), 1)
                .number("urbanity", "urbanity", sc.urbanity(), 2)
                .number("older_share", "share aged 65+", sc.olderShare(), 3)
                .integer("visits_latest", "visits", latestVisits);
    }

    // ------------------------------------------------------------------ estimation

    static void estimateDensities(Run run) {
        AgeScenario sc = run.sc;
        run.space = BayesSpace.splines(0, 100, 4, new double[] {2, 6, 12, 20, 30, 42, 55, 68, 80, 90});
        run.seasons = new DensitySet[sc.seasons()];
        run.estimationVariance = new double[sc.seasons()][];
        String[] ids = codes(run.region);
        int notConverged = 0;
        List<String> problems = new ArrayList<>();
        double minEdf = Double.POSITIVE_INFINITY;
        double maxEdf = Double.NEGATIVE_INFINITY;
        int[][] first = new int[run.n][];
        for (int i = 0; i < run.n; i++) {
            first[i] = sc.counts()[i][0];
        }
        double lambda = AgeDensities.commonSmoothing(run.space, first);
        List<String> extrapolated = new ArrayList<>();
        double[] extrapolationLatest = null;
        for (int s = 0; s < sc.seasons(); s++) {
            int[][] counts = new int[run.n][];
            for (int i = 0; i < run.n; i++) {
                counts[i] = sc.counts()[i][s];
            }
            Estimates est = AgeDensities.estimate(run.space, counts, ids, lambda);
            run.seasons[s] = est.densities();
            run.latestEstimate = est.batch();
            run.estimationVariance[s] = est.variances();
            problems.addAll(est.problems());
            notConverged += est.notConverged();
            minEdf = Math.min(minEdf, est.minEdf());
            maxEdf = Math.max(maxEdf, est.maxEdf());
            for (String id : est.extrapolated()) {
                extrapolated.add(id + " (season " + (s + 1) + ")");
            }
            if (s == sc.seasons() - 1) {
                extrapolationLatest = est.extrapolationShares();
            }
        }
        run.metrics.put("notConverged", (double) notConverged);
        run.metrics.put("extrapolatedEstimates", (double) extrapolated.size());
        run.progress.line(String.format(Locale.ROOT, "estimated %d age densities by penalised likelihood (common "
                + "smoothing λ = %.3g; %d fits did not converge)", run.n * sc.seasons(), lambda, notConverged));
        run.table = run.table.number("extrapolation_share_latest", "extrapolation share", extrapolationLatest, 3);
        run.report.heading("Age densities").paragraph("Each district-season's counts by single year of age are "
                + "turned into a density on [0, 100) years in " + Describe.splineSpace(run.space, "interior knots at 2, 6, 12, "
                + "20, 30, 42, 55, 68, 80 and 90 years (denser where profiles bend: infancy, youth)") + " by " + AgeDensities.describe()
                + String.format(Locale.ROOT, " (λ = %.3g)", lambda) + ". Dots are the observed shares by year of age; "
                + "lines the estimated densities.");
        if (Double.isFinite(minEdf)) {
            run.report.paragraph(String.format(Locale.ROOT, "%d of %d fits converged; effective degrees of freedom "
                    + "range from %.1f (small districts: strong smoothing) to %.1f.", run.n * sc.seasons()
                    - notConverged, run.n * sc.seasons(), minEdf, maxEdf));
        }
        run.report.paragraph(Findings.extrapolated(extrapolated, run.n * sc.seasons(), 10));
        if (!problems.isEmpty()) {
            run.report.paragraph("Fits that did not converge (kept, with the estimator's reason):")
                    .bullets(problems.subList(0, Math.min(20, problems.size())));
        }
        densityFigure(run, null);
    }

    /** Chart of counts and estimated densities for four districts of different sizes. */
    static void densityFigure(Run run, DensitySet predicted) {
        AgeScenario sc = run.sc;
        int latest = sc.seasons() - 1;
        int[] order = sortedBy(run.n, i -> sc.total(i, latest));
        int shiftedBig = -1;
        for (int k = order.length - 1; k >= 0; k--) {
            if (sc.shifted()[order[k]]) {
                shiftedBig = order[k];
                break;
            }
        }
        int[] pick = {order[0], order[order.length / 3], order[order.length - 1],
            shiftedBig >= 0 ? shiftedBig : order[order.length / 2]};
        double[] lower = new double[AgeScenario.AGES];
        double[] upper = new double[AgeScenario.AGES];
        for (int a = 0; a < lower.length; a++) {
            lower[a] = a;
            upper[a] = a + 1;
        }
        Axis age = Axis.linear("age", "years");
        List<Chart> charts = new ArrayList<>();
        for (int i : pick) {
            int total = sc.total(i, latest);
            String title = run.region.units().get(i).code() + " " + run.region.units().get(i).name() + " — "
                    + total + " visits" + (sc.shifted()[i] ? " (shifted)" : "");
            Observed observed = total == 0 ? null
                    : Observed.counts("observed share per year of age", lower, upper, sc.counts()[i][latest]);
            charts.add(predicted == null ? Figures.density(title, run.seasons[latest].get(i), observed, age)
                    : Figures.baseline(title, run.seasons[latest].get(i), predicted.get(i), observed, age));
        }
        String name = predicted == null ? "fig_densities.png" : "fig_baseline.png";
        run.report.figure(name, ChartGrid.of(predicted == null ? "Latest season: counts and estimated age densities"
                : "Latest season: estimated density against the baseline prediction", charts, 2)
                .withCellSize(560, 380), predicted == null
                ? "Four districts (smallest, a small one, the largest, the largest shifted one): observed shares "
                        + "by year of age (points) and the estimated density (line)."
                : "The same districts: observed shares (points), the estimated density (solid) and the baseline "
                        + "model's prediction (dashed).");
    }

    // ------------------------------------------------------------------ baseline model

    /** The baseline model and its residuals. */
    record Baseline(int predictorComponents, double trainR2, DensitySet predictedLatest, DensitySet residualLatest,
            DensitySet standardisedCalibration, DensitySet standardisedLatest, double[] normLatest,
            double[] scoreLatest, double varianceA, double varianceB) {
    }

    /**
     * Function-on-function regression with scalar covariates ({@link FunctionalRegression}, FPCA
     * truncation with the number of components chosen by cross-validation): the response is a
     * season's density, the predictors the densities of the two previous seasons, the scalar
     * covariates urbanity and the share of older residents. Fitted on the transitions of the
     * early seasons; the following transitions calibrate; the latest season is scored.
     */
    static Baseline baseline(Run run) {
        AgeScenario sc = run.sc;
        int n = run.n;
        int seasons = sc.seasons();
        int trainTransitions = (seasons - 1) / 2;
        DensitySet predictors = run.seasons[1];
        DensitySet predictors2 = run.seasons[0];
        DensitySet responses = run.seasons[2];
        for (int s = 2; s < trainTransitions + 1; s++) {
            predictors = predictors.concat(run.seasons[s]);
            predictors2 = predictors2.concat(run.seasons[s - 1]);
            responses = responses.concat(run.seasons[s + 1]);
        }
        Design train = covariates(repeat(sc.urbanity(), trainTransitions), repeat(sc.olderShare(), trainTransitions));
        FunctionOnFunctionFit fit = FunctionalRegression.truncation().withComponents(1, 8).withSeed(run.options.seed())
                .fit(List.of(predictors, predictors2), train, responses);
        int m = fit.chosen().predictorComponents();
        double[] trainNorm = fit.residualNorms();
        double[] inverseSize = new double[trainNorm.length];
        for (int s = 0; s < trainTransitions; s++) {
            for (int i = 0; i < n; i++) {
                inverseSize[s * n + i] = run.estimationVariance[s + 1][i] + run.estimationVariance[s + 2][i];
            }
        }
        // E‖r‖² ≈ a (u_previous + u_current) + b: estimation variances plus genuine change
        double[] ab = nonNegativeLine(inverseSize, square(trainNorm));
        int test = seasons - 1;
        Design d = covariates(sc.urbanity(), sc.olderShare());
        DensitySet calStd = null;
        for (int cal = trainTransitions + 2; cal < test; cal++) {
            DensitySet r = standardise(run, fit.residuals(List.of(run.seasons[cal - 1], run.seasons[cal - 2]), d,
                    run.seasons[cal]), cal, ab);
            calStd = calStd == null ? r : calStd.concat(r);
        }
        DensitySet residual = fit.residuals(List.of(run.seasons[test - 1], run.seasons[test - 2]), d, run.seasons[test]);
        DensitySet predicted = fit.predict(List.of(run.seasons[test - 1], run.seasons[test - 2]), d);
        DensitySet testStd = standardise(run, residual, test, ab);
        double[] score = square(testStd.norms());
        run.progress.line(String.format(Locale.ROOT, "baseline model fitted: function-on-function on the two previous "
                + "seasons, %d FPCA components each (chosen by CV) + 2 covariates, functional R² %.3f on %d training rows", m,
                fit.rSquared(), trainNorm.length));
        run.report.heading("Baseline model").paragraph(String.format(Locale.ROOT, "The expected age profile of a "
                + "district in a season is modelled from its profiles in the two previous seasons and two district "
                + "covariates (urbanity and the share of residents aged 65+): a function-on-function regression "
                + "(Densa's `FunctionalRegression`) in which each previous season's density enters through its first "
                + "%d FPCA scores (Yao, Müller and Wang 2005 truncation; the number chosen by 5-fold cross-validation "
                + "from 1–8). Fitted on the %d transitions into seasons 3–%d (%d rows, functional R² %.3f); the "
                + "transitions into seasons %d–%d are held out for calibration; the latest season %d is scored.", m,
                trainTransitions, trainTransitions + 2, trainNorm.length, fit.rSquared(), trainTransitions + 3, test,
                test + 1));
        run.report.paragraph(String.format(Locale.ROOT, "Residual norms grow as districts get smaller (fewer visits "
                + "give noisier densities), so raw norms would flag small districts. With u the B2 estimation variance "
                + "of a density (" + AgeDensities.varianceSource() + "), the squared residual norm was modelled on "
                + "the training rows as a·(u_previous + u_current) + b (a = %.3g, b = %.3g), and "
                + "each residual density r_i was standardised by powering, r_i ⊙ (1/√v_i) with v_i that expectation,"
                + " so that its B2 norm is comparable across district sizes. The anomaly score is the squared norm "
                + "of the standardised residual.", ab[0], ab[1]));
        densityFigure(run, predicted);
        return new Baseline(m, fit.rSquared(), predicted, residual, calStd, testStd, residual.norms(), score, ab[0],
                ab[1]);
    }

    /** r_i ⊙ (1 / √v_i) for every row: v_i = a (u_{i,s−1} + u_{i,s}) + b with u the estimation variances. */
    static DensitySet standardise(Run run, DensitySet residual, int season, double[] ab) {
        double[][] c = residual.coordinates();
        for (int i = 0; i < c.length; i++) {
            double v = ab[0] * (run.estimationVariance[season - 1][i] + run.estimationVariance[season][i]) + ab[1];
            double f = 1 / Math.sqrt(v);
            for (int k = 0; k < c[i].length; k++) {
                c[i][k] *= f;
            }
        }
        return DensitySet.of(residual.space(), c);
    }

    static Design covariates(double[] urban, double[] older) {
        return Design.builder().numeric("urbanity", urban).numeric("older_share", older).build();
    }

    // ------------------------------------------------------------------ flags

    /** Conformal p-values, BH-adjusted p-values, flags and the self-score. */
    record Flags(double[] p, double[] q, boolean[] flagged, String[] excess, String[] deficit, double[] youngObserved,
            double[] youngExpected, int truePositives, int falsePositives, int falseNegatives) {
    }

    static Flags flag(Run run, Baseline b, Excess ex) {
        AgeScenario sc = run.sc;
        int n = run.n;
        AnomalyScoring.Calibrated scorer = AnomalyScoring.withDefaults().withFdr(FDR)
                .withRandomisedTies(run.options.seed()).fit(b.standardisedCalibration(), AGE_MID);
        AnomalyScoring.Report scores = scorer.score(b.standardisedLatest());
        double[] p = new double[n];
        double[] q = new double[n];
        boolean[] flagged = new boolean[n];
        String[] excess = new String[n];
        String[] deficit = new String[n];
        double[] youngObs = new double[n];
        double[] youngExp = new double[n];
        int tp = 0;
        int fp = 0;
        int fn = 0;
        int latest = sc.seasons() - 1;
        for (int i = 0; i < n; i++) {
            AnomalyScoring.UnitScore u = scores.units().get(i);
            p[i] = u.pValue();
            q[i] = u.adjustedPValue();
            flagged[i] = u.flagged();
            youngExp[i] = b.predictedLatest().get(i).cdf(25);
            int young = 0;
            for (int a = 0; a < 25; a++) {
                young += sc.counts()[i][latest][a];
            }
            youngObs[i] = young / (double) sc.total(i, latest);
            excess[i] = flagged[i] ? ages(u.excursions(), AnomalyScoring.Direction.EXCESS) : "";
            deficit[i] = flagged[i] ? ages(u.excursions(), AnomalyScoring.Direction.DEFICIT) : "";
            if (flagged[i] && sc.shifted()[i]) {
                tp++;
            } else if (flagged[i]) {
                fp++;
            } else if (sc.shifted()[i]) {
                fn++;
            }
        }
        double precision = tp + fp == 0 ? 0 : tp / (double) (tp + fp);
        double recall = tp + fn == 0 ? 1 : tp / (double) (tp + fn);
        run.metrics.put("precision", precision);
        run.metrics.put("recall", recall);
        run.metrics.put("flagged", (double) (tp + fp));
        run.progress.line(String.format(Locale.ROOT, "%d districts flagged at FDR %.2f: precision %.2f, recall %.2f "
                + "against the injected truth", tp + fp, FDR, precision, recall));
        run.report.keyNumber(String.format(Locale.ROOT, "%d of %d districts flagged at a false discovery rate of %.2f;"
                + " against the injected truth (%d shifted districts): **precision %.2f, recall %.2f**.", tp + fp, n,
                FDR, tp + fn, precision, recall));

        int n1 = scores.calibrationSize() + 1;
        int beyond = 0;
        for (int i = 0; i < n; i++) {
            if (flagged[i] && p[i] < 1.0 / n1) {
                beyond++;
            }
        }
        run.metrics.put("flagsBeyondCalibration", (double) beyond);
        run.report.heading("Flags").paragraph(String.format(Locale.ROOT, "Smoothed split-conformal p-values (Vovk, "
                + "Gammerman and Shafer 2005) of the standardised residual norms, p_i = (#{calibration norms > s_i} + "
                + "U_i·(1 + #{calibration norms = s_i})) / (n_cal + 1) with U_i uniform on (0, 1) (seeded), with the %d "
                + "district-transitions held out for calibration; flags where the Benjamini–Hochberg (1995) adjusted "
                + "p-value is at most %.2f (Densa's `AnomalyScoring`). Under no change the smoothed p-value is exactly "
                + "uniform, and it never exceeds the ordinary one, (1 + #{calibration norms ≥ s_i}) / (n_cal + 1). "
                + "%d of the %d flagged districts exceed every calibration norm: the ordinary p-value would give them "
                + "all the same 1/%d, and the smoothed one orders them at random, so neither ranks them. The table "
                + "below ranks flagged districts by their displaced visits instead.", scores.calibrationSize(), FDR,
                beyond, tp + fp, n1));
        run.report.paragraph(String.format(Locale.ROOT, "**Self-score against the injected truth:** %d flagged, %d "
                + "of them truly shifted; %d shifted %s missed. **Precision %.2f, recall %.2f.**", tp + fp, tp, fn,
                fn == 1 ? "district" : "districts", precision, recall) + sizeComparison(run, flagged));
        int[] cat = new int[n];
        for (int i = 0; i < n; i++) {
            cat[i] = flagged[i] && sc.shifted()[i] ? 1 : flagged[i] ? 2 : sc.shifted()[i] ? 3 : 0;
        }
        String fdr = Numbers.fixed(FDR, 2);
        run.report.figure("map_flags.png", Maps.categories(run.frame, cat, new String[] {"not flagged",
            "flagged and shifted", "flagged, not shifted", "shifted but not flagged"}, new Color[] {Palette.QUIET,
                Palette.BRICK, Palette.INK, Palette.OCHRE}, "Flags against the injected truth",
                "Flagged districts (false discovery rate " + fdr + ") against the injected truth"),
                "Flags against the injected truth, with the number of districts in each class.");
        run.report.figure("map_score.png", Maps.choropleth(run.frame, b.scoreLatest(), ColourScale.log(
                b.scoreLatest(), "anomaly score", "squared B2 norm of the standardised residual"),
                "Anomaly score of the latest season").withFlagged(flagged, "flagged at a false discovery rate of "
                + fdr), "Anomaly score: squared B2 norm of the standardised residual density (logarithmic colour "
                + "scale); flagged districts outlined.");

        int[] flaggedRows = Arrays.stream(ex.result().rankByDisplaced()).filter(i -> flagged[i]).toArray();
        String[] displacedText = new String[n];
        double[] displacedNoise = new double[n];
        String[][] bandText = new String[2][n];
        for (int i = 0; i < n; i++) {
            ExcessCounts.UnitExcess u = ex.result().units().get(i);
            displacedText[i] = withInterval(u.displaced().value(), u.displaced().lower(), u.displaced().upper(), false);
            displacedNoise[i] = u.displaced().noiseMean();
            for (int t = 0; t < 2; t++) {
                ExcessCounts.BandExcess e = u.bands().get(t);
                bandText[t][i] = withInterval(e.excess(), e.lower(), e.upper(), true);
            }
        }
        Table shown = Table.of(n).text("code", codes(run.region)).text("name", names(run.region))
                .integer("visits", "visits", latestTotals(run)).probability("p", "smoothed conformal p", p)
                .probability("q", "BH q", q)
                .text("displaced", "visits displaced (90 % interval)", displacedText)
                .number("displaced_noise", "displaced without change (mean)", displacedNoise, 0)
                .text("excess_0_14", "excess ages 0–14", bandText[0])
                .text("excess_15_24", "excess ages 15–24", bandText[1])
                .text("excess_ages", "excess at ages", excess)
                .flag("truth_shifted", "shifted (truth)", sc.shifted()).select(flaggedRows);
        if (flaggedRows.length > 0) {
            ExcessCounts.UnitExcess top = ex.result().units().get(flaggedRows[0]);
            run.report.keyNumber(String.format(Locale.ROOT, "Largest departure among the flags: %s %s, %s visits "
                    + "displaced between age bands (90 %% interval %s to %s; a season without change would displace "
                    + "about %s) of %d.", codes(run.region)[flaggedRows[0]],
                    names(run.region)[flaggedRows[0]], Numbers.fixed(top.displaced().value(), 0),
                    Numbers.fixed(top.displaced().lower(), 0), Numbers.fixed(top.displaced().upper(), 0),
                    Numbers.fixed(top.displaced().noiseMean(), 0), run.sc.total(flaggedRows[0], latest)));
        }
        run.report.subheading("Flagged districts").paragraph("Where each flagged district departs, in visits: the "
                + "visits displaced between the age bands " + ex.bandNames() + " against the baseline (see "
                + "\"Excess visits\" above) with what a season without change would displace against the same baseline "
                + "(a sum of positive parts is never 0), the excess (observed − expected) at ages 0–14 and 15–24, each with its 90 % "
                + "bootstrap interval, and the age ranges where the standardised residual clr leaves the calibration "
                + "set's central 95 % pointwise band (more visits at those ages than the baseline expects). Ranked by "
                + "displaced visits, largest first.");
        run.report.table(shown);
        return new Flags(p, q, flagged, excess, deficit, youngObs, youngExp, tp, fp, fn);
    }

    // ------------------------------------------------------------------ excess visits

    /** Age bands of the excess counts (years). */
    static final double[] BANDS = {0, 15, 25, 45, 65, 100};

    /** Excess counts of every district against the baseline. */
    record Excess(ExcessCounts.Result result, long[] youngObserved, double[] youngExpected, double[] youngExcess) {
        String bandNames() {
            StringBuilder sb = new StringBuilder();
            for (int t = 0; t + 1 < BANDS.length; t++) {
                sb.append(t == 0 ? "" : t + 2 == BANDS.length ? " and " : ", ");
                sb.append(t + 2 == BANDS.length ? (int) BANDS[t] + "+" : (int) BANDS[t] + "–" + ((int) BANDS[t + 1] - 1));
            }
            return sb.toString();
        }
    }

    /**
     * Visits in excess of the baseline by age band, with a parametric bootstrap interval that
     * carries the counting noise (Poisson band counts) and the baseline's prediction uncertainty
     * (Gaussian coordinates with covariance (a·u_previous + b)·S/tr S: the part of the residual
     * variance model not due to the current season's counting noise, shaped like the calibration
     * residuals' second moments S), and a p-value
     * of the displaced visits against a season without change (counting noise and the baseline's
     * error).
     */
    static Excess excessCounts(Run run, Baseline b) {
        AgeScenario sc = run.sc;
        int n = run.n;
        int latest = sc.seasons() - 1;
        long[][] counts = new long[n][AgeScenario.AGES];
        for (int i = 0; i < n; i++) {
            for (int a = 0; a < AgeScenario.AGES; a++) {
                counts[i][a] = sc.counts()[i][latest][a];
            }
        }
        double[] edges = new double[AgeScenario.AGES + 1];
        for (int a = 0; a <= AgeScenario.AGES; a++) {
            edges[a] = a;
        }
        double[][] cal = b.standardisedCalibration().coordinates();
        int k = run.space.dimension();
        double[][] shape = new double[k][k];
        double trace = 0;
        for (double[] row : cal) {
            for (int r = 0; r < k; r++) {
                for (int c = 0; c < k; c++) {
                    shape[r][c] += row[r] * row[c] / cal.length;
                }
            }
        }
        for (int r = 0; r < k; r++) {
            trace += shape[r][r];
        }
        for (double[] row : shape) {
            for (int c = 0; c < k; c++) {
                row[c] /= trace;
            }
        }
        double[] scales = new double[n];
        for (int i = 0; i < n; i++) {
            scales[i] = b.varianceA() * run.estimationVariance[latest - 1][i] + b.varianceB();
        }
        long t0 = System.nanoTime();
        ExcessCounts.Result r = ExcessCounts.withDefaults().withLevel(0.90).withDraws(999, run.options.seed())
                .estimate(b.predictedLatest(), counts, edges, BANDS, ExcessCounts.BaselineError.scaled(shape, scales));
        long[] youngObs = new long[n];
        double[] youngExp = new double[n];
        double[] youngExcess = new double[n];
        double displacedAll = 0;
        for (int i = 0; i < n; i++) {
            ExcessCounts.UnitExcess u = r.units().get(i);
            for (int t = 0; t < 2; t++) {
                youngObs[i] += (long) u.bands().get(t).observed();
                youngExp[i] += u.bands().get(t).expected();
            }
            youngExcess[i] = youngObs[i] - youngExp[i];
            displacedAll += u.displaced().value();
        }
        Excess ex = new Excess(r, youngObs, youngExp, youngExcess);
        double secs = (System.nanoTime() - t0) / 1e9;
        run.progress.line(String.format(Locale.ROOT, "excess visits by age band for %d districts (%d bootstrap draws "
                + "each, %.1f s)", n, r.draws(), secs));
        run.report.heading("Excess visits").paragraph("For each district and age band (" + ex.bandNames() + " years) "
                + "the expected visits are the district's visits in the latest season times the baseline prediction's "
                + "share of that band (Densa's `ExcessCounts`); the excess is observed − expected, and the visits "
                + "displaced are the sum of the positive excesses over the bands (the visits that would have to change "
                + "band for the district to match its baseline). Each comes with a 90 % interval from a parametric "
                + "bootstrap (Efron and Tibshirani 1993) of 999 seeded draws that carries both the counting noise "
                + "(band counts redrawn as Poisson with the observed means) and the baseline's prediction uncertainty "
                + String.format(Locale.ROOT, "(its coordinates redrawn from a normal law whose size, a·u_previous + b "
                + "with a = %.3g and b = %.3g from the residual model above, leaves out the current season's counting "
                + "noise, and whose shape is that of the calibration residuals). ", b.varianceA(), b.varianceB())
                + "Counting noise alone makes displaced visits positive, so each district also gets what a season "
                + "without change would displace against the same baseline — band counts drawn multinomially with "
                + "the district's total from a baseline redrawn from that normal law, a Monte Carlo mean — and a Monte "
                + "Carlo p-value against it (`displaced_noise`, `displaced_p` in `districts.csv`; `displaced_q` adjusts "
                + "it for testing every district, Benjamini–Hochberg): read a district's interval against that, not "
                + "against zero.");
        run.report.paragraph(String.format(Locale.ROOT, "Across all %d districts %,.0f visits are displaced between "
                + "bands in the latest season; at ages 0–24 the districts have %,d visits against %,.0f expected.",
                n, displacedAll, Arrays.stream(youngObs).sum(), Arrays.stream(youngExp).sum()));
        String[] labels = codes(run.region);
        String[] unitNames = names(run.region);
        for (int i = 0; i < n; i++) {
            labels[i] += " " + unitNames[i];
        }
        run.report.paragraph(io.densa.report.Findings.displaced(r, labels, "districts", "visits", FDR, 12));
        return ex;
    }

    /** "+212 (170 to 251)" or "212 (170 to 251)". */
    static String withInterval(double v, double lo, double hi, boolean signed) {
        return signed ? String.format(Locale.ROOT, "%+.0f (%+.0f to %+.0f)", v, lo, hi)
                : String.format(Locale.ROOT, "%.0f (%.0f to %.0f)", v, lo, hi);
    }

    /** Kulldorff's scan statistic on the visits at ages 0–24 against the baseline's expectation. */
    static void scan(Run run, Excess ex) {
        Locations loc = Locations.planar(run.region.xs(), run.region.ys());
        SpatialScan.Result r = SpatialScan.withDefaults().withMaxShare(0.5).withReplicates(999, run.options.seed())
                .test(loc, ex.youngObserved(), ex.youngExpected());
        SpatialScan.Cluster c = r.mostLikely();
        boolean[] member = new boolean[run.n];
        int shiftedInside = 0;
        for (int u : c.members()) {
            member[u] = true;
            if (run.sc.shifted()[u]) {
                shiftedInside++;
            }
        }
        String[] label = new String[run.n];
        for (int i = 0; i < run.n; i++) {
            label[i] = run.region.units().get(i).code() + " " + run.region.units().get(i).name();
        }
        String statement = Findings.scanCluster("Visits at ages 0–24 against the baseline", r, label, 6, ALPHA);
        run.metrics.put("scanP", r.pValue());
        run.metrics.put("scanClusterSize", (double) c.members().length);
        run.metrics.put("scanClusterShifted", (double) shiftedInside);
        run.progress.line(String.format(Locale.ROOT, "spatial scan of visits at ages 0–24: most likely cluster of %d "
                + "districts (%d shifted), excess %.0f, p = %.3f", c.members().length, shiftedInside, c.excess(),
                r.pValue()));
        run.report.keyNumber(statement);
        run.report.heading("Cluster of excess young visits").paragraph(String.format(Locale.ROOT, "Kulldorff's (1997) "
                + "spatial scan statistic under the Poisson model (Densa's `SpatialScan`): observed visits at ages 0–24 "
                + "per district against the baseline's expected visits at those ages. Candidate zones are circles "
                + "around each district's site, grown by nearest districts up to half the expected visits; each zone's "
                + "log-likelihood ratio compares a raised rate inside with one rate everywhere (expected counts "
                + "rescaled to the observed total, %,d visits; %,d zones), and the most likely cluster is tested by "
                + "%d seeded Monte Carlo replicates that spread the visits over the districts in proportion to their "
                + "expectation.", r.totalObserved(), r.zones(), r.replicates()))
                .paragraph("**" + statement + "**");
        if (c.members().length > 0) {
            run.report.paragraph(String.format(Locale.ROOT, "Against the injected truth: %d of the zone's %d districts "
                    + "were shifted (of %d shifted in all).", shiftedInside, c.members().length, count(run.sc.shifted())));
        }
        double[] abs = Arrays.stream(ex.youngExcess()).map(Math::abs).sorted().toArray();
        double max = Math.max(1, abs[(int) Math.floor(0.98 * (abs.length - 1))]);
        ColourScale scale = ColourScale.diverging(max, "excess visits at ages 0–24", "visits");
        run.report.figure("map_excess.png", Maps.choropleth(run.frame, ex.youngExcess(), scale,
                "Excess visits at ages 0–24 and the most likely cluster").withFlagged(member, "most likely cluster "
                + "(scan p = " + Numbers.significant(r.pValue(), 2) + ")").withLegendNote("Colours saturate at ±"
                + Numbers.significant(scale.upper(), 3) + " visits (the 98th percentile of |excess| is "
                + Numbers.significant(max, 3) + ")."),
                "Observed − expected visits at ages 0–24 per district (diverging colours: brick above the baseline, "
                + "blue below); the districts of the scan's most likely cluster are outlined.");
    }

    /** Median visits of the detected and of the missed shifted districts, as a sentence. */
    static String sizeComparison(Run run, boolean[] flagged) {
        int latest = run.sc.seasons() - 1;
        List<Integer> hit = new ArrayList<>();
        List<Integer> miss = new ArrayList<>();
        for (int i = 0; i < run.n; i++) {
            if (run.sc.shifted()[i]) {
                (flagged[i] ? hit : miss).add(run.sc.total(i, latest));
            }
        }
        if (hit.isEmpty() || miss.isEmpty()) {
            return "";
        }
        return String.format(Locale.ROOT, " The detected shifted districts have a median of %d visits in the latest "
                + "season, the missed ones %d: with few visits a shift of a third of them is within sampling noise.",
                median(hit), median(miss));
    }

    static int median(List<Integer> v) {
        List<Integer> s = new ArrayList<>(v);
        s.sort(null);
        return s.get(s.size() / 2);
    }

    /** The age ranges of the excursions in one direction, in ASCII, e.g. {@code 8-27; 40-44}. */
    static String ages(List<AnomalyScoring.Excursion> excursions, AnomalyScoring.Direction direction) {
        StringBuilder sb = new StringBuilder();
        for (AnomalyScoring.Excursion e : excursions) {
            if (e.direction() != direction) {
                continue;
            }
            if (sb.length() > 0) {
                sb.append("; ");
            }
            sb.append((int) Math.floor(e.from())).append('-').append((int) Math.floor(e.to()));
        }
        return sb.toString();
    }

    static int[] latestTotals(Run run) {
        int[] out = new int[run.n];
        for (int i = 0; i < run.n; i++) {
            out[i] = run.sc.total(i, run.sc.seasons() - 1);
        }
        return out;
    }

    // ------------------------------------------------------------------ spatial structure

    static void autocorrelation(Run run, Baseline b) {
        List<org.locationtech.jts.geom.Geometry> shapes = shapes(run.region);
        SpatialWeights w = SpatialWeights.contiguity(shapes, SpatialWeights.Contiguity.QUEEN, 1e-6)
                .rowStandardised();
        double[] logScore = new double[run.n];
        for (int i = 0; i < run.n; i++) {
            logScore[i] = Math.log(b.scoreLatest()[i]);
        }
        AutocorrelationOptions opt = AutocorrelationOptions.withDefaults().withPermutations(999, run.options.seed());
        MoranI.Result global = MoranI.test(w, logScore, opt);
        double pPerm = global.permutation().map(x -> x.pGreater()).orElse(Double.NaN);
        LocalMoran.Result local = LocalMoran.test(w, logScore, opt);
        int hh = 0;
        for (LocalMoran.Unit u : local.units()) {
            if (u.adjustedPValue() <= FDR && u.quadrant() == LocalMoran.Quadrant.HIGH_HIGH) {
                hh++;
            }
        }
        run.metrics.put("moranI", global.statistic());
        run.metrics.put("moranPermutationP", pPerm);
        run.clustering = Findings.clustering("Departures from the baseline", "log anomaly score", global, ALPHA);
        run.report.keyNumber(String.format(Locale.ROOT, "Moran's I of the log anomaly scores %.3f (permutation p = "
                + "%s); %d districts raised among raised neighbours (local Moran, false discovery rate %.2f).",
                global.statistic(), Numbers.significant(pPerm, 2), hh, FDR));
        run.progress.line(String.format(Locale.ROOT, "Moran's I of the log anomaly scores %.3f (permutation p %.4f);"
                + " %d districts raised among raised neighbours", global.statistic(), pPerm, hh));
        run.report.heading("Spatial structure of the departures").paragraph(String.format(Locale.ROOT,
                "Queen contiguity of the district polygons (row-standardised, %d links). Moran's I of the log anomaly "
                + "score: %.3f (expectation %.3f under no autocorrelation; z = %.2f under randomisation; one-sided "
                + "permutation p = %s with 999 permutations).", w.linkCount(), global.statistic(),
                global.randomisation().expectation(), global.randomisation().z(), Numbers.significant(pPerm, 2)))
                .paragraph("**" + run.clustering + "**")
                .paragraph(String.format(Locale.ROOT, "Local Moran's I with conditional permutations, "
                + "Benjamini–Hochberg adjusted at a false discovery rate of %.2f: %d districts are raised among raised "
                + "neighbours. On the map the fill is the local statistic (brick where a district resembles its "
                + "neighbours, blue where it differs from them); significant districts carry a heavy outline and a "
                + "line pattern for their kind, and the legend counts each kind.", FDR, hh));
        run.report.figure("map_local_moran.png", Maps.clusters(run.frame, local, FDR, "log anomaly score",
                "Local pattern of the anomaly score"), "Local Moran's I of the log anomaly score: fill, outline and "
                + "pattern as described above.");
        String[] pattern = new String[run.n];
        double[] localP = new double[run.n];
        java.util.Arrays.fill(pattern, "left out");
        java.util.Arrays.fill(localP, Double.NaN);
        for (LocalMoran.Unit u : local.units()) {
            pattern[u.index()] = u.adjustedPValue() > FDR ? "none" : switch (u.quadrant()) {
                case HIGH_HIGH -> "raised among raised";
                case LOW_LOW -> "lowered among lowered";
                case HIGH_LOW -> "raised among lowered";
                case LOW_HIGH -> "lowered among raised";
                default -> "none";
            };
            localP[u.index()] = u.adjustedPValue();
        }
        run.table = run.table.text("local_pattern", "local pattern", pattern)
                .probability("local_pattern_q", "local pattern q", localP);
    }

    static void residualFpca(Run run, Baseline b) {
        Fpca pca = Fpca.fit(b.standardisedLatest());
        Scores scores = pca.scores(b.standardisedLatest(), 2);
        double[] ev = pca.explainedVariance();
        run.progress.line(String.format(Locale.ROOT, "FPCA of the residuals: first two components explain %.1f %% and "
                + "%.1f %%", 100 * ev[0], 100 * ev[1]));
        run.report.heading("Principal modes of the departures").paragraph("Simplicial FPCA of the latest season's "
                + "standardised residual densities (observed ⊖ baseline, powered by 1/√v_i as above, so that small "
                + "districts' sampling noise does not dominate the components). The modes are drawn on the clr scale "
                + "(log-ratio against the geometric mean over ages, in standardised units): a positive value at an age"
                + " means more visits at that age than the baseline expects.");
        run.report.figure("fig_fpca_modes.png", Figures.fpcaModes("Modes of variation of the residual densities",
                pca, 2, 2, Axis.linear("age", "years"), Axis.linear("clr of standardised residual", "log-ratio")),
                "Residual mean (grey), ⊕ two standard deviations along each component (solid) and ⊖ two (dashed).");
        double[] pc1 = scores.column(0);
        double[] pc2 = scores.column(1);
        for (int j = 0; j < 2; j++) {
            double[] v = j == 0 ? pc1 : pc2;
            double[] abs = new double[v.length];
            for (int i = 0; i < v.length; i++) {
                abs[i] = Math.abs(v[i]);
            }
            Arrays.sort(abs);
            double max = abs[(int) Math.floor(0.98 * (abs.length - 1))];
            ColourScale scale = ColourScale.diverging(max, "score on residual component " + (j + 1), "");
            run.report.figure("map_pc" + (j + 1) + ".png", Maps.choropleth(run.frame, v, scale,
                    "Residual FPCA score, component " + (j + 1)).withLegendNote("Colours saturate at ±"
                    + Numbers.significant(scale.upper(), 3) + " (the 98th percentile of |score| is "
                    + Numbers.significant(max, 3) + ")."), "District scores on residual component " + (j + 1) + ".");
        }
        run.table = run.table.number("residual_pc1", "residual PC1 score", pc1, 3)
                .number("residual_pc2", "residual PC2 score", pc2, 3);
    }

    // ------------------------------------------------------------------ variogram and kriged surface

    static void variogramAndSurface(Run run, Baseline b) {
        int latest = run.sc.seasons() - 1;
        Locations loc = Locations.planar(run.region.xs(), run.region.ys());
        Envelope env = run.region.outline().getEnvelopeInternal();
        double maxLag = 0.35 * Math.hypot(env.getWidth(), env.getHeight());
        VariogramOptions vo = VariogramOptions.withDefaults().withBinCount(15).withMaxLag(maxLag);
        VariogramFitOptions fo = VariogramFitOptions.withDefaults().withFamily(VariogramModel.Family.EXPONENTIAL);
        EmpiricalVariogram evResid = EmpiricalVariogram.of(loc, b.standardisedLatest(), vo);
        VariogramFit fitResid = VariogramFitting.fit(evResid, fo);
        EmpiricalVariogram evDens = EmpiricalVariogram.of(loc, run.seasons[latest], vo);
        VariogramFit fitDens = VariogramFitting.fit(evDens, fo);
        run.progress.line("trace-variograms fitted: residuals " + Describe.variogram(fitResid.model(), "km")
                + "; densities " + Describe.variogram(fitDens.model(), "km"));
        run.report.heading("Trace-variograms").paragraph("Empirical trace-variogram γ̂(h) = (1/(2|N(h)|)) Σ "
                + "‖X_i ⊖ X_j‖²_B (Giraldo, Delicado and Mateu 2011) in 15 bins up to " + Numbers.fixed(maxLag, 1)
                + " km between district sites, with a nugget + exponential model (practical range) fitted by "
                + "Cressie's (1985) weighted least squares. Standardised residuals: "
                + Describe.variogram(fitResid.model(), "km") + "; latest-season densities: "
                + Describe.variogram(fitDens.model(), "km") + ". " + residualVariogramReading(fitResid.model(),
                        evResid.meanLags()[0]) + " " + run.clustering);
        List<String> fitNotes = new ArrayList<>(Findings.variogramFit("Standardised residuals", fitResid, "km"));
        fitNotes.addAll(Findings.variogramFit("Latest-season densities", fitDens, "km"));
        run.report.bullets(fitNotes);
        run.metrics.put("variogramFitWarnings", (double) (fitResid.warnings().size() + fitDens.warnings().size()));
        run.report.figure("fig_variogram.png", ChartGrid.of("Trace-variograms: empirical (points) and fitted nugget + "
                + "exponential (line); pairs per bin below", List.of(
                    Figures.variogram("Standardised residual densities", "km", List.of(new Figures.VariogramLayer(
                            "residuals", evResid, fitResid.model()))),
                    Figures.variogram("Latest-season densities", "km", List.of(new Figures.VariogramLayer(
                            "densities", evDens, fitDens.model())))), 2).withCellSize(560, 440),
                "Trace-variograms of the standardised residual and of the latest-season densities, with the number "
                        + "of district pairs in each distance bin.");

        // kriged median age: ordinary kriging of the latest season's densities, estimation variances as
        // measurement error, median of each predicted density
        Kriging ok = Kriging.ordinary(loc, run.seasons[latest], fitDens.model(), KrigingOptions.withDefaults()
                .withErrorVariances(run.estimationVariance[latest]).withNeighbourhood(Neighbourhood.nearest(32)));
        int nx = run.n >= 200 ? 240 : 140;
        int ny = (int) Math.round(nx * env.getHeight() / env.getWidth());
        Grid grid = Grid.over(env.getMinX(), env.getMinY(), env.getMaxX(), env.getMaxY(), nx, ny)
                .withMask((Polygon) run.region.outline());
        double[] median = new double[nx * ny];
        double[] medianSd = new double[nx * ny];
        Arrays.fill(median, Double.NaN);
        Arrays.fill(medianSd, Double.NaN);
        int[] cells = {0};
        long t0 = System.nanoTime();
        // the predictive law of each cell's density (proportional covariance) and the SD of its median
        // from 100 draws per cell, in the same pass as the kriging
        PredictiveDistribution pd = PredictiveDistribution.of(ok);
        pd.summariseGrid(grid, GridOptions.withDefaults().withVariance(true).withQuantiles(0.5),
                UncertaintyOptions.withSeed(run.options.seed()).withDraws(100).withQuantiles(0.5), ut -> {
                    GridTile tile = ut.tile();
                    for (int q = 0; q < tile.size(); q++) {
                        int idx = tile.rows()[q] * nx + tile.columns()[q];
                        median[idx] = tile.quantiles()[0][q];
                        medianSd[idx] = ut.quantiles().get(0).sds()[q];
                    }
                    cells[0] += tile.size();
                });
        double secs = (System.nanoTime() - t0) / 1e9;
        run.progress.line(String.format(Locale.ROOT, "kriged the latest-season densities onto %,d cells (%.1f s)",
                cells[0], secs));
        run.report.heading("Smooth surface of the median age").paragraph(String.format(Locale.ROOT, "Ordinary kriging "
                + "of the latest season's densities (32 nearest districts, the fitted variogram above, each density's "
                + "estimation variance as measurement error) onto a %d × %d grid over the region; the median of each "
                + "predicted density gives a smooth surface of the median age of visits (%,d cells inside the outline, "
                + "%.1f s). District borders are drawn faintly.", nx, ny, cells[0], secs));
        run.report.figure("map_median_age.png", Maps.grid(run.frame, GridValues.of(grid, median),
                ColourScale.of(median, "median age of visits", "years"),
                "Median age of visits, latest season (kriged densities)").withUnitBorders(),
                "Median age of visits from the kriged densities.");
        double[] sds = Arrays.stream(medianSd).filter(v -> !Double.isNaN(v)).sorted().toArray();
        run.metrics.put("medianAgeSdYears", sds[sds.length / 2]);
        run.report.paragraph(String.format(Locale.ROOT, "How far a district's median age may sit from that surface: "
                + "the standard deviation of the median age of the density predicted at each cell, under its "
                + "predictive law (the kriging variance, which includes the district-to-district variation that the "
                + "variogram's nugget describes, spread over the coordinates' covariance shape; 100 seeded draws per "
                + "cell), is %.1f years at the median cell (%.1f–%.1f over the region). It is smallest where the "
                + "predicted age profile has one dominant peak (the youngest and the oldest areas) and largest in the "
                + "zones between them, where the profile has a young and an old peak and a small change moves the "
                + "median from one to the other. The fine speckle is the Monte Carlo noise of 100 draws (about 7 %% "
                + "of each value). The surface shows broad patterns; a single district can differ from it by much "
                + "more than one colour step.", sds[sds.length / 2], sds[0], sds[sds.length - 1]));
        run.report.figure("map_median_age_sd.png", Maps.grid(run.frame, GridValues.of(grid, medianSd),
                ColourScale.of(medianSd, "SD of the median age", "years"),
                "Uncertainty of the median age, latest season").withUnitBorders(),
                "Standard deviation of the kriged median age, in years, from the predictive law.");
    }

    /**
     * What the residual variogram's fitted model says, in words that follow its numbers; whether the
     * departures cluster in space is said by the clustering test, not here.
     */
    static String residualVariogramReading(VariogramModel model, double firstLag) {
        double nugget = model.nugget();
        double sill = model.sill();
        double range = 0;
        for (VariogramModel.Structure s : model.structures()) {
            if (s.family() != VariogramModel.Family.NUGGET) {
                range = Math.max(range, s.range());
            }
        }
        if (range < firstLag || sill - nugget < 0.1 * sill) {
            return "The residual variogram is essentially flat beyond the first lag (" + Numbers.fixed(firstLag, 1)
                    + " km): most of the variance of the departures is district-level noise rather than a smooth "
                    + "difference between neighbouring residual densities.";
        }
        return String.format(Locale.ROOT, "The residuals' fitted model keeps a spatially correlated part (%.0f %% of "
                + "its sill, practical range %.1f km).", 100 * (sill - nugget) / sill, range);
    }

    // ------------------------------------------------------------------ output

    /**
     * 90 % intervals of each district's median age from its estimate's covariance
     * ({@link EstimateUncertainty}, 1,000 draws): {lower, upper}.
     */
    static double[][] medianIntervals(BatchEstimate latest, long seed) {
        List<UnitUncertainty> u = EstimateUncertainty.summarise(latest, UncertaintyOptions.withSeed(seed)
                .withQuantiles(0.5).withDraws(1000));
        double[][] out = new double[2][u.size()];
        for (int i = 0; i < u.size(); i++) {
            out[0][i] = u.get(i).quantiles().get(0).lower();
            out[1][i] = u.get(i).quantiles().get(0).upper();
        }
        return out;
    }

    static void writeTables(Run run, Baseline b, Flags f, Excess ex) {
        AgeScenario sc = run.sc;
        int n = run.n;
        double[] median = run.seasons[sc.seasons() - 1].quantiles(0.5);
        double[][] medianInterval = medianIntervals(run.latestEstimate, run.options.seed());
        double[] expectedMedian = b.predictedLatest().quantiles(0.5);
        run.table = run.table.number("median_age", "median age (years)", median, 1)
                .number("median_age_lo90", "median age, 90 % interval from", medianInterval[0], 1)
                .number("median_age_hi90", "median age, 90 % interval to", medianInterval[1], 1)
                .number("expected_median_age", "expected median age (years)", expectedMedian, 1)
                .number("residual_norm", "residual norm", b.normLatest(), 3)
                .number("anomaly_score", "anomaly score", b.scoreLatest(), 3)
                .probability("p_conformal", "conformal p", f.p()).probability("q_bh", "BH q", f.q())
                .flag("flagged", "flagged", f.flagged()).text("excess_ages", "excess at ages", f.excess())
                .text("deficit_ages", "deficit at ages", f.deficit())
                .percent("under25_observed", "under 25 observed", f.youngObserved(), 1)
                .percent("under25_expected", "under 25 expected", f.youngExpected(), 1)
                .flag("truth_shifted", "shifted (truth)", sc.shifted())
                .number("truth_shift_fraction", "shifted share of visits (truth)", sc.shiftFraction(), 3);
        int nb = BANDS.length - 1;
        double[][] bandValues = new double[3 * nb + 5][n];
        for (int i = 0; i < n; i++) {
            ExcessCounts.UnitExcess u = ex.result().units().get(i);
            for (int t = 0; t < nb; t++) {
                ExcessCounts.BandExcess e = u.bands().get(t);
                bandValues[3 * t][i] = e.excess();
                bandValues[3 * t + 1][i] = e.lower();
                bandValues[3 * t + 2][i] = e.upper();
            }
            bandValues[3 * nb][i] = u.displaced().value();
            bandValues[3 * nb + 1][i] = u.displaced().lower();
            bandValues[3 * nb + 2][i] = u.displaced().upper();
            bandValues[3 * nb + 3][i] = u.displaced().noiseMean();
            bandValues[3 * nb + 4][i] = u.displaced().pValue();
        }
        for (int t = 0; t < nb; t++) {
            String band = (int) BANDS[t] + "_" + ((int) BANDS[t + 1] - 1);
            String label = "excess ages " + (int) BANDS[t] + "–" + ((int) BANDS[t + 1] - 1);
            run.table = run.table.number("excess_" + band, label, bandValues[3 * t], 1)
                    .number("excess_" + band + "_lo90", label + ", 90 % interval from", bandValues[3 * t + 1], 1)
                    .number("excess_" + band + "_hi90", label + ", 90 % interval to", bandValues[3 * t + 2], 1);
        }
        run.table = run.table.number("displaced", "visits displaced", bandValues[3 * nb], 1)
                .number("displaced_lo90", "visits displaced, 90 % interval from", bandValues[3 * nb + 1], 1)
                .number("displaced_hi90", "visits displaced, 90 % interval to", bandValues[3 * nb + 2], 1)
                .number("displaced_noise", "visits displaced without change (mean)", bandValues[3 * nb + 3], 1)
                .probability("displaced_p", "p, visits displaced against no change", bandValues[3 * nb + 4])
                .probability("displaced_q", "BH-adjusted p, visits displaced", ex.result().displacedAdjustedPValues());
        run.report.csv("districts.csv", run.table);
        run.report.geoJson("districts.geojson", shapes(run.region).stream().map(run.region.projection()::toLonLat)
                .toList(), run.table.unitValues("code"));
        String[] code = new String[n * sc.seasons()];
        int[] season = new int[code.length];
        int[][] byAge = new int[AgeScenario.AGES][code.length];
        for (int i = 0; i < n; i++) {
            for (int s = 0; s < sc.seasons(); s++) {
                int r = i * sc.seasons() + s;
                code[r] = run.region.units().get(i).code();
                season[r] = s + 1;
                for (int a = 0; a < AgeScenario.AGES; a++) {
                    byAge[a][r] = sc.counts()[i][s][a];
                }
            }
        }
        Table counts = Table.of(code.length).text("code", code).integer("season", "season", season);
        for (int a = 0; a < AgeScenario.AGES; a++) {
            counts = counts.integer("age_" + a, "age " + a, byAge[a]);
        }
        run.report.csv("counts.csv", counts);
        run.report.heading("Files").bullets(List.of(
                "`districts.csv` and `districts.geojson` — one row / feature per district: covariates, visits, "
                        + "median age with its 90 % interval (`median_age_lo90`, `median_age_hi90`: 1,000 draws "
                        + "from the estimate's coordinate covariance, which carries the counting noise), expected "
                        + "median age, residual norm, anomaly score, conformal p-value, BH q-value, flag, the age "
                        + "ranges of excess and of deficit (columns `excess_ages` and `deficit_ages`), local pattern, "
                        + "residual FPCA scores, the injected truth, and the excess visits per age band and the "
                        + "visits displaced with their 90 % intervals (`excess_0_14`, `excess_0_14_lo90`, "
                        + "`excess_0_14_hi90`, …, `displaced`, `displaced_lo90`, `displaced_hi90`).",
                "`counts.csv` — the invented input: visits by district, season and single year of age.",
                "PNG figures shown above."));
    }

    // ------------------------------------------------------------------ helpers

    static int count(boolean[] b) {
        int c = 0;
        for (boolean v : b) {
            if (v) {
                c++;
            }
        }
        return c;
    }

    static double[] toDouble(int[] v) {
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = v[i];
        }
        return out;
    }

    static double[] repeat(double[] v, int times) {
        double[] out = new double[v.length * times];
        for (int t = 0; t < times; t++) {
            System.arraycopy(v, 0, out, t * v.length, v.length);
        }
        return out;
    }

    static double[] square(double[] v) {
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = v[i] * v[i];
        }
        return out;
    }

    /** Least-squares line y ≈ a x + b with a, b ≥ 0 (a clamped fit, then b refitted). */
    static double[] nonNegativeLine(double[] x, double[] y) {
        int n = x.length;
        double mx = 0;
        double my = 0;
        for (int i = 0; i < n; i++) {
            mx += x[i] / n;
            my += y[i] / n;
        }
        double sxy = 0;
        double sxx = 0;
        for (int i = 0; i < n; i++) {
            sxy += (x[i] - mx) * (y[i] - my);
            sxx += (x[i] - mx) * (x[i] - mx);
        }
        double a = Math.max(0, sxy / sxx);
        double b = my - a * mx;
        if (b <= 0) {
            b = 1e-3 * my;
        }
        return new double[] {a, b};
    }

    static int[] sortedBy(int n, java.util.function.IntToDoubleFunction key) {
        return java.util.stream.IntStream.range(0, n).boxed()
                .sorted(java.util.Comparator.comparingDouble(key::applyAsDouble)).mapToInt(Integer::intValue)
                .toArray();
    }

    static String[] codes(Region r) {
        return r.units().stream().map(Region.Unit::code).toArray(String[]::new);
    }

    static String[] names(Region r) {
        return r.units().stream().map(Region.Unit::name).toArray(String[]::new);
    }

    static double[] areas(Region r) {
        return r.units().stream().mapToDouble(Region.Unit::areaKm2).toArray();
    }

    static double[] lon(Region r) {
        return r.units().stream().mapToDouble(u -> r.projection().lon(u.x())).toArray();
    }

    static double[] lat(Region r) {
        return r.units().stream().mapToDouble(u -> r.projection().lat(u.y())).toArray();
    }
}
