package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import io.densa.core.internal.GaussLegendre;
import io.densa.core.internal.Kernels;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.TreeSet;

/**
 * Gauss–Legendre nodes over the domain with log-weights and the band of each node, and the band
 * probabilities of a density from its log-density values at the nodes. Immutable.
 */
final class BandQuadrature {
    private static final int NODES_PER_PIECE = 5;
    private static final int PIECES = 8;

    final double[] x;
    final double[] logWeight;
    final int[] band;
    final int bands;

    private BandQuadrature(double[] x, double[] logWeight, int[] band, int bands) {
        this.x = x;
        this.logWeight = logWeight;
        this.band = band;
        this.bands = bands;
    }

    /**
     * Nodes over the bands' span: the domain [a, b] of a bounded space; on a circle the period from
     * the first band edge, which may start anywhere (a band may wrap around the cut point; the
     * space evaluates positions modulo the period, and the breakpoints are continued around it).
     */
    static BandQuadrature of(BayesSpace space, double[] bandEdges) {
        boolean circle = space.isPeriodic();
        double a = circle ? bandEdges[0] : space.lower();
        double b = circle ? bandEdges[bandEdges.length - 1] : space.upper();
        TreeSet<Double> cuts = new TreeSet<>();
        for (double t : space.basis().breakpoints()) {
            if (circle) {
                for (int turn = -1; turn <= 1; turn++) {
                    double s = t + turn * space.period();
                    if (s > a && s < b) {
                        cuts.add(s);
                    }
                }
            } else {
                cuts.add(t);
            }
        }
        for (double t : bandEdges) {
            cuts.add(Math.max(a, Math.min(b, t)));
        }
        cuts.add(a);
        cuts.add(b);
        double[] gx = GaussLegendre.nodes(NODES_PER_PIECE);
        double[] gw = GaussLegendre.weights(NODES_PER_PIECE);
        double maxWidth = (b - a) / PIECES;
        List<double[]> nodes = new ArrayList<>();
        Double prev = null;
        for (double c : cuts) {
            if (prev != null && c > prev) {
                int pieces = (int) Math.ceil((c - prev) / maxWidth - 1e-9);
                double w = (c - prev) / pieces;
                for (int p = 0; p < pieces; p++) {
                    double l = prev + p * w;
                    double mid = l + w / 2;
                    for (int g = 0; g < gx.length; g++) {
                        double xx = Math.min(c, Math.max(prev, mid + w / 2 * gx[g]));
                        double weight = gw[g] * w / 2 * space.referenceDensity(xx);
                        nodes.add(new double[] {xx, weight, mid});
                    }
                }
            }
            prev = c;
        }
        int m = nodes.size();
        double[] x = new double[m];
        double[] lw = new double[m];
        int[] bandOf = new int[m];
        int nb = bandEdges.length - 1;
        for (int q = 0; q < m; q++) {
            double[] node = nodes.get(q);
            x[q] = node[0];
            lw[q] = node[1] > 0 ? Math.log(node[1]) : Double.NEGATIVE_INFINITY;
            int t = 0;
            while (t < nb - 1 && node[2] >= bandEdges[t + 1]) {
                t++;
            }
            bandOf[q] = t;
        }
        return new BandQuadrature(x, lw, bandOf, nb);
    }

    /** out[t] = Σ_{q in band t} exp(v_q + log w_q) / Σ_q exp(v_q + log w_q), by a shifted sum. */
    void bandProbabilities(double[] v, double[] out) {
        double max = Double.NEGATIVE_INFINITY;
        for (int q = 0; q < v.length; q++) {
            max = Math.max(max, v[q] + logWeight[q]);
        }
        Arrays.fill(out, 0, bands, 0.0);
        double total = 0;
        for (int q = 0; q < v.length; q++) {
            double e = expNonPositive(v[q] + logWeight[q] - max);
            out[band[q]] += e;
            total += e;
        }
        for (int t = 0; t < bands; t++) {
            out[t] /= total;
        }
    }

