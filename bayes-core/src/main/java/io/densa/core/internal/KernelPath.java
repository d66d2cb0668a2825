package io.densa.core.internal;

import java.util.Locale;

/**
 * The few hot inner kernels of {@link Kernels}, the variogram pass, the density estimator and
 * kriging's exponential covariances, in two implementations:
 * {@link ScalarPath} (plain Java, vectorised by the JIT where it can) and, only when the JVM was
 * started with the incubating vector module ({@code --add-modules jdk.incubator.vector}), a path
 * written with explicit SIMD vectors ({@code VectorPath}). Internal.
 *
 * <p>The choice is made once, when this class is initialised: the vector path when the module is
 * in the boot layer, its preferred vector holds at least four doubles and the system property
 * {@code densa.vector} is not {@code false}; the scalar path otherwise. The vector class is loaded
 * by name only in the first case, so users who add no flag never link against the incubating
 * module and get exactly the scalar arithmetic. The two paths compute the same sums with the same
 * blocking but may round differently (fused multiply-add, another order inside a block); they
 * agree to about 1e-14 relative on sums of products (checked by KernelPathTest, run in a second
 * test execution with the flag). The incubating module's transcendental operators (its vector
 * exponential) are not used: the JIT compiles them to intrinsics that may round differently from
 * their interpreted fallback, so a result would depend on warm-up (measured: a parallel fit then
 * differed from the serial one in the 14th digit). The exponential and logarithm kernels here
 * ({@link #weightedExp}, {@link #logs}) are instead Densa's own polynomials written with lane-wise
 * IEEE operations only, within one or two units in the last place of {@link StrictMath}'s and the
 * same bits compiled or interpreted; the scalar path keeps {@link Math#exp} and {@link Math#log}.
 */
public abstract class KernelPath {
    private static final KernelPath SCALAR = new ScalarPath();
    private static final KernelPath VECTOR = loadVector();
    private static final KernelPath ACTIVE =
            VECTOR != null && !"false".equalsIgnoreCase(System.getProperty("densa.vector", "")) ? VECTOR : SCALAR;

    KernelPath() {
    }

    /** The path in use. */
    public static KernelPath active() {
        return ACTIVE;
    }

    /** The plain-Java path. */
    public static KernelPath scalar() {
        return SCALAR;
    }

    /** The SIMD path when the JVM offers it (null otherwise), whatever {@code densa.vector} says. */
    public static KernelPath vector() {
        return VECTOR;
    }

    private static KernelPath loadVector() {
        if (ModuleLayer.boot().findModule("jdk.incubator.vector").isEmpty()) {
            return null;
        }
        try {
            KernelPath p = (KernelPath) Class.forName("io.densa.core.internal.VectorPath")
                    .getDeclaredConstructor().newInstance();
            return p.lanes() >= 4 ? p : null;
        } catch (ReflectiveOperationException | LinkageError | SecurityException e) {
            return null;
        }
    }

    /** The estimator's passes with one unit per lane ({@link UnitLanes}), or null on the scalar path. */
    UnitLanes unitLanes() {
        return null;
    }

    /** Doubles per SIMD vector (1 for the scalar path). */
    public abstract int lanes();

    /** A short description for benchmark output, e.g. "vector (8 doubles)". */
    public String describe() {
        return lanes() == 1 ? "scalar" : String.format(Locale.ROOT, "vector (%d doubles)", lanes());
    }

    /**
     * Adds the rows r0..r1−1 of A (k columns) to s[0..k), each column's entries in row order, and
     * raises s[k] to the largest |entry| (NaN once an entry is NaN, as {@link Math#max}).
     */
    public abstract void addColumnSumsAndMaxAbs(double[] a, int k, int r0, int r1, double[] s);

    /**
     * Adds Σ_i (a_i − c)(a_i − c)ᵀ over the rows {@code rows[r0..r1)} of A (k columns; the rows
     * r0..r1−1 themselves when {@code rows} is null; c = 0 when {@code center} is null) to the
     * upper triangle (l ≥ j) of s (k × k row-major); the lower triangle is left undefined.
     */
    public abstract void addCrossProduct(double[] a, int k, int[] rows, int r0, int r1, double[] center, double[] s);

