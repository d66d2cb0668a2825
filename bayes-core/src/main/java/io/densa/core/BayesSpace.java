package io.densa.core;

import io.densa.core.internal.Cholesky;
import io.densa.core.internal.GaussLegendre;
import java.util.Arrays;
import java.util.Objects;
import java.util.function.DoubleUnaryOperator;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.SingularOps_DDRM;
import org.ejml.dense.row.factory.LinearSolverFactory_DDRM;
import org.ejml.interfaces.linsol.LinearSolverDense;

/**
 * A Bayes Hilbert space B2(P) of densities on a bounded interval I = [a, b], with reference
 * measure P and an orthonormal basis e_1..e_K of the clr subspace of L2(P) (functions with
 * zero P-integral). Every density f of the space is stored as its coordinates
 * c_k = ⟨clr f, e_k⟩_P, so that perturbation, powering, the B2 inner product, norms and distances
 * are exactly the vector operations of R^K (Egozcue, Díaz-Barrero, Pawlowsky-Glahn (2006),
 * Hilbert space of probability density functions based on Aitchison geometry, Acta Math. Sinica
 * 22(4); van den Boogaart, Egozcue, Pawlowsky-Glahn (2014), Bayes Hilbert spaces, Aust. N. Z. J.
 * Stat. 56(2)).
 *
 * <h2>Conventions</h2>
 * <ul>
 * <li>clr f = ln f_P − (1/P(I)) ∫ ln f_P dP, where f_P is the density of the distribution with
 * respect to P; ⟨f, g⟩_B = ∫ clr f clr g dP.</li>
 * <li>The default reference is Lebesgue measure on I (P(I) = b − a); see {@link Reference} for
 * the uniform probability and weighted alternatives.</li>
 * <li>{@link Density#pdf(double)} always returns the Lebesgue density (what a histogram
 * estimates), whatever the reference.</li>
 * </ul>
 *
 * <h2>Basis and quadrature</h2>
 * The space takes the raw functions of its {@link Basis}, centres them against P and
 * orthonormalises them in L2(P) by a Cholesky factorisation of their Gram matrix (done twice
 * for accuracy), so e = T (φ − φ̄) with T lower triangular. Integrals use composite
 * Gauss–Legendre quadrature on panels that never straddle a knot or bin edge, with at least as
 * many points per panel as the spline order: for Lebesgue and uniform references it is exact for
 * products of basis functions, hence the round trip coordinates → clr → coordinates is exact to
 * rounding. Non-linear functionals (normalising constants, cdf, tail probabilities, quantiles,
 * moments) use the same panels (at least 64 of them for splines and polynomials); a panel on
 * which the clr varies by more than 3 across its nodes (a sharply peaked density, or one piled
 * up at an end) is integrated by adaptive bisection of its rule instead, to a relative
 * tolerance of 1e-12 or the rounding noise of the clr, whichever is larger (the log of a
 * non-flat reference weight counts towards that variation). Cumulative panel
 * masses are kept from both ends, so lower tails (cdf) and upper tails
 * ({@link Density#tailProbability}) both keep their relative accuracy; quantiles are solved to
 * the double spacing at the answer.
 *
 * <p>Immutable and thread-safe. Equality compares domain, reference and basis.
 */
public final class BayesSpace {
    private static final int MIN_PANELS = 64;
    private static final int POINTS = 8;

    private final double a;
    private final double b;
    private final Reference reference;
    private final Basis basis;
    private final int dim;

    private final int pts;
    /** (Λ − 1)/2, Λ the Lebesgue constant of the panel rule's nodes: see {@link #panelSums}. */
    private final double overshoot;
    private final double[] glx;
    private final double[] glw;
    private final double[] panelLo;
    private final double[] panelHi;
    private final double[] nodes;
    private final double[] weights;
    private final double refNorm;
    private final double mass;
    /** log of the reference weight at each node (0 for flat references): part of the integrand's log-range. */
    private final double[] logRefNodes;
    private final boolean flatReference;
    /** Local raw-basis table at the nodes: node q uses raw functions nodeFirst[q] + i, i &lt; width. */
    private final int[] nodeFirst;
    private final double[] nodeLocal;
    private final int localWidth;

    private final double[] t; // K×K lower triangular, row-major
    private final double[] mbar; // K
    private final double[] basisT; // K×Q row-major: e_k(x_q)
    private final Density neutral;

    private BayesSpace(double a, double b, Reference reference, Basis basis) {
        this.a = a;
        this.b = b;
        this.reference = reference;
        this.basis = basis;
        this.dim = basis.size();

        double[] breaks = breakpointsFor(basis, a, b);
        int spans = breaks.length - 1;
        int perSpan;
        if (basis.kind() == Basis.Kind.STEP && reference.isFlat()) {
            pts = 2;
            perSpan = 1;
        } else {
            int minPts = basis.kind() == Basis.Kind.SPLINE ? basis.order()
                    : basis.kind() == Basis.Kind.POLYNOMIAL ? basis.order() + 1 : 1;
            pts = Math.max(POINTS, minPts);
            perSpan = (MIN_PANELS + spans - 1) / spans;
        }
        glx = GaussLegendre.nodes(pts);
        glw = GaussLegendre.weights(pts);
        overshoot = (GaussLegendre.lebesgueConstant(pts) - 1) / 2;
        int panels = spans * perSpan;
        panelLo = new double[panels];
        panelHi = new double[panels];
        int p = 0;
        for (int s = 0; s < spans; s++) {
            double u = breaks[s], v = breaks[s + 1];
            for (int j = 0; j < perSpan; j++) {
                panelLo[p] = j == 0 ? u : u + (v - u) * j / perSpan;
                panelHi[p] = j == perSpan - 1 ? v : u + (v - u) * (j + 1) / perSpan;
                p++;
            }
        }
        int q = panels * pts;
        nodes = new double[q];
        weights = new double[q];
        double norm = 0;
        for (int j = 0; j < panels; j++) {
            double u = panelLo[j], v = panelHi[j];
            double h = 0.5 * (v - u), c = 0.5 * (u + v);
            for (int i = 0; i < pts; i++) {
                int idx = j * pts + i;
                double x = c + h * glx[i];
                nodes[idx] = x;
                double w = reference.rawWeight(x, a, b);
                if (!(w > 0 && Double.isFinite(w))) {
                    throw new IllegalArgumentException("reference " + reference + " has weight " + w + " at x = " + x
                            + "; a reference weight must be finite and > 0 on (" + a + ", " + b + ")");
                }
                weights[idx] = h * glw[i] * w;
                norm += weights[idx];
            }
        }
        if (reference.isFlat()) {
            refNorm = 1.0;
        } else {
            refNorm = norm;
            for (int i = 0; i < q; i++) {
                weights[i] /= norm;
            }
        }
        flatReference = reference.isFlat();
        logRefNodes = new double[q];
        if (!reference.isFlat()) {
            for (int i = 0; i < q; i++) {
                logRefNodes[i] = Math.log(reference.rawWeight(nodes[i], a, b) / refNorm);
            }
        }
        double m = 0;
        for (double w : weights) {
            m += w;
        }
        mass = reference.kind() == Reference.Kind.LEBESGUE ? b - a
                : reference.kind() == Reference.Kind.UNIFORM ? 1.0 : m;

        // raw functions at nodes
        int k = dim;
        double[] phi = new double[q * k];
        double[] row = new double[k];
        for (int i = 0; i < q; i++) {
            basis.evalDense(nodes[i], row);
            System.arraycopy(row, 0, phi, i * k, k);
        }
        mbar = new double[k];
        for (int i = 0; i < q; i++) {
            for (int j = 0; j < k; j++) {
                mbar[j] += weights[i] * phi[i * k + j];
            }
        }
        for (int j = 0; j < k; j++) {
            mbar[j] /= mass;
        }
        for (int i = 0; i < q; i++) {
            for (int j = 0; j < k; j++) {
                phi[i * k + j] -= mbar[j];
            }
        }
        // two passes of Cholesky orthonormalisation
        double[] tt = identity(k);
        for (int pass = 0; pass < 2; pass++) {
            double[] e = applyLower(tt, phi, q, k);
            double[] gram = weightedGram(e, weights, q, k);
            double[] linv = inverseCholeskyFactor(gram, k, basis);
            tt = multiplyLower(linv, tt, k);
        }
        t = tt;
        double[] e = applyLower(t, phi, q, k);
        basisT = new double[k * q];
        for (int i = 0; i < q; i++) {
            for (int j = 0; j < k; j++) {
                basisT[j * q + i] = e[i * k + j];
            }
        }
        localWidth = basis.supportWidth();
        nodeFirst = new int[q];
        nodeLocal = new double[q * localWidth];
        double[] scratch = new double[basis.scratchSize()];
        for (int i = 0; i < q; i++) {
            nodeFirst[i] = basis.evalLocal(nodes[i], scratch);
            for (int j = 0; j < localWidth; j++) {
                // the dropped raw function (index k) gets weight 0 through the zero padding of the
                // raw coefficients in clrAtNodes
                nodeLocal[i * localWidth + j] = scratch[j];
            }
        }
        neutral = new Density(this, new double[k], false);
    }

