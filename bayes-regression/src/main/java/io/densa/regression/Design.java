package io.densa.regression;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Objects;
import java.util.TreeSet;
import org.ejml.data.DMatrixRMaj;

/**
 * An immutable design (model) matrix for scalar covariates: an optional intercept, named numeric
 * columns, and categorical covariates in treatment coding (one indicator column per level other
 * than the reference level). Columns are named {@code intercept}, the numeric name, or
 * {@code name=level}; a covariate ("term") may span several columns.
 *
 * <p>Built with {@link #builder()}; every value is checked (NaN or infinite numeric values and
 * null categories are rejected naming column and row). Rank is checked by the models that
 * fit it, which name the columns that are linear combinations of earlier ones.
 *
 * <p>Immutable and thread-safe; arrays in and out are copies.
 */
public final class Design {
    /** Name of the intercept column and term. */
    public static final String INTERCEPT = "intercept";

    private final int n;
    private final int p;
    private final double[] x; // n × p row-major
    private final List<String> columnNames;
    private final List<Term> terms;

    /**
     * A covariate and the design columns it occupies.
     *
     * @param name        covariate name ({@link #INTERCEPT} for the intercept)
     * @param columns     indices of its columns in the design matrix
     * @param categorical whether it is a categorical covariate
     * @param reference   reference level of a categorical covariate, else null
     */
    public record Term(String name, List<Integer> columns, boolean categorical, String reference) {
        /** Canonical constructor: copies the column list. */
        public Term {
            columns = List.copyOf(columns);
        }
    }

    private Design(int n, int p, double[] x, List<String> columnNames, List<Term> terms) {
        this.n = n;
        this.p = p;
        this.x = x;
        this.columnNames = columnNames;
        this.terms = terms;
    }

    /** A new builder (with intercept unless {@link Builder#withoutIntercept()} is called). */
    public static Builder builder() {
        return new Builder();
    }

    /**
     * Intercept-only design with n rows.
     *
     * @throws IllegalArgumentException if n &lt; 1
     */
    public static Design interceptOnly(int n) {
        if (n < 1) {
            throw new IllegalArgumentException("design needs at least 1 row, got " + n);
        }
        return builder().rows(n).build();
    }

    /** Number of rows n. */
    public int rows() {
        return n;
    }

    /** Number of columns p. */
    public int columns() {
        return p;
    }

    /** Column names, in order (unmodifiable). */
    public List<String> columnNames() {
        return columnNames;
    }

    /** Terms (covariates) in order, the intercept first when present (unmodifiable). */
    public List<Term> terms() {
        return terms;
    }

    /** Whether column 0 is the intercept. */
    public boolean hasIntercept() {
        return !terms.isEmpty() && terms.get(0).name().equals(INTERCEPT);
    }

    /**
     * The term of the given name.
     *
     * @throws IllegalArgumentException if there is none (listing the names there are)
     */
    public Term term(String name) {
        for (Term t : terms) {
            if (t.name().equals(name)) {
                return t;
            }
        }
        List<String> names = new ArrayList<>();
        for (Term t : terms) {
            names.add(t.name());
        }
        throw new IllegalArgumentException("no covariate named '" + name + "'; the design has " + names);
    }

    /**
     * Index of a column by name.
     *
     * @throws IllegalArgumentException if there is none
     */
    public int columnIndex(String name) {
        int i = columnNames.indexOf(name);
        if (i < 0) {
            throw new IllegalArgumentException("no design column named '" + name + "'; columns are " + columnNames);
        }
        return i;
    }

    /** The design matrix n × p (fresh copy). */
    public DMatrixRMaj matrix() {
        return DMatrixRMaj.wrap(n, p, x.clone());
    }

    /**
     * Value at row i, column j.
     *
     * @throws IllegalArgumentException if i is outside [0, n) or j outside [0, p)
     */
    public double value(int i, int j) {
        if (i < 0 || i >= n || j < 0 || j >= p) {
            throw new IllegalArgumentException("design entry (" + i + ", " + j + ") outside the " + n + " x " + p
                    + " design (rows 0.." + (n - 1) + ", columns " + columnNames + ")");
        }
        return x[i * p + j];
    }

