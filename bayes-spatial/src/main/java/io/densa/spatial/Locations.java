package io.densa.spatial;

import io.densa.spatial.internal.GreatCircle;
import io.densa.spatial.internal.Scaling;
import java.util.Objects;

/**
 * Point locations of spatial units: planar coordinates (projected, any consistent unit such as
 * metres or kilometres) or geographic longitude/latitude in degrees, with distances in
 * kilometres along the great circle.
 *
 * <p>Great-circle distances use the haversine form on a sphere of mean Earth radius
 * {@value #EARTH_RADIUS_KM} km (IUGG mean radius R1; Moritz (2000), Geodetic Reference System
 * 1980, J. Geodesy 74 — from memory).
 *
 * <p>Immutable and thread-safe; arrays are copied in and out.
 */
public final class Locations {
    /** Mean Earth radius R1 in kilometres used for geographic distances. */
    public static final double EARTH_RADIUS_KM = GreatCircle.RADIUS_KM;

    /** Coordinate system of the locations. */
    public enum Kind {
        /** Planar (projected) coordinates; Euclidean distance in the same unit. */
        PLANAR,
        /** Longitude/latitude in degrees; great-circle distance in kilometres. */
        GEOGRAPHIC
    }

    private final Kind kind;
    private final double[] x;
    private final double[] y;
    /** Bounding box {minX, minY, maxX, maxY}; null when there are no locations. */
    private final double[] box;

    private Locations(Kind kind, double[] x, double[] y) {
        this.kind = kind;
        this.x = x;
        this.y = y;
        this.box = x.length == 0 ? null : box(x, y);
    }

    private static double[] box(double[] x, double[] y) {
        double[] bb = {x[0], y[0], x[0], y[0]};
        for (int i = 1; i < x.length; i++) {
            bb[0] = Math.min(bb[0], x[i]);
            bb[1] = Math.min(bb[1], y[i]);
            bb[2] = Math.max(bb[2], x[i]);
            bb[3] = Math.max(bb[3], y[i]);
        }
        return bb;
    }

    /**
     * Planar locations.
     *
     * @param x first coordinates (copied)
     * @param y second coordinates (copied)
     * @throws IllegalArgumentException on mismatched lengths, a non-finite coordinate (naming the
     *                                  index), or a bounding box whose diagonal overflows a double
     */
    public static Locations planar(double[] x, double[] y) {
        check(x, y);
        checkSpan(x, y);
        return new Locations(Kind.PLANAR, x.clone(), y.clone());
    }

    /** Planar locations from rows {x, y}. */
    public static Locations planar(double[][] xy) {
        Objects.requireNonNull(xy, "xy");
        double[] x = new double[xy.length];
        double[] y = new double[xy.length];
        for (int i = 0; i < xy.length; i++) {
            if (xy[i] == null || xy[i].length != 2) {
                throw new IllegalArgumentException("location " + i + " must have exactly 2 coordinates");
            }
            x[i] = xy[i][0];
            y[i] = xy[i][1];
        }
        return planar(x, y);
    }

    /**
     * Geographic locations in degrees.
     *
     * @throws IllegalArgumentException if a latitude is outside [−90, 90], a longitude outside
     *                                  [−180, 360], or a value is not finite (the check of
     *                                  {@link #requirePoint}, naming the index)
     */
    public static Locations geographic(double[] longitude, double[] latitude) {
        checkLengths(longitude, latitude);
        for (int i = 0; i < latitude.length; i++) {
            checkGeographic(longitude[i], latitude[i], "location " + i);
        }
        return new Locations(Kind.GEOGRAPHIC, longitude.clone(), latitude.clone());
    }

    /**
     * The one check of a geographic point: longitude in [−180, 360] and latitude in [−90, 90]
     * (NaN fails both). Used for locations, for targets of prediction and neighbour queries, and by
     * {@link #greatCircleKm}.
     *
     * @param what names the point in the message ("location 3", "target", ...)
     */
    static void checkGeographic(double lon, double lat, String what) {
        if (!(lat >= -90 && lat <= 90) || !(lon >= -180 && lon <= 360)) {
            throw new IllegalArgumentException(what + " (longitude " + lon + ", latitude " + lat + ") is not a"
                    + " geographic point: longitude must be in [-180, 360] and latitude in [-90, 90] degrees");
        }
    }

