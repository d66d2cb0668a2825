package io.densa.core;

import java.util.Objects;
import java.util.function.DoubleUnaryOperator;
import org.ejml.data.DMatrixRMaj;
import io.densa.core.DistributionFunctions.Shape;

/**
 * A Bayes Hilbert space B2(P) of densities on a bounded interval I = [a, b] or on a circle
 * [a, a + P) ({@link #periodicSplines}, {@link #fourier}; see {@link #isPeriodic()}), with reference
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
 * <p>Immutable and thread-safe. Equality compares domain, reference and basis. The quadrature
 * ({@code QuadratureGrid}), the orthonormalisation ({@code OrthonormalBasis}), the projections,
 * the panel integrals and the distribution functions live in package-private classes beside this
 * one; this class holds them and is the only entry point.
 */
public final class BayesSpace {
    private final double a;
    private final double b;
    private final Reference reference;
    private final Basis basis;
    private final int dim;

    private final QuadratureGrid grid;
    private final OrthonormalBasis ob;
    private final PanelIntegration integration;
    private final DistributionFunctions functions;
    private final SpaceProjection projection;
    private final double[] nodes;
    private final double[] weights;
    private final double refNorm;
    private final double mass;
    private final Density neutral;

    private BayesSpace(double a, double b, Reference reference, Basis basis) {
        this.a = a;
        this.b = b;
        this.reference = reference;
        this.basis = basis;
        this.dim = basis.size();
        grid = new QuadratureGrid(a, b, reference, basis);
        nodes = grid.nodes;
        weights = grid.weights;
        refNorm = grid.refNorm;
        mass = grid.mass;
        ob = new OrthonormalBasis(basis, grid);
        integration = new PanelIntegration(this, grid, ob, basis);
        functions = new DistributionFunctions(this, grid, integration);
        projection = new SpaceProjection(this, grid, ob);
        neutral = new Density(this, new double[dim], false);
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
        QuadratureGrid.checkDomain(a, b);
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
        QuadratureGrid.checkDomain(a, b);
        return new BayesSpace(a, b, Reference.lebesgue(), Basis.spline(a, b, order, interiorKnots));
    }

    /**
     * Space spanned by polynomials of degree ≤ {@code degree} (clr functions of degree 1..d),
     * Lebesgue reference; with the Lebesgue reference the basis is the normalised Legendre
     * polynomials. Exponential families with polynomial sufficient statistics (normal,
     * exponential restricted to I) lie exactly in such a space.
     */
    public static BayesSpace polynomials(double a, double b, int degree) {
        QuadratureGrid.checkDomain(a, b);
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
        QuadratureGrid.checkDomain(edges[0], edges[edges.length - 1]);
        Basis basis = Basis.step(edges);
        return new BayesSpace(edges[0], edges[edges.length - 1], Reference.lebesgue(), basis);
    }

    /** Space of step densities on {@code bins} equal bins over [a, b]. */
    public static BayesSpace steps(double a, double b, int bins) {
        QuadratureGrid.checkDomain(a, b);
        if (bins < 2) {
            throw new IllegalArgumentException("steps need at least 2 bins, got " + bins);
        }
        double[] e = new double[bins + 1];
        for (int i = 0; i <= bins; i++) {
            e[i] = i == bins ? b : a + (b - a) * i / bins;
        }
        return new BayesSpace(a, b, Reference.lebesgue(), Basis.step(e));
    }

    /**
     * Space on the circle [start, start + period) spanned by the periodic B-splines of the given order
     * on knotCount equally spaced knots start + j·period/knotCount, Lebesgue reference. The knotCount
     * periodic B-splines sum to 1 (de Boor (1978), A Practical Guide to Splines, Springer), so the clr
     * subspace has dimension K = knotCount − 1. Every function of the space, and so clr, pdf, cdf and
     * the basis, is evaluated at x modulo the period (see {@link #isPeriodic()}); the estimators accept
     * bins that wrap around the cut point {@code start}.
     *
     * @param start     the cut point: the domain is [start, start + period)
     * @param period    the period P &gt; 0
     * @param order     spline order (4 = cubic), 2..12
     * @param knotCount number of knots on the circle, at least max(order, 3)
     */
    public static BayesSpace periodicSplines(double start, double period, int order, int knotCount) {
        double b = start + period;
        QuadratureGrid.checkDomain(start, b);
        return new BayesSpace(start, b, Reference.lebesgue(), Basis.periodicSpline(start, b, order, knotCount));
    }

