package io.densa.spark;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import java.io.Serializable;
import java.util.Objects;

/**
 * Locations and the coordinates of the densities observed there, as primitive arrays to broadcast:
 * x (or longitude), y (or latitude), whether they are geographic, the space definition and the n × K
 * row-major coordinates. {@link #locations()} and {@link #densities()} rebuild the objects once per JVM
 * through the public factories, from the same numbers, so an executor holds the driver's data.
 * Immutable.
 */
public final class LocationData implements Serializable {
    private static final long serialVersionUID = 1L;

    private final double[] x;
    private final double[] y;
    private final boolean geographic;
    private final SpaceSpec space;
    private final double[] coordinates;
    private final int n;
    private final PerJvm<Locations> locations = new PerJvm<>();
    private final PerJvm<DensitySet> densities = new PerJvm<>();

    private LocationData(double[] x, double[] y, boolean geographic, SpaceSpec space, double[] coordinates, int n) {
        this.x = x;
        this.y = y;
        this.geographic = geographic;
        this.space = space;
        this.coordinates = coordinates;
        this.n = n;
    }

    /**
     * The data of the given locations and densities (copied).
     *
     * @throws IllegalArgumentException if the sizes differ or the space cannot be described
     *                                  ({@link SpaceSpec#of})
     */
    public static LocationData of(Locations locations, DensitySet densities) {
        Objects.requireNonNull(locations, "locations");
        Objects.requireNonNull(densities, "densities");
        if (locations.size() != densities.size()) {
            throw new IllegalArgumentException("locations (" + locations.size() + ") and densities ("
                    + densities.size() + ") differ in number");
        }
        return new LocationData(locations.xs(), locations.ys(), locations.kind() == Locations.Kind.GEOGRAPHIC,
                SpaceSpec.of(densities.space()), densities.coordinatesRowMajor(), densities.size());
    }

    /** As {@link #of(Locations, DensitySet)} with a given space definition (e.g. a weighted reference). */
    public static LocationData of(Locations locations, DensitySet densities, SpaceSpec space) {
        Objects.requireNonNull(locations, "locations");
        Objects.requireNonNull(densities, "densities");
        Objects.requireNonNull(space, "space");
        if (locations.size() != densities.size()) {
            throw new IllegalArgumentException("locations (" + locations.size() + ") and densities ("
                    + densities.size() + ") differ in number");
        }
        if (densities.dimension() != space.dimension()) {
            throw new IllegalArgumentException("densities have dimension " + densities.dimension() + ", the space "
                    + space.dimension());
        }
        return new LocationData(locations.xs(), locations.ys(), locations.kind() == Locations.Kind.GEOGRAPHIC,
                space, densities.coordinatesRowMajor(), densities.size());
    }

    /** Number of locations. */
    public int size() {
        return n;
    }

    /** The space definition. */
    public SpaceSpec space() {
        return space;
    }

    /** The locations (built once per JVM). */
    public Locations locations() {
        return locations.get(() -> geographic ? Locations.geographic(x, y) : Locations.planar(x, y));
    }

    /** The densities (built once per JVM). */
    public DensitySet densities() {
        return densities.get(() -> DensitySet.ofRowMajor(space.space(), coordinates, n, null));
    }
}
