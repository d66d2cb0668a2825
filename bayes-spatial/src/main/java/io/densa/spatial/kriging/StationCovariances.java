package io.densa.spatial.kriging;

import io.densa.core.internal.Kernels;
import io.densa.spatial.Locations;
import io.densa.spatial.internal.GreatCircle;
import io.densa.spatial.internal.Scaling;
import io.densa.spatial.variogram.VariogramModel;

/**
 * The covariances of a kriging's systems (package-private): the (pseudo-)covariance A − γ(h) of the
 * model between stations and from targets to stations, in units of an even power of two 2^e near
 * the (pseudo-)sill A (exact scaling, see {@link Kriging}); the station–station matrix is computed
 * once, when first needed, for up to 2500 stations. Thread-safe.
 */
final class StationCovariances {
    private static final int STATION_MATRIX_LIMIT = 2500;

    private final Locations loc;
    private final int n;
    private final double[] sx;
    private final double[] sy;
    private final boolean parallel;
    private final double sill;
    private final int unitExponent;
    /** The model in units of 2^unitExponent (the sills scaled, exact): what the systems use. */
    private final VariogramModel unitModel;
    private final double pseudoSill;
    private volatile double[] stationCov;

    /**
     * @param bb the data's bounding box (minX, minY, maxX, maxY)
     * @throws IllegalArgumentException if an unbounded model overflows a double across the data
     */
    StationCovariances(Locations loc, VariogramModel model, double[] bb, boolean parallel) {
        this.loc = loc;
        this.n = loc.size();
        this.sx = loc.xs();
        this.sy = loc.ys();
        this.parallel = parallel;
        double diam = distance(bb[0], bb[1], bb[2], bb[3]);
        double s = model.bounded() ? model.sill() : 2 * gammaOrInfinity(model, Math.max(diam, 1e-300)) + 1;
        if (!(s <= Double.MAX_VALUE)) {
            throw new IllegalArgumentException("the variogram " + model + " overflows a double at the largest"
                    + " distance between the data locations (" + diam + "); accepted are power models whose value"
                    + " there stays below about 1e308: rescale the coordinates or the data");
        }
        this.sill = s;
        // an even exponent keeps the Cholesky factor's scale 2^(e/2) a power of two (exact)
        this.unitExponent = Math.getExponent(s) & ~1;
        this.unitModel = model.scaledBy(-unitExponent);
        this.pseudoSill = Math.scalb(s, -unitExponent);
    }

    /** The (pseudo-)sill A in the data's units. */
    double sill() {
        return sill;
    }

    /** e of the scale 2^e (even). */
    int unitExponent() {
        return unitExponent;
    }

    /** A in the systems' units: C(0). */
    double pseudoSill() {
        return pseudoSill;
    }

    /** Distance between two checked points, computed as {@link Locations} computes it. */
    double distance(double x1, double y1, double x2, double y2) {
        return loc.kind() == Locations.Kind.PLANAR ? Scaling.planarNorm(x1 - x2, y1 - y2)
                : GreatCircle.km(x1, y1, x2, y2);
    }

    /** γ(h) (h &gt; 0), or +∞ where it exceeds the double range (reported by the caller). */
    private static double gammaOrInfinity(VariogramModel model, double h) {
        try {
            return model.gamma(h);
        } catch (IllegalArgumentException overflow) {
            return Double.POSITIVE_INFINITY;
        }
    }

    /** The (pseudo-)covariance at lag h; C(0) at h = 0. */
    double cov(double h) {
        return unitModel.pseudoCovariance(h, pseudoSill);
    }

    /** Distances from (x, y) to stations idx[0..m) (all stations 0..m−1 if idx is null) into out. */
    void distances(int[] idx, int m, double x, double yy, double[] out) {
        if (loc.kind() == Locations.Kind.PLANAR) {
            for (int r = 0; r < m; r++) {
                int i = idx == null ? r : idx[r];
                out[r] = Scaling.planarNorm(sx[i] - x, sy[i] - yy);
            }
        } else {
            for (int r = 0; r < m; r++) {
                int i = idx == null ? r : idx[r];
                out[r] = GreatCircle.km(sx[i], sy[i], x, yy);
            }
        }
    }

