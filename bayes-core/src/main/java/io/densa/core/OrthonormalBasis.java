package io.densa.core;

import io.densa.core.internal.Cholesky;

/**
 * The orthonormal basis of a {@link BayesSpace}: its raw functions centred against the reference
 * and orthonormalised in L2(P) by two passes of a Cholesky factorisation of their Gram matrix,
 * e = T (φ − φ̄) with T lower triangular, with the basis values at the quadrature nodes (dense,
 * and in the local raw basis). Immutable; internal.
 */
final class OrthonormalBasis {
    private final Basis basis;
    private final int dim;
    /** K×K lower triangular, row-major. */
    final double[] t;
    /** Means φ̄ of the raw functions under the reference (K). */
    final double[] mbar;
    /** K×Q row-major: e_k(x_q). */
    final double[] basisT;
    /** Local raw-basis table at the nodes: node q uses raw functions nodeFirst[q] + i, i &lt; width. */
    final int[] nodeFirst;
    final double[] nodeLocal;
    final int localWidth;

    OrthonormalBasis(Basis basis, QuadratureGrid grid) {
        this.basis = basis;
        this.dim = basis.size();
        double[] nodes = grid.nodes;
        double[] weights = grid.weights;
        double mass = grid.mass;
        int q = nodes.length;
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
    }

    /** e(x) = T (φ(x) − φ̄) into out, with raw as scratch (x not checked). */
    void valuesAt(double x, double[] out, double[] raw) {
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
     * clr values of coordinates c[off..off+K) at every quadrature node, evaluated in the local raw
     * basis (b = Tᵀc once, then width-many terms per node: 4 for cubic splines instead of K).
     */
    void clrAtNodes(double[] c, int off, double[] out) {
        int q = nodeFirst.length;
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
}
