package io.densa.core;

import io.densa.core.internal.GaussLegendre;
import io.densa.core.internal.Sorted;

/**
 * The quadrature of a {@link BayesSpace}: composite Gauss–Legendre panels that never straddle a
 * breakpoint of the basis (at least 64 of them for splines and polynomials, with at least as many
 * points per panel as the spline order), their nodes and the reference measure's weights there
 * (see the class description of {@link BayesSpace}). Immutable; internal.
 */
final class QuadratureGrid {
    private static final int MIN_PANELS = 64;
    private static final int POINTS = 8;

    final int pts;
    /** (Λ − 1)/2, Λ the Lebesgue constant of the panel rule's nodes: see {@link PanelIntegration}. */
    final double overshoot;
    final double[] glx;
    final double[] glw;
    final double[] panelLo;
    final double[] panelHi;
    final double[] nodes;
    final double[] weights;
    /** Normaliser of a weighted reference's raw weight (1 for flat references). */
    final double refNorm;
    /** Total mass P(I) of the reference measure. */
    final double mass;
    /** log of the reference weight at each node (0 for flat references): part of the integrand's log-range. */
    final double[] logRefNodes;
    final boolean flatReference;

    QuadratureGrid(double a, double b, Reference reference, Basis basis) {
        double[] breaks = basis.breakpoints();
        int spans = breaks.length - 1;
        int perSpan;
        if (basis.kind() == Basis.Kind.STEP && reference.isFlat()) {
            pts = 2;
            perSpan = 1;
        } else {
            Basis.Kind kind = basis.kind();
            int minPts = kind == Basis.Kind.SPLINE || kind == Basis.Kind.PERIODIC_SPLINE ? basis.order()
                    : kind == Basis.Kind.POLYNOMIAL ? basis.order() + 1 : 1;
            pts = Math.max(POINTS, minPts);
            // Fourier: 16 panels per period of the highest harmonic (8 per period of a product of two
            // basis functions), so that each 8-point panel rule integrates such products to rounding
            int minPanels = kind == Basis.Kind.FOURIER ? Math.max(MIN_PANELS, 16 * basis.order()) : MIN_PANELS;
            perSpan = (minPanels + spans - 1) / spans;
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
    }

    /** The panel that holds x (the first for x below the domain, the last for x above it). */
    int panelOf(double x) {
        return Sorted.lastAtMost(panelLo, 0, panelLo.length - 1, x);
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

    static void checkDomain(double a, double b) {
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
}
