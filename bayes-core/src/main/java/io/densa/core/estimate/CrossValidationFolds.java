package io.densa.core.estimate;

import io.densa.core.estimate.EstimationSupport.SampleData;
import io.densa.core.internal.Seeds;
import java.util.SplittableRandom;

/**
 * The fold structure of one unit for the cross-validation criterion of
 * {@link PenalizedLikelihoodEstimator}: held-out counts (each bin's events dealt into folds) or
 * held-out sample statistics, and the held-out log-likelihood summed over folds with every fit
 * started from the full fit. Owned by one unit's fit; not thread-safe.
 */
final class CrossValidationFolds {
    private final int k;
    private final int maxIterations;
    private final double searchTolerance;
    final PenalizedNewton eng;
    final int nf;
    final double[][] test; // counts mode: per fold test counts; sample mode: test linear stats
    final double[] testTotal;
    final double[] testTotal2;
    final double[] train;
    final double[] fullLinear;
    final double[] fullCounts;
    final double fullTotal;
    final double fullTotal2;
    final double[] start;

    CrossValidationFolds(PenalizedNewton eng, SampleData sample, int nf, long seed,
            int index, int k, int maxIterations, double searchTolerance) {
        this.k = k;
        this.maxIterations = maxIterations;
        this.searchTolerance = searchTolerance;
        this.eng = eng;
        this.nf = nf;
        SplittableRandom rnd = foldStream(seed, index);
        testTotal = new double[nf];
        testTotal2 = new double[nf];
        fullTotal = eng.total();
        fullTotal2 = eng.objective().total2();
        fullLinear = eng.objective().sampleStatistics();
        start = new double[k + 1];
        if (eng.hasCounts()) {
            int d = eng.bins().bins;
            fullCounts = eng.counts();
            test = new double[nf][d];
            splitCounts(fullCounts, nf, rnd, test, testTotal);
            train = new double[d];
        } else {
            fullCounts = null;
            int[] order = new int[sample.n];
            for (int i = 0; i < order.length; i++) {
                order[i] = i;
            }
            Seeds.shuffle(order, rnd);
            test = new double[nf][k + 1];
            for (int i = 0; i < order.length; i++) {
                int obs = order[i], f = i % nf;
                double w = sample.w[obs];
                testTotal[f] += w;
                testTotal2[f] += w * w;
                int fi = sample.first[obs];
                for (int j = 0; j < sample.width; j++) {
                    test[f][fi + j] += w * sample.vals[obs * sample.width + j];
                }
            }
            train = new double[k + 1];
        }
    }

    /** Minus the held-out log-likelihood summed over folds, fits started from the full fit. */
    double score(double lambda) {
        eng.copyCoefficientsTo(start);
        double sum = 0;
        for (int f = 0; f < nf && sum < Double.POSITIVE_INFINITY; f++) {
            if (!(testTotal[f] > 0) || !(fullTotal - testTotal[f] > 0)) {
                continue;
            }
            eng.setCoefficients(start);
            if (fullCounts != null) {
                for (int j = 0; j < train.length; j++) {
                    train[j] = fullCounts[j] - test[f][j];
                }
                eng.setCounts(train, fullTotal - testTotal[f]);
                eng.solveForSearch(lambda, maxIterations, searchTolerance);
                eng.evaluate(lambda);
                double logZ = Math.log(eng.objective().zScaled());
                for (int j = 0; j < train.length; j++) {
                    double c = test[f][j];
                    if (c > 0) {
                        sum -= c * (Math.log(eng.objective().mass(j)) - logZ);
                    }
                }
            } else {
                for (int j = 0; j <= k; j++) {
                    train[j] = fullLinear[j] - test[f][j];
                }
                eng.setSampleStatistics(train, fullTotal - testTotal[f], fullTotal2 - testTotal2[f]);
                eng.solveForSearch(lambda, maxIterations, searchTolerance);
                eng.evaluate(lambda);
                double[] beta = eng.coefficients();
                double tb = 0;
                for (int j = 0; j < k; j++) {
                    tb += test[f][j] * beta[j];
                }
                sum -= tb - testTotal[f] * (eng.objective().shift() + Math.log(eng.objective().zScaled()));
            }
        }
        // restore the full data and the full fit
        eng.restoreData(fullCounts, fullTotal, fullTotal2, fullLinear);
        eng.setCoefficients(start);
        eng.evaluate(lambda);
        return Double.isNaN(sum) ? Double.POSITIVE_INFINITY : sum;
    }

    /**
     * The generator of the cross-validation folds of unit {@code index}: an independent stream per
     * unit from {@link Seeds#stream} (SplitMix64 finaliser), so that no unit's stream is a shifted
     * copy of another's and the folds do not depend on the number of threads.
     */
    static SplittableRandom foldStream(long seed, int index) {
        return Seeds.stream(seed, index);
    }

    /**
     * Deals the events of each bin into folds independently with equal probabilities: for bin j
     * with n_j events the fold counts are multinomial(n_j; 1/k, …, 1/k), drawn as successive
     * binomials x_f ~ Bin(n_j − x_0 − … − x_{f−1}, 1/(k − f)) by inversion of the binomial
     * distribution function (Commons Math). Memory O(D k), independent of the number of events.
     *
     * @throws IllegalArgumentException for a bin with more than 2³¹ − 1 events
     */
    static void splitCounts(double[] counts, int nf, SplittableRandom rnd, double[][] test, double[] testTotal) {
        for (int j = 0; j < counts.length; j++) {
            double remaining = counts[j];
            if (remaining > Integer.MAX_VALUE) {
                throw new IllegalArgumentException("cross-validation supports at most " + Integer.MAX_VALUE
                        + " events per bin, bin " + j + " has " + remaining);
            }
            for (int f = 0; f < nf - 1 && remaining > 0; f++) {
                double u = rnd.nextDouble();
                double x = new org.apache.commons.math3.distribution.BinomialDistribution(null, (int) remaining,
                        1.0 / (nf - f)).inverseCumulativeProbability(u);
                test[f][j] = x;
                testTotal[f] += x;
                remaining -= x;
            }
            test[nf - 1][j] += remaining;
            testTotal[nf - 1] += remaining;
        }
    }
}
