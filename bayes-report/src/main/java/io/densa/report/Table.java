package io.densa.report;

import io.densa.io.geometry.UnitValues;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;

/**
 * A table of named, typed columns, one row per unit (or per line of a summary), shown in the
 * report (numbers right-aligned) and written as RFC 4180 CSV.
 *
 * <p>Column names are ASCII ({@code [a-z][a-z0-9_]*}) so that the CSV header reads anywhere; each
 * column may carry a display label with units for the report. Numbers are shown with the
 * column's decimals and written to CSV with ten significant digits; probabilities (p- and
 * q-values) are shown with the fewest digits that still rank them ({@link Numbers#rankable});
 * percentages are shown as "12.3 %" and written as fractions; flags are shown as yes/no and
 * written as true/false. NaN is shown as "n/a" and written as an empty cell.
 *
 * <p>Immutable: every column method returns a new table; arrays are copied.
 */
public final class Table {
    private static final Pattern NAME = Pattern.compile("[a-z][a-z0-9_]*");

    private enum Kind {
        TEXT, NUMBER, INTEGER, FLAG, PROBABILITY, PERCENT
    }

    private record Column(String name, String label, Kind kind, Object values, int decimals) {
    }

    private final int rows;
    private final List<Column> columns;

    private Table(int rows, List<Column> columns) {
        this.rows = rows;
        this.columns = List.copyOf(columns);
    }

    /** An empty table of {@code rows} rows (≥ 0). */
    public static Table of(int rows) {
        if (rows < 0) {
            throw new IllegalArgumentException("a table needs rows >= 0, got " + rows);
        }
        return new Table(rows, List.of());
    }

    private Table add(String name, String label, Kind kind, Object values, int length, int decimals) {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(label, "label");
        if (!NAME.matcher(name).matches()) {
            throw new IllegalArgumentException("column name '" + name + "' must be ASCII lower case letters, digits "
                    + "and underscores, starting with a letter (e.g. excess_ages)");
        }
        for (Column c : columns) {
            if (c.name().equals(name)) {
                throw new IllegalArgumentException("column name '" + name + "' is already used");
            }
        }
        if (length != rows) {
            throw new IllegalArgumentException("column '" + name + "' has " + length + " values, the table has "
                    + rows + " rows");
        }
        if (decimals < 0 || decimals > 12) {
            throw new IllegalArgumentException("column '" + name + "': decimals must be in [0, 12], got " + decimals);
        }
        List<Column> all = new ArrayList<>(columns);
        all.add(new Column(name, label, kind, values, decimals));
        return new Table(rows, all);
    }

    /** A text column (null entries are shown and written as empty). */
    public Table text(String name, String label, String[] values) {
        return add(name, label, Kind.TEXT, values.clone(), values.length, 0);
    }

    /** A text column labelled by its name. */
    public Table text(String name, String[] values) {
        return text(name, name, values);
    }

    /**
     * A numeric column.
     *
     * @param decimals decimals shown in the report (the CSV keeps ten significant digits)
     * @throws IllegalArgumentException if a value is infinite
     */
    public Table number(String name, String label, double[] values, int decimals) {
        for (int i = 0; i < values.length; i++) {
            if (Double.isInfinite(values[i])) {
                throw new IllegalArgumentException("column '" + name + "', row " + i + ": " + values[i]
                        + "; give a finite number or NaN for none");
            }
        }
        return add(name, label, Kind.NUMBER, values.clone(), values.length, decimals);
    }

    /** An integer column. */
    public Table integer(String name, String label, long[] values) {
        return add(name, label, Kind.INTEGER, values.clone(), values.length, 0);
    }

    /** An integer column. */
    public Table integer(String name, String label, int[] values) {
        long[] v = new long[values.length];
        for (int i = 0; i < v.length; i++) {
            v[i] = values[i];
        }
        return integer(name, label, v);
    }

    /** A yes/no column. */
    public Table flag(String name, String label, boolean[] values) {
        return add(name, label, Kind.FLAG, values.clone(), values.length, 0);
    }

