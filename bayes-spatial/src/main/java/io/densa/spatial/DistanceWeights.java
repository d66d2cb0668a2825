package io.densa.spatial;

import io.densa.spatial.internal.ByDistance;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.stream.IntStream;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.index.strtree.ItemBoundable;
import org.locationtech.jts.index.strtree.STRtree;

/**
 * Builders of distance-based {@link SpatialWeights} (package-private): k nearest neighbours,
 * distance band and inverse distance, with their neighbour searches (a JTS {@code STRtree} for
 * planar locations, an exact scan for geographic ones).
 */
final class DistanceWeights {
    private DistanceWeights() {
    }

    static SpatialWeights nearestNeighbours(Locations locations, int k, SpatialWeights.Symmetry symmetry) {
        Objects.requireNonNull(locations, "locations");
        Objects.requireNonNull(symmetry, "symmetry");
        int n = locations.size();
        WeightsAssembly.checkUnits(n);
        if (!(k >= 1 && k <= n - 1)) {
            throw new IllegalArgumentException("k = " + k + " nearest neighbours requested for " + n
                    + " units; k must be in 1.." + (n - 1));
        }
        int[][] nb = new int[n][];
        if (locations.kind() == Locations.Kind.PLANAR) {
            STRtree tree = pointTree(locations);
            IntStream.range(0, n).parallel().forEach(i -> nb[i] = nearestPlanar(locations, tree, i, k));
        } else {
            IntStream.range(0, n).parallel().forEach(i -> nb[i] = nearestByScan(locations, i, k));
        }
        if (symmetry != SpatialWeights.Symmetry.DIRECTED) {
            symmetrise(nb, symmetry == SpatialWeights.Symmetry.UNION);
        }
        double[][] ones = new double[n][];
        for (int i = 0; i < n; i++) {
            ones[i] = new double[nb[i].length];
            Arrays.fill(ones[i], 1.0);
        }
        return WeightsAssembly.assemble(n, nb, ones);
    }

