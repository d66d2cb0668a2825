package io.densa.spatial.kriging;

import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.Locations;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import java.util.ArrayList;
import java.util.List;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * Kriging with an external drift on grids: a covariate known at the stations and at every cell
 * (here the distance to an invented straight road, and a raster layer) enters the universal
 * kriging drift. Checks: a drift that is exactly linear in the covariate is recovered (the
 * unbiasedness constraints make universal kriging exact for the drift), and predictions and
 * variances equal a direct EJML solve of the bordered universal kriging system
 * [C F; Fᵀ 0][λ; μ] = [c₀; f₀], σ² = C(0) − λᵀc₀ − μᵀf₀ ("A Universal Kriging predictor for
 * spatially dependent functional data of a Hilbert Space", Electron. J. Statist. 7 (2013),
 * doi:10.1214/13-EJS843 — from memory).
 */
class ExternalDriftTest {
    static final BayesSpace SPACE = BayesSpace.polynomials(0, 1, 3);

    /** Distance to the line y = 0.3 x + 0.2 (an invented road). */
    static double road(double x, double y) {
        return Math.abs(y - 0.3 * x - 0.2) / Math.hypot(0.3, 1);
    }

    static List<GridTile> tiles(Kriging kr, Grid grid, CovariateGrid cg, GridOptions o) {
        List<GridTile> out = new ArrayList<>();
        kr.predictGrid(grid, cg, o, out::add);
        return out;
    }

    @Test
    void aDriftLinearInTheCovariateIsRecoveredOnTheGrid() {
        Locations loc = TestData.uniformSquare(40, 1, 21);
        double[][] z = new double[40][1];
        double[] b0 = {0.4, -1.2, 0.3}, b1 = {-2.0, 0.5, 1.5};
        double[][] c = new double[40][3];
        for (int i = 0; i < 40; i++) {
            z[i][0] = road(loc.x(i), loc.y(i));
            for (int j = 0; j < 3; j++) {
                c[i][j] = b0[j] + b1[j] * z[i][0];
            }
        }
        Kriging kr = Kriging.universal(loc, DensitySet.of(SPACE, c), Drift.constant().withCovariates(z),
                VariogramModel.exponential(1, 0.5).withNugget(0.05), KrigingOptions.withDefaults()
                        .withNeighbourhood(Neighbourhood.nearest(10)));
        double[][] beta = kr.driftCoefficients();
        for (int j = 0; j < 3; j++) {
            assertEquals(b0[j], beta[0][j], 1e-10);
            assertEquals(b1[j], beta[1][j], 1e-10);
        }
        Grid grid = Grid.over(0, 0, 1, 1, 23, 19);
        CovariateGrid cg = CovariateGrid.of(23, 19, 1, (col, row, j) -> road(grid.x(col), grid.y(row)));
        int cells = 0;
        for (GridTile t : tiles(kr, grid, cg, GridOptions.withDefaults().withTileSize(8))) {
            for (int q = 0; q < t.size(); q++) {
                double zz = road(grid.x(t.columns()[q]), grid.y(t.rows()[q]));
                for (int j = 0; j < 3; j++) {
                    assertEquals(b0[j] + b1[j] * zz, t.predictions().coordinate(q, j), 1e-9);
                }
                cells++;
            }
        }
        assertEquals(23 * 19, cells);
    }

