package io.densa.io.geometry;

import io.densa.io.ReadLimits;
import io.densa.io.tables.CountTable;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.json.simple.JSONArray;
import org.json.simple.JSONObject;
import org.json.simple.JSONValue;
import org.json.simple.parser.JSONParser;
import org.json.simple.parser.ParseException;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Point;
import org.locationtech.jts.geom.PrecisionModel;
import org.locationtech.jts.io.geojson.GeoJsonReader;

/**
 * Unit geometries read from a GeoJSON FeatureCollection (RFC 7946), one feature per unit, each with
 * an id — the feature's {@code "id"} member or a property — and a geometry built by JTS's GeoJSON
 * reader. Join them to a table by id ({@link #join}) and build spatial weights straight from them
 * ({@link #contiguity}, {@link #locations}).
 *
 * <p>Semantics: {@link #read} expects RFC 7946 longitude/latitude (WGS 84) and checks every
 * coordinate against [−180, 180] × [−90, 90]; {@link #readPlanar} accepts projected coordinates
 * (older files) without that check. Ids are strings or numbers (a number's id is its text, an
 * integer without a decimal point), non-empty and distinct. A feature with a null geometry (RFC
 * 7946 §3.2, an unlocated feature) is kept as an id without geometry ({@link #unlocated()}). The
 * legacy {@code "crs"} member is ignored, and nothing in the file makes the reader open anything else.
 *
 * <p>Hostile files: the file size, JSON nesting depth, count of numbers, string lengths, number of
 * features and id length are checked against {@link ReadLimits} before the document is parsed;
 * every problem is an {@link IllegalArgumentException} naming the file, the feature (index and id)
 * and the accepted form, and nothing is returned.
 *
 * <p>Example:
 * <pre>{@code
 * UnitGeometries g = UnitGeometries.read(Path.of("districts.geojson"), "code");
 * GeometryJoin j = g.join(counts.ids());          // lists ids missing on either side
 * SpatialWeights w = j.contiguity(SpatialWeights.Contiguity.QUEEN, 0);
 * }</pre>
 *
 * <p>Immutable (geometries are JTS objects: do not modify them).
 */
public final class UnitGeometries {
    private final List<String> ids;
    private final List<Geometry> geometries;
    private final List<String> unlocated;
    private final Map<String, Integer> index;
    private final boolean geographic;
    private final String source;

    private UnitGeometries(List<String> ids, List<Geometry> geometries, List<String> unlocated, boolean geographic,
            String source) {
        this.ids = Collections.unmodifiableList(ids);
        this.geometries = Collections.unmodifiableList(geometries);
        this.unlocated = Collections.unmodifiableList(unlocated);
        Map<String, Integer> m = new HashMap<>();
        for (int i = 0; i < ids.size(); i++) {
            m.put(ids.get(i), i);
        }
        this.index = m;
        this.geographic = geographic;
        this.source = source;
    }

    /**
     * Reads an RFC 7946 FeatureCollection with longitude/latitude coordinates.
     *
     * @param idProperty the property holding the unit id, or null to use each feature's {@code "id"} member
     */
    public static UnitGeometries read(Path file, String idProperty) {
        return read(file, idProperty, ReadLimits.defaults(), true);
    }

    /** {@link #read(Path, String)} with other limits. */
    public static UnitGeometries read(Path file, String idProperty, ReadLimits limits) {
        return read(file, idProperty, limits, true);
    }

    /** Reads a FeatureCollection whose coordinates are planar (projected), not longitude/latitude. */
    public static UnitGeometries readPlanar(Path file, String idProperty, ReadLimits limits) {
        return read(file, idProperty, limits, false);
    }

