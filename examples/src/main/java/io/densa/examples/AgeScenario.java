package io.densa.examples;

import java.util.List;
import java.util.Random;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Polygon;

/**
 * Invented scenario of study 1: emergency visits by single year of age (0–99) in the districts
 * of an invented region over several seasons. Everything is drawn from a seed.
 *
 * <p>Model (log-linear in age a, district i, season s):
 * log λ_is(a) = log b(a) + g1_is φ1(a) + g2_is φ2(a) + s δ(a), where b is a fixed mixture
 * (infants, young adults, elderly), φ1 tilts toward old age (driven by the district's share of
 * residents aged 65+ and a smooth random field), φ2 is a young-adult bump (driven by urbanity
 * and a second field), δ is a slow ageing drift, and the g's wobble a little from season to
 * season. In the latest season a spatially clustered group of districts (a third random field
 * above its upper quantile) moves a share p_i of its visits to a child and young-adult profile
 * N(14, 6²) (p_i between 0.30 and 0.45). Counts are multinomial draws of the season's total visits.
 *
 * @param region        the districts
 * @param seasons       number of seasons (the last one is the season under surveillance)
 * @param counts        counts[i][s][a]: visits of district i in season s at age a
 * @param urbanity      covariate in (0, 1]: exp(−distance to the nearest town centre / 12 km)
 * @param olderShare    covariate: share of residents aged 65+ (invented)
 * @param shifted       truth: whether district i's latest season was shifted
 * @param shiftFraction truth: the share of visits moved (0 where not shifted)
 * @param trueLogIntensity true log λ_i(a) of the latest season before the shift, for plots
 */
