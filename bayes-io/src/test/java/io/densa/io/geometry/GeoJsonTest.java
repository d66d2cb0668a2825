package io.densa.io.geometry;


import io.densa.io.ReadLimits;
import static io.densa.io.IoTestSupport.rejects;
import static io.densa.io.IoTestSupport.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.locationtech.jts.geom.Geometry;

/**
 * GeoJSON in and out (RFC 7946, Butler et al. 2016, The GeoJSON Format). Fixture: four unit squares
 * of 0.1° in a 2 × 2 block at 10°E, 50°N (A B on the south row, C D on the north row), so that by the
 * definitions of rook (shared edge) and queen (shared point) contiguity each square has 2 rook and 3
 * queen neighbours (Cliff &amp; Ord 1981, Spatial Processes, §1.5; from memory), plus an unlocated
 * feature E.
 */
class GeoJsonTest {
    @TempDir
    Path dir;

    private static String square(String code, double x, double y, int pop) {
        double s = 0.1;
        return "{\"type\":\"Feature\",\"properties\":{\"code\":\"" + code + "\",\"pop\":" + pop + "},"
                + "\"geometry\":{\"type\":\"Polygon\",\"coordinates\":[[[" + x + "," + y + "],[" + x + "," + (y + s)
                + "],[" + (x + s) + "," + (y + s) + "],[" + (x + s) + "," + y + "],[" + x + "," + y + "]]]}}";
    }

    private Path fixture() {
        return write(dir, "units.geojson", "{\"type\":\"FeatureCollection\",\"features\":[\n"
                + square("A", 10.0, 50.0, 1) + ",\n" + square("B", 10.1, 50.0, 2) + ",\n"
                + square("C", 10.0, 50.1, 3) + ",\n" + square("D", 10.1, 50.1, 4) + ",\n"
                + "{\"type\":\"Feature\",\"properties\":{\"code\":\"E\"},\"geometry\":null}]}");
    }

    @Test
    void readsFeaturesWithIdsAndContiguityStraightFromTheFile() {
        UnitGeometries g = UnitGeometries.read(fixture(), "code");
        assertEquals(List.of("A", "B", "C", "D"), g.ids());
        assertEquals(List.of("E"), g.unlocated());
        SpatialWeights rook = g.contiguity(SpatialWeights.Contiguity.ROOK, 0);
        SpatialWeights queen = g.contiguity(SpatialWeights.Contiguity.QUEEN, 0);
        for (int i = 0; i < 4; i++) {
            assertEquals(2, rook.neighbourCount(i));
            assertEquals(3, queen.neighbourCount(i));
        }
        assertArrayEquals(new int[] {1, 2}, rook.neighbours(0));
        Locations loc = g.locations();
        assertEquals(Locations.Kind.GEOGRAPHIC, loc.kind());
        // centroid of the square [10, 10.1] x [50, 50.1] is its centre (closed form)
        assertEquals(10.05, loc.x(0), 1e-12);
        assertEquals(50.05, loc.y(0), 1e-12);
    }

    @Test
    void joinAccountsForUnmatchedIdsOnBothSides() {
        UnitGeometries g = UnitGeometries.read(fixture(), "code");
        GeometryJoin j = g.join(new String[] {"D", "A", "Z", "E"});
        assertEquals(List.of("D", "A"), j.ids());
        assertArrayEquals(new int[] {0, 1}, j.tableRows());
        assertEquals(List.of("Z", "E"), j.withoutGeometry());
        assertEquals(List.of("B", "C"), j.withoutData());
        assertFalse(j.isComplete());
        rejects(() -> j.contiguity(SpatialWeights.Contiguity.QUEEN, 0), "units.geojson", "2 table id(s) have no"
                + " geometry: [Z, E]");
        GeometryJoin ok = g.join(new String[] {"D", "C", "B", "A"});
        SpatialWeights w = ok.contiguity(SpatialWeights.Contiguity.ROOK, 0);
        // in table order D C B A: D touches C and B by an edge
        assertArrayEquals(new int[] {1, 2}, w.neighbours(0));
        SpatialWeights band = ok.distanceBand(12.0);
        // centres 0.1° of longitude apart at 50.05°N: ≈ 7.15 km; 0.1° of latitude ≈ 11.1 km; diagonal ≈ 13.2 km
        assertEquals(2, band.neighbourCount(0));
        rejects(() -> g.join(new String[] {"A", "A"}), "table ids 0 and 1 are both 'A'");
    }

