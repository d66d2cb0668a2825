package io.densa.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;

/** The local projection the studies draw in and the conversion of their geometries for GeoJSON. */
class LocalProjectionTest {
    @Test
    void projectionRoundTripsAndMeasuresKilometres() {
        LocalProjection proj = new LocalProjection(-21, -28.5);
        assertEquals(-20.9, proj.lon(proj.x(-20.9)), 1e-12);
        assertEquals(-28.4, proj.lat(proj.y(-28.4)), 1e-12);
        // 0.1 degree of latitude is R · 0.1 · π / 180 with the mean Earth radius R = 6371.0088 km
        // (IUGG mean radius R1, from memory; the value Locations.EARTH_RADIUS_KM uses). Second
        // derivation: R1 = (2a + b) / 3 with the GRS80 semi-axes a = 6378.137 km, b = 6356.7523141 km
        // (Moritz (2000), Geodetic Reference System 1980, J. Geodesy 74) = 6371.00877 km
        assertEquals(6371.0088, (2 * 6378.137 + 6356.7523141) / 3, 5e-5);
        assertEquals(6371.0088 * Math.toRadians(0.1), proj.y(-28.4), 1e-9);
        // along the centre parallel, the planar distance matches the great circle to well under 1 %
        double planar = proj.x(-20.9);
        double great = io.densa.spatial.Locations.greatCircleKm(-21, -28.5, -20.9, -28.5);
        assertEquals(great, planar, 1e-3 * great);
    }

    @Test
    void geometriesAreConvertedToLongitudeLatitudeWithoutChangingTheOriginal() {
        LocalProjection proj = new LocalProjection(-20, -30);
        Geometry square = Region.GEOMETRY.createPolygon(new Coordinate[] {new Coordinate(0, 0), new Coordinate(10, 0),
            new Coordinate(10, 10), new Coordinate(0, 10), new Coordinate(0, 0)});
        Geometry lonLat = proj.toLonLat(square);
        assertEquals(-20.0, lonLat.getCoordinates()[0].x, 1e-12);
        assertEquals(-30.0, lonLat.getCoordinates()[0].y, 1e-12);
        assertEquals(proj.lon(10), lonLat.getCoordinates()[2].x, 1e-12);
        assertEquals(proj.lat(10), lonLat.getCoordinates()[2].y, 1e-12);
        assertEquals(10.0, square.getCoordinates()[2].x, "the planar geometry is not modified");
    }
}
