package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensaException;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Polygon;

/**
 * Universal kriging far outside the data, drift functions that the data cannot identify, drift
 * covariates at extreme scales, and the distance to the nearest station on every prediction.
 */
class KrigingEdgesTest {
    final Locations loc = TestData.uniformSquare(30, 1, 5);
    final DensitySet data = TestData.gaussianField(TestData.K3, loc, VariogramModel.exponential(1, 0.5), 6);
    final VariogramModel model = VariogramModel.exponential(1, 0.5);

    static void matches(String regex, Throwable e) {
        assertTrue(e.getMessage().matches(regex), "message was: " + e.getMessage());
    }

    /** The drift functions of Drift.polynomial(degree) at location i, in the kriging's scaled coordinates. */
    static double[] driftRow(Kriging k, int i) {
        double[] f = new double[k.driftSize()];
        k.design().driftRow(i, f, 0);
        return f;
    }

    @Test
    void theUnbiasednessConstraintsHoldOrThePredictionFailsLoudly() {
        // the universal kriging equations C λ + F μ = c0, Fᵀλ = f(s0) ("A Universal Kriging predictor
        // for spatially dependent functional data of a Hilbert Space", Electron. J. Statist. 7 (2013)
        // — from memory): whatever the target, either the weights satisfy Fᵀλ = f(s0) (the first
        // equation being Σλ = 1) to 1e-6, or the prediction throws and says why
        for (int degree = 1; degree <= 3; degree++) {
            Kriging k = Kriging.universal(loc, data, Drift.polynomial(degree), model, KrigingOptions.withDefaults());
            int thrown = 0;
            for (int e = 1; e <= 8; e++) {
                double x = Math.pow(10, e), y = 0.3 * x;
                try {
                    KrigingPrediction p = k.predictWithWeights(x, y);
                    double[] f0 = new double[k.driftSize()];
                    k.design().driftAt(x, y, null, f0);
                    for (int j = 0; j < f0.length; j++) {
                        double s = 0;
                        for (int r = 0; r < p.weights().length; r++) {
                            s += p.weights()[r] * driftRow(k, p.neighbours()[r])[j];
                        }
                        assertEquals(f0[j], s, 1e-6 * Math.max(1, Math.abs(f0[j])), "degree " + degree + ", 1e" + e);
                    }
                    assertTrue(Double.isFinite(p.variance()));
                    assertTrue(Double.isFinite(k.predict(x, y).variance()));
                } catch (DensaException ex) {
                    thrown++;
                    matches("UNIVERSAL kriging at target \\(" + x + ", " + y + "\\) is numerically unreliable: its"
                            + " weights satisfy the unbiasedness constraints F'lambda = f\\(s0\\) only to a relative"
                            + " residual of \\S+ \\(accepted: 1e-06; the weights should sum to 1\\)\\. The target is \\S+"
                            + " from the nearest data location, .*use a lower drift degree", ex);
                    KrigingDiagnostics d = ex.diagnostics(KrigingDiagnostics.class).orElseThrow();
                    assertTrue(d.detail().startsWith("unbiasedness constraint residual "), d.detail());
                    assertEquals(30, d.systemSize());
                }
            }
            // near the data nothing fails; a polynomial drift of degree 2 or 3 at 1e8 half-widths
            // away (terms of order 1e16 and 1e24) cannot meet its constraints in double precision
            assertTrue(degree == 1 ? thrown == 0 : thrown >= 1, "degree " + degree + ": " + thrown + " thrown");
            assertTrue(Double.isFinite(k.predict(0.5, 0.5).variance()));
        }
        // the grid paths check too: a local neighbourhood grid far away
        Kriging local = Kriging.universal(loc, data, Drift.polynomial(3), model, KrigingOptions.withDefaults()
                .withNeighbourhood(Neighbourhood.nearest(12)));
        DensaException e = assertThrows(DensaException.class, () -> local.predictGrid(Grid.over(1e8, 1e8, 2e8, 2e8,
                2, 2), GridOptions.withDefaults(), t -> { }));
        matches("UNIVERSAL kriging at target .* is numerically unreliable: .*", e);
    }

