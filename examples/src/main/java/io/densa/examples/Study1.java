package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.AnomalyScoring;
import io.densa.regression.Design;
import io.densa.regression.Fpca;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionalRegression;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.autocorrelation.AutocorrelationOptions;
import io.densa.spatial.autocorrelation.LocalMoran;
import io.densa.spatial.autocorrelation.MoranI;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.awt.Color;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.ejml.data.DMatrixRMaj;
import org.jfree.chart.JFreeChart;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Polygon;

/**
 * Study 1: age-profile surveillance in the districts of an invented region. See
 * {@link AgeScenario} for the scenario; the pipeline is documented in the report it writes.
 */
final class Study1 {
    /** False discovery rate of the flags. */
    static final double FDR = 0.10;
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
        final List<String> files = new ArrayList<>();
        final List<String> missing = new ArrayList<>();
        final Map<String, Double> metrics = new LinkedHashMap<>();
        final UnitTable table;
        BayesSpace space;
        DensitySet[] seasons;
        double[][] estimationVariance;

        Run(Main.Options options, Progress progress, AgeScenario sc) {
            this.options = options;
            this.progress = progress;
            this.sc = sc;
            this.region = sc.region();
            this.n = region.size();
            this.dir = options.out();
            this.report = new Report(dir, "Densa study 1 — age profiles of emergency visits in an invented region");
            this.table = new UnitTable(n);
        }

        String file(String name) {
            files.add(name);
            return name;
        }

