package io.densa.io.tables;

import io.densa.io.Bins;
import io.densa.io.ReadLimits;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.function.Consumer;
import java.util.stream.Stream;

/**
 * One sandboxed in-memory SQL engine with a view {@code src} over the file of a
 * {@link BulkObservations}: checks the columns, bins or collects the values per unit and delivers
 * them in batches. Package-private; opened and closed by {@link BulkObservations} for one pass.
 */
final class BulkEngine implements AutoCloseable {
    private final BulkObservations owner;
    private final Path path;
    private final Path temp;
    private final Connection conn;
    private String unit;
    private String value;
    private String weight;
    private String period;
    /** On a circle: values are reduced into [wrapLo, wrapHi) and then capped at wrapTop; NaN when bounded. */
    private double wrapLo = Double.NaN, wrapHi = Double.NaN, wrapTop = Double.NaN;

    BulkEngine(BulkObservations owner, Path path, int nThreads) {
        this.owner = owner;
        this.path = path;
        Connection c = null;
        Path t = null;
        try {
            t = Files.createTempDirectory("densa-sql");
            c = connect(path, t, nThreads);
            conn = c;
            temp = t;
            createView();
        } catch (IOException ex) {
            closeAll(c, t);
            throw new IllegalStateException("cannot create a temporary directory for the SQL engine: "
                    + ex.getMessage(), ex);
        } catch (RuntimeException ex) {
            closeAll(c, t);
            throw ex;
        }
    }

    private Connection connect(Path p, Path tmp, int nThreads) {
        Connection c;
        try {
            c = DriverManager.getConnection("jdbc:duckdb:");
        } catch (SQLException ex) {
            throw new IllegalStateException("the embedded SQL engine is not available (" + ex.getMessage()
                    + "); add the dependency org.duckdb:duckdb_jdbc to use BulkObservations", ex);
        }
        try (Statement st = c.createStatement()) {
            st.execute("SET threads = " + nThreads);
            st.execute("SET memory_limit = '" + owner.memoryMiB + "MiB'");
            st.execute("SET temp_directory = " + BulkObservations.literal(tmp.toString()));
            st.execute("SET autoinstall_known_extensions = false");
            st.execute("SET autoload_known_extensions = false");
            st.execute("SET allowed_paths = [" + BulkObservations.literal(p.toString()) + "]");
            st.execute("SET allowed_directories = [" + BulkObservations.literal(tmp.toString() + "/") + "]");
            st.execute("SET enable_external_access = false");
            st.execute("SET lock_configuration = true");
        } catch (SQLException ex) {
            try {
                c.close();
            } catch (SQLException ignored) {
                // closing after a failed set-up
            }
            throw new IllegalStateException("cannot configure the SQL engine sandbox: " + ex.getMessage(), ex);
        }
        return c;
    }

    private String scan(String types) {
        if (owner.format == BulkObservations.Format.PARQUET) {
            return "read_parquet(" + BulkObservations.literal(path.toString()) + ")";
        }
        return "read_csv(" + BulkObservations.literal(path.toString()) + ", header = true, delim = ',', quote = '\"', escape = '\"',"
                + " strict_mode = true, max_line_size = " + owner.limits.maxRecordChars()
                + (types.isEmpty() ? "" : ", types = {" + types + "}") + ")";
    }

    private void createView() {
        List<String> cols = new ArrayList<>();
        List<String> kinds = new ArrayList<>();
        query("DESCRIBE SELECT * FROM " + scan(""), rs -> {
            while (rs.next()) {
                cols.add(rs.getString(1));
                kinds.add(rs.getString(2));
            }
        });
        unit = resolve(cols, owner.unitColumn, "unit");
        value = resolve(cols, owner.valueColumn, "value");
        weight = owner.weightColumn == null ? null : resolve(cols, owner.weightColumn, "weight");
        period = owner.periodColumn == null ? null : resolve(cols, owner.periodColumn, "period");
        String types = "";
        if (owner.format == BulkObservations.Format.CSV) {
            java.util.Map<String, String> t = new java.util.LinkedHashMap<>();
            typed(t, unit, "VARCHAR");
            typed(t, value, "DOUBLE");
            if (weight != null) {
                typed(t, weight, "DOUBLE");
            }
            if (period != null) {
                typed(t, period, "VARCHAR");
            }
            StringBuilder sb = new StringBuilder();
            t.forEach((k, ty) -> sb.append(sb.length() == 0 ? "" : ", ").append(BulkObservations.literal(k)).append(": '")
                    .append(ty).append('\''));
            types = sb.toString();
        } else {
            checkNumeric(value, kinds.get(cols.indexOf(value)), "value");
            if (weight != null) {
                checkNumeric(weight, kinds.get(cols.indexOf(weight)), "weight");
            }
        }
        update("CREATE TEMP VIEW src AS SELECT * FROM " + scan(types));
    }

