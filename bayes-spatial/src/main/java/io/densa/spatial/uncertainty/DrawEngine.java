package io.densa.spatial.uncertainty;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.Density;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.Seeds;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.DoubleUnaryOperator;

/**
 * Monte Carlo draws of one location's predictive law and their summaries (package-private engine
 * of {@link PredictiveDistribution}).
 *
 * <p>Draw d of a location with kriged coordinates ĉ, kriging variance σ² and stream s has
 * coordinates ĉ + σ F z_d, with F the K × r factor of the coordinate covariance shape (F Fᵀ = Σ/tr Σ)
 * and z_d the next r standard normals of the generator {@code Seeds.stream(seed, s)}
 * ({@link SplittableRandom#nextGaussian()}, draws in order, components in order), so the draws do
 * not depend on threads or tiling. One extra column, z = 0, gives the plug-in value at ĉ.
 *
 * <p>The node rule works on all draws of a location at once, one row per node (draw d at column d
 * of every row), so that the inner loops are unit-stride over the draws and index their rows from
 * 0 (which JDK 17 vectorises; copying through such rows from one flat node-major array cost
 * about 10 % of the work). With 4-point panels, one bound per location ({@link CellBound}) shows that no draw's rule error
 * estimate can exceed the tolerance, and then the per-draw estimates are not computed (every
 * number unchanged, CellBoundTest; for the smooth draws of the study-2 space this removed about a
 * third of the work). Quantiles are searched for all draws of a block together
 * ({@link QuantileSearch}: vectorised Newton steps, the one-draw guarded search where the root is
 * not certified; the two agree to rounding, CellBoundTest), and the central intervals of the draws
 * come from bucketed order statistics ({@link Selection}).
 */
final class DrawEngine {
    /**
     * A draw whose estimated rule error exceeds this share of its mass is evaluated on the refined
     * rules, and exactly when it fails those too.
     */
    static final double RULE_TOLERANCE = 1e-4;
    /**
     * Most draws evaluated together (work rows of this length, one per node and per panel); more
     * draws are evaluated in blocks so that the work arrays stay bounded. With 200 draws one block: blocks
     * of 16 to 64 draws were measured 30–50 % slower (the per-loop overhead outweighs the cache).
     */
    static final int BLOCK = 256;

    final BayesSpace space;
    final NodeRule rule;
    final int k;
    final int r;
    /** K × r, row-major. */
    final double[] factor;
    /** r × m: column-space perturbation per unit normal, bt[l m + i] = (E F)_{il}. */
    private final double[] bt;
    final int draws;
    /** The central level of the intervals. */
    final double level;
    final int cols;
    /** Columns of a block, min(cols, BLOCK). */
    final int width;
    final double[] probs;
    final double[] thresholds;
    final boolean mean;
    final int quantities;
    private final DoubleUnaryOperator units;
    private final double[] meanWeights;
    /**
     * On a periodic space the mean is the circular mean: weights w_i cos θ_i and w_i sin θ_i of the
     * nodes, θ = 2π (x − lower) / P (null on an interval).
     */
    private final double[] cosWeights;
    private final double[] sinWeights;
    private final boolean exactOnly;
    final UncertaintyOptions options;
    /** The refined rules for draws the rule cannot take (null in a refined engine). */
    private final RefinedRules refined;
    private final long seed;
    /** The per-location bound of 4-point panels (null for other rules). */
    private final CellBound cellBound;
    private final boolean useCellBound;

    DrawEngine(BayesSpace space, double[] factor, int r, UncertaintyOptions opt) {
        this(space, factor, r, opt, true);
    }

    /**
     * The number of quantities the options ask for (quantiles, then exceedances, then the mean).
     *
     * @throws IllegalArgumentException when they ask for none
     */
    static int quantities(UncertaintyOptions opt) {
        int q = opt.quantiles().length + opt.exceedances().length + (opt.mean() ? 1 : 0);
        if (q == 0) {
            throw new IllegalArgumentException("no quantity to summarise: add quantiles, exceedances or the mean to"
                    + " the uncertainty options");
        }
        return q;
    }