    double[] internal() {
        return x;
    }

    /**
     * The rows at the given indices, in that order (a new design with the same columns).
     *
     * @param rowIdx at least one row index in [0, n); repeats allowed (not modified)
     * @throws IllegalArgumentException on an empty selection or an index out of range
     */
    public Design subset(int... rowIdx) {
        Objects.requireNonNull(rowIdx, "rowIdx");
        if (rowIdx.length == 0) {
            throw new IllegalArgumentException("a design subset needs at least one row; give indices in [0, " + n
                    + ")");
        }
        double[] out = new double[rowIdx.length * p];
        for (int r = 0; r < rowIdx.length; r++) {
            if (rowIdx[r] < 0 || rowIdx[r] >= n) {
                throw new IllegalArgumentException("row " + rowIdx[r] + " outside [0, " + n + ")");
            }
            System.arraycopy(x, rowIdx[r] * p, out, r * p, p);
        }
        return new Design(rowIdx.length, p, out, columnNames, terms);
    }

    /** The design without the given term's columns (used by tests of that term). */
    Design without(String termName) {
        Term drop = term(termName);
        List<Integer> keep = new ArrayList<>();
        for (int j = 0; j < p; j++) {
            if (!drop.columns().contains(j)) {
                keep.add(j);
            }
        }
        int q = keep.size();
        double[] out = new double[n * q];
        for (int i = 0; i < n; i++) {
            for (int c = 0; c < q; c++) {
                out[i * q + c] = x[i * p + keep.get(c)];
            }
        }
        List<String> names = new ArrayList<>();
        for (int c : keep) {
            names.add(columnNames.get(c));
        }
        List<Term> ts = new ArrayList<>();
        for (Term t : terms) {
            if (t == drop) {
                continue;
            }
            List<Integer> cols = new ArrayList<>();
            for (int c : t.columns()) {
                cols.add(keep.indexOf(c));
            }
            ts.add(new Term(t.name(), cols, t.categorical(), t.reference()));
        }
        return new Design(n, q, out, Collections.unmodifiableList(names), Collections.unmodifiableList(ts));
    }

    /**
     * Checks that the weighted design has full column rank and at least as many rows as
     * columns, by modified Gram–Schmidt on the columns in order. Each column is first scaled by a
     * power of two to a largest |value| in [1, 2) (rank does not depend on column scales), so that
     * covariates near 1e300 or 1e-170 are judged by their direction, not by the overflow or
     * underflow of their squares.
     *
     * @param w observation weights or null
     * @throws IllegalArgumentException naming the columns that are (numerically) linear
     *                                  combinations of earlier columns
     */
    void requireFullRank(double[] w, int extraParameters, String what) {
        if (n < p + extraParameters) {
            throw new IllegalArgumentException(what + ": " + n + " observations for " + (p + extraParameters)
                    + " parameters; need at least as many observations as parameters");
        }
        List<String> bad = new ArrayList<>();
        List<double[]> basis = new ArrayList<>();
        for (int j = 0; j < p; j++) {
            double[] c = new double[n];
            for (int i = 0; i < n; i++) {
                c[i] = x[i * p + j] * (w == null ? 1.0 : Math.sqrt(w[i]));
            }
            scaleToUnit(c, 0, 1, n);
            double norm0 = 0;
            for (int i = 0; i < n; i++) {
                norm0 += c[i] * c[i];
            }
            for (int pass = 0; pass < 2; pass++) {
                for (double[] b : basis) {
                    double d = 0;
                    for (int i = 0; i < n; i++) {
                        d += b[i] * c[i];
                    }
                    for (int i = 0; i < n; i++) {
                        c[i] -= d * b[i];
                    }
                }
            }
            double norm = 0;
            for (int i = 0; i < n; i++) {
                norm += c[i] * c[i];
            }
            if (!(norm > 1e-20 * Math.max(norm0, Double.MIN_NORMAL)) || norm0 == 0) {
                bad.add(columnNames.get(j));
            } else {
                double s = 1 / Math.sqrt(norm);
                for (int i = 0; i < n; i++) {
                    c[i] *= s;
                }
                basis.add(c);
            }
        }
        if (!bad.isEmpty()) {
            throw new IllegalArgumentException(what + ": the design is rank deficient; column(s) " + bad
                    + " are zero or linear combinations of earlier columns of " + columnNames
                    + "; drop or recode them");
        }
    }