    private void typed(java.util.Map<String, String> t, String col, String type) {
        String prev = t.putIfAbsent(col, type);
        if (prev != null && !prev.equals(type)) {
            throw new IllegalArgumentException(owner.source() + ": column '" + col + "' cannot be both a text (unit,"
                    + " period) and a numeric (value, weight) column");
        }
    }

    private String resolve(List<String> cols, String name, String role) {
        if (cols.contains(name)) {
            return name;
        }
        String found = null;
        for (String c : cols) {
            if (c.equalsIgnoreCase(name)) {
                if (found != null) {
                    throw new IllegalArgumentException(owner.source() + ": " + role + " column '" + name
                            + "' matches several columns ignoring case; name it exactly");
                }
                found = c;
            }
        }
        if (found == null) {
            throw new IllegalArgumentException(owner.source() + ": missing " + role + " column '" + name
                    + "'; the columns are " + cols);
        }
        return found;
    }

    private void checkNumeric(String col, String type, String role) {
        String t = type.toUpperCase(Locale.ROOT);
        boolean numeric = t.matches("(U?(TINYINT|SMALLINT|INTEGER|BIGINT|HUGEINT)|FLOAT|DOUBLE|DECIMAL.*)");
        if (!numeric) {
            throw new IllegalArgumentException(owner.source() + ", column '" + col + "': the " + role
                    + " column has type " + type + "; expected a numeric column (integer, float, double or"
                    + " decimal)");
        }
    }

    /**
     * Value expression: the value column as DOUBLE; on a circle ({@link #onCircle}) a finite value
     * reduced modulo P = wrapHi − wrapLo into [wrapLo, wrapHi) by the arithmetic of
     * {@link io.densa.io.CircularValues#wrap} and capped at wrapTop (a value in the sliver between e_D
     * and e_0 + P goes to the last bin), while NULL, NaN and ±∞ pass unchanged for the checks to name.
     */
    private String v() {
        String r = "CAST(" + BulkObservations.ident(value) + " AS DOUBLE)";
        if (Double.isNaN(wrapLo)) {
            return r;
        }
        String lo = BulkObservations.dbl(wrapLo), hi = BulkObservations.dbl(wrapHi);
        String p = "(" + hi + " - " + lo + ")";
        String y = "(" + lo + " + ((" + r + " - " + lo + ") - " + p + " * floor((" + r + " - " + lo + ") / " + p
                + ")))";
        return "(CASE WHEN " + r + " IS NULL OR isnan(" + r + ") OR isinf(" + r + ") THEN " + r + " ELSE least(CASE WHEN "
                + r + " >= " + lo + " AND " + r + " < " + hi + " THEN " + r + " WHEN " + y + " >= " + hi + " OR " + y
                + " < " + lo + " THEN " + lo + " ELSE " + y + " END, " + BulkObservations.dbl(wrapTop) + ") END)";
    }

    /** Values are taken modulo the period from now on: into [lo, lo + period), capped at top. */
    private void onCircle(double lo, double hi, double top) {
        wrapLo = lo;
        wrapHi = hi;
        wrapTop = top;
    }

    /** On a circle only ±∞ can lie outside the range: an error whatever the policy. */
    private void checkCircle(long outside, double periodLength) {
        if (!Double.isNaN(wrapLo) && outside > 0) {
            fail("value", "isinf(v)", "the value is infinite (" + outside + " such values in the file); on the circle"
                    + " of period " + periodLength + " every finite value is accepted (taken modulo the period)");
        }
    }

    private String w() {
        return weight == null ? "1.0" : "CAST(" + BulkObservations.ident(weight) + " AS DOUBLE)";
    }

