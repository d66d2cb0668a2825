package io.densa.spark;

import io.densa.regression.Fpca;
import io.densa.regression.FpcaMoments;
import java.io.Serializable;
import java.util.Objects;

/**
 * A fitted FPCA as the numbers it was fitted from — the space definition, the number of densities, the
 * coordinate mean and covariance — to broadcast to executors. {@link #fpca()} rebuilds it once per
 * JVM with {@link FpcaMoments#fit}; the eigen-decomposition is deterministic, so executors hold an
 * FPCA bit-identical to the driver's and compute the same scores.
 *
 * <p>Immutable.
 */
public final class FpcaSpec implements Serializable {
    private static final long serialVersionUID = 1L;

    private final SpaceSpec space;
    private final long n;
    private final double[] mean;
    private final double[] covariance;
    private final PerJvm<Fpca> fpca = new PerJvm<>();

    FpcaSpec(SpaceSpec space, long n, double[] mean, double[] covariance) {
        this.space = Objects.requireNonNull(space, "space");
        this.n = n;
        this.mean = mean.clone();
        this.covariance = covariance.clone();
        fpca();
    }

    /**
     * The spec of the FPCA of n densities with the given coordinate moments.
     *
     * @throws IllegalArgumentException as {@link FpcaMoments#fit}
     */
    public static FpcaSpec of(SpaceSpec space, long n, double[] mean, double[] covariance) {
        Objects.requireNonNull(mean, "mean");
        Objects.requireNonNull(covariance, "covariance");
        return new FpcaSpec(space, n, mean, covariance);
    }

    /** The FPCA (built once per JVM). */
    public Fpca fpca() {
        return fpca.get(() -> FpcaMoments.fit(space.space(), n, mean, covariance));
    }

    /** The space definition. */
    public SpaceSpec space() {
        return space;
    }

    /** Number of densities the moments summarise. */
    public long size() {
        return n;
    }

    /** Mean coordinates (fresh copy). */
    public double[] mean() {
        return mean.clone();
    }

    /** Covariance, K × K row-major, divisor n − 1 (fresh copy). */
    public double[] covariance() {
        return covariance.clone();
    }

    @Override
    public String toString() {
        return "FpcaSpec[" + space + ", n=" + n + "]";
    }
}
