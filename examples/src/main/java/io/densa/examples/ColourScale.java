package io.densa.examples;

import java.awt.Color;

/**
 * A continuous colour scale from {@code min} to {@code max}: piecewise-linear interpolation
 * between anchor colours. {@link #sequential} uses the anchors of the viridis palette (van der
 * Walt and Smith, matplotlib colormaps, 2015, CC0), which is perceptually uniform and readable in
 * grey scale; {@link #diverging} the red–blue palette of ColorBrewer (Brewer, colorbrewer2.org).
 *
 * @param min     value at the first anchor
 * @param max     value at the last anchor
 * @param anchors anchor colours, evenly spaced
 * @param label   what the colours show, with unit
 */
record ColourScale(double min, double max, Color[] anchors, String label) {
    private static final Color[] VIRIDIS = hex("440154", "482878", "3e4989", "31688e", "26828e", "1f9e89",
            "35b779", "6ece58", "b5de2b", "fde725");
    private static final Color[] RED_BLUE = hex("2166ac", "67a9cf", "d1e5f0", "f7f7f7", "fddbc7", "ef8a62",
            "b2182b");

    ColourScale {
        if (!(max > min)) {
            max = min + 1;
        }
    }

    static ColourScale sequential(double min, double max, String label) {
        return new ColourScale(min, max, VIRIDIS, label);
    }

    /** Symmetric diverging scale around zero. */
    static ColourScale diverging(double absMax, String label) {
        double m = absMax > 0 ? absMax : 1;
        return new ColourScale(-m, m, RED_BLUE, label);
    }

    /** Sequential scale from the finite range of the values. */
    static ColourScale of(double[] values, String label) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double v : values) {
            if (Double.isFinite(v)) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
            }
        }
        if (!Double.isFinite(lo)) {
            lo = 0;
            hi = 1;
        }
        return sequential(lo, hi, label);
    }

    Color colour(double v) {
        if (!Double.isFinite(v)) {
            return new Color(200, 200, 200);
        }
        double t = (v - min) / (max - min);
        t = Math.max(0, Math.min(1, t)) * (anchors.length - 1);
        int i = Math.min((int) Math.floor(t), anchors.length - 2);
        double f = t - i;
        Color a = anchors[i];
        Color b = anchors[i + 1];
        return new Color((int) Math.round(a.getRed() + f * (b.getRed() - a.getRed())),
                (int) Math.round(a.getGreen() + f * (b.getGreen() - a.getGreen())),
                (int) Math.round(a.getBlue() + f * (b.getBlue() - a.getBlue())));
    }

    int rgb(double v) {
        return colour(v).getRGB();
    }

    private static Color[] hex(String... codes) {
        Color[] out = new Color[codes.length];
        for (int i = 0; i < codes.length; i++) {
            out[i] = new Color(Integer.parseInt(codes[i], 16));
        }
        return out;
    }
}
