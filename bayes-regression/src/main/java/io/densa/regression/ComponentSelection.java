package io.densa.regression;

import io.densa.core.ProgressListener;
import java.util.Objects;

/**
 * How {@link Fpca#chooseComponents(io.densa.core.DensitySet, ComponentSelection)} chooses the
 * number of FPCA components: by cross-validated reconstruction error, the smallest m whose held-out
 * error is at most (1 − fraction) times the error with no component.
 *
 * <p>Start from {@link #withDefaults()} and change what differs:
 * {@code ComponentSelection.withDefaults().withFraction(0.95).withCrossValidation(10, 7)}.
 *
 * @param maxComponents largest count tried, ≥ 1, or 0 for min(K, 20)
 * @param fraction      target fraction of held-out variability, in (0, 1)
 * @param folds         number of cross-validation folds, ≥ 2
 * @param seed          seed of the random fold assignment
 * @param progress      progress listener ({@link ProgressListener#NONE} for none)
 */
public record ComponentSelection(int maxComponents, double fraction, int folds, long seed,
        ProgressListener progress) {
    /** Largest count tried by default, when K is larger. */
    public static final int DEFAULT_MAX_COMPONENTS = 20;

    /** Validates. */
    public ComponentSelection {
        if (maxComponents < 0) {
            throw new IllegalArgumentException("maxComponents must be >= 1 (or 0 for min(K, "
                    + DEFAULT_MAX_COMPONENTS + ")), got " + maxComponents);
        }
        if (!(fraction > 0 && fraction < 1)) {
            throw new IllegalArgumentException("fraction must be in (0, 1), got " + fraction);
        }
        if (folds < 2) {
            throw new IllegalArgumentException("folds must be >= 2, got " + folds);
        }
        Objects.requireNonNull(progress, "progress");
    }

    /** min(K, 20) components at most, fraction 0.9, 5 folds, seed 0, no progress listener. */
    public static ComponentSelection withDefaults() {
        return new ComponentSelection(0, 0.9, 5, 0L, ProgressListener.NONE);
    }

    /** The largest count tried, 1..K. */
    public ComponentSelection withMaxComponents(int m) {
        if (m < 1) {
            throw new IllegalArgumentException("maxComponents must be >= 1, got " + m);
        }
        return new ComponentSelection(m, fraction, folds, seed, progress);
    }

    /** The target fraction of held-out variability, in (0, 1). */
    public ComponentSelection withFraction(double f) {
        return new ComponentSelection(maxComponents, f, folds, seed, progress);
    }

    /** The number of folds (2..n) and the seed of their random assignment. */
    public ComponentSelection withCrossValidation(int k, long s) {
        return new ComponentSelection(maxComponents, fraction, k, s, progress);
    }

    /**
     * Reports progress to a listener: task {@code "cross-validation"}, one unit per fold, from the
     * calling thread. The listener does not change the result.
     */
    public ComponentSelection withProgressListener(ProgressListener listener) {
        return new ComponentSelection(maxComponents, fraction, folds, seed, listener);
    }

    /** The largest count tried for a space of dimension k. */
    int maxFor(int k) {
        return maxComponents == 0 ? Math.min(k, DEFAULT_MAX_COMPONENTS) : maxComponents;
    }
}