    /**
     * The coordinates of stations idx[0..m) gathered into xs and ys (planar locations), for
     * {@link #planarDistances}, which then reads them with unit stride.
     */
    void gather(int[] idx, int m, double[] xs, double[] ys) {
        for (int r = 0; r < m; r++) {
            xs[r] = sx[idx[r]];
            ys[r] = sy[idx[r]];
        }
    }

    /**
     * {@link #distances} for planar locations whose coordinates were gathered by {@link #gather}:
     * the same numbers (the plain square root of the sum of squares wherever {@link
     * Scaling#planarNorm} takes it, that method elsewhere), in two short loops without branches
     * or indirection, which the JIT vectorises; sq is scratch.
     */
    static void planarDistances(double[] xs, double[] ys, int m, double x, double yy, double[] sq, double[] out) {
        for (int r = 0; r < m; r++) {
            double dx = xs[r] - x, dy = ys[r] - yy;
            sq[r] = dx * dx + dy * dy;
        }
        for (int r = 0; r < m; r++) {
            out[r] = Math.sqrt(sq[r]);
        }
        for (int r = 0; r < m; r++) {
            if (!Scaling.plainSquareInRange(sq[r])) {
                out[r] = Scaling.planarNorm(xs[r] - x, ys[r] - yy);
            }
        }
    }

    /** Covariances from (x, y) to stations idx[0..m) (all if idx is null) into out; dist is scratch. */
    void targets(int[] idx, int m, double x, double yy, double[] dist, double[] out) {
        distances(idx, m, x, yy, dist);
        atDistances(dist, m, out);
    }

    /** Covariances at the distances dist[0..m) (from {@link #distances}) into out. */
    void atDistances(double[] dist, int m, double[] out) {
        unitModel.pseudoCovariances(dist, m, pseudoSill, out);
    }

    /**
     * The m × m block of covariances between the stations idx[0..m) into a (row-major, both
     * triangles; C(0) on the diagonal): from the station matrix when there is one (up to
     * {@code STATION_MATRIX_LIMIT} stations), otherwise from the distances.
     */
    void block(int[] idx, int m, double[] a) {
        double[] sc = stationMatrix();
        for (int r = 0; r < m; r++) {
            int ir = idx[r];
            int ro = ir * n;
            for (int c = 0; c <= r; c++) {
                double v = sc != null ? sc[ro + idx[c]] : cov(loc.distance(ir, idx[c]));
                a[r * m + c] = v;
                a[c * m + r] = v;
            }
        }
    }

    private double[] stationMatrix() {
        if (n > STATION_MATRIX_LIMIT) {
            return null;
        }
        double[] sc = stationCov;
        if (sc == null) {
            synchronized (this) {
                sc = stationCov;
                if (sc == null) {
                    double[] m = new double[n * n];
                    int blocks = (n + 63) / 64;
                    Kernels.forEachBlock(blocks, parallel && n > 256, b -> {
                        double[] d = new double[n];
                        double[] row = new double[n];
                        for (int i = b * 64; i < Math.min(n, b * 64 + 64); i++) {
                            targets(null, n, loc.x(i), loc.y(i), d, row);
                            row[i] = pseudoSill;
                            System.arraycopy(row, 0, m, i * n, n);
                        }
                    });
                    stationCov = m;
                    sc = m;
                }
            }
        }
        return sc;
    }

    /** The smallest of dist[0..m) (+∞ for m = 0). */
    static double nearest(double[] a, int m) {
        double v = Double.POSITIVE_INFINITY;
        for (int i = 0; i < m; i++) {
            v = Math.min(v, a[i]);
        }
        return v;
    }
}
