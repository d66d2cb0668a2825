package io.densa.examples;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.locationtech.jts.geom.Geometry;

/**
 * One row per unit, named columns of numbers, text or flags; written both as a CSV table and as
 * the properties of a GeoJSON FeatureCollection, so that the two always agree.
 */
final class UnitTable {
    private final int rows;
    private final Map<String, Object> columns = new LinkedHashMap<>();

    UnitTable(int rows) {
        this.rows = rows;
    }

    UnitTable text(String name, String[] values) {
        return put(name, values.clone(), values.length);
    }

    UnitTable number(String name, double[] values) {
        return put(name, values.clone(), values.length);
    }

    UnitTable integer(String name, int[] values) {
        return put(name, values.clone(), values.length);
    }

    UnitTable flag(String name, boolean[] values) {
        return put(name, values.clone(), values.length);
    }

    private UnitTable put(String name, Object values, int length) {
        if (length != rows) {
            throw new IllegalArgumentException("column " + name + " has " + length + " rows, table has " + rows);
        }
        columns.put(name, values);
        return this;
    }

    private Object cell(Object column, int i) {
        if (column instanceof double[] d) {
            return d[i];
        }
        if (column instanceof int[] k) {
            return k[i];
        }
        if (column instanceof boolean[] b) {
            return b[i];
        }
        return ((String[]) column)[i];
    }

    void writeCsv(Path file) {
        List<Object[]> out = new ArrayList<>();
        for (int i = 0; i < rows; i++) {
            Object[] row = new Object[columns.size()];
            int c = 0;
            for (Object col : columns.values()) {
                row[c++] = cell(col, i);
            }
            out.add(row);
        }
        Tables.writeCsv(file, columns.keySet().toArray(String[]::new), out);
    }

    void writeGeoJson(Path file, List<Geometry> geometries, LocalProjection projection) {
        List<GeoJson.Feature> features = new ArrayList<>();
        for (int i = 0; i < rows; i++) {
            Map<String, Object> props = new LinkedHashMap<>();
            for (Map.Entry<String, Object> e : columns.entrySet()) {
                props.put(e.getKey(), cell(e.getValue(), i));
            }
            features.add(new GeoJson.Feature(geometries.get(i), props));
        }
        GeoJson.write(file, features, projection);
    }
}
