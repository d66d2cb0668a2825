package io.densa.report.colour;

import java.awt.Color;
import java.util.Arrays;
import java.util.Locale;
import java.util.Objects;

/**
 * A continuous colour ramp on [0, 1], designed for Densa and computed in the OKLab perceptual
 * colour space (Ottosson 2020, "A perceptual color space for image processing", blog post).
 *
 * <p>A ramp is given by control colours in OKLab's polar form (lightness L, chroma C, hue h in
 * degrees) at increasing positions. Between control points L, C and h are interpolated linearly
 * (hue along the shorter arc), so lightness is piecewise linear in the position: a sequential
 * ramp whose control lightnesses decrease has strictly decreasing lightness, and equal steps of
 * the ramp are close to equal perceived steps. Colours outside the sRGB gamut keep their
 * lightness and hue and lose chroma until they fit. {@link #sequential()} and
 * {@link #diverging()} are checked by the tests for monotone lightness and for distinguishable
 * steps under simulated colour-vision deficiencies ({@link ColourVision}).
 *
 * <p>Immutable and thread-safe; {@link #colour(double)} reads a 1024-entry table built once.
 */
public final class ColourRamp {
    private static final int TABLE = 1024;

    private static final ColourRamp SEQUENTIAL = new ColourRamp("densa sequential",
            new double[] {0, 0.35, 0.7, 1},
            new double[][] {{0.975, 0.030, 92}, {0.80, 0.105, 120}, {0.56, 0.095, 185}, {0.29, 0.085, 272}});
    private static final ColourRamp DIVERGING = new ColourRamp("densa diverging",
            new double[] {0, 0.25, 0.5, 0.75, 1},
            new double[][] {{0.36, 0.100, 245}, {0.67, 0.085, 225}, {0.965, 0.012, 85}, {0.70, 0.110, 55},
                {0.40, 0.125, 30}});

    private final String name;
    private final double[] positions;
    private final double[][] lch;
    private final int[] table;

    private ColourRamp(String name, double[] positions, double[][] lch) {
        this.name = name;
        this.positions = positions;
        this.lch = lch;
        this.table = new int[TABLE];
        for (int i = 0; i < TABLE; i++) {
            table[i] = Oklab.toColor(lab(i / (TABLE - 1.0))).getRGB();
        }
    }

    /**
     * Densa's sequential ramp: from a pale sand (low values) through a soft green and a sea teal to
     * a deep blue ink (high values); OKLab lightness falls from 0.975 to 0.29. For magnitudes and
     * probabilities.
     */
    public static ColourRamp sequential() {
        return SEQUENTIAL;
    }

    /**
     * Densa's diverging ramp: a deep slate blue (low) through a warm near-white centre (0.5) to a
     * deep brick (high); lightness rises monotonically to the centre and falls after it. For signed
     * values around a meaningful zero.
     */
    public static ColourRamp diverging() {
        return DIVERGING;
    }

    /**
     * A ramp of one's own from control colours.
     *
     * @param name      a name for messages
     * @param positions increasing positions from 0 to 1 (first 0, last 1), at least two
     * @param lch       one {L, C, h} per position: L in [0, 1], C ≥ 0, h in degrees
     * @throws IllegalArgumentException if the positions are not increasing from 0 to 1 or a control
     *                                  colour is not finite or out of range
     */
    public static ColourRamp of(String name, double[] positions, double[][] lch) {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(positions, "positions");
        Objects.requireNonNull(lch, "lch");
        if (positions.length < 2 || positions.length != lch.length) {
            throw new IllegalArgumentException("ramp '" + name + "' needs at least two positions and one {L, C, h} "
                    + "per position, got " + positions.length + " positions and " + lch.length + " colours");
        }
        if (positions[0] != 0 || positions[positions.length - 1] != 1) {
            throw new IllegalArgumentException("ramp '" + name + "': positions must run from 0 to 1, got "
                    + Arrays.toString(positions));
        }
        double[][] copy = new double[lch.length][];
        for (int i = 0; i < positions.length; i++) {
            if (i > 0 && !(positions[i] > positions[i - 1])) {
                throw new IllegalArgumentException("ramp '" + name + "': positions must increase, got "
                        + Arrays.toString(positions));
            }
            double[] c = lch[i];
            if (c == null || c.length != 3 || !(c[0] >= 0 && c[0] <= 1) || !(c[1] >= 0 && c[1] <= 0.4)
                    || !Double.isFinite(c[2])) {
                throw new IllegalArgumentException("ramp '" + name + "': control colour " + i + " must be {L in "
                        + "[0, 1], C in [0, 0.4], finite h}, got " + Arrays.toString(c));
            }
            copy[i] = c.clone();
        }
        return new ColourRamp(name, positions.clone(), copy);
    }

    /** The name given to the ramp. */
    public String name() {
        return name;
    }

    /** The OKLab {L, a, b} at position t in [0, 1] (clamped), inside the sRGB gamut. */
    double[] lab(double t) {
        double u = Math.max(0, Math.min(1, t));
        int k = 0;
        while (k < positions.length - 2 && u > positions[k + 1]) {
            k++;
        }
        double f = (u - positions[k]) / (positions[k + 1] - positions[k]);
        double[] p = lch[k];
        double[] q = lch[k + 1];
        double dh = q[2] - p[2];
        dh -= 360 * Math.rint(dh / 360);
        return Oklab.lch(p[0] + f * (q[0] - p[0]), p[1] + f * (q[1] - p[1]), p[2] + f * dh);
    }

    /**
     * The colour at position t.
     *
     * @param t position in [0, 1]; values outside are clamped
     * @throws IllegalArgumentException if t is NaN
     */
    public Color colour(double t) {
        if (Double.isNaN(t)) {
            throw new IllegalArgumentException("ramp '" + name + "': position is NaN");
        }
        double u = Math.max(0, Math.min(1, t));
        return new Color(table[(int) Math.round(u * (TABLE - 1))]);
    }

    /** {@code n ≥ 2} colours at equal steps from 0 to 1. */
    public Color[] steps(int n) {
        if (n < 2) {
            throw new IllegalArgumentException("ramp '" + name + "': need at least 2 steps, got " + n);
        }
        Color[] out = new Color[n];
        for (int i = 0; i < n; i++) {
            out[i] = colour(i / (n - 1.0));
        }
        return out;
    }

    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder("ColourRamp[").append(name);
        for (Color c : steps(5)) {
            sb.append(String.format(Locale.ROOT, " #%06x", c.getRGB() & 0xffffff));
        }
        return sb.append(']').toString();
    }
}
