package io.densa.io.tables;

import java.nio.file.Path;
import java.sql.Connection;
import java.sql.ResultSet;
import java.util.Objects;
import org.apache.commons.csv.CSVFormat;

/**
 * Where a table comes from: a CSV file (RFC 4180, first record the header), an SQL query on a
 * JDBC connection, or an open JDBC result set. The readers of this package ({@link CountTableReader},
 * {@link ObservationReader}) take a source, look its columns up by name and read it row by row.
 *
 * <p>Column names are matched exactly, or, when no column has exactly that name, ignoring case if
 * that finds exactly one (databases often upper-case unquoted names). Every error names the source:
 * the file and line for CSV (the line a record ends on), the query and 1-based row for JDBC.
 *
 * <p>A source does not own a caller's connection or result set: the reader closes the statement and
 * result set it opened for a query, and leaves a given result set open (positioned after the last row).
 */
public final class TableSource {
    enum Kind { CSV, QUERY, RESULT_SET }

    final Kind kind;
    final Path file;
    final CSVFormat format;
    final Connection connection;
    final String sql;
    final ResultSet resultSet;
    final String name;

    private TableSource(Kind kind, Path file, CSVFormat format, Connection connection, String sql,
            ResultSet resultSet, String name) {
        this.kind = kind;
        this.file = file;
        this.format = format;
        this.connection = connection;
        this.sql = sql;
        this.resultSet = resultSet;
        this.name = name;
    }

    /**
     * A CSV file in UTF-8 (a leading byte-order mark is skipped): comma-separated, double-quoted
     * fields as in RFC 4180, the first record the header (names distinct), empty lines skipped, every
     * record with as many fields as the header.
     */
    public static TableSource csv(Path file) {
        return csv(file, CSVFormat.RFC4180.builder().setIgnoreEmptyLines(true).get());
    }

    /**
     * A CSV file in UTF-8 read with a caller's format (delimiter, quote, …); the first record is
     * always taken as the header, whatever the format says about headers, and its names must be distinct.
     */
    public static TableSource csv(Path file, CSVFormat format) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(format, "format");
        return new TableSource(Kind.CSV, file, format, null, null, null, "file " + file);
    }

    /**
     * The rows of an SQL query run on a connection (the statement is created, read forward only and
     * closed by the reader; the connection stays open).
     */
    public static TableSource query(Connection connection, String sql) {
        Objects.requireNonNull(connection, "connection");
        Objects.requireNonNull(sql, "sql");
        return new TableSource(Kind.QUERY, null, null, connection, sql, null, "query '" + abbreviate(sql) + "'");
    }

    /**
     * The remaining rows of an open result set, named in messages by {@code name}; the reader does not
     * close it.
     */
    public static TableSource of(ResultSet resultSet, String name) {
        Objects.requireNonNull(resultSet, "resultSet");
        Objects.requireNonNull(name, "name");
        return new TableSource(Kind.RESULT_SET, null, null, null, null, resultSet, abbreviate(name));
    }

    /** How messages name the source. */
    public String name() {
        return name;
    }

    static String abbreviate(String s) {
        String t = s.strip().replaceAll("\\s+", " ");
        return t.length() <= 80 ? t : t.substring(0, 77) + "...";
    }

    @Override
    public String toString() {
        return "TableSource[" + name + "]";
    }
}
