package io.densa.spatial.uncertainty;

import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.Locations;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import org.junit.jupiter.api.Test;

/**
 * Simulation-recovery: Gaussian random fields of densities with known truth (proportional
 * covariance: every coordinate with the exponential correlation, coordinate covariance of rank 3),
 * ordinary kriging with the true variogram and the coordinate shape estimated from the data, and
 * 90 % Monte Carlo intervals at held-out sites. Under the model the interval of a quantity is a
 * 90 % interval of its predictive law, so over 20 independent fields × 20 held-out sites (400
 * intervals, binomial standard error 0.015) the share covering the true value must lie in
 * [0.85, 0.95] — for the median and for P(X &gt; t) of the held-out density.
 */
class PredictiveCoverageTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 3);
    static final double T = 0.6;

    @Test
    void ninetyPercentIntervalsCoverNinetyPercent() {
        int k = SPACE.dimension();
        double[] mean = SPACE.project(x -> Math.exp(-0.5 * Math.pow((x - 0.5) / 0.12, 2))).density().coordinates();
        double[] shift = SPACE.project(x -> Math.exp(-0.5 * Math.pow((x - 0.52) / 0.12, 2))).density().coordinates();
        double[] wide = SPACE.project(x -> Math.exp(-0.5 * Math.pow((x - 0.5) / 0.13, 2))).density().coordinates();
        double[][] a = new double[k][3];
        java.util.Random rnd = new java.util.Random(5);
        double tr = 0;
        for (int i = 0; i < k; i++) {
            a[i][0] = shift[i] - mean[i];
            a[i][1] = wide[i] - mean[i];
            a[i][2] = 0.05 * rnd.nextGaussian();
            for (double v : a[i]) {
                tr += v * v;
            }
        }
        for (double[] row : a) {
            for (int j = 0; j < 3; j++) {
                row[j] /= Math.sqrt(tr);
            }
        }
        VariogramModel model = VariogramModel.exponential(0.6, 0.5).withNugget(0.01);
        int fields = 20, stations = 50, held = 20;
        int coveredMedian = 0, coveredTail = 0, total = 0;
        double widthMedian = 0;
        for (int f = 0; f < fields; f++) {
            Locations all = TestData.uniformSquare(stations + held, 1, 100 + f);
            double[][] truth = ProportionalFields.sample(all, model, mean, a, 200 + f);
            double[] xs = all.xs(), ys = all.ys();
            Locations loc = Locations.planar(java.util.Arrays.copyOf(xs, stations), java.util.Arrays.copyOf(ys, stations));
            DensitySet data = DensitySet.of(SPACE, ProportionalFields.head(truth, stations));
            PredictiveDistribution pd = PredictiveDistribution.of(Kriging.ordinary(loc, data, model,
                    KrigingOptions.withDefaults()));
            double[] tx = java.util.Arrays.copyOfRange(xs, stations, stations + held);
            double[] ty = java.util.Arrays.copyOfRange(ys, stations, stations + held);
            var out = pd.summarise(tx, ty, null, UncertaintyOptions.withSeed(300 + f).withQuantiles(0.5)
                    .withExceedances(T));
            for (int i = 0; i < held; i++) {
                Density d = SPACE.density(truth[stations + i]);
                double med = d.quantile(0.5);
                double p = d.tailProbability(T);
                DerivedInterval im = out.get(i).quantiles().get(0);
                DerivedInterval ip = out.get(i).exceedances().get(0);
                coveredMedian += med >= im.lower() && med <= im.upper() ? 1 : 0;
                coveredTail += p >= ip.lower() && p <= ip.upper() ? 1 : 0;
                widthMedian += im.width();
                total++;
            }
        }
        double cm = coveredMedian / (double) total, ct = coveredTail / (double) total;
        System.out.printf("coverage of 90 %% intervals over %d held-out sites: median %.3f, P(X > %.1f) %.3f;"
                + " mean width of the median's interval %.4f%n", total, cm, T, ct, widthMedian / total);
        assertTrue(cm >= 0.85 && cm <= 0.95, "median coverage " + cm);
        assertTrue(ct >= 0.85 && ct <= 0.95, "exceedance coverage " + ct);
    }
}
