package io.densa.report.map;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.report.Fixtures;
import io.densa.report.colour.ColourRamp;
import io.densa.report.colour.ColourScale;
import io.densa.report.colour.Oklab;
import io.densa.report.colour.Palette;
import java.awt.Color;
import java.awt.Rectangle;
import java.awt.image.BufferedImage;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Checks the pixels of rendered maps: legend swatches show the category colours, and the
 * probability scale stays 0–1 whatever the data.
 */
class MapRenderTest {
    static final Fixtures F = new Fixtures(11);

    @Test
    void legendSwatchesShowTheCategoryColoursWithCounts() {
        int[] category = new int[F.frame().size()];
        for (int i = 0; i < category.length; i++) {
            category[i] = i % 3;
        }
        Color[] colours = {Palette.QUIET, Palette.BRICK, Palette.TEAL};
        MapFigure.Drawn d = Maps.categories(F.frame(), category, new String[] {"a", "b", "c"}, colours, "Classes",
                "Categories").draw();
        List<Rectangle> swatches = d.layout().swatches();
        assertEquals(3, swatches.size());
        for (int k = 0; k < 3; k++) {
            Rectangle r = swatches.get(k);
            int rgb = d.image().getRGB((int) r.getCenterX(), (int) r.getCenterY()) & 0xffffff;
            assertEquals(colours[k].getRGB() & 0xffffff, rgb, "swatch " + k);
        }
    }

    /** A wider panel makes a wider figure with the same content scaled; widths outside [200, 3000] are refused. */
    @Test
    void panelWidthSetsTheFigureWidth() {
        ColourScale p = ColourScale.probability("P(X > t)");
        MapFigure base = Maps.grid(F.frame(), F.grid(45, 30, (x, y) -> 0.1 + 0.004 * x), p, "grid");
        int normal = base.draw().image().getWidth();
        int wide = base.withPanelWidth(1200).draw().image().getWidth();
        int narrow = base.withPanelWidth(400).draw().image().getWidth();
        assertTrue(narrow < normal && normal < wide, narrow + " < " + normal + " < " + wide);
        // the panel is most of the figure: its width follows the setting (the legend column is fixed)
        assertEquals(800, wide - narrow, 40.0);
        org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class, () -> base.withPanelWidth(199));
    }

    @Test
    void probabilityScaleIsFixedWhateverTheData() {
        ColourScale p = ColourScale.probability("P(X > t)");
        assertEquals(0, p.lower());
        assertEquals(1, p.upper());
        assertArrayEquals(new String[] {"0", "0.2", "0.4", "0.6", "0.8", "1"}, p.tickLabels());
        MapFigure.Drawn low = Maps.grid(F.frame(), F.grid(45, 30, (x, y) -> 0.1 + 0.004 * x), p, "low").draw();
        MapFigure.Drawn high = Maps.grid(F.frame(), F.grid(45, 30, (x, y) -> 0.6 + 0.008 * x), p, "high").draw();
        Rectangle a = low.layout().colourBar();
        Rectangle b = high.layout().colourBar();
        assertEquals(a, b);
        assertArrayEquals(low.layout().barTicks(), high.layout().barTicks());
        int cx = (int) a.getCenterX();
        for (int yy = a.y + 1; yy < a.y + a.height; yy++) {
            assertEquals(low.image().getRGB(cx, yy), high.image().getRGB(cx, yy), "colour bar row " + yy);
        }
        // the top of the bar is probability 1, the bottom 0, and ticks are evenly spaced
        assertTrue(Oklab.distance(ColourRamp.sequential().colour(1), new Color(low.image().getRGB(cx, a.y + 1)))
                < 0.01, "top of the bar is probability 1");
        assertTrue(Oklab.distance(ColourRamp.sequential().colour(0),
                new Color(low.image().getRGB(cx, a.y + a.height - 2))) < 0.01, "bottom of the bar is probability 0");
        int[] t = low.layout().barTicks();
        for (int i = 2; i < t.length; i++) {
            assertTrue(Math.abs((t[i - 1] - t[i]) - (t[0] - t[1])) <= 1, "ticks evenly spaced");
        }
        // a cell of probability 0.1 + 0.004 · 0.5 ≈ 0.102 keeps its own colour, not the darkest one of a
        // scale stretched to the data
        BufferedImage img = low.image();
        Color expected = p.colour(0.1 + 0.004 * (0.5 * 45.0 / 45));
        Color seen = pixelNear(img, 30, a);
        assertTrue(Oklab.distance(expected, seen) < 0.03, "cell colour " + seen + " against " + expected);
    }

    /** The colour of the first map pixel right of the map's left edge at mid-height. */
    private static Color pixelNear(BufferedImage img, int dx, Rectangle bar) {
        int y = bar.y + bar.height / 2;
        return new Color(img.getRGB(MapCanvas.LEFT + dx, Math.min(y, img.getHeight() / 2)));
    }
}
