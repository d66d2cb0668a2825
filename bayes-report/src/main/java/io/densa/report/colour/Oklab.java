package io.densa.report.colour;

import java.awt.Color;

/**
 * Conversions between sRGB and the OKLab perceptual colour space, and colour differences in it.
 *
 * <p>sRGB transfer function after IEC 61966-2-1:1999 (linear part below 0.04045, exponent 2.4).
 * OKLab after Björn Ottosson (2020), "A perceptual color space for image processing", blog post
 * (bottosson.github.io/posts/oklab): linear sRGB → LMS by the matrix M1 below, cube root, then the
 * matrix M2 to (L, a, b). L runs from 0 (black) to 1 (white); a and b are zero on the grey axis.
 * The colour difference ΔE is the Euclidean distance in (L, a, b).
 *
 * <p>Arrays are {@code {L, a, b}} or {@code {r, g, b}} with components in [0, 1]; inputs are not
 * modified. Stateless and thread-safe.
 */
public final class Oklab {
    private Oklab() {
    }

    /** sRGB component (0..1, gamma-encoded) to linear light. */
    static double toLinear(double c) {
        return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
    }

    /** Linear light to gamma-encoded sRGB component. */
    static double fromLinear(double c) {
        return c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055;
    }

    /** Linear sRGB to OKLab. */
    static double[] fromLinearRgb(double[] rgb) {
        double l = 0.4122214708 * rgb[0] + 0.5363325363 * rgb[1] + 0.0514459929 * rgb[2];
        double m = 0.2119034982 * rgb[0] + 0.6806995451 * rgb[1] + 0.1073969566 * rgb[2];
        double s = 0.0883024619 * rgb[0] + 0.2817188376 * rgb[1] + 0.6299787005 * rgb[2];
        double l3 = Math.cbrt(l);
        double m3 = Math.cbrt(m);
        double s3 = Math.cbrt(s);
        return new double[] {
            0.2104542553 * l3 + 0.7936177850 * m3 - 0.0040720468 * s3,
            1.9779984951 * l3 - 2.4285922050 * m3 + 0.4505937099 * s3,
            0.0259040371 * l3 + 0.7827717662 * m3 - 0.8086757660 * s3};
    }

    /** OKLab to linear sRGB (components may fall outside [0, 1] for colours outside the gamut). */
    static double[] toLinearRgb(double[] lab) {
        double l3 = lab[0] + 0.3963377774 * lab[1] + 0.2158037573 * lab[2];
        double m3 = lab[0] - 0.1055613458 * lab[1] - 0.0638541728 * lab[2];
        double s3 = lab[0] - 0.0894841775 * lab[1] - 1.2914855480 * lab[2];
        double l = l3 * l3 * l3;
        double m = m3 * m3 * m3;
        double s = s3 * s3 * s3;
        return new double[] {
            4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s,
            -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s,
            -0.0041960863 * l - 0.7034186147 * m + 1.7076147010 * s};
    }

    /** A Java colour (alpha ignored) to OKLab. */
    public static double[] of(Color c) {
        return fromLinearRgb(new double[] {toLinear(c.getRed() / 255.0), toLinear(c.getGreen() / 255.0),
            toLinear(c.getBlue() / 255.0)});
    }

    /** Whether the OKLab colour lies inside the sRGB gamut (within {@code 1e-9}). */
    static boolean inGamut(double[] lab) {
        double[] rgb = toLinearRgb(lab);
        for (double v : rgb) {
            if (!(v >= -1e-9 && v <= 1 + 1e-9)) {
                return false;
            }
        }
        return true;
    }

    /** OKLab to a Java colour; components are clamped to [0, 1] before encoding. */
    static Color toColor(double[] lab) {
        double[] rgb = toLinearRgb(lab);
        return new Color(channel(rgb[0]), channel(rgb[1]), channel(rgb[2]));
    }

    private static int channel(double linear) {
        double v = fromLinear(Math.max(0, Math.min(1, linear)));
        return (int) Math.round(255 * v);
    }

    /**
     * The colour of lightness L, chroma C and hue h (degrees) in OKLab's polar form, with the chroma
     * reduced (lightness and hue kept) until it lies inside the sRGB gamut.
     */
    static double[] lch(double lightness, double chroma, double hueDegrees) {
        double h = Math.toRadians(hueDegrees);
        double[] lab = {lightness, chroma * Math.cos(h), chroma * Math.sin(h)};
        if (inGamut(lab)) {
            return lab;
        }
        return toGamut(lab);
    }

    /** Reduces the chroma of an OKLab colour by bisection, keeping L and hue, until it fits sRGB. */
    static double[] toGamut(double[] lab) {
        if (inGamut(lab)) {
            return lab.clone();
        }
        double lo = 0;
        double hi = 1;
        for (int it = 0; it < 50; it++) {
            double mid = 0.5 * (lo + hi);
            if (inGamut(new double[] {lab[0], mid * lab[1], mid * lab[2]})) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return new double[] {lab[0], lo * lab[1], lo * lab[2]};
    }

    /** ΔE in OKLab: the Euclidean distance. */
    public static double distance(double[] p, double[] q) {
        double dl = p[0] - q[0];
        double da = p[1] - q[1];
        double db = p[2] - q[2];
        return Math.sqrt(dl * dl + da * da + db * db);
    }

    /** ΔE in OKLab between two Java colours. */
    public static double distance(Color p, Color q) {
        return distance(of(p), of(q));
    }
}
