package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import io.densa.core.BenjaminiHochberg;
import io.densa.core.DensitySet;
import io.densa.core.TestResult;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.Sorted;
import io.densa.core.internal.Seeds;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * Anomaly scoring of densities against a fitted model, by split-conformal inference on residual
 * norms (Vovk, Gammerman, Shafer (2005), Algorithmic Learning in a Random World [from memory]):
 * <ol>
 * <li>the model is fitted on a training set; its residual densities on a separate calibration
 * set give calibration norms s_1..s_n (a model's {@code residuals(...)} method for new data
 * produces them);</li>
 * <li>a new unit with residual norm s gets the conformal p-value
 * (1 + #{i : s_i ≥ s}) / (n + 1), valid (P(p ≤ α) ≤ α) when the unit is exchangeable with the
 * calibration units;</li>
 * <li>the p-values of a batch are adjusted by Benjamini–Hochberg ({@link BenjaminiHochberg}) and
 * units with adjusted p-value ≤ q are flagged;</li>
 * <li>for each flagged unit, the grid points where its residual clr lies above the calibration
 * set's pointwise upper quantile (an excess of mass relative to the prediction) or below the
 * lower quantile (a deficit) are merged into intervals.</li>
 * </ol>
 * The smallest possible p-value is 1/(n + 1), so a batch of m units can produce a flag only
 * when n + 1 ≥ m/q: calibrate on enough units.
 *
 * <p><b>Ties and resolution.</b> Every unit whose norm exceeds all n calibration norms gets the same
 * p-value 1/(n + 1). {@link #withRandomisedTies(long)} switches to the <em>smoothed</em> conformal
 * p-value (Vovk, Gammerman, Shafer (2005), Algorithmic Learning in a Random World, Springer, §2.4
 * on smoothed conformal predictors [from memory]):
 * p = (#{i : s_i &gt; s} + U·(1 + #{i : s_i = s})) / (n + 1) with U ~ Uniform(0, 1) drawn from a
 * seeded stream per unit. Under exchangeability it is exactly Uniform(0, 1) (not merely
 * conservative), it is never larger than the ordinary p-value, and it does not tie. Its order
 * among units that exceed the same number of calibration norms is random and carries no evidence:
 * rank such units by their score ({@link Report#ranking()}) or by an excess in counts
 * ({@link ExcessCounts}), and calibrate on more units to resolve smaller p-values.
 *
 * <p>Immutable and thread-safe.
 */
public final class AnomalyScoring {
    private final double fdr;
    private final double bandLevel;
    private final boolean randomisedTies;
    private final long tieSeed;

    private AnomalyScoring(double fdr, double bandLevel, boolean randomisedTies, long tieSeed) {
        this.fdr = fdr;
        this.bandLevel = bandLevel;
        this.randomisedTies = randomisedTies;
        this.tieSeed = tieSeed;
    }

    @Override
    public String toString() {
        return "AnomalyScoring[fdr=" + fdr + ", bandLevel=" + bandLevel
                + (randomisedTies ? ", randomisedTies seed " + tieSeed : "") + "]";
    }

    /** FDR level 0.05 and a central pointwise band of 95 %. */
    public static AnomalyScoring withDefaults() {
        return new AnomalyScoring(0.05, 0.95, false, 0);
    }

    /**
     * The false discovery rate level q.
     *
     * @param q in (0, 1)
     */
    public AnomalyScoring withFdr(double q) {
        if (!(q > 0 && q < 1)) {
            throw new IllegalArgumentException("FDR level must be in (0, 1), got " + q);
        }
        return new AnomalyScoring(q, bandLevel, randomisedTies, tieSeed);
    }

    /**
     * Coverage of the pointwise band: limits are the (1 ∓ level)/2 quantiles of the calibration
     * residual clr values at each grid point.
     *
     * @param level in (0, 1)
     */
    public AnomalyScoring withBandLevel(double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("band level must be in (0, 1), got " + level);
        }
        return new AnomalyScoring(fdr, level, randomisedTies, tieSeed);
    }

    /**
     * Smoothed conformal p-values (see the class description): ties, including the floor
     * 1/(n + 1), are broken by a seeded uniform per unit (stream = row of the scored set).
     *
     * @param seed seed of the uniforms
     */
    public AnomalyScoring withRandomisedTies(long seed) {
        return new AnomalyScoring(fdr, bandLevel, true, seed);
    }

    /** Whether p-values are smoothed (randomised ties). */
    public boolean randomisedTies() {
        return randomisedTies;
    }

    /** The FDR level q. */
    public double fdr() {
        return fdr;
    }

    /** The pointwise band coverage. */
    public double bandLevel() {
        return bandLevel;
    }

    /**
     * Calibrates on the residual densities of a calibration set (not used to fit the model).
     *
     * @param calibrationResiduals at least 1 residual density
     * @param grid                 points of the domain where bands are evaluated (copied)
     */
    public Calibrated fit(DensitySet calibrationResiduals, double[] grid) {
        Objects.requireNonNull(calibrationResiduals, "calibrationResiduals");
        if (calibrationResiduals.size() < 1) {
            throw new IllegalArgumentException("calibration set is empty");
        }
        BayesSpace space = calibrationResiduals.space();
        double[] g = Kernels.checkedPoints(grid, space.lower(), space.upper(), "grid");
        for (int i = 1; i < g.length; i++) {
            if (!(g[i] > g[i - 1])) {
                throw new IllegalArgumentException("grid must be strictly increasing; grid[" + i + "] = " + g[i]
                        + " after " + g[i - 1]);
            }
        }
        double[] norms = calibrationResiduals.norms();
        Arrays.sort(norms);
        DMatrixRMaj clr = calibrationResiduals.clr(g);
        int n = calibrationResiduals.size();
        int m = g.length;
        double[] lo = new double[m];
        double[] hi = new double[m];
        double[] col = new double[n];
        for (int q = 0; q < m; q++) {
            for (int i = 0; i < n; i++) {
                col[i] = clr.data[i * m + q];
            }
            Arrays.sort(col);
            lo[q] = Sorted.quantile(col, (1 - bandLevel) / 2);
            hi[q] = Sorted.quantile(col, (1 + bandLevel) / 2);
        }
        return new Calibrated(this, calibrationResiduals.space(), norms, g, lo, hi);
    }

    /**
     * A calibration from its saved state (what {@link Calibrated#calibrationNorms()} and
     * {@link Calibrated#band()} return, with this object's FDR and band level): scores equal those
     * of the calibration the state came from, bit for bit.
     *
     * @param space            the space of the residuals
     * @param calibrationNorms residual norms of the calibration units, finite, ≥ 0 and sorted
     *                         ascending (copied)
     * @param band             the pointwise band, grid strictly increasing inside the domain
     * @throws IllegalArgumentException on an empty calibration, an unsorted or negative norm, a
     *                                  grid point outside the domain or out of order, or a band
     *                                  value that is not finite
     */
    public Calibrated restore(BayesSpace space, double[] calibrationNorms, List<BandPoint> band) {
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(calibrationNorms, "calibrationNorms");
        Objects.requireNonNull(band, "band");
        double[] sorted = calibrationNorms.clone();
        if (sorted.length < 1) {
            throw new IllegalArgumentException("calibration set is empty");
        }
        for (int i = 0; i < sorted.length; i++) {
            if (!(sorted[i] >= 0) || Double.isInfinite(sorted[i]) || i > 0 && !(sorted[i] >= sorted[i - 1])) {
                throw new IllegalArgumentException("calibration norm " + i + " is " + sorted[i]
                        + "; norms must be finite, >= 0 and sorted ascending");
            }
        }
        int m = band.size();
        double[] g = new double[m];
        double[] lo = new double[m];
        double[] hi = new double[m];
        for (int q = 0; q < m; q++) {
            BandPoint b = Objects.requireNonNull(band.get(q), "band point");
            g[q] = b.x();
            lo[q] = b.lower();
            hi[q] = b.upper();
            if (!Double.isFinite(lo[q]) || !Double.isFinite(hi[q])) {
                throw new IllegalArgumentException("band point " + q + " has bounds [" + lo[q] + ", " + hi[q]
                        + "]; finite bounds are required");
            }
            if (q > 0 && !(g[q] > g[q - 1])) {
                throw new IllegalArgumentException("band grid must be strictly increasing; point " + q + " = " + g[q]
                        + " after " + g[q - 1]);
            }
        }
        Kernels.checkedPoints(g, space.lower(), space.upper(), "band grid");
        return new Calibrated(this, space, sorted, g, lo, hi);
    }

    /** Direction of a departure. */
    public enum Direction {
        /** Residual clr above the band: more mass than predicted. */
        EXCESS,
        /** Residual clr below the band: less mass than predicted. */
        DEFICIT
    }

    /**
     * One grid point of the calibrated pointwise band of residual clr values.
     *
     * @param x     grid point
     * @param lower lower band limit at x
     * @param upper upper band limit at x
     */
    public record BandPoint(double x, double lower, double upper) {
    }

    /**
     * A maximal run of grid points where the residual clr leaves the band.
     *
     * @param from      first grid point of the run
     * @param to        last grid point of the run
     * @param direction excess or deficit
     * @param extreme   residual clr value farthest outside the band in the run
     */
    public record Excursion(double from, double to, Direction direction, double extreme) {
    }

    /**
     * Score of one unit.
     *
     * @param row            row in the scored set
     * @param id             id of the unit ("#row" without ids)
     * @param residualNorm   B2 norm of the residual density
     * @param pValue         split-conformal p-value (smoothed when ties are randomised)
     * @param adjustedPValue Benjamini–Hochberg adjusted p-value within the batch
     * @param flagged        adjusted p-value ≤ q
     * @param excursions     band departures (computed for flagged units only, else empty)
     */
    public record UnitScore(int row, String id, double residualNorm, double pValue, double adjustedPValue,
            boolean flagged, List<Excursion> excursions) implements TestResult {
        /** Canonical constructor: copies the excursion list. */
        public UnitScore {
            excursions = List.copyOf(excursions);
        }

        /** The residual norm, {@link #residualNorm()}. */
        @Override
        public double statistic() {
            return residualNorm;
        }

        @Override
        public String method() {
            return "split-conformal rank of the residual norm among the calibration units, upper tail"
                    + " (not adjusted; see adjustedPValue)";
        }
    }

    /**
     * Scores of a batch.
     *
     * @param units           one score per unit, in input order
     * @param fdr             FDR level used
     * @param bandLevel       pointwise band coverage used
     * @param calibrationSize number of calibration units
     * @param flaggedCount    number of flagged units
     */
    public record Report(List<UnitScore> units, double fdr, double bandLevel, int calibrationSize,
            int flaggedCount) {
        /** Canonical constructor: copies the unit list. */
        public Report {
            units = List.copyOf(units);
        }

        /**
         * Rows ranked by p-value, ascending; equal p-values (for example all units at the floor
         * 1/(n + 1) without randomised ties) by residual norm, largest first; then by row.
         */
        public int[] ranking() {
            return java.util.stream.IntStream.range(0, units.size()).boxed().sorted((a, b) -> {
                UnitScore x = units.get(a);
                UnitScore y = units.get(b);
                int c = Double.compare(x.pValue(), y.pValue());
                if (c == 0) {
                    c = Double.compare(y.residualNorm(), x.residualNorm());
                }
                return c != 0 ? c : Integer.compare(a, b);
            }).mapToInt(Integer::intValue).toArray();
        }

        /** The settings, the counts and the flagged units (at most five). */
        @Override
        public String toString() {
            StringBuilder sb = new StringBuilder("AnomalyScoring.Report[").append(units.size()).append(" units, ")
                    .append(flaggedCount).append(" flagged at FDR ").append(fdr).append(", band level ")
                    .append(bandLevel).append(", ").append(calibrationSize).append(" calibration units]");
            int shown = 0;
            for (UnitScore u : units) {
                if (u.flagged() && shown++ < 5) {
                    sb.append(String.format(java.util.Locale.ROOT, "%n  %s: norm %.4g, p %.3g, adjusted %.3g",
                            u.id(), u.residualNorm(), u.pValue(), u.adjustedPValue()));
                }
            }
            if (shown > 5) {
                sb.append("\n  … (").append(shown - 5).append(" more flagged)");
            }
            return sb.toString();
        }
    }

    /** A calibrated scorer: sorted calibration norms and pointwise bands. Immutable and thread-safe. */
    public static final class Calibrated {
        private final AnomalyScoring cfg;
        private final BayesSpace space;
        private final double[] sorted;
        private final double[] grid;
        private final double[] lower;
        private final double[] upper;

        private Calibrated(AnomalyScoring cfg, BayesSpace space, double[] sorted, double[] grid, double[] lower,
                double[] upper) {
            this.cfg = cfg;
            this.space = space;
            this.sorted = sorted;
            this.grid = grid;
            this.lower = lower;
            this.upper = upper;
        }

        /** Number of calibration units. */
        public int calibrationSize() {
            return sorted.length;
        }

        /** The configuration (FDR and band level) this calibration scores with. */
        public AnomalyScoring configuration() {
            return cfg;
        }

        /** The space of the calibration residuals. */
        public BayesSpace space() {
            return space;
        }

        /** Residual norms of the calibration units, sorted ascending (fresh array). */
        public double[] calibrationNorms() {
            return sorted.clone();
        }

        /**
         * The pointwise band: for each grid point x, the (1 ∓ level)/2 sample quantiles of the
         * calibration residual clr values at x, by linear interpolation between order statistics
         * (definition 7 of Hyndman &amp; Fan (1996), Sample quantiles in statistical packages, Am.
         * Stat. 50(4) — from memory).
         *
         * @return one point per grid point, in grid order (unmodifiable)
         */
        public List<BandPoint> band() {
            List<BandPoint> out = new ArrayList<>(grid.length);
            for (int q = 0; q < grid.length; q++) {
                out.add(new BandPoint(grid[q], lower[q], upper[q]));
            }
            return List.copyOf(out);
        }

        /**
         * Split-conformal p-value (1 + #{calibration norms ≥ s}) / (n + 1) of each score.
         *
         * @param norms non-negative residual norms (not modified)
         */
        public double[] pValues(double[] norms) {
            Objects.requireNonNull(norms, "norms");
            int n = sorted.length;
            double[] p = new double[norms.length];
            for (int i = 0; i < norms.length; i++) {
                double s = checkedNorm(norms, i);
                p[i] = (1.0 + (n - firstAtLeast(s, false))) / (n + 1.0);
            }
            return p;
        }

        /**
         * Smoothed conformal p-value (#{s_i &gt; s} + U·(1 + #{s_i = s})) / (n + 1) of each score, U
         * uniform on (0, 1) from stream j of the seed for score j (see the class description).
         *
         * @param norms non-negative residual norms (not modified)
         * @param seed  seed of the uniforms
         */
        public double[] smoothedPValues(double[] norms, long seed) {
            Objects.requireNonNull(norms, "norms");
            int n = sorted.length;
            double[] p = new double[norms.length];
            for (int i = 0; i < norms.length; i++) {
                double s = checkedNorm(norms, i);
                int atLeast = n - firstAtLeast(s, false);
                int greater = n - firstAtLeast(s, true);
                // U in (0, 1): 53 random bits, centred in their cell
                double u = ((Seeds.stream(seed, i).nextLong() >>> 11) + 0.5) * 0x1.0p-53;
                p[i] = (greater + u * (1 + atLeast - greater)) / (n + 1.0);
            }
            return p;
        }

        private static double checkedNorm(double[] norms, int i) {
            double s = norms[i];
            if (!(s >= 0) || Double.isInfinite(s)) {
                throw new IllegalArgumentException("norm " + i + " is " + s + "; norms must be finite and >= 0");
            }
            return s;
        }

        /** First index with sorted[idx] ≥ s (or &gt; s when strict). */
        private int firstAtLeast(double s, boolean strict) {
            int lo = 0;
            int hi = sorted.length;
            while (lo < hi) {
                int mid = (lo + hi) >>> 1;
                if (strict ? sorted[mid] > s : sorted[mid] >= s) {
                    hi = mid;
                } else {
                    lo = mid + 1;
                }
            }
            return lo;
        }

        /**
         * Scores the residual densities of new units.
         *
         * @param residuals residuals of the model for the new units, in the calibration space
         */
        public Report score(DensitySet residuals) {
            Objects.requireNonNull(residuals, "residuals");
            space.requireSame(residuals.space(), "residuals");
            double[] norms = residuals.norms();
            double[] p = cfg.randomisedTies ? smoothedPValues(norms, cfg.tieSeed) : pValues(norms);
            double[] adj = BenjaminiHochberg.adjust(p);
            List<UnitScore> out = new ArrayList<>();
            int flagged = 0;
            int m = grid.length;
            for (int i = 0; i < residuals.size(); i++) {
                boolean f = adj[i] <= cfg.fdr;
                List<Excursion> ex = List.of();
                if (f) {
                    flagged++;
                    ex = excursions(residuals.get(i).clr(grid), m);
                }
                out.add(new UnitScore(i, residuals.id(i), norms[i], p[i], adj[i], f, ex));
            }
            return new Report(out, cfg.fdr, cfg.bandLevel, sorted.length, flagged);
        }

        @Override
        public String toString() {
            return "AnomalyScoring.Calibrated[n=" + sorted.length + ", grid=" + grid.length + " points, " + cfg + "]";
        }

        private List<Excursion> excursions(double[] clr, int m) {
            List<Excursion> ex = new ArrayList<>();
            int q = 0;
            while (q < m) {
                Direction d = clr[q] > upper[q] ? Direction.EXCESS : clr[q] < lower[q] ? Direction.DEFICIT : null;
                if (d == null) {
                    q++;
                    continue;
                }
                int start = q;
                double extreme = clr[q];
                while (q < m && (d == Direction.EXCESS ? clr[q] > upper[q] : clr[q] < lower[q])) {
                    extreme = d == Direction.EXCESS ? Math.max(extreme, clr[q]) : Math.min(extreme, clr[q]);
                    q++;
                }
                ex.add(new Excursion(grid[start], grid[q - 1], d, extreme));
            }
            return ex;
        }
    }
}
