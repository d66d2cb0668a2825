package io.densa.regression;

import io.densa.core.BayesSpace;
import java.util.Objects;

/**
 * Simplicial FPCA from precomputed moments, for data that are summarised elsewhere (by a
 * distributed aggregation, or in chunks): given the number of densities n, the mean of their
 * coordinates c̄ and their sample covariance S (divisor n − 1), {@link #fit} returns the
 * {@link Fpca} that {@link Fpca#fit} returns for data with exactly these moments — the same
 * eigen-decomposition code runs on the same K × K matrix, so equal moments give a bit-identical
 * fit, and moments accurate to a relative ε give eigenvalues accurate to about ε (well-separated
 * eigenvalues also eigenvectors).
 *
 * <p>Stateless; arrays are copied, not modified.
 */
public final class FpcaMoments {
    private FpcaMoments() {
    }

    /**
     * The FPCA of n densities of the space with the given coordinate mean and covariance.
     *
     * @param space      the densities' space (dimension K)
     * @param n          number of densities, at least 2
     * @param mean       K finite coordinates of the ⊕-mean
     * @param covariance K × K row-major sample covariance (divisor n − 1), finite and symmetric
     * @throws IllegalArgumentException for n &lt; 2, wrong lengths, non-finite entries (naming the
     *                                  entry), an asymmetric covariance (naming the pair) or a
     *                                  negative diagonal entry
     */
    public static Fpca fit(BayesSpace space, long n, double[] mean, double[] covariance) {
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(mean, "mean");
        Objects.requireNonNull(covariance, "covariance");
        if (n < 2 || n > Integer.MAX_VALUE) {
            throw new IllegalArgumentException("FPCA needs at least 2 densities (and at most " + Integer.MAX_VALUE
                    + " for the sample size it reports), got " + n);
        }
        int k = space.dimension();
        if (mean.length != k) {
            throw new IllegalArgumentException("mean has " + mean.length + " coordinates; the space has dimension " + k);
        }
        if (covariance.length != k * k) {
            throw new IllegalArgumentException("covariance has " + covariance.length + " entries; " + k + " x " + k
                    + " = " + (k * k) + " expected (row-major)");
        }
        for (int i = 0; i < k; i++) {
            if (!Double.isFinite(mean[i])) {
                throw new IllegalArgumentException("mean coordinate " + i + " is not finite: " + mean[i]);
            }
        }
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                double v = covariance[i * k + j];
                if (!Double.isFinite(v)) {
                    throw new IllegalArgumentException("covariance entry (" + i + ", " + j + ") is not finite: " + v);
                }
                if (j > i && Double.compare(v, covariance[j * k + i]) != 0) {
                    throw new IllegalArgumentException("covariance is not symmetric: entry (" + i + ", " + j + ") = "
                            + v + " but (" + j + ", " + i + ") = " + covariance[j * k + i]);
                }
            }
            if (!(covariance[i * k + i] >= 0)) {
                throw new IllegalArgumentException("covariance diagonal entry " + i + " is negative: "
                        + covariance[i * k + i]);
            }
        }
        return Fpca.fromMoments(space, (int) n, mean, covariance.clone());
    }
}