    // ---------------------------------------------------------------- factories

    /**
     * Space of cubic splines (order 4) with equally spaced interior knots and Lebesgue reference:
     * the usual choice, {@code splines(a, b, 4, interiorKnotCount)}.
     *
     * @param a                 lower end of the domain
     * @param b                 upper end of the domain, b &gt; a
     * @param interiorKnotCount number of equally spaced interior knots, ≥ 0
     * @return the space, of dimension K = interiorKnotCount + 3
     */
    public static BayesSpace cubicSplines(double a, double b, int interiorKnotCount) {
        return splines(a, b, 4, interiorKnotCount);
    }

    /**
     * Space of splines of any order with equally spaced interior knots and Lebesgue reference: the
     * order (4 = cubic; see {@link #cubicSplines}) comes first, then the knot count.
     *
     * @param a                 lower end of the domain
     * @param b                 upper end of the domain, b &gt; a
     * @param order             spline order (4 = cubic), 2..12
     * @param interiorKnotCount number of equally spaced interior knots, ≥ 0
     * @return the space, of dimension K = interiorKnotCount + order − 1
     */
    public static BayesSpace splines(double a, double b, int order, int interiorKnotCount) {
        checkDomain(a, b);
        if (interiorKnotCount < 0) {
            throw new IllegalArgumentException("interior knot count must be >= 0, got " + interiorKnotCount);
        }
        double[] knots = new double[interiorKnotCount];
        for (int i = 0; i < interiorKnotCount; i++) {
            knots[i] = a + (b - a) * (i + 1) / (interiorKnotCount + 1);
        }
        return new BayesSpace(a, b, Reference.lebesgue(), Basis.spline(a, b, order, knots));
    }

    /**
     * Space of splines of the given order on the given interior knots, Lebesgue reference.
     *
     * @param interiorKnots strictly increasing knots inside (a, b) (not modified)
     */
    public static BayesSpace splines(double a, double b, int order, double[] interiorKnots) {
        checkDomain(a, b);
        return new BayesSpace(a, b, Reference.lebesgue(), Basis.spline(a, b, order, interiorKnots));
    }

    /**
     * Space spanned by polynomials of degree ≤ {@code degree} (clr functions of degree 1..d),
     * Lebesgue reference; with the Lebesgue reference the basis is the normalised Legendre
     * polynomials. Exponential families with polynomial sufficient statistics (normal,
     * exponential restricted to I) lie exactly in such a space.
     */
    public static BayesSpace polynomials(double a, double b, int degree) {
        checkDomain(a, b);
        return new BayesSpace(a, b, Reference.lebesgue(), Basis.polynomial(a, b, degree));
    }

    /**
     * Space of step densities on the given bin edges e_0 &lt; … &lt; e_D (D bins, K = D − 1):
     * the Aitchison geometry of D-part compositions, scaled by bin widths.
     *
     * @param edges strictly increasing bin edges, at least 3 (not modified)
     */
    public static BayesSpace steps(double... edges) {
        Objects.requireNonNull(edges, "edges");
        if (edges.length < 3) {
            throw new IllegalArgumentException("steps need at least 3 edges (2 bins), got " + edges.length);
        }
        checkDomain(edges[0], edges[edges.length - 1]);
        Basis basis = Basis.step(edges);
        return new BayesSpace(edges[0], edges[edges.length - 1], Reference.lebesgue(), basis);
    }

    /** Space of step densities on {@code bins} equal bins over [a, b]. */
    public static BayesSpace steps(double a, double b, int bins) {
        checkDomain(a, b);
        if (bins < 2) {
            throw new IllegalArgumentException("steps need at least 2 bins, got " + bins);
        }
        double[] e = new double[bins + 1];
        for (int i = 0; i <= bins; i++) {
            e[i] = i == bins ? b : a + (b - a) * i / bins;
        }
        return new BayesSpace(a, b, Reference.lebesgue(), Basis.step(e));
    }

    /** The same domain and basis with another reference measure (a new space). */
    public BayesSpace withReference(Reference newReference) {
        Objects.requireNonNull(newReference, "reference");
        return new BayesSpace(a, b, newReference, basis);
    }

    /** Largest accepted |a|, |b|: moments such as the variance, of order (b − a)², stay representable. */
    static final double MAX_DOMAIN_END = 1e150;
    /** Smallest accepted width b − a, for the same reason at the small end. */
    static final double MIN_DOMAIN_WIDTH = 1e-150;
    /**
     * Smallest accepted width relative to max(|a|, |b|): a point of the domain is then known to
     * about 2e-8 of the width (double spacing 2.2e-16 relative), enough to place the quadrature
     * nodes and knots distinctly.
     */
    static final double MIN_RELATIVE_WIDTH = 1e-8;

    private static void checkDomain(double a, double b) {
        if (!Double.isFinite(a) || !Double.isFinite(b)) {
            throw new IllegalArgumentException("domain ends must be finite, got [" + a + ", " + b + "]");
        }
        if (!(a < b)) {
            throw new IllegalArgumentException("domain must satisfy a < b, got [" + a + ", " + b + "]");
        }
        double mag = Math.max(Math.abs(a), Math.abs(b));
        if (!(mag <= MAX_DOMAIN_END)) {
            throw new IllegalArgumentException("domain [" + a + ", " + b + "] reaches " + mag + "; ends up to "
                    + MAX_DOMAIN_END + " in magnitude are accepted (so that moments such as the variance stay"
                    + " representable): express the data in larger units");
        }
        double width = b - a;
        if (!(width >= MIN_DOMAIN_WIDTH)) {
            throw new IllegalArgumentException("domain [" + a + ", " + b + "] has width " + width
                    + "; widths from " + MIN_DOMAIN_WIDTH + " are accepted: express the data in smaller units");
        }
        if (!(width >= MIN_RELATIVE_WIDTH * mag)) {
            throw new IllegalArgumentException("domain [" + a + ", " + b + "] is too narrow relative to its"
                    + " magnitude: width " + width + " is " + (width / mag) + " of max(|a|, |b|) = " + mag
                    + ", and at least " + MIN_RELATIVE_WIDTH + " of it is accepted (points inside are then"
                    + " resolved to about 2e-8 of the width); subtract an offset from the data first, e.g. use ["
                    + 0.0 + ", " + width + "] for values minus " + a);
        }
    }

    private static double[] breakpointsFor(Basis basis, double a, double b) {
        return basis.breakpoints();
    }

    // ---------------------------------------------------------------- accessors

    /** Lower end a of the domain. */
    public double lower() {
        return a;
    }

    /** Upper end b of the domain. */
    public double upper() {
        return b;
    }

    /** Dimension K of the space (number of coordinates of a density). */
    public int dimension() {
        return dim;
    }

    /** The reference measure. */
    public Reference reference() {
        return reference;
    }

    /**
     * The matrix T of the orthonormalisation e(x) = T(φ(x) − φ̄), with φ the raw functions of
     * {@link #basis()} and φ̄ their means under the reference (see the class description): K × K,
     * lower triangular, row-major, a fresh copy. A density with coordinates c has the clr
     * cᵀT(φ(x) − φ̄), i.e. raw coefficients Tᵀc.
     */
    public double[] basisTransform() {
        return t.clone();
    }

    /** The basis family. */
    public Basis basis() {
        return basis;
    }

    /** Total mass P(I) of the reference measure (b − a for Lebesgue, 1 otherwise). */
    public double referenceMass() {
        return mass;
    }