    private String p() {
        return period == null ? "NULL" : BulkObservations.ident(period);
    }

    /** The unit, period, value and weight of every row as u, p, v, w (and more columns). */
    private String projection(String more) {
        return "(SELECT " + more + BulkObservations.ident(unit) + " AS u, " + p() + " AS p, " + v() + " AS v, " + w() + " AS w FROM src)";
    }

    private String badWeight() {
        return "coalesce(NOT (w >= 0 AND isfinite(w)), true)";
    }

    /** circle: the period on a periodic space (values taken modulo it into [e_0, e_0 + P)), 0 when bounded. */
    BulkSummary histograms(Bins bins, double circle, OutsidePolicy policy, Consumer<CountTable> consumer) {
        int d = bins.count();
        double[] e = bins.edges();
        if (circle > 0) {
            onCircle(e[0], e[0] + circle, e[d]);
        }
        String inner = projection("");
        String inside;
        if (BulkObservations.uniformEdges(e)) {
            // j0 = floor((v - e0) D / (eD - e0)) is the bin up to rounding; one comparison with each
            // neighbouring edge, computed by the same formula as Bins.uniform, makes it exact
            String range = "(" + BulkObservations.dbl(e[d]) + " - " + BulkObservations.dbl(e[0]) + ")";
            inner = "(SELECT *, least(greatest(floor((v - " + BulkObservations.dbl(e[0]) + ") * (" + d + " / " + range
                    + "))::INTEGER, 0), " + (d - 1) + ") AS j0 FROM " + inner + ")";
            inside = "CASE WHEN v < " + BulkObservations.edgeSql(e[0], range, d, "j0") + " THEN j0 - 1 WHEN j0 < "
                    + (d - 1) + " AND v >= " + BulkObservations.edgeSql(e[0], range, d, "j0 + 1")
                    + " THEN j0 + 1 ELSE j0 END";
        } else {
            inside = BulkObservations.binTree(e, 0, d);
        }
        String binExpr = "CASE WHEN v IS NULL OR isnan(v) THEN " + (d + 2) + " WHEN v < " + BulkObservations.dbl(e[0]) + " THEN " + d
                + " WHEN v > " + BulkObservations.dbl(e[d]) + " THEN " + (d + 1) + " ELSE " + inside + " END";
        String weights = weight == null ? "NULL AS sw, 0 AS bad"
                : "sum(w) AS sw, count(*) FILTER (WHERE " + badWeight() + ") AS bad";
        // without a period column p is a constant NULL: leave it out of the grouping key
        String keys = period == null ? "u, b" : "u, p, b";
        update("CREATE TEMP TABLE densa_h AS SELECT u, " + (period == null ? "NULL AS p" : "p") + ", b, n, sw, bad"
                + " FROM (SELECT u, " + (period == null ? "" : "p, ") + "(" + binExpr + ") AS b, count(*) AS n, "
                + weights + " FROM " + inner + " GROUP BY " + keys + ")");
        String kept = policy == OutsidePolicy.CLAMP ? "b <= " + (d + 1) : "b < " + d;
        long[] s = new long[9];
        query("SELECT count(*) FILTER (WHERE u IS NULL), count(*) FILTER (WHERE p IS NULL), "
                + "coalesce(sum(n) FILTER (WHERE b = " + (d + 2) + "), 0), coalesce(sum(n) FILTER (WHERE b = " + d
                + "), 0), coalesce(sum(n) FILTER (WHERE b = " + (d + 1) + "), 0), coalesce(sum(bad), 0), "
                + "coalesce(sum(n), 0), count(DISTINCT (u, p)) FILTER (WHERE " + kept + "), "
                + "coalesce(max(greatest(length(CAST(u AS VARCHAR)), coalesce(length(CAST(p AS VARCHAR)), 0))), 0)"
                + " FROM densa_h", rs -> {
                    rs.next();
                    for (int i = 0; i < s.length; i++) {
                        s[i] = rs.getLong(i + 1);
                    }
                });
        checkCircle(s[3] + s[4], circle);
        checkSummary(s, policy, bins.lower(), bins.upper(), "the range of the bins");
        long below = s[3], above = s[4], total = s[6];
        OutsideReport rep = policy == OutsidePolicy.DROP
                ? new OutsideReport(policy, bins.lower(), bins.upper(), total, below + above, 0, 0)
                : new OutsideReport(policy, bins.lower(), bins.upper(), total, 0, below, above);
        String amount = weight == null ? "CAST(n AS DOUBLE)" : "sw";
        long[] units = {0};
        int[] batches = {0};
        query("SELECT CAST(u AS VARCHAR), CAST(p AS VARCHAR), b, " + amount + " FROM densa_h WHERE " + kept
                + " ORDER BY u, p, b", rs -> {
                    List<String> ids = new ArrayList<>();
                    List<String> periods = period == null ? null : new ArrayList<>();
                    List<double[]> rows = new ArrayList<>();
                    String lastU = null, lastP = null;
                    double[] cur = null;
                    while (rs.next()) {
                        String u = rs.getString(1);
                        String pp = rs.getString(2);
                        int b = rs.getInt(3);
                        double a = rs.getDouble(4);
                        if (cur == null || !u.equals(lastU) || !Objects.equals(pp, lastP)) {
                            if (rows.size() == owner.batchUnits) {
                                deliver(bins, ids, periods, rows, rep, consumer);
                                batches[0]++;
                            }
                            cur = new double[d];
                            rows.add(cur);
                            ids.add(u);
                            if (periods != null) {
                                periods.add(pp);
                            }
                            lastU = u;
                            lastP = pp;
                            units[0]++;
                        }
                        cur[b == d ? 0 : b == d + 1 ? d - 1 : b] += a;
                    }
                    if (!rows.isEmpty()) {
                        deliver(bins, ids, periods, rows, rep, consumer);
                        batches[0]++;
                    }
                });
        return new BulkSummary(units[0], batches[0], rep.kept(), rep, owner.source());
    }