    @Test
    void gridPredictionsEqualTheDirectUniversalKrigingSolve() {
        int n = 30;
        Locations loc = TestData.uniformSquare(n, 1, 31);
        double[][] z = new double[n][1];
        for (int i = 0; i < n; i++) {
            z[i][0] = road(loc.x(i), loc.y(i));
        }
        DensitySet data = TestData.independentCoordinates(SPACE, n, 32);
        VariogramModel model = VariogramModel.spherical(0.8, 0.7).withNugget(0.1);
        Kriging kr = Kriging.universal(loc, data, Drift.polynomial(1).withCovariates(z), model,
                KrigingOptions.withDefaults());
        int nx = 7, ny = 5;
        Grid grid = Grid.over(0, 0, 1, 1, nx, ny);
        double[] layer = new double[nx * ny];
        for (int r = 0; r < ny; r++) {
            for (int col = 0; col < nx; col++) {
                layer[r * nx + col] = road(grid.x(col), grid.y(r));
            }
        }
        CovariateGrid cg = CovariateGrid.ofLayers(nx, ny, layer);
        // the bordered system with drift functions 1, x, y, covariate (any basis of their span)
        int p = 4, m = n + p;
        DMatrixRMaj a = new DMatrixRMaj(m, m);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                a.set(i, j, i == j ? model.sill() : model.covariance(loc.distance(i, j)));
            }
            double[] f = {1, loc.x(i), loc.y(i), z[i][0]};
            for (int l = 0; l < p; l++) {
                a.set(i, n + l, f[l]);
                a.set(n + l, i, f[l]);
            }
        }
        DMatrixRMaj y = data.coordinateMatrix();
        int checked = 0;
        for (GridTile t : tiles(kr, grid, cg, GridOptions.withDefaults().withTileSize(3))) {
            for (int q = 0; q < t.size(); q++) {
                double gx = grid.x(t.columns()[q]), gy = grid.y(t.rows()[q]);
                DMatrixRMaj rhs = new DMatrixRMaj(m, 1);
                for (int i = 0; i < n; i++) {
                    rhs.set(i, model.covariance(Math.hypot(loc.x(i) - gx, loc.y(i) - gy)));
                }
                double[] f0 = {1, gx, gy, road(gx, gy)};
                for (int l = 0; l < p; l++) {
                    rhs.set(n + l, f0[l]);
                }
                DMatrixRMaj sol = new DMatrixRMaj(m, 1);
                assertTrue(CommonOps_DDRM.solve(a, rhs, sol));
                double var = model.sill();
                for (int i = 0; i < m; i++) {
                    var -= sol.get(i) * rhs.get(i);
                }
                assertEquals(var, t.variances()[q], 1e-9);
                for (int j = 0; j < SPACE.dimension(); j++) {
                    double pred = 0;
                    for (int i = 0; i < n; i++) {
                        pred += sol.get(i) * y.get(i, j);
                    }
                    assertEquals(pred, t.predictions().coordinate(q, j), 1e-9);
                }
                checked++;
            }
        }
        assertEquals(nx * ny, checked);
        // the dual form (global neighbourhood, no variance) gives the same predictions
        List<GridTile> withVar = tiles(kr, grid, cg, GridOptions.withDefaults());
        List<GridTile> dual = tiles(kr, grid, cg, GridOptions.withDefaults().withVariance(false));
        for (int t = 0; t < withVar.size(); t++) {
            for (int q = 0; q < withVar.get(t).size(); q++) {
                for (int j = 0; j < SPACE.dimension(); j++) {
                    assertEquals(withVar.get(t).predictions().coordinate(q, j), dual.get(t).predictions()
                            .coordinate(q, j), 1e-9);
                }
            }
        }
    }

    @Test
    void covariateGridsAreChecked() {
        Locations loc = TestData.uniformSquare(20, 1, 41);
        double[][] z = new double[20][1];
        for (int i = 0; i < 20; i++) {
            z[i][0] = road(loc.x(i), loc.y(i));
        }
        DensitySet data = TestData.independentCoordinates(SPACE, 20, 42);
        VariogramModel model = VariogramModel.exponential(1, 0.5);
        Kriging ked = Kriging.universal(loc, data, Drift.constant().withCovariates(z), model,
                KrigingOptions.withDefaults());
        Kriging ok = Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults());
        Grid grid = Grid.over(0, 0, 1, 1, 4, 3);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ked.predictGrid(grid, CovariateGrid.ofLayers(3, 4, new double[12]), GridOptions.withDefaults(),
                        t -> { }));
        assertTrue(e.getMessage().contains("3 x 4 cells but the prediction grid has 4 x 3"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> ok.predictGrid(grid,
                CovariateGrid.ofLayers(4, 3, new double[12]), GridOptions.withDefaults(), t -> { }));
        assertTrue(e.getMessage().contains("no external covariates"), e.getMessage());
        double[] bad = new double[12];
        bad[7] = Double.NaN;
        e = assertThrows(IllegalArgumentException.class, () -> ked.predictGrid(grid, CovariateGrid.ofLayers(4, 3, bad),
                GridOptions.withDefaults(), t -> { }));
        assertTrue(e.getMessage().contains("at grid cell (column 3, row 1) is not finite"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> ked.predictGrid(grid,
                CovariateGrid.ofLayers(4, 3, new double[12], new double[12]), GridOptions.withDefaults(), t -> { }));
        assertTrue(e.getMessage().contains("2 covariate(s) but the drift has 1"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> CovariateGrid.ofLayers(4, 3, new double[11]));
        assertThrows(IllegalArgumentException.class, () -> CovariateGrid.of(0, 3, 1, (c, r, j) -> 0));
        // the predictive distribution takes the covariate grid too
        PredictiveDistribution pd = PredictiveDistribution.of(ked);
        int[] cells = {0};
        pd.summariseGrid(grid, CovariateGrid.of(4, 3, 1, (c, r, j) -> road(grid.x(c), grid.y(r))),
                GridOptions.withDefaults(), UncertaintyOptions.withSeed(3).withDraws(20).withQuantiles(0.5),
                t -> cells[0] += t.size());
        assertEquals(12, cells[0]);
    }
}
