package io.densa.spatial;

import java.util.ArrayList;
import java.util.List;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Polygon;

/** Fixtures shared by the autocorrelation tests: lattices built by hand, brute-force formulas. */
final class AutocorrelationTestSupport {
    private static final GeometryFactory GF = new GeometryFactory();

    private AutocorrelationTestSupport() {
    }

    /** Rook neighbours of an r × c lattice, units numbered row-wise, built directly from the definition. */
    static int[][] rookLattice(int rows, int cols) {
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
    static double[][] dense(int[][] nb) {
        double[][] w = new double[nb.length][nb.length];
        for (int i = 0; i < nb.length; i++) {
            for (int j : nb[i]) {
                w[i][j] = 1;
            }
        }
        return w;
    }

    /** Moran's I straight from Moran (1950): (n/S0) Σ w_ij z_i z_j / Σ z_i², on a dense matrix. */
    static double moranDense(double[][] w, double[] x) {
        return pairSum(w, x, false);
    }

    /** Geary's c straight from Geary (1954): (n−1) Σ w_ij (x_i − x_j)² / (2 S0 Σ z_i²). */
    static double gearyDense(double[][] w, double[] x) {
        return pairSum(w, x, true);
    }

    private static double pairSum(double[][] w, double[] x, boolean geary) {
        int n = x.length;
        double mean = 0;
        for (double v : x) {
            mean += v;
        }
        mean /= n;
        double num = 0, den = 0, s0 = 0;
        for (int i = 0; i < n; i++) {
            den += (x[i] - mean) * (x[i] - mean);
            for (int j = 0; j < n; j++) {
                num += w[i][j] * (geary ? (x[i] - x[j]) * (x[i] - x[j]) : (x[i] - mean) * (x[j] - mean));
                s0 += w[i][j];
            }
        }
        return geary ? (n - 1) * num / (2 * s0 * den) : n / s0 * num / den;
    }

    /** {mean, variance} of a statistic over seeded draws of n iid N(0, 1) values. */
    static double[] normalSimulation(int n, int draws, long seed, java.util.function.ToDoubleFunction<double[]> stat) {
        java.util.Random rnd = new java.util.Random(seed);
        double s = 0, ss = 0;
        double[] x = new double[n];
        for (int d = 0; d < draws; d++) {
            for (int i = 0; i < n; i++) {
                x[i] = rnd.nextGaussian();
            }
            double v = stat.applyAsDouble(x);
            s += v;
            ss += v * v;
        }
        double mean = s / draws;
        return new double[] {mean, ss / draws - mean * mean};
    }

    /** Calls body for every permutation of a (in place; Heap's algorithm, iterative). */
    static void forEachPermutation(double[] a, java.util.function.Consumer<double[]> body) {
        int n = a.length;
        int[] c = new int[n];
        body.accept(a);
        int i = 0;
        while (i < n) {
            if (c[i] < i) {
                int j = (i % 2 == 0) ? 0 : c[i];
                double t = a[j];
                a[j] = a[i];
                a[i] = t;
                body.accept(a);
                c[i]++;
                i = 0;
            } else {
                c[i] = 0;
                i++;
            }
        }
    }

    /** Axis-aligned rectangle polygon. */
    static Polygon box(double x0, double y0, double x1, double y1) {
        return GF.createPolygon(new Coordinate[] {new Coordinate(x0, y0), new Coordinate(x1, y0),
            new Coordinate(x1, y1), new Coordinate(x0, y1), new Coordinate(x0, y0)});
    }

    /** r × c lattice of unit squares numbered row-wise, each shrunk (gap &gt; 0) or grown (gap &lt; 0) by gap. */
    static List<Polygon> squareLattice(int rows, int cols, double gap) {
        List<Polygon> out = new ArrayList<>();
        for (int r = 0; r < rows; r++) {
            for (int c = 0; c < cols; c++) {
                out.add(box(c + gap, r + gap, c + 1 - gap, r + 1 - gap));
            }
        }
        return out;
    }
}
