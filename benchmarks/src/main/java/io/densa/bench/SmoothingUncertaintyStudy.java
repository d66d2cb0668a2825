package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.util.Arrays;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * Replicate study of the reported estimation variance with λ chosen per unit (the default): for three
 * smooth seasonal truths (invented; the recipe of {@link SideBySide}'s histograms) and 20–1,000
 * events over 365 daily bins (cubic splines, K = 24), REPS replicates each are fitted with every
 * default; printed per case: the reported trace over the empirical trace of the replicates' coordinates
 * (mean, median, 90 % quantile, largest) and the empirical trace E. Usage:
 * {@code java -cp benchmarks/target/benchmarks.jar io.densa.bench.SmoothingUncertaintyStudy 300}.
 */
public final class SmoothingUncertaintyStudy {
    private SmoothingUncertaintyStudy() {
    }

    /** Bin probabilities of the seasonal law 0.2 + α/(1 + (d(x, φ)/40)²) + β/(1 + (d(x, ψ)/12)²), d circular. */
    static double[] truth(double alpha, double phi, double beta, double psi) {
        double[] w = new double[365];
        double s = 0;
        for (int j = 0; j < 365; j++) {
            double x = j + 0.5;
            double d1 = Math.abs(x - phi);
            d1 = Math.min(d1, 365 - d1) / 40;
            double d2 = Math.abs(x - psi);
            d2 = Math.min(d2, 365 - d2) / 12;
            w[j] = 0.2 + alpha / (1 + d1 * d1) + beta / (1 + d2 * d2);
            s += w[j];
        }
        for (int j = 0; j < 365; j++) {
            w[j] /= s;
        }
        return w;
    }

    /**
     * Runs the study.
     *
     * @param args REPS (replicates per case)
     */
    public static void main(String[] args) {
        int reps = Integer.parseInt(args[0]);
        int[] ns = {20, 30, 50, 100, 300, 1000};
        double[][] pars = {{1.2, 100, 0.5, 250}, {0.4, 200, 0.8, 30}, {1.8, 300, 0.1, 150}};
        BayesSpace space = BayesSpace.splines(0, 365, 4, 21);
        double[] edges = new double[366];
        for (int j = 0; j <= 365; j++) {
            edges[j] = j;
        }
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
        SplittableRandom rng = new SplittableRandom(42);
        System.out.println("truth events  mean(T)/E  median  q90  largest  E   (" + reps + " replicates)");
        for (int t = 0; t < pars.length; t++) {
            double[] p = truth(pars[t][0], pars[t][1], pars[t][2], pars[t][3]);
            double[] cum = new double[365];
            double c = 0;
            for (int j = 0; j < 365; j++) {
                c += p[j];
                cum[j] = c;
            }
            for (int n : ns) {
                int[][] counts = new int[reps][365];
                for (int r = 0; r < reps; r++) {
                    for (int e = 0; e < n; e++) {
                        int j = Arrays.binarySearch(cum, rng.nextDouble() * c);
                        j = j < 0 ? -j - 1 : j;
                        counts[r][Math.min(364, j)]++;
                    }
                }
                String[] ids = new String[reps];
                Arrays.setAll(ids, i -> "r" + i);
                BatchEstimate b = est.fitAll(edges, counts, ids);
                double[] co = b.densities().coordinatesRowMajor();
                int k = b.densities().dimension();
                double[] mean = new double[k];
                for (int r = 0; r < reps; r++) {
                    for (int i = 0; i < k; i++) {
                        mean[i] += co[r * k + i] / reps;
                    }
                }
                double e2 = 0;
                for (int r = 0; r < reps; r++) {
                    for (int i = 0; i < k; i++) {
                        double d = co[r * k + i] - mean[i];
                        e2 += d * d / (reps - 1);
                    }
                }
                double[] tr = new double[reps];
                double mt = 0;
                for (int r = 0; r < reps; r++) {
                    tr[r] = b.diagnostics().get(r).estimationVariance() / e2;
                    mt += tr[r] / reps;
                }
                Arrays.sort(tr);
                System.out.printf(Locale.ROOT, "%d %5d  %.3f  %.3f  %.3f  %.2f  %.4g%n", t, n, mt, tr[reps / 2],
                        tr[(int) (0.9 * reps)], tr[reps - 1], e2);
            }
        }
    }
}
