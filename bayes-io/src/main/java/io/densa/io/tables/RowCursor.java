package io.densa.io.tables;

import io.densa.io.Bins;
import io.densa.io.ReadLimits;
import java.io.FilterReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.math.BigDecimal;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.ResultSet;
import java.sql.ResultSetMetaData;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.regex.Pattern;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.apache.commons.csv.DuplicateHeaderMode;

/**
 * Row-by-row access to a {@link TableSource}, with limits and locations for messages. Package-private.
 */
abstract class RowCursor implements AutoCloseable {
    /** Decimal numbers as written in tables: optional sign, digits with optional point, optional exponent. */
    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+\\.?\\d*|\\.\\d+)([eE][+-]?\\d+)?");
    private static final Pattern INTEGER = Pattern.compile("[+-]?\\d{1,9}");

    final String source;
    final ReadLimits limits;
    long row; // 1-based data row

    RowCursor(String source, ReadLimits limits) {
        this.source = source;
        this.limits = limits;
    }

    static RowCursor open(TableSource src, ReadLimits limits) {
        switch (src.kind) {
            case CSV:
                return new Csv(src, limits);
            case QUERY:
                return new Jdbc(src, limits, true);
            default:
                return new Jdbc(src, limits, false);
        }
    }

    /** Column names in order. */
    abstract List<String> columns();

    /** Advances to the next row; false at the end. Checks the row limit. */
    abstract boolean next();

    /** Raw text of a field, or null when missing (empty CSV field, SQL NULL). */
    abstract String raw(int column);

    /** Numeric value of a field, or NaN when missing; throws for text that is not a number. */
    abstract double number(int column, String accepted);

    /** "file x, line 12" or "query '…', row 12". */
    abstract String where();

    /** The current line (CSV) or row (JDBC) number, to name it later with {@link #at}. */
    abstract long position();

    /** Names a position returned by {@link #position}. */
    abstract String at(long position);

    @Override
    public abstract void close();

    /** Index of a named column: exact match, else the unique case-insensitive match. */
    int column(String name, String role) {
        List<String> cols = columns();
        int idx = cols.indexOf(name);
        if (idx >= 0) {
            return idx;
        }
        int found = -1;
        for (int i = 0; i < cols.size(); i++) {
            if (cols.get(i).equalsIgnoreCase(name)) {
                if (found >= 0) {
                    throw new IllegalArgumentException(source + ": " + role + " column '" + name
                            + "' matches several columns ignoring case (" + cols.get(found) + ", " + cols.get(i)
                            + "); name it exactly");
                }
                found = i;
            }
        }
        if (found < 0) {
            throw new IllegalArgumentException(source + ": missing " + role + " column '" + name + "'; the columns are "
                    + cols);
        }
        return found;
    }

    /** A non-empty text field within the field limit. */
    String text(int column, String what) {
        String s = raw(column);
        if (s == null || s.isEmpty()) {
            throw new IllegalArgumentException(where() + ", column '" + columns().get(column) + "': " + what
                    + " is missing; every row needs a non-empty " + what);
        }
        if (s.length() > limits.maxFieldChars()) {
            throw new IllegalArgumentException(where() + ", column '" + columns().get(column) + "': " + what + " has "
                    + s.length() + " characters, more than the limit of " + limits.maxFieldChars()
                    + " (ReadLimits.withMaxFieldChars)");
        }
        return s;
    }

    /** A required finite number. */
    double requiredNumber(int column, String what, String accepted) {
        double v = number(column, accepted);
        if (Double.isNaN(v)) {
            throw new IllegalArgumentException(where() + ", column '" + columns().get(column) + "': " + what
                    + " is missing; expected " + accepted);
        }
        return v;
    }

    /** A required integer. */
    int integer(int column, String what, String accepted) {
        String s = raw(column);
        if (s == null || s.isEmpty()) {
            throw new IllegalArgumentException(where() + ", column '" + columns().get(column) + "': " + what
                    + " is missing; expected " + accepted);
        }
        String t = s.strip();
        if (!INTEGER.matcher(t).matches()) {
            throw new IllegalArgumentException(where() + ", column '" + columns().get(column) + "': " + what + " '"
                    + clip(s) + "' is not an integer; expected " + accepted);
        }
        return Integer.parseInt(t);
    }

    double parse(String s, int column, String accepted) {
        if (s == null) {
            return Double.NaN;
        }
        String t = s.strip();
        if (t.isEmpty()) {
            return Double.NaN;
        }
        if (t.length() > 64 || !NUMBER.matcher(t).matches()) {
            throw new IllegalArgumentException(where() + ", column '" + columns().get(column) + "': '" + clip(s)
                    + "' is not a number; expected " + accepted);
        }
        double v = Double.parseDouble(t);
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException(where() + ", column '" + columns().get(column) + "': " + t
                    + " overflows a double; expected " + accepted);
        }
        return v;
    }

    static String clip(String s) {
        return s.length() <= 40 ? s : s.substring(0, 37) + "...";
    }

    void countRow() {
        row++;
        if (row > limits.maxRows()) {
            throw new IllegalArgumentException(source + " has more than " + limits.maxRows()
                    + " data rows, the limit (ReadLimits.withMaxRows)");
        }
    }

    // ------------------------------------------------------------------ CSV

    static final class Csv extends RowCursor {
        private final CSVParser parser;
        private final Iterator<CSVRecord> it;
        private final List<String> header;
        private final GuardReader guard;
        private CSVRecord rec;

        Csv(TableSource src, ReadLimits limits) {
            super(src.name, limits);
            Path f = src.file;
            long size;
            try {
                if (!Files.isRegularFile(f)) {
                    throw new IllegalArgumentException(source + " does not exist or is not a regular file");
                }
                size = Files.size(f);
            } catch (IOException e) {
                throw new IllegalArgumentException(source + " cannot be read: " + e.getMessage(), e);
            }
            if (size > limits.maxFileBytes()) {
                throw new IllegalArgumentException(source + " has " + size + " bytes, more than the limit of "
                        + limits.maxFileBytes() + " (ReadLimits.withMaxFileBytes)");
            }
            CSVParser p = null;
            InputStream in = null;
            try {
                in = Files.newInputStream(f);
                CharsetDecoder dec = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
                        .onUnmappableCharacter(CodingErrorAction.REPORT);
                guard = new GuardReader(new InputStreamReader(in, dec), limits.maxRecordChars(), source);
                CSVFormat fmt = src.format.builder().setHeader().setSkipHeaderRecord(true)
                        .setDuplicateHeaderMode(DuplicateHeaderMode.DISALLOW).get();
                p = CSVParser.builder().setReader(guard).setFormat(fmt).get();
                List<String> h = new ArrayList<>(p.getHeaderNames());
                if (!h.isEmpty() && h.get(0).startsWith("\uFEFF")) {
                    h.set(0, h.get(0).substring(1));
                }
                header = List.copyOf(h);
                it = p.iterator();
            } catch (IOException | UncheckedIOException | IllegalArgumentException | IllegalStateException e) {
                closeQuietly(p);
                if (p == null && in != null) {
                    try {
                        in.close();
                    } catch (IOException ignored) {
                        // already failing
                    }
                }
                throw bad(e, "header");
            }
            parser = p;
        }

        private IllegalArgumentException bad(Exception e, String at) {
            if (e instanceof IllegalArgumentException && e.getMessage() != null && e.getMessage().startsWith(source)) {
                return (IllegalArgumentException) e;
            }
            Throwable c = e instanceof UncheckedIOException ? e.getCause() : e;
            String msg = c.getMessage() == null ? c.getClass().getSimpleName() : c.getMessage();
            if (c.getCause() != null && c instanceof IOException && c.getCause().getMessage() != null
                    && msg.contains(c.getCause().getMessage()) == false) {
                msg += " (" + c.getCause().getMessage() + ")";
            }
            return new IllegalArgumentException(source + ", " + at + ": malformed CSV: " + msg
                    + "; expected UTF-8 text in RFC 4180 form (comma-separated, fields with commas, quotes or line"
                    + " breaks in double quotes, quotes doubled inside)", e);
        }

        @Override
        List<String> columns() {
            return header;
        }

        @Override
        boolean next() {
            guard.newRecord();
            try {
                if (!it.hasNext()) {
                    rec = null;
                    return false;
                }
                rec = it.next();
            } catch (UncheckedIOException | IllegalStateException | IllegalArgumentException e) {
                throw bad(e, "after line " + parser.getCurrentLineNumber());
            }
            countRow();
            if (rec.size() != header.size()) {
                throw new IllegalArgumentException(where() + ": " + rec.size() + " fields for " + header.size()
                        + " columns " + header + "; every record needs one field per header column");
            }
            return true;
        }

        @Override
        String raw(int column) {
            String s = rec.get(column);
            return s.isEmpty() ? null : s;
        }

        @Override
        double number(int column, String accepted) {
            return parse(rec.get(column), column, accepted);
        }

        @Override
        String where() {
            return at(position());
        }

        @Override
        long position() {
            return parser.getCurrentLineNumber();
        }

        @Override
        String at(long position) {
            return source + ", line " + position;
        }

        @Override
        public void close() {
            closeQuietly(parser);
        }

        private static void closeQuietly(CSVParser p) {
            if (p != null) {
                try {
                    p.close();
                } catch (IOException | UncheckedIOException e) {
                    // nothing more to read; the data already read are complete
                }
            }
        }
    }

    /** Counts characters since the last reset and fails past the record limit (plus one read-ahead buffer). */
    static final class GuardReader extends FilterReader {
        private final long limit;
        private final String source;
        private long count;

        GuardReader(Reader in, int maxRecordChars, String source) {
            super(in);
            this.limit = maxRecordChars + 16_384L;
            this.source = source;
        }

        /** Starts counting a new record. */
        void newRecord() {
            count = 0;
        }

        @Override
        public int read() throws IOException {
            int c = super.read();
            if (c >= 0) {
                add(1);
            }
            return c;
        }

        @Override
        public int read(char[] buf, int off, int len) throws IOException {
            int n = super.read(buf, off, len);
            if (n > 0) {
                add(n);
            }
            return n;
        }

        private void add(int n) throws IOException {
            count += n;
            if (count > limit) {
                throw new IOException("a record is longer than the limit of " + (limit - 16_384L)
                        + " characters (ReadLimits.withMaxRecordChars) in " + source);
            }
        }
    }

    // ------------------------------------------------------------------ JDBC

    static final class Jdbc extends RowCursor {
        private final Statement statement; // null when the caller gave the result set
        private final ResultSet rs;
        private final List<String> cols;

        Jdbc(TableSource src, ReadLimits limits, boolean ownStatement) {
            super(src.name, limits);
            Statement st = null;
            try {
                ResultSet r;
                if (ownStatement) {
                    st = src.connection.createStatement(ResultSet.TYPE_FORWARD_ONLY, ResultSet.CONCUR_READ_ONLY);
                    st.setFetchSize(10_000);
                    r = st.executeQuery(src.sql);
                } else {
                    r = src.resultSet;
                }
                ResultSetMetaData md = r.getMetaData();
                List<String> c = new ArrayList<>();
                for (int i = 1; i <= md.getColumnCount(); i++) {
                    c.add(md.getColumnLabel(i));
                }
                cols = List.copyOf(c);
                rs = r;
            } catch (SQLException | RuntimeException e) {
                closeQuietly(st);
                throw new IllegalArgumentException(source + " failed: " + e.getMessage(), e);
            }
            statement = st;
        }

        @Override
        List<String> columns() {
            return cols;
        }

        @Override
        boolean next() {
            try {
                if (!rs.next()) {
                    return false;
                }
            } catch (SQLException e) {
                throw new IllegalArgumentException(source + ", after row " + row + ": " + e.getMessage(), e);
            }
            countRow();
            return true;
        }

        @Override
        String raw(int column) {
            try {
                String s = rs.getString(column + 1);
                return s == null || s.isEmpty() ? null : s;
            } catch (SQLException e) {
                throw new IllegalArgumentException(where() + ", column '" + cols.get(column) + "': " + e.getMessage(),
                        e);
            }
        }

        @Override
        double number(int column, String accepted) {
            Object o;
            try {
                o = rs.getObject(column + 1);
            } catch (SQLException e) {
                throw new IllegalArgumentException(where() + ", column '" + cols.get(column) + "': " + e.getMessage(),
                        e);
            }
            if (o == null) {
                return Double.NaN;
            }
            if (o instanceof Number) {
                double v = o instanceof BigDecimal ? ((BigDecimal) o).doubleValue() : ((Number) o).doubleValue();
                if (!Double.isFinite(v)) {
                    throw new IllegalArgumentException(where() + ", column '" + cols.get(column) + "': " + v
                            + " is not a finite number; expected " + accepted);
                }
                return v;
            }
            if (o instanceof String) {
                return parse((String) o, column, accepted);
            }
            throw new IllegalArgumentException(where() + ", column '" + cols.get(column) + "': a value of type "
                    + o.getClass().getSimpleName().toLowerCase(Locale.ROOT) + " is not a number; expected "
                    + accepted);
        }

        @Override
        String where() {
            return at(row);
        }

        @Override
        long position() {
            return row;
        }

        @Override
        String at(long position) {
            return source + ", row " + position;
        }

        @Override
        public void close() {
            if (statement != null) {
                closeQuietly(statement);
            }
        }

        private static void closeQuietly(Statement st) {
            if (st != null) {
                try {
                    st.close();
                } catch (SQLException e) {
                    // the rows already read are complete
                }
            }
        }
    }

    /** Throws unless the bin layout is within the limits' bin count ({@link ReadLimits#maxBins()}). */
    static void checkBinCount(Bins bins, ReadLimits limits) {
        if (bins.count() > limits.maxBins()) {
            throw new IllegalArgumentException("the layout has " + bins.count() + " bins, more than the limit of "
                    + limits.maxBins() + " (ReadLimits.withMaxBins)");
        }
    }
}