    /**
     * Lebesgue density of the reference measure at x: 1 for Lebesgue, 1/(b − a) for uniform, the
     * normalised weight otherwise; 0 outside the domain.
     */
    public double referenceDensity(double x) {
        if (!(x >= a && x <= b)) {
            return 0.0;
        }
        return reference.rawWeight(x, a, b) / refNorm;
    }

    /** The neutral element of perturbation (the reference, as a density). */
    public Density neutral() {
        return neutral;
    }

    // ---------------------------------------------------------------- basis evaluation

    /**
     * Values e_1(x)..e_K(x) of the orthonormal basis at x.
     *
     * @throws IllegalArgumentException if x is outside [a, b] or NaN
     */
    public double[] basisAt(double x) {
        double[] out = new double[dim];
        basisAt(x, out, new double[dim]);
        return out;
    }

    void basisAt(double x, double[] out, double[] raw) {
        checkPoint(x);
        basis.evalDense(x, raw);
        for (int i = 0; i < dim; i++) {
            raw[i] -= mbar[i];
        }
        for (int i = 0; i < dim; i++) {
            double s = 0;
            int base = i * dim;
            for (int j = 0; j <= i; j++) {
                s += t[base + j] * raw[j];
            }
            out[i] = s;
        }
    }

    /**
     * Matrix of basis values, row i = (e_1(x_i), …, e_K(x_i)).
     *
     * @param xs points in [a, b] (not modified)
     * @return an xs.length × K matrix
     */
    public DMatrixRMaj basisMatrix(double... xs) {
        DMatrixRMaj m = new DMatrixRMaj(xs.length, dim);
        double[] raw = new double[dim];
        double[] row = new double[dim];
        for (int i = 0; i < xs.length; i++) {
            basisAt(xs[i], row, raw);
            System.arraycopy(row, 0, m.data, i * dim, dim);
        }
        return m;
    }

    /** The transposed basis matrix K × m (row k = e_k at every x), for batch products. */
    double[] basisTransposed(double[] xs) {
        double[] out = new double[dim * xs.length];
        double[] raw = new double[dim];
        double[] row = new double[dim];
        for (int i = 0; i < xs.length; i++) {
            basisAt(xs[i], row, raw);
            for (int k = 0; k < dim; k++) {
                out[k * xs.length + i] = row[k];
            }
        }
        return out;
    }

    void checkPoint(double x) {
        if (!(x >= a && x <= b)) {
            throw new IllegalArgumentException("x = " + x + " is outside the domain [" + a + ", " + b + "]: the clr"
                    + " and the basis are defined on the domain only (pdf, cdf and tail probabilities accept"
                    + " any x but NaN)");
        }
    }

    // ---------------------------------------------------------------- building densities

    /**
     * The density with the given coordinates.
     *
     * @param coordinates K finite values (copied)
     * @throws IllegalArgumentException if the length is not K or a value is NaN or infinite
     */
    public Density density(double... coordinates) {
        Objects.requireNonNull(coordinates, "coordinates");
        if (coordinates.length != dim) {
            throw new IllegalArgumentException("expected " + dim + " coordinates for " + this + ", got "
                    + coordinates.length);
        }
        for (int i = 0; i < dim; i++) {
            if (!Double.isFinite(coordinates[i])) {
                throw new IllegalArgumentException("coordinate " + i + " is not finite: " + coordinates[i]);
            }
        }
        return new Density(this, coordinates.clone(), false);
    }

