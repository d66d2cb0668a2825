package io.densa.core;

import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.SingularOps_DDRM;
import org.ejml.dense.row.factory.LinearSolverFactory_DDRM;
import org.ejml.interfaces.linsol.LinearSolverDense;

/**
 * Projections onto a {@link BayesSpace}: log-pdf values at the quadrature nodes projected in
 * L2(P), and least-squares fits of clr values at points ({@link BayesSpace#project},
 * {@link BayesSpace#fromClr}). Immutable; internal.
 */
final class SpaceProjection {
    private final BayesSpace space;
    private final int dim;
    private final double[] nodes;
    private final double[] weights;
    private final double mass;
    private final double[] basisT;

    SpaceProjection(BayesSpace space, QuadratureGrid grid, OrthonormalBasis ob) {
        this.space = space;
        this.dim = space.dimension();
        this.nodes = grid.nodes;
        this.weights = grid.weights;
        this.mass = grid.mass;
        this.basisT = ob.basisT;
    }

    /** {@link BayesSpace#project(java.util.function.DoubleUnaryOperator)} (log false) and {@link BayesSpace#projectLogPdf} (log true). */
    Projection projectFunction(java.util.function.DoubleUnaryOperator f, boolean log) {
        double[] h = new double[nodes.length];
        for (int i = 0; i < nodes.length; i++) {
            double x = nodes[i];
            double v = f.applyAsDouble(x);
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException((log ? "log-pdf" : "pdf") + " is not finite at x = " + x + ": " + v);
            }
            if (log) {
                h[i] = v - Math.log(space.referenceDensity(x));
                continue;
            }
            if (!(v > 0)) {
                throw new IllegalArgumentException("pdf must be > 0 on the domain (Bayes-space densities have full"
                        + " support), got " + v + " at x = " + x);
            }
            h[i] = Math.log(v / space.referenceDensity(x));
        }
        return projectLogNodes(h);
    }

    /** {@link BayesSpace#fromGrid}. */
    Density fromGrid(double[] xs, double[] pdfValues) {
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
            space.checkPoint(xs[i]);
            h[i] = Math.log(v / space.referenceDensity(xs[i]));
        }
        return fromClr(xs, h);
    }

    Projection projectLogNodes(double[] h) {
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
                        + " nodes: its coordinate " + k + " in " + space + " is beyond the double range; smaller log-pdf"
                        + " values are accepted");
            }
        }
        if (!Double.isFinite(err)) {
            throw new IllegalArgumentException("the log-pdf reaches " + big + " in magnitude at the quadrature nodes:"
                    + " the norm of its projection residual is beyond the double range; smaller log-pdf values are"
                    + " accepted");
        }
        return new Projection(new Density(space, c, false), err, rel);
    }

    Density fromClr(double[] xs, double[] values) {
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
            space.basisAt(xs[i], row, raw);
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
                    + " coordinates of " + space + " (rank-deficient design, reciprocal condition "
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
        return new Density(space, c, false);
    }
}