    @Test
    void writerProducesRfc7946WithRightHandRingsReadableByAnIndependentParser() throws Exception {
        UnitGeometries g = UnitGeometries.read(fixture(), "code");
        UnitValues v = UnitValues.of("C", "A").withNumbers("median", new double[] {1.25, Double.NaN})
                .withTexts("note", new String[] {"north \"west\"", "south"});
        Path out = dir.resolve("out.geojson");
        GeometryJoin j = GeoJsonUnitWriter.withDefaults().write(out, g, v);
        assertEquals(List.of("B", "D"), j.withoutData());
        JsonObject root = JsonParser.parseString(Files.readString(out, StandardCharsets.UTF_8)).getAsJsonObject();
        assertEquals("FeatureCollection", root.get("type").getAsString());
        assertFalse(root.has("crs"));
        JsonArray fs = root.getAsJsonArray("features");
        assertEquals(2, fs.size());
        JsonObject c = fs.get(0).getAsJsonObject();
        assertEquals("C", c.get("id").getAsString());
        assertEquals(1.25, c.getAsJsonObject("properties").get("median").getAsDouble());
        assertEquals("north \"west\"", c.getAsJsonObject("properties").get("note").getAsString());
        assertTrue(fs.get(1).getAsJsonObject().getAsJsonObject("properties").get("median").isJsonNull());
        // the input rings run clockwise; RFC 7946 §3.1.6 wants exterior rings counter-clockwise:
        // positive shoelace area (Gauss's area formula)
        JsonArray ring = c.getAsJsonObject("geometry").getAsJsonArray("coordinates").get(0).getAsJsonArray();
        double area2 = 0;
        for (int k = 0; k + 1 < ring.size(); k++) {
            JsonArray p = ring.get(k).getAsJsonArray();
            JsonArray q = ring.get(k + 1).getAsJsonArray();
            area2 += p.get(0).getAsDouble() * q.get(1).getAsDouble() - q.get(0).getAsDouble() * p.get(1).getAsDouble();
        }
        assertEquals(2 * 0.01, area2, 1e-9);
        UnitGeometries back = UnitGeometries.read(out, null);
        assertEquals(List.of("C", "A"), back.ids());
        Geometry orig = g.geometry("C");
        assertTrue(orig.equalsTopo(back.geometry("C")));
        rejects(() -> GeoJsonUnitWriter.withDefaults().write(dir.resolve("x.geojson"), g, UnitValues.of("A", "Q")),
                "1 table id(s) have no geometry: [Q]");
        assertFalse(Files.exists(dir.resolve("x.geojson")));
    }

    /**
     * Fewer decimals round every coordinate to that many (RFC 7946 §11.2 on coordinate precision:
     * six decimals of a degree are about 10 cm; from memory): with two, each written position has at
     * most two decimals and lies within 0.005 of an input coordinate; out-of-range settings are
     * refused.
     */
    @Test
    void decimalsRoundTheCoordinates() throws Exception {
        UnitGeometries g = UnitGeometries.read(write(dir, "fine.geojson", "{\"type\":\"FeatureCollection\","
                + "\"features\":[\n" + square("A", 10.123456, 50.987654, 1) + ",\n" + square("C", 10.223456, 50.987654, 2)
                + "]}"), "code");
        Path out = dir.resolve("two.geojson");
        GeoJsonUnitWriter.withDefaults().withDecimals(2).write(out, g, UnitValues.of("C", "A"));
        assertTrue(!Files.readString(out, StandardCharsets.UTF_8).contains("10.123"), "coordinates not rounded");
        String text = Files.readString(out, StandardCharsets.UTF_8);
        JsonArray fs = JsonParser.parseString(text).getAsJsonObject().getAsJsonArray("features");
        for (int f = 0; f < fs.size(); f++) {
            JsonArray ring = fs.get(f).getAsJsonObject().getAsJsonObject("geometry").getAsJsonArray("coordinates")
                    .get(0).getAsJsonArray();
            Geometry orig = g.geometry(fs.get(f).getAsJsonObject().get("id").getAsString());
            for (int k = 0; k < ring.size(); k++) {
                for (int a = 0; a < 2; a++) {
                    double v = ring.get(k).getAsJsonArray().get(a).getAsDouble();
                    assertEquals(Math.round(v * 100) / 100.0, v, 1e-12, "not rounded to 2 decimals: " + v);
                    double nearest = Double.POSITIVE_INFINITY;
                    for (org.locationtech.jts.geom.Coordinate c : orig.getCoordinates()) {
                        nearest = Math.min(nearest, Math.abs((a == 0 ? c.x : c.y) - v));
                    }
                    assertTrue(nearest <= 0.005 + 1e-12, "position " + v + " is not an input coordinate rounded");
                }
            }
        }
        rejects(() -> GeoJsonUnitWriter.withDefaults().withDecimals(16), "decimals must be in [0, 15], got 16");
    }

