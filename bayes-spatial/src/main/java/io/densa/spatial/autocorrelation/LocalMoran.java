package io.densa.spatial.autocorrelation;

import io.densa.core.BenjaminiHochberg;
import io.densa.core.TestResult;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.ProgressCounter;
import io.densa.core.internal.Seeds;
import io.densa.spatial.SpatialWeights;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Objects;
import java.util.SplittableRandom;

/**
 * Local Moran's I (a local indicator of spatial association, LISA) per unit, with
 * conditional-permutation pseudo p-values, quadrant labels and Benjamini–Hochberg adjusted
 * p-values.
 *
 * <h2>Definition</h2>
 * Anselin (1995), Local indicators of spatial association — LISA, Geographical Analysis 27(2)
 * (from memory). With z_i = x_i − x̄ and m2 = Σ_j z_j² / n,
 * <pre>
 *   I_i = (z_i / m2) Σ_j w_ij z_j,      so that   Σ_i I_i = n Σ_i Σ_j w_ij z_i z_j / Σ_j z_j² = S0 · I,
 * </pre>
 * where I is the global Moran's I of {@link MoranI} with the same weights; with row-standardised
 * weights and no islands S0 = n, so the mean of the I_i is I.
 *
 * <h2>Moments under total randomisation</h2>
 * Over all permutations of the n values over the units (Anselin 1995, from memory; re-derived for
 * this implementation), with w_i = Σ_j w_ij, w_i(2) = Σ_j w_ij² and b2 = n Σ z⁴ / (Σ z²)²:
 * <pre>
 *   E[I_i] = −w_i / (n − 1),
 *   Var[I_i] = w_i(2) (n − b2) / (n − 1) + (w_i² − w_i(2)) (2 b2 − n) / ((n − 1)(n − 2)) − w_i² / (n − 1)².
 * </pre>
 *
 * <h2>Conditional permutation test</h2>
 * For unit i the value x_i is held fixed and the other n − 1 values are randomly permuted over
 * the other units (only the |N(i)| values landing on the neighbours matter: they are drawn
 * without replacement by a partial Fisher–Yates shuffle). The conditional expectation is
 * E_i = −w_i z_i² / ((n − 1) m2). Pseudo p-values as in {@link AutocorrelationPermutation}:
 * p_greater = (1 + #{I_i,r ≥ I_i}) / (R + 1), p_less = (1 + #{I_i,r ≤ I_i}) / (R + 1),
 * p_two-sided = (1 + #{|I_i,r − E_i| ≥ |I_i − E_i|}) / (R + 1). Unit i draws from its own
 * generator seeded from (seed, i), so results depend neither on threads nor on blocking.
 *
 * <h2>Multiple testing</h2>
 * {@link Unit#adjustedPValue()} is the Benjamini–Hochberg step-up adjustment of the two-sided
 * p-values over the analysed units (Benjamini &amp; Hochberg (1995), Controlling the false
 * discovery rate, JRSS B 57 — from memory); a unit is significant at false discovery rate q when
 * adjustedPValue ≤ q. {@link io.densa.core.BenjaminiHochberg#adjust(double[])} adjusts any other set of p-values.
 *
 * <p>Inputs are not modified; methods are thread-safe.
 */
public final class LocalMoran {
    private static final int UNIT_BLOCK = 256;

    private LocalMoran() {
    }

    /** Moran scatterplot quadrant of a unit: its own value against its neighbours' (lag). */
    public enum Quadrant {
        /** z_i &gt; 0 and lag &gt; 0: a high value among high values. */
        HIGH_HIGH,
        /** z_i &lt; 0 and lag &lt; 0: a low value among low values. */
        LOW_LOW,
        /** z_i &gt; 0 and lag &lt; 0: a high value among low values. */
        HIGH_LOW,
        /** z_i &lt; 0 and lag &gt; 0: a low value among high values. */
        LOW_HIGH,
        /** z_i = 0 or lag = 0 exactly. */
        NONE
    }

