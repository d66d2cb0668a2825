package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.io.raster.GeoTiffOptions;
import io.densa.spatial.kriging.GridTile;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramModel;
import java.awt.image.Raster;
import java.io.File;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import javax.imageio.ImageIO;
import javax.imageio.ImageReader;
import javax.imageio.stream.ImageInputStream;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Polygon;

/**
 * Grid kriging by tiles in Spark tasks against {@link io.densa.spatial.kriging.Kriging#predictGrid} on one
 * machine, cell by cell and bit for bit (coordinates and every derived map), with a mask and with one
 * against several tasks; GeoTIFF tiles read back with the JDK's own TIFF reader (javax.imageio,
 * an implementation independent of ours) hold the same values as float32.
 */
class SparkKrigingTest {
    static final BayesSpace SPACE = BayesSpace.splines(0, 10, 3, 2); // K = 4

    /** Invented stations: 60 in [0, 50] × [0, 30], coordinates a smooth field plus noise. */
    static LocationData stations() {
        SplittableRandom rnd = new SplittableRandom(41);
        int n = 60;
        double[] x = new double[n];
        double[] y = new double[n];
        double[][] c = new double[n][4];
        for (int i = 0; i < n; i++) {
            x[i] = 50 * rnd.nextDouble();
            y[i] = 30 * rnd.nextDouble();
            for (int j = 0; j < 4; j++) {
                c[i][j] = 0.5 * Math.sin(x[i] / (8 + 2 * j)) + 0.4 * Math.cos(y[i] / 6) + 0.1 * SparkDensitiesTest.gaussian(rnd);
            }
        }
        return LocationData.of(Locations.planar(x, y), DensitySet.of(SPACE, c));
    }

    static Polygon mask() {
        GeometryFactory gf = new GeometryFactory();
        return gf.createPolygon(new Coordinate[] {new Coordinate(0, 0), new Coordinate(50, 0), new Coordinate(50, 20),
            new Coordinate(20, 30), new Coordinate(0, 30), new Coordinate(0, 0)});
    }

    static String key(int c, int r) {
        return c + "," + r;
    }

