package io.densa.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Polygon;

/** The report writers against the formats they claim. */
class ReportOutputTest {

    /** Signed area of a ring by the shoelace formula (positive: counter-clockwise). */
    static double signedArea(JsonArray ring) {
        double a = 0;
        for (int i = 0; i + 1 < ring.size(); i++) {
            JsonArray p = ring.get(i).getAsJsonArray();
            JsonArray q = ring.get(i + 1).getAsJsonArray();
            a += p.get(0).getAsDouble() * q.get(1).getAsDouble() - q.get(0).getAsDouble() * p.get(1).getAsDouble();
        }
        return a / 2;
    }

    @Test
    void geoJsonFollowsTheRightHandRuleAndWritesNaNAsNull(@TempDir Path dir) throws IOException {
        // a clockwise square with a counter-clockwise hole: RFC 7946 section 3.1.6 wants the
        // exterior counter-clockwise and holes clockwise, and section 3.1.1 [longitude, latitude]
        Coordinate[] outer = {new Coordinate(0, 0), new Coordinate(0, 10), new Coordinate(10, 10),
            new Coordinate(10, 0), new Coordinate(0, 0)};
        Coordinate[] hole = {new Coordinate(2, 2), new Coordinate(4, 2), new Coordinate(4, 4), new Coordinate(2, 4),
            new Coordinate(2, 2)};
        Polygon poly = Region.GEOMETRY.createPolygon(Region.GEOMETRY.createLinearRing(outer),
                new org.locationtech.jts.geom.LinearRing[] {Region.GEOMETRY.createLinearRing(hole)});
        Map<String, Object> props = new LinkedHashMap<>();
        props.put("name", "a \"quoted\" name");
        props.put("value", Double.NaN);
        props.put("flag", true);
        Path file = dir.resolve("x.geojson");
        LocalProjection proj = new LocalProjection(-20, -30);
        GeoJson.write(file, List.of(new GeoJson.Feature(poly, props)), proj);
        JsonObject f = JsonParser.parseString(Files.readString(file)).getAsJsonObject().getAsJsonArray("features")
                .get(0).getAsJsonObject();
        JsonArray rings = f.getAsJsonObject("geometry").getAsJsonArray("coordinates");
        assertTrue(signedArea(rings.get(0).getAsJsonArray()) > 0, "exterior ring must be counter-clockwise");
        assertTrue(signedArea(rings.get(1).getAsJsonArray()) < 0, "hole must be clockwise");
        JsonArray first = rings.get(0).getAsJsonArray().get(0).getAsJsonArray();
        assertEquals(-20.0, first.get(0).getAsDouble(), 1e-6, "longitude first");
        assertEquals(-30.0, first.get(1).getAsDouble(), 1e-6, "latitude second");
        JsonObject p = f.getAsJsonObject("properties");
        assertEquals("a \"quoted\" name", p.get("name").getAsString());
        assertTrue(p.get("value").isJsonNull());
        assertTrue(p.get("flag").getAsBoolean());
    }

    @Test
    void projectionRoundTripsAndMeasuresKilometres() {
        LocalProjection proj = new LocalProjection(-21, -28.5);
        assertEquals(-20.9, proj.lon(proj.x(-20.9)), 1e-12);
        assertEquals(-28.4, proj.lat(proj.y(-28.4)), 1e-12);
        // 0.1 degree of latitude is about 11.1 km (mean Earth radius 6371.0088 km, REFERENCES.md section 10)
        assertEquals(6371.0088 * Math.toRadians(0.1), proj.y(-28.4), 1e-9);
        // along the centre parallel, the planar distance matches the great circle to well under 1 %
        double planar = proj.x(-20.9);
        double great = io.densa.spatial.Locations.greatCircleKm(-21, -28.5, -20.9, -28.5);
        assertEquals(great, planar, 1e-3 * great);
    }

    @Test
    void csvQuotesAndHtmlEscapes(@TempDir Path dir) throws IOException {
        Path csv = dir.resolve("t.csv");
        Tables.writeCsv(csv, new String[] {"a", "b"}, List.of(new Object[] {"x,y", "say \"hi\""},
            new Object[] {1.5, Double.NaN}));
        // RFC 4180: fields with commas or quotes are quoted, quotes doubled
        assertEquals(List.of("a,b", "\"x,y\",\"say \"\"hi\"\"\"", "1.500000,"), Files.readAllLines(csv));
        Report r = new Report(dir, "T <&>");
        r.paragraph("**bold** and `code` < 3");
        String html = r.html();
        assertTrue(html.contains("<strong>bold</strong> and <code>code</code> &lt; 3"));
        assertTrue(html.contains("<title>T &lt;&amp;&gt;</title>"));
        assertFalse(html.contains("T <&>"));
    }
}