record AgeScenario(Region region, int seasons, int[][][] counts, double[] urbanity, double[] olderShare,
        boolean[] shifted, double[] shiftFraction, double[][] trueLogIntensity) {

    static final int AGES = 100;
    /** Mean and sd of the age profile that shifted visits move to. */
    static final double SHIFT_MEAN = 14;
    static final double SHIFT_SD = 6;

    /** Generates the scenario with {@code n} districts (about; Voronoi clipping may drop none). */
    static AgeScenario generate(long seed, int n, int seasons) {
        Random random = new Random(seed);
        double radius = 45 * Math.sqrt(n / 300.0);
        LocalProjection projection = new LocalProjection(-21.0, -28.5);
        Polygon outline = Region.blobOutline(radius, 1.25, random);
        double[][] towns = new double[2][];
        List<Coordinate> townSites = Region.randomSites(outline, 2, new double[0][], 0, 0, radius * 0.6, random);
        for (int t = 0; t < 2; t++) {
            towns[t] = new double[] {townSites.get(t).x * 0.7, townSites.get(t).y * 0.7};
        }
        double spread = radius / 6;
        List<Coordinate> sites = Region.randomSites(outline, n, towns, spread, 0.45, radius / 60, random);
        Region region = Region.voronoi(outline, sites, projection, "D", seed ^ 0x5eedL);
        int m = region.size();
        double[] x = region.xs();
        double[] y = region.ys();

        double[] urbanity = new double[m];
        for (int i = 0; i < m; i++) {
            double d = Double.POSITIVE_INFINITY;
            for (double[] t : towns) {
                d = Math.min(d, Math.hypot(x[i] - t[0], y[i] - t[1]));
            }
            urbanity[i] = Math.exp(-d / 12.0);
        }
        double[] oldField = GaussianField.sample(x, y, radius / 2, 1.0, random);
        double[] field1 = GaussianField.sample(x, y, radius / 3, 1.0, random);
        double[] field2 = GaussianField.sample(x, y, radius / 3, 1.0, random);
        double[] hot = GaussianField.sample(x, y, radius / 5, 1.0, random);
        double[] olderShare = new double[m];
        double[] events = new double[m];
        for (int i = 0; i < m; i++) {
            olderShare[i] = clamp(0.19 - 0.06 * urbanity[i] + 0.035 * oldField[i], 0.06, 0.34);
            events[i] = Math.max(20, Math.exp(Math.log(70) + 2.6 * urbanity[i] + 0.8 * random.nextGaussian()));
        }

        // truth: the clustered group = hot field above its 92 % quantile
        double[] sorted = hot.clone();
        java.util.Arrays.sort(sorted);
        double cut = sorted[(int) Math.floor(0.92 * (m - 1))];
        boolean[] shifted = new boolean[m];
        double[] fraction = new double[m];
        for (int i = 0; i < m; i++) {
            if (hot[i] > cut) {
                shifted[i] = true;
                fraction[i] = 0.30 + 0.15 * Math.min(1, (hot[i] - cut) / 1.0);
            }
        }

        double[] base = new double[AGES];
        double[] phi1 = new double[AGES];
        double[] phi2 = new double[AGES];
        double[] drift = new double[AGES];
        double[] shiftProfile = new double[AGES];
        for (int a = 0; a < AGES; a++) {
            double t = a + 0.5;
            base[a] = Math.log(0.10 * Math.exp(-t / 2.0) / 2.0 + 0.32 * normal(t, 24, 10) + 0.55 * normal(t, 76, 13)
                    + 0.03 / 100);
            phi1[a] = (t - 50) / 50;
            phi2[a] = Math.exp(-0.5 * Math.pow((t - 26) / 9, 2)) - 0.2;
            drift[a] = 0.04 * (t - 50) / 50;
            shiftProfile[a] = normal(t, SHIFT_MEAN, SHIFT_SD);
        }
        int[][][] counts = new int[m][seasons][];
        double[][] trueLog = new double[m][AGES];
        double[] p = new double[AGES];
        for (int i = 0; i < m; i++) {
            double g1 = 0.45 * (olderShare[i] - 0.17) / 0.05 + 0.25 * field1[i];
            double g2 = 0.9 * urbanity[i] + 0.3 * field2[i];
            for (int s = 0; s < seasons; s++) {
                double w1 = g1 + 0.04 * random.nextGaussian();
                double w2 = g2 + 0.04 * random.nextGaussian();
                double max = Double.NEGATIVE_INFINITY;
                for (int a = 0; a < AGES; a++) {
                    p[a] = base[a] + w1 * phi1[a] + w2 * phi2[a] + s * drift[a];
                    max = Math.max(max, p[a]);
                }
                if (s == seasons - 1) {
                    System.arraycopy(p, 0, trueLog[i], 0, AGES);
                }
                double sum = 0;
                for (int a = 0; a < AGES; a++) {
                    p[a] = Math.exp(p[a] - max);
                    sum += p[a];
                }
                for (int a = 0; a < AGES; a++) {
                    p[a] /= sum;
                }
                if (s == seasons - 1 && shifted[i]) {
                    double q = fraction[i];
                    for (int a = 0; a < AGES; a++) {
                        p[a] = (1 - q) * p[a] + q * shiftProfile[a];
                    }
                }
                double total = events[i] * (1 + 0.02 * s) * Math.exp(0.08 * random.nextGaussian());
                int nEvents = poisson(total, random);
                counts[i][s] = multinomial(nEvents, p, random);
            }
        }
        return new AgeScenario(region, seasons, counts, urbanity, olderShare, shifted, fraction, trueLog);
    }

    int total(int district, int season) {
        int s = 0;
        for (int c : counts[district][season]) {
            s += c;
        }
        return s;
    }

    static double normal(double x, double mu, double sd) {
        double z = (x - mu) / sd;
        return Math.exp(-0.5 * z * z) / (sd * Math.sqrt(2 * Math.PI));
    }

    static double clamp(double v, double lo, double hi) {
        return Math.max(lo, Math.min(hi, v));
    }

    /** Poisson draw by normal approximation above 500 and by inversion below. */
    static int poisson(double mean, Random random) {
        if (mean > 500) {
            return (int) Math.max(0, Math.round(mean + Math.sqrt(mean) * random.nextGaussian()));
        }
        double l = Math.exp(-mean);
        int k = 0;
        double prod = random.nextDouble();
        while (prod > l) {
            k++;
            prod *= random.nextDouble();
        }
        return k;
    }

    /** Multinomial draw of n events over the cells with probabilities p (summing to one). */
    static int[] multinomial(int n, double[] p, Random random) {
        double[] cdf = new double[p.length];
        double s = 0;
        for (int a = 0; a < p.length; a++) {
            s += p[a];
            cdf[a] = s;
        }
        int[] out = new int[p.length];
        for (int e = 0; e < n; e++) {
            double u = random.nextDouble() * s;
            int idx = java.util.Arrays.binarySearch(cdf, u);
            if (idx < 0) {
                idx = -idx - 1;
            }
            out[Math.min(idx, p.length - 1)]++;
        }
        return out;
    }
}
