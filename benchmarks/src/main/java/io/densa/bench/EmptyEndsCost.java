package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.DetectionLimits;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.PenalizedLikelihoodEstimator.EmptyEnds;
import java.util.Arrays;
import java.util.Locale;

/**
 * What the estimator's readings of empty end runs cost on the side-by-side histograms (365 daily
 * bins, cubic splines K = 24, 20–2,000 events per unit): for each reading, λ fixed (5·10⁴) and λ
 * chosen by the default criterion, the best of ROUNDS timed runs of {@code fitAll} over UNITS units
 * (alternating the readings within each round). Prints how many units each reading censors.
 *
 * <pre>
 *   java -cp benchmarks/target/benchmarks.jar io.densa.bench.EmptyEndsCost [UNITS=4000] [ROUNDS=4]
 * </pre>
 */
public final class EmptyEndsCost {
    private EmptyEndsCost() {
    }

    /**
     * Runs the comparison.
     *
     * @param args UNITS and ROUNDS (optional)
     */
    public static void main(String[] args) {
        int units = args.length > 0 ? Integer.parseInt(args[0]) : 4000;
        int rounds = args.length > 1 ? Integer.parseInt(args[1]) : 4;
        int[][] counts = SideBySide.histograms(7, units);
        double[] edges = new double[366];
        for (int j = 0; j <= 365; j++) {
            edges[j] = j;
        }
        String[] ids = new String[units];
        Arrays.setAll(ids, i -> "u" + i);
        double[][] asDoubles = Arrays.stream(counts).map(r -> Arrays.stream(r).asDoubleStream().toArray())
                .toArray(double[][]::new);
        DetectionLimits runs = DetectionLimits.emptyEnds(edges, asDoubles);
        int withRuns = 0;
        int dense = 0;
        for (int i = 0; i < units; i++) {
            withRuns += runs.censored(i) ? 1 : 0;
            dense += runs.censored(i) && Arrays.stream(counts[i]).sum() >= DetectionLimits.DENSE_EVENTS_PER_BIN * 365
                    ? 1 : 0;
        }
        System.out.printf(Locale.ROOT, "%d units: %d with empty end runs (CENSORED censors them), %d of them dense"
                + " (CENSORED_IF_DENSE)%n", units, withRuns, dense);
        PenalizedLikelihoodEstimator base = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(0, 365, 4, 21));
        for (boolean fixed : new boolean[] {true, false}) {
            PenalizedLikelihoodEstimator est = fixed ? base.withSmoothing(5e4) : base;
            double[] best = new double[EmptyEnds.values().length];
            Arrays.fill(best, Double.POSITIVE_INFINITY);
            for (int r = 0; r < rounds; r++) {
                for (EmptyEnds e : EmptyEnds.values()) {
                    long t0 = System.nanoTime();
                    est.withEmptyEnds(e).fitAll(edges, counts, ids);
                    best[e.ordinal()] = Math.min(best[e.ordinal()], (System.nanoTime() - t0) * 1e-9);
                }
            }
            for (EmptyEnds e : EmptyEnds.values()) {
                System.out.printf(Locale.ROOT, "lambda %s, %s: best %.3f s (%.2f x COUNTED)%n",
                        fixed ? "fixed" : "chosen", e, best[e.ordinal()],
                        best[e.ordinal()] / best[EmptyEnds.COUNTED.ordinal()]);
            }
        }
    }
}
