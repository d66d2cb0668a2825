package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

/**
 * Command-line entry point of the examples. Until the full studies land it runs a small core
 * demonstration on invented densities.
 */
public final class Main {
    private Main() {
    }

    /**
     * Runs the demo.
     *
     * @param args ignored for the core demo
     */
    public static void main(String[] args) {
        long seed = 20261201L;
        BayesSpace space = BayesSpace.splines(0, 100, 4, 10);
        Random rnd = new Random(seed);
        List<Density> list = new ArrayList<>();
        for (int i = 0; i < 50; i++) {
            double mu = 35 + 10 * rnd.nextGaussian();
            double sd = 12 + 3 * rnd.nextDouble();
            list.add(space.project(x -> Math.exp(-0.5 * Math.pow((x - mu) / sd, 2))).density());
        }
        DensitySet set = DensitySet.of(list);
        Density mean = set.mean();
        System.out.printf("Densa core demo: %d invented age profiles in %s%n", set.size(), space);
        System.out.printf("mean density: median %.2f, mean %.2f, sd %.2f%n", mean.quantile(0.5), mean.mean(),
                Math.sqrt(mean.variance()));
        double[] d = new double[set.size()];
        for (int i = 0; i < set.size(); i++) {
            d[i] = set.get(i).distance(mean);
        }
        int far = 0;
        for (int i = 1; i < d.length; i++) {
            if (d[i] > d[far]) {
                far = i;
            }
        }
        System.out.printf("profile farthest from the mean: #%d at B2 distance %.3f (median age %.1f)%n", far, d[far],
                set.get(far).quantile(0.5));
    }
}