    /**
     * A column of probabilities (p-values, q-values) shown with enough digits to rank them.
     *
     * @throws IllegalArgumentException if a value is outside [0, 1] (NaN allowed for none)
     */
    public Table probability(String name, String label, double[] values) {
        for (int i = 0; i < values.length; i++) {
            if (!Double.isNaN(values[i]) && !(values[i] >= 0 && values[i] <= 1)) {
                throw new IllegalArgumentException("column '" + name + "', row " + i + ": " + values[i]
                        + " is not a probability in [0, 1]");
            }
        }
        return add(name, label, Kind.PROBABILITY, values.clone(), values.length, 0);
    }

    /** A column of fractions shown as percentages with {@code decimals} decimals and written as fractions. */
    public Table percent(String name, String label, double[] fractions, int decimals) {
        for (int i = 0; i < fractions.length; i++) {
            if (Double.isInfinite(fractions[i])) {
                throw new IllegalArgumentException("column '" + name + "', row " + i + ": " + fractions[i]
                        + "; give a finite number or NaN for none");
            }
        }
        return add(name, label, Kind.PERCENT, fractions.clone(), fractions.length, decimals);
    }

    /** The same columns restricted to (and ordered as) the given rows. */
    public Table select(int[] rowIndices) {
        List<Column> out = new ArrayList<>();
        for (Column c : columns) {
            Object v = switch (c.kind()) {
                case TEXT -> pick((String[]) c.values(), rowIndices);
                case NUMBER, PROBABILITY, PERCENT -> pick((double[]) c.values(), rowIndices);
                case INTEGER -> pick((long[]) c.values(), rowIndices);
                case FLAG -> pick((boolean[]) c.values(), rowIndices);
            };
            out.add(new Column(c.name(), c.label(), c.kind(), v, c.decimals()));
        }
        return new Table(rowIndices.length, out);
    }

    private int check(int r) {
        if (r < 0 || r >= rows) {
            throw new IllegalArgumentException("row " + r + " is outside the table's " + rows + " rows");
        }
        return r;
    }

    private String[] pick(String[] v, int[] idx) {
        String[] out = new String[idx.length];
        for (int i = 0; i < idx.length; i++) {
            out[i] = v[check(idx[i])];
        }
        return out;
    }

    private double[] pick(double[] v, int[] idx) {
        double[] out = new double[idx.length];
        for (int i = 0; i < idx.length; i++) {
            out[i] = v[check(idx[i])];
        }
        return out;
    }

    private long[] pick(long[] v, int[] idx) {
        long[] out = new long[idx.length];
        for (int i = 0; i < idx.length; i++) {
            out[i] = v[check(idx[i])];
        }
        return out;
    }

    private boolean[] pick(boolean[] v, int[] idx) {
        boolean[] out = new boolean[idx.length];
        for (int i = 0; i < idx.length; i++) {
            out[i] = v[check(idx[i])];
        }
        return out;
    }

    /** The same rows with only the named columns, in the order given. */
    public Table columns(String... names) {
        List<Column> out = new ArrayList<>();
        for (String n : names) {
            out.add(column(n));
        }
        return new Table(rows, out);
    }

    private Column column(String name) {
        for (Column c : columns) {
            if (c.name().equals(name)) {
                return c;
            }
        }
        throw new IllegalArgumentException("no column '" + name + "'; the table has " + names());
    }

    /** Number of rows. */
    public int rows() {
        return rows;
    }

    /** Column names in order. */
    public List<String> names() {
        List<String> out = new ArrayList<>();
        for (Column c : columns) {
            out.add(c.name());
        }
        return out;
    }

    /** Display labels in order. */
    List<String> labels() {
        List<String> out = new ArrayList<>();
        for (Column c : columns) {
            out.add(c.label());
        }
        return out;
    }

    /** Whether column j is numeric (right-aligned in the report). */
    boolean numeric(int j) {
        return columns.get(j).kind() != Kind.TEXT && columns.get(j).kind() != Kind.FLAG;
    }

