package io.densa.core.internal;

import java.util.Arrays;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/**
 * The Cholesky factorisation A = L Lᵀ of a symmetric positive definite matrix and the triangular
 * solves and inverses built on it (Golub &amp; Van Loan (2013), Matrix Computations, 4th ed., Johns
 * Hopkins, §4.2 and §3.1). Matrices are row-major {@code double[]} with an explicit row stride;
 * only the lower triangle of a factor is read. Kernels follow the EJML convention
 * {@code (inputs, out) -> out}: an output array must not alias an input unless the method says
 * "in place".
 *
 * <p>Internal: not exported outside the Densa modules; may change without notice. Stateless and
 * thread-safe.
 */
public final class Cholesky {
    /**
     * Size from which {@link #factorLarge} is the better choice: EJML switches from its inner-product
     * Cholesky to a blocked one at this size ({@code EjmlParameters.SWITCH_BLOCK64_CHOLESKY}).
     */
    public static final int LARGE = 1000;

    private Cholesky() {
    }

    /**
     * In-place lower Cholesky factor of the leading n × n block of a (row stride s), reading and
     * writing the lower triangle only (the strict upper triangle is left as it was). The pivots are
     * formed column by column and the off-diagonal entries are scaled by the reciprocal pivot, as
     * LAPACK's dpotf2 and EJML's inner Cholesky do, so that for an exactly symmetric matrix the
     * result equals EJML's {@code CholeskyDecompositionInner_DDRM} bit for bit.
     *
     * @param a                the matrix, overwritten by L on success
     * @param minRelativePivot a column j fails when its pivot d (before the square root) is not
     *                         greater than {@code minRelativePivot · |a_jj|} (relative to the
     *                         column's own diagonal, so a uniformly small matrix is not called
     *                         degenerate; 0: d must be positive) or is +∞; NaN always fails
     * @return -1 on success, or the first failing column j; its d is left in {@code a[j*s+j]}
     */
    public static int factor(double[] a, int n, int s, double minRelativePivot) {
        // pivot[i] = a_ii − Σ_{p<j} L_ip², its terms subtracted as each L_ip is formed (in the same
        // order as the dot product over row i would, so the same bits), which takes that dot
        // product off the chain from one column's pivot to the next
        double[] pivot = new double[n];
        for (int i = 0; i < n; i++) {
            pivot[i] = a[i * s + i];
        }
        for (int j = 0; j < n; j++) {
            int rj = j * s;
            double ajj = a[rj + j];
            double d = pivot[j];
            double floor = minRelativePivot == 0 ? 0.0 : minRelativePivot * Math.abs(ajj);
            if (!(d > floor) || d == Double.POSITIVE_INFINITY) {
                a[rj + j] = d;
                return j;
            }
            d = Math.sqrt(d);
            a[rj + j] = d;
            double inv = 1.0 / d;
            int i = j + 1;
            // eight rows at a time: independent sums share the loads of row j (each entry's terms
            // in the same order as one row at a time, so the factor is the same bit for bit)
            for (; i + 7 < n; i += 8) {
                int r0 = i * s, r1 = r0 + s, r2 = r1 + s, r3 = r2 + s, r4 = r3 + s, r5 = r4 + s, r6 = r5 + s,
                        r7 = r6 + s;
                double v0 = a[r0 + j], v1 = a[r1 + j], v2 = a[r2 + j], v3 = a[r3 + j];
                double v4 = a[r4 + j], v5 = a[r5 + j], v6 = a[r6 + j], v7 = a[r7 + j];
                for (int p = 0; p < j; p++) {
                    double b = a[rj + p];
                    v0 -= a[r0 + p] * b;
                    v1 -= a[r1 + p] * b;
                    v2 -= a[r2 + p] * b;
                    v3 -= a[r3 + p] * b;
                    v4 -= a[r4 + p] * b;
                    v5 -= a[r5 + p] * b;
                    v6 -= a[r6 + p] * b;
                    v7 -= a[r7 + p] * b;
                }
                double l0 = v0 * inv, l1 = v1 * inv, l2 = v2 * inv, l3 = v3 * inv;
                double l4 = v4 * inv, l5 = v5 * inv, l6 = v6 * inv, l7 = v7 * inv;
                a[r0 + j] = l0;
                a[r1 + j] = l1;
                a[r2 + j] = l2;
                a[r3 + j] = l3;
                a[r4 + j] = l4;
                a[r5 + j] = l5;
                a[r6 + j] = l6;
                a[r7 + j] = l7;
                pivot[i] -= l0 * l0;
                pivot[i + 1] -= l1 * l1;
                pivot[i + 2] -= l2 * l2;
                pivot[i + 3] -= l3 * l3;
                pivot[i + 4] -= l4 * l4;
                pivot[i + 5] -= l5 * l5;
                pivot[i + 6] -= l6 * l6;
                pivot[i + 7] -= l7 * l7;
            }
            for (; i < n; i++) {
                int ri = i * s;
                double v = a[ri + j];
                for (int p = 0; p < j; p++) {
                    v -= a[ri + p] * a[rj + p];
                }
                double l = v * inv;
                a[ri + j] = l;
                pivot[i] -= l * l;
            }
        }
        return -1;
    }

