package io.densa.examples;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Polygon;

/**
 * Invented scenario of study 2: a year (8,760 hours) of hourly fine-particle concentrations
 * (µg/m³) at monitors inside an invented city outline, drawn from a seed.
 *
 * <p>Model: log c(s, t) = m(s) + seasonal(t) + r(s) diurnal(t) + w(t) + e(s, t), where m has a
 * west–east trend, a raised city centre, a smooth random field and a few heavy-traffic hot
 * spots; w is a regional AR(1) "weather" series shared by all monitors; e is a local AR(1)
 * series; r(s) amplifies the rush-hour peaks near the hot spots. Hours are missing in random
 * outages (a few per monitor, geometric lengths) and at random single hours.
 *
 * @param outline   the city outline (km)
 * @param projection projection of the kilometres to longitude and latitude
 * @param codes     invented monitor codes
 * @param names     invented monitor names
 * @param x         monitor x, km east
 * @param y         monitor y, km north
 * @param roadside  whether a monitor was placed next to a traffic hot spot
 * @param hourly    hourly[i][t], NaN where missing
 * @param hotSpots  the hot spot centres (km)
 */
record AirScenario(Polygon outline, LocalProjection projection, String[] codes, String[] names, double[] x,
        double[] y, boolean[] roadside, double[][] hourly, double[][] hotSpots) {

    static final int HOURS = 8760;
    static final int DAYS = 365;
    /** A day counts only with at least this many valid hours (75 % completeness; common practice). */
    static final int MIN_HOURS_PER_DAY = 18;

    static AirScenario generate(long seed, int monitors) {
        Random random = new Random(seed);
        double radius = 12;
        LocalProjection projection = new LocalProjection(-24.6, -33.9);
        Polygon outline = Region.blobOutline(radius, 1.3, random);
        int nHot = 4;
        List<Coordinate> hotList = Region.randomSites(outline.buffer(-3), nHot, new double[][] {{0, 0}}, 4, 1.0,
                2.5, random);
        double[][] hot = new double[nHot][];
        for (int h = 0; h < nHot; h++) {
            hot[h] = new double[] {hotList.get(h).x, hotList.get(h).y};
        }
        int nRoad = Math.min(monitors / 10, 2 * nHot);
        List<Coordinate> sites = new ArrayList<>();
        for (int k = 0; k < nRoad; k++) {
            double[] c = hot[k % nHot];
            double ang = 2 * Math.PI * random.nextDouble();
            double d = 0.15 + 0.35 * random.nextDouble();
            sites.add(new Coordinate(c[0] + d * Math.cos(ang), c[1] + d * Math.sin(ang)));
        }
        sites.addAll(Region.randomSites(outline, monitors - nRoad, new double[][] {{0, 0}}, 4, 0.5, 0.4, random));
        int n = sites.size();
        double[] x = new double[n];
        double[] y = new double[n];
        boolean[] road = new boolean[n];
        String[] codes = new String[n];
        String[] names = new String[n];
        InventedNames nameGen = new InventedNames(seed ^ 0xa1bL);
        for (int i = 0; i < n; i++) {
            x[i] = sites.get(i).x;
            y[i] = sites.get(i).y;
            road[i] = i < nRoad;
            codes[i] = String.format("M%02d", i + 1);
            names[i] = nameGen.next() + (road[i] ? " Road" : " Park");
        }
        double[] field = GaussianField.sample(x, y, 5, 0.03, random);
        double[] mean = new double[n];
        for (int i = 0; i < n; i++) {
            mean[i] = meanLog(x[i], y[i], radius, hot) + field[i];
        }
        // regional weather: AR(1), stationary sd 0.42
        double phiW = 0.985;
        double[] w = ar1(HOURS, phiW, 0.42, random);
        double[][] hourly = new double[n][HOURS];
        for (int i = 0; i < n; i++) {
            double[] e = ar1(HOURS, 0.9, 0.22, random);
            double amp = road[i] ? 0.35 : 0.12;
            for (int t = 0; t < HOURS; t++) {
                double seasonal = 0.22 * Math.cos(2 * Math.PI * (t / (double) HOURS - 0.03));
                int hour = t % 24;
                double diurnal = Math.exp(-0.5 * Math.pow((hour - 8) / 1.5, 2))
                        + Math.exp(-0.5 * Math.pow((hour - 18) / 2.0, 2)) - 0.3;
                hourly[i][t] = Math.exp(mean[i] + seasonal + amp * diurnal + w[t] + e[t]);
            }
            int outages = 1 + AgeScenario.poisson(4, random);
            for (int o = 0; o < outages; o++) {
                int start = random.nextInt(HOURS);
                int len = 1 + (int) Math.floor(Math.log(1 - random.nextDouble()) / Math.log(1 - 1.0 / 30));
                for (int t = start; t < Math.min(HOURS, start + len); t++) {
                    hourly[i][t] = Double.NaN;
                }
            }
            if (random.nextInt(12) == 0) {
                int start = random.nextInt(HOURS - 1500);
                for (int t = start; t < start + 1400; t++) {
                    hourly[i][t] = Double.NaN;
                }
            }
            for (int t = 0; t < HOURS; t++) {
                if (random.nextDouble() < 0.02) {
                    hourly[i][t] = Double.NaN;
                }
            }
        }
        return new AirScenario(outline, projection, codes, names, x, y, road, hourly, hot);
    }

    /** The deterministic part of the mean log concentration at (x, y) (without the random field). */
    static double meanLog(double x, double y, double radius, double[][] hot) {
        double m = Math.log(8.5) + 0.22 * x / radius + 0.35 * Math.exp(-0.5 * (x * x + y * y) / 25.0);
        for (double[] h : hot) {
            double d2 = (x - h[0]) * (x - h[0]) + (y - h[1]) * (y - h[1]);
            m += 0.45 * Math.exp(-0.5 * d2 / 0.36);
        }
        return m;
    }

    int size() {
        return x.length;
    }

    /** Daily means of monitor i (NaN for a day with fewer than {@link #MIN_HOURS_PER_DAY} valid hours). */
    double[] dailyMeans(int i) {
        double[] out = new double[DAYS];
        for (int d = 0; d < DAYS; d++) {
            double s = 0;
            int c = 0;
            for (int h = 0; h < 24; h++) {
                double v = hourly[i][d * 24 + h];
                if (!Double.isNaN(v)) {
                    s += v;
                    c++;
                }
            }
            out[d] = c >= MIN_HOURS_PER_DAY ? s / c : Double.NaN;
        }
        return out;
    }

    /** Share of missing hours at monitor i. */
    double missingShare(int i) {
        int c = 0;
        for (double v : hourly[i]) {
            if (Double.isNaN(v)) {
                c++;
            }
        }
        return c / (double) HOURS;
    }

    private static double[] ar1(int n, double phi, double sd, Random random) {
        double[] out = new double[n];
        double innov = sd * Math.sqrt(1 - phi * phi);
        out[0] = sd * random.nextGaussian();
        for (int t = 1; t < n; t++) {
            out[t] = phi * out[t - 1] + innov * random.nextGaussian();
        }
        return out;
    }
}
