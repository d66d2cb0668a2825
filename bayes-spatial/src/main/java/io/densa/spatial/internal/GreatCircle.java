package io.densa.spatial.internal;

/**
 * Great-circle distances on the sphere of radius {@link #RADIUS_KM} from the chord between unit
 * vectors, the one computation behind every geographic distance of the spatial module (see
 * {@code Locations.greatCircleKm} for the formula and its source). Internal: not exported; may
 * change without notice.
 */
public final class GreatCircle {
    /** Mean Earth radius R1 in km (IUGG; see {@code Locations.EARTH_RADIUS_KM}). */
    public static final double RADIUS_KM = 6371.0088;

    private GreatCircle() {
    }

    /**
     * Great-circle km between two (longitude, latitude) points in degrees, unchecked: the same
     * operations in the same order as {@link #unitVector} twice and {@link #kmFromChordSq}.
     */
    public static double km(double lon1, double lat1, double lon2, double lat2) {
        double l1 = Math.toRadians(lon1), p1 = Math.toRadians(lat1);
        double x1 = Math.cos(p1) * Math.cos(l1), y1 = Math.cos(p1) * Math.sin(l1), z1 = Math.sin(p1);
        double l2 = Math.toRadians(lon2), p2 = Math.toRadians(lat2);
        double x2 = Math.cos(p2) * Math.cos(l2), y2 = Math.cos(p2) * Math.sin(l2), z2 = Math.sin(p2);
        double ex = x1 - x2, ey = y1 - y2, ez = z1 - z2;
        double chordSq = ex * ex + ey * ey + ez * ez;
        if (chordSq <= 2) {
            return 2 * RADIUS_KM * Math.asin(Math.sqrt(chordSq) / 2);
        }
        double sx = x1 + x2, sy = y1 + y2, sz = z1 + z2;
        return RADIUS_KM * (Math.PI - 2 * Math.asin(Math.min(1, Math.sqrt(sx * sx + sy * sy + sz * sz) / 2)));
    }

    /** Writes the unit vector of (longitude, latitude) in degrees to out[off..off+2]. */
    public static void unitVector(double lon, double lat, double[] out, int off) {
        double l = Math.toRadians(lon), p = Math.toRadians(lat);
        out[off] = Math.cos(p) * Math.cos(l);
        out[off + 1] = Math.cos(p) * Math.sin(l);
        out[off + 2] = Math.sin(p);
    }

    /**
     * Great-circle km between the unit vectors u[a..a+2] and u[b..b+2] whose squared chord
     * (‖u_a − u_b‖², summed x, y, z in that order) is chordSq: 2R asin(c / 2) up to a quarter
     * circle (c² ≤ 2), R (π − 2 asin(c' / 2)) with the chord c' = ‖u_a + u_b‖ to the antipode beyond.
     */
    public static double kmFromChordSq(double[] u, int a, int b, double chordSq) {
        if (chordSq <= 2) {
            return 2 * RADIUS_KM * Math.asin(Math.sqrt(chordSq) / 2);
        }
        double sx = u[a] + u[b], sy = u[a + 1] + u[b + 1], sz = u[a + 2] + u[b + 2];
        return RADIUS_KM * (Math.PI - 2 * Math.asin(Math.min(1, Math.sqrt(sx * sx + sy * sy + sz * sz) / 2)));
    }
}
