package io.densa.spatial.uncertainty;

import io.densa.core.Basis;
import io.densa.core.BayesSpace;
import io.densa.core.internal.Kernels;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;

/**
 * A fixed quadrature rule for evaluating many densities of one space fast (package-private; the
 * engine of {@link UncertaintyOptions.Evaluation#NODE_RULE}).
 *
 * <p><b>Nodes.</b> The domain is cut into panels at the basis breakpoints (spline knots, bin
 * edges; polynomial spaces get 16 equal panels), spans are split evenly so that there are at
 * least 16 panels (the cubic-spline space of study 2, 9 spans, gets 2 per span: with one, about
 * 40 % of its draws failed the error check below), and every exceedance threshold inside the domain becomes a panel edge. Each
 * panel carries the q-point Gauss–Legendre rule, q = max(4, clr degree + 1) (1 for step bases
 * with a flat reference, whose clr is constant on each bin): the clr of a density is a
 * polynomial of degree below q on every panel, so its node values determine it exactly there.
 * With E the m × K basis matrix at the nodes, a density with coordinates c has node values
 * y = E c + log p (p the reference's Lebesgue density) and Lebesgue density ∝ exp(y).
 *
 * <p><b>Functionals.</b> Panel masses are the Gauss–Legendre sums of exp(y − max y); the
 * normalising constant is their total and P(X &gt; t) the share of the panels right of t (exact
 * panel edges, no interpolation). A quantile is found in its panel by inverting the integral of
 * the polynomial that interpolates exp(y) at the panel's nodes (Newton steps on a polynomial of
 * degree q), followed by one Newton step on the exact partial integral, in which the clr is
 * interpolated (exactly, see above) and exp(clr) integrated by the q-point rule on the partial
 * panel (the interpolant alone was off by up to 3·10⁻⁴ in the tests, the step brings that to the
 * panel rule's own error). The mean of u(X) is the Gauss–Legendre sum of u · exp(y).
 *
 * <p><b>Error.</b> The q-point Gauss–Legendre rule on a panel of width h has error
 * h (q!)⁴/((2q+1)((2q)!)³) f^{(2q)}(ξ) for f(u) = exp(clr) in the panel fraction u (Davis &amp;
 * Rabinowitz (1984), Methods of Numerical Integration, 2nd ed., §2.7 — from memory). The engine
 * estimates f^{(2q)} by (2q)! e_{2q} exp(c_max), with e_{2q} the t^{2q} coefficient of
 * exp(Σ_m |β_m| t^m), β_m the Taylor coefficients of the clr about the panel centre and c_max the
 * largest clr value at the nodes and both panel ends (for 4-point panels the bound
 * c(½) + |β₁|/2 + |β₂|/4 + |β₃|/8 instead; all exact, the clr being a polynomial of degree below
 * q there), times a safety factor of 4; over 3,000 random cubic clr on one panel this estimate was
 * never below the true error (at worst 0.42 of it before the factor 4: a committed check in the
 * tests). The panel estimates are added, and the engine evaluates a density exactly when their
 * total exceeds its tolerance (10⁻⁴ of the mass) — first on this rule with every panel cut into 4,
 * then 16 ({@link #NodeRule(BayesSpace, double[], int)}). Exponentials are computed by {@link #exp},
 * relative error below 3·10⁻¹⁰.
 */
final class NodeRule {
    /** Panels at least, for spline spaces (spans are split evenly). */
    static final int MIN_PANELS = 16;
    /** Equal panels of a polynomial space. */
    static final int POLYNOMIAL_PANELS = 16;
    private static final double SAFETY = 4;

    final BayesSpace space;
    final int k;
    final int q;
    final int panels;
    final int m;
    final double[] lo;
    final double[] width;
    final double[] x;
    final double[] w;
    final double[] logRef;
    /** m × K basis values, row-major. */
    final double[] e;
    final double[] un;
    final double[] uw;
    /** q × q: ∫_0^u ℓ_i = Σ_{j=1..q} anti[i q + j − 1] u^j for the Lagrange polynomials ℓ_i of the nodes. */
    final double[] anti;
    private final double[] lagScale;
    /**
     * safety · (q!)⁴/((2q+1)((2q)!)³) · (2q)!: the error estimate of a panel of width h is this ·
     * h · e_{2q} · exp(max clr), see {@link #errorFactor}.
     */
    final double ruleConstant;
    /** (q − 1) × q: Taylor coefficients β_m (m = 1..q−1) of the clr about the panel centre, in the panel fraction u, from its node values. */
    final double[] taylor;
    /** ℓ_i(0) then ℓ_i(1), i &lt; q: the interpolated clr at the panel's ends from its node values. */
    final double[] endWeights;
    /** ℓ_i(½): the clr at the panel centre from its node values. */
    final double[] centreWeights;
    /** q × q: the clr's power coefficients in the panel fraction from its node values (see {@link #powerWeights}). */
    final double[] power;
    /** Per threshold: the first panel right of it (0 below the domain, panels above it). */
    final int[] tailPanel;

