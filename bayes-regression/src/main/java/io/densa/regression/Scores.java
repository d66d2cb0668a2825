package io.densa.regression;

import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * FPCA scores: an n × m table of z_ij, the score of density i on component j
 * ({@link Fpca#scores(io.densa.core.DensitySet, int)}), with the densities' ids.
 *
 * <p>A value: the row-major array is copied in and out; {@code toString} prints at most five rows
 * and six components.
 *
 * @param rows       n, the number of densities
 * @param components m, the number of components
 * @param values     the scores, row-major (n·m values)
 * @param ids        the densities' ids, or an empty list when the set had none
 */
public record Scores(int rows, int components, double[] values, List<String> ids) {
    private static final int SHOWN_ROWS = 5;
    private static final int SHOWN_COLUMNS = 6;

    /** Validates and copies. */
    public Scores {
        Objects.requireNonNull(values, "values");
        Objects.requireNonNull(ids, "ids");
        if (rows < 0 || components < 0 || values.length != (long) rows * components) {
            throw new IllegalArgumentException("scores need rows x components = " + rows + " x " + components
                    + " values, got " + values.length);
        }
        if (!ids.isEmpty() && ids.size() != rows) {
            throw new IllegalArgumentException(ids.size() + " ids for " + rows + " rows (give one per row or none)");
        }
        values = values.clone();
        ids = List.copyOf(ids);
    }

    /** The scores, row-major (a fresh copy). */
    @Override
    public double[] values() {
        return values.clone();
    }

    /** The score of density i on component j (both 0-based). */
    public double get(int i, int j) {
        Objects.checkIndex(i, rows);
        Objects.checkIndex(j, components);
        return values[i * components + j];
    }

    /** The m scores of density i (a fresh array). */
    public double[] row(int i) {
        Objects.checkIndex(i, rows);
        double[] r = new double[components];
        System.arraycopy(values, i * components, r, 0, components);
        return r;
    }

    /** The n scores on component j (a fresh array). */
    public double[] column(int j) {
        Objects.checkIndex(j, components);
        double[] c = new double[rows];
        for (int i = 0; i < rows; i++) {
            c[i] = values[i * components + j];
        }
        return c;
    }

    /** The scores as a fresh n × m EJML matrix. */
    public DMatrixRMaj matrix() {
        return new DMatrixRMaj(rows, components, true, values);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Scores s && rows == s.rows && components == s.components
                && java.util.Arrays.equals(values, s.values) && ids.equals(s.ids);
    }

    @Override
    public int hashCode() {
        return Objects.hash(rows, components, java.util.Arrays.hashCode(values), ids);
    }

    /** At most five rows and six components, then the size. */
    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder("Scores[").append(rows).append(" × ").append(components).append(']');
        for (int i = 0; i < Math.min(rows, SHOWN_ROWS); i++) {
            sb.append('\n').append(ids.isEmpty() ? "#" + i : ids.get(i)).append(':');
            for (int j = 0; j < Math.min(components, SHOWN_COLUMNS); j++) {
                sb.append(String.format(Locale.ROOT, " %.6g", values[i * components + j]));
            }
            if (components > SHOWN_COLUMNS) {
                sb.append(" …");
            }
        }
        if (rows > SHOWN_ROWS) {
            sb.append("\n… (").append(rows - SHOWN_ROWS).append(" more rows)");
        }
        return sb.toString();
    }
}