    private void deliver(Bins bins, List<String> ids, List<String> periods, List<double[]> rows,
            OutsideReport rep, Consumer<CountTable> consumer) {
        CountTable t = new CountTable(bins, ids.toArray(new String[0]),
                periods == null ? null : periods.toArray(new String[0]), rows.toArray(new double[0][]), rep,
                owner.source());
        ids.clear();
        rows.clear();
        if (periods != null) {
            periods.clear();
        }
        consumer.accept(t);
    }

    /**
     * s: null units, null periods, bad values, below, above, bad weights, total, units kept, longest
     * id or period.
     */
    private void checkSummary(long[] s, OutsidePolicy policy, double lo, double hi, String range) {
        if (s[0] > 0) {
            fail("unit", "u IS NULL", "the unit id is missing; every row needs one");
        }
        if (s[1] > 0 && period != null) {
            fail("period", "p IS NULL", "the period is missing; every row needs one");
        }
        if (s[2] > 0) {
            fail("value", "v IS NULL OR isnan(v)", "the value is missing or NaN; expected a finite number");
        }
        if (s[5] > 0) {
            fail("weight", badWeight(), "the weight is missing, negative or not finite; expected a finite"
                    + " number >= 0");
        }
        if (policy == OutsidePolicy.REJECT && s[3] + s[4] > 0) {
            fail("value", "v < " + BulkObservations.dbl(lo) + " OR v > " + BulkObservations.dbl(hi), "the value lies outside " + range + " [" + lo
                    + ", " + hi + "] and the policy is REJECT (" + (s[3] + s[4]) + " such values in the file);"
                    + " choose OutsidePolicy.DROP or CLAMP to accept them, or widen the range");
        }
        if (s[7] > owner.limits.maxUnits()) {
            throw new IllegalArgumentException(owner.source() + " has " + s[7] + " units, more than the limit of "
                    + owner.limits.maxUnits() + " (ReadLimits.withMaxUnits)");
        }
        if (s[8] > owner.limits.maxFieldChars()) {
            fail("unit", "greatest(length(CAST(u AS VARCHAR)), coalesce(length(CAST(p AS VARCHAR)), 0)) > "
                    + owner.limits.maxFieldChars(), "a unit id or period has more than "
                    + owner.limits.maxFieldChars() + " characters, the limit (ReadLimits.withMaxFieldChars)");
        }
    }