    /**
     * Lower Cholesky factor of a large symmetric matrix by EJML's blocked algorithm (for n ≥
     * {@link #LARGE}; any size is accepted). The matrix is overwritten.
     *
     * @return the factor (n × n, zero above the diagonal), or null if EJML reports a breakdown
     */
    public static double[] factorLarge(DMatrixRMaj a) {
        CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(a.numRows, true);
        if (!chol.decompose(a)) {
            return null;
        }
        return chol.getT(null).data;
    }

    /**
     * log det(L Lᵀ) = 2 Σ_i log L_ii of the factor left by {@link #factor} (n × n, row stride s),
     * the diagonal summed in order.
     */
    public static double logDeterminant(double[] l, int n, int s) {
        double ld = 0;
        for (int i = 0; i < n; i++) {
            ld += Math.log(l[i * s + i]);
        }
        return 2 * ld;
    }

    /** Solves L Lᵀ x = b in place, b in x[off..off+n) (L lower in l, row stride s). */
    public static void solve(double[] l, int n, int s, double[] x, int off) {
        forward(l, n, s, x, off);
        backward(l, n, s, x, off);
    }

    /** Forward substitution L x = b in place, b in x[off..off+n). */
    public static void forward(double[] l, int n, int s, double[] x, int off) {
        forward(l, null, n, s, x, off);
    }

    /**
     * Forward substitution L x = b in place, b in x[off..off+n); with {@code inverseDiagonal}
     * (1/L_ii, see {@link #inverseDiagonal}) each unknown is a product by it instead of a division
     * by L_ii (within one rounding of the quotient: for many right-hand sides solved one at a time,
     * where the divisions, each waiting for the last, set the pace); null: divisions.
     */
    public static void forward(double[] l, double[] inverseDiagonal, int n, int s, double[] x, int off) {
        final double[] rd = inverseDiagonal;
        int i = 0;
        // four rows at a time: their sums over the unknowns already solved run side by side, then
        // the four finish in turn (each row's terms in the same order as one row at a time)
        for (; i + 3 < n; i += 4) {
            int r0 = i * s, r1 = r0 + s, r2 = r1 + s, r3 = r2 + s;
            double v0 = x[off + i], v1 = x[off + i + 1], v2 = x[off + i + 2], v3 = x[off + i + 3];
            for (int p = 0; p < i; p++) {
                double xp = x[off + p];
                v0 -= l[r0 + p] * xp;
                v1 -= l[r1 + p] * xp;
                v2 -= l[r2 + p] * xp;
                v3 -= l[r3 + p] * xp;
            }
            double x0 = rd == null ? v0 / l[r0 + i] : v0 * rd[i];
            v1 -= l[r1 + i] * x0;
            v2 -= l[r2 + i] * x0;
            v3 -= l[r3 + i] * x0;
            double x1 = rd == null ? v1 / l[r1 + i + 1] : v1 * rd[i + 1];
            v2 -= l[r2 + i + 1] * x1;
            v3 -= l[r3 + i + 1] * x1;
            double x2 = rd == null ? v2 / l[r2 + i + 2] : v2 * rd[i + 2];
            v3 -= l[r3 + i + 2] * x2;
            x[off + i] = x0;
            x[off + i + 1] = x1;
            x[off + i + 2] = x2;
            x[off + i + 3] = rd == null ? v3 / l[r3 + i + 3] : v3 * rd[i + 3];
        }
        for (; i < n; i++) {
            double v = x[off + i];
            int ri = i * s;
            for (int p = 0; p < i; p++) {
                v -= l[ri + p] * x[off + p];
            }
            x[off + i] = rd == null ? v / l[ri + i] : v * rd[i];
        }
    }

