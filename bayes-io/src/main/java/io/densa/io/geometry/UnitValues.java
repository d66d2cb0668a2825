package io.densa.io.geometry;

import java.util.ArrayList;
import java.util.Collections;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;

/**
 * A per-unit table of results to write with the units' geometries: distinct unit ids and named
 * columns of numbers or text, one entry per unit. Numbers must not be infinite; NaN means "no value"
 * and is written as JSON {@code null}. Text must not be null.
 *
 * <pre>{@code
 * UnitValues v = UnitValues.of(estimate.densities().ids().toArray(new String[0]))
 *         .withNumbers("median", medians)
 *         .withNumbers("p_above_15", tail);
 * }</pre>
 *
 * <p>Immutable; arrays are copied in and out.
 */
public final class UnitValues {
    private final String[] ids;
    private final Map<String, Object> columns; // double[] or String[]

    private UnitValues(String[] ids, Map<String, Object> columns) {
        this.ids = ids;
        this.columns = columns;
    }

    /**
     * A table of these units, without columns yet.
     *
     * @throws IllegalArgumentException if an id is null, empty or repeats
     */
    public static UnitValues of(String... ids) {
        Objects.requireNonNull(ids, "ids");
        Set<String> seen = new HashSet<>();
        for (int i = 0; i < ids.length; i++) {
            if (ids[i] == null || ids[i].isEmpty()) {
                throw new IllegalArgumentException("unit id " + i + " is null or empty");
            }
            if (!seen.add(ids[i])) {
                throw new IllegalArgumentException("unit id '" + ids[i] + "' repeats (entry " + i
                        + "); one row per unit");
            }
        }
        return new UnitValues(ids.clone(), new LinkedHashMap<>());
    }

    /** With a numeric column (NaN = no value; infinities rejected, naming the unit). */
    public UnitValues withNumbers(String name, double[] values) {
        Objects.requireNonNull(values, "values");
        check(name, values.length);
        for (int i = 0; i < values.length; i++) {
            if (Double.isInfinite(values[i])) {
                throw new IllegalArgumentException("column '" + name + "', unit '" + ids[i] + "': " + values[i]
                        + " cannot be written to JSON; give a finite number or NaN for no value");
            }
        }
        return with(name, values.clone());
    }

    /** With a text column. */
    public UnitValues withTexts(String name, String[] values) {
        Objects.requireNonNull(values, "values");
        check(name, values.length);
        for (int i = 0; i < values.length; i++) {
            if (values[i] == null) {
                throw new IllegalArgumentException("column '" + name + "', unit '" + ids[i] + "': text is null");
            }
        }
        return with(name, values.clone());
    }

    private void check(String name, int length) {
        Objects.requireNonNull(name, "name");
        if (name.isEmpty() || columns.containsKey(name)) {
            throw new IllegalArgumentException("column name '" + name + "' is empty or already used");
        }
        if (length != ids.length) {
            throw new IllegalArgumentException("column '" + name + "' has " + length + " values for " + ids.length
                    + " units");
        }
    }

    private UnitValues with(String name, Object values) {
        Map<String, Object> m = new LinkedHashMap<>(columns);
        m.put(name, values);
        return new UnitValues(ids, m);
    }

    /** Number of units. */
    public int size() {
        return ids.length;
    }

    /** The ids (a copy). */
    public String[] ids() {
        return ids.clone();
    }

    /** Column names in order. */
    public List<String> columnNames() {
        return Collections.unmodifiableList(new ArrayList<>(columns.keySet()));
    }

    /** The value of a column for unit row i: a Double (NaN for none) or a String. */
    Object value(String column, int i) {
        Object c = columns.get(column);
        return c instanceof double[] ? (Object) ((double[]) c)[i] : ((String[]) c)[i];
    }
}
