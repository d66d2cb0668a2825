package io.densa.core.estimate;

import io.densa.core.BayesSpace;
import io.densa.core.internal.GaussLegendre;
import io.densa.core.internal.RawBasis;

/**
 * Quadrature of a space's raw basis over a set of bins, prepared once and shared by every unit
 * with those bin edges. Internal.
 *
 * <p>Each bin [e_j, e_{j+1}] is cut at the basis breakpoints inside it and further into pieces no
 * wider than (b − a)/64; each piece carries an m-point Gauss–Legendre rule (m given, or, when 0
 * is given, 3 points for pieces at most (b − a)/200 wide and 4 otherwise: for a log-density whose
 * derivatives are of order 1/s, the 3-point rule's relative error on such a piece is of order
 * (η/(400 s))⁶, below 10⁻¹⁰ for s ≥ η/40). For node q the layout
 * stores the weight w_q = (GL weight) × (Lebesgue density of the reference P at x_q), so that
 * Σ_{q ∈ bin j} w_q exp(η(x_q)) ≈ ∫_{bin j} exp(η) dP, and the W = support-width raw basis values
 * that may be nonzero at x_q with the index of the first (local support of B-splines). Raw index
 * K (the basis function the space drops) is a sink: its coefficient is held at 0.
 */
final class BinLayout {
    private static final int MAX_PIECE_FRACTION = 64;

    final int bins;
    final int nodes;
    final int width;
    final int k;
    final double[] edges;
    final int[] binStart; // bins + 1
    final double[] weight; // nodes
    final double[] x; // nodes
    final int[] first; // nodes
    final double[] vals; // nodes × width
    final int[] binLo; // first raw index touched by bin j
    final int[] binHi; // one past the last raw index touched by bin j

    /**
     * @param space  the space
     * @param edges  validated edges inside [a, b], strictly increasing, at least 2
     * @param points Gauss–Legendre points per piece, or 0 for automatic
     */
    BinLayout(BayesSpace space, double[] edges, int points) {
        RawBasis basis = EstimationSupport.rawBasis(space.basis());
        this.edges = edges.clone();
        this.bins = edges.length - 1;
        this.k = space.dimension();
        this.width = basis.supportWidth();
        double narrow = (space.upper() - space.lower()) / 200;
        double[][] gxs = new double[17][];
        double[][] gws = new double[17][];
        for (int m = 2; m <= 16; m++) {
            gxs[m] = GaussLegendre.nodes(m);
            gws[m] = GaussLegendre.weights(m);
        }
        double[] br = basis.knotsView();
        double maxPiece = (space.upper() - space.lower()) / MAX_PIECE_FRACTION;
        // count pieces
        int total = 0;
        double[] cuts = new double[br.length + 2];
        for (int j = 0; j < bins; j++) {
            int nc = cutsOf(edges[j], edges[j + 1], br, cuts);
            int pc = 0;
            for (int c = 0; c + 1 < nc; c++) {
                int sub = Math.max(1, (int) Math.ceil((cuts[c + 1] - cuts[c]) / maxPiece - 1e-9));
                pc += sub * pointsFor((cuts[c + 1] - cuts[c]) / sub, points, narrow);
            }
            total += pc;
        }
        nodes = total;
        binStart = new int[bins + 1];
        weight = new double[nodes];
        x = new double[nodes];
        first = new int[nodes];
        vals = new double[nodes * width];
        binLo = new int[bins];
        binHi = new int[bins];
        double[] scratch = new double[basis.scratchSize()];
        int q = 0;
        for (int j = 0; j < bins; j++) {
            binStart[j] = q;
            int nc = cutsOf(edges[j], edges[j + 1], br, cuts);
            int lo = Integer.MAX_VALUE, hi = 0;
            for (int c = 0; c + 1 < nc; c++) {
                double u = cuts[c], v = cuts[c + 1];
                int sub = Math.max(1, (int) Math.ceil((v - u) / maxPiece - 1e-9));
                for (int s = 0; s < sub; s++) {
                    double pu = s == 0 ? u : u + (v - u) * s / sub;
                    double pv = s == sub - 1 ? v : u + (v - u) * (s + 1) / sub;
                    double h = 0.5 * (pv - pu), mid = 0.5 * (pu + pv);
                    int m = pointsFor((v - u) / sub, points, narrow);
                    double[] gx = gxs[m], gw = gws[m];
                    for (int i = 0; i < m; i++) {
                        double xq = mid + h * gx[i];
                        x[q] = xq;
                        weight[q] = h * gw[i] * space.referenceDensity(xq);
                        int f = basis.evalLocal(xq, scratch);
                        first[q] = f;
                        for (int w = 0; w < width; w++) {
                            vals[q * width + w] = f + w < k ? scratch[w] : 0.0;
                        }
                        lo = Math.min(lo, f);
                        hi = Math.max(hi, Math.min(f + width, k + 1));
                        q++;
                    }
                }
            }
            binLo[j] = lo;
            binHi[j] = hi;
        }
        binStart[bins] = q;
    }

    private static int pointsFor(double width, int points, double narrow) {
        return points > 0 ? points : width <= narrow ? 3 : 4;
    }

    /** Breakpoints of the basis strictly inside (u, v), with u and v, into cuts; returns count. */
    private static int cutsOf(double u, double v, double[] br, double[] cuts) {
        int n = 0;
        cuts[n++] = u;
        for (double t : br) {
            if (t > u && t < v) {
                cuts[n++] = t;
            }
        }
        cuts[n++] = v;
        return n;
    }
}