        Path path(String name) {
            return dir.resolve(file(name));
        }
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
        Flags flags = flag(run, baseline);
        autocorrelation(run, baseline);
        residualFpca(run, baseline);
        variogramAndSurface(run, baseline);
        writeTables(run, baseline, flags);
        run.metrics.put("seconds", run.progress.seconds());
        run.report.keyNumber(String.format(Locale.ROOT, "Run time: %.1f s.", run.progress.seconds()));
        run.report.heading("Timing").paragraph(String.format(Locale.ROOT,
                "The whole study took %.1f s on this machine (%d processors available to the JVM).",
                run.progress.seconds(), Runtime.getRuntime().availableProcessors())).paragraph("The progress log of this run:")
                .bullets(run.progress.lines().stream().map(l -> "`" + l.strip() + "`").toList());
        if (!run.missing.isEmpty()) {
            run.report.heading("Steps not run").bullets(run.missing);
        }
        run.report.caution();
        run.report.write();
        run.files.add("summary.md");
        run.files.add("summary.html");
        return new StudyResult(run.dir, run.n, List.copyOf(run.files), Map.copyOf(run.metrics),
                List.copyOf(run.missing));
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
        double[] logVisits = new double[n];
        for (int i = 0; i < n; i++) {
            logVisits[i] = Math.log10(Math.max(1, visits[i]));
        }
        Maps.choropleth(run.region, logVisits, ColourScale.of(logVisits, "log10 visits in the latest season"), 1,
                "Visits per district, latest season (log10)", run.path("map_visits.png"));
        run.report.figure("map_visits.png", "Visits per district in the latest season (log10 scale).");
        run.table.text("code", codes(run.region)).text("name", names(run.region))
                .number("lon", lon(run.region)).number("lat", lat(run.region))
                .number("area_km2", areas(run.region)).number("urbanity", sc.urbanity())
                .number("older_share", sc.olderShare());
        int[] latestVisits = new int[n];
        for (int i = 0; i < n; i++) {
            latestVisits[i] = sc.total(i, latest);
        }
        run.table.integer("visits_latest", latestVisits);
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
        for (int s = 0; s < sc.seasons(); s++) {
            int[][] counts = new int[run.n][];
            for (int i = 0; i < run.n; i++) {
                counts[i] = sc.counts()[i][s];
            }
            Estimates est = AgeDensities.estimate(run.space, counts, ids, lambda);
            run.seasons[s] = est.densities();
            run.estimationVariance[s] = est.variances();
            problems.addAll(est.problems());
            notConverged += est.notConverged();
            minEdf = Math.min(minEdf, est.minEdf());
            maxEdf = Math.max(maxEdf, est.maxEdf());
            for (String id : est.extrapolated()) {
                extrapolated.add(id + " (season " + (s + 1) + ")");
            }
            if (s == sc.seasons() - 1) {
                run.table.number("extrapolation_share_latest", est.extrapolationShares());
            }
        }
        run.metrics.put("notConverged", (double) notConverged);
        run.metrics.put("extrapolatedEstimates", (double) extrapolated.size());
        run.progress.line(String.format(Locale.ROOT, "estimated %d age densities by penalised likelihood (common "
                + "smoothing λ = %.3g; %d fits did not converge)", run.n * sc.seasons(), lambda, notConverged));
        run.report.heading("Age densities").paragraph("Each district-season's counts by single year of age are "
                + "turned into a density on [0, 100) years in " + ModelText.space(run.space, "interior knots at 2, 6, 12, "
                + "20, 30, 42, 55, 68, 80 and 90 years (denser where profiles bend: infancy, youth)") + " by " + AgeDensities.describe()
                + String.format(Locale.ROOT, " (λ = %.3g)", lambda) + ". Dots are the observed shares by year of age; "
                + "lines the estimated densities.");
        if (Double.isFinite(minEdf)) {
            run.report.paragraph(String.format(Locale.ROOT, "%d of %d fits converged; effective degrees of freedom "
                    + "range from %.1f (small districts: strong smoothing) to %.1f.", run.n * sc.seasons()
                    - notConverged, run.n * sc.seasons(), minEdf, maxEdf));
        }
        run.report.paragraph(Estimates.extrapolationSentence(extrapolated, run.n * sc.seasons(), 10));
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
        List<JFreeChart> charts = new ArrayList<>();
        for (int i : pick) {
            int total = sc.total(i, latest);
            double[] share = new double[AgeScenario.AGES];
            for (int a = 0; a < share.length; a++) {
                share[a] = sc.counts()[i][latest][a] / (double) Math.max(1, total);
            }
            List<Charts.Series> series = new ArrayList<>();
            series.add(new Charts.Series("observed share", AGE_MID, share, Charts.Style.POINTS, 7));
            series.add(new Charts.Series("estimated density", AGE_MID, run.seasons[latest].get(i).pdf(AGE_MID),
                    Charts.Style.LINE, 0));
            if (predicted != null) {
                series.add(new Charts.Series("baseline prediction", AGE_MID, predicted.get(i).pdf(AGE_MID),
                        Charts.Style.DASHED, 1));
            }
            String title = run.region.units().get(i).code() + " " + run.region.units().get(i).name() + " — "
                    + total + " visits" + (sc.shifted()[i] ? " (shifted)" : "");
            charts.add(Charts.chart(title, "age (years)", "density", series));
        }
        String name = predicted == null ? "fig_densities.png" : "fig_baseline.png";
        Charts.panel(predicted == null ? "Latest season: counts and estimated age densities"
                : "Latest season: estimated density against the baseline prediction", charts, 2, 560, 360,
                run.path(name));
        run.report.figure(name, predicted == null
                ? "Four districts (smallest, a small one, the largest, the largest shifted one): observed shares "
                        + "by year of age and the estimated density."
                : "The same districts with the baseline model's prediction (dashed).");
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
                .fitDensityResponse(List.of(predictors, predictors2), train, responses);
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
    record Flags(double[] p, double[] q, boolean[] flagged, String[] band, double[] youngObserved,
            double[] youngExpected, int truePositives, int falsePositives, int falseNegatives) {
    }

