package io.densa.report.colour;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.Color;
import org.junit.jupiter.api.Test;

/**
 * OKLab conversions, the colour-vision simulations, and Densa's ramps and categorical colours
 * checked for monotone lightness, gamut and distinguishable steps under simulated deficiencies.
 */
class ColourTest {
    /**
     * Smallest OKLab ΔE between adjacent steps of a 9-step ramp. The just-noticeable difference in
     * OKLab is about 0.02 (the value CSS Color Module Level 4 uses for gamut mapping, from memory);
     * 0.05 asks for well over twice that.
     */
    static final double RAMP_STEP = 0.05;
    /** Smallest OKLab ΔE between any two categorical colours (five just-noticeable differences). */
    static final double CATEGORICAL = 0.10;

    @Test
    void oklabOfWhiteBlackAndRed() {
        // Ottosson (2020), "A perceptual color space for image processing": M1 and M2 are normalised
        // so that white has L = 1, a = b = 0 (stated in the post).
        double[] white = Oklab.of(Color.WHITE);
        assertEquals(1.0, white[0], 1e-6);
        assertEquals(0.0, white[1], 1e-6);
        assertEquals(0.0, white[2], 1e-6);
        assertEquals(0.0, Oklab.of(Color.BLACK)[0], 1e-12);
        // sRGB red #ff0000 in OKLab: L 0.62796, a 0.22486, b 0.12585 (from memory, as listed in
        // CSS Color Module Level 4 examples); confirmed below by the round trip through the inverse.
        double[] red = Oklab.of(Color.RED);
        assertEquals(0.62796, red[0], 5e-5);
        assertEquals(0.22486, red[1], 5e-5);
        assertEquals(0.12585, red[2], 5e-5);
    }

    @Test
    void srgbTransferFunctionMatchesIec61966() {
        // IEC 61966-2-1: 0.5 encoded is ((0.5 + 0.055) / 1.055)^2.4 = 0.21404 linear (closed form)
        assertEquals(Math.pow(0.555 / 1.055, 2.4), Oklab.toLinear(0.5), 1e-15);
        assertEquals(0.04045 / 12.92, Oklab.toLinear(0.04045), 1e-15);
        for (int v = 0; v <= 255; v++) {
            assertEquals(v / 255.0, Oklab.fromLinear(Oklab.toLinear(v / 255.0)), 1e-12);
        }
    }

    @Test
    void oklabRoundTripsEverySampledColour() {
        for (int r = 0; r < 256; r += 17) {
            for (int g = 0; g < 256; g += 17) {
                for (int b = 0; b < 256; b += 17) {
                    Color c = new Color(r, g, b);
                    assertEquals(c, Oklab.toColor(Oklab.of(c)), "round trip of " + c);
                }
            }
        }
    }

    @Test
    void simulationsKeepGreysAndMergeRedAndGreen() {
        // Machado, Oliveira and Fernandes (2009): each matrix row sums to one, so greys are unchanged.
        for (ColourVision.Deficiency d : ColourVision.Deficiency.values()) {
            double[] m = d.matrix();
            for (int r = 0; r < 3; r++) {
                assertEquals(1.0, m[3 * r] + m[3 * r + 1] + m[3 * r + 2], 2e-6, d + " row " + r);
            }
            Color grey = new Color(120, 120, 120);
            Color s = ColourVision.simulate(grey, d);
            assertTrue(Math.abs(s.getRed() - 120) <= 1 && Math.abs(s.getGreen() - 120) <= 1
                    && Math.abs(s.getBlue() - 120) <= 1, d + " moved a grey to " + s);
        }
        // red-green dichromats confuse a brick red and an olive green that typical vision tells apart,
        // while readers without blue cones still separate them (common practice: the defining
        // confusion of protanopia and deuteranopia; protanopes also see the red darker, so the pair
        // keeps part of its lightness difference for them)
        Color red = new Color(190, 90, 70);
        Color green = new Color(110, 140, 70);
        double typical = ColourVision.difference(red, green, ColourVision.Deficiency.NONE);
        assertTrue(ColourVision.difference(red, green, ColourVision.Deficiency.DEUTERANOPIA) < 0.2 * typical);
        assertTrue(ColourVision.difference(red, green, ColourVision.Deficiency.PROTANOPIA) < 0.6 * typical);
        assertTrue(ColourVision.difference(red, green, ColourVision.Deficiency.TRITANOPIA) > 0.8 * typical);
    }

