package io.densa.io.geometry;

import java.io.BufferedWriter;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.List;
import java.util.Objects;
import org.json.simple.JSONValue;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.io.geojson.GeoJsonWriter;

/**
 * Writes units with their results as an RFC 7946 GeoJSON FeatureCollection: one Feature per row of
 * a {@link UnitValues} table, in its order, with the unit id as the feature's {@code "id"} and as
 * property {@code "id"}, the table's columns as properties, and the geometry written by JTS's
 * GeoJSON writer.
 *
 * <p>RFC 7946 conformance: positions are WGS 84 longitude, latitude (checked: every coordinate in
 * [−180, 180] × [−90, 90]), polygon rings follow the right-hand rule (exterior counter-clockwise,
 * holes clockwise; JTS's {@code setForceCCW}), no {@code "crs"} member, UTF-8. Coordinates are
 * rounded to a number of decimals (default 7, about 1 cm). The file is written to a temporary
 * sibling and moved into place, so a failure leaves no partial file.
 *
 * <p>Example:
 * <pre>{@code
 * GeoJsonUnitWriter.withDefaults().write(Path.of("results.geojson"), geometries, values);
 * }</pre>
 *
 * <p>Immutable and thread-safe.
 */
public final class GeoJsonUnitWriter {
    private final int decimals;

    private GeoJsonUnitWriter(int decimals) {
        this.decimals = decimals;
    }

    /** Seven decimals. */
    public static GeoJsonUnitWriter withDefaults() {
        return new GeoJsonUnitWriter(7);
    }

    /** Decimals of coordinates, in [0, 15]. */
    public GeoJsonUnitWriter withDecimals(int d) {
        if (d < 0 || d > 15) {
            throw new IllegalArgumentException("decimals must be in [0, 15], got " + d);
        }
        return new GeoJsonUnitWriter(d);
    }

    /**
     * Writes the units of {@code values} with their geometries from {@code geometries}.
     *
     * @return the join (units of the file without values are listed in {@link GeometryJoin#withoutData()}
     *         and not written)
     * @throws IllegalArgumentException if a unit of the table has no geometry (listing them), a
     *                                  coordinate is outside longitude/latitude range, or the file
     *                                  cannot be written
     */
    public GeometryJoin write(Path file, UnitGeometries geometries, UnitValues values) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(geometries, "geometries");
        Objects.requireNonNull(values, "values");
        GeometryJoin join = geometries.join(values.ids()).requireComplete();
        writeFeatures(file, values, join.geometries());
        return join;
    }

    /**
     * Writes the units of {@code values} with the given geometries, one per table row in the same order.
     */
    public void write(Path file, List<? extends Geometry> geometries, UnitValues values) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(geometries, "geometries");
        Objects.requireNonNull(values, "values");
        if (geometries.size() != values.size()) {
            throw new IllegalArgumentException(geometries.size() + " geometries for " + values.size() + " units");
        }
        writeFeatures(file, values, geometries);
    }

    private void writeFeatures(Path file, UnitValues values, List<? extends Geometry> geometries) {
        String[] ids = values.ids();
        if (values.columnNames().contains("id")) {
            throw new IllegalArgumentException("column name 'id' is reserved for the unit id in the written"
                    + " properties; rename the column");
        }
        for (int i = 0; i < ids.length; i++) {
            Geometry g = geometries.get(i);
            if (g == null || g.isEmpty()) {
                throw new IllegalArgumentException("unit '" + ids[i] + "' has no geometry");
            }
            for (Coordinate c : g.getCoordinates()) {
                if (!(c.x >= -180 && c.x <= 180 && c.y >= -90 && c.y <= 90)) {
                    throw new IllegalArgumentException("unit '" + ids[i] + "': position (" + c.x + ", " + c.y
                            + ") is outside longitude [-180, 180] x latitude [-90, 90]; RFC 7946 needs WGS 84"
                            + " longitude, latitude: transform the geometries first");
                }
            }
        }
        Path abs = file.toAbsolutePath();
        Path tmp = abs.resolveSibling(abs.getFileName() + ".part");
        GeoJsonWriter gw = new GeoJsonWriter(decimals);
        gw.setEncodeCRS(false);
        gw.setForceCCW(true);
        List<String> cols = values.columnNames();
        try {
            try (Writer w = new BufferedWriter(Files.newBufferedWriter(tmp, StandardCharsets.UTF_8), 1 << 16)) {
                w.write("{\"type\":\"FeatureCollection\",\"features\":[");
                for (int i = 0; i < ids.length; i++) {
                    w.write(i == 0 ? "\n" : ",\n");
                    w.write("{\"type\":\"Feature\",\"id\":\"");
                    w.write(JSONValue.escape(ids[i]));
                    w.write("\",\"geometry\":");
                    gw.write(geometries.get(i), w);
                    w.write(",\"properties\":{\"id\":\"");
                    w.write(JSONValue.escape(ids[i]));
                    w.write('"');
                    for (String c : cols) {
                        w.write(",\"");
                        w.write(JSONValue.escape(c));
                        w.write("\":");
                        Object v = values.value(c, i);
                        if (v instanceof Double) {
                            double d = (Double) v;
                            w.write(Double.isNaN(d) ? "null" : Double.toString(d));
                        } else {
                            w.write('"');
                            w.write(JSONValue.escape((String) v));
                            w.write('"');
                        }
                    }
                    w.write("}}");
                }
                w.write("\n]}\n");
            }
            Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING);
        } catch (IOException e) {
            try {
                Files.deleteIfExists(tmp);
            } catch (IOException ignored) {
                // the partial file could not be removed either
            }
            throw new IllegalArgumentException("cannot write " + file + ": " + e.getMessage(), e);
        }
    }
}
