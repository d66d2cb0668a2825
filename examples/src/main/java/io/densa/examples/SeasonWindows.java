package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.PenalizedLikelihoodEstimator.EmptyEnds;
import io.densa.regression.surveillance.Period;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The weekly observations of study 3: for district i and week t, the counts of the events of the
 * trailing 365 days (the days of week t and the 358 before them, so every day of the year once) by
 * day of the year in {@value #BINS} bins of {@value #BIN_DAYS} days, and their density on the circle
 * of days estimated with Densa's penalised-likelihood estimator.
 *
 * <p>The space is chosen here and only here ({@link #space()}).
 */
final class SeasonWindows {
    static final int BIN_DAYS = 5;
    /** Harmonics of the Fourier basis on the circle of days. */
    static final int HARMONICS = 3;
    static final int BINS = SeasonScenario.DAYS_PER_YEAR / BIN_DAYS;
    static final double[] EDGES = new double[BINS + 1];

    static {
        for (int b = 0; b <= BINS; b++) {
            EDGES[b] = b * BIN_DAYS;
        }
    }

    private SeasonWindows() {
    }

    /** The Bayes space of the day of the year: the one place where it is chosen. */
    static BayesSpace space() {
        return BayesSpace.fourier(0, SeasonScenario.DAYS_PER_YEAR, HARMONICS);
    }

    /** How the space is described in the report. */
    static String describeSpace() {
        return "the circle of days of the year (period 365, day 0 = 1 January) with the Fourier basis of " + HARMONICS
                + " harmonics (" + space().dimension() + " clr coordinates: cos and sin of 2πjd/365, j = 1.." + HARMONICS
                + "): 31 December and 1 January are neighbours, so a season that straddles the turn of the year is "
                + "one smooth density. A von Mises season lies exactly in the first harmonic (Mardia & Jupp 2000); "
                + "the flat background of the invented seasons adds small higher harmonics";
    }

    /** First week whose trailing 365 days lie inside the record. */
    static int firstWeek() {
        return (SeasonScenario.DAYS_PER_YEAR - 7 + 6) / 7;
    }

    /** Last complete week of the record. */
    static int lastWeek(int days) {
        return (days - 7) / 7;
    }

    /** Bin of a day since the start. */
    static int bin(int day) {
        return (day % SeasonScenario.DAYS_PER_YEAR) / BIN_DAYS;
    }

    /**
     * The trailing-year counts of every week from {@link #firstWeek()} to the last, by sliding a
     * window of 365 days a week at a time: result[w][i][b] for week firstWeek() + w.
     */
    static int[][][] trailingCounts(SeasonScenario sc) {
        int n = sc.size();
        int first = firstWeek();
        int last = lastWeek(sc.days());
        int[][][] out = new int[last - first + 1][n][];
        int[][] bins = new int[n][BINS];
        int end = 7 * first + 6;
        for (int i = 0; i < n; i++) {
            for (int d = end - SeasonScenario.DAYS_PER_YEAR + 1; d <= end; d++) {
                bins[i][bin(d)] += sc.counts()[i][d];
            }
        }
        for (int t = first; t <= last; t++) {
            int e = 7 * t + 6;
            if (t > first) {
                for (int i = 0; i < n; i++) {
                    int[] c = sc.counts()[i];
                    for (int d = e - 6; d <= e; d++) {
                        bins[i][bin(d)] += c[d];
                        bins[i][bin(d - SeasonScenario.DAYS_PER_YEAR)] -= c[d - SeasonScenario.DAYS_PER_YEAR];
                    }
                }
            }
            for (int i = 0; i < n; i++) {
                out[t - first][i] = bins[i].clone();
            }
        }
        return out;
    }

    /**
     * One common smoothing parameter: the median of the estimator's default choices (marginal
     * likelihood per unit) over the largest quarter of the districts in the first week.
     */
    static double commonSmoothing(BayesSpace space, int[][] counts) {
        return AgeDensities.commonSmoothing(space, EDGES, counts);
    }

    /**
     * The estimated weekly periods (densities and estimation variances; the counts stay with the
     * caller, since the excess over the whole year is zero by construction) and the units that did
     * not converge.
     */
    /** The weekly periods, the fits that did not converge, and the last week's estimates (with covariances). */
    record Periods(List<Period> periods, List<String> notConverged, BatchEstimate last) {
    }

    static Periods estimate(BayesSpace space, int[][][] weekly, String[] ids, double lambda) {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space).withSmoothing(lambda)
                .withEmptyEnds(EmptyEnds.COUNTED); // event counts: every bin as recorded, the same every week
        List<Period> out = new ArrayList<>(weekly.length);
        List<String> problems = new ArrayList<>();
        int first = firstWeek();
        BatchEstimate b = null;
        for (int w = 0; w < weekly.length; w++) {
            b = est.fitAll(EDGES, weekly[w], ids);
            for (EstimationDiagnostics d : b.diagnostics()) {
                if (!d.converged()) {
                    problems.add("week " + (first + w) + ", " + d.id() + ": " + d.reason());
                }
            }
            out.add(new Period(first + w, b.densities(), null, b.estimationVariances(), null, null));
        }
        return new Periods(out, problems, b);
    }

    /**
     * The circular mean day of each density, in [0, 365): the mean direction of the density on the
     * circle of days ({@link io.densa.core.Density#circularMean()}; Mardia &amp; Jupp (2000),
     * Directional Statistics, Wiley, §2.2.1).
     */
    static double[] timing(DensitySet d) {
        double[] out = new double[d.size()];
        for (int i = 0; i < d.size(); i++) {
            out[i] = d.get(i).circularMean();
        }
        return out;
    }

    /** A day of the year in [0, 365) as days from 1 January in [−185, 180): the unrolled axis with its cut at day 180. */
    static double unrolled(double dayOfYear) {
        return dayOfYear >= 180 ? dayOfYear - SeasonScenario.DAYS_PER_YEAR : dayOfYear;
    }
}