    NodeRule(BayesSpace space, double[] thresholds) {
        this(space, thresholds, 1);
    }

    /**
     * The rule with every panel of {@link #NodeRule(BayesSpace, double[])} cut into {@code refine}
     * equal panels (the refined rule a draw falls back to before the exact methods).
     */
    NodeRule(BayesSpace space, double[] thresholds, int refine) {
        this.space = space;
        this.k = space.dimension();
        Basis basis = space.basis();
        double a = space.lower(), b = space.upper();
        double[] bp;
        int per;
        boolean flat = space.reference().isFlat();
        switch (basis.kind()) {
            case STEP:
                bp = basis.breakpoints();
                per = flat ? 1 : Math.max(1, (MIN_PANELS + bp.length - 2) / (bp.length - 1));
                q = flat ? 1 : 4;
                break;
            case POLYNOMIAL:
                bp = new double[] {a, b};
                per = POLYNOMIAL_PANELS;
                q = Math.max(4, basis.order() + 1);
                break;
            default:
                bp = basis.breakpoints();
                per = Math.max(1, (MIN_PANELS + bp.length - 2) / (bp.length - 1));
                q = Math.max(4, basis.order());
                break;
        }
        per *= refine;
        List<Double> edges = new ArrayList<>();
        for (int s = 0; s + 1 < bp.length; s++) {
            for (int j = 0; j < per; j++) {
                edges.add(j == 0 ? bp[s] : bp[s] + (bp[s + 1] - bp[s]) * j / per);
            }
        }
        edges.add(b);
        double eps = 1e-12 * (b - a);
        for (double t : thresholds) {
            if (t > a + eps && t < b - eps) {
                boolean present = false;
                for (double v : edges) {
                    present |= Math.abs(v - t) <= eps;
                }
                if (!present) {
                    edges.add(t);
                }
            }
        }
        double[] ed = edges.stream().mapToDouble(Double::doubleValue).sorted().toArray();
        panels = ed.length - 1;
        lo = Arrays.copyOf(ed, panels);
        width = new double[panels];
        for (int j = 0; j < panels; j++) {
            width[j] = ed[j + 1] - ed[j];
        }
        tailPanel = new int[thresholds.length];
        for (int i = 0; i < thresholds.length; i++) {
            double t = thresholds[i];
            int j = 0;
            while (j < panels && lo[j] < t - eps) {
                j++;
            }
            tailPanel[i] = t >= b ? panels : j;
        }
        GaussIntegrator gi = new GaussIntegratorFactory().legendre(q, 0, 1);
        un = new double[q];
        uw = new double[q];
        for (int i = 0; i < q; i++) {
            un[i] = gi.getPoint(i);
            uw[i] = gi.getWeight(i);
        }
        lagScale = new double[q];
        for (int i = 0; i < q; i++) {
            double s = 1;
            for (int j = 0; j < q; j++) {
                if (j != i) {
                    s *= un[i] - un[j];
                }
            }
            lagScale[i] = 1 / s;
        }
        anti = antiderivatives(un, lagScale, q);
        m = panels * q;
        x = new double[m];
        w = new double[m];
        logRef = new double[m];
        for (int j = 0; j < panels; j++) {
            for (int i = 0; i < q; i++) {
                int o = j * q + i;
                x[o] = lo[j] + width[j] * un[i];
                w[o] = width[j] * uw[i];
                logRef[o] = Math.log(space.referenceDensity(x[o]));
            }
        }
        e = space.basisMatrix(x).data;
        double fq = 1;
        for (int i = 2; i <= q; i++) {
            fq *= i;
        }
        double f2q = 1;
        for (int i = 2; i <= 2 * q; i++) {
            f2q *= i;
        }
        ruleConstant = q == 1 ? 0 : SAFETY * Math.pow(fq, 4) / ((2 * q + 1) * f2q * f2q);
        taylor = taylorWeights(un, q);
        power = powerWeights(un, q);
        endWeights = new double[2 * q];
        double[] l0 = new double[q];
        lagrange(0, l0);
        System.arraycopy(l0, 0, endWeights, 0, q);
        lagrange(1, l0);
        System.arraycopy(l0, 0, endWeights, q, q);
        centreWeights = new double[q];
        lagrange(0.5, centreWeights);
    }

    /** q × q: power coefficients γ_m = Σ_i power[m q + i] y_i of the clr in the panel fraction u, c(u) = Σ γ_m u^m. */
    private static double[] powerWeights(double[] un, int q) {
        return inverseVandermonde(un, q);
    }

