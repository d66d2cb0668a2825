package io.densa.report;

import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.DetectionLimits;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.regression.surveillance.ExcessCounts;
import io.densa.spatial.autocorrelation.AutocorrelationPermutation;
import io.densa.spatial.autocorrelation.MoranI;
import io.densa.spatial.scan.SpatialScan;
import io.densa.spatial.variogram.VariogramFit;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * Sentences for reports generated from the numbers and tests that decide them, so that the words
 * cannot contradict the figures: a finding is stated only when its test says so at the stated
 * level, and the opposite sentence is written otherwise; fit warnings, extrapolated estimates and
 * non-converged fits are always said.
 *
 * <p>Stateless and thread-safe.
 */
public final class Findings {
    private Findings() {
    }

    /**
     * Whether values cluster in space, decided by a one-sided test of positive autocorrelation at
     * level {@code alpha}: "Subject cluster in space: test = 0.41, p = 0.001 ≤ 0.05." when p ≤ alpha,
     * otherwise "Subject show no clustering in space at the 0.05 level: …, p = 0.31 &gt; 0.05."
     *
     * @param subject   what is tested, plural, e.g. "Departures from the baseline"
     * @param testName  the statistic's name, e.g. "Moran's I of the log anomaly score"
     * @param statistic its value
     * @param pValue    the one-sided p-value for clustering, in [0, 1]
     * @param alpha     the level, in (0, 1)
     */
    public static String clustering(String subject, String testName, double statistic, double pValue,
            double alpha) {
        Objects.requireNonNull(subject, "subject");
        Objects.requireNonNull(testName, "testName");
        checkLevel(alpha);
        if (!(pValue >= 0 && pValue <= 1) || !Double.isFinite(statistic)) {
            throw new IllegalArgumentException("clustering finding needs a p-value in [0, 1] and a finite statistic,"
                    + " got p = " + pValue + ", statistic = " + statistic);
        }
        String numbers = testName + " = " + Numbers.significant(statistic, 3) + ", p = "
                + Numbers.significant(pValue, 2);
        String level = Numbers.significant(alpha, 3);
        if (pValue <= alpha) {
            return subject + " cluster in space: " + numbers + " ≤ " + level + ".";
        }
        return subject + " show no clustering in space at the " + level + " level: " + numbers + " > " + level
                + ".";
    }

    /**
     * {@link #clustering(String, String, double, double, double)} from Moran's I: the one-sided
     * permutation p-value when permutations were run, otherwise the one-sided test under
     * randomisation; the sentence names which.
     */
    public static String clustering(String subject, String valueName, MoranI.Result result, double alpha) {
        Objects.requireNonNull(result, "result");
        Optional<AutocorrelationPermutation> perm = result.permutation();
        double p = perm.map(AutocorrelationPermutation::pGreater).orElse(result.randomisation().pGreater());
        String how = perm.map(x -> " (one-sided, " + x.permutations() + " permutations)")
                .orElse(" (one-sided, normal approximation under randomisation)");
        return clustering(subject, "Moran's I of the " + valueName + how, result.statistic(), p, alpha);
    }

    /**
     * The cluster statement of a spatial scan, decided by its Monte Carlo test at level
     * {@code alpha}: when p ≤ alpha, "Subject: a cluster of raised counts — k units (names) with O
     * observed against E expected, an excess of X (relative risk R); Kulldorff's scan statistic LLR =
     * …, p = … ≤ alpha (R replicates)."; otherwise "Subject: no cluster of raised counts at the alpha
     * level — the most likely zone (…) has LLR = …, p = … &gt; alpha." (or that no zone has raised
     * counts at all).
     *
     * @param subject   what was scanned, e.g. "Visits under 25 against the baseline"
     * @param result    the scan
     * @param unitNames a name per unit, in the scan's order
     * @param maxNames  at most this many member names are listed (≥ 1); the rest are counted
     * @param alpha     the level, in (0, 1)
     */
    public static String scanCluster(String subject, SpatialScan.Result result, String[] unitNames, int maxNames,
            double alpha) {
        Objects.requireNonNull(subject, "subject");
        Objects.requireNonNull(result, "result");
        Objects.requireNonNull(unitNames, "unitNames");
        checkLevel(alpha);
        if (maxNames < 1) {
            throw new IllegalArgumentException("maxNames must be at least 1, got " + maxNames);
        }
        SpatialScan.Cluster c = result.mostLikely();
        String level = Numbers.significant(alpha, 3);
        int[] members = c.members();
        if (members.length == 0) {
            return subject + ": no cluster of raised counts — no zone has more observed than expected events.";
        }
        StringBuilder names = new StringBuilder();
        for (int i = 0; i < Math.min(maxNames, members.length); i++) {
            int u = members[i];
            if (u < 0 || u >= unitNames.length) {
                throw new IllegalArgumentException("cluster member " + u + " has no name: " + unitNames.length
                        + " names given");
            }
            names.append(i == 0 ? "" : ", ").append(unitNames[u]);
        }
        if (members.length > maxNames) {
            names.append(" and ").append(members.length - maxNames).append(" more");
        }
        String zone = members.length + (members.length == 1 ? " unit" : " units") + " (" + names + ") with "
                + Numbers.fixed(c.observed(), 0) + " observed against " + Numbers.fixed(c.expected(), 0)
                + " expected, an excess of " + Numbers.fixed(c.excess(), 0) + " (relative risk "
                + (Double.isInfinite(c.relativeRisk()) ? "unbounded" : Numbers.significant(c.relativeRisk(), 3)) + ")";
        String test = "Kulldorff's scan statistic LLR = " + Numbers.significant(c.logLikelihoodRatio(), 3) + ", p = "
                + Numbers.significant(result.pValue(), 2);
        String reps = " (" + result.replicates() + " Monte Carlo replicates)";
        if (result.pValue() <= alpha) {
            return subject + ": a cluster of raised counts — " + zone + "; " + test + " ≤ " + level + reps + ".";
        }
        return subject + ": no cluster of raised counts at the " + level + " level — the most likely zone, " + zone
                + ", has " + test + " > " + level + reps + ".";
    }