    @Test
    void malformedAndAdversarialFilesFailClearlyAndQuickly() {
        Duration quick = Duration.ofSeconds(10);
        Path deep = write(dir, "deep.geojson", "[".repeat(200_000) + "]".repeat(200_000));
        assertTimeoutPreemptively(quick, () -> rejects(() -> UnitGeometries.read(deep, "code"),
                "deep.geojson, character 64: JSON nested deeper than 64 levels"));
        Path many = write(dir, "many.geojson", "{\"type\":\"FeatureCollection\",\"features\":[],\"x\":["
                + "1,".repeat(5000) + "1]}");
        rejects(() -> UnitGeometries.read(many, "code", ReadLimits.defaults().withMaxJsonNumbers(1000)),
                "more than 1000 numbers");
        rejects(() -> UnitGeometries.read(write(dir, "t.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + square("A", 10, 50, 1).substring(0, 60)), "code"), "t.geojson, character", "malformed JSON");
        rejects(() -> UnitGeometries.read(write(dir, "p.geojson", "{\"type\":\"Polygon\",\"coordinates\":[]}"),
                "code"), "not a FeatureCollection");
        rejects(() -> UnitGeometries.read(write(dir, "d.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + square("A", 10, 50, 1) + "," + square("A", 11, 50, 1) + "]}"), "code"),
                "feature 1: id 'A' repeats feature 0");
        rejects(() -> UnitGeometries.read(write(dir, "m.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + square("A", 10, 50, 1) + "]}"), "name"), "feature 0: property 'name' is missing");
        rejects(() -> UnitGeometries.read(write(dir, "r.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + "{\"type\":\"Feature\",\"id\":7,\"geometry\":{\"type\":\"Polygon\",\"coordinates\":[[[0,0],[1,0],"
                + "[1,1]]]}}]}"), null), "feature 0 (id '7'): invalid geometry");
        rejects(() -> UnitGeometries.read(write(dir, "o.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + square("A", 500000, 4000000, 1) + "]}"), "code"), "feature 0 (id 'A'): position (500000.0,"
                + " 4000000.0) is outside longitude", "readPlanar");
        assertEquals(1, UnitGeometries.readPlanar(dir.resolve("o.geojson"), "code", ReadLimits.defaults()).size());
        rejects(() -> UnitGeometries.read(write(dir, "l.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + square("x".repeat(3000), 10, 50, 1) + "]}"), "code"), "id of 3000 characters");
        rejects(() -> UnitGeometries.read(fixture(), "code", ReadLimits.defaults().withMaxFeatures(3)),
                "5 features, more than the limit of 3");
        rejects(() -> UnitGeometries.read(fixture(), "code", ReadLimits.defaults().withMaxFileBytes(100)),
                "bytes, more than the limit of 100");
        rejects(() -> UnitGeometries.read(write(dir, "i.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + "{\"type\":\"Feature\",\"id\":1,\"geometry\":{\"type\":\"Point\",\"coordinates\":[1e999,0]}}]}"),
                null), "i.geojson, feature 0 (id '1'): invalid geometry");
        rejects(() -> UnitGeometries.read(write(dir, "n.geojson", "{\"type\":\"FeatureCollection\",\"features\":["
                + "{\"type\":\"Feature\",\"id\":1,\"geometry\":{\"type\":\"Point\",\"coordinates\":[99999999999999999999,"
                + "0]}}]}"), null), "n.geojson");
    }
}