    /** The cells as shown in the report, row by row. */
    List<String[]> displayRows() {
        String[][] cols = new String[columns.size()][];
        for (int j = 0; j < columns.size(); j++) {
            Column c = columns.get(j);
            cols[j] = switch (c.kind()) {
                case PROBABILITY -> Numbers.rankable((double[]) c.values());
                default -> {
                    String[] s = new String[rows];
                    for (int i = 0; i < rows; i++) {
                        s[i] = display(c, i);
                    }
                    yield s;
                }
            };
        }
        List<String[]> out = new ArrayList<>();
        for (int i = 0; i < rows; i++) {
            String[] row = new String[columns.size()];
            for (int j = 0; j < row.length; j++) {
                row[j] = cols[j][i];
            }
            out.add(row);
        }
        return out;
    }

    private static String display(Column c, int i) {
        return switch (c.kind()) {
            case TEXT -> {
                String s = ((String[]) c.values())[i];
                yield s == null ? "" : s;
            }
            case NUMBER -> Numbers.fixed(((double[]) c.values())[i], c.decimals());
            case INTEGER -> Long.toString(((long[]) c.values())[i]);
            case FLAG -> ((boolean[]) c.values())[i] ? "yes" : "no";
            case PERCENT -> {
                double v = ((double[]) c.values())[i];
                yield Double.isNaN(v) ? "n/a" : Numbers.fixed(100 * v, c.decimals()) + " %";
            }
            case PROBABILITY -> Numbers.significant(((double[]) c.values())[i], 4);
        };
    }

    private static String csv(Column c, int i) {
        return switch (c.kind()) {
            case TEXT -> {
                String s = ((String[]) c.values())[i];
                yield s == null ? "" : s;
            }
            case NUMBER, PROBABILITY, PERCENT -> {
                double v = ((double[]) c.values())[i];
                yield Double.isNaN(v) ? "" : Numbers.significant(v, 10);
            }
            case INTEGER -> Long.toString(((long[]) c.values())[i]);
            case FLAG -> Boolean.toString(((boolean[]) c.values())[i]);
        };
    }

    /**
     * Writes the table as RFC 4180 CSV (UTF-8, comma, CRLF, quoted where needed) with the column
     * names as header.
     *
     * @throws UncheckedIOException if the file cannot be written
     */
    public void writeCsv(Path file) {
        Objects.requireNonNull(file, "file");
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8);
                CSVPrinter p = new CSVPrinter(w, CSVFormat.RFC4180)) {
            p.printRecord(names());
            for (int i = 0; i < rows; i++) {
                List<String> row = new ArrayList<>(columns.size());
                for (Column c : columns) {
                    row.add(csv(c, i));
                }
                p.printRecord(row);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write the table " + file + ": " + e.getMessage(), e);
        }
    }

    /**
     * The table as per-unit values for a GeoJSON file (bayes-io's {@link UnitValues}): the text
     * column {@code idColumn} gives the unit ids; numbers (integers, probabilities, fractions
     * included) become numbers and text and flags become text ("true"/"false"), as in the CSV.
     */
    public UnitValues unitValues(String idColumn) {
        Column id = column(idColumn);
        if (id.kind() != Kind.TEXT) {
            throw new IllegalArgumentException("id column '" + idColumn + "' must be a text column");
        }
        UnitValues v = UnitValues.of((String[]) id.values());
        for (Column c : columns) {
            if (c == id) {
                continue;
            }
            switch (c.kind()) {
                case NUMBER, PROBABILITY, PERCENT -> v = v.withNumbers(c.name(), (double[]) c.values());
                case INTEGER -> {
                    long[] l = (long[]) c.values();
                    double[] d = new double[l.length];
                    for (int i = 0; i < l.length; i++) {
                        d[i] = l[i];
                    }
                    v = v.withNumbers(c.name(), d);
                }
                default -> {
                    String[] s = new String[rows];
                    for (int i = 0; i < rows; i++) {
                        s[i] = csv(c, i);
                    }
                    v = v.withTexts(c.name(), s);
                }
            }
        }
        return v;
    }
}