    /**
     * @param useCellBound whether the per-location bound of {@link CellBound} may skip the per-draw
     *                     error estimates (false: always compute them; the tests compare both)
     */
    DrawEngine(BayesSpace space, double[] factor, int r, UncertaintyOptions opt, boolean useCellBound) {
        this(space, factor, r, opt, useCellBound, 1);
    }

    /** With the rule's panels cut into {@code refine} (1: the rule itself, with its refined rules). */
    DrawEngine(BayesSpace space, double[] factor, int r, UncertaintyOptions opt, boolean useCellBound, int refine) {
        this.options = opt;
        this.refined = refine == 1 ? new RefinedRules(this) : null;
        this.useCellBound = useCellBound;
        this.space = space;
        this.k = space.dimension();
        this.r = r;
        this.factor = factor;
        this.draws = opt.draws();
        this.level = opt.level();
        this.cols = draws + 1;
        this.width = Math.min(cols, BLOCK);
        this.probs = opt.probabilitiesInternal();
        this.thresholds = opt.thresholdsInternal();
        this.mean = opt.mean();
        this.quantities = quantities(opt);
        this.units = opt.dataUnits();
        this.seed = opt.seed();
        // the node rule's error bound needs a clr that is polynomial on each panel: not so for Fourier spaces
        this.exactOnly = opt.evaluation() == UncertaintyOptions.Evaluation.EXACT
                || space.basis().kind() == io.densa.core.Basis.Kind.FOURIER;
        this.rule = new NodeRule(space, thresholds, refine);
        int m = rule.m;
        bt = new double[r * m];
        for (int i = 0; i < m; i++) {
            for (int l = 0; l < r; l++) {
                double s = 0;
                for (int j = 0; j < k; j++) {
                    s += rule.e[i * k + j] * factor[j * r + l];
                }
                bt[l * m + i] = s;
            }
        }
        // the refined rules (refine > 1) check every draw: no per-location bound
        cellBound = rule.q == 4 && refine == 1 ? new CellBound(rule, bt, r) : null;
        double[] u = units == null ? rule.x.clone() : rule.unitsAtNodes(units);
        meanWeights = new double[m];
        for (int i = 0; i < m; i++) {
            meanWeights[i] = rule.w[i] * u[i];
        }
        if (space.isPeriodic()) {
            cosWeights = new double[m];
            sinWeights = new double[m];
            for (int i = 0; i < m; i++) {
                double theta = 2 * Math.PI * (rule.x[i] - space.lower()) / space.period();
                cosWeights[i] = rule.w[i] * Math.cos(theta);
                sinWeights[i] = rule.w[i] * Math.sin(theta);
            }
        } else {
            cosWeights = null;
            sinWeights = null;
        }
    }

    /**
     * The direction lower + P·atan2(s, c)/(2π) in [lower, lower + P) of the mean resultant (c, s)
     * (Mardia &amp; Jupp (2000), Directional Statistics, §2.2.1), as {@link Density#circularMean()}.
     */
    private double direction(double c, double s) {
        double p = space.period();
        double x = p * Math.atan2(s, c) / (2 * Math.PI);
        return space.lower() + (x < 0 ? x + p : x);
    }

