package io.densa.spatial;

import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.stream.IntStream;
import org.locationtech.jts.geom.Dimension;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.IntersectionMatrix;
import org.locationtech.jts.geom.Location;
import org.locationtech.jts.geom.MultiPolygon;
import org.locationtech.jts.geom.Polygon;
import org.locationtech.jts.index.strtree.STRtree;
import org.locationtech.jts.operation.overlay.snap.GeometrySnapper;

/** The polygon-contiguity builder of {@link SpatialWeights} (package-private). */
final class ContiguityWeights {
    private ContiguityWeights() {
    }

    static SpatialWeights contiguity(List<? extends Geometry> polygons, SpatialWeights.Contiguity rule,
            double tolerance) {
        Objects.requireNonNull(polygons, "polygons");
        Objects.requireNonNull(rule, "rule");
        if (!(tolerance >= 0 && tolerance < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException("contiguity tolerance " + tolerance + " must be finite and >= 0");
        }
        int n = polygons.size();
        WeightsAssembly.checkUnits(n);
        Geometry[] g = new Geometry[n];
        STRtree tree = new STRtree();
        for (int i = 0; i < n; i++) {
            Geometry gi = polygons.get(i);
            if (!(gi instanceof Polygon || gi instanceof MultiPolygon) || gi.isEmpty()) {
                throw new IllegalArgumentException("unit " + i + " is " + (gi == null ? "null"
                        : gi.isEmpty() ? "an empty geometry" : "a " + gi.getGeometryType())
                        + "; contiguity needs a non-empty Polygon or MultiPolygon per unit");
            }
            g[i] = gi;
            Envelope e = new Envelope(gi.getEnvelopeInternal());
            e.expandBy(tolerance);
            tree.insert(e, i);
        }
        tree.build();
        // Each pair is tested once (j > i), then the relation is mirrored.
        int[][] upper = new int[n][];
        IntStream.range(0, n).parallel().forEach(i -> {
            Envelope e = new Envelope(g[i].getEnvelopeInternal());
            e.expandBy(tolerance);
            List<?> cand = tree.query(e);
            int[] found = new int[cand.size()];
            int m = 0;
            for (Object o : cand) {
                int j = (Integer) o;
                if (j > i && contiguous(g[i], g[j], rule, tolerance)) {
                    found[m++] = j;
                }
            }
            upper[i] = Arrays.copyOf(found, m);
        });
        int[] count = new int[n];
        for (int i = 0; i < n; i++) {
            count[i] += upper[i].length;
            for (int j : upper[i]) {
                count[j]++;
            }
        }
        int[][] nb = new int[n][];
        int[] fill = new int[n];
        for (int i = 0; i < n; i++) {
            nb[i] = new int[count[i]];
        }
        for (int i = 0; i < n; i++) {
            for (int j : upper[i]) {
                nb[i][fill[i]++] = j;
                nb[j][fill[j]++] = i;
            }
        }
        double[][] ones = new double[n][];
        for (int i = 0; i < n; i++) {
            ones[i] = new double[nb[i].length];
            Arrays.fill(ones[i], 1.0);
        }
        return WeightsAssembly.assemble(n, nb, ones);
    }

    /** Whether polygons a and b are neighbours under the rule (after snapping when tolerance &gt; 0). */
    private static boolean contiguous(Geometry a, Geometry b, SpatialWeights.Contiguity rule, double tolerance) {
        Geometry ga = a, gb = b;
        if (tolerance > 0) {
            if (a.distance(b) > tolerance) {
                return false;
            }
            Geometry[] s = GeometrySnapper.snap(a, b, tolerance);
            ga = s[0];
            gb = s[1];
        } else if (!a.getEnvelopeInternal().intersects(b.getEnvelopeInternal())) {
            return false;
        }
        IntersectionMatrix im = ga.relate(gb);
        if (rule == SpatialWeights.Contiguity.QUEEN) {
            return im.isIntersects();
        }
        return im.get(Location.BOUNDARY, Location.BOUNDARY) == Dimension.L
                || im.get(Location.INTERIOR, Location.INTERIOR) == Dimension.A;
    }
}
