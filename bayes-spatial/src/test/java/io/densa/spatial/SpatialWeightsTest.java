package io.densa.spatial;

import static io.densa.spatial.Lattices.box;
import static io.densa.spatial.Lattices.rookLattice;
import static io.densa.spatial.Lattices.squareLattice;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.locationtech.jts.geom.Polygon;

class SpatialWeightsTest {
    private static final int[] CORNERS = {0, 2, 6, 8};
    private static final int[] EDGES = {1, 3, 5, 7};

    @Test
    void constantsOfTheRookGrid() {
        // Cliff & Ord (1981), Spatial Processes (from memory): S0 = Σ w_ij, S1 = ½ Σ (w_ij + w_ji)²,
        // S2 = Σ (w_i. + w_.i)². By hand for the 3 x 3 rook grid with binary weights: 4 corners of
        // degree 2, 4 edge cells of degree 3 and the centre of degree 4 give S0 = 8 + 12 + 4 = 24
        // ordered links; symmetric binary weights give S1 = ½ · 24 · 2² = 48 and
        // S2 = Σ (2 deg_i)² = 4 (4·4 + 4·9 + 16) = 272.
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        assertEquals(24, w.s0(), 0);
        assertEquals(48, w.s1(), 0);
        assertEquals(272, w.s2(), 0);
        assertTrue(w.isSymmetric());
        assertEquals(24, w.linkCount());
        assertFalse(w.hasIslands());
    }

    @Test
    void constantsOfAsymmetricWeightsFollowTheirDefinition() {
        // Cliff & Ord (1981, from memory): S1 = ½ Σ (w_ij + w_ji)², S2 = Σ (w_i. + w_.i)², by
        // brute force on the dense matrix of row-standardised (asymmetric) weights.
        Random rnd = new Random(1);
        double[][] m = new double[12][12];
        for (int i = 0; i < 12; i++) {
            for (int j = 0; j < 12; j++) {
                if (i != j && rnd.nextDouble() < 0.3) {
                    m[i][j] = rnd.nextDouble() * 3;
                }
            }
            m[i][(i + 1) % 12] = 1.5;
        }
        for (SpatialWeights w : List.of(SpatialWeights.fromMatrix(m), SpatialWeights.fromMatrix(m).rowStandardised())) {
            double[][] d = w.toMatrix();
            double s0 = 0, s1 = 0, s2 = 0;
            for (int i = 0; i < 12; i++) {
                double row = 0, col = 0;
                for (int j = 0; j < 12; j++) {
                    s0 += d[i][j];
                    s1 += 0.5 * (d[i][j] + d[j][i]) * (d[i][j] + d[j][i]);
                    row += d[i][j];
                    col += d[j][i];
                }
                s2 += (row + col) * (row + col);
            }
            assertEquals(s0, w.s0(), 1e-12);
            assertEquals(s1, w.s1(), 1e-12);
            assertEquals(s2, w.s2(), 1e-11);
            assertFalse(w.isSymmetric());
        }
        double[][] back = SpatialWeights.fromMatrix(m).toMatrix();
        for (int i = 0; i < 12; i++) {
            assertArrayEquals(m[i], back[i], 0);
        }
    }

    @Test
    void rowStandardisationAndIslands() {
        int[][] nb = {{1, 2}, {0}, {0}, {}};
        SpatialWeights w = SpatialWeights.fromNeighbours(nb);
        assertArrayEquals(new int[] {3}, w.islands());
        SpatialWeights r = w.rowStandardised();
        assertTrue(r.isRowStandardised());
        assertEquals(0.5, r.weight(0, 1), 0);
        assertEquals(1.0, r.weight(1, 0), 0);
        assertEquals(0.0, r.rowSum(3), 0);
        assertEquals(3, r.s0(), 1e-15); // n minus the island
        assertArrayEquals(new int[] {3}, r.islands());
        assertArrayEquals(new double[] {1.5, 1, 1, 0}, w.spatialLag(new double[] {1, 1, 0.5, 9}), 0);
    }

    @Test
    void rookAndQueenNeighbourCountsOnASquareLattice() {
        // Common practice: on a 3 x 3 lattice of squares rook gives corner 2, edge 3, centre 4
        // neighbours; queen gives 3, 5, 8.
        List<Polygon> cells = squareLattice(3, 3, 0);
        SpatialWeights rook = SpatialWeights.contiguity(cells, SpatialWeights.Contiguity.ROOK, 0);
        SpatialWeights queen = SpatialWeights.contiguity(cells, SpatialWeights.Contiguity.QUEEN, 0);
        assertCounts(rook, 2, 3, 4);
        assertCounts(queen, 3, 5, 8);
        // Rook contiguity equals the lattice neighbours built by hand.
        int[][] byHand = rookLattice(3, 3);
        for (int i = 0; i < 9; i++) {
            int[] expected = byHand[i].clone();
            Arrays.sort(expected);
            assertArrayEquals(expected, rook.neighbours(i));
        }
        assertTrue(rook.isSymmetric() && queen.isSymmetric());
    }