    /** Per-thread working storage. */
    final class Scratch {
        final double[] base = new double[rule.m];
        /** Scaled normals σ z, one row per direction. */
        final double[][] z = new double[r][cols];
        /** The normals of a block that does not start at draw 0, rows indexed from 0. */
        final double[][] zBlock = new double[r][width];
        /**
         * Node values and node exponentials, one row per node (draws of the block at 0..nc): every
         * loop over draws indexes its rows from 0, which JDK 17 vectorises.
         */
        final double[][] y = new double[rule.m][width];
        final double[][] g = new double[rule.m][width];
        final double[] shift = new double[width];
        /** Panel masses, one row per panel. */
        final double[][] mass = new double[rule.panels][width];
        final double[] total = new double[width];
        /** Cumulative panel masses, rows j = 0..panels. */
        final double[][] prefix = new double[rule.panels + 1][width];
        final double[] err = new double[width];
        final double[][] panelError = new double[rule.panels][width];
        final double[] lag = new double[rule.q];
        final PanelErrors errors = new PanelErrors(rule, width);
        final double[] coords = new double[k];
        /** values[quantity][column]: quantiles, then exceedances, then the mean. */
        final double[][] values = new double[quantities][cols];
        final double[] sel = new double[draws];
        final double[] tails = new double[Selection.workLength(draws)];
        final QuantileSearch work = new QuantileSearch(rule, width);
        final double[] quantile = new double[width];
        final double[] scaleMax = new double[r];
        /** S_l, the largest |z_l| of a block's draws, and per node Σ_l S_l |bt_li|. */
        final double[] blockScale = new double[r];
        final double[] reach = new double[rule.m];
        int exact;
        /**
         * Per refinement level, its engine's scratch (on first need) and whether its node values of
         * the location are set.
         */
        final Scratch[] fine = new Scratch[RefinedRules.LEVELS];
        final boolean[] fineBase = new boolean[RefinedRules.LEVELS];
        /** Block columns that failed the rule's check. */
        final int[] failed = new int[width];
        /** Draws whose block passed the bound of {@link CellBound}, summed over calls (for the tests). */
        long bounded;
    }

    Scratch scratch() {
        return new Scratch();
    }

    /**
     * Draws and evaluates one location: c[off..off+K) the kriged coordinates, variance σ², stream
     * s. Values go to s.values; s.exact counts the draws evaluated exactly.
     *
     * @throws DensaException if a draw cannot be evaluated (coordinates beyond what double precision resolves)
     */
    void evaluate(double[] c, int off, double variance, long stream, Scratch s) {
        double sigma = Math.sqrt(Math.max(0, variance));
        SplittableRandom rng = Seeds.stream(seed, stream);
        double[][] z = s.z;
        for (int d = 0; d < draws; d++) {
            for (int l = 0; l < r; l++) {
                z[l][d] = sigma * rng.nextGaussian();
            }
        }
        for (int l = 0; l < r; l++) {
            z[l][draws] = 0;
        }
        s.exact = 0;
        java.util.Arrays.fill(s.fineBase, false);
        if (exactOnly) {
            for (int d = 0; d < cols; d++) {
                exactDraw(c, off, d, s);
            }
            return;
        }
        nodeDraws(c, off, s);
    }

    private void nodeDraws(double[] c, int off, Scratch s) {
        rule.nodeValues(c, off, s.base);
        // the bound covers every draw of the location; each block compares it with its own masses
        double bound = rule.q == 4 && useCellBound ? cellBound(s) : Double.NaN;
        for (int d0 = 0; d0 < cols; d0 += width) {
            nodeBlock(c, off, d0, Math.min(width, cols - d0), bound, s);
        }
    }

    /** Draws d0 .. d0 + nc − 1 of the location (block-local arrays at column d − d0). */
    private void nodeBlock(double[] c, int off, int d0, int nc, double bound, Scratch s) {
        // in steps of their own, each method small enough to compile quickly
        nodeValues(d0, nc, s);
        boolean check = massesAndErrors(nc, bound, s);
        quantities(d0, nc, s);
        if (check) {
            double[] err = s.err, tot = s.total;
            int nf = 0;
            for (int d = 0; d < nc; d++) {
                if (!(err[d] <= RULE_TOLERANCE * tot[d])) {
                    s.failed[nf++] = d0 + d;
                }
            }
            if (nf > 0) {
                refined.evaluate(c, off, nf, s);
            }
        }
    }

    /**
     * After {@link #nodeValues}: the panel masses and totals of draws 0 .. nc − 1 of the block, and,
     * unless the location's bound (NaN: none) shows them below the tolerance, each draw's error
     * estimate into s.err; returns whether the estimates were computed (and must be checked).
     */
    boolean massesAndErrors(int nc, double bound, Scratch s) {
        boolean check = rule.q == 4 ? panelsOfFour(nc, bound, s) : panels(nc, s);
        if (check) {
            double[] err = s.err;
            java.util.Arrays.fill(err, 0, nc, 0.0);
            for (int j = 0; j < rule.panels; j++) {
                double[] rj = s.panelError[j];
                for (int d = 0; d < nc; d++) {
                    err[d] += rj[d];
                }
            }
        }
        return check;
    }

