package io.densa.report.colour;

import java.awt.Color;

/**
 * Densa's categorical colours and the neutral colours of its figures.
 *
 * <p>The six categorical colours were chosen in OKLab's polar form (Ottosson 2020, "A perceptual
 * color space for image processing", blog post) with lightnesses spread from 0.38 to 0.86, so that
 * they differ in lightness as well as hue: the tests check that every pair stays at least 0.10
 * apart (ΔE in OKLab) under typical vision and under simulated protanopia, deuteranopia and
 * tritanopia ({@link ColourVision}).
 *
 * <p>Stateless and thread-safe; arrays are returned as copies.
 */
public final class Palette {
    /** Ink blue. */
    public static final Color INK = lch(0.47, 0.13, 258);
    /** Ochre. */
    public static final Color OCHRE = lch(0.78, 0.14, 72);
    /** Brick red. */
    public static final Color BRICK = lch(0.56, 0.16, 32);
    /** Sea teal. */
    public static final Color TEAL = lch(0.66, 0.10, 178);
    /** Plum. */
    public static final Color PLUM = lch(0.38, 0.11, 330);
    /** Pale moss. */
    public static final Color MOSS = lch(0.86, 0.05, 110);

    /** Text and outlines. */
    public static final Color TEXT = new Color(0x23262b);
    /** Secondary text (captions, tick labels). */
    public static final Color MUTED = new Color(0x5b6068);
    /** Observed data points in charts: a dark neutral that reads against every categorical colour. */
    public static final Color DATA = new Color(0x4a4d52);
    /** Grid lines of charts. */
    public static final Color GRID = new Color(0xe3e1dc);
    /** Background of the map area (sea, outside the units). */
    public static final Color MAP_BACKGROUND = new Color(0xf2f4f3);
    /** Units without a value. */
    public static final Color NO_DATA = new Color(0xc9c9c9);
    /** Units of no interest in a category map (e.g. not flagged). */
    public static final Color QUIET = new Color(0xecebe6);

    private static final Color[] CATEGORICAL = {INK, BRICK, TEAL, OCHRE, PLUM, MOSS};

    private Palette() {
    }

    /** The six categorical colours in the order charts use them: ink, brick, teal, ochre, plum, moss. */
    public static Color[] categorical() {
        return CATEGORICAL.clone();
    }

    /** Categorical colour {@code i} (cycling after six). */
    public static Color categorical(int i) {
        return CATEGORICAL[Math.floorMod(i, CATEGORICAL.length)];
    }

    private static Color lch(double l, double c, double h) {
        return Oklab.toColor(Oklab.lch(l, c, h));
    }
}
