package io.densa.core.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.junit.jupiter.api.Test;

class GaussLegendreTest {
    /**
     * Nodes and weights against Commons Math's rules, an independent implementation (Golub and
     * Welsch (1969), Calculation of Gauss quadrature rules, Math. Comp. 23, for what the rule is):
     * the rule computed in BigDecimal for n ≤ 12 (to 1e-15; larger n cost seconds each there) and
     * the double-precision rule for every n ≤ 64 (to 1e-14).
     */
    @Test
    void nodesAndWeightsAgreeWithCommonsMathRules() {
        GaussIntegratorFactory factory = new GaussIntegratorFactory();
        for (int n = 1; n <= 64; n++) {
            double[] x = GaussLegendre.nodes(n);
            double[] w = GaussLegendre.weights(n);
            GaussIntegrator rule = factory.legendre(n, -1, 1);
            GaussIntegrator precise = n <= 12 ? factory.legendreHighPrecision(n, -1, 1) : null;
            assertEquals(n, rule.getNumberOfPoints());
            for (int i = 0; i < n; i++) {
                assertEquals(rule.getPoint(i), x[i], 1e-14, "node " + i + " of n = " + n);
                assertEquals(rule.getWeight(i), w[i], 1e-14, "weight " + i + " of n = " + n);
                if (precise != null) {
                    assertEquals(precise.getPoint(i), x[i], 1e-15, "node " + i + " of n = " + n);
                    assertEquals(precise.getWeight(i), w[i], 1e-15, "weight " + i + " of n = " + n);
                }
            }
        }
    }

    /** An n-point rule integrates x^j over [−1, 1] exactly for j ≤ 2n − 1: 2/(j + 1) for even j, 0 for odd j. */
    @Test
    void rulesAreExactToDegreeTwoNMinusOne() {
        for (int n = 1; n <= 20; n++) {
            double[] x = GaussLegendre.nodes(n);
            double[] w = GaussLegendre.weights(n);
            for (int j = 0; j <= 2 * n - 1; j++) {
                double s = 0;
                for (int i = 0; i < n; i++) {
                    s += w[i] * Math.pow(x[i], j);
                }
                assertEquals(j % 2 == 0 ? 2.0 / (j + 1) : 0.0, s, 1e-14, "n = " + n + ", degree " + j);
            }
        }
    }
}
