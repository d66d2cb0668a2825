package io.densa.core.estimate;

import io.densa.core.BayesSpace;

/**
 * Arithmetic cost of one damped-Newton iteration of {@link PenalizedLikelihoodEstimator} for one
 * unit, counted from the loops (see {@link PenalizedLikelihoodEstimator#newtonCost(double[])}).
 *
 * @param quadratureNodes nodes Q of the bin quadrature
 * @param supportWidth    raw basis functions nonzero at a point (W; the spline order)
 * @param dimension       K
 * @param flops           floating-point operations per iteration
 * @param expCalls        calls of {@code Math.exp} per iteration (Q)
 */
public record NewtonCost(int quadratureNodes, int supportWidth, int dimension, long flops, long expCalls) {

    /**
     * Cost of one Newton iteration of {@link PenalizedLikelihoodEstimator} for one unit with these bin
     * edges, every bin occupied (the upper bound; an empty bin saves its rank-one update), counted
     * from the loops with a multiply and an add as one flop each and one line-search trial per iteration (the usual case near the
     * optimum): per quadrature node 2W (bin moments) + 2W + W(W + 1) (second-moment block, lower
     * triangle) + 2W + 3 (η, weight and sum at the trial point) for W raw functions nonzero at a
     * point; per bin 3R + R(R + 1) (R raw functions touching it); per iteration K²/2 + 4K² (rank-one
     * update and penalty) + K³/3 + 2K² (Cholesky and solve) + 2K; one {@code exp} per node.
     * Multiply flops by the iterations a unit takes (its diagnostics report them) and add the final
     * covariance, about 2.5 K³.
     */
    static NewtonCost of(BayesSpace space, double[] edges, int points) {
        double[] e = EstimationSupport.checkEdges(space, edges);
        BinLayout lay = new BinLayout(space, e, points);
        long w = lay.width;
        long q = lay.nodes;
        long flops = q * (6 * w + w * (w + 1) + 3);
        for (int j = 0; j < lay.bins; j++) {
            long r = lay.binHi[j] - lay.binLo[j];
            flops += 3 * r + r * (r + 1);
        }
        long kk = space.dimension();
        flops += kk * kk / 2 + 4 * kk * kk + kk * kk * kk / 3 + 2 * kk * kk + 2 * kk;
        return new NewtonCost(lay.nodes, lay.width, space.dimension(), flops, q);
    }
}