    /**
     * One unit's local statistic.
     *
     * @param index                  original index of the unit
     * @param statistic              I_i
     * @param deviation              z_i = x_i − x̄
     * @param lag                    Σ_j w_ij z_j
     * @param quadrant               quadrant of (z_i, lag)
     * @param expectation            E[I_i] under total randomisation, −w_i / (n − 1)
     * @param variance               Var[I_i] under total randomisation
     * @param conditionalExpectation E_i = −w_i z_i² / ((n − 1) m2), the conditional-permutation mean
     * @param pTwoSided              two-sided conditional-permutation pseudo p-value
     * @param pGreater               one-sided pseudo p-value for I_i larger than expected
     * @param pLess                  one-sided pseudo p-value for I_i smaller than expected
     * @param adjustedPValue         Benjamini–Hochberg adjusted two-sided p-value
     */
    public record Unit(int index, double statistic, double deviation, double lag, Quadrant quadrant,
            double expectation, double variance, double conditionalExpectation, double pTwoSided, double pGreater,
            double pLess, double adjustedPValue) implements TestResult {
        /** The two-sided conditional-permutation pseudo p-value, {@link #pTwoSided()} (not adjusted). */
        @Override
        public double pValue() {
            return pTwoSided;
        }

        @Override
        public String method() {
            return "conditional permutation, two-sided (not adjusted for multiple testing)";
        }
    }

    /**
     * Local Moran's I of all analysed units.
     *
     * @param units         per-unit results in increasing original index
     * @param sum           Σ_i I_i (= S0 · I)
     * @param s0            S0 of the weights analysed
     * @param excludedUnits original indices of the units excluded as islands (empty if none)
     * @param permutations  R
     * @param seed          the seed that reproduces the permutations
     */
    public record Result(List<Unit> units, double sum, double s0, List<Integer> excludedUnits, int permutations,
            long seed) {
        /** Units whose adjusted p-value is at most q (false discovery rate q). */
        public List<Unit> significant(double q) {
            if (!(q > 0 && q <= 1)) {
                throw new IllegalArgumentException("false discovery rate " + q + " must be in (0, 1]");
            }
            List<Unit> out = new ArrayList<>();
            for (Unit u : units) {
                if (u.adjustedPValue() <= q) {
                    out.add(u);
                }
            }
            return Collections.unmodifiableList(out);
        }
    }

    /**
     * The local statistics I_i alone (islands are an error).
     *
     * @return a fresh n-vector
     * @throws IllegalArgumentException on a size mismatch, a non-finite value (naming the unit),
     *                                  a constant field or islands
     */
    public static double[] statistics(SpatialWeights weights, double[] values) {
        AutocorrelationSupport.ScalarField f = AutocorrelationSupport.scalarField(weights, values,
                IslandPolicy.ERROR, 2, "local Moran's I");
        double[] z = f.z();
        double m2 = f.sumSq() / z.length;
        double[] lag = f.original().spatialLag(z);
        double[] out = new double[z.length];
        for (int i = 0; i < z.length; i++) {
            out[i] = z[i] / m2 * lag[i];
        }
        return out;
    }

