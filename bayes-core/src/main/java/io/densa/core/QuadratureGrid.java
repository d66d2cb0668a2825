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
    }

    /** The panel that holds x (the first for x below the domain, the last for x above it). */
    int panelOf(double x) {
        return Sorted.lastAtMost(panelLo, 0, panelLo.length - 1, x);
    }
}
