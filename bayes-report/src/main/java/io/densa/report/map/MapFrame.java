package io.densa.report.map;

import java.util.List;
import java.util.Objects;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;

/**
 * What every map of a study shares: the units' polygons and an outline, in planar coordinates
 * whose length unit the scale bar uses, and a caption line (data source, projection).
 *
 * <p>Coordinates must be planar (projected), x to the east and y to the north, in
 * {@code lengthUnit}: the scale bar measures them as they are. Longitude/latitude degrees would
 * give a wrong scale bar; project them first.
 *
 * @param units      one polygon (or multipolygon) per unit, in the order of the values mapped; may be
 *                   empty for maps of grids and points
 * @param outline    the outline of the study area (drawn on top; sets the map's extent)
 * @param lengthUnit unit of the coordinates, e.g. "km"
 * @param caption    a line under the map, e.g. "Drawn in planar km: …"
 */
public record MapFrame(List<Geometry> units, Geometry outline, String lengthUnit, String caption) {
    /** Checks and copies. */
    public MapFrame {
        units = List.copyOf(Objects.requireNonNull(units, "units"));
        Objects.requireNonNull(outline, "outline");
        Objects.requireNonNull(lengthUnit, "lengthUnit");
        Objects.requireNonNull(caption, "caption");
        if (outline.isEmpty()) {
            throw new IllegalArgumentException("map outline is empty");
        }
        Envelope e = outline.getEnvelopeInternal();
        if (!(e.getWidth() > 0 && e.getHeight() > 0)) {
            throw new IllegalArgumentException("map outline has no area: " + e);
        }
        for (int i = 0; i < units.size(); i++) {
            if (units.get(i) == null || units.get(i).isEmpty()) {
                throw new IllegalArgumentException("unit " + i + " of the map has no geometry");
            }
        }
    }

    /** A frame in kilometres. */
    public static MapFrame km(List<? extends Geometry> units, Geometry outline, String caption) {
        return new MapFrame(List.copyOf(units), outline, "km", caption);
    }

    /** Number of units. */
    public int size() {
        return units.size();
    }

    void checkLength(int length, String what) {
        if (length != units.size()) {
            throw new IllegalArgumentException(what + " has " + length + " values for " + units.size()
                    + " units of the map");
        }
    }
}
