package io.densa.spatial.uncertainty;

import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.core.internal.RecordArrays;

/**
 * The Gaussian predictive law of the coordinates at one location: mean the kriged coordinates,
 * covariance σ² Σ/tr Σ with σ² the kriging variance and Σ the coordinates' covariance (see
 * {@link PredictiveDistribution} for the model). Immutable: the covariance is copied on
 * construction and by its accessor; equality is by content.
 *
 * @param prediction the kriging prediction (kriged density, kriging variance σ² = tr of the
 *                   covariance, neighbours, nearest-station distance)
 * @param covariance the K × K predictive covariance of the coordinates
 */
public record CoordinateLaw(KrigingPrediction prediction, double[][] covariance) {

    /** Copies the covariance (the caller keeps its array). */
    public CoordinateLaw {
        covariance = RecordArrays.copy(covariance);
    }

    /** A copy of the {@code covariance} component. */
    @Override
    public double[][] covariance() {
        return RecordArrays.copy(covariance);
    }

    /** The predictive mean of the coordinates (the kriged density's coordinates). */
    public double[] mean() {
        return prediction.density().coordinates();
    }

    /** Equality by content of every component. */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    /** The components, arrays printed by content. */
    @Override
    public String toString() {
        return RecordArrays.describe(this);
    }
}