    @Test
    void tilesOnTasksGiveTheSingleMachineGridBitForBit() {
        KrigingSpec model = KrigingSpec.ordinary(stations(), VariogramModel.exponential(0.3, 15).withNugget(0.01),
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(12)));
        GridSpec grid = GridSpec.over(0, 0, 50, 30, 70, 45).withMask(mask()).withTileSize(16).withMeans(true)
                .withQuantiles(0.25, 0.5).withTailProbabilities(6.0).withNearestDistances(true);
        Map<String, double[]> local = new HashMap<>();
        model.kriging().predictGrid(grid.grid(), grid.options(), (GridTile t) -> {
            for (int i = 0; i < t.size(); i++) {
                double[] c = t.predictions().get(i).coordinates();
                double[] v = new double[c.length + 6];
                System.arraycopy(c, 0, v, 0, c.length);
                v[c.length] = t.variances()[i];
                v[c.length + 1] = t.means()[i];
                v[c.length + 2] = t.quantiles()[0][i];
                v[c.length + 3] = t.quantiles()[1][i];
                v[c.length + 4] = t.tailProbabilities()[0][i];
                v[c.length + 5] = t.nearestDistances()[i];
                local.put(key(t.columns()[i], t.rows()[i]), v);
            }
        });
        List<Row> three = SparkErrors.run(() -> SparkKriging.cells(SparkTestSession.get(), model, grid, 3, true)
                .collectAsList());
        List<Row> one = SparkErrors.run(() -> SparkKriging.cells(SparkTestSession.get(), model, grid, 1, true)
                .collectAsList());
        assertEquals(local.size(), three.size());
        assertTrue(local.size() < 70 * 45, "the mask removes cells");
        for (int i = 0; i < three.size(); i++) {
            Row r = three.get(i);
            double[] v = local.get(key(r.getInt(2), r.getInt(3)));
            assertNotNull(v);
            assertEquals(grid.grid().x(r.getInt(2)), r.getDouble(4), 0.0);
            assertEquals(grid.grid().y(r.getInt(3)), r.getDouble(5), 0.0);
            assertArrayEquals(java.util.Arrays.copyOf(v, 4), SparkRows.doubles(r, 6), 0.0);
            assertEquals(v[4], r.getDouble(7), 0.0);
            assertEquals(v[5], r.getDouble(8), 0.0);
            assertArrayEquals(new double[] {v[6], v[7]}, SparkRows.doubles(r, 9), 0.0);
            assertEquals(v[8], SparkRows.doubles(r, 10)[0], 0.0);
            assertEquals(v[9], r.getDouble(11), 0.0);
            assertEquals(r, one.get(i), "3 tasks against 1 (same tile order)");
        }
    }

    @Test
    void geoTiffTilesHoldThePredictedMaps(@TempDir Path dir) throws Exception {
        KrigingSpec model = KrigingSpec.universal(stations(), 1, VariogramModel.spherical(0.3, 20),
                KrigingOptions.withDefaults());
        GridSpec grid = GridSpec.over(0, 0, 50, 30, 40, 24).withTileSize(16).withMeans(true);
        List<SparkKriging.TileFile> files = SparkKriging.writeGeoTiffTiles(SparkTestSession.get(), model, grid, 2,
                dir.resolve("tiles").toString(), 32633, false, GeoTiffOptions.Compression.DEFLATE);
        assertEquals(3 * 2, files.size());
        long cells = 0;
        for (SparkKriging.TileFile f : files) {
            cells += f.cells();
            assertTrue(Files.size(Path.of(f.file())) > 0);
        }
        assertEquals(40 * 24, cells);
        Map<String, double[]> local = new HashMap<>();
        model.kriging().predictGrid(grid.grid(), grid.options(), t -> {
            for (int i = 0; i < t.size(); i++) {
                local.put(key(t.columns()[i], t.rows()[i]), new double[] {t.variances()[i], t.means()[i]});
            }
        });
        // tile row 1, column 2: columns 32..39, rows 16..23 (row 0 of the file is grid row 23, the north)
        Raster raster = read(new File(dir.resolve("tiles").toFile(), "tile_r1_c2.tif"));
        assertEquals(8, raster.getWidth());
        assertEquals(8, raster.getHeight());
        for (int fr = 0; fr < 8; fr++) {
            for (int fc = 0; fc < 8; fc++) {
                double[] v = local.get(key(32 + fc, 23 - fr));
                assertEquals((float) v[0], raster.getSampleFloat(fc, fr, 0), 0.0f);
                assertEquals((float) v[1], raster.getSampleFloat(fc, fr, 1), 0.0f);
            }
        }
    }

    /**
     * Intervals of the derived maps on tasks against {@link PredictiveDistribution#summariseGrid} on one
     * machine, bit for bit (a cell's draws depend only on its column and row), with the grid's variance
     * map off (the intervals' pass computes it but the column stays out), and the interval ends as
     * GeoTIFF bands after the plain maps.
     */
    @Test
    void intervalsOnTasksGiveTheSingleMachineIntervalsBitForBit(@TempDir Path dir) throws Exception {
        KrigingSpec model = KrigingSpec.ordinary(stations(), VariogramModel.exponential(0.3, 15).withNugget(0.01),
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(12)));
        GridSpec grid = GridSpec.over(0, 0, 50, 30, 40, 24).withTileSize(16).withVariance(false).withMeans(true)
                .withQuantiles(0.5, 0.9).withTailProbabilities(6.0);
        IntervalSpec intervals = IntervalSpec.withSeed(11).withDraws(40).withLevel(0.8);
        Map<String, double[]> local = new HashMap<>();
        UncertaintyOptions uo = UncertaintyOptions.withSeed(11).withDraws(40).withLevel(0.8).withQuantiles(0.5, 0.9)
                .withExceedances(6.0).withMean(true);
        PredictiveDistribution.of(model.kriging()).summariseGrid(grid.grid(), grid.options(), uo, u -> {
            for (int i = 0; i < u.size(); i++) {
                local.put(key(u.tile().columns()[i], u.tile().rows()[i]), new double[] {u.tile().means()[i],
                    u.quantiles().get(0).lowers()[i], u.quantiles().get(1).lowers()[i],
                    u.quantiles().get(0).uppers()[i], u.quantiles().get(1).uppers()[i],
                    u.exceedances().get(0).lowers()[i], u.exceedances().get(0).uppers()[i],
                    u.mean().lowers()[i], u.mean().uppers()[i]});
            }
        });
        Dataset<Row> cells = SparkKriging.cells(SparkTestSession.get(), model, grid, intervals, 3, false);
        assertEquals(List.of("tile_column", "tile_row", "column", "row", "x", "y", "mean", "quantiles",
                "tail_probabilities", "quantile_lower", "quantile_upper", "tail_probability_lower",
                "tail_probability_upper", "mean_lower", "mean_upper"), List.of(cells.columns()));
        List<Row> rows = SparkErrors.run(cells::collectAsList);
        assertEquals(40 * 24, rows.size());
        int ordered = 0;
        for (Row r : rows) {
            double[] v = local.get(key(r.getInt(2), r.getInt(3)));
            assertEquals(v[0], r.getDouble(6), 0.0);
            assertArrayEquals(new double[] {v[1], v[2]}, SparkRows.doubles(r, 9), 0.0);
            assertArrayEquals(new double[] {v[3], v[4]}, SparkRows.doubles(r, 10), 0.0);
            assertEquals(v[5], SparkRows.doubles(r, 11)[0], 0.0);
            assertEquals(v[6], SparkRows.doubles(r, 12)[0], 0.0);
            assertEquals(v[7], r.getDouble(13), 0.0);
            assertEquals(v[8], r.getDouble(14), 0.0);
            ordered += v[1] <= v[3] && v[5] <= v[6] && v[7] <= v[8] ? 1 : 0;
        }
        assertEquals(rows.size(), ordered, "every interval's lower end at most its upper end");

        List<SparkKriging.TileFile> files = SparkKriging.writeGeoTiffTiles(SparkTestSession.get(), model, grid,
                intervals, 2, dir.resolve("tiles").toString(), 32633, false, GeoTiffOptions.Compression.NONE);
        assertEquals(3 * 2, files.size());
        Raster raster = read(new File(dir.resolve("tiles").toFile(), "tile_r1_c2.tif"));
        assertEquals(1 + 2 + 1 + 2 * 4, raster.getNumBands(), "mean, 2 quantiles, 1 tail probability, 4 intervals");
        for (int fr = 0; fr < 8; fr++) {
            for (int fc = 0; fc < 8; fc++) {
                double[] v = local.get(key(32 + fc, 23 - fr));
                assertEquals((float) v[1], raster.getSampleFloat(fc, fr, 4), 0.0f, "quantile_0.5_lower");
                assertEquals((float) v[4], raster.getSampleFloat(fc, fr, 7), 0.0f, "quantile_0.9_upper");
                assertEquals((float) v[6], raster.getSampleFloat(fc, fr, 9), 0.0f, "p_above_6.0_upper");
                assertEquals((float) v[8], raster.getSampleFloat(fc, fr, 11), 0.0f, "mean_upper");
            }
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SparkKriging.cells(
                SparkTestSession.get(), model, GridSpec.over(0, 0, 50, 30, 4, 4), intervals, 1, false));
        assertTrue(e.getMessage().startsWith("intervals need a quantity"), e.getMessage());
    }

    static Raster read(File f) throws Exception {
        try (ImageInputStream in = ImageIO.createImageInputStream(f)) {
            ImageReader r = ImageIO.getImageReadersByFormatName("tiff").next();
            r.setInput(in);
            return r.read(0).getRaster();
        }
    }

    @Test
    void gridWithoutMapsToWriteIsRejected() {
        KrigingSpec model = KrigingSpec.ordinary(stations(), VariogramModel.exponential(0.3, 15),
                KrigingOptions.withDefaults());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SparkKriging.writeGeoTiffTiles(
                SparkTestSession.get(), model, GridSpec.over(0, 0, 1, 1, 4, 4).withVariance(false), 1, "unused", 32633,
                false, GeoTiffOptions.Compression.NONE));
        assertTrue(e.getMessage().startsWith("the grid spec derives no map to write"), e.getMessage());
    }
}
