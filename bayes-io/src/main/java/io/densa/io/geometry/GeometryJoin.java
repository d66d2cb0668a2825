package io.densa.io.geometry;

import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import java.util.List;
import java.util.Objects;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.Point;

/**
 * A table joined to unit geometries by id ({@link UnitGeometries#join}): the matched units in table
 * order, and the ids that did not match on either side. Spatial weights built from a join follow the
 * table's order, and require every table id to have a geometry ({@link #requireComplete}).
 *
 * @param ids              matched ids, in table order
 * @param geometries       their geometries
 * @param tableRows        the table row of each matched id
 * @param withoutGeometry  table ids with no geometry in the file, in table order
 * @param withoutData      file ids with no row in the table, in file order
 * @param geographic       whether coordinates are longitude/latitude
 * @param source           the geometry file
 */
public record GeometryJoin(List<String> ids, List<Geometry> geometries, int[] tableRows,
        List<String> withoutGeometry, List<String> withoutData, boolean geographic, String source) {

    /** Copies the lists. */
    public GeometryJoin {
        ids = List.copyOf(ids);
        geometries = List.copyOf(geometries);
        tableRows = tableRows.clone();
        withoutGeometry = List.copyOf(withoutGeometry);
        withoutData = List.copyOf(withoutData);
        Objects.requireNonNull(source, "source");
    }

    @Override
    public int[] tableRows() {
        return tableRows.clone();
    }

    /** Whether every table id has a geometry. */
    public boolean isComplete() {
        return withoutGeometry.isEmpty();
    }

    /**
     * Checks that every table id has a geometry.
     *
     * @throws IllegalArgumentException listing (up to 20 of) the ids without geometry
     */
    public GeometryJoin requireComplete() {
        if (!withoutGeometry.isEmpty()) {
            List<String> show = withoutGeometry.size() <= 20 ? withoutGeometry : withoutGeometry.subList(0, 20);
            throw new IllegalArgumentException(source + ": " + withoutGeometry.size() + " table id(s) have no"
                    + " geometry: " + show + (withoutGeometry.size() > 20 ? " ..." : "")
                    + "; every unit needs a feature with that id");
        }
        return this;
    }

    /** Contiguity weights in table order (rook or queen); requires a complete join. */
    public SpatialWeights contiguity(SpatialWeights.Contiguity rule, double tolerance) {
        requireComplete();
        return contiguity(geometries, ids, rule, tolerance, source);
    }

    /** Locations (centroids) in table order; requires a complete join. See {@link UnitGeometries#locations}. */
    public Locations locations() {
        requireComplete();
        return locations(geometries, geographic);
    }

    /** k-nearest-neighbour weights between centroids in table order; see {@link SpatialWeights#nearestNeighbours}. */
    public SpatialWeights nearestNeighbours(int k, SpatialWeights.Symmetry symmetry) {
        return SpatialWeights.nearestNeighbours(locations(), k, symmetry);
    }

    /** Distance-band weights between centroids (km for geographic files); see {@link SpatialWeights#distanceBand}. */
    public SpatialWeights distanceBand(double maxDistance) {
        return SpatialWeights.distanceBand(locations(), maxDistance);
    }

    /** Inverse-distance weights between centroids; see {@link SpatialWeights#inverseDistance}. */
    public SpatialWeights inverseDistance(double power, double maxDistance) {
        return SpatialWeights.inverseDistance(locations(), power, maxDistance);
    }

    static SpatialWeights contiguity(List<Geometry> geoms, List<String> ids, SpatialWeights.Contiguity rule,
            double tolerance, String source) {
        try {
            return SpatialWeights.contiguity(geoms, rule, tolerance);
        } catch (IllegalArgumentException e) {
            String m = e.getMessage();
            java.util.regex.Matcher mt = java.util.regex.Pattern.compile("unit (\\d+)").matcher(m);
            if (mt.find()) {
                int i = Integer.parseInt(mt.group(1));
                if (i < ids.size()) {
                    m = m + " (id '" + ids.get(i) + "')";
                }
            }
            throw new IllegalArgumentException(source + ": " + m, e);
        }
    }

    static Locations locations(List<Geometry> geoms, boolean geographic) {
        int n = geoms.size();
        double[] x = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            Point p = UnitGeometries.centroid(geoms.get(i));
            x[i] = p.getX();
            y[i] = p.getY();
        }
        return geographic ? Locations.geographic(x, y) : Locations.planar(x, y);
    }
}
