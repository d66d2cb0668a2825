package io.densa.spatial;

import io.densa.spatial.internal.ByDistance;
import java.util.Arrays;
import java.util.Objects;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.index.strtree.STRtree;

/**
 * Spatial index over a set of {@link Locations} for neighbour queries, backed by the JTS
 * {@link STRtree} (Sort-Tile-Recursive packed R-tree).
 *
 * <p>Semantics: distances are those of {@link Locations#distance(double, double, double, double)}
 * (Euclidean for planar, great-circle km for geographic). Neighbour lists are ordered by distance,
 * ties broken by the smaller location index, so every query is deterministic. k-nearest queries
 * run as radius queries on the tree with a radius that grows until at least k locations lie
 * within it; the k closest of those are exact.
 *
 * <p>Immutable and thread-safe after construction (the tree is built eagerly).
 */
public final class NeighbourIndex {
    private final Locations locations;
    private final STRtree tree;
    private final double initialRadius;

    private NeighbourIndex(Locations locations) {
        this.locations = locations;
        this.tree = new STRtree();
        int n = locations.size();
        for (int i = 0; i < n; i++) {
            tree.insert(new Envelope(locations.x(i), locations.x(i), locations.y(i), locations.y(i)), i);
        }
        tree.build();
        double[] bb = n == 0 ? new double[] {0, 0, 0, 0} : locations.boundingBox();
        double diag = locations.unchecked(bb[0], bb[1], bb[2], bb[3]);
        this.initialRadius = diag > 0 ? diag / Math.sqrt(Math.max(1, n)) : 1.0;
    }

    /**
     * An index over the given locations.
     *
     * @throws IllegalArgumentException if there are no locations
     */
    public static NeighbourIndex of(Locations locations) {
        Objects.requireNonNull(locations, "locations");
        if (locations.size() == 0) {
            throw new IllegalArgumentException("cannot index an empty set of locations");
        }
        return new NeighbourIndex(locations);
    }

    /** The indexed locations. */
    public Locations locations() {
        return locations;
    }

    /**
     * Indices of all locations within distance r of (px, py) (inclusive), ordered by distance then
     * index.
     *
     * @throws IllegalArgumentException if r is negative or NaN, or the point fails
     *                                  {@link Locations#requirePoint}
     */
    public int[] within(double px, double py, double r) {
        checkPoint(px, py);
        if (!(r >= 0) || Double.isInfinite(r)) {
            throw new IllegalArgumentException("radius must be finite and >= 0, got " + r);
        }
        Candidates c = new Candidates(locations.size());
        collect(px, py, r, c);
        return c.sortedIndices();
    }

    /**
     * Indices of the k nearest locations to (px, py), ordered by distance then index; all
     * locations if k is at least their number.
     *
     * @throws IllegalArgumentException if k &lt; 1 or the point fails {@link Locations#requirePoint}
     */
    public int[] nearest(double px, double py, int k) {
        checkPoint(px, py);
        if (k < 1) {
            throw new IllegalArgumentException("neighbour count must be >= 1, got " + k);
        }
        int n = locations.size();
        int want = Math.min(k, n);
        Candidates c = new Candidates(n);
        double r = initialRadius * Math.sqrt(want);
        while (true) {
            c.clear();
            collect(px, py, r, c);
            if (c.count >= want) {
                break;
            }
            r *= 2;
        }
        int[] all = c.sortedIndices();
        return Arrays.copyOf(all, want);
    }

    /**
     * Distance from (px, py) to its k-th nearest location.
     */
    public double kthDistance(double px, double py, int k) {
        int[] nn = nearest(px, py, k);
        return locations.distanceTo(nn[nn.length - 1], px, py);
    }

    /**
     * Pairs (i, j), i &lt; j, of locations closer than or at distance tol, in lexicographic
     * order; tol = 0 finds exactly coincident locations.
     */
    public int[][] pairsWithin(double tol) {
        if (!(tol >= 0) || Double.isInfinite(tol)) {
            throw new IllegalArgumentException("tolerance must be finite and >= 0, got " + tol);
        }
        int n = locations.size();
        int[][] out = new int[8][];
        int count = 0;
        Candidates c = new Candidates(n);
        for (int i = 0; i < n; i++) {
            c.clear();
            collect(locations.x(i), locations.y(i), tol, c);
            for (int q = 0; q < c.count; q++) {
                int j = c.index[q];
                if (j > i) {
                    if (count == out.length) {
                        out = Arrays.copyOf(out, 2 * count);
                    }
                    out[count++] = new int[] {i, j};
                }
            }
        }
        int[][] res = Arrays.copyOf(out, count);
        Arrays.sort(res, (a, b) -> a[0] != b[0] ? Integer.compare(a[0], b[0]) : Integer.compare(a[1], b[1]));
        return res;
    }

    private void checkPoint(double px, double py) {
        locations.requirePoint(px, py, "query point");
    }

    /** Adds every location within distance r of (px, py) to c (unsorted). */
    void collect(double px, double py, double r, Candidates c) {
        if (locations.kind() == Locations.Kind.PLANAR) {
            query(new Envelope(px - r, px + r, py - r, py + r), px, py, r, c);
            return;
        }
        double dDeg = Math.toDegrees(r / Locations.EARTH_RADIUS_KM);
        double lat0 = py - dDeg, lat1 = py + dDeg;
        double maxLat = Math.max(Math.abs(lat0), Math.abs(lat1));
        if (dDeg >= 90 || maxLat >= 89.999) {
            query(new Envelope(-180, 360, Math.max(-90, lat0), Math.min(90, lat1)), px, py, r, c);
            return;
        }
        double dLon = dDeg / Math.cos(Math.toRadians(maxLat));
        if (dLon >= 180) {
            query(new Envelope(-180, 360, lat0, lat1), px, py, r, c);
            return;
        }
        for (int shift = -360; shift <= 360; shift += 360) {
            double lo = px + shift - dLon, hi = px + shift + dLon;
            if (hi >= -180 && lo <= 360) {
                query(new Envelope(lo, hi, lat0, lat1), px, py, r, c);
            }
        }
    }

    private void query(Envelope env, double px, double py, double r, Candidates c) {
        tree.query(env, item -> {
            int j = (Integer) item;
            double d = locations.unchecked(locations.x(j), locations.y(j), px, py);
            if (d <= r) {
                c.add(j, d);
            }
        });
    }

    /** Reusable candidate buffer (index, distance); a location is added at most once. */
    static final class Candidates {
        int[] index;
        double[] dist;
        int count;
        private final boolean[] seen;

        Candidates(int n) {
            index = new int[16];
            dist = new double[16];
            seen = new boolean[n];
        }

        void clear() {
            for (int q = 0; q < count; q++) {
                seen[index[q]] = false;
            }
            count = 0;
        }

        void add(int j, double d) {
            if (seen[j]) {
                return;
            }
            seen[j] = true;
            if (count == index.length) {
                index = Arrays.copyOf(index, 2 * count);
                dist = Arrays.copyOf(dist, 2 * count);
            }
            index[count] = j;
            dist[count] = d;
            count++;
        }

        int[] sortedIndices() {
            return ByDistance.sorted(index, dist, count);
        }
    }

    @Override
    public String toString() {
        return "NeighbourIndex[n=" + locations.size() + ", " + locations.kind() + "]";
    }
}
