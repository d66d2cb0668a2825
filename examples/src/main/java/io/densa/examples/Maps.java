package io.densa.examples;

import java.awt.Color;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.locationtech.jts.geom.Geometry;

/** Ready-made maps of a {@link Region}: choropleths with a colour bar and category maps. */
final class Maps {
    static final Color FLAG = new Color(0xd7301f);
    static final Color NO_FLAG = new Color(0xe9e9e9);
    static final Color TRUTH_ONLY = new Color(0xfdae6b);
    static final Color FALSE_ALARM = new Color(0x6a51a3);

    private Maps() {
    }

    static List<Geometry> shapes(Region region) {
        List<Geometry> out = new ArrayList<>();
        for (Region.Unit u : region.units()) {
            out.add(u.shape());
        }
        return out;
    }

    static String caption(Region region) {
        return "Invented data. Drawn in planar km: " + region.projection().describe() + ".";
    }

    /** Choropleth of one value per unit with a colour bar. */
    static void choropleth(Region region, double[] values, ColourScale scale, int digits, String title, Path file) {
        Color[] fills = new Color[values.length];
        for (int i = 0; i < values.length; i++) {
            fills[i] = scale.colour(values[i]);
        }
        new MapPainter(region.outline().getEnvelopeInternal(), 760, title, caption(region))
                .fill(shapes(region), fills, new Color(255, 255, 255, 160), 0.6f)
                .stroke(List.of(region.outline()), Color.DARK_GRAY, 1.5f)
                .colourBar(scale, digits).scaleBar().save(file);
    }

    /** Category map: each unit coloured by its category index. */
    static void categories(Region region, int[] category, String[] labels, Color[] colours, String heading,
            String title, Path file) {
        Color[] fills = new Color[category.length];
        for (int i = 0; i < category.length; i++) {
            fills[i] = colours[category[i]];
        }
        new MapPainter(region.outline().getEnvelopeInternal(), 760, title, caption(region))
                .fill(shapes(region), fills, new Color(0x999999), 0.6f)
                .stroke(List.of(region.outline()), Color.DARK_GRAY, 1.5f)
                .legend(heading, labels, colours).scaleBar().save(file);
    }
}