    static SpatialWeights distanceBand(Locations locations, double maxDistance) {
        Objects.requireNonNull(locations, "locations");
        if (!(maxDistance > 0 && maxDistance < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException("distance band " + maxDistance + " must be finite and positive");
        }
        int n = locations.size();
        WeightsAssembly.checkUnits(n);
        int[][] nb = new int[n][];
        double[][] wt = new double[n][];
        withinBand(locations, maxDistance, nb, wt);
        for (double[] row : wt) {
            Arrays.fill(row, 1.0);
        }
        return WeightsAssembly.assemble(n, nb, wt);
    }

    static SpatialWeights inverseDistance(Locations locations, double power, double maxDistance) {
        Objects.requireNonNull(locations, "locations");
        if (!(power > 0 && power < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException("inverse-distance power " + power + " must be finite and positive");
        }
        if (!(maxDistance > 0)) {
            throw new IllegalArgumentException("distance band " + maxDistance
                    + " must be positive (or +Infinity for none)");
        }
        int n = locations.size();
        WeightsAssembly.checkUnits(n);
        int[][] nb = new int[n][];
        double[][] wt = new double[n][];
        if (maxDistance == Double.POSITIVE_INFINITY) {
            if ((long) n * (n - 1) > Integer.MAX_VALUE - 8) {
                throw new IllegalArgumentException("inverse-distance weights without a band for " + n
                        + " units would store n(n-1) entries; give a finite band");
            }
            IntStream.range(0, n).parallel().forEach(i -> {
                int[] c = new int[n - 1];
                double[] d = new double[n - 1];
                ByDistance.others(n, i, j -> locations.distance(i, j), c, d);
                nb[i] = c;
                wt[i] = d;
            });
        } else {
            withinBand(locations, maxDistance, nb, wt);
        }
        for (int i = 0; i < n; i++) {
            for (int m = 0; m < nb[i].length; m++) {
                double d = wt[i][m];
                if (!(d > 0)) {
                    throw new IllegalArgumentException("units " + Math.min(i, nb[i][m]) + " and "
                            + Math.max(i, nb[i][m]) + " are coincident; inverse-distance weight is infinite"
                            + " (merge them or use binary weights)");
                }
                double w = power == 1 ? 1 / d : Math.pow(d, -power);
                if (!(w > 0 && w <= Double.MAX_VALUE)) {
                    throw new IllegalArgumentException("the inverse-distance weight of units " + i + " and " + nb[i][m]
                            + " at distance " + d + " with power " + power + " is " + w + " (d^-power "
                            + (w > 0 ? "overflows" : "underflows to 0") + "); accepted are powers and distances whose"
                            + " weights are positive finite doubles: use a smaller power or rescale the coordinates");
                }
                wt[i][m] = w;
            }
        }
        return WeightsAssembly.assemble(n, nb, wt);
    }

    private static STRtree pointTree(Locations loc) {
        STRtree tree = new STRtree();
        for (int i = 0; i < loc.size(); i++) {
            tree.insert(new Envelope(loc.x(i), loc.x(i), loc.y(i), loc.y(i)), i);
        }
        tree.build();
        return tree;
    }

    /** The k nearest of unit i (planar), exact, ties broken by index. */
    private static int[] nearestPlanar(Locations loc, STRtree tree, int i, int k) {
        Envelope env = new Envelope(loc.x(i), loc.x(i), loc.y(i), loc.y(i));
        Object[] near = tree.nearestNeighbour(env, i, (ItemBoundable a, ItemBoundable b) ->
                loc.distance((Integer) a.getItem(), (Integer) b.getItem()), k + 1);
        double radius = 0;
        for (Object o : near) {
            radius = Math.max(radius, loc.distance(i, (Integer) o));
        }
        // Every unit within the (k+1)-th smallest distance (self included) is a candidate.
        Envelope box = new Envelope(loc.x(i) - radius, loc.x(i) + radius, loc.y(i) - radius, loc.y(i) + radius);
        List<?> cand = tree.query(box);
        int[] idx = new int[cand.size()];
        double[] dist = new double[cand.size()];
        int m = 0;
        for (Object o : cand) {
            int j = (Integer) o;
            if (j != i) {
                double d = loc.distance(i, j);
                if (d <= radius) {
                    idx[m] = j;
                    dist[m++] = d;
                }
            }
        }
        return smallest(idx, dist, m, k);
    }

    private static int[] nearestByScan(Locations loc, int i, int k) {
        int n = loc.size();
        int[] idx = new int[n - 1];
        double[] dist = new double[n - 1];
        ByDistance.others(n, i, j -> loc.distance(i, j), idx, dist);
        return smallest(idx, dist, n - 1, k);
    }

    /** The k entries of idx[0..m) with smallest (dist, idx), sorted by index. */
    private static int[] smallest(int[] idx, double[] dist, int m, int k) {
        int[] out = Arrays.copyOf(ByDistance.sorted(idx, dist, m), Math.min(k, m));
        Arrays.sort(out);
        return out;
    }

    /** Fills nb[i] and wt[i] (= distances) with the units within the band of unit i. */
    private static void withinBand(Locations loc, double band, int[][] nb, double[][] wt) {
        int n = loc.size();
        STRtree tree = loc.kind() == Locations.Kind.PLANAR ? pointTree(loc) : null;
        IntStream.range(0, n).parallel().forEach(i -> {
            int[] idx;
            double[] dist;
            int m = 0;
            if (tree != null) {
                List<?> cand = tree.query(new Envelope(loc.x(i) - band, loc.x(i) + band, loc.y(i) - band,
                        loc.y(i) + band));
                idx = new int[cand.size()];
                dist = new double[cand.size()];
                for (Object o : cand) {
                    int j = (Integer) o;
                    double d = loc.distance(i, j);
                    if (j != i && d <= band) {
                        idx[m] = j;
                        dist[m++] = d;
                    }
                }
            } else {
                idx = new int[n];
                dist = new double[n];
                for (int j = 0; j < n; j++) {
                    double d = loc.distance(i, j);
                    if (j != i && d <= band) {
                        idx[m] = j;
                        dist[m++] = d;
                    }
                }
            }
            nb[i] = Arrays.copyOf(idx, m);
            wt[i] = Arrays.copyOf(dist, m);
        });
    }

    /** In place: union (either direction) or mutual (both directions) of the relation. */
    private static void symmetrise(int[][] nb, boolean union) {
        int n = nb.length;
        for (int[] row : nb) {
            Arrays.sort(row);
        }
        int[][] out = new int[n][];
        List<List<Integer>> extra = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            extra.add(new ArrayList<>());
        }
        if (union) {
            for (int i = 0; i < n; i++) {
                for (int j : nb[i]) {
                    if (Arrays.binarySearch(nb[j], i) < 0) {
                        extra.get(j).add(i);
                    }
                }
            }
            for (int i = 0; i < n; i++) {
                int[] r = Arrays.copyOf(nb[i], nb[i].length + extra.get(i).size());
                for (int a = 0; a < extra.get(i).size(); a++) {
                    r[nb[i].length + a] = extra.get(i).get(a);
                }
                out[i] = r;
            }
        } else {
            for (int i = 0; i < n; i++) {
                final int ii = i;
                out[i] = Arrays.stream(nb[i]).filter(j -> Arrays.binarySearch(nb[j], ii) >= 0).toArray();
            }
        }
        System.arraycopy(out, 0, nb, 0, n);
    }
}