    @Test
    void sequentialRampHasFallingLightnessInsideTheGamut() {
        double previous = Double.POSITIVE_INFINITY;
        for (int i = 0; i <= 512; i++) {
            double[] lab = ColourRamp.sequential().lab(i / 512.0);
            assertTrue(lab[0] < previous, "lightness must fall at step " + i);
            assertTrue(Oklab.inGamut(lab), "out of gamut at step " + i);
            previous = lab[0];
        }
        assertTrue(ColourRamp.sequential().lab(0)[0] - ColourRamp.sequential().lab(1)[0] > 0.6,
                "the ramp should span most of the lightness range");
    }

    @Test
    void divergingRampRisesToItsCentreAndFallsAfter() {
        double previous = Double.NEGATIVE_INFINITY;
        for (int i = 0; i <= 256; i++) {
            double[] lab = ColourRamp.diverging().lab(i / 512.0);
            assertTrue(lab[0] > previous, "lightness must rise up to the centre, step " + i);
            assertTrue(Oklab.inGamut(lab));
            previous = lab[0];
        }
        for (int i = 257; i <= 512; i++) {
            double[] lab = ColourRamp.diverging().lab(i / 512.0);
            assertTrue(lab[0] < previous, "lightness must fall after the centre, step " + i);
            previous = lab[0];
        }
        // the centre is close to neutral
        double[] centre = ColourRamp.diverging().lab(0.5);
        assertTrue(Math.hypot(centre[1], centre[2]) < 0.02);
    }

    @Test
    void adjacentRampStepsStayDistinguishableUnderEveryDeficiency() {
        for (ColourRamp ramp : new ColourRamp[] {ColourRamp.sequential(), ColourRamp.diverging()}) {
            Color[] steps = ramp.steps(9);
            for (ColourVision.Deficiency d : ColourVision.Deficiency.values()) {
                for (int i = 0; i + 1 < steps.length; i++) {
                    double e = ColourVision.difference(steps[i], steps[i + 1], d);
                    assertTrue(e >= RAMP_STEP, ramp.name() + " steps " + i + "-" + (i + 1) + " under " + d + ": ΔE "
                            + e);
                }
            }
        }
    }

    @Test
    void categoricalColoursStayApartUnderEveryDeficiency() {
        Color[] c = Palette.categorical();
        assertEquals(6, c.length);
        for (ColourVision.Deficiency d : ColourVision.Deficiency.values()) {
            for (int i = 0; i < c.length; i++) {
                for (int j = i + 1; j < c.length; j++) {
                    double e = ColourVision.difference(c[i], c[j], d);
                    assertTrue(e >= CATEGORICAL, "categorical " + i + " and " + j + " under " + d + ": ΔE " + e);
                }
                assertTrue(ColourVision.difference(c[i], Color.WHITE, d) >= CATEGORICAL,
                        "categorical " + i + " too close to the white background under " + d);
            }
        }
    }

    @Test
    void ownRampsAreCheckedAndNaNIsRefused() {
        ColourRamp r = ColourRamp.of("test", new double[] {0, 1}, new double[][] {{0.9, 0.05, 90}, {0.3, 0.1, 260}});
        assertTrue(Oklab.of(r.colour(0))[0] > Oklab.of(r.colour(1))[0]);
        assertThrows(IllegalArgumentException.class, () -> r.colour(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> ColourRamp.of("bad", new double[] {0, 0.5},
                new double[][] {{0.9, 0.05, 90}, {0.3, 0.1, 260}}));
        assertThrows(IllegalArgumentException.class, () -> ColourRamp.of("bad", new double[] {0, 1},
                new double[][] {{Double.NaN, 0.05, 90}, {0.3, 0.1, 260}}));
    }
}