    /**
     * Periodic splines as {@link #periodicSplines(double, double, int, int)} on the given knots of the
     * circle (K = knots.length − 1).
     *
     * @param knots strictly increasing knots in [start, start + period), the first equal to start, at
     *              least max(order, 3) of them (not modified)
     */
    public static BayesSpace periodicSplines(double start, double period, int order, double[] knots) {
        double b = start + period;
        QuadratureGrid.checkDomain(start, b);
        return new BayesSpace(start, b, Reference.lebesgue(), Basis.periodicSpline(start, b, order, knots));
    }

    /**
     * Space on the circle [start, start + period) spanned by cos(2πj(x − start)/period) and
     * sin(2πj(x − start)/period), j = 1..harmonics (K = 2·harmonics), Lebesgue reference; with it the
     * orthonormal basis is √(2/P) times these functions. The von Mises family, an exponential family
     * with sufficient statistics cos and sin (Mardia &amp; Jupp (2000), Directional Statistics, Wiley),
     * lies exactly in the space with one harmonic. Evaluation wraps modulo the period as in
     * {@link #periodicSplines}.
     *
     * @param harmonics number of harmonics H, 1..200
     */
    public static BayesSpace fourier(double start, double period, int harmonics) {
        double b = start + period;
        QuadratureGrid.checkDomain(start, b);
        return new BayesSpace(start, b, Reference.lebesgue(), Basis.fourier(start, b, harmonics));
    }