    static Flags flag(Run run, Baseline b) {
        AgeScenario sc = run.sc;
        int n = run.n;
        AnomalyScoring.Calibrated scorer = AnomalyScoring.withDefaults().withFdr(FDR)
                .calibrate(b.standardisedCalibration(), AGE_MID);
        AnomalyScoring.Report scores = scorer.score(b.standardisedLatest());
        double[] p = new double[n];
        double[] q = new double[n];
        boolean[] flagged = new boolean[n];
        String[] band = new String[n];
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
            band[i] = flagged[i] ? describe(u.excursions()) : "";
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

        run.report.heading("Flags").paragraph(String.format(Locale.ROOT, "Split-conformal p-values (Vovk, Gammerman "
                + "and Shafer 2005) of the standardised residual norms, p_i = (1 + #{calibration norms ≥ s_i}) / "
                + "(n_cal + 1), with the %d district-transitions held out for calibration; flags where "
                + "the Benjamini–Hochberg (1995) adjusted p-value is at most %.2f (Densa's `AnomalyScoring`).",
                scores.calibrationSize(), FDR));
        run.report.paragraph(String.format(Locale.ROOT, "**Self-score against the injected truth:** %d flagged, %d "
                + "of them truly shifted; %d shifted districts missed. **Precision %.2f, recall %.2f.**", tp + fp, tp, fn,
                precision, recall) + sizeComparison(run, flagged));
        int[] cat = new int[n];
        for (int i = 0; i < n; i++) {
            cat[i] = flagged[i] && sc.shifted()[i] ? 1 : flagged[i] ? 2 : sc.shifted()[i] ? 3 : 0;
        }
        Maps.categories(run.region, cat, new String[] {"not flagged", "flagged, shifted", "flagged, not shifted",
            "shifted, missed"}, new Color[] {Maps.NO_FLAG, Maps.FLAG, Maps.FALSE_ALARM, Maps.TRUTH_ONLY},
                "Flags vs truth", "Flagged districts (FDR " + Tables.fmt(FDR, 2) + ") against the injected truth",
                run.path("map_flags.png"));
        run.report.figure("map_flags.png", "Flags against the injected truth.");
        double[] logScore = new double[n];
        for (int i = 0; i < n; i++) {
            logScore[i] = Math.log10(b.scoreLatest()[i]);
        }
        Maps.choropleth(run.region, logScore, ColourScale.of(logScore, "log10 anomaly score"), 1,
                "Anomaly score of the latest season (log10)", run.path("map_score.png"));
        run.report.figure("map_score.png", "Anomaly score: squared norm of the standardised residual density, "
                + "log10.");

        List<String[]> rows = new ArrayList<>();
        int[] order = sortedBy(n, i -> p[i]);
        for (int i : order) {
            if (!flagged[i]) {
                continue;
            }
            Region.Unit u = run.region.units().get(i);
            rows.add(new String[] {u.code(), u.name(), String.valueOf(sc.total(i, latest)), Tables.fmt(p[i], 4),
                Tables.fmt(q[i], 4), band[i], Tables.fmt(100 * youngObs[i], 1) + " %",
                Tables.fmt(100 * youngExp[i], 1) + " %", sc.shifted()[i] ? "yes" : "no"});
        }
        run.report.subheading("Flagged districts").paragraph("Where each flagged district departs: the age ranges "
                + "where its standardised residual clr leaves the calibration set's central 95 % pointwise band "
                + "(excess: more visits at those ages than the baseline expects; deficit: fewer), and the share of "
                + "visits under 25 observed against the baseline's expectation.");
        run.report.table(new String[] {"code", "name", "visits", "p", "BH q", "departs at ages", "under 25 observed",
            "under 25 expected", "shifted (truth)"}, rows);
        return new Flags(p, q, flagged, band, youngObs, youngExp, tp, fp, fn);
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

    /** Excursions as text, e.g. {@code excess 8–27; deficit 62–88}. */
    static String describe(List<AnomalyScoring.Excursion> excursions) {
        StringBuilder sb = new StringBuilder();
        for (AnomalyScoring.Excursion e : excursions) {
            if (sb.length() > 0) {
                sb.append("; ");
            }
            sb.append(e.direction() == AnomalyScoring.Direction.EXCESS ? "excess " : "deficit ")
                    .append((int) Math.floor(e.from())).append('–').append((int) Math.floor(e.to()));
        }
        return sb.length() == 0 ? "within band" : sb.toString();
    }

    // ------------------------------------------------------------------ spatial structure

    static void autocorrelation(Run run, Baseline b) {
        List<org.locationtech.jts.geom.Geometry> shapes = Maps.shapes(run.region);
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
        int[] cat = new int[run.n];
        int hh = 0;
        for (LocalMoran.Unit u : local.units()) {
            if (u.adjustedPValue() <= FDR) {
                cat[u.index()] = switch (u.quadrant()) {
                    case HIGH_HIGH -> 1;
                    case LOW_LOW -> 2;
                    case HIGH_LOW, LOW_HIGH -> 3;
                    default -> 0;
                };
                if (u.quadrant() == LocalMoran.Quadrant.HIGH_HIGH) {
                    hh++;
                }
            }
        }
        run.metrics.put("moranI", global.statistic());
        run.report.keyNumber(String.format(Locale.ROOT, "Moran's I of the log anomaly scores %.3f (permutation p = "
                + "%.4f); %d districts in high-high local clusters.", global.statistic(), pPerm, hh));
        run.progress.line(String.format(Locale.ROOT, "Moran's I of the log anomaly scores %.3f (permutation p %.4f);"
                + " %d high-high local clusters", global.statistic(), pPerm, hh));
        run.report.heading("Spatial structure of the departures").paragraph(String.format(Locale.ROOT,
                "Queen contiguity of the district polygons (row-standardised, %d links). Moran's I of the log anomaly "
                + "score: %.3f (expectation %.3f under no autocorrelation; z = %.2f under randomisation; one-sided "
                + "permutation p = %.4f with 999 permutations). Local Moran's I with conditional permutations, "
                + "Benjamini–Hochberg adjusted at %.2f: %d districts are high-high cores.", w.linkCount(),
                global.statistic(), global.randomisation().expectation(), global.randomisation().z(), pPerm, FDR, hh));
        Maps.categories(run.region, cat, new String[] {"not significant", "high-high", "low-low", "high-low / low-high"},
                new Color[] {Maps.NO_FLAG, new Color(0xd7301f), new Color(0x2b8cbe), new Color(0xbcbddc)},
                "Local Moran (BH " + Tables.fmt(FDR, 2) + ")", "Local clusters of the anomaly score",
                run.path("map_local_moran.png"));
        run.report.figure("map_local_moran.png", "Local Moran's I clusters of the log anomaly score.");
        String[] quadrant = new String[run.n];
        double[] localP = new double[run.n];
        java.util.Arrays.fill(quadrant, "excluded");
        java.util.Arrays.fill(localP, Double.NaN);
        for (LocalMoran.Unit u : local.units()) {
            quadrant[u.index()] = u.adjustedPValue() <= FDR ? u.quadrant().name().toLowerCase(Locale.ROOT) : "none";
            localP[u.index()] = u.adjustedPValue();
        }
        run.table.text("local_moran_cluster", quadrant).number("local_moran_q", localP);
    }

    static void residualFpca(Run run, Baseline b) {
        Fpca pca = Fpca.fit(b.standardisedLatest());
        DMatrixRMaj scores = pca.scores(b.standardisedLatest(), 2);
        double[] ev = pca.explainedVariance();
        run.progress.line(String.format(Locale.ROOT, "FPCA of the residuals: first two components explain %.1f %% and "
                + "%.1f %%", 100 * ev[0], 100 * ev[1]));
        List<JFreeChart> charts = new ArrayList<>();
        for (int j = 0; j < 2; j++) {
            List<Charts.Series> s = new ArrayList<>();
            s.add(new Charts.Series("mean", AGE_MID, pca.mean().clr(AGE_MID), Charts.Style.LINE, 7));
            s.add(new Charts.Series("mean ⊕ 2 sd", AGE_MID, pca.modeOfVariation(j, 2).clr(AGE_MID),
                    Charts.Style.LINE, 1));
            s.add(new Charts.Series("mean ⊖ 2 sd", AGE_MID, pca.modeOfVariation(j, -2).clr(AGE_MID),
                    Charts.Style.DASHED, 0));
            charts.add(Charts.chart(String.format(Locale.ROOT, "Component %d (%.1f %% of variance)", j + 1,
                    100 * ev[j]), "age (years)", "clr of standardised residual", s));
        }
        Charts.panel("Modes of variation of the residual densities", charts, 2, 560, 380,
                run.path("fig_fpca_modes.png"));
        run.report.heading("Principal modes of the departures").paragraph("Simplicial FPCA of the latest season's "
                + "standardised residual densities (observed ⊖ baseline, powered by 1/√v_i as above, so that small "
                + "districts' sampling noise does not dominate the components). The modes are drawn on the clr scale "
                + "(log-ratio against the geometric mean over ages, in standardised units): a positive value at an age"
                + " means more visits at that age than the baseline expects.");
        run.report.figure("fig_fpca_modes.png", "Residual mean ⊕/⊖ two standard deviations along each component.");
        double[] pc1 = column(scores, 0);
        double[] pc2 = column(scores, 1);
        for (int j = 0; j < 2; j++) {
            double[] v = j == 0 ? pc1 : pc2;
            double[] abs = new double[v.length];
            for (int i = 0; i < v.length; i++) {
                abs[i] = Math.abs(v[i]);
            }
            Arrays.sort(abs);
            double max = abs[(int) Math.floor(0.98 * (abs.length - 1))];
            String name = "map_pc" + (j + 1) + ".png";
            Maps.choropleth(run.region, v, ColourScale.diverging(max, "score on residual component " + (j + 1)
                    + " (colours saturate at ±" + Tables.fmt(max, 1) + ", the 98th percentile)"), 2,
                    "Residual FPCA score, component " + (j + 1), run.path(name));
            run.report.figure(name, "District scores on residual component " + (j + 1) + ".");
        }
        run.table.number("residual_pc1", pc1).number("residual_pc2", pc2);
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
        List<JFreeChart> charts = List.of(
                variogramChart("Standardised residual densities", evResid, fitResid.model(), maxLag),
                variogramChart("Latest-season densities", evDens, fitDens.model(), maxLag));
        Charts.panel("Trace-variograms (points: empirical; line: fitted nugget + exponential)", charts, 2, 560, 400,
                run.path("fig_variogram.png"));
        run.progress.line("trace-variograms fitted: residuals " + ModelText.variogram(fitResid.model()) + "; densities "
                + ModelText.variogram(fitDens.model()));
        run.report.heading("Trace-variograms").paragraph("Empirical trace-variogram γ̂(h) = (1/(2|N(h)|)) Σ "
                + "‖X_i ⊖ X_j‖²_B (Giraldo, Delicado and Mateu 2011) in 15 bins up to " + Tables.fmt(maxLag, 1)
                + " km between district sites, with a nugget + exponential model (practical range) fitted by "
                + "Cressie's (1985) weighted least squares. Standardised residuals: " + ModelText.variogram(fitResid.model())
                + "; latest-season densities: " + ModelText.variogram(fitDens.model()) + ". " + residualVariogramReading(
                        fitResid.model(), evResid.meanLags()[0]));
        run.report.figure("fig_variogram.png", "Trace-variograms of the residual and of the latest-season densities.");

        // kriged median age: ordinary kriging of the latest season's densities, estimation variances as
        // measurement error, median of each predicted density
        Kriging ok = Kriging.ordinary(loc, run.seasons[latest], fitDens.model(), KrigingOptions.withDefaults()
                .withErrorVariances(run.estimationVariance[latest]).withNeighbourhood(Neighbourhood.nearest(32)));
        int nx = run.n >= 200 ? 240 : 140;
        int ny = (int) Math.round(nx * env.getHeight() / env.getWidth());
        Grid grid = Grid.over(env.getMinX(), env.getMinY(), env.getMaxX(), env.getMaxY(), nx, ny)
                .withMask((Polygon) run.region.outline());
        double[] median = new double[nx * ny];
        Arrays.fill(median, Double.NaN);
        int[] cells = {0};
        long t0 = System.nanoTime();
        ok.predictGrid(grid, GridOptions.withDefaults().withVariance(false).withQuantiles(0.5), tile -> {
            for (int q = 0; q < tile.size(); q++) {
                median[tile.rows()[q] * nx + tile.columns()[q]] = tile.quantiles()[0][q];
            }
            cells[0] += tile.size();
        });
        double secs = (System.nanoTime() - t0) / 1e9;
        run.progress.line(String.format(Locale.ROOT, "kriged the latest-season densities onto %,d cells (%.1f s)",
                cells[0], secs));
        ColourScale scale = ColourScale.of(median, "median age of visits (years)");
        Color[] dots = new Color[run.n];
        Arrays.fill(dots, Color.WHITE);
        new MapPainter(env, 760, "Median age of visits, latest season (kriged densities)", Maps.caption(run.region))
                .raster(env, nx, ny, median, scale, run.region.outline())
                .stroke(Maps.shapes(run.region), new Color(255, 255, 255, 90), 0.5f)
                .stroke(List.of(run.region.outline()), Color.DARK_GRAY, 1.5f).colourBar(scale, 1).scaleBar()
                .save(run.path("map_median_age.png"));
        run.report.heading("Smooth surface of the median age").paragraph(String.format(Locale.ROOT, "Ordinary kriging "
                + "of the latest season's densities (32 nearest districts, the fitted variogram above, each density's "
                + "estimation variance as measurement error) onto a %d × %d grid over the region; the median of each "
                + "predicted density gives a smooth surface of the median age of visits (%,d cells inside the outline, "
                + "%.1f s). District borders are drawn faintly.", nx, ny, cells[0], secs));
        run.report.figure("map_median_age.png", "Median age of visits from the kriged densities.");
    }

    /** What the residual variogram says, in words that follow the fitted numbers. */
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
            return "The residual variogram is essentially flat beyond the first lag (" + Tables.fmt(firstLag, 1)
                    + " km): most of the departure variance is district-level noise, and the spatial clustering of "
                    + "the injected shift shows in the autocorrelation of the anomaly scores (above) rather than in "
                    + "the average squared difference between neighbouring residual densities.";
        }
        return String.format(Locale.ROOT, "The residuals keep a spatially correlated part (%.0f %% of their sill, "
                + "practical range %.1f km): departures from the baseline cluster in space, as the injected shift "
                + "does.", 100 * (sill - nugget) / sill, range);
    }

    static JFreeChart variogramChart(String title, EmpiricalVariogram ev, VariogramModel model, double maxLag) {
        double[] h = new double[120];
        double[] g = new double[h.length];
        for (int i = 0; i < h.length; i++) {
            h[i] = maxLag * (i + 1) / h.length; // from just above 0: the nugget is a jump at h = 0
            g[i] = model.gamma(h[i]);
        }
        return Charts.chart(title, "distance h (km)", "γ(h), squared B2 norm", List.of(
                new Charts.Series("empirical", ev.meanLags(), ev.semivariances(), Charts.Style.POINTS, 0),
                new Charts.Series("fitted", h, g, Charts.Style.LINE, 1)));
    }

    // ------------------------------------------------------------------ output

    static void writeTables(Run run, Baseline b, Flags f) {
        AgeScenario sc = run.sc;
        int n = run.n;
        double[] median = run.seasons[sc.seasons() - 1].quantiles(0.5);
        double[] expectedMedian = b.predictedLatest().quantiles(0.5);
        run.table.number("median_age", median).number("expected_median_age", expectedMedian)
                .number("residual_norm", b.normLatest()).number("anomaly_score", b.scoreLatest())
                .number("p_conformal", f.p()).number("q_bh", f.q()).flag("flagged", f.flagged())
                .text("excess_ages", f.band()).number("under25_observed", f.youngObserved())
                .number("under25_expected", f.youngExpected()).flag("truth_shifted", sc.shifted())
                .number("truth_shift_fraction", sc.shiftFraction());
        run.table.writeCsv(run.path("districts.csv"));
        run.table.writeGeoJson(run.path("districts.geojson"), Maps.shapes(run.region), run.region.projection());
        List<Object[]> rows = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            for (int s = 0; s < sc.seasons(); s++) {
                int[] c = sc.counts()[i][s];
                Object[] row = new Object[2 + AgeScenario.AGES];
                row[0] = run.region.units().get(i).code();
                row[1] = s + 1;
                for (int a = 0; a < AgeScenario.AGES; a++) {
                    row[2 + a] = c[a];
                }
                rows.add(row);
            }
        }
        String[] header = new String[2 + AgeScenario.AGES];
        header[0] = "code";
        header[1] = "season";
        for (int a = 0; a < AgeScenario.AGES; a++) {
            header[2 + a] = "age_" + a;
        }
        Tables.writeCsv(run.path("counts.csv"), header, rows);
        run.report.heading("Files").bullets(List.of(
                "`districts.csv` and `districts.geojson` — one row / feature per district: covariates, visits, "
                        + "median age, residual norm, anomaly score, conformal p-value, BH q-value, flag, excess age "
                        + "band, local Moran cluster, residual FPCA scores and the injected truth.",
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

    static double[] column(DMatrixRMaj m, int j) {
        double[] out = new double[m.numRows];
        for (int i = 0; i < out.length; i++) {
            out[i] = m.get(i, j);
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