    /** The inverse of V_{im} = un_i^m (q × q, row m holds the weights of coefficient m). */
    private static double[] inverseVandermonde(double[] un, int q) {
        double[][] a = new double[q][2 * q];
        for (int i = 0; i < q; i++) {
            double p = 1;
            for (int mm = 0; mm < q; mm++) {
                a[i][mm] = p;
                p *= un[i];
            }
            a[i][q + i] = 1;
        }
        gaussJordan(a, q);
        double[] out = new double[q * q];
        for (int mm = 0; mm < q; mm++) {
            for (int i = 0; i < q; i++) {
                out[mm * q + i] = a[mm][q + i];
            }
        }
        return out;
    }

    /** Gauss–Jordan with partial pivoting on [V | I], leaving [I | V⁻¹]. */
    private static void gaussJordan(double[][] a, int q) {
        for (int c = 0; c < q; c++) {
            int piv = c;
            for (int r = c + 1; r < q; r++) {
                if (Math.abs(a[r][c]) > Math.abs(a[piv][c])) {
                    piv = r;
                }
            }
            double[] tmp = a[c];
            a[c] = a[piv];
            a[piv] = tmp;
            double d = a[c][c];
            for (int cc = 0; cc < 2 * q; cc++) {
                a[c][cc] /= d;
            }
            for (int r = 0; r < q; r++) {
                if (r != c && a[r][c] != 0) {
                    double f = a[r][c];
                    for (int cc = 0; cc < 2 * q; cc++) {
                        a[r][cc] -= f * a[c][cc];
                    }
                }
            }
        }
    }

    /** Rows m = 1..q−1 of the inverse of the Vandermonde matrix V_{im} = (un_i − ½)^m, m = 0..q−1. */
    private static double[] taylorWeights(double[] un, int q) {
        double[][] a = new double[q][2 * q];
        for (int i = 0; i < q; i++) {
            double t = un[i] - 0.5, p = 1;
            for (int mm = 0; mm < q; mm++) {
                a[i][mm] = p;
                p *= t;
            }
            a[i][q + i] = 1;
        }
        gaussJordan(a, q);
        double[] out = new double[(q - 1) * q];
        for (int mm = 1; mm < q; mm++) {
            for (int i = 0; i < q; i++) {
                out[(mm - 1) * q + i] = a[mm][q + i];
            }
        }
        return out;
    }

    /**
     * e_{2q}: the coefficient of t^{2q} in exp(Σ_m |β_m| t^m) (β from {@link #taylor}), by the
     * power-series recurrence n e_n = Σ_m m |β_m| e_{n−m}; e stores e_0..e_{2q} (scratch).
     * (2q)! e_{2q} exp(c) bounds the 2q-th derivative of exp(clr) at the centre in the panel
     * fraction when the Taylor coefficients are taken in absolute value.
     */
    double errorFactor(double[] beta, double[] e) {
        int n = 2 * q;
        e[0] = 1;
        for (int kk = 1; kk <= n; kk++) {
            double s = 0;
            for (int mm = 1; mm < q && mm <= kk; mm++) {
                s += mm * Math.abs(beta[mm - 1]) * e[kk - mm];
            }
            e[kk] = s / kk;
        }
        return e[n];
    }

    /** Coefficients of ∫_0^u ℓ_i(v) dv in powers u^1..u^q (ℓ_i the Lagrange polynomials of nodes un). */
    private static double[] antiderivatives(double[] un, double[] scale, int q) {
        double[] out = new double[q * q];
        for (int i = 0; i < q; i++) {
            // expand Π_{j≠i} (v − un_j) into power coefficients
            double[] poly = new double[q];
            poly[0] = 1;
            int deg = 0;
            for (int j = 0; j < q; j++) {
                if (j == i) {
                    continue;
                }
                for (int d = deg + 1; d >= 1; d--) {
                    poly[d] = poly[d - 1] - un[j] * poly[d];
                }
                poly[0] = -un[j] * poly[0];
                deg++;
            }
            for (int d = 0; d < q; d++) {
                out[i * q + d] = poly[d] * scale[i] / (d + 1);
            }
        }
        return out;
    }

    /** Node values y_i = (E c)_i + log p(x_i) of the coordinates c[off..off+K) into out[0..m). */
    void nodeValues(double[] c, int off, double[] out) {
        for (int i = 0; i < m; i++) {
            double s = logRef[i];
            int eo = i * k;
            for (int j = 0; j < k; j++) {
                s += e[eo + j] * c[off + j];
            }
            out[i] = s;
        }
    }