    /**
     * Multiplies the count values v[off], v[off + stride], … by the power of two that brings their
     * largest magnitude into [1, 2) (exact); all zeros are left alone.
     * Returns the factor.
     */
    static double scaleToUnit(double[] v, int off, int stride, int count) {
        double m = 0;
        for (int i = 0; i < count; i++) {
            m = Math.max(m, Math.abs(v[off + i * stride]));
        }
        if (m == 0 || !Double.isFinite(m)) {
            return 1.0;
        }
        double f = Math.scalb(1.0, -Math.getExponent(m));
        if (f == 1.0) {
            return 1.0;
        }
        for (int i = 0; i < count; i++) {
            v[off + i * stride] *= f; // f ≤ 2^1023: subnormal columns end up below [1, 2), still normal
        }
        return f;
    }

    @Override
    public String toString() {
        return "Design[n=" + n + ", columns=" + columnNames + "]";
    }

    /** Builder of a {@link Design}; not thread-safe, build once. */
    public static final class Builder {
        private boolean intercept = true;
        private int rows = -1;
        private String firstName;
        private final List<Object[]> specs = new ArrayList<>();
        private final LinkedHashSet<String> names = new LinkedHashSet<>();

        private Builder() {
        }

        /** Leaves out the intercept column. */
        public Builder withoutIntercept() {
            intercept = false;
            return this;
        }

        /** Fixes the number of rows (needed only for an intercept-only design). */
        public Builder rows(int n) {
            if (n < 1) {
                throw new IllegalArgumentException("design needs at least 1 row, got " + n);
            }
            setRows(n, "rows()");
            return this;
        }

        private void setRows(int len, String name) {
            if (rows >= 0 && len != rows) {
                throw new IllegalArgumentException("covariate '" + name + "' has " + len + " values but "
                        + (firstName == null ? "the design" : "'" + firstName + "'") + " has " + rows
                        + "; every covariate needs one value per observation");
            }
            if (rows < 0) {
                rows = len;
                firstName = name.equals("rows()") ? null : name;
            }
        }

        private void addName(String name) {
            Objects.requireNonNull(name, "name");
            if (name.isEmpty() || name.equals(INTERCEPT) || !names.add(name)) {
                throw new IllegalArgumentException("covariate name '" + name + "' is empty, reserved or used twice");
            }
        }

        /**
         * Adds a numeric covariate.
         *
         * @param values one finite value per observation (copied); any magnitude up to the largest
         *               double, but a column that is not all zero needs one |value| of at least
         *               {@link Double#MIN_NORMAL} (the fit scales columns, see
         *               {@link FunctionOnScalarRegression})
         * @throws IllegalArgumentException on a NaN or infinite value (naming the row), a column of
         *                                  subnormal values or a length that differs from earlier
         *                                  covariates
         */
        public Builder numeric(String name, double[] values) {
            addName(name);
            Objects.requireNonNull(values, "values");
            double largest = 0;
            for (int i = 0; i < values.length; i++) {
                if (!Double.isFinite(values[i])) {
                    throw new IllegalArgumentException("covariate '" + name + "' row " + i + " is not finite: "
                            + values[i] + "; numeric covariates must be finite");
                }
                largest = Math.max(largest, Math.abs(values[i]));
            }
            if (largest > 0 && largest < Double.MIN_NORMAL) {
                throw new IllegalArgumentException("covariate '" + name + "' has largest |value| " + largest
                        + ", below the smallest normal double " + Double.MIN_NORMAL + ": such values keep fewer"
                        + " significant digits than the fit needs; express the covariate in smaller units (or"
                        + " give an all-zero column, which the fit names as rank deficient)");
            }
            setRows(values.length, name);
            specs.add(new Object[] {name, values.clone()});
            return this;
        }

