package io.densa.spatial.uncertainty;

import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.Locations;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Behaviour of {@link PredictiveDistribution}: streams, tiling, units, edges and bad input. */
class PredictiveDistributionTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 4);

    static Kriging kriging(Neighbourhood hood) {
        Locations loc = TestData.uniformSquare(40, 1, 3);
        int k = SPACE.dimension();
        double[] mean = NodeRuleAccuracyTest.bump(SPACE, 0.45, 0.12);
        double[] shift = NodeRuleAccuracyTest.bump(SPACE, 0.47, 0.12);
        double[][] a = new double[k][2];
        double tr = 0;
        for (int i = 0; i < k; i++) {
            a[i][0] = shift[i] - mean[i];
            a[i][1] = 0.02 * Math.sin(i + 1.0);
            tr += a[i][0] * a[i][0] + a[i][1] * a[i][1];
        }
        for (double[] row : a) {
            row[0] /= Math.sqrt(tr);
            row[1] /= Math.sqrt(tr);
        }
        VariogramModel model = VariogramModel.exponential(0.5, 0.6).withNugget(0.01);
        double[][] c = ProportionalFields.sample(loc, model, mean, a, 4);
        return Kriging.ordinary(loc, DensitySet.of(SPACE, c), model,
                KrigingOptions.withDefaults().withNeighbourhood(hood));
    }

    static UncertaintyOptions options() {
        return UncertaintyOptions.withSeed(77).withDraws(60).withQuantiles(0.5, 0.95).withExceedances(0.55)
                .withMean(true);
    }

    static List<double[]> collect(PredictiveDistribution pd, Grid grid, GridOptions go, UncertaintyOptions o) {
        List<double[]> cells = new ArrayList<>();
        pd.summariseGrid(grid, go, o, t -> add(cells, t));
        cells.sort((x, y) -> x[1] != y[1] ? Double.compare(x[1], y[1]) : Double.compare(x[0], y[0]));
        return cells;
    }

    /** The tile's cells as rows: column, row, then estimate, mean, sd, lower, upper of each layer. */
    static void add(List<double[]> cells, UncertaintyTile t) {
        List<IntervalLayer> all = new ArrayList<>(t.quantiles());
        all.addAll(t.exceedances());
        all.add(t.mean());
        for (int q = 0; q < t.size(); q++) {
            double[] row = new double[2 + 5 * all.size()];
            row[0] = t.tile().columns()[q];
            row[1] = t.tile().rows()[q];
            int o2 = 2;
            for (IntervalLayer l : all) {
                row[o2++] = l.estimates()[q];
                row[o2++] = l.means()[q];
                row[o2++] = l.sds()[q];
                row[o2++] = l.lowers()[q];
                row[o2++] = l.uppers()[q];
            }
            cells.add(row);
        }
    }

    @Test
    void tileRangesReproduceTheWholeGridBitForBit() {
        PredictiveDistribution pd = PredictiveDistribution.of(kriging(Neighbourhood.nearest(12)));
        Grid grid = Grid.over(0, 0, 1, 1, 17, 13);
        GridOptions go = GridOptions.withDefaults().withTileSize(5);
        List<double[]> whole = collect(pd, grid, go, options());
        int tiles = io.densa.spatial.kriging.GridTiles.tileCount(grid, go);
        assertEquals(12, tiles);
        List<double[]> parts = new ArrayList<>();
        for (int[] r : new int[][] {{0, 5}, {5, 6}, {6, 12}}) {
            pd.summariseTiles(grid, null, go, options(), r[0], r[1], t -> add(parts, t));
        }
        parts.sort((x, y) -> x[1] != y[1] ? Double.compare(x[1], y[1]) : Double.compare(x[0], y[0]));
        assertEquals(whole.size(), parts.size());
        for (int i = 0; i < whole.size(); i++) {
            assertArrayEquals(whole.get(i), parts.get(i), 0.0, "cell " + i);
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> pd.summariseTiles(grid, null, go, options(), 3, 13, t -> { }));
        assertTrue(e.getMessage().contains("tile range [3, 13)"), e.getMessage());
    }

    @Test
    void gridResultsDependNeitherOnThreadsNorOnTiles() {
        PredictiveDistribution pd = PredictiveDistribution.of(kriging(Neighbourhood.nearest(12)));
        Grid grid = Grid.over(0, 0, 1, 1, 17, 13);
        List<double[]> a = collect(pd, grid, GridOptions.withDefaults().withTileSize(64), options());
        List<double[]> b = collect(pd, grid, GridOptions.withDefaults().withTileSize(5).withParallel(false),
                options().withParallel(false));
        assertEquals(17 * 13, a.size());
        for (int i = 0; i < a.size(); i++) {
            assertArrayEquals(a.get(i), b.get(i), 0.0, "cell " + i);
        }
    }

    @Test
    void gridCellEqualsTheLocationWithTheCellsStream() {
        PredictiveDistribution pd = PredictiveDistribution.of(kriging(Neighbourhood.nearest(12)));
        int nx = 9, ny = 7;
        Grid grid = Grid.over(0, 0, 1, 1, nx, ny);
        List<double[]> cells = collect(pd, grid, GridOptions.withDefaults(), options());
        double[] xs = new double[nx * ny], ys = new double[nx * ny];
        for (int r = 0; r < ny; r++) {
            for (int c = 0; c < nx; c++) {
                xs[r * nx + c] = grid.x(c);
                ys[r * nx + c] = grid.y(r);
            }
        }
        List<LocationUncertainty> locs = pd.summarise(xs, ys, null, options());
        for (int i = 0; i < nx * ny; i++) {
            LocationUncertainty u = locs.get(i);
            double[] row = cells.get(i);
            DerivedInterval med = u.quantiles().get(0);
            assertEquals(med.estimate(), row[2], 1e-12);
            assertEquals(med.lower(), row[5], 1e-12);
            assertEquals(med.upper(), row[6], 1e-12);
            assertEquals(u.mean().sd(), row[2 + 5 * 3 + 2], 1e-12);
        }
        assertEquals(locs.get(0), pd.summarise(xs[0], ys[0], options()), "stream 0 for a single location");
    }

    @Test
    void nodeRuleAgreesWithExactEvaluation() {
        PredictiveDistribution pd = PredictiveDistribution.of(kriging(Neighbourhood.global()));
        double[] xs = {0.13, 0.5, 0.91}, ys = {0.2, 0.52, 0.77};
        List<LocationUncertainty> node = pd.summarise(xs, ys, null, options());
        List<LocationUncertainty> exact = pd.summarise(xs, ys, null,
                options().withEvaluation(UncertaintyOptions.Evaluation.EXACT));
        for (int i = 0; i < xs.length; i++) {
            assertEquals(61, exact.get(i).exactDraws());
            for (int q = 0; q < 2; q++) {
                DerivedInterval a = node.get(i).quantiles().get(q), b = exact.get(i).quantiles().get(q);
                assertEquals(b.estimate(), a.estimate(), 5e-5);
                assertEquals(b.lower(), a.lower(), 5e-5);
                assertEquals(b.upper(), a.upper(), 5e-5);
            }
            DerivedInterval a = node.get(i).exceedances().get(0), b = exact.get(i).exceedances().get(0);
            assertEquals(b.mean(), a.mean(), 2e-5);
            assertEquals(b.sd(), a.sd(), 2e-5);
            assertEquals(exact.get(i).mean().mean(), node.get(i).mean().mean(), 2e-5);
        }
    }

    @Test
    void dataUnitsTransformQuantilesAndTheMean() {
        PredictiveDistribution pd = PredictiveDistribution.of(kriging(Neighbourhood.global()));
        UncertaintyOptions o = options().withDataUnits(Math::exp);
        LocationUncertainty raw = pd.summarise(0.3, 0.6, options());
        LocationUncertainty units = pd.summarise(0.3, 0.6, o);
        assertEquals(Math.exp(raw.quantiles().get(0).estimate()), units.quantiles().get(0).estimate(), 1e-12);
        assertEquals(raw.exceedances().get(0), units.exceedances().get(0), "exceedances are not transformed");
        // E[exp X] of the kriged density, by the space's quadrature (∫ e^x f(x) dx)
        Density d = raw.law().prediction().density();
        double expected = SPACE.integrate(x -> Math.exp(x) * d.pdf(x));
        assertEquals(expected, units.mean().estimate(), 2e-6);
        assertThrows(IllegalArgumentException.class, () -> pd.summarise(0.3, 0.6, options().withDataUnits(x -> -x)));
    }

    @Test
    void atAStationWithoutNuggetTheIntervalsCollapse() {
        Locations loc = TestData.uniformSquare(12, 1, 8);
        DensitySet data = TestData.independentCoordinates(BayesSpace.polynomials(0, 1, 2), 12, 9);
        Kriging kr = Kriging.ordinary(loc, data, VariogramModel.exponential(1, 0.5), KrigingOptions.withDefaults());
        PredictiveDistribution pd = PredictiveDistribution.of(kr);
        LocationUncertainty u = pd.summarise(loc.x(3), loc.y(3), UncertaintyOptions.withSeed(1).withQuantiles(0.5));
        DerivedInterval m = u.quantiles().get(0);
        assertEquals(data.get(3).quantile(0.5), m.estimate(), 1e-6);
        assertEquals(m.estimate(), m.lower(), 1e-6);
        assertEquals(m.estimate(), m.upper(), 1e-6);
        assertEquals(0, m.sd(), 1e-6);
        assertNull(u.mean());
    }

    @Test
    void scaledIntervalsCountDays() {
        DerivedInterval p = new DerivedInterval(0.1, 0.11, 0.02, 0.08, 0.14, 0.9, 200);
        DerivedInterval days = p.scaled(365);
        assertEquals(36.5, days.estimate(), 1e-12);
        assertEquals(365 * 0.06, days.width(), 1e-9);
        assertThrows(IllegalArgumentException.class, () -> p.scaled(0));
        assertThrows(IllegalArgumentException.class, () -> p.scaled(Double.NaN));
    }

    @Test
    void badInputIsNamed() {
        Kriging kr = kriging(Neighbourhood.global());
        PredictiveDistribution pd = PredictiveDistribution.of(kr);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> pd.summarise(0.5, 0.5, UncertaintyOptions.withSeed(1)));
        assertTrue(e.getMessage().contains("no quantity"), e.getMessage());
        int k = SPACE.dimension();
        double[][] asym = new double[k][k];
        for (int i = 0; i < k; i++) {
            asym[i][i] = 1;
        }
        asym[0][1] = 0.5;
        e = assertThrows(IllegalArgumentException.class, () -> PredictiveDistribution.of(kr, asym));
        assertTrue(e.getMessage().contains("not symmetric"), e.getMessage());
        double[][] neg = new double[k][k];
        neg[0][0] = 1;
        neg[1][1] = -0.5;
        e = assertThrows(IllegalArgumentException.class, () -> PredictiveDistribution.of(kr, neg));
        assertTrue(e.getMessage().contains("positive semi-definite"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> pd.summarise(new double[2], new double[3], null, options()));
        assertThrows(IllegalArgumentException.class, () -> UncertaintyOptions.withSeed(1).withLevel(1));
        assertThrows(IllegalArgumentException.class, () -> UncertaintyOptions.withSeed(1).withDraws(5));
        assertThrows(IllegalArgumentException.class, () -> UncertaintyOptions.withSeed(1).withQuantiles(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> UncertaintyOptions.withSeed(1).withExceedances(
                Double.POSITIVE_INFINITY));
        assertThrows(IllegalArgumentException.class, () -> pd.summarise(Double.NaN, 0.5, options()));
    }

    @Test
    void givenCovarianceIsUsedUpToScale() {
        Kriging kr = kriging(Neighbourhood.global());
        int k = SPACE.dimension();
        double[][] s = new double[k][k];
        for (int i = 0; i < k; i++) {
            s[i][i] = 3.0 * (i + 1);
        }
        PredictiveDistribution pd = PredictiveDistribution.of(kr, s);
        double tr = 3.0 * k * (k + 1) / 2;
        for (int i = 0; i < k; i++) {
            assertEquals(3.0 * (i + 1) / tr, pd.shape()[i][i], 1e-15);
        }
        assertEquals(k, pd.rank());
        assertEquals(3.0 * k / tr, pd.shapeEigenvalues()[0], 1e-12);
    }
}
