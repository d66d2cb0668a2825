package io.densa.spatial;

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
    public static final double EARTH_RADIUS_KM = 6371.0088;

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

    private Locations(Kind kind, double[] x, double[] y) {
        this.kind = kind;
        this.x = x;
        this.y = y;
    }

    /**
     * Planar locations.
     *
     * @param x first coordinates (copied)
     * @param y second coordinates (copied)
     * @throws IllegalArgumentException on mismatched lengths or a non-finite coordinate (naming the
     *                                  index)
     */
    public static Locations planar(double[] x, double[] y) {
        check(x, y);
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
     *                                  [−180, 360], or a value is not finite
     */
    public static Locations geographic(double[] longitude, double[] latitude) {
        check(longitude, latitude);
        for (int i = 0; i < latitude.length; i++) {
            if (!(latitude[i] >= -90 && latitude[i] <= 90)) {
                throw new IllegalArgumentException("latitude " + i + " = " + latitude[i] + " is outside [-90, 90]");
            }
            if (!(longitude[i] >= -180 && longitude[i] <= 360)) {
                throw new IllegalArgumentException("longitude " + i + " = " + longitude[i]
                        + " is outside [-180, 360]");
            }
        }
        return new Locations(Kind.GEOGRAPHIC, longitude.clone(), latitude.clone());
    }

    private static void check(double[] x, double[] y) {
        Objects.requireNonNull(x, "x");
        Objects.requireNonNull(y, "y");
        if (x.length != y.length) {
            throw new IllegalArgumentException("coordinate arrays differ in length: " + x.length + " and " + y.length);
        }
        for (int i = 0; i < x.length; i++) {
            if (!Double.isFinite(x[i]) || !Double.isFinite(y[i])) {
                throw new IllegalArgumentException("location " + i + " has a non-finite coordinate (" + x[i] + ", "
                        + y[i] + ")");
            }
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

    /** First coordinate (x, or longitude) of location i. */
    public double x(int i) {
        return x[i];
    }

    /** Second coordinate (y, or latitude) of location i. */
    public double y(int i) {
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

    /** Distance between locations i and j. */
    public double distance(int i, int j) {
        return distance(x[i], y[i], x[j], y[j]);
    }

    /** Distance from location i to a point given in the same coordinate system. */
    public double distanceTo(int i, double px, double py) {
        return distance(x[i], y[i], px, py);
    }

    /** Distance between two points in this coordinate system. */
    public double distance(double x1, double y1, double x2, double y2) {
        if (kind == Kind.PLANAR) {
            double dx = x1 - x2, dy = y1 - y2;
            return Math.sqrt(dx * dx + dy * dy);
        }
        return greatCircleKm(x1, y1, x2, y2);
    }

    /**
     * Great-circle distance in km between two (longitude, latitude) points in degrees, by the
     * haversine formula (Sinnott (1984), Virtues of the haversine, Sky and Telescope 68(2) — from
     * memory), on the sphere of radius {@link #EARTH_RADIUS_KM}.
     */
    public static double greatCircleKm(double lon1, double lat1, double lon2, double lat2) {
        double p1 = Math.toRadians(lat1), p2 = Math.toRadians(lat2);
        double dp = p2 - p1, dl = Math.toRadians(lon2 - lon1);
        double h = Math.sin(dp / 2) * Math.sin(dp / 2) + Math.cos(p1) * Math.cos(p2) * Math.sin(dl / 2) * Math.sin(dl / 2);
        return 2 * EARTH_RADIUS_KM * Math.asin(Math.min(1.0, Math.sqrt(h)));
    }

    /** Bounding box {minX, minY, maxX, maxY}. */
    public double[] boundingBox() {
        double[] bb = {Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY,
            Double.NEGATIVE_INFINITY};
        for (int i = 0; i < x.length; i++) {
            bb[0] = Math.min(bb[0], x[i]);
            bb[1] = Math.min(bb[1], y[i]);
            bb[2] = Math.max(bb[2], x[i]);
            bb[3] = Math.max(bb[3], y[i]);
        }
        return bb;
    }

    /** Subset of locations in the given order. */
    public Locations subset(int... rows) {
        double[] nx = new double[rows.length];
        double[] ny = new double[rows.length];
        for (int r = 0; r < rows.length; r++) {
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
