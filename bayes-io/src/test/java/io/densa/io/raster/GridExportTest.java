package io.densa.io.raster;


import static io.densa.io.IoTestSupport.rejects;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramModel;
import java.awt.image.Raster;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import javax.imageio.ImageIO;
import javax.imageio.ImageReader;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.plugins.tiff.TIFFImageReadParam;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Polygon;

/**
 * Kriged grids exported to GeoTIFF and CSV: every cell of the file (read back with the JDK's ImageIO
 * TIFF plugin) equals the point prediction of the same kriging at the cell centre, masked cells hold
 * nodata, and the georeferencing puts cell (i, j) where the grid says. Invented stations and
 * densities (seeded) — the reference is the library's own point prediction and the file formats.
 */
class GridExportTest {
    @TempDir
    Path dir;

    static Kriging kriging() {
        BayesSpace space = BayesSpace.polynomials(0, 1, 3);
        int n = 40;
        SplittableRandom rnd = new SplittableRandom(11);
        double[] x = new double[n];
        double[] y = new double[n];
        double[][] c = new double[n][3];
        for (int i = 0; i < n; i++) {
            x[i] = 1000 * rnd.nextDouble();
            y[i] = 800 * rnd.nextDouble();
            c[i][0] = 0.8 * Math.sin(x[i] / 300) + 0.1 * rnd.nextGaussian();
            c[i][1] = 0.5 * Math.cos(y[i] / 250) + 0.1 * rnd.nextGaussian();
            c[i][2] = 0.05 * rnd.nextGaussian();
        }
        return Kriging.ordinary(Locations.planar(x, y), DensitySet.of(space, c),
                VariogramModel.exponential(0.3, 300).withNugget(0.01),
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(10)));
    }

    static Polygon ellipse() {
        GeometryFactory gf = new GeometryFactory();
        Coordinate[] ring = new Coordinate[41];
        for (int k = 0; k < 40; k++) {
            double a = 2 * Math.PI * k / 40;
            ring[k] = new Coordinate(500 + 480 * Math.cos(a), 400 + 330 * Math.sin(a));
        }
        ring[40] = ring[0];
        return gf.createPolygon(ring);
    }

    @Test
    void everyCellEqualsThePointPredictionAndMaskedCellsAreNodata() throws Exception {
        Kriging k = kriging();
        Grid grid = Grid.over(0, 0, 1000, 800, 45, 37).withMask(ellipse());
        Path tif = dir.resolve("map.tif");
        Path csv = dir.resolve("cells.csv");
        double t = 0.6;
        GridExportSummary s = GridExport.of(GridBand.median(), GridBand.quantile(0.9).map(v -> 10 * v).named("q90x10"),
                GridBand.exceedance(t), GridBand.krigingSd(), GridBand.mean(),
                GridBand.of("c0", co -> co[0]))
                .toGeoTiff(tif, Crs.local("test plane, m", 9001), GeoTiffOptions.defaults().withTileSize(16)
                        .withSampleType(GeoTiffOptions.SampleType.FLOAT64))
                .toCsv(csv)
                .run(k, grid);
        ImageReader r = ImageIO.getImageReadersByFormatName("tiff").next();
        r.setInput(ImageIO.createImageInputStream(tif.toFile()));
        TIFFImageReadParam p = new TIFFImageReadParam();
        p.setReadUnknownTags(true);
        Raster px = r.read(0, p).getRaster();
        TIFFDirectory d = TIFFDirectory.createFromMetadata(r.getImageMetadata(0));
        double[] scale = d.getTIFFField(33550).getAsDoubles();
        double[] tie = d.getTIFFField(33922).getAsDoubles();
        assertEquals(1000.0 / 45, scale[0], 1e-12);
        assertEquals(800.0 / 37, scale[1], 1e-12);
        assertEquals(0, tie[3], 1e-9);
        assertEquals(800, tie[4], 1e-9);
        long inside = 0;
        for (int yy = 0; yy < 37; yy++) {
            for (int i = 0; i < 45; i++) {
                // GeoTIFF PixelIsArea: the centre of file cell (i, yy) is tie + (i + ½, yy + ½) × (sx, −sy)
                double cx = tie[3] + (i + 0.5) * scale[0];
                double cy = tie[4] - (yy + 0.5) * scale[1];
                int j = 36 - yy;
                assertEquals(grid.x(i), cx, 1e-9);
                assertEquals(grid.y(j), cy, 1e-9);
                boolean in = grid.mask().covers(new GeometryFactory().createPoint(new Coordinate(cx, cy)));
                if (!in) {
                    for (int b = 0; b < 6; b++) {
                        assertEquals(-9999, px.getSampleDouble(i, yy, b));
                    }
                    continue;
                }
                inside++;
                KrigingPrediction kp = k.predict(grid.x(i), grid.y(j));
                assertEquals(kp.density().quantile(0.5), px.getSampleDouble(i, yy, 0), 1e-9);
                assertEquals(10 * kp.density().quantile(0.9), px.getSampleDouble(i, yy, 1), 1e-8);
                assertEquals(1 - kp.density().cdf(t), px.getSampleDouble(i, yy, 2), 1e-9);
                assertEquals(Math.sqrt(kp.variance()), px.getSampleDouble(i, yy, 3), 1e-9);
                assertEquals(kp.density().mean(), px.getSampleDouble(i, yy, 4), 1e-9);
                assertEquals(kp.density().coordinates()[0], px.getSampleDouble(i, yy, 5), 1e-12);
            }
        }
        assertEquals(inside, s.cells());
        assertTrue(inside > 500 && inside < 45 * 37);
        List<String> lines = Files.readAllLines(csv, StandardCharsets.UTF_8);
        assertEquals("column,row,x,y,median,q90x10,P(X>0.6),kriging_sd,mean,c0", lines.get(0));
        assertEquals(inside + 1, lines.size());
        for (String line : lines.subList(1, lines.size())) {
            String[] f = line.split(",");
            int i = Integer.parseInt(f[0]);
            int j = Integer.parseInt(f[1]);
            assertEquals(grid.x(i), Double.parseDouble(f[2]));
            assertEquals(grid.y(j), Double.parseDouble(f[3]));
            for (int b = 0; b < 6; b++) {
                assertEquals(px.getSampleDouble(i, 36 - j, b), Double.parseDouble(f[4 + b]), "csv = tiff");
            }
        }
    }

    @Test
    void aFailingBandLeavesNoFiles() {
        Kriging k = kriging();
        Grid grid = Grid.over(0, 0, 1000, 800, 20, 20);
        Path tif = dir.resolve("bad.tif");
        Path csv = dir.resolve("bad.csv");
        rejects(() -> GridExport.of(GridBand.median().map(v -> v > 0.5 ? Double.NaN : v))
                .toGeoTiff(tif, Crs.projected(32633), GeoTiffOptions.defaults().withTileSize(16)).toCsv(csv)
                .run(k, grid), "band 'median': value NaN is not finite");
        assertFalse(Files.exists(tif));
        assertFalse(Files.exists(csv));
        assertFalse(Files.exists(dir.resolve("bad.tif.part")));
        assertFalse(Files.exists(dir.resolve("bad.csv.part")));
        rejects(() -> GridExport.of(GridBand.median(), GridBand.quantile(0.5).named("median")), "used twice");
    }

    /**
     * With intervals: the CSV's plain bands are those of the export without intervals, and each
     * interval end equals the layer {@code PredictiveDistribution.summariseGrid} gives for the same
     * cell (a band's function applied to both ends, a decreasing one swapping them).
     */
    @Test
    void intervalBandsAreTheSummariesOfTheSameCells() throws Exception {
        Kriging k = kriging();
        Grid grid = Grid.over(0, 0, 1000, 800, 20, 15);
        Path plain = dir.resolve("plain.csv");
        Path withIv = dir.resolve("intervals.csv");
        GridBand[] bands = {GridBand.median(), GridBand.exceedance(0.6).map(v -> 1 - v).named("p_below"),
            GridBand.krigingSd()};
        io.densa.spatial.uncertainty.UncertaintyOptions uo = io.densa.spatial.uncertainty.UncertaintyOptions
                .withSeed(5).withDraws(50);
        GridExport.of(bands).withParallel(false).toCsv(plain).run(k, grid);
        GridExport.of(bands).withIntervals(uo).toCsv(withIv).run(k, grid);
        List<String> a = Files.readAllLines(plain, StandardCharsets.UTF_8);
        List<String> b = Files.readAllLines(withIv, StandardCharsets.UTF_8);
        assertEquals("column,row,x,y,median,p_below,kriging_sd,median_lower,median_upper,p_below_lower,p_below_upper",
                b.get(0));
        assertEquals(a.size(), b.size());
        java.util.Map<String, double[]> layers = new java.util.HashMap<>();
        io.densa.spatial.uncertainty.PredictiveDistribution.of(k).summariseGrid(grid,
                io.densa.spatial.kriging.GridOptions.withDefaults(), uo.withQuantiles(0.5).withExceedances(0.6), u -> {
                    for (int q = 0; q < u.size(); q++) {
                        layers.put(u.tile().columns()[q] + "," + u.tile().rows()[q], new double[] {
                            u.quantiles().get(0).lowers()[q], u.quantiles().get(0).uppers()[q],
                            u.exceedances().get(0).lowers()[q], u.exceedances().get(0).uppers()[q]});
                    }
                });
        for (int i = 1; i < b.size(); i++) {
            String[] pa = a.get(i).split(",");
            String[] pb = b.get(i).split(",");
            for (int c = 0; c < 7; c++) {
                assertEquals(pa[c], pb[c], "line " + i + ", column " + c);
            }
            double[] l = layers.get(pb[0] + "," + pb[1]);
            assertEquals(l[0], Double.parseDouble(pb[7]), 0.0);
            assertEquals(l[1], Double.parseDouble(pb[8]), 0.0);
            assertEquals(1 - l[3], Double.parseDouble(pb[9]), 0.0);
            assertEquals(1 - l[2], Double.parseDouble(pb[10]), 0.0);
            assertTrue(Double.parseDouble(pb[7]) <= Double.parseDouble(pb[8]));
        }
        IllegalStateException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalStateException.class,
                () -> GridExport.of(GridBand.krigingSd()).withIntervals(uo).toCsv(withIv).run(k, grid));
        assertTrue(e.getMessage().contains("intervals need a quantile, exceedance or mean band"), e.getMessage());
        rejects(() -> GridExport.of(GridBand.median(), GridBand.mean().named("median_lower")).withIntervals(uo)
                .toCsv(withIv).run(k, grid), "used twice");
    }
}