    /** Whether a one-sided Moran test is significant at alpha (the rule {@link #clustering} applies). */
    public static boolean clusters(MoranI.Result result, double alpha) {
        checkLevel(alpha);
        return result.permutation().map(AutocorrelationPermutation::pGreater)
                .orElse(result.randomisation().pGreater()) <= alpha;
    }

    private static void checkLevel(double alpha) {
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("level must be in (0, 1), got " + alpha);
        }
    }

    /**
     * What a reader of a variogram fit must know: one sentence per warning (range beyond the
     * largest lag, a parameter at a bound, no convergence, optimiser fallback) with what it means,
     * or one sentence saying that none was raised.
     *
     * @param label      which fit, e.g. "Raw densities"
     * @param fit        the fit
     * @param lengthUnit unit of the lags, e.g. "km"
     */
    public static List<String> variogramFit(String label, VariogramFit fit, String lengthUnit) {
        Objects.requireNonNull(label, "label");
        Objects.requireNonNull(fit, "fit");
        List<String> out = new ArrayList<>();
        if (fit.warnings().isEmpty()) {
            out.add(label + ": the fit converged, its practical range lies within the largest lag ("
                    + Numbers.significant(fit.largestLag(), 3) + " " + lengthUnit + ") and no parameter ended on a "
                    + "bound.");
            return out;
        }
        for (VariogramFit.Warning w : fit.warnings()) {
            String meaning = switch (w.kind()) {
                case RANGE_BEYOND_LAGS -> " The range and the sill are therefore poorly determined; predictions "
                        + "between nearby sites rest mostly on the short-lag part of the model, which the data do "
                        + "constrain.";
                case PARAMETER_AT_BOUND -> " A value on a bound is a limit of the search, not an estimate.";
                case NOT_CONVERGED -> " The fitted model is approximate.";
                case OPTIMISER_FALLBACK -> "";
            };
            out.add(label + " (lags in " + lengthUnit + "): " + w.message() + "." + meaning);
        }
        return out;
    }

    /**
     * The units whose estimate is carried by extrapolation
     * ({@link EstimationDiagnostics#extrapolated()}), naming at most {@code listed} of them, or a
     * sentence saying there are none.
     *
     * @param ids   ids of the extrapolated units (e.g. {@link BatchEstimate#extrapolatedIds()})
     * @param units number of estimates
     */
    public static String extrapolated(List<String> ids, int units, int listed) {
        Objects.requireNonNull(ids, "ids");
        String what = " (more than " + Math.round(100 * EstimationDiagnostics.EXTRAPOLATION_THRESHOLD)
                + " % of the squared B2 norm lies beyond the unit's data, below the level at which that region is"
                + " already expected to be empty: that part is set by the estimator, not by the data)";
        if (ids.isEmpty()) {
            return "No estimate is carried by extrapolation" + what + ".";
        }
        return ids.size() + " of " + units + " estimates " + (ids.size() == 1 ? "is" : "are")
                + " carried by extrapolation" + what + ": " + list(ids, listed) + ". Their distances to the others say"
                + " more about how the estimator fills empty regions than about their data.";
    }

    /** {@link #extrapolated(List, int, int)} for a batch. */
    public static String extrapolated(BatchEstimate estimate, int listed) {
        return extrapolated(estimate.extrapolatedIds(), estimate.size(), listed);
    }

    /**
     * Which units displace more events between the bands than a period without change would, at a
     * false discovery rate q ({@link ExcessCounts.Result#displacedAdjustedPValues}, Benjamini–Hochberg
     * over all units), largest displacement first, naming at most {@code listed}; or that none does.
     *
     * @param result    excess counts of the units
     * @param unitNames display names in the result's unit order
     * @param units     what the units are, plural, e.g. "districts"
     * @param events    what is counted, plural, e.g. "visits"
     * @param q         the false discovery rate, in (0, 1)
     */
    public static String displaced(ExcessCounts.Result result, String[] unitNames, String units, String events,
            double q, int listed) {
        Objects.requireNonNull(result, "result");
        Objects.requireNonNull(unitNames, "unitNames");
        Objects.requireNonNull(units, "units");
        Objects.requireNonNull(events, "events");
        checkLevel(q);
        int n = result.units().size();
        if (unitNames.length != n) {
            throw new IllegalArgumentException(unitNames.length + " unit names for " + n + " units");
        }
        double[] adjusted = result.displacedAdjustedPValues();
        List<String> found = new ArrayList<>();
        for (int i : result.rankByDisplaced()) {
            if (adjusted[i] <= q) {
                found.add(unitNames[i] + " (" + Numbers.fixed(result.units().get(i).displaced().value(), 0) + ")");
            }
        }
        String level = Numbers.significant(q, 3);
        if (found.isEmpty()) {
            return "At a false discovery rate of " + level + ", none of the " + n + " " + units + " displaces more " + events
                    + " between the bands than a period without change would (counting noise and the baseline's error).";
        }
        return "At a false discovery rate of " + level + ", " + found.size() + " of " + n + " " + units + " displace more "
                + events + " between the bands than a period without change would (counting noise and the baseline's"
                + " error): " + list(found, listed) + ".";
    }

    /**
     * The units whose counts look clipped at a detection limit ({@link DetectionLimits#suggested}),
     * naming at most {@code listed} with the suggested limit, or that none does; a suggestion for
     * the analyst to check against how the data were recorded.
     *
     * @param suggested the suggestions for the units, in the order of {@code ids}
     * @param ids       the units' ids
     */
    public static String clippedUnits(DetectionLimits suggested, List<String> ids, int listed) {
        Objects.requireNonNull(suggested, "suggested");
        Objects.requireNonNull(ids, "ids");
        if (ids.size() != suggested.size()) {
            throw new IllegalArgumentException(ids.size() + " ids for " + suggested.size() + " units");
        }
        double[] lo = suggested.lower();
        double[] hi = suggested.upper();
        List<String> named = new ArrayList<>();
        for (int i = 0; i < ids.size(); i++) {
            if (suggested.censored(i)) {
                named.add(ids.get(i) + " (" + (lo[i] == lo[i] ? "below " + Numbers.significant(lo[i], 4) : "")
                        + (lo[i] == lo[i] && hi[i] == hi[i] ? ", " : "")
                        + (hi[i] == hi[i] ? "above " + Numbers.significant(hi[i], 4) : "") + ")");
            }
        }
        if (named.isEmpty()) {
            return "No unit's counts look clipped at a detection limit (a run of empty bins at an end of the range"
                    + " followed by a spike).";
        }
        return named.size() + " of " + ids.size() + " units' counts look clipped at a detection limit (a run of empty"
                + " bins at an end of the range followed by a spike): " + list(named, listed) + ". If their values"
                + " were recorded at the limit there, declare the limits (DetectionLimits) so that those counts enter"
                + " the estimate as censored (by default the estimator already reads the empty ends of units with at"
                + " least " + Numbers.significant(DetectionLimits.DENSE_EVENTS_PER_BIN, 3) + " events per bin so); a"
                + " quantity with a hard bound of its own looks the same.";
    }

    /**
     * Whether every density fit converged, naming at most {@code listed} of those that did not,
     * with the estimator's reason.
     */
    public static String convergence(List<EstimationDiagnostics> diagnostics, int listed) {
        Objects.requireNonNull(diagnostics, "diagnostics");
        List<String> bad = new ArrayList<>();
        int empty = 0;
        for (EstimationDiagnostics d : diagnostics) {
            if (d.status() == EstimationDiagnostics.Status.NOT_CONVERGED) {
                bad.add(d.id() + " (" + d.reason() + ")");
            } else if (d.status() == EstimationDiagnostics.Status.EMPTY_UNIT_REFERENCE) {
                empty++;
            }
        }
        String emptyText = empty == 0 ? "" : " " + empty + " unit" + (empty == 1 ? " had" : "s had")
                + " no events and " + (empty == 1 ? "was" : "were") + " given the reference density.";
        if (bad.isEmpty()) {
            return "All " + (diagnostics.size() - empty) + " density fits with data converged." + emptyText;
        }
        return bad.size() + " of " + diagnostics.size() + " density fits did not converge and are kept as the "
                + "estimator left them: " + list(bad, listed) + "." + emptyText;
    }

    private static String list(List<String> items, int listed) {
        if (listed < 1) {
            throw new IllegalArgumentException("listed must be at least 1, got " + listed);
        }
        return String.join(", ", items.subList(0, Math.min(listed, items.size())))
                + (items.size() > listed ? " and " + (items.size() - listed) + " more" : "");
    }
}