    /**
     * Local Moran's I with conditional-permutation p-values.
     *
     * @param options permutations (at least 1; 999 or 9,999 are usual), seed, island policy,
     *                parallelism
     * @throws IllegalArgumentException on a size mismatch, a non-finite value (naming the unit),
     *                                  a constant field, islands under the ERROR policy, fewer than
     *                                  3 units, or no permutations requested
     */
    public static Result test(SpatialWeights weights, double[] values, AutocorrelationOptions options) {
        Objects.requireNonNull(options, "options");
        AutocorrelationSupport.checkValues(values, weights);
        if (options.permutations() < 1) {
            throw new IllegalArgumentException("local Moran's I needs permutations for its p-values; use"
                    + " AutocorrelationOptions.withPermutations(999, seed)");
        }
        AutocorrelationSupport.ScalarField f = AutocorrelationSupport.scalarField(weights, values,
                options.islandPolicy(), 3, "local Moran's I");
        SpatialWeights w = f.original(); // I_i scales with the weights: the caller's own
        double[] z = f.z();
        int n = z.length;
        double nn = n;
        double m2 = f.sumSq() / n;
        double b2 = f.kurtosis();
        double[] lag = w.spatialLag(z);
        int[] rs = w.rowStarts();
        int[] cs = w.columnIndices();
        double[] vs = w.linkWeights();
        int r = options.permutations();
        long seed = options.seed();
        double[] stat = new double[n];
        double[] pTwo = new double[n];
        double[] pGt = new double[n];
        double[] pLt = new double[n];
        double[] condE = new double[n];
        int blocks = (n + UNIT_BLOCK - 1) / UNIT_BLOCK;
        boolean par = options.parallel() && Kernels.parallelWorth((long) r * (w.linkCount() + n));
        ProgressCounter progress = new ProgressCounter(options.progressListener(),
                "local Moran's I permutations", n);
        Kernels.forEachBlock(blocks, par, b -> {
            int[] pool = AutocorrelationSupport.identity(n);
            int[] swaps = new int[n];
            int i1 = Math.min(n, (b + 1) * UNIT_BLOCK);
            for (int i = b * UNIT_BLOCK; i < i1; i++) {
                int deg = rs[i + 1] - rs[i];
                double coef = z[i] / m2;
                double obs = coef * lag[i];
                double wi = 0;
                for (int q = rs[i]; q < rs[i + 1]; q++) {
                    wi += vs[q];
                }
                double e = -wi * z[i] * z[i] / ((nn - 1) * m2);
                stat[i] = obs;
                condE[i] = e;
                double tol = 1e-11 * (Math.abs(obs) + Math.abs(e));
                double dev = Math.abs(obs - e) - tol;
                // Exclude unit i: move it to the last slot and draw from the first n − 1.
                pool[i] = n - 1;
                pool[n - 1] = i;
                SplittableRandom rng = Seeds.stream(seed, i);
                int ge = 0, le = 0, two = 0;
                int size = n - 1;
                for (int t = 0; t < r; t++) {
                    double s = 0;
                    for (int m = 0; m < deg; m++) {
                        int j = m + rng.nextInt(size - m);
                        swaps[m] = j;
                        int tmp = pool[m];
                        pool[m] = pool[j];
                        pool[j] = tmp;
                        s += vs[rs[i] + m] * z[pool[m]];
                    }
                    for (int m = deg - 1; m >= 0; m--) {
                        int j = swaps[m];
                        int tmp = pool[m];
                        pool[m] = pool[j];
                        pool[j] = tmp;
                    }
                    double sim = coef * s;
                    if (sim >= obs - tol) {
                        ge++;
                    }
                    if (sim <= obs + tol) {
                        le++;
                    }
                    if (Math.abs(sim - e) >= dev) {
                        two++;
                    }
                }
                pool[n - 1] = n - 1;
                pool[i] = i;
                pTwo[i] = (1.0 + two) / (r + 1);
                pGt[i] = (1.0 + ge) / (r + 1);
                pLt[i] = (1.0 + le) / (r + 1);
            }
            progress.advance(i1 - b * UNIT_BLOCK);
        });
        double[] adj = BenjaminiHochberg.adjust(pTwo);
        List<Unit> units = new ArrayList<>(n);
        double sum = 0;
        for (int i = 0; i < n; i++) {
            double wi = 0, wi2 = 0;
            for (int q = rs[i]; q < rs[i + 1]; q++) {
                wi += vs[q];
                wi2 += vs[q] * vs[q];
            }
            double e = -wi / (nn - 1);
            // factors grouped so that weights near the accepted limit do not overflow on the way
            double var = wi2 * ((nn - b2) / (nn - 1)) + (wi * wi - wi2) * ((2 * b2 - nn) / ((nn - 1) * (nn - 2)))
                    - e * e;
            sum += stat[i];
            double dev = z[i] * f.scale(), lg = lag[i] * f.scale();
            if (!Double.isFinite(dev) || !Double.isFinite(lg)) {
                throw new IllegalArgumentException("the deviation from the mean or the spatial lag of unit " + f.kept()[i]
                        + " overflows a double (values up to " + maxAbs(values) + "); rescale the values");
            }
            if (!Double.isFinite(var) || !Double.isFinite(stat[i]) || !Double.isFinite(condE[i])) {
                throw new IllegalArgumentException("the local Moran statistic of unit " + f.kept()[i] + " or its"
                        + " variance overflows a double (its weights sum to " + wi + "); divide the weights by a"
                        + " common factor");
            }
            units.add(new Unit(f.kept()[i], stat[i], dev, lg, quadrant(z[i], lag[i]), e, var, condE[i], pTwo[i],
                    pGt[i], pLt[i], adj[i]));
        }
        return new Result(Collections.unmodifiableList(units), sum, w.s0(), f.excluded(), r, seed);
    }

    private static double maxAbs(double[] v) {
        double m = 0;
        for (double x : v) {
            m = Math.max(m, Math.abs(x));
        }
        return m;
    }

    private static Quadrant quadrant(double z, double lag) {
        if (z == 0 || lag == 0) {
            return Quadrant.NONE;
        }
        if (z > 0) {
            return lag > 0 ? Quadrant.HIGH_HIGH : Quadrant.HIGH_LOW;
        }
        return lag > 0 ? Quadrant.LOW_HIGH : Quadrant.LOW_LOW;
    }
}