    /**
     * {@link #bandProbabilities(double[], double[])} of n draws at once: draw d has log-density
     * values v_q = base_q + Σ_c f[c·nq + q] z[c][d] at the nodes (f: K rows of nq values), and its
     * band probabilities go to out[t][d]. The arithmetic of each draw is that of the one-draw
     * method in the same order, except the exponential: {@code Kernels.expFast}, within 3·10⁻¹⁰ relative
     * of the exact one (band probabilities to the same relative accuracy). The work is node by
     * node in loops over the draws, each over whole rows indexed from 0 (v[q][d], z[c][d]): JDK
     * 17's vectoriser handles those, not loops whose arrays carry different offsets (measured
     * about five times slower). v is nq rows, shift and total one row, of at least n values.
     */
    void bandProbabilities(double[] base, double[] f, int k, double[][] z, int n, double[][] v, double[] shift,
            double[] total, double[][] out) {
        int nq = x.length;
        java.util.Arrays.fill(shift, 0, n, Double.NEGATIVE_INFINITY);
        for (int q = 0; q < nq; q++) {
            double[] vq = v[q];
            java.util.Arrays.fill(vq, 0, n, base[q]);
            for (int c = 0; c < k; c++) {
                double fq = f[c * nq + q];
                double[] zc = z[c];
                for (int d = 0; d < n; d++) {
                    vq[d] += fq * zc[d];
                }
            }
            double lw = logWeight[q];
            for (int d = 0; d < n; d++) {
                vq[d] = vq[d] + lw;
            }
            for (int d = 0; d < n; d++) {
                shift[d] = vq[d] > shift[d] ? vq[d] : shift[d];
            }
        }
        for (int t = 0; t < bands; t++) {
            java.util.Arrays.fill(out[t], 0, n, 0.0);
        }
        java.util.Arrays.fill(total, 0, n, 0.0);
        for (int q = 0; q < nq; q++) {
            double[] vq = v[q];
            double[] ob = out[band[q]];
            for (int d = 0; d < n; d++) {
                vq[d] = Kernels.expFast(vq[d] - shift[d]);
            }
            for (int d = 0; d < n; d++) {
                ob[d] += vq[d];
            }
            for (int d = 0; d < n; d++) {
                total[d] += vq[d];
            }
        }
        for (int t = 0; t < bands; t++) {
            double[] ob = out[t];
            for (int d = 0; d < n; d++) {
                ob[d] /= total[d];
            }
        }
    }

    /**
     * Band probabilities of the density with coordinates c: ∫_B f for each band (Lebesgue density
     * f = exp(clr) · reference density, normalised).
     *
     * @param space      the space
     * @param coordinates K coordinates (not modified)
     * @param bandEdges  strictly increasing, inside the domain, first and last at its ends
     */
    static double[] bandProbabilities(BayesSpace space, double[] coordinates, double[] bandEdges) {
        BandQuadrature quad = BandQuadrature.of(space, bandEdges.clone());
        double[] phi = space.basisMatrix(quad.x).data;
        int k = space.dimension();
        double[] v = new double[quad.x.length];
        for (int q = 0; q < v.length; q++) {
            for (int c = 0; c < k; c++) {
                v[q] += phi[q * k + c] * coordinates[c];
            }
        }
        double[] out = new double[bandEdges.length - 1];
        quad.bandProbabilities(v, out);
        return out;
    }

    private static final double LOG2E = 1.4426950408889634;
    private static final double LN2_HI = 0.6931471803691238; // ln 2 split in two parts (Cody & Waite 1980, from memory)
    private static final double LN2_LO = 1.9082149292705877e-10;

    /**
     * exp(y) for y ≤ 0 to about 1e-14 relative (values below e^−700 are returned as e^−700's order of
     * magnitude, negligible against the largest term 1 of the sums that use it): y = k ln 2 + r with
     * k = rint(y / ln 2) and |r| ≤ ln 2 / 2 (Cody–Waite reduction), exp(r) by its Taylor polynomial of
     * degree 12 (remainder below (ln 2 / 2)^13 / 13! ≈ 2e-16), times 2^k built from the exponent bits.
     * About three times faster than {@link Math#exp} in the bootstrap's inner loop, where exponentials
     * dominate.
     */
    static double expNonPositive(double y) {
        double x = Math.max(y, -700);
        double k = Math.rint(x * LOG2E);
        double r = (x - k * LN2_HI) - k * LN2_LO;
        double p = 1.0 / 479001600;
        p = p * r + 1.0 / 39916800;
        p = p * r + 1.0 / 3628800;
        p = p * r + 1.0 / 362880;
        p = p * r + 1.0 / 40320;
        p = p * r + 1.0 / 5040;
        p = p * r + 1.0 / 720;
        p = p * r + 1.0 / 120;
        p = p * r + 1.0 / 24;
        p = p * r + 1.0 / 6;
        p = p * r + 0.5;
        p = p * r + 1.0;
        p = p * r + 1.0;
        return p * Double.longBitsToDouble(((long) k + 1023) << 52);
    }
}
