package io.densa.spatial.spacetime;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import java.util.HashMap;
import java.util.Map;
import java.util.Objects;

/**
 * Densities observed at (location, time) pairs: observation i is the density
 * {@code densities.get(i)} at location i of {@code locations} and time {@code times[i]} (a period
 * index or any other real time; lags are |t_i − t_j| in the same unit). A unit observed in many
 * periods appears once per period, with its location repeated.
 *
 * <p>Immutable and thread-safe; arrays are copied in and out.
 */
public final class SpaceTimeData {
    private final Locations locations;
    private final double[] times;
    private final DensitySet densities;

    private SpaceTimeData(Locations locations, double[] times, DensitySet densities) {
        this.locations = locations;
        this.times = times;
        this.densities = densities;
    }

    /**
     * Checks and wraps the observations.
     *
     * @param locations one location per observation (repeated for a unit seen in several periods)
     * @param times     one finite time per observation (copied)
     * @param densities one density per observation, in one space
     * @throws IllegalArgumentException when the three sizes differ, there are no observations, a
     *                                  time is not finite (naming the row), or two observations share
     *                                  both location and time (naming both rows: merge them first)
     */
    public static SpaceTimeData of(Locations locations, double[] times, DensitySet densities) {
        Objects.requireNonNull(locations, "locations");
        Objects.requireNonNull(times, "times");
        Objects.requireNonNull(densities, "densities");
        int n = locations.size();
        if (times.length != n || densities.size() != n) {
            throw new IllegalArgumentException("locations (" + n + "), times (" + times.length + ") and densities ("
                    + densities.size() + ") must have one entry per observation each");
        }
        if (n == 0) {
            throw new IllegalArgumentException("there are no observations; at least one is needed");
        }
        double[] t = times.clone();
        Map<Key, Integer> seen = new HashMap<>();
        for (int i = 0; i < n; i++) {
            if (!Double.isFinite(t[i])) {
                throw new IllegalArgumentException("time of observation " + i + " is " + t[i]
                        + "; accepted are finite numbers (for example period indices)");
            }
            Key key = new Key(locations.x(i) + 0.0, locations.y(i) + 0.0, t[i] + 0.0);
            Integer other = seen.putIfAbsent(key, i);
            if (other != null) {
                throw new IllegalArgumentException("observations " + other + " and " + i + " share location ("
                        + locations.x(i) + ", " + locations.y(i) + ") and time " + t[i]
                        + "; accepted is at most one density per location and time: merge them first");
            }
        }
        return new SpaceTimeData(locations, t, densities);
    }

    private record Key(double x, double y, double t) {
    }

    /** Number of observations. */
    public int size() {
        return times.length;
    }

    /** The locations, one per observation. */
    public Locations locations() {
        return locations;
    }

    /** The times, one per observation (a copy). */
    public double[] times() {
        return times.clone();
    }

    /** Time of observation i. */
    public double time(int i) {
        return times[i];
    }

    /** The densities, one per observation. */
    public DensitySet densities() {
        return densities;
    }

    /** The densities' space. */
    public BayesSpace space() {
        return densities.space();
    }

    /** Spatial lag between observations i and j (the locations' distance). */
    public double spatialLag(int i, int j) {
        return locations.distance(i, j);
    }

    /** Temporal lag |t_i − t_j|. */
    public double temporalLag(int i, int j) {
        return Math.abs(times[i] - times[j]);
    }

    /**
     * The observations at rows {@code rows}, in that order.
     *
     * @throws IllegalArgumentException naming a row outside 0..size()−1 or a repeated row
     */
    public SpaceTimeData subset(int... rows) {
        Objects.requireNonNull(rows, "rows");
        double[] t = new double[rows.length];
        for (int r = 0; r < rows.length; r++) {
            if (rows[r] < 0 || rows[r] >= times.length) {
                throw new IllegalArgumentException("subset row " + r + " is " + rows[r] + "; accepted are 0.."
                        + (times.length - 1));
            }
            t[r] = times[rows[r]];
        }
        return of(locations.subset(rows), t, densities.subset(rows));
    }

    @Override
    public String toString() {
        return "SpaceTimeData[n=" + times.length + ", " + locations.kind() + ", K=" + densities.dimension() + "]";
    }
}
