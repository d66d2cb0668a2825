package io.densa.examples;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Random;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Point;
import org.locationtech.jts.geom.Polygon;
import org.locationtech.jts.geom.prep.PreparedGeometry;
import org.locationtech.jts.geom.prep.PreparedGeometryFactory;
import org.locationtech.jts.triangulate.VoronoiDiagramBuilder;

/**
 * An invented region: an outline and a partition of it into units (districts), all in planar
 * kilometres of a {@link LocalProjection}. Units are Voronoi cells of random sites clipped to the
 * outline (JTS {@code VoronoiDiagramBuilder}).
 *
 * @param outline    the outline (km)
 * @param units      the units, in index order
 * @param projection the projection that maps the kilometres to longitude and latitude
 */
record Region(Geometry outline, List<Unit> units, LocalProjection projection) {

    /**
     * One unit of the partition.
     *
     * @param index   position in the region's list
     * @param code    invented code, e.g. {@code D007}
     * @param name    invented name
     * @param shape   polygon (km)
     * @param x       site (or centroid) x, km east
     * @param y       site (or centroid) y, km north
     * @param areaKm2 area in square kilometres
     */
    record Unit(int index, String code, String name, Geometry shape, double x, double y, double areaKm2) {
    }

    static final GeometryFactory GEOMETRY = new GeometryFactory();

    int size() {
        return units.size();
    }

    double[] xs() {
        return units.stream().mapToDouble(Unit::x).toArray();
    }

    double[] ys() {
        return units.stream().mapToDouble(Unit::y).toArray();
    }

    /**
     * A smooth star-shaped outline: radius r(θ) = R (1 + Σ a_k cos(kθ + φ_k)) for k = 2..5 with
     * random amplitudes and phases, stretched by {@code aspect} in x.
     */
    static Polygon blobOutline(double radiusKm, double aspect, Random random) {
        double[] amp = new double[6];
        double[] phase = new double[6];
        for (int k = 2; k <= 5; k++) {
            amp[k] = (0.16 / k) * (0.5 + random.nextDouble());
            phase[k] = 2 * Math.PI * random.nextDouble();
        }
        int m = 160;
        Coordinate[] ring = new Coordinate[m + 1];
        for (int i = 0; i < m; i++) {
            double t = 2 * Math.PI * i / m;
            double r = 1;
            for (int k = 2; k <= 5; k++) {
                r += amp[k] * Math.cos(k * t + phase[k]);
            }
            ring[i] = new Coordinate(aspect * radiusKm * r * Math.cos(t), radiusKm * r * Math.sin(t));
        }
        ring[m] = new Coordinate(ring[0]);
        return GEOMETRY.createPolygon(ring);
    }

    /**
     * Random points inside the outline: a share {@code clustered} of them drawn around the given
     * centres (normal, sd {@code spreadKm}), the rest uniform; no two closer than {@code minGapKm}.
     */
    static List<Coordinate> randomSites(Geometry outline, int n, double[][] centres, double spreadKm,
            double clustered, double minGapKm, Random random) {
        PreparedGeometry inside = PreparedGeometryFactory.prepare(outline);
        Envelope env = outline.getEnvelopeInternal();
        List<Coordinate> sites = new ArrayList<>();
        int guard = 0;
        while (sites.size() < n) {
            if (++guard > 200 * n) {
                throw new IllegalStateException("could not place " + n + " sites in the outline");
            }
            double x;
            double y;
            if (centres.length > 0 && random.nextDouble() < clustered) {
                double[] c = centres[random.nextInt(centres.length)];
                x = c[0] + spreadKm * random.nextGaussian();
                y = c[1] + spreadKm * random.nextGaussian();
            } else {
                x = env.getMinX() + env.getWidth() * random.nextDouble();
                y = env.getMinY() + env.getHeight() * random.nextDouble();
            }
            Point p = GEOMETRY.createPoint(new Coordinate(x, y));
            if (!inside.contains(p)) {
                continue;
            }
            boolean tooClose = false;
            for (Coordinate s : sites) {
                if (Math.hypot(s.x - x, s.y - y) < minGapKm) {
                    tooClose = true;
                    break;
                }
            }
            if (!tooClose) {
                sites.add(new Coordinate(x, y));
            }
        }
        return sites;
    }

    /**
     * The Voronoi partition of the sites clipped to the outline. Units are ordered from north-west
     * to south-east (by rows of 10 km) so that codes read roughly like a map.
     */
    static Region voronoi(Geometry outline, List<Coordinate> sites, LocalProjection projection, String codePrefix,
            long nameSeed) {
        VoronoiDiagramBuilder builder = new VoronoiDiagramBuilder();
        builder.setSites(sites);
        Envelope clip = new Envelope(outline.getEnvelopeInternal());
        clip.expandBy(0.2 * Math.max(clip.getWidth(), clip.getHeight()));
        builder.setClipEnvelope(clip);
        Geometry cells = builder.getDiagram(GEOMETRY);
        List<Object[]> raw = new ArrayList<>();
        for (int i = 0; i < cells.getNumGeometries(); i++) {
            Geometry cell = cells.getGeometryN(i);
            Coordinate site = (Coordinate) cell.getUserData();
            Geometry clipped = cell.intersection(outline);
            if (clipped.isEmpty() || clipped.getArea() <= 0) {
                continue;
            }
            raw.add(new Object[] {site, clipped});
        }
        raw.sort(Comparator.<Object[]>comparingDouble(o -> -Math.floor(((Coordinate) o[0]).y / 10.0))
                .thenComparingDouble(o -> ((Coordinate) o[0]).x));
        InventedNames names = new InventedNames(nameSeed);
        List<Unit> units = new ArrayList<>();
        int width = String.valueOf(raw.size()).length();
        for (int i = 0; i < raw.size(); i++) {
            Coordinate site = (Coordinate) raw.get(i)[0];
            Geometry shape = (Geometry) raw.get(i)[1];
            String code = codePrefix + String.format("%0" + Math.max(3, width) + "d", i + 1);
            units.add(new Unit(i, code, names.next(), shape, site.x, site.y, shape.getArea()));
        }
        return new Region(outline, List.copyOf(units), projection);
    }
}