    /** 1/L_ii for i &lt; n (a new array), for the substitutions that multiply instead of dividing. */
    public static double[] inverseDiagonal(double[] l, int n, int s) {
        double[] rd = new double[n];
        for (int i = 0; i < n; i++) {
            rd[i] = 1.0 / l[i * s + i];
        }
        return rd;
    }

    /**
     * Back substitution Lᵀ x = b in place, b in x[off..off+n), by rows of L: once x_i is known its
     * multiples L_{i,p} x_i (p &lt; i, row i of L, unit stride) are subtracted from the remaining
     * right-hand sides. The same operations as {@link #backward} in another order (so results
     * differ by rounding), without its chain of dependent subtractions per unknown: for the small
     * systems solved once per target (kriging), where that chain's latency dominates.
     */
    public static void backwardByRows(double[] l, int n, int s, double[] x, int off) {
        backwardByRows(l, null, n, s, x, off);
    }

    /**
     * {@link #backwardByRows(double[], int, int, double[], int)} with products by 1/L_ii as in
     * {@link #forward(double[], double[], int, int, double[], int)} (null: divisions).
     */
    public static void backwardByRows(double[] l, double[] inverseDiagonal, int n, int s, double[] x, int off) {
        final double[] rd = inverseDiagonal;
        int i = n - 1;
        // four rows at a time: the 4 × 4 corner in turn, then each remaining unknown loses the four
        // multiples in the order one row at a time would subtract them (one load and store for four)
        for (; i >= 3; i -= 4) {
            int r0 = i * s, r1 = r0 - s, r2 = r1 - s, r3 = r2 - s;
            double x0 = rd == null ? x[off + i] / l[r0 + i] : x[off + i] * rd[i];
            double v1 = x[off + i - 1] - l[r0 + i - 1] * x0;
            double x1 = rd == null ? v1 / l[r1 + i - 1] : v1 * rd[i - 1];
            double v2 = x[off + i - 2] - l[r0 + i - 2] * x0;
            v2 -= l[r1 + i - 2] * x1;
            double x2 = rd == null ? v2 / l[r2 + i - 2] : v2 * rd[i - 2];
            double v3 = x[off + i - 3] - l[r0 + i - 3] * x0;
            v3 -= l[r1 + i - 3] * x1;
            v3 -= l[r2 + i - 3] * x2;
            double x3 = rd == null ? v3 / l[r3 + i - 3] : v3 * rd[i - 3];
            x[off + i] = x0;
            x[off + i - 1] = x1;
            x[off + i - 2] = x2;
            x[off + i - 3] = x3;
            for (int p = 0; p < i - 3; p++) {
                double v = x[off + p];
                v -= l[r0 + p] * x0;
                v -= l[r1 + p] * x1;
                v -= l[r2 + p] * x2;
                v -= l[r3 + p] * x3;
                x[off + p] = v;
            }
        }
        for (; i >= 0; i--) {
            int ri = i * s;
            double xi = rd == null ? x[off + i] / l[ri + i] : x[off + i] * rd[i];
            x[off + i] = xi;
            for (int p = 0; p < i; p++) {
                x[off + p] -= l[ri + p] * xi;
            }
        }
    }

    /** Back substitution Lᵀ x = b in place, b in x[off..off+n). */
    public static void backward(double[] l, int n, int s, double[] x, int off) {
        for (int i = n - 1; i >= 0; i--) {
            double v = x[off + i];
            for (int p = i + 1; p < n; p++) {
                v -= l[p * s + i] * x[off + p];
            }
            x[off + i] = v / l[i * s + i];
        }
    }

    /**
     * Solves L Lᵀ X = B in place for B row-major n × w, one column at a time (L row stride n).
     */
    public static void solveColumns(double[] l, int n, double[] b, int w) {
        for (int c = 0; c < w; c++) {
            for (int i = 0; i < n; i++) {
                double s = b[i * w + c];
                for (int j = 0; j < i; j++) {
                    s -= l[i * n + j] * b[j * w + c];
                }
                b[i * w + c] = s / l[i * n + i];
            }
            for (int i = n - 1; i >= 0; i--) {
                double s = b[i * w + c];
                for (int j = i + 1; j < n; j++) {
                    s -= l[j * n + i] * b[j * w + c];
                }
                b[i * w + c] = s / l[i * n + i];
            }
        }
    }

