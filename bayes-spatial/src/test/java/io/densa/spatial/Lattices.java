package io.densa.spatial;

import java.util.ArrayList;
import java.util.List;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Polygon;

/** Lattices built by hand for the weights and autocorrelation tests (test fixtures). */
public final class Lattices {
    private static final GeometryFactory GF = new GeometryFactory();

    private Lattices() {
    }

    /** Rook neighbours of an r × c lattice, units numbered row-wise, built directly from the definition. */
    public static int[][] rookLattice(int rows, int cols) {
        int[][] nb = new int[rows * cols][];
        for (int r = 0; r < rows; r++) {
            for (int c = 0; c < cols; c++) {
                List<Integer> l = new ArrayList<>();
                if (r > 0) {
                    l.add((r - 1) * cols + c);
                }
                if (c > 0) {
                    l.add(r * cols + c - 1);
                }
                if (c < cols - 1) {
                    l.add(r * cols + c + 1);
                }
                if (r < rows - 1) {
                    l.add((r + 1) * cols + c);
                }
                nb[r * cols + c] = l.stream().mapToInt(Integer::intValue).toArray();
            }
        }
        return nb;
    }

    /** Dense binary matrix of neighbour lists. */
    public static double[][] dense(int[][] nb) {
        double[][] w = new double[nb.length][nb.length];
        for (int i = 0; i < nb.length; i++) {
            for (int j : nb[i]) {
                w[i][j] = 1;
            }
        }
        return w;
    }

    /** Axis-aligned rectangle polygon. */
    public static Polygon box(double x0, double y0, double x1, double y1) {
        return GF.createPolygon(new Coordinate[] {new Coordinate(x0, y0), new Coordinate(x1, y0),
            new Coordinate(x1, y1), new Coordinate(x0, y1), new Coordinate(x0, y0)});
    }

    /** r × c lattice of unit squares numbered row-wise, each shrunk (gap &gt; 0) or grown (gap &lt; 0) by gap. */
    public static List<Polygon> squareLattice(int rows, int cols, double gap) {
        List<Polygon> out = new ArrayList<>();
        for (int r = 0; r < rows; r++) {
            for (int c = 0; c < cols; c++) {
                out.add(box(c + gap, r + gap, c + 1 - gap, r + 1 - gap));
            }
        }
        return out;
    }
}
