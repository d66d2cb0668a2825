package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.PenalizedLikelihoodEstimator.EmptyEnds;
import io.densa.io.Bins;
import io.densa.io.tables.BulkObservations;
import io.densa.io.tables.CountTable;
import io.densa.io.tables.CountTableReader;
import io.densa.io.tables.OutsidePolicy;
import io.densa.io.tables.TableSource;
import io.densa.io.model.ModelBundle;
import io.densa.io.model.ModelFile;
import io.densa.io.model.ModelLimits;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.Design;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionalRegression;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The backend path: a baseline is fitted once on past seasons of the invented age-profile scenario
 * (study 1's function-on-function regression and anomaly scoring, smaller), saved as one model
 * file, and loaded by a scoring process that reads a new season's counts from a CSV file
 * ({@link CountTableReader}) or binned by the embedded SQL engine from raw events
 * ({@link BulkObservations}; needs the optional {@code org.duckdb:duckdb_jdbc} on the class path)
 * and writes its flags. Loaded models score bit for bit as the fitted ones.
 *
 * <pre>
 * java -cp ... io.densa.examples.BackendExample                      # everything in a new temporary folder
 * java -cp ... io.densa.examples.BackendExample fit DIR [SEED] [N]   # baseline.densa.json, counts.csv, events.csv
 * java -cp ... io.densa.examples.BackendExample score DIR            # scores-csv.csv and scores-sql.csv in DIR
 * </pre>
 */
public final class BackendExample {
    /** Seasons in the scenario; the last one is the new period. */
    static final int SEASONS = 6;
    static final String BUNDLE = "baseline.densa.json";
    static final String COUNTS = "counts.csv";
    static final String EVENTS = "events.csv";

    private BackendExample() {
    }

    /** What the fitting process produces: the models to save and the new period's counts. */
    record Baseline(ModelBundle models, String[] ids, int[][] newCounts) {
    }

    /**
     * Fits the baseline on the past seasons: densities by the penalised-likelihood estimator with a
     * common λ, a function-on-function regression of each season on the previous one and two
     * district covariates (training transitions into seasons 2 and 3), and an anomaly calibration
     * on the transitions into seasons 4 and 5.
     */
    static Baseline fit(long seed, int districts) {
        AgeScenario sc = AgeScenario.generate(seed, districts, SEASONS);
        int n = sc.region().size();
        String[] ids = sc.region().units().stream().map(Region.Unit::code).toArray(String[]::new);
        BayesSpace space = BayesSpace.splines(0, AgeScenario.AGES, 4, 8);
        int[][][] bySeason = new int[SEASONS][n][];
        for (int i = 0; i < n; i++) {
            for (int s = 0; s < SEASONS; s++) {
                bySeason[s][i] = sc.counts()[i][s];
            }
        }
        double lambda = AgeDensities.commonSmoothing(space, bySeason[0]);
        PenalizedLikelihoodEstimator estimator = PenalizedLikelihoodEstimator.withDefaults(space).withSmoothing(lambda)
                .withEmptyEnds(EmptyEnds.COUNTED); // event counts: every bin as recorded, the same every period
        DensitySet[] seasons = new DensitySet[SEASONS - 1];
        for (int s = 0; s < SEASONS - 1; s++) {
            seasons[s] = estimator.fitAll(AgeDensities.EDGES, bySeason[s], ids).densities();
        }
        Design one = Design.builder().numeric("urbanity", sc.urbanity()).numeric("older_share", sc.olderShare())
                .build();
        Design two = Design.builder().numeric("urbanity", twice(sc.urbanity()))
                .numeric("older_share", twice(sc.olderShare())).build();
        FunctionOnFunctionFit fit = FunctionalRegression.truncation().withComponents(1, 5).withSeed(seed)
                .fit(List.of(seasons[0].concat(seasons[1])), two, seasons[1].concat(seasons[2]));
        double[][] totals = new double[SEASONS][n];
        for (int s = 0; s < SEASONS; s++) {
            for (int i = 0; i < n; i++) {
                totals[s][i] = sc.total(i, s);
            }
        }
        DensitySet calibration = standardise(fit.residuals(List.of(seasons[2]), one, seasons[3]), totals[2], totals[3])
                .concat(standardise(fit.residuals(List.of(seasons[3]), one, seasons[4]), totals[3], totals[4]));
        AnomalyScoring.Calibrated calibrated = AnomalyScoring.withDefaults().withFdr(0.2)
                .fit(calibration, grid());
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("estimator", estimator);
        m.put("fit", fit);
        m.put("calibration", calibrated);
        m.put("previous", seasons[SEASONS - 2]);
        m.put("covariates", one);
        m.put("previousTotals", Design.builder().withoutIntercept().numeric("events", totals[SEASONS - 2]).build());
        return new Baseline(ModelBundle.of(m), ids, bySeason[SEASONS - 1]);
    }

    private static double[] twice(double[] v) {
        double[] out = new double[2 * v.length];
        System.arraycopy(v, 0, out, 0, v.length);
        System.arraycopy(v, 0, out, v.length, v.length);
        return out;
    }

    static double[] grid() {
        double[] g = new double[AgeScenario.AGES];
        for (int a = 0; a < g.length; a++) {
            g[a] = a + 0.5;
        }
        return g;
    }

    /**
     * Scores a new period with the models: counts in the order of the previous season's ids, fitted
     * by the saved estimator, residuals against the baseline's prediction, conformal scores.
     */
    static AnomalyScoring.Report score(ModelBundle models, String[] ids, double[][] counts) {
        PenalizedLikelihoodEstimator estimator = models.get("estimator", PenalizedLikelihoodEstimator.class);
        DensitySet previous = models.get("previous", DensitySet.class);
        if (!previous.ids().equals(List.of(ids))) {
            throw new IllegalArgumentException("the new period's units differ from the baseline's");
        }
        DensitySet current = estimator.fitAll(AgeDensities.EDGES, counts, ids).densities();
        DensitySet residuals = models.get("fit", FunctionOnFunctionFit.class)
                .residuals(List.of(previous), models.get("covariates", Design.class), current);
        Design prev = models.get("previousTotals", Design.class);
        double[] prevTotals = new double[ids.length];
        double[] curTotals = new double[ids.length];
        for (int i = 0; i < ids.length; i++) {
            prevTotals[i] = prev.value(i, 0);
            for (double c : counts[i]) {
                curTotals[i] += c;
            }
        }
        return models.get("calibration", AnomalyScoring.Calibrated.class)
                .score(standardise(residuals, prevTotals, curTotals));
    }

    /**
     * Residuals made comparable across district sizes: r_i ⊙ (1/√(1/N_prev + 1/N_cur)), N the
     * seasons' event counts (a density estimated from N events varies about as 1/N; common practice).
     */
    static DensitySet standardise(DensitySet residuals, double[] previousTotals, double[] currentTotals) {
        double[][] c = residuals.coordinates();
        for (int i = 0; i < c.length; i++) {
            double f = 1 / Math.sqrt(1 / Math.max(1, previousTotals[i]) + 1 / Math.max(1, currentTotals[i]));
            for (int k = 0; k < c[i].length; k++) {
                c[i][k] *= f;
            }
        }
        return DensitySet.of(residuals.space(), c, residuals.ids().toArray(new String[0]));
    }

    /** Writes the baseline file, the new period as a long count table and as raw events. */
    static void save(Baseline b, Path dir) throws IOException {
        Files.createDirectories(dir);
        ModelFile.save(dir.resolve(BUNDLE), b.models());
        try (BufferedWriter w = Files.newBufferedWriter(dir.resolve(COUNTS), StandardCharsets.UTF_8)) {
            w.write("district,age,count\n");
            for (int i = 0; i < b.ids().length; i++) {
                for (int a = 0; a < AgeScenario.AGES; a++) {
                    w.write(b.ids()[i] + "," + a + "," + b.newCounts()[i][a] + "\n");
                }
            }
        }
        try (BufferedWriter w = Files.newBufferedWriter(dir.resolve(EVENTS), StandardCharsets.UTF_8)) {
            w.write("district,age\n");
            for (int i = 0; i < b.ids().length; i++) {
                for (int a = 0; a < AgeScenario.AGES; a++) {
                    for (int e = 0; e < b.newCounts()[i][a]; e++) {
                        w.write(b.ids()[i] + "," + (a + 0.5) + "\n");
                    }
                }
            }
        }
    }

    /** The new period's counts from the CSV count table, in the order of {@code ids}. */
    static double[][] countsFromCsv(Path csv, BayesSpace space, String[] ids) {
        CountTable t = CountTableReader.of("district", "count").withBinIndex("age", Bins.of(AgeDensities.EDGES))
                .withSpace(space).read(TableSource.csv(csv));
        return inOrder(List.of(t), ids, csv);
    }

    /** The new period's counts binned by the embedded SQL engine from the raw events, in the order of {@code ids}. */
    static double[][] countsFromSql(Path events, String[] ids) {
        List<CountTable> batches = new java.util.ArrayList<>();
        BulkObservations.of(events, "district", "age").withThreads(1)
                .histograms(Bins.of(AgeDensities.EDGES), OutsidePolicy.REJECT, batches::add);
        return inOrder(batches, ids, events);
    }

    private static double[][] inOrder(List<CountTable> tables, String[] ids, Path source) {
        Map<String, double[]> byId = new LinkedHashMap<>();
        for (CountTable t : tables) {
            for (int i = 0; i < t.size(); i++) {
                byId.put(t.ids()[i], t.counts(i));
            }
        }
        double[][] c = new double[ids.length][];
        for (int i = 0; i < ids.length; i++) {
            c[i] = byId.get(ids[i]);
            if (c[i] == null) {
                // a district without events in the new period has no rows in the events file
                c[i] = new double[AgeScenario.AGES];
            }
        }
        if (byId.size() > ids.length) {
            throw new IllegalArgumentException(source + ": units outside the baseline");
        }
        return c;
    }

    /** The scores as text, every number also as its IEEE 754 bits (so equal files mean equal bits). */
    static String describe(AnomalyScoring.Report r) {
        StringBuilder sb = new StringBuilder("district,flagged,residual_norm,p_value,adjusted_p_value,excursions,bits\n");
        for (AnomalyScoring.UnitScore u : r.units()) {
            StringBuilder ex = new StringBuilder();
            for (AnomalyScoring.Excursion e : u.excursions()) {
                ex.append(String.format(Locale.ROOT, "%s %.1f-%.1f;", e.direction(), e.from(), e.to()));
            }
            sb.append(String.format(Locale.ROOT, "%s,%b,%.6g,%.6g,%.6g,%s,%016x %016x %016x%n", u.id(), u.flagged(),
                    u.residualNorm(), u.pValue(), u.adjustedPValue(), ex, Double.doubleToRawLongBits(u.residualNorm()),
                    Double.doubleToRawLongBits(u.pValue()), Double.doubleToRawLongBits(u.adjustedPValue())));
        }
        return sb.toString();
    }

    /** Loads the baseline in this process and scores the new period from both sources; writes both score files. */
    static void scoreFolder(Path dir) throws IOException {
        ModelBundle models = ModelFile.load(dir.resolve(BUNDLE), ModelBundle.class, ModelLimits.defaults());
        DensitySet previous = models.get("previous", DensitySet.class);
        String[] ids = previous.ids().toArray(new String[0]);
        AnomalyScoring.Report fromCsv = score(models, ids, countsFromCsv(dir.resolve(COUNTS), previous.space(), ids));
        Files.writeString(dir.resolve("scores-csv.csv"), describe(fromCsv));
        System.out.println("scored " + ids.length + " districts from " + COUNTS + ": " + fromCsv.flaggedCount() + " flagged");
        try {
            AnomalyScoring.Report fromSql = score(models, ids, countsFromSql(dir.resolve(EVENTS), ids));
            Files.writeString(dir.resolve("scores-sql.csv"), describe(fromSql));
            System.out.println("scored " + ids.length + " districts from " + EVENTS + " through the SQL engine: "
                    + fromSql.flaggedCount() + " flagged");
        } catch (IllegalStateException e) {
            System.out.println("SQL engine path skipped: " + e.getMessage());
        }
    }

    /**
     * Runs the example.
     *
     * @param args nothing (all steps in a new temporary folder), {@code fit DIR [SEED] [DISTRICTS]}
     *             or {@code score DIR}
     */
    public static void main(String[] args) throws IOException {
        try {
            if (args.length == 0) {
                Path dir = Files.createTempDirectory("densa-backend");
                Baseline b = fit(7, 80);
                save(b, dir);
                System.out.println("baseline saved to " + dir.resolve(BUNDLE) + " (" + Files.size(dir.resolve(BUNDLE))
                        + " bytes)");
                scoreFolder(dir);
            } else if (args[0].equals("fit") && args.length >= 2) {
                long seed = args.length > 2 ? Long.parseLong(args[2]) : 7;
                int n = args.length > 3 ? Integer.parseInt(args[3]) : 80;
                save(fit(seed, n), Path.of(args[1]));
                System.out.println("baseline, counts and events written to " + args[1]);
            } else if (args[0].equals("score") && args.length == 2) {
                scoreFolder(Path.of(args[1]));
            } else {
                System.out.println("usage: BackendExample [fit DIR [SEED] [DISTRICTS] | score DIR]");
                System.exit(2);
            }
        } catch (IllegalArgumentException e) {
            System.err.println("error: " + e.getMessage());
            System.exit(1);
        } catch (UncheckedIOException e) {
            System.err.println("error: " + e.getCause().getMessage());
            System.exit(1);
        }
    }
}