    /** The node values of draws d0 .. d0 + nc − 1 into s.y and their largest into s.shift. */
    void nodeValues(int d0, int nc, Scratch s) {
        int m = rule.m;
        double[][] y = s.y;
        double[] mx = s.shift;
        // node by node, the block's normals in rows indexed from 0 too
        double[][] zb = s.z;
        if (d0 > 0) {
            zb = s.zBlock;
            for (int l = 0; l < r; l++) {
                System.arraycopy(s.z[l], d0, zb[l], 0, nc);
            }
        }
        for (int i = 0; i < m; i++) {
            nodeRow(s.base[i], i, zb, y[i], nc);
        }
        // the largest node value of each draw, over the nodes that can hold it: with S_l the largest
        // |z_l| of the block, node i's values lie within base_i ± Σ_l S_l |bt_li|, so a node whose
        // upper end is below the largest lower end is never the largest (margin for rounding); max is
        // exact, so the result is that of all nodes
        double[] base = s.base, sc = s.blockScale;
        CellBound.largestMagnitudes(zb, r, nc, sc);
        double floor = Double.NEGATIVE_INFINITY;
        double[] reach = s.reach;
        for (int i = 0; i < m; i++) {
            double e = 0;
            for (int l = 0; l < r; l++) {
                e += sc[l] * Math.abs(bt[l * m + i]);
            }
            reach[i] = e;
            floor = Math.max(floor, base[i] - e);
        }
        floor -= 1e-9 * (1 + Math.abs(floor));
        boolean first = true;
        for (int i = 0; i < m; i++) {
            if (!(base[i] + reach[i] < floor)) {
                double[] row = y[i];
                if (first) {
                    System.arraycopy(row, 0, mx, 0, nc);
                    first = false;
                } else {
                    for (int d = 0; d < nc; d++) {
                        mx[d] = Math.max(mx[d], row[d]);
                    }
                }
            }
        }
    }

    /**
     * 4-point panels: node exponentials, panel masses and totals; the per-draw error estimates into
     * s.panelError unless the location's bound shows them below the tolerance. Returns whether they
     * were computed (and must be checked).
     */
    private boolean panelsOfFour(int nc, double bound, Scratch s) {
        double[] tot = s.total;
        exponentialsOfFour(s.y, s.shift, s.g, s.mass, nc);
        totals(s.mass, s.prefix, tot, nc);
        double least = Double.POSITIVE_INFINITY;
        for (int d = 0; d < nc; d++) {
            least = Math.min(least, tot[d]);
        }
        // every draw's estimate is at most the bound: the per-draw estimates are not needed
        boolean check = !(bound * (1 + 1e-6) <= RULE_TOLERANCE * least);
        if (check) {
            s.errors.four(s.y, s.shift, s.panelError, nc);
        } else {
            s.bounded += nc;
        }
        return check;
    }

    /** Other rules: error estimates, node exponentials, panel masses and totals; returns true. */
    private boolean panels(int nc, Scratch s) {
        NodeRule nr = rule;
        int m = nr.m, q = nr.q, np = nr.panels;
        double[][] y = s.y, g = s.g, mass = s.mass, rp = s.panelError;
        double[] mx = s.shift, tot = s.total;
        // per-panel error estimate h C e_{2q}(|β|) exp(c_max − shift) (see NodeRule), vectorised over draws
        for (double[] row : rp) {
            java.util.Arrays.fill(row, 0, nc, 0.0);
        }
        if (nr.ruleConstant > 0) {
            s.errors.general(y, mx, rp, nc);
        }
        for (int i = 0; i < m; i++) {
            double[] yi = y[i], gi = g[i];
            for (int d = 0; d < nc; d++) {
                gi[d] = Kernels.expFast(yi[d] - mx[d]);
            }
        }
        for (int j = 0; j < np; j++) {
            double[] mj = mass[j];
            java.util.Arrays.fill(mj, 0, nc, 0.0);
            for (int i = j * q; i < (j + 1) * q; i++) {
                double wi = nr.w[i];
                double[] gi = g[i];
                for (int d = 0; d < nc; d++) {
                    mj[d] += wi * gi[d];
                }
            }
        }
        totals(mass, s.prefix, tot, nc);
        return true;
    }