    /** The same domain and basis with another reference measure (a new space). */
    public BayesSpace withReference(Reference newReference) {
        Objects.requireNonNull(newReference, "reference");
        return new BayesSpace(a, b, newReference, basis);
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

    /**
     * Whether the domain is a circle: then clr, pdf, log pdf, cdf, tail probabilities and the basis take
     * x modulo the period, {@link Density#cdf} and {@link Density#quantile} measure from the cut point
     * lower() ({@link Density#cdfFrom} from another), and {@link Density#circularMean()} and
     * {@link Density#meanResultantLength()} are defined.
     */
    public boolean isPeriodic() {
        return basis.isPeriodic();
    }

    /**
     * The period P = upper() − lower() of a periodic space.
     *
     * @throws IllegalStateException if the space is not periodic (its width is upper() − lower())
     */
    public double period() {
        if (!isPeriodic()) {
            throw new IllegalStateException(this + " is not periodic: it has no period (its width is upper() − lower() = "
                    + (b - a) + "); periodic spaces come from BayesSpace.periodicSplines or BayesSpace.fourier");
        }
        return b - a;
    }

    /** x on a periodic space's circle, a + ((x − a) mod P) in [a, b) (x itself on a bounded space); finite x only. */
    double wrap(double x) {
        if (basis.isPeriodic() && Double.isInfinite(x)) {
            throw new IllegalArgumentException("x = " + x + " cannot be placed on the circle of " + this
                    + "; finite x are accepted (taken modulo the period " + (b - a) + ")");
        }
        return basis.raw().wrap(x);
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
        return ob.t.clone();
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
     * normalised weight otherwise; 0 outside the domain (taken modulo the period on a periodic space).
     */
    public double referenceDensity(double x) {
        x = wrap(x);
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
     * @throws IllegalArgumentException if x is outside [a, b] or NaN (any finite x on a periodic space)
     */
    public double[] basisAt(double x) {
        double[] out = new double[dim];
        basisAt(x, out, new double[dim]);
        return out;
    }

    void basisAt(double x, double[] out, double[] raw) {
        checkPoint(x);
        ob.valuesAt(x, out, raw);
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

    void checkPoint(double x) {
        if (basis.isPeriodic() && Double.isFinite(x)) {
            return;
        }
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
        return projection.projectFunction(Objects.requireNonNull(pdf, "pdf"), false);
    }

    /**
     * Projects a density given by its log-pdf (Lebesgue, up to an additive constant); use this for
     * sharply peaked densities whose pdf underflows.
     *
     * @throws IllegalArgumentException if the log-pdf is not finite at a quadrature node
     */
    public Projection projectLogPdf(DoubleUnaryOperator logPdf) {
        return projection.projectFunction(Objects.requireNonNull(logPdf, "logPdf"), true);
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
        return projection.fromClr(xs, values);
    }

    /**
     * Density from positive pdf values on a grid (log values fitted by least squares, see
     * {@link #fromClr}).
     *
     * @throws IllegalArgumentException if a value is not finite and positive
     */
    public Density fromGrid(double[] xs, double[] pdfValues) {
        return projection.fromGrid(xs, pdfValues);
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

    double[] nodesInternal() {
        return nodes;
    }

    /** Raw-function coefficients b = T'c and offset b·φ̄, so clr(x) = φ(x)·b − offset. */
    double rawCoefficients(double[] c, int off, double[] out) {
        return ob.rawCoefficients(c, off, out);
    }

    /**
     * clr values of coordinates c[off..off+K) at every quadrature node, evaluated in the local raw
     * basis (b = Tᵀc once, then width-many terms per node: 4 for cubic splines instead of K).
     */
    void clrAtNodes(double[] c, int off, double[] out) {
        ob.clrAtNodes(c, off, out);
    }

    /** Scratch length for evaluations at single points (pdf, cdf, …). */
    int scratchSize() {
        return basis.scratchSize();
    }

    /** Computes the shape (normaliser, panel masses) of coordinates c[off..off+K). */
    Shape shape(double[] c, int off, double[] clrNodes) {
        return integration.shape(c, off, clrNodes);
    }

    /** See {@link PanelIntegration#logNormaliser}. */
    void logNormaliser(double[] clrNodes, int off, double[] c, int coff, double[] out, int outOff) {
        integration.logNormaliser(clrNodes, off, c, coff, out, outOff);
    }

    /** The failure of pdf-type evaluations for a density concentrated below the double resolution. */
    static DensaException concentrated(double x) {
        return PanelIntegration.concentrated(x);
    }

    /** Lebesgue pdf at x for a shape (see {@link DistributionFunctions#pdf}). */
    double pdf(Shape sh, double x, double[] scratch) {
        return functions.pdf(sh, x, scratch);
    }

    /** Natural log of the Lebesgue pdf at x in [a, b] (see {@link DistributionFunctions#logPdf}). */
    double logPdf(Shape sh, double x, double[] scratch) {
        return functions.logPdf(sh, x, scratch);
    }

    /** P(X ≤ x) (see {@link DistributionFunctions#cdf}). */
    double cdf(Shape sh, double x, double[] scratch) {
        return functions.cdf(sh, x, scratch);
    }

    /** P(X &gt; t) (see {@link DistributionFunctions#tail}). */
    double tail(Shape sh, double t, double[] scratch) {
        return functions.tail(sh, t, scratch);
    }

    /** The x with P(X ≤ x) = p (see {@link DistributionFunctions#quantile}). */
    double quantile(Shape sh, double p, double[] scratch) {
        return functions.quantile(sh, p, scratch);
    }

    /** Mean ∫ x f(x) dx of a shape, from its clr values at the nodes (within [a, b]). */
    double mean(Shape sh, double[] clrNodes) {
        return functions.mean(sh, clrNodes);
    }

    /** Variance ∫ (x − mean)² f(x) dx (≥ 0). */
    double variance(Shape sh, double[] clrNodes) {
        return functions.variance(sh, clrNodes);
    }

    /** Trigonometric moments (∫ cos θ f dx, ∫ sin θ f dx), θ = 2π(x − a)/(b − a) (see {@link DistributionFunctions#trigMoments}). */
    double[] trigMoments(Shape sh, double[] clrNodes) {
        return functions.trigMoments(sh, clrNodes);
    }

    /** Requires a cdf point / tail threshold that is not NaN, and a probability in [0, 1] (quantile(0) = a, quantile(1) = b). */
    void checkCdfPoint(double x) {
        functions.checkCdfPoint(x);
    }

    void checkThreshold(double t) {
        functions.checkThreshold(t);
    }

    void checkProbability(double p) {
        functions.checkProbability(p);
    }

    // ---------------------------------------------------------------- identity

    @Override
    public boolean equals(Object o) {
        return this == o || o instanceof BayesSpace s
                && Double.compare(a, s.a) == 0 && Double.compare(b, s.b) == 0 && reference.equals(s.reference)
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
