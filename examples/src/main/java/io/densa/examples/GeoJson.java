package io.densa.examples;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.locationtech.jts.algorithm.Orientation;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.LinearRing;
import org.locationtech.jts.geom.Point;
import org.locationtech.jts.geom.Polygon;

/**
 * GeoJSON output following RFC 7946 (Butler et al. 2016, The GeoJSON Format): a
 * FeatureCollection in WGS 84 longitude/latitude (the planar kilometres of the study are
 * converted with the scenario's {@link LocalProjection}), exterior rings counter-clockwise and
 * holes clockwise, six decimals (about 0.1 m).
 */
final class GeoJson {
    private GeoJson() {
    }

    /**
     * One feature.
     *
     * @param geometry   polygon, multipolygon or point in planar km
     * @param properties property values (String, Number, Boolean or null); NaN is written as null
     */
    record Feature(Geometry geometry, Map<String, Object> properties) {
    }

    static void write(Path file, List<Feature> features, LocalProjection projection) {
        StringBuilder sb = new StringBuilder(1 << 16);
        sb.append("{\"type\":\"FeatureCollection\",\"features\":[\n");
        for (int f = 0; f < features.size(); f++) {
            Feature feature = features.get(f);
            sb.append("{\"type\":\"Feature\",\"geometry\":");
            geometry(sb, feature.geometry(), projection);
            sb.append(",\"properties\":{");
            int k = 0;
            for (Map.Entry<String, Object> e : feature.properties().entrySet()) {
                if (k++ > 0) {
                    sb.append(',');
                }
                string(sb, e.getKey());
                sb.append(':');
                value(sb, e.getValue());
            }
            sb.append("}}").append(f + 1 < features.size() ? ",\n" : "\n");
        }
        sb.append("]}\n");
        try {
            Files.writeString(file, sb, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static void geometry(StringBuilder sb, Geometry g, LocalProjection p) {
        if (g instanceof Point pt) {
            sb.append("{\"type\":\"Point\",\"coordinates\":");
            position(sb, pt.getCoordinate(), p);
            sb.append('}');
        } else if (g instanceof Polygon poly) {
            sb.append("{\"type\":\"Polygon\",\"coordinates\":");
            polygon(sb, poly, p);
            sb.append('}');
        } else {
            sb.append("{\"type\":\"MultiPolygon\",\"coordinates\":[");
            int k = 0;
            for (int i = 0; i < g.getNumGeometries(); i++) {
                if (g.getGeometryN(i) instanceof Polygon poly && !poly.isEmpty()) {
                    if (k++ > 0) {
                        sb.append(',');
                    }
                    polygon(sb, poly, p);
                }
            }
            sb.append("]}");
        }
    }

    private static void polygon(StringBuilder sb, Polygon poly, LocalProjection p) {
        sb.append('[');
        ring(sb, poly.getExteriorRing(), true, p);
        for (int h = 0; h < poly.getNumInteriorRing(); h++) {
            sb.append(',');
            ring(sb, poly.getInteriorRingN(h), false, p);
        }
        sb.append(']');
    }

    private static void ring(StringBuilder sb, LinearRing ring, boolean ccw, LocalProjection p) {
        Coordinate[] cs = ring.getCoordinates();
        boolean reverse = Orientation.isCCW(cs) != ccw;
        sb.append('[');
        for (int i = 0; i < cs.length; i++) {
            if (i > 0) {
                sb.append(',');
            }
            position(sb, cs[reverse ? cs.length - 1 - i : i], p);
        }
        sb.append(']');
    }

    private static void position(StringBuilder sb, Coordinate c, LocalProjection p) {
        sb.append(String.format(Locale.ROOT, "[%.6f,%.6f]", p.lon(c.x), p.lat(c.y)));
    }

    private static void value(StringBuilder sb, Object v) {
        if (v == null) {
            sb.append("null");
        } else if (v instanceof Double d) {
            sb.append(Double.isFinite(d) ? String.format(Locale.ROOT, "%.6g", d) : "null");
        } else if (v instanceof Number || v instanceof Boolean) {
            sb.append(v);
        } else {
            string(sb, v.toString());
        }
    }

    private static void string(StringBuilder sb, String s) {
        sb.append('"');
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> sb.append("\\\"");
                case '\\' -> sb.append("\\\\");
                case '\n' -> sb.append("\\n");
                default -> {
                    if (c < 0x20) {
                        sb.append(String.format(Locale.ROOT, "\\u%04x", (int) c));
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        sb.append('"');
    }
}