        /**
         * Adds a categorical covariate with treatment coding against {@code reference}; the other
         * levels are those present in the data, in sorted order.
         *
         * @throws IllegalArgumentException on a null value (naming the row), a reference level
         *                                  that does not occur, or only one level
         */
        public Builder categorical(String name, String[] values, String reference) {
            Objects.requireNonNull(values, "values");
            TreeSet<String> levels = new TreeSet<>();
            for (int i = 0; i < values.length; i++) {
                if (values[i] == null) {
                    throw new IllegalArgumentException("covariate '" + name + "' row " + i
                            + " is null; every row needs a level (a non-null string)");
                }
                levels.add(values[i]);
            }
            return categorical(name, values, reference, levels.toArray(new String[0]));
        }

        /**
         * Adds a categorical covariate with a fixed list of levels (so that designs for new data
         * get the same columns even when a level does not occur).
         *
         * @param levels all admissible levels, including the reference
         */
        public Builder categorical(String name, String[] values, String reference, String... levels) {
            addName(name);
            Objects.requireNonNull(values, "values");
            Objects.requireNonNull(reference, "reference");
            Objects.requireNonNull(levels, "levels");
            for (int i = 0; i < levels.length; i++) {
                if (levels[i] == null) {
                    throw new IllegalArgumentException("covariate '" + name + "': level " + i
                            + " is null; levels must be non-null strings");
                }
            }
            List<String> lv = new ArrayList<>(new LinkedHashSet<>(Arrays.asList(levels)));
            if (!lv.contains(reference)) {
                throw new IllegalArgumentException("covariate '" + name + "': reference level '" + reference
                        + "' is not among its levels " + lv);
            }
            lv.remove(reference);
            if (lv.isEmpty()) {
                throw new IllegalArgumentException("covariate '" + name + "' has only its reference level '"
                        + reference + "'; a categorical covariate needs at least two levels");
            }
            for (int i = 0; i < values.length; i++) {
                if (values[i] == null || !(values[i].equals(reference) || lv.contains(values[i]))) {
                    throw new IllegalArgumentException("covariate '" + name + "' row " + i + " has level '"
                            + values[i] + "', accepted levels are " + reference + " and " + lv);
                }
            }
            setRows(values.length, name);
            specs.add(new Object[] {name, values.clone(), reference, lv});
            return this;
        }

        /**
         * Builds the design.
         *
         * @throws IllegalArgumentException if it has no columns or no rows
         */
        @SuppressWarnings("unchecked")
        public Design build() {
            if (rows < 1) {
                throw new IllegalArgumentException("design has no rows: add a covariate or call rows(n)");
            }
            List<String> cols = new ArrayList<>();
            List<Term> terms = new ArrayList<>();
            List<double[]> data = new ArrayList<>();
            if (intercept) {
                double[] one = new double[rows];
                Arrays.fill(one, 1.0);
                terms.add(new Term(INTERCEPT, List.of(0), false, null));
                cols.add(INTERCEPT);
                data.add(one);
            }
            for (Object[] s : specs) {
                String name = (String) s[0];
                if (s.length == 2) {
                    terms.add(new Term(name, List.of(cols.size()), false, null));
                    cols.add(name);
                    data.add((double[]) s[1]);
                } else {
                    String[] v = (String[]) s[1];
                    List<String> lv = (List<String>) s[3];
                    List<Integer> idx = new ArrayList<>();
                    for (String level : lv) {
                        double[] ind = new double[rows];
                        for (int i = 0; i < rows; i++) {
                            ind[i] = v[i].equals(level) ? 1.0 : 0.0;
                        }
                        idx.add(cols.size());
                        cols.add(name + "=" + level);
                        data.add(ind);
                    }
                    terms.add(new Term(name, idx, true, (String) s[2]));
                }
            }
            int p = cols.size();
            if (p == 0) {
                throw new IllegalArgumentException("design has no columns: keep the intercept or add a covariate");
            }
            double[] x = new double[rows * p];
            for (int j = 0; j < p; j++) {
                double[] c = data.get(j);
                for (int i = 0; i < rows; i++) {
                    x[i * p + j] = c[i];
                }
            }
            return new Design(rows, p, x, Collections.unmodifiableList(cols), Collections.unmodifiableList(terms));
        }
    }
}
