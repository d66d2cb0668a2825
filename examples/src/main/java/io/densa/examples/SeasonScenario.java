package io.densa.examples;

import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Polygon;

/**
 * The invented scenario of study 3: daily event counts in the districts of an invented region over
 * {@value #YEARS} years of {@value #DAYS_PER_YEAR} days, with a winter season whose timing drifts
 * slowly across space, and an injected early season in a spatially clustered group of districts in
 * the last year.
 *
 * <p>District i has an expected number of events per year N_i (log-normal, median
 * {@value #MEDIAN_EVENTS}, at least {@value #MIN_EVENTS}) spread over the day of the year d by the
 * intensity λ_i(d) ∝ {@value #BACKGROUND} + exp(κ cos(2π (d − p_i) / 365)), a von Mises bump on the
 * circle of days with concentration κ = {@value #KAPPA} above a flat background. The peak day p_i is
 * a smooth field: {@value #PEAK_MEAN} + a west–east gradient of ±{@value #GRADIENT_DAYS} days + a
 * Gaussian random field with standard deviation {@value #FIELD_SD_DAYS} days, taken modulo 365, so the
 * peaks straddle 1 January (day 0). Days are counted from the first 1 January; every year has 365
 * days; a day's count is Poisson. Apart from counting noise the season is the same every year.
 *
 * <p>The injected truth: the districts whose second random field (range a fifth of the region's
 * radius) lies above its {@value #SHIFT_QUANTILE} quantile form the shifted group; from day of the
 * year {@value #ONSET_DAY_OF_YEAR} of the last year on, their peak is {@value #SHIFT_DAYS} days
 * earlier, so the season's rise comes earlier (an early season). The onset week is the first week
 * containing that day.
 *
 * @param region     the districts
 * @param counts     counts[i][day], day 0 .. years · 365 − 1
 * @param peaks      the peak day of the year p_i (in [0, 365))
 * @param yearly     expected events per year N_i
 * @param shifted    whether district i belongs to the early-season group
 * @param onsetDay   the first shifted day (days since the start)
 */
record SeasonScenario(Region region, int[][] counts, double[] peaks, double[] yearly, boolean[] shifted,
        int onsetDay) {
    static final int YEARS = 6;
    static final int DAYS_PER_YEAR = 365;
    static final double MEDIAN_EVENTS = 900;
    static final double MIN_EVENTS = 200;
    static final double BACKGROUND = 0.25;
    static final double KAPPA = 2.2;
    static final double PEAK_MEAN = 12;
    static final double GRADIENT_DAYS = 20;
    static final double FIELD_SD_DAYS = 8;
    static final double SHIFT_QUANTILE = 0.93;
    static final int ONSET_DAY_OF_YEAR = 275;
    static final double SHIFT_DAYS = 30;

    /** Generates the scenario with about {@code n} districts. */
    static SeasonScenario generate(long seed, int n) {
        Random random = new Random(seed);
        double radius = 45 * Math.sqrt(n / 300.0);
        LocalProjection projection = new LocalProjection(-138.5, -41.0);
        Polygon outline = Region.blobOutline(radius, 1.3, random);
        List<Coordinate> sites = Region.randomSites(outline, n, new double[0][], 0, 0, radius / 60, random);
        Region region = Region.voronoi(outline, sites, projection, "D", seed ^ 0x5ea50L);
        int m = region.size();
        double[] x = region.xs();
        double[] y = region.ys();
        double[] field = GaussianField.sample(x, y, radius / 2, 1.0, random);
        double[] hot = GaussianField.sample(x, y, radius / 5, 1.0, random);
        double xMax = Arrays.stream(x).map(Math::abs).max().orElse(1);
        double[] peaks = new double[m];
        double[] yearly = new double[m];
        for (int i = 0; i < m; i++) {
            double p = PEAK_MEAN + GRADIENT_DAYS * x[i] / xMax + FIELD_SD_DAYS * field[i];
            peaks[i] = ((p % DAYS_PER_YEAR) + DAYS_PER_YEAR) % DAYS_PER_YEAR;
            yearly[i] = Math.max(MIN_EVENTS, MEDIAN_EVENTS * Math.exp(0.6 * random.nextGaussian()));
        }
        double[] sorted = hot.clone();
        Arrays.sort(sorted);
        double cut = sorted[(int) Math.floor(SHIFT_QUANTILE * (m - 1))];
        boolean[] shifted = new boolean[m];
        for (int i = 0; i < m; i++) {
            shifted[i] = hot[i] > cut;
        }
        int days = YEARS * DAYS_PER_YEAR;
        int onset = (YEARS - 1) * DAYS_PER_YEAR + ONSET_DAY_OF_YEAR;
        int[][] counts = new int[m][days];
        double[] shape = new double[DAYS_PER_YEAR];
        double[] early = new double[DAYS_PER_YEAR];
        for (int i = 0; i < m; i++) {
            intensity(peaks[i], yearly[i], shape);
            intensity(peaks[i] - SHIFT_DAYS, yearly[i], early);
            for (int d = 0; d < days; d++) {
                double mean = shifted[i] && d >= onset ? early[d % DAYS_PER_YEAR] : shape[d % DAYS_PER_YEAR];
                counts[i][d] = AgeScenario.poisson(mean, random);
            }
        }
        return new SeasonScenario(region, counts, peaks, yearly, shifted, onset);
    }

    /** Expected events per day of the year for a peak day and a yearly total (written into {@code out}). */
    static void intensity(double peak, double perYear, double[] out) {
        double sum = 0;
        for (int d = 0; d < DAYS_PER_YEAR; d++) {
            out[d] = BACKGROUND + Math.exp(KAPPA * Math.cos(2 * Math.PI * (d + 0.5 - peak) / DAYS_PER_YEAR));
            sum += out[d];
        }
        for (int d = 0; d < DAYS_PER_YEAR; d++) {
            out[d] *= perYear / sum;
        }
    }

    int size() {
        return region.size();
    }

    int days() {
        return counts[0].length;
    }

    /** Week of day {@code day} (weeks of 7 days from day 0). */
    static int weekOf(int day) {
        return day / 7;
    }
}