    /** Finds the first offending data row with a single-threaded pass, and throws naming it. */
    private void fail(String column, String condition, String what) {
        String at = "";
        try (BulkEngine diag = new BulkEngine(owner, path, 1)) {
            String col = column.equals("unit") ? unit : column.equals("value") ? value
                    : column.equals("weight") ? weight : period;
            String[] found = new String[2];
            diag.query("SELECT rn, t FROM " + diag.projection("row_number() OVER () AS rn, CAST(" + BulkObservations.ident(col)
                    + " AS VARCHAR) AS t, ") + " WHERE " + condition + " LIMIT 1", rs -> {
                        if (rs.next()) {
                            found[0] = rs.getString(1);
                            found[1] = rs.getString(2);
                        }
                    });
            if (found[0] != null) {
                at = ", data row " + found[0] + ", column '" + col + "' ("
                        + (found[1] == null ? "empty" : "'" + RowCursor.clip(found[1]) + "'") + ")";
            }
        } catch (RuntimeException ex) {
            at = " (the row could not be located: " + ex.getMessage() + ")";
        }
        throw new IllegalArgumentException(owner.source() + at + ": " + what);
    }

    /** circle: the period on a periodic space (values taken modulo it into [lo, hi)), 0 when bounded. */
    BulkSummary samples(double lo, double hi, double circle, OutsidePolicy policy, Consumer<SampleTable> consumer) {
        if (circle > 0) {
            onCircle(lo, hi, hi);
        }
        String inner = projection("");
        String keep = policy == OutsidePolicy.DROP ? "v >= " + BulkObservations.dbl(lo) + " AND v <= " + BulkObservations.dbl(hi) : "true";
        long[] s = new long[10];
        query("SELECT count(*) FILTER (WHERE u IS NULL), count(*) FILTER (WHERE p IS NULL), "
                + "count(*) FILTER (WHERE v IS NULL OR isnan(v)), count(*) FILTER (WHERE v < " + BulkObservations.dbl(lo) + "), "
                + "count(*) FILTER (WHERE v > " + BulkObservations.dbl(hi) + "), count(*) FILTER (WHERE " + badWeight() + "), "
                + "count(*), count(DISTINCT (u, p)) FILTER (WHERE " + keep + "), "
                + "coalesce(max(greatest(length(CAST(u AS VARCHAR)), coalesce(length(CAST(p AS VARCHAR)), 0))), 0),"
                + " (SELECT coalesce(max(c), 0) FROM (SELECT count(*) AS c FROM " + inner + " WHERE " + keep
                + " GROUP BY u, p)) FROM " + inner, rs -> {
                    rs.next();
                    for (int i = 0; i < s.length; i++) {
                        s[i] = rs.getLong(i + 1);
                    }
                });
        checkCircle(s[3] + s[4], circle);
        checkSummary(s, policy, lo, hi, "the domain of the space");
        if (s[9] > owner.limits.maxRows()) {
            throw new IllegalArgumentException(owner.source() + ": one unit has " + s[9] + " observations, more than"
                    + " the limit of " + owner.limits.maxRows() + " held at once (ReadLimits.withMaxRows)");
        }
        long below = s[3], above = s[4], total = s[6];
        OutsideReport rep = policy == OutsidePolicy.DROP
                ? new OutsideReport(policy, lo, hi, total, below + above, 0, 0)
                : new OutsideReport(policy, lo, hi, total, 0, below, above);
        String vv = policy == OutsidePolicy.CLAMP ? "least(greatest(v, " + BulkObservations.dbl(lo) + "), " + BulkObservations.dbl(hi) + ")" : "v";
        long[] units = {0};
        int[] batches = {0};
        long[] kept = {0};
        query("SELECT CAST(u AS VARCHAR), CAST(p AS VARCHAR), " + vv + " AS x, w FROM " + inner + " WHERE " + keep
                + " ORDER BY u, p, x, w", rs -> {
                    SampleBatch batch = new SampleBatch(period != null, weight != null);
                    String lastU = null, lastP = null;
                    while (rs.next()) {
                        String u = rs.getString(1);
                        String pp = rs.getString(2);
                        double x = rs.getDouble(3);
                        double wt = rs.getDouble(4);
                        if (batch.units() == 0 || !u.equals(lastU) || !Objects.equals(pp, lastP)) {
                            if (batch.units() == owner.batchUnits || batch.observations >= owner.limits.maxRows()) {
                                consumer.accept(batch.take(rep, owner.source()));
                                batches[0]++;
                            }
                            batch.start(u, pp);
                            lastU = u;
                            lastP = pp;
                            units[0]++;
                        }
                        batch.add(x, wt);
                        kept[0]++;
                    }
                    if (batch.units() > 0) {
                        consumer.accept(batch.take(rep, owner.source()));
                        batches[0]++;
                    }
                });
        return new BulkSummary(units[0], batches[0], kept[0], rep, owner.source());
    }