    /**
     * Checks a point given in this coordinate system, as every query with a caller's point does
     * (prediction targets, neighbour queries, {@link #distanceTo}): planar points must be finite and
     * lie close enough to the locations that their distances stay finite — the distance from the
     * point to the farthest corner of the locations' bounding box must be a finite double, which
     * bounds its distance to every location; geographic points as in {@link #geographic}. O(1).
     *
     * @param what names the point in the message
     * @throws IllegalArgumentException naming the point and what would be accepted
     */
    public void requirePoint(double px, double py, String what) {
        if (kind == Kind.GEOGRAPHIC) {
            checkGeographic(px, py, what);
            return;
        }
        if (!Double.isFinite(px) || !Double.isFinite(py)) {
            throw new IllegalArgumentException(what + " must be finite, got (" + px + ", " + py + ")");
        }
        if (box != null) {
            double dx = Math.max(Math.abs(px - box[0]), Math.abs(px - box[2]));
            double dy = Math.max(Math.abs(py - box[1]), Math.abs(py - box[3]));
            if (!(Scaling.planarNorm(dx, dy) <= Double.MAX_VALUE)) {
                throw new IllegalArgumentException(what + " (" + px + ", " + py + ") is so far from the locations"
                        + " (bounding box [" + box[0] + ", " + box[2] + "] x [" + box[1] + ", " + box[3] + "]) that"
                        + " its distance to them overflows a double; accepted are points whose distance to every"
                        + " corner of that box is below about 1.8e308");
            }
        }
    }

    /** Throws unless 0 &lt;= i &lt; size(), naming the index, what it was for, and the size. */
    private void checkIndex(int i, String what) {
        if (i < 0 || i >= x.length) {
            throw new IllegalArgumentException(what + " index " + i + " is out of range: "
                    + (x.length == 0 ? "there are no locations" : "accepted are 0.." + (x.length - 1) + " ("
                    + x.length + " locations)"));
        }
    }

    private static void checkLengths(double[] x, double[] y) {
        Objects.requireNonNull(x, "x");
        Objects.requireNonNull(y, "y");
        if (x.length != y.length) {
            throw new IllegalArgumentException("coordinate arrays differ in length: " + x.length + " and " + y.length);
        }
    }

    private static void check(double[] x, double[] y) {
        checkLengths(x, y);
        for (int i = 0; i < x.length; i++) {
            if (!Double.isFinite(x[i]) || !Double.isFinite(y[i])) {
                throw new IllegalArgumentException("location " + i + " has a non-finite coordinate (" + x[i] + ", "
                        + y[i] + ")");
            }
        }
    }

