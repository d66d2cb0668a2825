package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.Density;
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

/** Grid prediction agrees with cell-by-cell point prediction and the space's own batch methods. */
class GridPredictionTest {
    final Locations loc = TestData.uniformSquare(200, 1, 41);
    final DensitySet data = TestData.gaussianField(TestData.K3, loc, VariogramModel.exponential(1, 0.4), 42);
    final VariogramModel model = VariogramModel.exponential(1, 0.4).withNugget(0.02);

    static List<GridTile> collect(Kriging k, Grid g, GridOptions o) {
        List<GridTile> tiles = new ArrayList<>();
        k.predictGrid(g, o, tiles::add);
        return tiles;
    }

    static Polygon triangle() {
        GeometryFactory gf = new GeometryFactory();
        return gf.createPolygon(new Coordinate[] {new Coordinate(0, 0), new Coordinate(1, 0), new Coordinate(0, 1),
            new Coordinate(0, 0)});
    }

    @Test
    void localNeighbourhoodGridEqualsPointPredictions() {
        Kriging k = Kriging.ordinary(loc, data, model,
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(12)));
        Grid g = Grid.over(-0.1, -0.1, 1.1, 1.1, 37, 29).withMask(triangle());
        double[] sum = {0};
        GridOptions o = GridOptions.withDefaults().withTileSize(8).withTailProbabilities(0.2).withQuantiles(0.5)
                .withMeans(true).withCellFunction(c -> {
                    double s = 0;
                    for (double v : c) {
                        s += v * v;
                    }
                    return s;
                });
        List<GridTile> tiles = collect(k, g, o);
        int cells = 0;
        int lastTile = -1;
        for (GridTile t : tiles) {
            int order = t.tileRow() * 5 + t.tileColumn();
            assertTrue(order > lastTile, "tiles arrive in order");
            lastTile = order;
            for (int q = 0; q < t.size(); q++) {
                double x = g.x(t.columns()[q]), y = g.y(t.rows()[q]);
                assertTrue(x + y <= 1 + 1e-12, "masked cell delivered");
                KrigingPrediction p = k.predict(x, y);
                Density pd = t.predictions().get(q);
                assertTrue(pd.equalsWithin(p.density(), 1e-12), "cell " + x + "," + y);
                assertEquals(p.variance(), t.variances()[q], 1e-12);
                assertEquals(1 - p.density().cdf(0.2), t.tailProbabilities()[0][q], 1e-9);
                assertEquals(p.density().quantile(0.5), t.quantiles()[0][q], 1e-9);
                assertEquals(p.density().mean(), t.means()[q], 1e-9);
                assertEquals(p.density().normSq(), t.cellValues()[0][q], 1e-12);
                cells++;
            }
        }
        int inside = 0;
        for (int i = 0; i < 37; i++) {
            for (int j = 0; j < 29; j++) {
                if (g.x(i) >= 0 && g.y(j) >= 0 && g.x(i) + g.y(j) <= 1) {
                    inside++;
                }
            }
        }
        assertEquals(inside, cells);
    }

    @Test
    void parallelEqualsSerialAndGlobalDualFormEqualsPointPredictions() {
        Kriging k = Kriging.universal(loc, data, Drift.polynomial(1), model,
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.radius(0.3, 20)));
        Grid g = Grid.over(0, 0, 1, 1, 30, 30);
        List<GridTile> a = collect(k, g, GridOptions.withDefaults().withTileSize(7).withParallel(true));
        List<GridTile> b = collect(k, g, GridOptions.withDefaults().withTileSize(7).withParallel(false));
        assertEquals(a.size(), b.size());
        for (int t = 0; t < a.size(); t++) {
            assertTrue(java.util.Arrays.equals(a.get(t).predictions().coordinatesRowMajor(),
                    b.get(t).predictions().coordinatesRowMajor()));
            assertTrue(java.util.Arrays.equals(a.get(t).variances(), b.get(t).variances()));
        }
        Kriging gk = Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults());
        int[] progress = {0};
        List<GridTile> dual = collect(gk, Grid.over(0, 0, 1, 1, 20, 20), GridOptions.withDefaults().withVariance(false)
                .withTileSize(16).withProgressListener((task, done, total) -> {
                    assertEquals("grid tiles", task);
                    assertEquals(4, total);
                    progress[0] = (int) done;
                }));
        assertEquals(4, progress[0]);
        Grid g2 = Grid.over(0, 0, 1, 1, 20, 20);
        for (GridTile t : dual) {
            for (int q = 0; q < t.size(); q++) {
                KrigingPrediction p = gk.predict(g2.x(t.columns()[q]), g2.y(t.rows()[q]));
                assertTrue(t.predictions().get(q).equalsWithin(p.density(), 1e-9));
            }
        }
        List<GridTile> withVar = collect(gk, Grid.over(0, 0, 1, 1, 4, 4), GridOptions.withDefaults());
        Grid g3 = Grid.over(0, 0, 1, 1, 4, 4);
        GridTile t = withVar.get(0);
        assertEquals(gk.predict(g3.x(t.columns()[5]), g3.y(t.rows()[5])).variance(), t.variances()[5], 1e-10);
    }

    @Test
    void geographicGridEqualsPointPredictions() {
        java.util.Random r = new java.util.Random(43);
        double[] lon = new double[150], lat = new double[150];
        for (int i = 0; i < 150; i++) {
            lon[i] = -10 + 20 * r.nextDouble();
            lat[i] = 35 + 25 * r.nextDouble();
        }
        Locations geo = Locations.geographic(lon, lat);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 150, 44);
        Kriging k = Kriging.ordinary(geo, d, VariogramModel.exponential(1, 800).withNugget(0.05),
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(16)));
        Grid g = Grid.over(-12, 33, 12, 62, 24, 29);
        List<GridTile> tiles = collect(k, g, GridOptions.withDefaults().withTileSize(10));
        int cells = 0;
        for (GridTile t : tiles) {
            for (int q = 0; q < t.size(); q++) {
                KrigingPrediction p = k.predict(g.x(t.columns()[q]), g.y(t.rows()[q]));
                assertTrue(t.predictions().get(q).equalsWithin(p.density(), 1e-12));
                assertEquals(p.variance(), t.variances()[q], 1e-12);
                cells++;
            }
        }
        assertEquals(24 * 29, cells);
    }

    @Test
    void badGridInputs() {
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> Grid.over(0, 0, Double.NaN, 1, 10, 10));
        assertTrue(e.getMessage().matches("grid box must be finite with min < max.*"), e.getMessage());
        org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class, () -> Grid.over(0, 0, 1, 1, 0, 5));
        e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> GridOptions.withDefaults().withQuantiles(0.5, 1));
        assertTrue(e.getMessage().matches("quantile probability 1 must be in \\(0, 1\\), got 1.0"), e.getMessage());
        org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> GridOptions.withDefaults().withTailProbabilities(Double.NaN));
        double[][] cov = new double[200][1];
        for (int i = 0; i < cov.length; i++) {
            cov[i][0] = Math.sin(i);
        }
        Kriging uk = Kriging.universal(loc, data, Drift.polynomial(1).withCovariates(cov), model,
                KrigingOptions.withDefaults());
        e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> uk.predictGrid(Grid.over(0, 0, 1, 1, 2, 2), GridOptions.withDefaults(), t -> { }));
        assertTrue(e.getMessage().matches("the drift has 1 external covariate\\(s\\): give their values at every cell.*"),
                e.getMessage());
    }
}