    /**
     * out[outOff + i·m + q] = Σ_j a[aOff + i·k + j] b[j·m + q] for i &lt; rows, q &lt; m (B row-major
     * k × m; out overwritten, must not alias a or b).
     */
    public abstract void multiplyRows(double[] a, int aOff, int rows, int k, double[] b, int m, double[] out,
            int outOff);

    /**
     * da[q] = Σ_c y[ia·k + c] yt[c·n + js + q] for q &lt; len (row ia of Y against the columns
     * js..js+len−1 of Yᵀ, stored k × n), and the same for row ib into db when ib ≥ 0.
     */
    public abstract void rowDots(double[] y, double[] yt, int n, int k, int ia, int ib, int js, int len, double[] da,
            double[] db);

    /**
     * Planar lags from one point to a run of points: d2[q] = dx² + dy² with dx = xs[from + q] − x0,
     * dy = ys[from + q] − y0 (products rounded, then their sum: no fused multiply-add), and
     * h[q] = √d2[q], for q &lt; len. Both paths compute exactly these operations (the same bits);
     * where d2 lies outside [2⁻⁹⁶⁰, 2⁹⁶⁰] the caller replaces h by a scaled form.
     */
    public abstract void planarLags(double[] xs, double[] ys, double x0, double y0, int from, int len, double[] d2,
            double[] h);

    /**
     * Squared distances from dot products, in place: dot[off + q] becomes
     * ni + nsq[from + q] − 2·dot[off + q] (‖a‖² + ‖b‖² − 2 a·b), negative rounding set to 0, for
     * q &lt; len. Both paths compute exactly these operations.
     */
    public abstract void squaredDistances(double ni, double[] nsq, int from, double[] dot, int off, int len);

    /**
     * Equal-width lag bins of a run of pairs (squared distances d2[q], distances h[q], q &lt; len):
     * bin[q] = ⌈h·invWidth⌉ − 1 clamped to [0, last], or {@code beyond} where d2 &gt; max2 or
     * h &gt; top, stored as a double (a small integer, exact). Both paths give the same bins.
     */
    public abstract void lagBins(double[] d2, double[] h, int len, double invWidth, int last, int beyond, double max2,
            double top, double[] bin);

    /**
     * The bin of {@link #lagBins} for one pair: ⌈x⌉ − 1 for x = h/width ≥ 0 by truncation,
     * minus one on an exact integer (a truncation past the int range saturates and clamps to last).
     */
    public static int lagBin(double d2, double h, double invWidth, int last, int beyond, double max2, double top) {
        double x = h * invWidth;
        int t = (int) x;
        int b = Math.max(0, Math.min(last, (double) t == x ? t - 1 : t));
        return d2 > max2 || h > top ? beyond : b;
    }

    /**
     * out[q] = w[q]·exp(a·x[q] − shift) for q &lt; n (w null: weights 1): the node weights of a
     * quadrature of exp, or exponential covariances. The scalar path computes exactly that
     * expression with {@link Math#exp}; the SIMD path evaluates exp with its own polynomial (within
     * one unit in the last place of {@link Math#exp}) and gives the same bits on every run, JIT or
     * not.
     */
    public abstract void weightedExp(double[] x, double a, double shift, double[] w, double[] out, int n);

    /**
     * out[i] = ln x[idx[i]] for i &lt; n (the logarithms of a gathered subset, e.g. of the occupied
     * bins' masses). The scalar path computes {@link Math#log}; the SIMD path its own series (within
     * two units in the last place of {@link StrictMath#log} where x is a positive normal number, the
     * same bits on every run), {@link Math#log} elsewhere (0, subnormal, ∞, negative, NaN).
     */
    public abstract void logs(double[] x, int[] idx, int n, double[] out);
}