    /**
     * Forward substitution L X = B in place for B row-major n × w (rows of length w; L row stride
     * n), row by row; zero entries of L are skipped. One column (w = 1) goes to {@link #forward},
     * whose loops are blocked for it: the same operations, so the same results for finite B (a
     * skipped zero entry would instead turn an infinite b into NaN there).
     */
    public static void forwardRows(double[] l, int n, double[] b, int w) {
        if (w == 1) {
            forward(l, n, n, b, 0);
            return;
        }
        for (int r = 0; r < n; r++) {
            int ro = r * w;
            int lo = r * n;
            for (int c = 0; c < r; c++) {
                double f = l[lo + c];
                if (f == 0) {
                    continue;
                }
                int co = c * w;
                for (int q = 0; q < w; q++) {
                    b[ro + q] -= f * b[co + q];
                }
            }
            double d = l[lo + r];
            for (int q = 0; q < w; q++) {
                b[ro + q] /= d;
            }
        }
    }

    /**
     * L⁻¹ (n × n lower, row-major, zero above the diagonal) of a lower factor with row stride n,
     * column by column.
     *
     * @param out n·n values, overwritten (must not alias l)
     */
    public static void invertLower(double[] l, int n, double[] out) {
        Arrays.fill(out, 0, n * n, 0.0);
        for (int c = 0; c < n; c++) {
            for (int i = c; i < n; i++) {
                double s = i == c ? 1.0 : 0.0;
                int ri = i * n;
                for (int p = c; p < i; p++) {
                    s -= l[ri + p] * out[p * n + c];
                }
                out[ri + c] = s / l[ri + i];
            }
        }
    }

    /**
     * Column col of L⁻¹ for a lower factor with row stride n: out[i] for i ≥ col (entries above
     * are not written).
     */
    public static void invertLowerColumn(double[] l, int n, int col, double[] out) {
        for (int i = col; i < n; i++) {
            double s = i == col ? 1.0 : 0.0;
            int ri = i * n;
            for (int p = col; p < i; p++) {
                s -= l[ri + p] * out[p];
            }
            out[i] = s / l[ri + i];
        }
    }

    /**
     * Inverse of an upper triangular matrix R whose entry (i, j), j ≥ i, is
     * {@code r[i*rowStride + j*colStride]} (so a lower factor L read as Lᵀ has strides (1, n)),
     * column by column by back substitution.
     *
     * @param out n·n values, row-major; the upper triangle and diagonal are written, the strict
     *            lower triangle is left as it was (zero for a fresh array); must not alias r
     */
    public static void invertUpper(double[] r, int n, int rowStride, int colStride, double[] out) {
        for (int c = 0; c < n; c++) {
            for (int i = c; i >= 0; i--) {
                double s = i == c ? 1.0 : 0.0;
                for (int m = i + 1; m <= c; m++) {
                    s -= r[i * rowStride + m * colStride] * out[m * n + c];
                }
                out[i * n + c] = s / r[i * rowStride + i * colStride];
            }
        }
    }

    /**
     * out = Tᵀ c for T lower triangular (n × n, row-major), c in c[off..off+n); out (length ≥ n) is
     * overwritten and must not alias c. The sum runs over the rows of T in order.
     */
    public static void transposeTimes(double[] t, int n, double[] c, int off, double[] out) {
        Arrays.fill(out, 0, n, 0.0);
        for (int i = 0; i < n; i++) {
            double ci = c[off + i];
            int base = i * n;
            for (int j = 0; j <= i; j++) {
                out[j] += t[base + j] * ci;
            }
        }
    }

    /**
     * L M Lᵀ for L lower triangular and M symmetric (both n × n, row-major): the product L M by
     * rows, then its lower triangle times Lᵀ, mirrored. Returns a fresh symmetric n × n matrix.
     */
    public static double[] lowerCongruence(double[] l, double[] m, int n) {
        double[] tmp = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double s = 0;
                for (int p = 0; p <= i; p++) {
                    s += l[i * n + p] * m[p * n + j];
                }
                tmp[i * n + j] = s;
            }
        }
        double[] out = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j <= i; j++) {
                double s = 0;
                for (int p = 0; p <= j; p++) {
                    s += tmp[i * n + p] * l[j * n + p];
                }
                out[i * n + j] = s;
                out[j * n + i] = s;
            }
        }
        return out;
    }
}
