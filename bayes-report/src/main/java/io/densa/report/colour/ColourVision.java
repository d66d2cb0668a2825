package io.densa.report.colour;

import java.awt.Color;

/**
 * Simulated colour-vision deficiencies, to check that the ramps and the categorical set stay
 * readable for readers with the common dichromacies.
 *
 * <p>Each deficiency is a 3 × 3 matrix applied to linear sRGB, the severity-1.0 matrices of
 * Machado, Oliveira and Fernandes (2009), "A physiologically-based model for simulation of color
 * vision deficiency", IEEE Transactions on Visualization and Computer Graphics 15(6), 1291–1298
 * (values from memory; each row sums to one, so greys map to themselves, which the tests check).
 * The result is clamped to [0, 1].
 *
 * <p>Stateless and thread-safe.
 */
public final class ColourVision {
    private ColourVision() {
    }

    /** A type of colour vision. */
    public enum Deficiency {
        /** Typical trichromatic vision: colours are returned unchanged. */
        NONE(new double[] {1, 0, 0, 0, 1, 0, 0, 0, 1}),
        /** No long-wavelength (red) cones. */
        PROTANOPIA(new double[] {0.152286, 1.052583, -0.204868, 0.114503, 0.786281, 0.099216, -0.003882,
            -0.048116, 1.051998}),
        /** No medium-wavelength (green) cones. */
        DEUTERANOPIA(new double[] {0.367322, 0.860646, -0.227968, 0.280085, 0.672501, 0.047413, -0.011820,
            0.042940, 0.968881}),
        /** No short-wavelength (blue) cones. */
        TRITANOPIA(new double[] {1.255528, -0.076749, -0.178779, -0.078411, 0.930809, 0.147602, 0.004733,
            0.691367, 0.303900});

        private final double[] matrix;

        Deficiency(double[] matrix) {
            this.matrix = matrix;
        }

        /** The row-major 3 × 3 matrix on linear sRGB (a copy). */
        public double[] matrix() {
            return matrix.clone();
        }
    }

    /**
     * How a colour looks to a reader with the given deficiency.
     *
     * @param colour     the colour (alpha is kept)
     * @param deficiency the simulated vision
     * @return the simulated colour
     */
    public static Color simulate(Color colour, Deficiency deficiency) {
        if (deficiency == Deficiency.NONE) {
            return colour;
        }
        double[] lin = {Oklab.toLinear(colour.getRed() / 255.0), Oklab.toLinear(colour.getGreen() / 255.0),
            Oklab.toLinear(colour.getBlue() / 255.0)};
        double[] m = deficiency.matrix;
        int[] out = new int[3];
        for (int r = 0; r < 3; r++) {
            double v = m[3 * r] * lin[0] + m[3 * r + 1] * lin[1] + m[3 * r + 2] * lin[2];
            out[r] = (int) Math.round(255 * Oklab.fromLinear(Math.max(0, Math.min(1, v))));
        }
        return new Color(out[0], out[1], out[2], colour.getAlpha());
    }

    /**
     * The colour difference ΔE in OKLab (Ottosson 2020) between two colours as a reader with the
     * given deficiency sees them.
     */
    public static double difference(Color a, Color b, Deficiency deficiency) {
        return Oklab.distance(simulate(a, deficiency), simulate(b, deficiency));
    }
}
