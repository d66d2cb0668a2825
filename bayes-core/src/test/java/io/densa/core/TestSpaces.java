package io.densa.core;

import java.util.List;
import java.util.Random;
import java.util.function.DoubleUnaryOperator;
import java.util.stream.Stream;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.params.provider.Arguments;

/** Spaces shared by the parameterised tests, and an integrator independent of the spaces' quadrature. */
final class TestSpaces {
    private TestSpaces() {
    }

    /** One space per basis kind and reference kind (the contract subclasses use the same ones). */
    static List<BayesSpace> all() {
        return List.of(
                BayesSpace.splines(0, 3, 4, new double[] {0.4, 1.1, 1.5, 2.2, 2.7}),
                BayesSpace.splines(-1, 1, 3, 6).withReference(Reference.uniform()),
                BayesSpace.polynomials(-1, 2, 6),
                BayesSpace.steps(0, 0.3, 1, 1.2, 2.5, 4),
                BayesSpace.splines(-2, 2, 4, 6).withReference(Reference.normal(0.3, 0.8)),
                BayesSpace.polynomials(0, 1, 4).withReference(Reference.beta(2, 3)),
                BayesSpace.steps(0, 3, 6).withReference(Reference.weight("exp-decay", x -> Math.exp(-0.7 * x))));
    }

    static Stream<Arguments> spaces() {
        return all().stream().map(s -> Arguments.of(s.toString(), s));
    }

    /** K coordinates uniform in [−r, r]. */
    static double[] randomCoordinates(BayesSpace s, Random rnd, double r) {
        double[] c = new double[s.dimension()];
        for (int i = 0; i < c.length; i++) {
            c[i] = r * (2 * rnd.nextDouble() - 1);
        }
        return c;
    }

    /**
     * ∫_lo^hi f dx by Apache Commons Math's {@link IterativeLegendreGaussIntegrator} (16-point rule,
     * relative accuracy 1e-13, absolute 1e-15), one call per smooth piece between the space's breakpoints, so the
     * integrand is smooth on every call. Independent of the space's own quadrature.
     */
    static double integrate(BayesSpace s, DoubleUnaryOperator f, double lo, double hi) {
        IterativeLegendreGaussIntegrator in = new IterativeLegendreGaussIntegrator(16, 1e-13, 1e-15);
        double[] br = s.basis().breakpoints();
        double sum = 0;
        for (int i = 0; i + 1 < br.length; i++) {
            double u = Math.max(lo, br[i]), v = Math.min(hi, br[i + 1]);
            if (v > u) {
                // the integrator's mapped nodes can round just outside [u, v]: clamp them
                double uu = u, vv = v;
                sum += in.integrate(1_000_000, x -> f.applyAsDouble(Math.min(vv, Math.max(uu, x))), u, v);
            }
        }
        return sum;
    }

    static double integrate(BayesSpace s, DoubleUnaryOperator f) {
        return integrate(s, f, s.lower(), s.upper());
    }

    /** Points spread over the domain, including both ends. */
    static double[] grid(BayesSpace s, int m) {
        double[] xs = new double[m];
        for (int i = 0; i < m; i++) {
            xs[i] = i == m - 1 ? s.upper() : s.lower() + (s.upper() - s.lower()) * i / (m - 1);
        }
        return xs;
    }
}