    @Test
    void contiguityToleratesTinyGapsAndOverlaps() {
        for (double gap : new double[] {1e-7, -1e-7}) {
            List<Polygon> cells = squareLattice(3, 3, gap);
            assertCounts(SpatialWeights.contiguity(cells, SpatialWeights.Contiguity.ROOK, 1e-6), 2, 3, 4);
            assertCounts(SpatialWeights.contiguity(cells, SpatialWeights.Contiguity.QUEEN, 1e-6), 3, 5, 8);
        }
        // Without tolerance the gaps separate every cell.
        SpatialWeights exact = SpatialWeights.contiguity(squareLattice(3, 3, 1e-7), SpatialWeights.Contiguity.QUEEN, 0);
        assertEquals(9, exact.islands().length);
    }

    @Test
    void rookContiguityAcrossATJunction() {
        // A wide cell on top of two squares: it shares an edge with each although the junction
        // vertex (1, 1) is not one of its vertices; the squares share their vertical edge.
        List<Polygon> cells = List.of(box(0, 1, 2, 2), box(0, 0, 1, 1), box(1, 0, 2, 1));
        for (double tol : new double[] {0, 1e-6}) {
            SpatialWeights rook = SpatialWeights.contiguity(cells, SpatialWeights.Contiguity.ROOK, tol);
            assertArrayEquals(new int[] {1, 2}, rook.neighbours(0));
            assertArrayEquals(new int[] {0, 2}, rook.neighbours(1));
        }
        List<Polygon> shifted = List.of(box(0, 1 + 1e-8, 2, 2), box(0, 0, 1, 1), box(1 + 1e-8, 0, 2, 1));
        SpatialWeights rook = SpatialWeights.contiguity(shifted, SpatialWeights.Contiguity.ROOK, 1e-6);
        assertArrayEquals(new int[] {1, 2}, rook.neighbours(0));
        assertArrayEquals(new int[] {0, 2}, rook.neighbours(1));
    }

    @Test
    void multiPolygonUnits() {
        // Unit 0 is two separate squares (a multipolygon) on both sides of unit 1 in a 1 x 3 strip;
        // unit 2 is the square above unit 1.
        org.locationtech.jts.geom.GeometryFactory gf = new org.locationtech.jts.geom.GeometryFactory();
        org.locationtech.jts.geom.Geometry split = gf.createMultiPolygon(new Polygon[] {box(0, 0, 1, 1),
            box(2, 0, 3, 1)});
        List<org.locationtech.jts.geom.Geometry> units = List.of(split, box(1, 0, 2, 1), box(1, 1, 2, 2));
        SpatialWeights rook = SpatialWeights.contiguity(units, SpatialWeights.Contiguity.ROOK, 0);
        SpatialWeights queen = SpatialWeights.contiguity(units, SpatialWeights.Contiguity.QUEEN, 0);
        assertArrayEquals(new int[] {0, 2}, rook.neighbours(1));
        assertArrayEquals(new int[] {1}, rook.neighbours(0));
        assertArrayEquals(new int[] {1, 2}, queen.neighbours(0)); // corners (1, 1) and (2, 1)
    }