    /** Planar only: the distance between the two farthest corners of the bounding box must be finite. */
    private static void checkSpan(double[] x, double[] y) {
        double x0 = Double.POSITIVE_INFINITY, x1 = Double.NEGATIVE_INFINITY;
        double y0 = Double.POSITIVE_INFINITY, y1 = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < x.length; i++) {
            x0 = Math.min(x0, x[i]);
            x1 = Math.max(x1, x[i]);
            y0 = Math.min(y0, y[i]);
            y1 = Math.max(y1, y[i]);
        }
        if (x.length > 0 && !Double.isFinite(Scaling.planarNorm(x1 - x0, y1 - y0))) {
            throw new IllegalArgumentException("the locations span [" + x0 + ", " + x1 + "] x [" + y0 + ", " + y1
                    + "], whose diagonal overflows a double; shift or rescale the coordinates (spans up to about"
                    + " 1e308 are accepted)");
        }
    }

    /** Number of locations. */
    public int size() {
        return x.length;
    }

    /** The coordinate system. */
    public Kind kind() {
        return kind;
    }

    /**
     * First coordinate (x, or longitude) of location i.
     *
     * @throws IllegalArgumentException unless 0 &lt;= i &lt; {@link #size()}
     */
    public double x(int i) {
        checkIndex(i, "location");
        return x[i];
    }

    /**
     * Second coordinate (y, or latitude) of location i.
     *
     * @throws IllegalArgumentException unless 0 &lt;= i &lt; {@link #size()}
     */
    public double y(int i) {
        checkIndex(i, "location");
        return y[i];
    }

    /** First coordinates (fresh copy). */
    public double[] xs() {
        return x.clone();
    }

    /** Second coordinates (fresh copy). */
    public double[] ys() {
        return y.clone();
    }

    /**
     * Distance between locations i and j (always finite: planar locations are checked at
     * construction so that the diagonal of their bounding box is finite).
     *
     * @throws IllegalArgumentException unless both indices are in 0..size()−1
     */
    public double distance(int i, int j) {
        checkIndex(i, "first location");
        checkIndex(j, "second location");
        return unchecked(x[i], y[i], x[j], y[j]);
    }

    /**
     * Distance from location i to a point given in the same coordinate system.
     *
     * @throws IllegalArgumentException if i is out of range or the point fails {@link #requirePoint}
     */
    public double distanceTo(int i, double px, double py) {
        checkIndex(i, "location");
        requirePoint(px, py, "point");
        return unchecked(x[i], y[i], px, py);
    }

    /**
     * Distance between two points in this coordinate system: Euclidean for planar points
     * (computed so that it neither overflows nor underflows), great-circle km otherwise.
     *
     * @throws IllegalArgumentException if a point fails {@link #requirePoint}, or (planar) the
     *                                  distance between the two points overflows a double
     */
    public double distance(double x1, double y1, double x2, double y2) {
        requirePoint(x1, y1, "first point");
        requirePoint(x2, y2, "second point");
        double d = unchecked(x1, y1, x2, y2);
        if (!(d <= Double.MAX_VALUE)) {
            throw new IllegalArgumentException("the distance between (" + x1 + ", " + y1 + ") and (" + x2 + ", " + y2
                    + ") overflows a double; accepted are points less than about 1.8e308 apart");
        }
        return d;
    }

    /** {@link #distance(double, double, double, double)} for points already checked. */
    double unchecked(double x1, double y1, double x2, double y2) {
        if (kind == Kind.PLANAR) {
            return Scaling.planarNorm(x1 - x2, y1 - y2);
        }
        return GreatCircle.km(x1, y1, x2, y2);
    }

    /**
     * Great-circle distance in km between two (longitude, latitude) points in degrees on the sphere
     * of radius R = {@link #EARTH_RADIUS_KM}, from the chord c = ‖u_1 − u_2‖ between the points'
     * unit vectors u = (cos φ cos λ, cos φ sin λ, sin φ): d = 2R asin(c / 2), which equals the
     * haversine formula (Sinnott (1984), Virtues of the haversine, Sky and Telescope 68(2) — from
     * memory) since hav(d / R) = (c / 2)². Beyond a quarter circle (c² &gt; 2), where asin loses
     * accuracy, d = R (π − 2 asin(c' / 2)) with the chord c' = ‖u_1 + u_2‖ to the antipode. The
     * chord form is the one the variogram uses to reject pairs on the squared chord before any
     * square root, so every geographic distance in the module is computed by the same operations
     * and a pair on a bin edge bins the same way everywhere.
     *
     * @throws IllegalArgumentException if a point is not a geographic point (longitude in
     *                                  [−180, 360], latitude in [−90, 90]; NaN fails)
     */
    public static double greatCircleKm(double lon1, double lat1, double lon2, double lat2) {
        checkGeographic(lon1, lat1, "first point");
        checkGeographic(lon2, lat2, "second point");
        return GreatCircle.km(lon1, lat1, lon2, lat2);
    }

    /**
     * Bounding box {minX, minY, maxX, maxY} (fresh array).
     *
     * @throws IllegalStateException if there are no locations (an empty set has no bounding box)
     */
    public double[] boundingBox() {
        if (box == null) {
            throw new IllegalStateException("there are no locations, so there is no bounding box; check size() > 0"
                    + " first");
        }
        return box.clone();
    }

    /**
     * Subset of locations in the given order (repeats allowed).
     *
     * @throws IllegalArgumentException naming the first row index outside 0..size()−1
     */
    public Locations subset(int... rows) {
        Objects.requireNonNull(rows, "rows");
        double[] nx = new double[rows.length];
        double[] ny = new double[rows.length];
        for (int r = 0; r < rows.length; r++) {
            checkIndex(rows[r], "subset row " + r + ": location");
            nx[r] = x[rows[r]];
            ny[r] = y[rows[r]];
        }
        return new Locations(kind, nx, ny);
    }

    @Override
    public String toString() {
        return "Locations[" + kind + ", n=" + x.length + "]";
    }
}