    @Test
    void dependentDriftFunctionsAreNamed() {
        double[][] constant = new double[30][1];
        for (double[] row : constant) {
            row[0] = 5;
        }
        matches("drift covariate 0 is constant over the 30 data locations \\(every value is 5.0\\): it duplicates the"
                + " constant term of the drift, so its coefficient is not identifiable; drop it",
                assertThrows(IllegalArgumentException.class, () -> Kriging.universal(loc, data,
                        Drift.constant().withCovariates(constant), model, KrigingOptions.withDefaults())));
        double[][] linear = new double[30][1];
        for (int i = 0; i < 30; i++) {
            linear[i][0] = 2 * loc.x(i) + 3;
        }
        matches("drift covariate 0 is a linear combination of the earlier drift functions \\(1, x, y\\) over the 30"
                + " data locations, so its coefficient is not identifiable; drop it",
                assertThrows(IllegalArgumentException.class, () -> Kriging.universal(loc, data,
                        Drift.polynomial(1).withCovariates(linear), model, KrigingOptions.withDefaults())));
        // all locations on one horizontal line: y is constant there
        double[] x = new double[8], y = new double[8];
        for (int i = 0; i < 8; i++) {
            x[i] = i;
            y[i] = 2;
        }
        DensitySet d8 = TestData.independentCoordinates(TestData.K3, 8, 2);
        matches("drift function y \\(column 2\\) is a linear combination of the earlier drift functions \\(1, x\\)"
                + " over the 8 data locations \\(for instance all of them on a line\\), so its coefficient is not"
                + " identifiable; use a lower drift degree or more locations",
                assertThrows(IllegalArgumentException.class, () -> Kriging.universal(Locations.planar(x, y), d8,
                        Drift.polynomial(1), model, KrigingOptions.withDefaults())));
        // identifiable globally, not within a neighbourhood: six stations on a line and two far off it
        double[] x2 = {0, 1, 2, 3, 4, 5, 50, 60}, y2 = {0, 0, 0, 0, 0, 0, 40, -30};
        Kriging k = Kriging.universal(Locations.planar(x2, y2), d8, Drift.polynomial(1), VariogramModel.exponential(1,
                10), KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(4)));
        DensaException e = assertThrows(DensaException.class, () -> k.predict(2.5, 0.1));
        matches("drift function y \\(column 2\\) is a linear combination of the earlier drift functions \\(1, x\\)"
                + " over the 4 data locations .*", e);
    }

    @Test
    void driftCovariatesAtExtremeScalesGiveTheSamePredictions() {
        // a covariate measured in another unit (times s) spans the same drift functions, so the
        // predictions are unchanged and its coefficient is divided by s (the drift is linear in it)
        double[][] cov = new double[30][1];
        for (int i = 0; i < 30; i++) {
            cov[i][0] = Math.sin(7 * loc.x(i)) + loc.y(i) * loc.y(i);
        }
        Kriging ref = Kriging.universal(loc, data, Drift.polynomial(1).withCovariates(cov), model,
                KrigingOptions.withDefaults());
        double t = 0.37;
        KrigingPrediction pr = ref.predict(0.4, 0.6, new double[] {t});
        double[][] beta = ref.driftCoefficients();
        for (double s : new double[] {1e300, 1e-300, 1e-170}) {
            double[][] sc = new double[30][1];
            for (int i = 0; i < 30; i++) {
                sc[i][0] = cov[i][0] * s;
            }
            Kriging k = Kriging.universal(loc, data, Drift.polynomial(1).withCovariates(sc), model,
                    KrigingOptions.withDefaults());
            KrigingPrediction p = k.predict(0.4, 0.6, new double[] {t * s});
            for (int c = 0; c < TestData.K3.dimension(); c++) {
                assertEquals(pr.density().coordinate(c), p.density().coordinate(c), 1e-9, "scale " + s);
            }
            assertEquals(pr.variance(), p.variance(), 1e-9 * pr.variance());
            double[][] b = k.driftCoefficients();
            for (int c = 0; c < TestData.K3.dimension(); c++) {
                assertEquals(beta[0][c], b[0][c], 1e-9 * (1 + Math.abs(beta[0][c])), "constant term");
                assertEquals(beta[3][c] / s, b[3][c], 1e-9 * Math.abs(beta[3][c] / s), "covariate coefficient");
            }
        }
    }

    static double nearest(Locations loc, double x, double y, int exclude) {
        double m = Double.POSITIVE_INFINITY;
        for (int i = 0; i < loc.size(); i++) {
            if (i != exclude) {
                m = Math.min(m, loc.distanceTo(i, x, y));
            }
        }
        return m;
    }

    @Test
    void everyPredictionCarriesItsDistanceToTheNearestStation() {
        List<Kriging> krigings = new ArrayList<>();
        KrigingOptions o = KrigingOptions.withDefaults();
        krigings.add(Kriging.ordinary(loc, data, model, o));
        krigings.add(Kriging.ordinary(loc, data, model, o.withNeighbourhood(Neighbourhood.nearest(6))));
        krigings.add(Kriging.universal(loc, data, Drift.polynomial(1), model, o.withNeighbourhood(
                Neighbourhood.radius(1.0, 20))));
        krigings.add(Kriging.simple(loc, data, TestData.K3.neutral(), model, o));
        double[][] targets = {{0.5, 0.5}, {0.03, 0.97}, {1.4, -0.2}, {loc.x(3), loc.y(3)}};
        for (Kriging k : krigings) {
            for (double[] t : targets) {
                double ref = nearest(loc, t[0], t[1], -1);
                assertEquals(ref, k.predict(t[0], t[1]).nearestStationDistance(), 1e-15, k + " at " + t[0]);
                assertEquals(ref, k.predictWithWeights(t[0], t[1]).nearestStationDistance(), 1e-15);
            }
        }
        // geographic: great-circle km
        double[] lon = {10, 10.5, 11, 10.2, 10.8, 11.3}, lat = {45, 45.2, 45.1, 45.6, 45.7, 45.4};
        Locations geo = Locations.geographic(lon, lat);
        Kriging g = Kriging.ordinary(geo, TestData.independentCoordinates(TestData.K3, 6, 4),
                VariogramModel.exponential(1, 100), o);
        assertEquals(nearest(geo, 12, 46, -1), g.predict(12, 46).nearestStationDistance(), 1e-9);
        // a block: from its nearest discretisation point
        GeometryFactory gf = new GeometryFactory();
        Polygon square = gf.createPolygon(new Coordinate[] {new Coordinate(2, 2), new Coordinate(3, 2),
            new Coordinate(3, 3), new Coordinate(2, 3), new Coordinate(2, 2)});
        double[][] pts = BlockKriging.discretise(square, 0.25);
        double ref = Double.POSITIVE_INFINITY;
        for (double[] pt : pts) {
            ref = Math.min(ref, nearest(loc, pt[0], pt[1], -1));
        }
        assertEquals(ref, krigings.get(0).predictBlock(square, 0.25).nearestStationDistance(), 1e-15);
    }

    @Test
    void gridTilesCanCarryTheDistanceToTheNearestStation() {
        Grid grid = Grid.over(-0.5, -0.5, 1.5, 1.5, 23, 19);
        KrigingOptions o = KrigingOptions.withDefaults();
        Kriging[] ks = {Kriging.ordinary(loc, data, model, o), Kriging.ordinary(loc, data, model,
            o.withNeighbourhood(Neighbourhood.nearest(5)))};
        for (Kriging k : ks) {
            for (boolean variance : new boolean[] {false, true}) { // dual form and the per-cell form
                int[] cells = {0};
                k.predictGrid(grid, GridOptions.withDefaults().withVariance(variance).withNearestDistances(true)
                        .withTileSize(8), t -> {
                            for (int q = 0; q < t.size(); q++) {
                                double x = grid.x(t.columns()[q]), y = grid.y(t.rows()[q]);
                                assertEquals(nearest(loc, x, y, -1), t.nearestDistances()[q], 1e-15);
                                cells[0]++;
                            }
                        });
                assertEquals(23 * 19, cells[0]);
                k.predictGrid(grid, GridOptions.withDefaults().withVariance(variance), t -> assertEquals(null,
                        t.nearestDistances()));
            }
        }
    }
}
