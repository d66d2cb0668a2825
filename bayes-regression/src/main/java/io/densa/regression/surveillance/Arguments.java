package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;

/** Argument checks of the surveillance classes (package-private). */
final class Arguments {
    private Arguments() {
    }

    /** Copies of grid points, each checked to be finite. */
    static double[] grid(double[] xs, String name) {
        if (xs == null || xs.length == 0) {
            throw new IllegalArgumentException(name + " must contain at least one point");
        }
        for (int i = 0; i < xs.length; i++) {
            if (!Double.isFinite(xs[i])) {
                throw new IllegalArgumentException(name + "[" + i + "] is not finite: " + xs[i]);
            }
        }
        return xs.clone();
    }

    /**
     * Copies of evaluation points, each checked to be finite and inside the space's domain
     * (naming the offending index).
     */
    static double[] grid(BayesSpace space, double[] xs, String name) {
        double[] g = grid(xs, name);
        for (int i = 0; i < g.length; i++) {
            if (!(g[i] >= space.lower() && g[i] <= space.upper())) {
                throw new IllegalArgumentException(name + "[" + i + "] = " + g[i] + " is outside the domain ["
                        + space.lower() + ", " + space.upper() + "]; evaluation points must lie in the domain");
            }
        }
        return g;
    }
}