    /** u(x_i) at the nodes, checking that u is finite and increasing on a fine grid of the domain. */
    double[] unitsAtNodes(DoubleUnaryOperator units) {
        double a = space.lower(), b = space.upper();
        double prev = Double.NEGATIVE_INFINITY;
        int steps = 4096;
        for (int i = 0; i <= steps; i++) {
            double v = a + (b - a) * i / steps;
            double u = units.applyAsDouble(i == steps ? b : v);
            if (!Double.isFinite(u) || !(u > prev)) {
                throw new IllegalArgumentException("the data-units function must be finite and increasing on the domain ["
                        + a + ", " + b + "]; at x = " + v + " it gives " + u + " after " + prev);
            }
            prev = u;
        }
        double[] out = new double[m];
        for (int i = 0; i < m; i++) {
            out[i] = units.applyAsDouble(x[i]);
        }
        return out;
    }

    /** ℓ_i(v) for i &lt; q into out. */
    private void lagrange(double v, double[] out) {
        for (int i = 0; i < q; i++) {
            double s = lagScale[i];
            for (int j = 0; j < q; j++) {
                if (j != i) {
                    s *= v - un[j];
                }
            }
            out[i] = s;
        }
    }

    /** Step (in the panel fraction) below which the search for the interpolant's root stops. */
    static final double ROOT_TOLERANCE = 1e-7;

    /**
     * The root u ∈ [0, 1] of G(u) = Σ_k a_k u^{k+1} = need (a[0..q), G(1) = mj), by Newton steps
     * from the linear guess need/mj kept inside a bisection bracket, until a step or the bracket is
     * below {@link #ROOT_TOLERANCE} (at most 12 steps).
     */
    double interpolantRoot(double[] a, double need, double mj) {
        double u = need / mj;
        double left = 0, right = 1;
        for (int it = 0; it < 12; it++) {
            double val = 0, der = 0;
            for (int d = q - 1; d >= 0; d--) {
                val = val * u + a[d];
                der = der * u + (d + 1) * a[d];
            }
            val *= u;
            double f = val - need;
            if (f > 0) {
                right = u;
            } else {
                left = u;
            }
            double nu = der > 0 ? u - f / der : Double.NaN;
            nu = nu > left && nu < right ? nu : 0.5 * (left + right);
            // the exact Newton step of the quantile search squares this error
            boolean done = Math.abs(nu - u) <= ROOT_TOLERANCE;
            u = nu;
            if (done || right - left <= ROOT_TOLERANCE) {
                break;
            }
        }
        return u;
    }

    /**
     * The quantile of probability p of one density, from its panel masses (mass[j·stride + col],
     * total z), node exponentials g and node values y (both at yOff + i·stride) and shift (the
     * largest node value). lag is scratch of length q.
     */
    double quantile(double p, double[] mass, int col, int stride, double z, double[] g, double[] y, int yOff,
            double shift, double[] lag) {
        double target = p * z;
        double cum = 0;
        int j = 0;
        while (j < panels - 1 && cum + mass[j * stride + col] < target) {
            cum += mass[j * stride + col];
            j++;
        }
        double mj = mass[j * stride + col];
        double need = Math.min(mj, Math.max(0, target - cum));
        if (!(mj > 0)) {
            return lo[j] + 0.5 * width[j];
        }
        double h = width[j];
        // interpolant of g on the panel: G(u) = h Σ_i g_i ∫_0^u ℓ_i = h Σ_d a_d u^{d+1}
        double[] a = lag; // reuse as coefficient storage (q values); lagrange() is not called before the exact step
        int gb = yOff + j * q * stride;
        for (int d = 0; d < q; d++) {
            double s = 0;
            for (int i = 0; i < q; i++) {
                s += g[gb + i * stride] * anti[i * q + d];
            }
            a[d] = h * s;
        }
        double u = interpolantRoot(a, need, mj);
        // one Newton step on the exact partial integral ∫_0^u exp(clr) (the clr interpolated exactly,
        // in power form); the interpolant's root is within about 10⁻⁴ of the panel, so the step
        // leaves an error of order its square (measured in the tests)
        double[] gam = lag;
        int yb = yOff + j * q * stride;
        for (int mm = 0; mm < q; mm++) {
            double c = 0;
            for (int i = 0; i < q; i++) {
                c += power[mm * q + i] * y[yb + i * stride];
            }
            gam[mm] = c;
        }
        double part = 0;
        for (int i = 0; i < q; i++) {
            double v = u * un[i], c = 0;
            for (int mm = q - 1; mm >= 0; mm--) {
                c = c * v + gam[mm];
            }
            part += uw[i] * Kernels.expFast(c - shift);
        }
        double cu = 0;
        for (int mm = q - 1; mm >= 0; mm--) {
            cu = cu * u + gam[mm];
        }
        double f = part * h * u - need;
        double dens = h * Kernels.expFast(cu - shift);
        double nu = dens > 0 ? u - f / dens : Double.NaN;
        if (nu >= 0 && nu <= 1) {
            u = nu;
        }
        return lo[j] + u * h;
    }
}
