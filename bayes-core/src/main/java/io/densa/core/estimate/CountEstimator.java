package io.densa.core.estimate;

import io.densa.core.BayesSpace;
import java.util.Objects;

/**
 * An estimator of densities from binned counts that share bin edges:
 * {@link PenalizedLikelihoodEstimator} and {@link SmoothingSplineEstimator}. Implementations are
 * immutable; a batch is fitted by {@link #fitAll}, one unit by {@link #fit}.
 */
public sealed interface CountEstimator permits PenalizedLikelihoodEstimator, SmoothingSplineEstimator {
    /** The space the densities are estimated in. */
    BayesSpace space();

    /**
     * Fits many units sharing bin edges.
     *
     * @param edges  D + 1 strictly increasing bin edges inside the domain, or spanning one period from any
     *               start on a periodic space (a bin may wrap around the cut point) (not modified)
     * @param counts n rows of D whole-number counts ≥ 0 (not modified)
     * @param ids    n ids, or null
     * @return the densities (ids kept) and per-unit diagnostics, in input order
     * @throws IllegalArgumentException naming the unit id and bin of the first bad count
     */
    BatchEstimate fitAll(double[] edges, int[][] counts, String[] ids);

    /** Fits many units of counts given as doubles; see {@link #fitAll(double[], int[][], String[])}. */
    BatchEstimate fitAll(double[] edges, double[][] counts, String[] ids);

    /**
     * Fits one unit of whole-number counts.
     *
     * @param edges  D + 1 strictly increasing bin edges inside the domain (not modified)
     * @param counts D counts ≥ 0 (not modified)
     * @throws IllegalArgumentException on bad edges or counts (naming the bin), or a zero total
     *                                  under {@link ZeroTotalPolicy#REJECT}
     */
    default UnitEstimate fit(double[] edges, int[] counts) {
        return fitAll(edges, new int[][] {Objects.requireNonNull(counts, "counts")}, null).unit(0);
    }

    /** Fits one unit of counts given as doubles (whole numbers unless the estimator accepts fractions). */
    default UnitEstimate fit(double[] edges, double[] counts) {
        return fitAll(edges, new double[][] {Objects.requireNonNull(counts, "counts")}, null).unit(0);
    }
}
