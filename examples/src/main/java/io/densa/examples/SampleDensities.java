package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import java.util.ArrayList;
import java.util.List;

/**
 * Densities from samples. Provisional: a 30-bin histogram with add-half counts fitted by least
 * squares on the log scale (core only), used until the penalised-likelihood estimator is merged;
 * it reports no estimation variances.
 */
final class SampleDensities {
    private SampleDensities() {
    }

    static String describe() {
        return "least-squares fit of the log of a 30-bin add-half histogram (provisional core-only estimator)";
    }

    static Estimates estimate(BayesSpace space, double[][] values, String[] ids) {
        int bins = 30;
        double lo = space.lower();
        double w = (space.upper() - lo) / bins;
        double[] mid = new double[bins];
        for (int b = 0; b < bins; b++) {
            mid[b] = lo + (b + 0.5) * w;
        }
        List<Density> out = new ArrayList<>();
        for (double[] v : values) {
            double[] h = new double[bins];
            for (double x : v) {
                h[Math.min(bins - 1, Math.max(0, (int) Math.floor((x - lo) / w)))]++;
            }
            for (int b = 0; b < bins; b++) {
                h[b] = (h[b] + 0.5) / ((v.length + 0.5 * bins) * w);
            }
            out.add(AgeDensities.leastSquaresLog(space, mid, h));
        }
        return new Estimates(DensitySet.of(out, ids), null, 0, Double.NaN, Double.NaN);
    }
}