    /** The quantiles, exceedance probabilities and mean of draws d0 .. d0 + nc − 1 into s.values. */
    void quantities(int d0, int nc, Scratch s) {
        NodeRule nr = rule;
        int m = nr.m, np = nr.panels;
        double[][] y = s.y, g = s.g, mass = s.mass;
        double[] mx = s.shift, tot = s.total;
        int qi = 0;
        for (int p = 0; p < probs.length; p++, qi++) {
            double[] v = s.values[qi];
            s.work.quantiles(probs[p], mass, s.prefix, g, y, mx, nc, s.quantile);
            for (int d = 0; d < nc; d++) {
                double xq = s.quantile[d];
                v[d0 + d] = units == null ? xq : units.applyAsDouble(xq);
            }
        }
        for (int t = 0; t < thresholds.length; t++, qi++) {
            double[] v = s.values[qi];
            java.util.Arrays.fill(v, d0, d0 + nc, 0.0);
            for (int j = nr.tailPanel[t]; j < np; j++) {
                double[] mj = mass[j];
                for (int d = 0; d < nc; d++) {
                    v[d0 + d] += mj[d];
                }
            }
            for (int d = 0; d < nc; d++) {
                v[d0 + d] = Math.min(1, v[d0 + d] / tot[d]);
            }
        }
        if (mean && cosWeights != null) {
            double[] v = s.values[qi];
            for (int d = 0; d < nc; d++) {
                double c = 0, sn = 0;
                for (int i = 0; i < m; i++) {
                    c += cosWeights[i] * g[i][d];
                    sn += sinWeights[i] * g[i][d];
                }
                v[d0 + d] = direction(c, sn);
            }
        } else if (mean) {
            double[] v = s.values[qi];
            java.util.Arrays.fill(v, d0, d0 + nc, 0.0);
            for (int i = 0; i < m; i++) {
                double wi = meanWeights[i];
                double[] gi = g[i];
                for (int d = 0; d < nc; d++) {
                    v[d0 + d] += wi * gi[d];
                }
            }
            for (int d = 0; d < nc; d++) {
                v[d0 + d] /= tot[d];
            }
        }
    }

    /**
     * row[0..nc) = base + Σ_l bt[l·m + i] zb[l][d], added in order of l (the same sums, rounded
     * the same way, as one pass per direction), with two directions per pass.
     */
    private void nodeRow(double base, int i, double[][] zb, double[] row, int nc) {
        int m = rule.m;
        int l = 0;
        if (r >= 2) {
            double b0 = bt[i], b1 = bt[m + i];
            double[] z0 = zb[0], z1 = zb[1];
            for (int d = 0; d < nc; d++) {
                row[d] = base + b0 * z0[d] + b1 * z1[d];
            }
            l = 2;
        } else {
            double b0 = bt[i];
            double[] z0 = zb[0];
            for (int d = 0; d < nc; d++) {
                row[d] = base + b0 * z0[d];
            }
            l = 1;
        }
        for (; l + 1 < r; l += 2) {
            double b0 = bt[l * m + i], b1 = bt[(l + 1) * m + i];
            double[] z0 = zb[l], z1 = zb[l + 1];
            for (int d = 0; d < nc; d++) {
                row[d] = row[d] + b0 * z0[d] + b1 * z1[d];
            }
        }
        if (l < r) {
            double b0 = bt[l * m + i];
            double[] z0 = zb[l];
            for (int d = 0; d < nc; d++) {
                row[d] = row[d] + b0 * z0[d];
            }
        }
    }