    private void update(String sql) {
        try (Statement st = conn.createStatement()) {
            st.execute(sql);
        } catch (SQLException ex) {
            throw engineError(ex);
        }
    }

    private void query(String sql, ResultReader reader) {
        try (Statement st = conn.createStatement(); ResultSet rs = st.executeQuery(sql)) {
            reader.read(rs);
        } catch (SQLException ex) {
            throw engineError(ex);
        }
    }

    private IllegalArgumentException engineError(SQLException ex) {
        String m = ex.getMessage() == null ? ex.toString() : ex.getMessage();
        int cut = m.indexOf("\n\nLINE");
        if (cut > 0) {
            m = m.substring(0, cut);
        }
        if (m.length() > 2000) {
            m = m.substring(0, 2000) + "...";
        }
        return new IllegalArgumentException(owner.source() + ": the SQL engine could not read it as "
                + (owner.format == BulkObservations.Format.CSV ? "RFC 4180 CSV (UTF-8, header line, numeric value and weight columns)"
                        : "Parquet with numeric value and weight columns") + ": " + m.strip(), ex);
    }

    @Override
    public void close() {
        closeAll(conn, temp);
    }

    private void closeAll(Connection c, Path t) {
        if (c != null) {
            try {
                c.close();
            } catch (SQLException ignored) {
                // nothing left to read
            }
        }
        if (t != null) {
            try (Stream<Path> walk = Files.walk(t)) {
                for (Path q : (Iterable<Path>) walk.sorted(Comparator.reverseOrder())::iterator) {
                    Files.deleteIfExists(q);
                }
            } catch (IOException ignored) {
                // a spill file left behind in the system temporary directory
            }
        }
    }

    private interface ResultReader {
        void read(ResultSet rs) throws SQLException;
    }

    /** Samples of the units of one batch. */
    private static final class SampleBatch {
        final List<String> ids = new ArrayList<>();
        final List<String> periods;
        final List<double[]> values = new ArrayList<>();
        final List<double[]> weights;
        final List<Integer> sizes = new ArrayList<>();
        double[] v;
        double[] w;
        int n;
        long observations;

        SampleBatch(boolean withPeriods, boolean weighted) {
            periods = withPeriods ? new ArrayList<>() : null;
            weights = weighted ? new ArrayList<>() : null;
        }

        int units() {
            return ids.size();
        }

        void start(String id, String period) {
            close();
            ids.add(id);
            if (periods != null) {
                periods.add(period);
            }
            v = new double[16];
            w = weights == null ? null : new double[16];
            n = 0;
        }

        void add(double x, double wt) {
            if (n == v.length) {
                v = Arrays.copyOf(v, n * 2);
                if (w != null) {
                    w = Arrays.copyOf(w, n * 2);
                }
            }
            v[n] = x;
            if (w != null) {
                w[n] = wt;
            }
            n++;
            observations++;
        }

        private void close() {
            if (v != null) {
                values.add(Arrays.copyOf(v, n));
                if (weights != null) {
                    weights.add(Arrays.copyOf(w, n));
                }
                v = null;
            }
        }

        SampleTable take(OutsideReport rep, String source) {
            close();
            SampleTable t = new SampleTable(ids.toArray(new String[0]),
                    periods == null ? null : periods.toArray(new String[0]), values.toArray(new double[0][]),
                    weights == null ? null : weights.toArray(new double[0][]), rep, source);
            ids.clear();
            values.clear();
            if (periods != null) {
                periods.clear();
            }
            if (weights != null) {
                weights.clear();
            }
            observations = 0;
            return t;
        }
    }
}