    @Test
    void nearestNeighboursMatchBruteForceAndSymmetrise() {
        Random rnd = new Random(17);
        int n = 150, k = 6;
        double[][] xy = new double[n][2];
        for (double[] p : xy) {
            p[0] = rnd.nextDouble() * 100;
            p[1] = rnd.nextDouble() * 50;
        }
        Locations loc = Locations.planar(xy);
        SpatialWeights directed = SpatialWeights.nearestNeighbours(loc, k, SpatialWeights.Symmetry.DIRECTED);
        boolean[][] rel = new boolean[n][n];
        for (int i = 0; i < n; i++) {
            final int ii = i;
            Integer[] order = new Integer[n];
            Arrays.setAll(order, j -> j);
            Arrays.sort(order, (a, b) -> Double.compare(Math.hypot(xy[ii][0] - xy[a][0], xy[ii][1] - xy[a][1]),
                    Math.hypot(xy[ii][0] - xy[b][0], xy[ii][1] - xy[b][1])));
            int[] expected = new int[k];
            for (int a = 0; a < k; a++) {
                expected[a] = order[a + 1]; // order[0] is the unit itself
                rel[i][expected[a]] = true;
            }
            Arrays.sort(expected);
            assertArrayEquals(expected, directed.neighbours(i), "unit " + i);
        }
        SpatialWeights union = SpatialWeights.nearestNeighbours(loc, k, SpatialWeights.Symmetry.UNION);
        SpatialWeights mutual = SpatialWeights.nearestNeighbours(loc, k, SpatialWeights.Symmetry.MUTUAL);
        assertFalse(directed.isSymmetric());
        assertTrue(union.isSymmetric());
        assertTrue(mutual.isSymmetric());
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                assertEquals(rel[i][j] || rel[j][i] ? 1.0 : 0.0, union.weight(i, j));
                assertEquals(rel[i][j] && rel[j][i] ? 1.0 : 0.0, mutual.weight(i, j));
            }
            assertTrue(union.neighbourCount(i) >= k);
            assertTrue(mutual.neighbourCount(i) <= k);
        }
    }

    @Test
    void nearestNeighbourTiesAreBrokenByIndex() {
        double[][] xy = new double[9][];
        for (int i = 0; i < 9; i++) {
            xy[i] = new double[] {i % 3, i / 3};
        }
        SpatialWeights w = SpatialWeights.nearestNeighbours(Locations.planar(xy), 4, SpatialWeights.Symmetry.DIRECTED);
        assertArrayEquals(new int[] {1, 3, 5, 7}, w.neighbours(4));
        // Corner 0: 1 and 3 at distance 1, 4 at √2, then 2 and 6 tie at 2: the smaller index wins.
        assertArrayEquals(new int[] {1, 2, 3, 4}, w.neighbours(0));
    }

    @Test
    void geographicNeighboursUseGreatCircleDistance() {
        // Across the antimeridian, longitudes 179 and -179 are 2 degrees apart on the sphere.
        Locations loc = Locations.geographic(new double[] {179, -179, 170, 160}, new double[] {0, 0, 0, 0});
        SpatialWeights w = SpatialWeights.nearestNeighbours(loc, 1, SpatialWeights.Symmetry.DIRECTED);
        assertArrayEquals(new int[] {1}, w.neighbours(0));
        assertArrayEquals(new int[] {0}, w.neighbours(1));
        assertArrayEquals(new int[] {0}, w.neighbours(2));
        // One degree of the equator is 2πR/360 km (R = Locations.EARTH_RADIUS_KM).
        double degree = 2 * Math.PI * Locations.EARTH_RADIUS_KM / 360;
        SpatialWeights band = SpatialWeights.distanceBand(loc, 2.5 * degree);
        assertArrayEquals(new int[] {1}, band.neighbours(0));
        assertArrayEquals(new int[] {2, 3}, band.islands()); // 9 and 10 degrees from the rest
        SpatialWeights inv = SpatialWeights.inverseDistance(loc, 1, Double.POSITIVE_INFINITY);
        assertEquals(1 / (2 * degree), inv.weight(0, 1), 1e-12 / degree);
    }

    @Test
    void distanceBandAndInverseDistanceMatchBruteForce() {
        Random rnd = new Random(23);
        int n = 120;
        double[] x = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = rnd.nextDouble() * 10;
            y[i] = rnd.nextDouble() * 10;
        }
        x[n - 1] = 100; // far away: an island for the band
        Locations loc = Locations.planar(x, y);
        double band = 1.3;
        SpatialWeights b = SpatialWeights.distanceBand(loc, band);
        SpatialWeights inv = SpatialWeights.inverseDistance(loc, 2, band);
        SpatialWeights all = SpatialWeights.inverseDistance(loc, 1.5, Double.POSITIVE_INFINITY);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double d = Math.hypot(x[i] - x[j], y[i] - y[j]);
                boolean in = i != j && d <= band;
                assertEquals(in ? 1.0 : 0.0, b.weight(i, j));
                assertEquals(in ? 1 / (d * d) : 0.0, inv.weight(i, j), 1e-12 / (d * d));
                assertEquals(i != j ? Math.pow(d, -1.5) : 0.0, all.weight(i, j), 1e-12);
            }
        }
        int[] isolated = java.util.stream.IntStream.range(0, n).filter(i -> java.util.stream.IntStream.range(0, n)
                .noneMatch(j -> j != i && Math.hypot(x[i] - x[j], y[i] - y[j]) <= band)).toArray();
        assertArrayEquals(isolated, b.islands());
        assertEquals(n - 1, isolated[isolated.length - 1]);
        assertEquals(n * (n - 1), all.linkCount());
    }

    private static void assertCounts(SpatialWeights w, int corner, int edge, int centre) {
        for (int c : CORNERS) {
            assertEquals(corner, w.neighbourCount(c), "corner " + c);
        }
        for (int e : EDGES) {
            assertEquals(edge, w.neighbourCount(e), "edge " + e);
        }
        assertEquals(centre, w.neighbourCount(4), "centre");
    }
}