    /**
     * The cumulative panel masses, prefix[j][d] = Σ_{i&lt;j} mass[i][d] summed in panel order
     * (j = 0..panels), and the totals tot[d] = prefix[panels][d].
     */
    private void totals(double[][] mass, double[][] prefix, double[] tot, int nc) {
        java.util.Arrays.fill(prefix[0], 0, nc, 0.0);
        for (int j = 0; j < rule.panels; j++) {
            double[] pj = prefix[j], mj = mass[j], next = prefix[j + 1];
            for (int d = 0; d < nc; d++) {
                next[d] = pj[d] + mj[d];
            }
        }
        System.arraycopy(prefix[rule.panels], 0, tot, 0, nc);
    }

    /**
     * 4-point panels: node exponentials exp(y − shift) into g and the panel masses; each loop is
     * short and unit-stride over the draws so that the JIT vectorises it.
     */
    private void exponentialsOfFour(double[][] y, double[] mx, double[][] g, double[][] mass, int nc) {
        NodeRule nr = rule;
        int np = nr.panels;
        for (int j = 0; j < np; j++) {
            for (int i = 4 * j; i < 4 * j + 4; i++) {
                double[] yi = y[i], gi = g[i];
                for (int d = 0; d < nc; d++) {
                    gi[d] = Kernels.expFast(yi[d] - mx[d]);
                }
            }
            double w0 = nr.w[4 * j], w1 = nr.w[4 * j + 1], w2 = nr.w[4 * j + 2], w3 = nr.w[4 * j + 3];
            double[] g0 = g[4 * j], g1 = g[4 * j + 1], g2 = g[4 * j + 2], g3 = g[4 * j + 3], mj = mass[j];
            for (int d = 0; d < nc; d++) {
                mj[d] = w0 * g0[d] + w1 * g1[d] + w2 * g2[d] + w3 * g3[d];
            }
        }
    }

    /** The bound of {@link CellBound} for the location in s (4-point panels only). */
    double cellBound(Scratch s) {
        return cellBound.of(s.z, cols, s.base, s.scaleMax);
    }

    /** Evaluates draw d (column) through the space's exact methods. */
    void exactDraw(double[] c, int off, int d, Scratch s) {
        double[] cc = s.coords;
        double[][] z = s.z;
        for (int j = 0; j < k; j++) {
            double v = c[off + j];
            for (int l = 0; l < r; l++) {
                v += factor[j * r + l] * z[l][d];
            }
            cc[j] = v;
        }
        Density dd = space.density(cc);
        int qi = 0;
        for (double p : probs) {
            double xq = dd.quantile(p);
            s.values[qi++][d] = units == null ? xq : units.applyAsDouble(xq);
        }
        for (double t : thresholds) {
            s.values[qi++][d] = dd.tailProbability(t);
        }
        if (mean && cosWeights != null) {
            // no mean direction for a uniform draw: lower(), as atan2(0, 0) gives in the node rule
            s.values[qi][d] = dd.meanResultantLength() >= 1e-12 ? dd.circularMean() : space.lower();
        } else if (mean) {
            s.values[qi][d] = units == null ? dd.mean() : space.integrate(
                    xx -> units.applyAsDouble(xx) * dd.pdf(xx) / space.referenceDensity(xx));
        }
        s.exact++;
    }

    /** Summaries of quantities from, …, from + count − 1 of the last evaluated location at the options' level. */
    List<DerivedInterval> intervals(Scratch s, int from, int count) {
        double[] v = new double[5];
        List<DerivedInterval> out = new ArrayList<>(count);
        for (int q = from; q < from + count; q++) {
            summary(s, q, level, v);
            out.add(new DerivedInterval(v[0], v[1], v[2], v[3], v[4], level, draws));
        }
        return out;
    }

    /**
     * Summary of quantity qi of the last evaluated location: writes estimate (plug-in), mean, sd,
     * lower and upper (central interval at level) into out[0..5); a circular mean's draws are
     * unrolled around the plug-in value first (within half a period of it).
     */
    void summary(Scratch s, int qi, double level, double[] out) {
        boolean circular = cosWeights != null && mean && qi == quantities - 1;
        Selection.summarise(s.values[qi], draws, level, circular ? space.period() : Double.NaN, s.sel, s.tails, out);
    }
}
