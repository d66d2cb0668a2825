package io.densa.spatial.kriging;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Point;
import org.locationtech.jts.geom.Polygon;
import org.locationtech.jts.geom.prep.PreparedGeometry;
import org.locationtech.jts.geom.prep.PreparedGeometryFactory;

/** Block kriging of the mean density of a polygon ({@link Kriging#predictBlock}; package-private). */
final class BlockKriging {
    private BlockKriging() {
    }

    static KrigingPrediction predict(Kriging kr, Polygon polygon, double spacing) {
        int p = kr.driftSize();
        Objects.requireNonNull(polygon, "polygon");
        if (polygon.isEmpty()) {
            throw new IllegalArgumentException("block polygon is empty");
        }
        if (!(spacing > 0) || Double.isInfinite(spacing)) {
            throw new IllegalArgumentException("block discretisation spacing must be finite and > 0, got " + spacing);
        }
        if (kr.drift() != null && kr.drift().covariateCount() > 0 && kr.type() == Kriging.Type.UNIVERSAL) {
            throw new IllegalArgumentException("block kriging with external drift covariates is not supported;"
                    + " use a polynomial drift");
        }
        double[][] pts = discretise(polygon, spacing);
        int m = pts.length;
        double nearest = Double.POSITIVE_INFINITY;
        for (double[] u : pts) {
            kr.locations().requirePoint(u[0], u[1], "block point");
            nearest = Math.min(nearest, kr.index().kthDistance(u[0], u[1], 1));
        }
        Point ip = polygon.getInteriorPoint();
        int[] nb = kr.neighbours(ip.getX(), ip.getY(), -1);
        LocalSystem sys = kr.systemFor(nb);
        double[] c0 = new double[nb.length];
        double[] f0 = new double[p];
        double[] fb = new double[p];
        double[] dist = new double[nb.length];
        double[] cu = new double[nb.length];
        for (double[] u : pts) {
            kr.covariances().targets(nb, nb.length, u[0], u[1], dist, cu);
            for (int r = 0; r < nb.length; r++) {
                c0[r] += cu[r];
            }
            kr.design().driftAt(u[0], u[1], null, fb);
            for (int j = 0; j < p; j++) {
                f0[j] += fb[j];
            }
        }
        for (int r = 0; r < nb.length; r++) {
            c0[r] /= m;
        }
        for (int j = 0; j < p; j++) {
            f0[j] /= m;
        }
        double cvv = 0;
        for (int a = 0; a < m; a++) {
            for (int b = 0; b < m; b++) {
                cvv += a == b ? kr.covariances().pseudoSill() : kr.covariances().cov(kr.covariances().distance(pts[a][0], pts[a][1], pts[b][0], pts[b][1]));
            }
        }
        cvv /= (double) m * m;
        double[] out = new double[kr.dimension()];
        double[] w = new double[nb.length];
        LocalSystem.Scratch sc = new LocalSystem.Scratch(p);
        double var = sys.predict(c0, f0, cvv, kr.centre(), out, 0, w, sc);
        kr.checkConstraints(sc.residual, ip.getX(), ip.getY(), sys, nearest);
        if (p > 0) {
            kr.checkConstraints(kr.design().weightResidual(nb, w, f0), ip.getX(), ip.getY(), sys, nearest);
        }
        return new KrigingPrediction(kr.density(out, ip.getX(), ip.getY(), sys),
                kr.variance(var, ip.getX(), ip.getY(), sys),
                nb, w, nearest);
    }

    /** Centres of a square grid of the given spacing covered by the polygon (package-private for tests). */
    static double[][] discretise(Polygon polygon, double spacing) {
        Envelope env = polygon.getEnvelopeInternal();
        long nx = (long) Math.ceil(env.getWidth() / spacing - 1e-9);
        long ny = (long) Math.ceil(env.getHeight() / spacing - 1e-9);
        nx = Math.max(1, nx);
        ny = Math.max(1, ny);
        if (nx * ny > 1L << 22) {
            throw new IllegalArgumentException("spacing " + spacing + " gives " + nx + " x " + ny
                    + " candidate points; use a coarser spacing");
        }
        PreparedGeometry prep = PreparedGeometryFactory.prepare(polygon);
        GeometryFactory gf = polygon.getFactory();
        double x0 = env.getMinX() + 0.5 * (env.getWidth() - (nx - 1) * spacing);
        double y0 = env.getMinY() + 0.5 * (env.getHeight() - (ny - 1) * spacing);
        List<double[]> pts = new ArrayList<>();
        for (long iy = 0; iy < ny; iy++) {
            for (long ix = 0; ix < nx; ix++) {
                double px = x0 + ix * spacing, py = y0 + iy * spacing;
                if (prep.covers(gf.createPoint(new Coordinate(px, py)))) {
                    pts.add(new double[] {px, py});
                    if (pts.size() > 4096) {
                        throw new IllegalArgumentException("spacing " + spacing + " puts more than 4096 points in"
                                + " the block; use a coarser spacing");
                    }
                }
            }
        }
        if (pts.isEmpty()) {
            Point ip = polygon.getInteriorPoint();
            pts.add(new double[] {ip.getX(), ip.getY()});
        }
        return pts.toArray(new double[0][]);
    }
}
