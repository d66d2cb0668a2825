package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.internal.Kernels;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * Events in excess of a baseline, in counts, with bootstrap intervals.
 *
 * <p>For unit i with observed counts O_i(b) in bins b (for example single years of age), a
 * baseline density f̂_i (for example a model's prediction for the unit) and a denominator T_i (the
 * unit's own total N_i = Σ_b O_i(b), or an expected total given by the caller, e.g. population ×
 * rate), the expected count in a band B (a union of consecutive bins, e.g. ages 15–24) is
 * E_i(B) = T_i π̂_i(B) with π̂_i(B) = ∫_B f̂_i, and the excess is O_i(B) − E_i(B). Reported per
 * band, overall (N_i − T_i, identically 0 with the unit's own total) and as the number of
 * <em>displaced</em> events Σ_B max(0, O_i(B) − E_i(B)) (the events that would have to change
 * band for the observed band counts to match the expected ones; with the unit's own total it is
 * N_i times the total-variation distance between the observed and the expected band shares).
 *
 * <p><b>Interval.</b> A parametric bootstrap (Efron &amp; Tibshirani (1993), An Introduction to the
 * Bootstrap, Chapman &amp; Hall, §6.5 for the parametric bootstrap and ch. 13 for percentile
 * intervals) with two independent sources of noise per draw:
 * <ol>
 * <li>counting noise: band counts O*(B) ~ Poisson(O_i(B)) independently (the Poisson model of
 * event counts; the denominator follows: N* = Σ_B O*(B) when the unit's own total is used);</li>
 * <li>baseline uncertainty (optional, {@link BaselineError}): coordinates c* ~ N(ĉ_i, s_i Σ) in
 * the B2 coordinates of the baseline, so π*(B) = ∫_B f(c*);</li>
 * </ol>
 * and excess* = O*(B) − T* π*(B). The interval is the central percentile interval at the chosen
 * level of the draws (sample quantiles by definition 7 of Hyndman &amp; Fan 1996). With no baseline uncertainty and large counts its half-width approaches
 * z·√(O(B)(1 − π(B))² + π(B)²(N − O(B))) (the delta method for the Poisson model), which the tests
 * check. Each unit draws from its own SplitMix64 stream of the seed, so results do not depend on
 * the number of threads.
 *
 * <p>Band probabilities are computed by Gauss–Legendre quadrature (5 nodes per piece) on the union
 * of the basis breakpoints and the band edges, pieces no wider than 1/8 of the domain (relative
 * error below 1e-6 on the tests' truncated normal and bimodal spline densities). The draws'
 * quadratures run a block of draws at a time with a polynomial exponential (relative error below
 * 3·10⁻¹⁰, so band probabilities agree with the one-draw computation to 10⁻⁹ relative; tested),
 * in loops over whole rows of draws that the JIT vectorises; the random numbers are drawn in the
 * order of one draw after the other, as before.
 *
 * <p>Immutable and thread-safe. Inputs are not modified.
 */
public final class ExcessCounts {
    private static final int UNITS_PER_BLOCK = 16;

    private final double level;
    private final int draws;
    private final long seed;

    private ExcessCounts(double level, int draws, long seed) {
        this.level = level;
        this.draws = draws;
        this.seed = seed;
    }

    /** 90 % intervals from 999 draws, seed 1. */
    public static ExcessCounts withDefaults() {
        return new ExcessCounts(0.90, 999, 1);
    }

    /**
     * Level of the central intervals.
     *
     * @param level in (0, 1)
     */
    public ExcessCounts withLevel(double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("interval level must be in (0, 1), got " + level);
        }
        return new ExcessCounts(level, draws, seed);
    }

    /**
     * Bootstrap draws per unit and the seed.
     *
     * @param draws at least 9
     */
    public ExcessCounts withDraws(int draws, long seed) {
        if (draws < 9) {
            throw new IllegalArgumentException("bootstrap draws must be at least 9, got " + draws);
        }
        return new ExcessCounts(level, draws, seed);
    }

    /** Interval level. */
    public double level() {
        return level;
    }

    /** Bootstrap draws per unit. */
    public int draws() {
        return draws;
    }

    /** Seed of the bootstrap. */
    public long seed() {
        return seed;
    }

    /**
     * Uncertainty of the baseline coordinates: unit i's baseline coordinates are drawn from
     * N(ĉ_i, s_i Σ) with Σ a common K × K covariance (symmetric, positive semi-definite) and s_i ≥ 0
     * a per-unit scale. Immutable.
     */
    public static final class BaselineError {
        private final double[] factor; // K × K, Σ = F Fᵀ, null for none
        private final double[] scales; // null: 1 for every unit
        private final int dim;

        private BaselineError(double[] factor, double[] scales, int dim) {
            this.factor = factor;
            this.scales = scales;
            this.dim = dim;
        }

        /** A baseline known exactly: only counting noise. */
        public static BaselineError none() {
            return new BaselineError(null, null, 0);
        }

        /**
         * The same covariance Σ for every unit.
         *
         * @param covariance K × K, symmetric, positive semi-definite (copied)
         */
        public static BaselineError common(double[][] covariance) {
            return scaled(covariance, null);
        }

        /**
         * Covariance s_i Σ for unit i.
         *
         * @param covariance K × K, symmetric, positive semi-definite (copied)
         * @param scales     one finite s_i ≥ 0 per unit, or null for 1 (copied)
         */
        public static BaselineError scaled(double[][] covariance, double[] scales) {
            Objects.requireNonNull(covariance, "covariance");
            int k = covariance.length;
            if (k == 0) {
                throw new IllegalArgumentException("baseline covariance is empty; give a K × K matrix");
            }
            DMatrixRMaj s = new DMatrixRMaj(k, k);
            double max = 0;
            for (int i = 0; i < k; i++) {
                if (covariance[i] == null || covariance[i].length != k) {
                    throw new IllegalArgumentException("baseline covariance row " + i + " has "
                            + (covariance[i] == null ? "no" : covariance[i].length) + " entries, expected " + k);
                }
                for (int j = 0; j < k; j++) {
                    double v = covariance[i][j];
                    if (!Double.isFinite(v)) {
                        throw new IllegalArgumentException("baseline covariance (" + i + ", " + j + ") is " + v
                                + "; entries must be finite");
                    }
                    s.set(i, j, v);
                    max = Math.max(max, Math.abs(v));
                }
            }
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < i; j++) {
                    if (Math.abs(s.get(i, j) - s.get(j, i)) > 1e-10 * Math.max(max, Double.MIN_NORMAL)) {
                        throw new IllegalArgumentException("baseline covariance is not symmetric at (" + i + ", " + j
                                + "): " + s.get(i, j) + " vs " + s.get(j, i));
                    }
                }
            }
            EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(k, true, true);
            if (!eig.decompose(s.copy())) {
                throw new IllegalArgumentException("baseline covariance: eigen-decomposition failed");
            }
            double[] f = new double[k * k];
            for (int m = 0; m < k; m++) {
                double lambda = eig.getEigenvalue(m).getReal();
                if (lambda < -1e-8 * Math.max(max, Double.MIN_NORMAL) * k) {
                    throw new IllegalArgumentException("baseline covariance is not positive semi-definite: eigenvalue "
                            + lambda);
                }
                double r = Math.sqrt(Math.max(0, lambda));
                DMatrixRMaj v = eig.getEigenVector(m);
                for (int i = 0; i < k; i++) {
                    f[i * k + m] = v.get(i) * r;
                }
            }
            double[] sc = null;
            if (scales != null) {
                sc = scales.clone();
                for (int i = 0; i < sc.length; i++) {
                    if (!(sc[i] >= 0) || Double.isInfinite(sc[i])) {
                        throw new IllegalArgumentException("baseline error scale of unit " + i + " is " + sc[i]
                                + "; scales must be finite and >= 0");
                    }
                }
            }
            return new BaselineError(f, sc, k);
        }

        boolean none0() {
            return factor == null;
        }
    }

    /**
     * Excess of one band (or overall).
     *
     * @param from     lower band edge
     * @param to       upper band edge
     * @param observed observed events O(B)
     * @param expected expected events E(B) = T π̂(B)
     * @param excess   O(B) − E(B)
     * @param lower    lower end of the bootstrap interval of the excess
     * @param upper    upper end
     */
    public record BandExcess(double from, double to, double observed, double expected, double excess, double lower,
            double upper) {
    }

    /**
     * Displaced events Σ_B max(0, O(B) − E(B)) with its bootstrap interval, and what the null of no
     * change would give against the same baseline. A sum of positive parts: counting noise alone
     * makes it positive (a quiet unit of a few hundred events displaces some tens), so its interval
     * does not reach 0 even without any change; read it against {@code noiseMean}, and
     * {@code pValue} for whether it is beyond the null.
     *
     * <p>The null: the unit's band shares are those of a baseline drawn from its error law
     * (coordinates c* ~ N(ĉ, s Σ), {@link BaselineError}; the baseline itself with
     * {@link BaselineError#none()}), and its band counts are drawn from them — O(B) ~ multinomial
     * (N, π*(B)) given the unit's own total N, or Poisson(T π*(B)) for a given total T — while the
     * statistic is always taken against the baseline as given, E(B) = T π̂(B): in a unit without
     * change the observed counts differ from the baseline both by counting noise and by the
     * baseline's own error, and a null without the latter gives too many small p-values (the
     * tests measure both). {@code pValue} is (1 + #{D₀ ≥ D}) / (1 + B) over B draws D₀ of that law
     * (a Monte Carlo test: Davison &amp; Hinkley (1997), Bootstrap Methods and their Application,
     * Cambridge UP, ch. 4; from memory). The null's counts come from a stream of their own; with a
     * baseline error its drawn baselines are those of the interval's draws (one quadrature per
     * draw serves both), so the intervals are as they were without the null. {@code noiseMean} is the mean of D₀: with a baseline taken
     * as exact it is Σ_B E max(0, O(B) − E(B)) in closed form, ν q P(X = ν) with ν = ⌊Np⌋ + 1 for a
     * binomial (the mean absolute deviation of de Moivre, halved) and λ P(X = ⌊λ⌋) for a Poisson
     * variate of mean λ (Diaconis &amp; Zabell (1991), Closed form summation for classical
     * distributions: variations on a theme of de Moivre, Statist. Sci. 6(3); from memory, checked in
     * the tests against sums over Commons Math's probability mass functions); with a baseline
     * error, the average of the B draws (Monte Carlo).
     *
     * @param value     point estimate
     * @param lower     lower end of the interval
     * @param upper     upper end
     * @param noiseMean displaced events expected under the null of no change (see above)
     * @param pValue    Monte Carlo p-value of the displaced events against that null
     */
    public record Displaced(double value, double lower, double upper, double noiseMean, double pValue) {
    }

    /**
     * One unit.
     *
     * @param row       row in the input
     * @param id        id of the baseline row
     * @param overall   total events against the denominator (0 with the unit's own total)
     * @param bands     one entry per band, in order
     * @param displaced displaced events across the bands
     */
    public record UnitExcess(int row, String id, BandExcess overall, List<BandExcess> bands, Displaced displaced) {
        /** Canonical constructor: copies the band list. */
        public UnitExcess {
            bands = List.copyOf(bands);
        }
    }

    /**
     * Excess counts of all units.
     *
     * @param units               in input order
     * @param level               interval level
     * @param draws               bootstrap draws per unit
     * @param seed                bootstrap seed
     * @param baselineUncertainty whether baseline uncertainty was drawn
     * @param ownTotals           whether the denominators were the units' own totals
     */
    public record Result(List<UnitExcess> units, double level, int draws, long seed, boolean baselineUncertainty,
            boolean ownTotals) {
        /** Canonical constructor: copies the unit list. */
        public Result {
            units = List.copyOf(units);
        }

        /** Rows ordered by displaced events, largest first (ties by row). */
        public int[] rankByDisplaced() {
            return java.util.stream.IntStream.range(0, units.size()).boxed()
                    .sorted((a, b) -> {
                        int c = Double.compare(units.get(b).displaced().value(), units.get(a).displaced().value());
                        return c != 0 ? c : Integer.compare(a, b);
                    }).mapToInt(Integer::intValue).toArray();
        }

        /**
         * The displaced events' p-values adjusted for testing every unit
         * ({@link io.densa.core.BenjaminiHochberg#adjust}, Benjamini &amp; Hochberg 1995): a unit
         * whose value is at most q is a discovery at false discovery rate q. In input order.
         */
        public double[] displacedAdjustedPValues() {
            double[] p = new double[units.size()];
            for (int i = 0; i < p.length; i++) {
                p[i] = units.get(i).displaced().pValue();
            }
            return io.densa.core.BenjaminiHochberg.adjust(p);
        }
    }

    /**
     * Excess counts with the units' own totals as denominators.
     *
     * @param baseline   baseline density per unit (n rows)
     * @param counts     n rows of non-negative counts per bin (not modified)
     * @param binEdges   D + 1 strictly increasing edges of the count bins, from the domain's lower to
     *                   its upper end (on a periodic space: spanning one period from any start, so
     *                   that a bin or a band may wrap around the cut point)
     * @param bandEdges  strictly increasing band edges, each one of the bin edges, the first and last
     *                   equal to the first and last bin edge
     * @param error      baseline uncertainty ({@link BaselineError#none()} for none)
     */
    public Result estimate(DensitySet baseline, long[][] counts, double[] binEdges, double[] bandEdges,
            BaselineError error) {
        return estimate(baseline, counts, binEdges, bandEdges, error, null);
    }

    /**
     * Excess counts against given expected totals T_i (for example population × a reference rate),
     * treated as known; the overall excess is then N_i − T_i.
     *
     * @param expectedTotals n finite values ≥ 0, or null for the units' own totals (not modified)
     * @see #estimate(DensitySet, long[][], double[], double[], BaselineError)
     */
    public Result estimate(DensitySet baseline, long[][] counts, double[] binEdges, double[] bandEdges,
            BaselineError error, double[] expectedTotals) {
        Objects.requireNonNull(baseline, "baseline");
        Objects.requireNonNull(counts, "counts");
        Objects.requireNonNull(error, "error");
        BayesSpace space = baseline.space();
        int n = baseline.size();
        int k = baseline.dimension();
        if (counts.length != n) {
            throw new IllegalArgumentException("counts has " + counts.length + " rows, expected " + n
                    + " (one per baseline row)");
        }
        double[] edges = Kernels.checkedPoints(binEdges, Double.NaN, Double.NaN, "binEdges");
        int d = edges.length - 1;
        if (d < 1) {
            throw new IllegalArgumentException("binEdges needs at least 2 edges, got " + edges.length);
        }
        for (int j = 1; j <= d; j++) {
            if (!(edges[j] > edges[j - 1])) {
                throw new IllegalArgumentException("binEdges must be strictly increasing; binEdges[" + j + "] = "
                        + edges[j] + " after " + edges[j - 1]);
            }
        }
        double tol = 1e-9 * (space.upper() - space.lower());
        if (space.isPeriodic()) {
            // on a circle the bins span one period from any start (a bin may wrap around the cut point)
            if (Math.abs(edges[d] - edges[0] - space.period()) > tol) {
                throw new IllegalArgumentException("binEdges run from " + edges[0] + " to " + edges[d] + " (a span of "
                        + (edges[d] - edges[0]) + "); on a circle of period " + space.period()
                        + " they must span exactly one period, from any start");
            }
        } else if (Math.abs(edges[0] - space.lower()) > tol || Math.abs(edges[d] - space.upper()) > tol) {
            throw new IllegalArgumentException("binEdges run from " + edges[0] + " to " + edges[d]
                    + "; they must cover the domain [" + space.lower() + ", " + space.upper() + "] exactly");
        }
        double[] bands = Kernels.checkedPoints(bandEdges, Double.NaN, Double.NaN, "bandEdges");
        int nb = bands.length - 1;
        if (nb < 1) {
            throw new IllegalArgumentException("bandEdges needs at least 2 edges, got " + bands.length);
        }
        int[] bandOfBin = new int[d];
        int[] bandStartBin = new int[nb + 1];
        for (int t = 0; t <= nb; t++) {
            int at = -1;
            for (int j = 0; j <= d; j++) {
                if (Math.abs(edges[j] - bands[t]) <= tol) {
                    at = j;
                }
            }
            if (at < 0) {
                throw new IllegalArgumentException("bandEdges[" + t + "] = " + bands[t] + " is not one of the bin edges "
                        + Arrays.toString(edges));
            }
            if (t > 0 && at <= bandStartBin[t - 1]) {
                throw new IllegalArgumentException("bandEdges must be strictly increasing; bandEdges[" + t + "] = "
                        + bands[t] + " after " + bands[t - 1]);
            }
            bandStartBin[t] = at;
        }
        if (bandStartBin[0] != 0 || bandStartBin[nb] != d) {
            throw new IllegalArgumentException("bandEdges run from " + bands[0] + " to " + bands[nb]
                    + "; they must start at the first bin edge " + edges[0] + " and end at the last " + edges[d]);
        }
        for (int t = 0; t < nb; t++) {
            for (int j = bandStartBin[t]; j < bandStartBin[t + 1]; j++) {
                bandOfBin[j] = t;
            }
            bands[t] = edges[bandStartBin[t]];
        }
        bands[nb] = edges[d];
        double[][] observed = new double[n][nb];
        double[] totals = new double[n];
        for (int i = 0; i < n; i++) {
            long[] row = counts[i];
            if (row == null || row.length != d) {
                throw new IllegalArgumentException("counts row " + i + " (" + baseline.id(i) + ") has "
                        + (row == null ? "no" : row.length) + " bins, expected " + d);
            }
            for (int j = 0; j < d; j++) {
                if (row[j] < 0) {
                    throw new IllegalArgumentException("count of row " + i + " (" + baseline.id(i) + "), bin " + j
                            + " is " + row[j] + "; counts must be >= 0");
                }
                observed[i][bandOfBin[j]] += row[j];
                totals[i] += row[j];
            }
        }
        double[] denominators = totals;
        if (expectedTotals != null) {
            if (expectedTotals.length != n) {
                throw new IllegalArgumentException("expectedTotals has " + expectedTotals.length + " values, expected "
                        + n);
            }
            denominators = expectedTotals.clone();
            for (int i = 0; i < n; i++) {
                if (!(denominators[i] >= 0) || Double.isInfinite(denominators[i])) {
                    throw new IllegalArgumentException("expected total of row " + i + " (" + baseline.id(i) + ") is "
                            + denominators[i] + "; it must be finite and >= 0");
                }
            }
        }
        if (!error.none0()) {
            if (error.dim != k) {
                throw new IllegalArgumentException("baseline covariance is " + error.dim + " × " + error.dim
                        + ", expected " + k + " × " + k + " (the space's dimension)");
            }
            if (error.scales != null && error.scales.length != n) {
                throw new IllegalArgumentException("baseline error has " + error.scales.length + " scales, expected "
                        + n + " (one per unit)");
            }
        }
        BandQuadrature quad = BandQuadrature.of(space, bands);
        int nq = quad.x.length;
        double[] phi = space.basisMatrix(quad.x).data; // nq × K
        double[] phiF = null;
        if (!error.none0()) {
            double[] prod = new double[nq * k];
            Kernels.multiply(phi, nq, k, error.factor, k, prod, false);
            phiF = new double[k * nq]; // transposed: row c holds column c of Φ F over the nodes
            for (int q = 0; q < nq; q++) {
                for (int c = 0; c < k; c++) {
                    phiF[c * nq + q] = prod[q * k + c];
                }
            }
        }
        double[] coords = baseline.coordinatesRowMajor();
        UnitExcess[] out = new UnitExcess[n];
        boolean own = expectedTotals == null;
        BootstrapPlan plan = new BootstrapPlan(quad, phi, phiF, k, nb, bands, draws, (1 - level) / 2, (1 + level) / 2, own,
                seed);
        double[] dens = denominators;
        int blocks = (n + UNITS_PER_BLOCK - 1) / UNITS_PER_BLOCK;
        boolean parallel = Kernels.parallelWorth((long) n * draws * nq * (k + 10));
        Kernels.forEachBlock(blocks, parallel, blk -> {
            BootstrapPlan.Buffers buf = new BootstrapPlan.Buffers(nq, k, nb, draws);
            int end = Math.min(n, (blk + 1) * UNITS_PER_BLOCK);
            for (int i = blk * UNITS_PER_BLOCK; i < end; i++) {
                double sd = plan.phiF == null ? 0 : Math.sqrt(error.scales == null ? 1 : error.scales[i]);
                out[i] = plan.unit(i, baseline.id(i), coords, observed[i], totals[i], dens[i], sd, buf);
            }
        });
        return new Result(Arrays.asList(out), level, draws, seed, !error.none0(), own);
    }
}
