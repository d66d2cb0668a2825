package io.densa.spatial.spacetime;

import io.densa.core.Density;
import io.densa.core.internal.RecordArrays;
import java.util.Arrays;
import java.util.Objects;

/**
 * A space–time kriging prediction X̂(s_0, t_0) = ⊕_i λ_i ⊙ X(s_i, t_i).
 *
 * <p>Immutable: arrays are copied in and out.
 *
 * @param density    the predicted density
 * @param variance   the kriging variance E‖X(s_0, t_0) ⊖ X̂(s_0, t_0)‖²_B (trace)
 * @param neighbours the observations used (rows of the data)
 * @param weights    their weights λ_i, summing to 1
 */
public record SpaceTimePrediction(Density density, double variance, int[] neighbours, double[] weights) {
    /** Validates and copies. */
    public SpaceTimePrediction {
        Objects.requireNonNull(density, "density");
        neighbours = RecordArrays.copy(neighbours);
        weights = RecordArrays.copy(weights);
        if (neighbours.length != weights.length) {
            throw new IllegalArgumentException(neighbours.length + " neighbours but " + weights.length + " weights");
        }
    }

    /** A copy of the {@code neighbours} component. */
    @Override
    public int[] neighbours() {
        return RecordArrays.copy(neighbours);
    }

    /** A copy of the {@code weights} component. */
    @Override
    public double[] weights() {
        return RecordArrays.copy(weights);
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof SpaceTimePrediction)) {
            return false;
        }
        SpaceTimePrediction p = (SpaceTimePrediction) o;
        return density.equals(p.density) && Double.compare(variance, p.variance) == 0
                && Arrays.equals(neighbours, p.neighbours) && Arrays.equals(weights, p.weights);
    }

    @Override
    public int hashCode() {
        return Objects.hash(density, variance, Arrays.hashCode(neighbours), Arrays.hashCode(weights));
    }

    @Override
    public String toString() {
        return "SpaceTimePrediction[variance " + variance + ", " + neighbours.length + " neighbours]";
    }
}
