package io.densa.examples;

import io.densa.spatial.Locations;

/**
 * Equirectangular projection around a centre point: planar kilometres east and north of the
 * centre. Over the few tens of kilometres of the invented scenarios its distance error against
 * the great circle is well below one percent, which is ample for a demonstration.
 */
final class LocalProjection {
    private static final double KM_PER_RAD = Locations.EARTH_RADIUS_KM;
    private final double lon0;
    private final double lat0;
    private final double cosLat0;

    LocalProjection(double lon0, double lat0) {
        this.lon0 = lon0;
        this.lat0 = lat0;
        this.cosLat0 = Math.cos(Math.toRadians(lat0));
    }

    double lon0() {
        return lon0;
    }

    double lat0() {
        return lat0;
    }

    /** Kilometres east of the centre. */
    double x(double lon) {
        return Math.toRadians(lon - lon0) * cosLat0 * KM_PER_RAD;
    }

    /** Kilometres north of the centre. */
    double y(double lat) {
        return Math.toRadians(lat - lat0) * KM_PER_RAD;
    }

    double lon(double x) {
        return lon0 + Math.toDegrees(x / (cosLat0 * KM_PER_RAD));
    }

    double lat(double y) {
        return lat0 + Math.toDegrees(y / KM_PER_RAD);
    }

    /** A copy of a planar-km geometry in WGS 84 longitude/latitude degrees. */
    org.locationtech.jts.geom.Geometry toLonLat(org.locationtech.jts.geom.Geometry planar) {
        org.locationtech.jts.geom.Geometry g = planar.copy();
        g.apply(new org.locationtech.jts.geom.CoordinateSequenceFilter() {
            @Override
            public void filter(org.locationtech.jts.geom.CoordinateSequence seq, int i) {
                seq.setOrdinate(i, 0, lon(seq.getX(i)));
                seq.setOrdinate(i, 1, lat(seq.getY(i)));
            }

            @Override
            public boolean isDone() {
                return false;
            }

            @Override
            public boolean isGeometryChanged() {
                return true;
            }
        });
        return g;
    }

    String describe() {
        return String.format(java.util.Locale.ROOT,
                "equirectangular projection centred on %.4f°%s %.4f°%s, kilometres east/north", Math.abs(lon0),
                lon0 < 0 ? "W" : "E", Math.abs(lat0), lat0 < 0 ? "S" : "N");
    }
}