    /**
     * Projects a density given by its Lebesgue pdf onto the space: the coordinates of the
     * L2(P)-orthogonal projection of its clr. The pdf need not be normalised.
     *
     * @param pdf a function positive and finite on [a, b]
     * @return the projected density and the L2(P) norm of the clr residual
     * @throws IllegalArgumentException if the pdf is not finite or not positive at a quadrature
     *                                  node (negative or zero on a set of positive measure)
     */
    public Projection project(DoubleUnaryOperator pdf) {
        Objects.requireNonNull(pdf, "pdf");
        double[] h = new double[nodes.length];
        for (int i = 0; i < nodes.length; i++) {
            double x = nodes[i];
            double v = pdf.applyAsDouble(x);
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException("pdf is not finite at x = " + x + ": " + v);
            }
            if (!(v > 0)) {
                throw new IllegalArgumentException("pdf must be > 0 on the domain (Bayes-space densities have full"
                        + " support), got " + v + " at x = " + x);
            }
            h[i] = Math.log(v / referenceDensity(x));
        }
        return projectLogNodes(h);
    }

    /**
     * Projects a density given by its log-pdf (Lebesgue, up to an additive constant); use this for
     * sharply peaked densities whose pdf underflows.
     *
     * @throws IllegalArgumentException if the log-pdf is not finite at a quadrature node
     */
    public Projection projectLogPdf(DoubleUnaryOperator logPdf) {
        Objects.requireNonNull(logPdf, "logPdf");
        double[] h = new double[nodes.length];
        for (int i = 0; i < nodes.length; i++) {
            double x = nodes[i];
            double v = logPdf.applyAsDouble(x);
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException("log-pdf is not finite at x = " + x + ": " + v);
            }
            h[i] = v - Math.log(referenceDensity(x));
        }
        return projectLogNodes(h);
    }

    /** Re-expresses a density of another space in this one (projection of its clr). */
    public Projection project(Density other) {
        Objects.requireNonNull(other, "density");
        if (other.space().equals(this)) {
            return new Projection(other, 0.0, 0.0);
        }
        BayesSpace o = other.space();
        if (o.a != a || o.b != b) {
            throw new IllegalArgumentException("cannot project a density on [" + o.a + ", " + o.b
                    + "] onto a space on [" + a + ", " + b + "]");
        }
        return projectLogPdf(other::logPdf);
    }

    private Projection projectLogNodes(double[] h) {
        // scaled by the largest |h| (a power of two, exact) so that log-pdf values near the double
        // limit neither overflow the weighted sums nor the residual's squares
        double big = 0;
        for (double v : h) {
            big = Math.max(big, Math.abs(v));
        }
        double scale = big > 0 ? Math.scalb(1.0, -Math.getExponent(big)) : 1.0;
        int q = nodes.length;
        double[] hs = new double[q];
        for (int i = 0; i < q; i++) {
            hs[i] = h[i] * scale;
        }
        double meanH = 0;
        for (int i = 0; i < q; i++) {
            meanH += weights[i] * hs[i];
        }
        meanH /= mass;
        double[] c = new double[dim];
        for (int k = 0; k < dim; k++) {
            double s = 0;
            int base = k * q;
            for (int i = 0; i < q; i++) {
                s += weights[i] * hs[i] * basisT[base + i];
            }
            c[k] = s;
        }
        double res = 0, tot = 0;
        for (int i = 0; i < q; i++) {
            double fit = 0;
            for (int k = 0; k < dim; k++) {
                fit += c[k] * basisT[k * q + i];
            }
            double hc = hs[i] - meanH;
            double r = hc - fit;
            res += weights[i] * r * r;
            tot += weights[i] * hc * hc;
        }
        double err = Math.sqrt(res) / scale;
        double rel = tot > 0 ? Math.sqrt(res / tot) : 0.0;
        for (int k = 0; k < dim; k++) {
            c[k] /= scale;
            if (!Double.isFinite(c[k])) {
                throw new IllegalArgumentException("the log-pdf reaches " + big + " in magnitude at the quadrature"
                        + " nodes: its coordinate " + k + " in " + this + " is beyond the double range; smaller log-pdf"
                        + " values are accepted");
            }
        }
        if (!Double.isFinite(err)) {
            throw new IllegalArgumentException("the log-pdf reaches " + big + " in magnitude at the quadrature nodes:"
                    + " the norm of its projection residual is beyond the double range; smaller log-pdf values are"
                    + " accepted");
        }
        return new Projection(new Density(this, c, false), err, rel);
    }

    /**
     * Least-squares fit of clr values (or log-pdf values: any additive constant is absorbed) given
     * at points: minimises Σ_i (y_i − c_0 − Σ_k c_k e_k(x_i))².
     *
     * @param xs     at least K + 1 points in [a, b] (not modified)
     * @param values finite values at those points (not modified)
     * @throws IllegalArgumentException on NaN, points outside the domain, mismatched lengths or
     *                                  points that do not determine the K coordinates
     */
    public Density fromClr(double[] xs, double[] values) {
        Objects.requireNonNull(xs, "xs");
        Objects.requireNonNull(values, "values");
        if (xs.length != values.length) {
            throw new IllegalArgumentException("xs has " + xs.length + " points but values has " + values.length);
        }
        if (xs.length < dim + 1) {
            throw new IllegalArgumentException("need at least K + 1 = " + (dim + 1) + " points, got " + xs.length);
        }
        DMatrixRMaj design = new DMatrixRMaj(xs.length, dim + 1);
        DMatrixRMaj y = new DMatrixRMaj(xs.length, 1);
        double[] raw = new double[dim];
        double[] row = new double[dim];
        // values scaled by a power of two (exact) so that values near the double limit do not
        // overflow the solver; the coordinates are scaled back at the end
        double big = 0;
        for (double v : values) {
            big = Math.max(big, Math.abs(v));
        }
        double scale = big > 0 && Double.isFinite(big) ? Math.scalb(1.0, -Math.getExponent(big)) : 1.0;
        for (int i = 0; i < xs.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException("value " + i + " (x = " + xs[i] + ") is not finite: " + values[i]);
            }
            basisAt(xs[i], row, raw);
            design.set(i, 0, 1.0);
            for (int k = 0; k < dim; k++) {
                design.set(i, k + 1, row[k]);
            }
            y.set(i, 0, values[i] * scale);
        }
        // rank check by the singular values (EJML's solver quality shrinks with the dimension and
        // rejected well-posed designs): reciprocal condition number below 1e-10 is rank-deficient
        double[] sv = SingularOps_DDRM.singularValues(design.copy());
        double svMax = 0, svMin = Double.POSITIVE_INFINITY;
        for (double v : sv) {
            svMax = Math.max(svMax, v);
            svMin = Math.min(svMin, v);
        }
        LinearSolverDense<DMatrixRMaj> solver = LinearSolverFactory_DDRM.leastSquaresQrPivot(true, false);
        if (sv.length < dim + 1 || !(svMin > 1e-10 * svMax) || !solver.setA(design)) {
            throw new IllegalArgumentException("the " + xs.length + " points do not determine the " + dim
                    + " coordinates of " + this + " (rank-deficient design, reciprocal condition "
                    + (svMax > 0 ? svMin / svMax : 0.0) + "; spread the points over the domain)");
        }
        DMatrixRMaj sol = new DMatrixRMaj(dim + 1, 1);
        solver.solve(y, sol);
        double[] c = new double[dim];
        for (int k = 0; k < dim; k++) {
            c[k] = sol.data[k + 1] / scale;
            if (!Double.isFinite(c[k])) {
                throw new IllegalArgumentException("the clr values (up to " + big + " in magnitude) give coordinate "
                        + k + " = " + c[k] + ", beyond the double range; smaller values are accepted");
            }
        }
        return new Density(this, c, false);
    }

    /**
     * Density from positive pdf values on a grid (log values fitted by least squares, see
     * {@link #fromClr}).
     *
     * @throws IllegalArgumentException if a value is not finite and positive
     */
    public Density fromGrid(double[] xs, double[] pdfValues) {
        Objects.requireNonNull(xs, "xs");
        Objects.requireNonNull(pdfValues, "pdfValues");
        if (xs.length != pdfValues.length) {
            throw new IllegalArgumentException("xs has " + xs.length + " points but pdfValues has " + pdfValues.length);
        }
        double[] h = new double[xs.length];
        for (int i = 0; i < xs.length; i++) {
            double v = pdfValues[i];
            if (!(v > 0 && Double.isFinite(v))) {
                throw new IllegalArgumentException("pdf value " + i + " at x = " + xs[i]
                        + " must be finite and > 0, got " + v);
            }
            checkPoint(xs[i]);
            h[i] = Math.log(v / referenceDensity(xs[i]));
        }
        return fromClr(xs, h);
    }

    /**
     * ∫ f dP by the space's quadrature.
     *
     * @param f a function finite on [a, b]
     */
    public double integrate(DoubleUnaryOperator f) {
        double s = 0;
        for (int i = 0; i < nodes.length; i++) {
            s += weights[i] * f.applyAsDouble(nodes[i]);
        }
        return s;
    }

    /** Requires that a density belongs to this space. */
    /**
     * Requires {@code other} to be this space (equal domain, reference and basis): the one check
     * for values from different spaces across the library.
     *
     * @param other the space of the argument
     * @param what  names the argument in the message ("density", "response", "predictor 0", …)
     * @throws IllegalArgumentException "&lt;what&gt; lives in &lt;other&gt; but &lt;this&gt; is
     *                                  required; use space.project(density) to move a density into
     *                                  another space"
     */
    public void requireSame(BayesSpace other, String what) {
        if (other != this && !equals(other)) {
            throw new IllegalArgumentException(what + " lives in " + other + " but " + this + " is required; use"
                    + " space.project(density) to move a density into another space");
        }
    }

    // ---------------------------------------------------------------- package-private numerics

    int nodeCount() {
        return nodes.length;
    }

    int panelCount() {
        return panelLo.length;
    }

    int pointsPerPanel() {
        return pts;
    }

    double[] nodesInternal() {
        return nodes;
    }

    double[] weightsInternal() {
        return weights;
    }


    /** Raw-function coefficients b = T'c and offset b·φ̄, so clr(x) = φ(x)·b − offset. */
    double rawCoefficients(double[] c, int off, double[] out) {
        Cholesky.transposeTimes(t, dim, c, off, out);
        double s = 0;
        for (int j = 0; j < dim; j++) {
            s += out[j] * mbar[j];
        }
        return s;
    }

    /**
     * A panel is integrated adaptively when the clr varies by more than this across its nodes: the
     * panel's Gauss–Legendre rule is then no longer accurate to rounding for exp(clr) (an
     * 8-point rule loses about 1e-14 relative accuracy at a log-range of 4, 1e-11 at 6).
     */
    private static final double SHARP_RANGE = 3.0;
    /** A refined panel's own relative error bound (keeps tail probabilities relatively accurate). */
    private static final double PANEL_REL = 1e-11;
    /** A refined panel's error bound relative to the whole normaliser. */
    private static final double TOTAL_REL = 1e-14;
    /** Up to this node range a panel is split into equal sub-panels of range about SUB_RANGE. */
    private static final double FIXED_RANGE = 40.0;
    private static final double SUB_RANGE = 2.5;
    /** Panels whose largest node value is below exp(−60) of the largest overall are not refined (tails down to ~1e-16 keep ~1e-10 relative accuracy). */
    private static final double NEGLIGIBLE = -60.0;
    /**
     * Relative tolerance of the adaptive panel integration; raised to the rounding noise of the
     * integrand, 8 ε |exponent terms|, when the clr is so large that its cancellation dominates.
     */
    private static final double ADAPT_REL = 1e-12;
    private static final double NOISE = 8 * Math.ulp(1.0);
    private static final int ADAPT_DEPTH = 50;
    private static final int ADAPT_BUDGET = 100_000;
    /** Depth limit of the peak search (a panel halved 60 times is below the double spacing). */
    private static final int PEAK_DEPTH = 60;
    /**
     * An adaptive interval is accepted only if the clr varies by at most this across its rule's
     * nodes (the 8-point rule's relative error for exp is then below about 1e-9, see ruleError) ...
     */
    private static final double ACCEPT_RANGE = 8.0;
    /** ... or if it cannot exceed e^−100 of the shift anywhere (below every tail we resolve). */
    private static final double LEAF_NEGLIGIBLE = -100.0;

    /** Computes the shape (normaliser, panel masses) of coordinates c[off..off+K). */
    Shape shape(double[] c, int off, double[] clrNodes) {
        int q = nodes.length;
        if (clrNodes == null) {
            clrNodes = new double[q];
            clrAtNodes(c, off, clrNodes);
        }
        double[] bc = new double[dim];
        double offset = rawCoefficients(c, off, bc);
        int np = panelLo.length;
        double[] sums = new double[np];
        double[][] leaves = new double[np][];
        double[] peak = new double[1];
        double shift = panelSums(clrNodes, 0, bc, offset, sums, leaves, peak);
        double total = 0;
        boolean anySharp = false;
        for (int j = 0; j < np; j++) {
            total += sums[j];
            anySharp |= leaves[j] != null;
        }
        if (!(total > 0)) {
            return pointMass(peak[0], bc, offset);
        }
        double logTotal = Math.log(total);
        double[] mass = new double[np];
        double[] cum = new double[np + 1];
        double[] tail = new double[np + 1];
        for (int j = 0; j < np; j++) {
            mass[j] = sums[j] / total;
            cum[j + 1] = cum[j] + mass[j];
        }
        for (int j = np - 1; j >= 0; j--) {
            tail[j] = tail[j + 1] + mass[j];
        }
        double[][] leafEdges = null, leafCum = null, leafTail = null;
        if (anySharp) {
            leafEdges = new double[np][];
            leafCum = new double[np][];
            leafTail = new double[np][];
            for (int j = 0; j < np; j++) {
                double[] lv = leaves[j];
                if (lv == null) {
                    continue;
                }
                int nl = lv.length / 2; // pairs (lo, unnormalised mass), in order
                double[] e = new double[nl + 1];
                double[] cu = new double[nl + 1];
                double[] ta = new double[nl + 1];
                for (int l = 0; l < nl; l++) {
                    e[l] = lv[2 * l];
                    cu[l + 1] = cu[l] + lv[2 * l + 1] / total;
                }
                e[nl] = panelHi[j];
                for (int l = nl - 1; l >= 0; l--) {
                    ta[l] = ta[l + 1] + lv[2 * l + 1] / total;
                }
                leafEdges[j] = e;
                leafCum[j] = cu;
                leafTail[j] = ta;
            }
        }
        // the mean is not computed here: it costs a second exp pass and most callers (cdf, tail,
        // quantile, pdf) do not need it; see mean(Shape, double[])
        return new Shape(shift, logTotal, mass, cum, tail, leafEdges, leafCum, leafTail, bc, offset, Double.NaN);
    }

    /**
     * The shape of a density whose whole mass lies within the resolution of the adaptive rule
     * (about 1e-17 of a panel) around x: every evaluated point but those next to x underflows.
     * Probabilities, quantiles and moments treat it as a point mass at x; its pdf is not
     * representable (see {@link #pdf(Shape, double, double[])}).
     */
    private Shape pointMass(double x, double[] bc, double offset) {
        int np = panelLo.length;
        int j = panelOf(x);
        double[] mass = new double[np];
        double[] cum = new double[np + 1];
        double[] tail = new double[np + 1];
        mass[j] = 1.0;
        for (int i = 0; i < np; i++) {
            cum[i + 1] = cum[i] + mass[i];
        }
        for (int i = np - 1; i >= 0; i--) {
            tail[i] = tail[i + 1] + mass[i];
        }
        return new Shape(Double.NaN, Double.NaN, mass, cum, tail, null, null, null, bc, offset, x);
    }

    /**
     * Panel integrals exp(−shift) ∫_panel exp(clr) dP into sums, refining sharp panels adaptively
     * (their leaf intervals and masses go to leaves[j] as (lo, mass) pairs when leaves is not
     * null); returns the shift and writes the point of the largest clr value found to peakAt[0]
     * (when peakAt is not null).
     *
     * <p>The shift is the largest clr value at the nodes when no panel is sharp. Otherwise a sharp
     * clr may peak between the nodes far above that value (at a domain end, a knot, or inside a
     * panel), so that exp would overflow: the shift is then the clr's maximum over the sharp panels
     * to within 1, found by {@link #peakSearch} (log-sum-exp with a guaranteed shift: no term of the
     * sums exceeds e times its weight).
     *
     * @throws DensaException if the clr cannot be evaluated accurately enough (see
     *                        {@link #requireResolvable})
     */
    private double panelSums(double[] clrNodes, int off, double[] bc, double offset, double[] sums,
            double[][] leaves, double[] peakAt) {
        requireResolvable(bc, offset);
        int q = nodes.length;
        double max = Double.NEGATIVE_INFINITY;
        int maxAt = 0;
        for (int i = 0; i < q; i++) {
            double v = clrNodes[off + i];
            if (v > max) { // values are finite: plain comparisons are cheaper than Math.max
                max = v;
                maxAt = i;
            }
        }
        if (peakAt != null) {
            peakAt[0] = nodes[maxAt];
        }
        int np = panelLo.length;
        double total = 0;
        boolean any = false;
        for (int j = 0; j < np; j++) {
            double s = 0;
            for (int i = j * pts; i < (j + 1) * pts; i++) {
                s += weights[i] * Math.exp(clrNodes[off + i] - max);
            }
            sums[j] = s;
            total += s;
            any |= logRange(clrNodes, off, j) > SHARP_RANGE;
        }
        if (!any) {
            return max;
        }
        // A sharp clr may peak between the nodes (at a domain end, a knot, or inside a panel) far
        // above their largest value, and exp would overflow: find its maximum over the sharp panels
        // to within 1 first (branch and bound on the Lebesgue bound), and shift by that.
        double[] scratch = new double[basis.scratchSize()];
        double[] best = {max, nodes[maxAt]};
        for (int j = 0; j < np; j++) {
            double range = logRange(clrNodes, off, j);
            if (range > SHARP_RANGE) {
                double top = Double.NEGATIVE_INFINITY;
                for (int i = j * pts; i < (j + 1) * pts; i++) {
                    top = Math.max(top, clrNodes[off + i]);
                }
                if (top + overshoot * range > best[0] + 1) {
                    peakSearch(panelLo[j], panelHi[j], bc, offset, scratch, best, PEAK_DEPTH);
                }
            }
        }
        double shift = best[0];
        if (peakAt != null) {
            peakAt[0] = best[1];
        }
        if (shift > max) {
            double scale = Math.exp(max - shift);
            total = 0;
            for (int j = 0; j < np; j++) {
                sums[j] *= scale;
                total += sums[j];
            }
        }
        Integrand g = new Integrand(bc, offset, shift, 0.0, 0, 0.0);
        for (int j = 0; j < np; j++) {
            double top = Double.NEGATIVE_INFINITY;
            for (int i = j * pts; i < (j + 1) * pts; i++) {
                top = Math.max(top, clrNodes[off + i]);
            }
            double range = logRange(clrNodes, off, j);
            // the clr is a polynomial of degree < pts on the panel: it exceeds its largest node
            // value by at most (Λ − 1)·range/2 (Λ the Lebesgue constant of the nodes)
            if (!(range > SHARP_RANGE && top + overshoot * range - shift > NEGLIGIBLE)) {
                continue;
            }
            // estimated relative error of the panel's rule: matters on its own (tails keep relative
            // accuracy) and as a share of the total (the normaliser)
            double err = ruleError(range);
            if (!(err > PANEL_REL || err * sums[j] > TOTAL_REL * total)) {
                continue;
            }
            g.startLeaves(leaves != null);
            sums[j] = range <= FIXED_RANGE ? g.subdivide(panelLo[j], panelHi[j], (int) Math.ceil(range / SUB_RANGE))
                    : g.integrate(panelLo[j], panelHi[j]);
            if (leaves != null) {
                leaves[j] = g.leaves();
            }
        }
        return shift;
    }

    /**
     * Raises best[0] to the largest clr value on [u, v] (inside one panel) to within 1, with its
     * point in best[1]: the clr at the panel rule's nodes mapped to [u, v] gives its largest node
     * value and, through the Lebesgue constant, a bound on the whole interval; an interval whose
     * bound is within 1 of the best value found is done, others are halved (the half with the
     * larger node values first, so that the best value rises early and prunes the other).
     */
    private void peakSearch(double u, double v, double[] bc, double offset, double[] scratch, double[] best,
            int depth) {
        double h = 0.5 * (v - u), c = 0.5 * (u + v);
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY, at = c;
        for (int i = 0; i < pts; i++) {
            double x = c + h * glx[i];
            double y = basis.combine(x, bc, scratch) - offset;
            lo = Math.min(lo, y);
            if (y > hi) {
                hi = y;
                at = x;
            }
        }
        if (hi > best[0]) {
            best[0] = hi;
            best[1] = at;
        }
        if (depth == 0 || !(hi + overshoot * (hi - lo) > best[0] + 1) || !(v - u > Math.ulp(c))) {
            return;
        }
        if (at < c) {
            peakSearch(u, c, bc, offset, scratch, best, depth - 1);
            peakSearch(c, v, bc, offset, scratch, best, depth - 1);
        } else {
            peakSearch(c, v, bc, offset, scratch, best, depth - 1);
            peakSearch(u, c, bc, offset, scratch, best, depth - 1);
        }
    }

    /**
     * Relative error of an 8-point Gauss–Legendre rule for exp of a function that varies by
     * {@code range} across the rule's nodes, fitted (with margin) to exact integrals of
     * exp(linear): 10^−22.1 (1.05 range)^14.4, e.g. 4e-14 at 4, 2e-11 at 6, 1e-9 at 8.
     */
    /**
     * Variation of the integrand's log across panel j's nodes: the larger of the clr's range and
     * the range of clr + log(reference weight) (either factor alone can make the rule inexact,
     * and their slopes may cancel in the sum).
     */
    private double logRange(double[] clrNodes, int off, int j) {
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        double lw = Double.POSITIVE_INFINITY, hw = Double.NEGATIVE_INFINITY;
        for (int i = j * pts; i < (j + 1) * pts; i++) {
            double v = clrNodes[off + i];
            if (v < lo) {
                lo = v;
            }
            if (v > hi) {
                hi = v;
            }
            if (!flatReference) {
                double w = v + logRefNodes[i];
                lw = Math.min(lw, w);
                hw = Math.max(hw, w);
            }
        }
        if (flatReference) {
            return hi - lo;
        }
        return Math.max(hi - lo, hw - lw);
    }

    private static double ruleError(double range) {
        return Math.pow(10, -22.1) * Math.pow(1.05 * range, 14.4);
    }


    /**
     * log ∫ exp(clr) dP from clr values at the nodes (and the coordinates, for sharp panels), by
     * log-sum-exp, as three numbers written to out[outOff..outOff+3): the shift (largest clr value),
     * log ∫ exp(clr − shift) dP (NaN for a density concentrated below the double resolution), and
     * the point of the largest clr value.
     */
    void logNormaliser(double[] clrNodes, int off, double[] c, int coff, double[] out, int outOff) {
        double[] bc = new double[dim];
        double offset = rawCoefficients(c, coff, bc);
        double[] sums = new double[panelLo.length];
        double[] peak = new double[1];
        double shift = panelSums(clrNodes, off, bc, offset, sums, null, peak);
        double total = 0;
        for (double s : sums) {
            total += s;
        }
        out[outOff] = shift;
        // NaN marks a density concentrated below the double resolution (see concentrated)
        out[outOff + 1] = total > 0 ? Math.log(total) : Double.NaN;
        out[outOff + 2] = peak[0];
    }

    /**
     * Largest rounding error of a clr value accepted for pdf, cdf, quantile and moment
     * evaluation (the pdf is then known to about 1 %).
     */
    static final double MAX_CLR_ERROR = 0.01;

    /**
     * Requires that the clr of raw coefficients bc (and offset) can be evaluated to within
     * {@link #MAX_CLR_ERROR}: its rounding error is at most 8ε (w max_j |b_j| + |offset|), w the
     * number of raw functions that overlap at a point (B-splines and steps are at most 1 and sum
     * to at most 1, Legendre polynomials are at most 1 in absolute value on the domain).
     *
     * @throws DensaException if it cannot
     */
    private void requireResolvable(double[] bc, double offset) {
        double big = 0;
        for (int j = 0; j < dim; j++) {
            big = Math.max(big, Math.abs(bc[j]));
        }
        double error = NOISE * (localWidth * big + Math.abs(offset));
        if (!(error <= MAX_CLR_ERROR)) {
            throw new DensaException("the density's clr reaches about " + String.format("%.3g", localWidth * big
                    + Math.abs(offset)) + " in magnitude, so its rounding error in double precision is about "
                    + String.format("%.3g", error) + ", above the " + MAX_CLR_ERROR + " that pdf, cdf, quantile and"
                    + " moment evaluation accept: coordinates about " + String.format("%.3g", error / MAX_CLR_ERROR)
                    + " times smaller would be evaluated (algebra, norms and distances work at any size)",
                    new EvaluationDiagnostics("clr magnitude", Double.NaN, localWidth * big + Math.abs(offset)));
        }
    }

    /** The failure of pdf-type evaluations for a density concentrated below the double resolution. */
    static DensaException concentrated(double x) {
        return new DensaException("the density is concentrated within the double resolution at x = " + x
                + " (its clr falls by more than 745 within about 1e-17 of the domain there): its pdf is not"
                + " representable; cdf, tail probabilities, quantiles and moments treat it as a point mass at x"
                + " (coordinates of this size are beyond what double precision resolves)",
                new EvaluationDiagnostics("pdf of a point mass", x, Double.POSITIVE_INFINITY));
    }

    /**
     * ∫ (x − center)^power f(x) dx for power 1 (center 0: the mean) or 2, sharp panels summed over
     * their adaptive leaves.
     */
    double moment(Shape sh, double[] clrNodes, int power, double center) {
        int np = panelLo.length;
        Integrand g = sh.leafEdges == null ? null : new Integrand(sh.rawCoef, sh.offset, sh.shift, sh.logTotal, power, center);
        double s = 0;
        for (int j = 0; j < np; j++) {
            double[] e = sh.leafEdges == null ? null : sh.leafEdges[j];
            if (e != null) {
                for (int l = 0; l + 1 < e.length; l++) {
                    s += g.rule(e[l], e[l + 1]);
                }
                continue;
            }
            for (int i = j * pts; i < (j + 1) * pts; i++) {
                double d = nodes[i] - center;
                double f = weights[i] * Math.exp(sh.logRelative(clrNodes[i]));
                s += power == 1 ? f * d : f * d * d;
            }
        }
        return s;
    }

    /** The integrand ref(y) exp(clr(y) − shift) (y − center)^power and its adaptive quadrature. */
    private final class Integrand {
        private final double[] bc;
        private final double offset;
        private final double shift;
        /** Subtracted after the shift: the integrand is ref · exp((clr − shift) − logScale) · (y − center)^power. */
        private final double logScale;
        private final int power;
        private final double center;
        private final double[] scratch;
        private int budget = ADAPT_BUDGET;
        private double[] leafBuf;
        private int leafCount;

        Integrand(double[] bc, double offset, double shift, double logScale, int power, double center) {
            this.bc = bc;
            this.offset = offset;
            this.shift = shift;
            this.logScale = logScale;
            this.power = power;
            this.center = center;
            this.scratch = new double[basis.scratchSize()];
        }

        /** Largest |clr term| seen by the last {@link #rule} call (for the noise level). */
        private double terms;
        /** Smallest and largest clr value at the nodes of the last {@link #rule} call. */
        private double ruleLo;
        private double ruleHi;

        double value(double y) {
            double comb = basis.combine(y, bc, scratch);
            terms = Math.max(terms, Math.abs(comb) + Math.abs(offset) + Math.abs(shift));
            double clr = comb - offset;
            ruleLo = Math.min(ruleLo, clr);
            ruleHi = Math.max(ruleHi, clr);
            double f = referenceDensity(y) * Math.exp((clr - shift) - logScale);
            double d = y - center;
            return power == 0 ? f : power == 1 ? f * d : f * d * d;
        }

        /** The panel's Gauss–Legendre rule mapped to [u, v]. */
        double rule(double u, double v) {
            terms = 0;
            ruleLo = Double.POSITIVE_INFINITY;
            ruleHi = Double.NEGATIVE_INFINITY;
            double h = 0.5 * (v - u), c = 0.5 * (u + v);
            double s = 0;
            for (int i = 0; i < pts; i++) {
                s += glw[i] * value(c + h * glx[i]);
            }
            return h * s;
        }

        /**
         * Whether the last {@link #rule} can be trusted on its own: the clr varied little across its
         * nodes (or no more than its rounding noise), or even the largest value the clr can take
         * between them (the Lebesgue bound) is negligible next to the shift. Without this, an
         * interval whose nodes all underflow would be accepted although a peak lies between them.
         */
        private boolean ruleTrusted() {
            double range = ruleHi - ruleLo;
            return range <= ACCEPT_RANGE + NOISE * terms
                    || ruleHi + overshoot * range - shift < LEAF_NEGLIGIBLE;
        }

        /** Starts a new panel: resets the budget and, if asked, the leaf list. */
        void startLeaves(boolean collect) {
            budget = ADAPT_BUDGET;
            leafCount = 0;
            leafBuf = collect ? new double[64] : null;
        }

        /** The (lo, mass) pairs of the leaves of the last {@link #integrate}, in order. */
        double[] leaves() {
            return Arrays.copyOf(leafBuf, 2 * leafCount);
        }

        /** The rule on {@code count} equal sub-intervals of [u, v], each recorded as a leaf. */
        double subdivide(double u, double v, int count) {
            double sum = 0;
            for (int i = 0; i < count; i++) {
                double lo = u + (v - u) * i / count;
                double hi = i == count - 1 ? v : u + (v - u) * (i + 1) / count;
                double val = rule(lo, hi);
                leaf(lo, val);
                sum += val;
            }
            return sum;
        }

        /** Adaptive bisection until the two halves agree with the whole to ADAPT_REL. */
        double integrate(double u, double v) {
            return refine(u, v, rule(u, v), ADAPT_DEPTH);
        }

        private double refine(double u, double v, double whole, int depth) {
            double m = 0.5 * (u + v);
            double l = rule(u, m);
            double t = terms;
            boolean trusted = ruleTrusted();
            double range = ruleHi - ruleLo;
            double r = rule(m, v);
            trusted &= ruleTrusted();
            range = Math.max(range, ruleHi - ruleLo);
            budget -= 2;
            double both = l + r;
            // the nodes are rounded to the double spacing of x, which moves the integrand by about
            // |clr'| ulp(x) relative: on intervals a few spacings wide that is the accuracy limit
            double spacing = Math.ulp(Math.max(Math.abs(u), Math.abs(v)));
            double rel = Math.max(Math.max(ADAPT_REL, NOISE * Math.max(t, terms)), 8 * range * spacing / (m - u));
            // an interval a few double spacings wide cannot be halved usefully, trusted or not
            boolean atResolution = v - u <= 64 * spacing;
            if (depth == 0 || budget <= 0 || atResolution
                    || trusted && Math.abs(both - whole) <= rel * Math.abs(both)) {
                leaf(u, l);
                leaf(m, r);
                return both;
            }
            return refine(u, m, l, depth - 1) + refine(m, v, r, depth - 1);
        }

        private void leaf(double lo, double value) {
            if (leafBuf == null) {
                return;
            }
            if (2 * leafCount + 2 > leafBuf.length) {
                leafBuf = Arrays.copyOf(leafBuf, 2 * leafBuf.length);
            }
            leafBuf[2 * leafCount] = lo;
            leafBuf[2 * leafCount + 1] = value;
            leafCount++;
        }
    }

    double clrRaw(Shape sh, double x, double[] scratch) {
        return basis.combine(x, sh.rawCoef, scratch) - sh.offset;
    }

    /**
     * Lebesgue pdf at x for a shape: 0 outside the domain.
     *
     * @throws IllegalArgumentException if x is NaN
     * @throws DensaException           if the value exceeds the largest double, or the shape is a
     *                                  point mass below the double resolution
     */
    double pdf(Shape sh, double x, double[] scratch) {
        if (!(x >= a && x <= b)) {
            if (Double.isNaN(x)) {
                throw new IllegalArgumentException("x is NaN; pdf accepts any other x (0 outside the domain ["
                        + a + ", " + b + "])");
            }
            return 0.0;
        }
        if (sh.isPointMass()) {
            throw concentrated(sh.atom);
        }
        double clr = clrRaw(sh, x, scratch);
        double v = referenceDensity(x) * Math.exp(sh.logRelative(clr));
        if (v == Double.POSITIVE_INFINITY) {
            double log = Math.log(referenceDensity(x)) + sh.logRelative(clr);
            if (!(log < MAX_LOG)) {
                throw new DensaException("the pdf at x = " + x + " is e^" + log
                        + ", beyond the largest double; logPdf(x) gives its logarithm",
                        new EvaluationDiagnostics("log pdf", x, log));
            }
            v = Math.exp(log);
        }
        return v;
    }

    /** log of the largest double. */
    private static final double MAX_LOG = Math.log(Double.MAX_VALUE);

    /**
     * Natural log of the Lebesgue pdf at x in [a, b].
     *
     * @throws IllegalArgumentException if x is outside the domain or NaN (the log pdf is −∞ there)
     * @throws DensaException           if the shape is a point mass below the double resolution
     */
    double logPdf(Shape sh, double x, double[] scratch) {
        if (!(x >= a && x <= b)) {
            throw new IllegalArgumentException("logPdf accepts x in the domain [" + a + ", " + b + "] only (the pdf is 0"
                    + " outside it, its log −∞), got x = " + x);
        }
        if (sh.isPointMass()) {
            throw concentrated(sh.atom);
        }
        double ref = referenceDensity(x);
        if (!(ref > 0)) {
            throw new IllegalArgumentException("logPdf at x = " + x + " is −∞: the reference " + reference
                    + " has weight 0 there (the pdf is 0); points where the reference weight is positive are accepted");
        }
        double v = Math.log(ref) + sh.logRelative(clrRaw(sh, x, scratch));
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException("logPdf at x = " + x + " is " + v + ": beyond the double range");
        }
        return v;
    }

    /** The pdf inside the domain, unchecked (may overflow to +∞; used as a Newton slope). */
    private double density(Shape sh, double x, double[] scratch) {
        return referenceDensity(x) * Math.exp(sh.logRelative(clrRaw(sh, x, scratch)));
    }

    int panelOf(double x) {
        int lo = 0, hi = panelLo.length - 1;
        while (lo < hi) {
            int mid = (lo + hi + 1) >>> 1;
            if (panelLo[mid] <= x) {
                lo = mid;
            } else {
                hi = mid - 1;
            }
        }
        return lo;
    }

    /** ∫ pdf over [u, v] by the panel's rule mapped to [u, v]. */
    private double piece(Shape sh, double u, double v, double[] scratch) {
        if (!(v > u)) {
            return 0.0;
        }
        double h = 0.5 * (v - u), c = 0.5 * (u + v);
        double s = 0;
        for (int i = 0; i < pts; i++) {
            double y = c + h * glx[i];
            s += glw[i] * referenceDensity(y) * Math.exp(sh.logRelative(clrRaw(sh, y, scratch)));
        }
        return h * s;
    }

    private static int leafOf(double[] e, double x) {
        int lo = 0, hi = e.length - 2;
        while (lo < hi) {
            int mid = (lo + hi + 1) >>> 1;
            if (e[mid] <= x) {
                lo = mid;
            } else {
                hi = mid - 1;
            }
        }
        return lo;
    }

    /** ∫_{panelLo[j]}^{x} pdf (x in panel j), clamped to the panel mass. */
    double partial(Shape sh, int j, double x, double[] scratch) {
        double[] e = sh.leafEdges == null ? null : sh.leafEdges[j];
        double v;
        if (e == null) {
            v = piece(sh, panelLo[j], x, scratch);
        } else {
            int l = leafOf(e, x);
            v = sh.leafCum[j][l] + Math.min(sh.leafCum[j][l + 1] - sh.leafCum[j][l], piece(sh, e[l], x, scratch));
        }
        return Math.min(sh.mass[j], v);
    }

    /** ∫_{x}^{panelHi[j]} pdf (x in panel j), clamped to the panel mass. */
    double upperPartial(Shape sh, int j, double x, double[] scratch) {
        double[] e = sh.leafEdges == null ? null : sh.leafEdges[j];
        double v;
        if (e == null) {
            v = piece(sh, x, panelHi[j], scratch);
        } else {
            int l = leafOf(e, x);
            v = sh.leafTail[j][l + 1] + Math.min(sh.leafTail[j][l] - sh.leafTail[j][l + 1],
                    piece(sh, x, e[l + 1], scratch));
        }
        return Math.min(sh.mass[j], v);
    }

    /**
     * P(X ≤ x): panel masses to the left plus the partial panel; non-decreasing in x, 0 for
     * x ≤ a and 1 for x ≥ b.
     *
     * @throws IllegalArgumentException if x is NaN
     */
    double cdf(Shape sh, double x, double[] scratch) {
        checkCdfPoint(x);
        if (x <= a) {
            return 0.0;
        }
        if (x >= b) {
            return 1.0;
        }
        if (sh.isPointMass()) {
            return x < sh.atom ? 0.0 : 1.0;
        }
        int j = panelOf(x);
        double v = sh.cum[j] + partial(sh, j, x, scratch);
        return Math.min(1.0, Math.max(0.0, v));
    }

    /**
     * P(X &gt; t), summed from the right (panel masses to the right plus the partial panel) so
     * that small upper tails keep their relative accuracy.
     */
    double tail(Shape sh, double t, double[] scratch) {
        checkThreshold(t);
        if (t <= a) {
            return 1.0;
        }
        if (t >= b) {
            return 0.0;
        }
        if (sh.isPointMass()) {
            return t < sh.atom ? 1.0 : 0.0;
        }
        int j = panelOf(t);
        double v = sh.tail[j + 1] + upperPartial(sh, j, t, scratch);
        return Math.min(1.0, Math.max(0.0, v));
    }

    /**
     * The x with P(X ≤ x) = p. Lower halves solve cdf(x) = p from the left, upper halves solve
     * P(X &gt; x) = 1 − p from the right (1 − p is exact for p ≥ 1/2), so both tails keep relative
     * accuracy; within the panel, safeguarded Newton steps (bisection fallback) down to the double spacing at x.
     */
    double quantile(Shape sh, double p, double[] scratch) {
        checkProbability(p);
        if (p == 0) {
            return a;
        }
        if (p == 1) {
            return b;
        }
        if (sh.isPointMass()) {
            return sh.atom;
        }
        int np = panelLo.length;
        boolean upper = p > 0.5;
        int j;
        double need;
        if (!upper) {
            int lo = 0, hi = np - 1;
            while (lo < hi) { // last panel j with cum[j] < p
                int mid = (lo + hi + 1) >>> 1;
                if (sh.cum[mid] < p) {
                    lo = mid;
                } else {
                    hi = mid - 1;
                }
            }
            j = lo;
            need = Math.min(p - sh.cum[j], sh.mass[j]);
        } else {
            double r = 1 - p;
            int lo = 0, hi = np - 1;
            while (lo < hi) { // first panel j with tail[j + 1] < r
                int mid = (lo + hi) >>> 1;
                if (sh.tail[mid + 1] < r) {
                    hi = mid;
                } else {
                    lo = mid + 1;
                }
            }
            j = lo;
            need = Math.min(r - sh.tail[j + 1], sh.mass[j]);
        }
        double u = panelLo[j], v = panelHi[j];
        double massJ = sh.mass[j];
        double frac = massJ > 0 ? Math.min(1, Math.max(0, need / massJ)) : 0.5;
        double x = upper ? v - (v - u) * frac : u + (v - u) * frac;
        double left = u, right = v;
        // to the double spacing at x: a sharply peaked density needs x to full resolution
        for (int it = 0; it < 200; it++) {
            double tol = Math.ulp(Math.max(Math.abs(left), Math.abs(right)));
            // g increasing in x for both branches
            double g = upper ? need - upperPartial(sh, j, x, scratch) : partial(sh, j, x, scratch) - need;
            if (g > 0) {
                right = x;
            } else {
                left = x;
            }
            double d = density(sh, x, scratch);
            double nx = d > 0 && d < Double.POSITIVE_INFINITY ? x - g / d : Double.NaN;
            if (!(nx > left && nx < right)) {
                nx = 0.5 * (left + right);
            }
            if (Math.abs(nx - x) <= tol || right - left <= tol) {
                x = nx;
                break;
            }
            x = nx;
        }
        return Math.min(b, Math.max(a, x));
    }

    /** Mean ∫ x f(x) dx of a shape, from its clr values at the nodes (within [a, b]). */
    double mean(Shape sh, double[] clrNodes) {
        if (sh.isPointMass()) {
            return sh.atom;
        }
        return Math.min(b, Math.max(a, moment(sh, clrNodes, 1, 0.0)));
    }

    /** Variance ∫ (x − mean)² f(x) dx (≥ 0). */
    double variance(Shape sh, double[] clrNodes) {
        if (sh.isPointMass()) {
            return 0.0;
        }
        return Math.max(0.0, moment(sh, clrNodes, 2, mean(sh, clrNodes)));
    }

    /** Requires a cdf evaluation point that is not NaN (any other x is accepted). */
    void checkCdfPoint(double x) {
        if (Double.isNaN(x)) {
            throw new IllegalArgumentException("x is NaN; cdf accepts any other x, including points outside the"
                    + " domain [" + a + ", " + b + "] (0 below it, 1 above)");
        }
    }

    /** Requires a tail-probability threshold that is not NaN (any other t is accepted). */
    void checkThreshold(double t) {
        if (Double.isNaN(t)) {
            throw new IllegalArgumentException("threshold is NaN; tail probabilities accept any other threshold,"
                    + " including points outside the domain [" + a + ", " + b + "] (1 below it, 0 above)");
        }
    }

    /**
     * Requires a probability in [0, 1] (quantile(0) = a, quantile(1) = b).
     *
     * @throws IllegalArgumentException otherwise, NaN included
     */
    void checkProbability(double p) {
        if (!(p >= 0 && p <= 1)) {
            throw new IllegalArgumentException("probability must be in [0, 1] (0 gives the domain's lower end " + a
                    + ", 1 its upper end " + b + "), got " + p);
        }
    }

    /**
     * clr values of coordinates c[off..off+K) at every quadrature node, evaluated in the local raw
     * basis (b = Tᵀc once, then width-many terms per node: 4 for cubic splines instead of K).
     */
    void clrAtNodes(double[] c, int off, double[] out) {
        int q = nodes.length;
        int w = localWidth;
        double[] bc = new double[dim + w];
        double offset = rawCoefficients(c, off, bc);
        for (int i = 0; i < q; i++) {
            int f = nodeFirst[i];
            int base = i * w;
            double v = 0;
            for (int j = 0; j < w; j++) {
                v += nodeLocal[base + j] * bc[f + j];
            }
            out[i] = v - offset;
        }
    }

    /** Scratch length for {@link #clrRaw}. */
    int scratchSize() {
        return basis.scratchSize();
    }

    // ---------------------------------------------------------------- small dense kernels

    private static double[] identity(int k) {
        double[] m = new double[k * k];
        for (int i = 0; i < k; i++) {
            m[i * k + i] = 1;
        }
        return m;
    }

    /** rows of phi (q × k) mapped by lower-triangular tt: e_i = tt φ_i. */
    private static double[] applyLower(double[] tt, double[] phi, int q, int k) {
        double[] e = new double[q * k];
        for (int r = 0; r < q; r++) {
            for (int i = 0; i < k; i++) {
                double s = 0;
                for (int j = 0; j <= i; j++) {
                    s += tt[i * k + j] * phi[r * k + j];
                }
                e[r * k + i] = s;
            }
        }
        return e;
    }

    private static double[] weightedGram(double[] e, double[] w, int q, int k) {
        double[] g = new double[k * k];
        for (int r = 0; r < q; r++) {
            double wr = w[r];
            for (int i = 0; i < k; i++) {
                double ei = wr * e[r * k + i];
                for (int j = 0; j <= i; j++) {
                    g[i * k + j] += ei * e[r * k + j];
                }
            }
        }
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < i; j++) {
                g[j * k + i] = g[i * k + j];
            }
        }
        return g;
    }

    /** L⁻¹ for the Gram matrix g = L Lᵀ (g is overwritten by L). */
    private static double[] inverseCholeskyFactor(double[] g, int k, Basis basis) {
        // the pivot floor is relative to the function's own squared norm: a narrow domain scales
        // every Gram entry down, which is not degeneracy
        int bad = Cholesky.factor(g, k, k, 1e-14);
        if (bad >= 0) {
            throw new IllegalArgumentException("basis " + basis
                    + " is numerically degenerate on this reference (Gram pivot " + g[bad * k + bad]
                    + " at function " + bad + "); use fewer knots or a lower degree");
        }
        double[] linv = new double[k * k];
        Cholesky.invertLower(g, k, linv);
        return linv;
    }

    private static double[] multiplyLower(double[] x, double[] y, int k) {
        double[] r = new double[k * k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j <= i; j++) {
                double s = 0;
                for (int m = j; m <= i; m++) {
                    s += x[i * k + m] * y[m * k + j];
                }
                r[i * k + j] = s;
            }
        }
        return r;
    }

    // ---------------------------------------------------------------- identity

    @Override
    public boolean equals(Object o) {
        if (this == o) {
            return true;
        }
        if (!(o instanceof BayesSpace)) {
            return false;
        }
        BayesSpace s = (BayesSpace) o;
        return Double.compare(a, s.a) == 0 && Double.compare(b, s.b) == 0 && reference.equals(s.reference)
                && basis.equals(s.basis);
    }

    @Override
    public int hashCode() {
        return Objects.hash(a, b, reference, basis);
    }

    @Override
    public String toString() {
        return "BayesSpace[" + a + ", " + b + "; " + basis + "; reference " + reference + "]";
    }
}