    private static UnitGeometries read(Path file, String idProperty, ReadLimits limits, boolean geographic) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(limits, "limits");
        String src = "file " + file;
        String text = readText(file, limits, src);
        JsonGuard.check(text, limits, src);
        Object root;
        try {
            root = new JSONParser().parse(text);
        } catch (ParseException e) {
            throw new IllegalArgumentException(src + ", character " + e.getPosition() + ": malformed JSON (" + e
                    + "); expected a GeoJSON FeatureCollection (RFC 7946)", e);
        } catch (RuntimeException e) {
            throw new IllegalArgumentException(src + ": malformed JSON (" + e.getMessage()
                    + "); expected a GeoJSON FeatureCollection (RFC 7946)", e);
        }
        if (!(root instanceof JSONObject) || !"FeatureCollection".equals(((JSONObject) root).get("type"))) {
            throw new IllegalArgumentException(src + ": the top level is not a FeatureCollection; expected"
                    + " {\"type\": \"FeatureCollection\", \"features\": [...]} (RFC 7946 §3.3)");
        }
        Object feats = ((JSONObject) root).get("features");
        if (!(feats instanceof JSONArray)) {
            throw new IllegalArgumentException(src + ": \"features\" is missing or not an array (RFC 7946 §3.3)");
        }
        JSONArray features = (JSONArray) feats;
        if (features.size() > limits.maxFeatures()) {
            throw new IllegalArgumentException(src + " has " + features.size() + " features, more than the limit of "
                    + limits.maxFeatures() + " (ReadLimits.withMaxFeatures)");
        }
        GeometryFactory gf = new GeometryFactory(new PrecisionModel(), geographic ? 4326 : 0);
        GeoJsonReader reader = new GeoJsonReader(gf);
        List<String> ids = new ArrayList<>();
        List<Geometry> geoms = new ArrayList<>();
        List<String> unlocated = new ArrayList<>();
        Map<String, Integer> seen = new HashMap<>();
        for (int i = 0; i < features.size(); i++) {
            Object o = features.get(i);
            if (!(o instanceof JSONObject) || !"Feature".equals(((JSONObject) o).get("type"))) {
                throw new IllegalArgumentException(src + ", feature " + i + ": not a Feature object (RFC 7946 §3.2)");
            }
            JSONObject f = (JSONObject) o;
            String id = id(f, idProperty, limits, src, i);
            Integer prev = seen.put(id, i);
            if (prev != null) {
                throw new IllegalArgumentException(src + ", feature " + i + ": id '" + id + "' repeats feature " + prev
                        + "; ids must be distinct");
            }
            Object g = f.get("geometry");
            if (g == null) {
                unlocated.add(id);
                continue;
            }
            if (!(g instanceof JSONObject)) {
                throw new IllegalArgumentException(src + ", feature " + i + " (id '" + id + "'): \"geometry\" is not"
                        + " an object or null (RFC 7946 §3.2)");
            }
            Geometry geom;
            try {
                geom = reader.read(JSONValue.toJSONString(g));
            } catch (org.locationtech.jts.io.ParseException | RuntimeException e) {
                String why = e.getCause() != null && e.getCause().getMessage() != null ? e.getMessage() + ": "
                        + e.getCause().getMessage() : e.getMessage();
                throw new IllegalArgumentException(src + ", feature " + i + " (id '" + id + "'): invalid geometry ("
                        + why + "); expected an RFC 7946 geometry (closed rings of at least 4 positions)", e);
            }
            checkCoordinates(geom, geographic, src, i, id);
            ids.add(id);
            geoms.add(geom);
        }
        return new UnitGeometries(ids, geoms, unlocated, geographic, src);
    }

    private static String readText(Path file, ReadLimits limits, String src) {
        byte[] bytes;
        try {
            if (!Files.isRegularFile(file)) {
                throw new IllegalArgumentException(src + " does not exist or is not a regular file");
            }
            long size = Files.size(file);
            if (size > limits.maxFileBytes()) {
                throw new IllegalArgumentException(src + " has " + size + " bytes, more than the limit of "
                        + limits.maxFileBytes() + " (ReadLimits.withMaxFileBytes)");
            }
            bytes = Files.readAllBytes(file);
        } catch (IOException e) {
            throw new IllegalArgumentException(src + " cannot be read: " + e.getMessage(), e);
        }
        try {
            return StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                    .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(bytes)).toString();
        } catch (CharacterCodingException e) {
            throw new IllegalArgumentException(src + " is not UTF-8 text (RFC 7946 §1.3 requires UTF-8)", e);
        }
    }

    private static String id(JSONObject f, String idProperty, ReadLimits limits, String src, int i) {
        Object v;
        String what;
        if (idProperty == null) {
            v = f.get("id");
            what = "the feature \"id\" member";
        } else {
            Object props = f.get("properties");
            v = props instanceof JSONObject ? ((JSONObject) props).get(idProperty) : null;
            what = "property '" + idProperty + "'";
        }
        String id;
        if (v instanceof String) {
            id = (String) v;
        } else if (v instanceof Long) {
            id = v.toString();
        } else if (v instanceof Double && Double.isFinite((Double) v)) {
            double d = (Double) v;
            id = d == Math.rint(d) && Math.abs(d) < 1e15 ? Long.toString((long) d) : Double.toString(d);
        } else {
            throw new IllegalArgumentException(src + ", feature " + i + ": " + what + " is "
                    + (v == null ? "missing" : "not a string or number") + "; every feature needs an id there");
        }
        if (id.isEmpty() || id.length() > limits.maxFieldChars()) {
            throw new IllegalArgumentException(src + ", feature " + i + ": id of " + id.length()
                    + " characters; expected 1 to " + limits.maxFieldChars() + " (ReadLimits.withMaxFieldChars)");
        }
        return id;
    }

    private static void checkCoordinates(Geometry g, boolean geographic, String src, int i, String id) {
        for (Coordinate c : g.getCoordinates()) {
            if (!Double.isFinite(c.x) || !Double.isFinite(c.y)) {
                throw new IllegalArgumentException(src + ", feature " + i + " (id '" + id + "'): coordinate (" + c.x
                        + ", " + c.y + ") is not finite");
            }
            if (geographic && !(c.x >= -180 && c.x <= 180 && c.y >= -90 && c.y <= 90)) {
                throw new IllegalArgumentException(src + ", feature " + i + " (id '" + id + "'): position (" + c.x
                        + ", " + c.y + ") is outside longitude [-180, 180] x latitude [-90, 90]; RFC 7946 positions"
                        + " are WGS 84 longitude, latitude (a file with projected coordinates: readPlanar)");
            }
        }
    }

    /** Number of located features. */
    public int size() {
        return ids.size();
    }

    /** Ids of the located features, in file order. */
    public List<String> ids() {
        return ids;
    }

    /** Geometries in file order. */
    public List<Geometry> geometries() {
        return geometries;
    }

    /** Ids of features whose geometry is null. */
    public List<String> unlocated() {
        return unlocated;
    }

    /** Whether coordinates are longitude/latitude (read by {@link #read}). */
    public boolean isGeographic() {
        return geographic;
    }

    /** The geometry of a unit, or null. */
    public Geometry geometry(String id) {
        Integer i = index.get(id);
        return i == null ? null : geometries.get(i);
    }

    /** Where the geometries came from. */
    public String source() {
        return source;
    }

    /**
     * Joins a table's ids (in table order) to the geometries.
     *
     * @param tableIds n distinct ids, e.g. {@link CountTable#ids()} (not modified)
     * @throws IllegalArgumentException if an id is null or repeats (join one period at a time)
     */
    public GeometryJoin join(String[] tableIds) {
        Objects.requireNonNull(tableIds, "tableIds");
        Map<String, Integer> seen = new HashMap<>();
        List<String> ids2 = new ArrayList<>();
        List<Geometry> g2 = new ArrayList<>();
        List<Integer> rows = new ArrayList<>();
        List<String> without = new ArrayList<>();
        for (int r = 0; r < tableIds.length; r++) {
            String id = tableIds[r];
            if (id == null) {
                throw new IllegalArgumentException("table id " + r + " is null");
            }
            Integer prev = seen.put(id, r);
            if (prev != null) {
                throw new IllegalArgumentException("table ids " + prev + " and " + r + " are both '" + id
                        + "'; join a table with one row per unit (one period at a time)");
            }
            Integer k = index.get(id);
            if (k == null) {
                without.add(id);
            } else {
                ids2.add(id);
                g2.add(geometries.get(k));
                rows.add(r);
            }
        }
        List<String> unused = new ArrayList<>();
        for (String id : ids) {
            if (!seen.containsKey(id)) {
                unused.add(id);
            }
        }
        return new GeometryJoin(ids2, g2, rows.stream().mapToInt(Integer::intValue).toArray(), without, unused,
                geographic, source);
    }

    /**
     * Polygon contiguity weights over the features in file order (rook or queen, with a snapping
     * tolerance in coordinate units); see {@link SpatialWeights#contiguity}.
     */
    public SpatialWeights contiguity(SpatialWeights.Contiguity rule, double tolerance) {
        return GeometryJoin.contiguity(geometries, ids, rule, tolerance, source);
    }

    /**
     * One location per feature in file order: the centroid of each geometry (its point for a Point),
     * geographic for {@link #read}, planar for {@link #readPlanar}. A centroid of longitude/latitude
     * coordinates is computed in the plane of those coordinates, a fair approximation for units a few
     * degrees across away from the poles and the antimeridian.
     */
    public Locations locations() {
        return GeometryJoin.locations(geometries, geographic);
    }

    static Point centroid(Geometry g) {
        return g instanceof Point ? (Point) g : g.getCentroid();
    }

    @Override
    public String toString() {
        return "UnitGeometries[" + ids.size() + " units from " + source + "]";
    }
}
