package io.densa.io.raster;

import io.densa.core.ProgressListener;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.GridTile;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.uncertainty.IntervalLayer;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import io.densa.spatial.uncertainty.UncertaintyTile;
import java.io.BufferedWriter;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;

/**
 * Kriges a grid and writes chosen bands — predicted quantiles, exceedance probabilities, means,
 * kriging uncertainty — to a GeoTIFF ({@link GeoTiffWriter}) and/or a CSV cell table, in one
 * streaming pass of {@link Kriging#predictGrid}: tiles are written as they arrive, so memory holds a
 * batch of prediction tiles plus at most two rows of file tiles, never the grid.
 *
 * <p>The prediction tile size is the GeoTIFF tile size ({@link GeoTiffOptions#tileSize()}, default
 * 64). Cells outside the grid's mask are not predicted: nodata in the GeoTIFF, absent from the CSV.
 * The CSV (RFC 4180) has the columns {@code column,row,x,y} and one per band, a row per predicted
 * cell in delivery order (tiles in order, cells row-major within a tile); rows are numbered as in
 * {@link Grid} (0 = south) and x, y are cell centres. Both files are written under a temporary name
 * and moved into place at the end; a failure leaves neither.
 *
 * <p>Example:
 * <pre>{@code
 * GridExportSummary s = GridExport.of(GridBand.median().map(Math::exp).named("median_ugm3"),
 *                 GridBand.exceedance(Math.log(15)).named("p_above_15"), GridBand.krigingSd())
 *         .toGeoTiff(Path.of("map.tif"), Crs.projected(32633), GeoTiffOptions.defaults())
 *         .toCsv(Path.of("cells.csv"))
 *         .run(kriging, grid);
 * }</pre>
 *
 * <p>With {@link #withIntervals}, every quantile, exceedance and mean band also gets the two ends of
 * its Monte Carlo interval as bands {@code <name>_lower} and {@code <name>_upper}, after all the
 * plain bands, from {@link PredictiveDistribution#summariseGrid} in the same streaming pass.
 *
 * <p>Immutable; {@link #run} may be called again (it overwrites the files).
 */
public final class GridExport {
    private final List<GridBand> bands;
    private final Path tiff;
    private final Crs crs;
    private final GeoTiffOptions tiffOptions;
    private final Path csv;
    private final boolean parallel;
    private final ProgressListener listener;
    private final UncertaintyOptions intervals;

    private GridExport(List<GridBand> bands, Path tiff, Crs crs, GeoTiffOptions tiffOptions, Path csv,
            boolean parallel, ProgressListener listener, UncertaintyOptions intervals) {
        this.bands = bands;
        this.tiff = tiff;
        this.crs = crs;
        this.tiffOptions = tiffOptions;
        this.csv = csv;
        this.parallel = parallel;
        this.listener = listener;
        this.intervals = intervals;
    }

    /** An export of these bands (names distinct), to targets still to be chosen. */
    public static GridExport of(GridBand... bands) {
        Objects.requireNonNull(bands, "bands");
        if (bands.length == 0) {
            throw new IllegalArgumentException("give at least one band");
        }
        List<String> names = new ArrayList<>();
        for (GridBand b : bands) {
            Objects.requireNonNull(b, "band");
            if (names.contains(b.name())) {
                throw new IllegalArgumentException("band name '" + b.name() + "' is used twice; rename one (named)");
            }
            names.add(b.name());
        }
        return new GridExport(List.of(bands), null, null, GeoTiffOptions.defaults(), null, true,
                ProgressListener.NONE, null);
    }

    /** Also write a GeoTIFF. */
    public GridExport toGeoTiff(Path file, Crs c, GeoTiffOptions options) {
        return new GridExport(bands, Objects.requireNonNull(file, "file"), Objects.requireNonNull(c, "crs"),
                Objects.requireNonNull(options, "options"), csv, parallel, listener, intervals);
    }

    /** Also write a CSV cell table. */
    public GridExport toCsv(Path file) {
        return new GridExport(bands, tiff, crs, tiffOptions, Objects.requireNonNull(file, "file"), parallel,
                listener, intervals);
    }

    /** Whether prediction tiles are computed in parallel (the files are identical either way). */
    public GridExport withParallel(boolean p) {
        return new GridExport(bands, tiff, crs, tiffOptions, csv, p, listener, intervals);
    }

    /** With a progress listener for the prediction ({@link GridOptions#withProgressListener}). */
    public GridExport withProgressListener(ProgressListener l) {
        return new GridExport(bands, tiff, crs, tiffOptions, csv, parallel, Objects.requireNonNull(l, "listener"),
                intervals);
    }

    /**
     * Also writes, for every quantile, exceedance and mean band, the two ends of its Monte Carlo
     * interval ({@link PredictiveDistribution#of(Kriging)}: the coordinate covariance shape from the
     * kriging data's drift residuals) as bands {@code <name>_lower} and {@code <name>_upper} after the
     * plain bands; a band's function maps both ends (their order kept for a decreasing one). The
     * options give the seed, draws, level and evaluation; their quantities are replaced by the
     * bands'. The plain bands keep their values.
     */
    public GridExport withIntervals(UncertaintyOptions options) {
        return new GridExport(bands, tiff, crs, tiffOptions, csv, parallel, listener,
                Objects.requireNonNull(options, "options"));
    }

    /** Whether band b has an interval (with {@link #withIntervals}). */
    private boolean hasInterval(GridBand b) {
        return intervals != null && (b.kind == GridBand.Kind.QUANTILE || b.kind == GridBand.Kind.EXCEEDANCE
                || b.kind == GridBand.Kind.MEAN);
    }

    /** The prediction options this export uses, with the index of each band's quantity. */
    private GridOptions options(int[] index) {
        Map<Double, Integer> q = new LinkedHashMap<>();
        Map<Double, Integer> t = new LinkedHashMap<>();
        boolean variance = false, means = false;
        GridOptions o = GridOptions.withDefaults().withTileSize(tiffOptions.tileSize()).withParallel(parallel)
                .withProgressListener(listener);
        int functions = 0;
        for (int b = 0; b < bands.size(); b++) {
            GridBand band = bands.get(b);
            switch (band.kind) {
                case QUANTILE:
                    index[b] = q.computeIfAbsent(band.parameter, k -> q.size());
                    break;
                case EXCEEDANCE:
                    index[b] = t.computeIfAbsent(band.parameter, k -> t.size());
                    break;
                case MEAN:
                    means = true;
                    break;
                case VARIANCE:
                case SD:
                    variance = true;
                    break;
                default:
                    o = o.withCellFunction(band.function);
                    index[b] = functions++;
            }
        }
        return o.withVariance(variance).withMeans(means)
                .withQuantiles(q.keySet().stream().mapToDouble(Double::doubleValue).toArray())
                .withTailProbabilities(t.keySet().stream().mapToDouble(Double::doubleValue).toArray());
    }

    /**
     * Predicts the grid with the kriging and writes the targets.
     *
     * @throws IllegalStateException    if no target was chosen, if intervals are asked for without a
     *                                  quantile, exceedance or mean band, or on an I/O error
     * @throws IllegalArgumentException as {@link Kriging#predictGrid} and {@link GeoTiffWriter} do (for
     *                                  example a band value that is not finite, naming the cell)
     */
    public GridExportSummary run(Kriging kriging, Grid grid) {
        Objects.requireNonNull(kriging, "kriging");
        Objects.requireNonNull(grid, "grid");
        if (tiff == null && csv == null) {
            throw new IllegalStateException("choose a target: toGeoTiff and/or toCsv");
        }
        int[] index = new int[bands.size()];
        GridOptions opt = options(index);
        List<String> names = new ArrayList<>();
        for (GridBand b : bands) {
            names.add(b.name());
        }
        List<Integer> withInterval = new ArrayList<>();
        for (int b = 0; b < bands.size(); b++) {
            if (hasInterval(bands.get(b))) {
                withInterval.add(b);
                names.add(bands.get(b).name() + "_lower");
                names.add(bands.get(b).name() + "_upper");
            }
        }
        if (intervals != null && withInterval.isEmpty()) {
            throw new IllegalStateException("intervals need a quantile, exceedance or mean band");
        }
        for (int i = 0; i < names.size(); i++) {
            if (names.subList(0, i).contains(names.get(i))) {
                throw new IllegalArgumentException("band name '" + names.get(i) + "' is used twice (an interval"
                        + " end's name is the band's name + _lower or _upper); rename one (named)");
            }
        }
        RasterLayout layout = tiff == null ? null : RasterLayout.of(grid, crs, names);
        GeoTiffWriter w = tiff == null ? null : GeoTiffWriter.create(tiff, layout, tiffOptions);
        Path csvPart = csv == null ? null : csv.toAbsolutePath().resolveSibling(csv.getFileName() + ".part");
        CSVPrinter printer = null;
        boolean ok = false;
        try {
            if (csv != null) {
                Writer out = new BufferedWriter(Files.newBufferedWriter(csvPart, StandardCharsets.UTF_8), 1 << 16);
                List<String> header = new ArrayList<>(List.of("column", "row", "x", "y"));
                header.addAll(names);
                printer = CSVFormat.RFC4180.builder().setHeader(header.toArray(new String[0])).get().print(out);
            }
            Sink sink = new Sink(grid, index, withInterval, names, w, printer, tiffOptions.tileSize());
            if (intervals == null) {
                kriging.predictGrid(grid, opt, t -> sink.accept(t, null));
            } else {
                UncertaintyOptions uo = intervals.withQuantiles(opt.probabilities())
                        .withExceedances(opt.thresholds()).withMean(opt.means());
                PredictiveDistribution.of(kriging).summariseGrid(grid, opt, uo, u -> sink.accept(u.tile(), u));
            }
            RasterSummary rs = w == null ? null : w.finish();
            if (printer != null) {
                printer.close(true);
                printer = null;
                Files.move(csvPart, csv.toAbsolutePath(), StandardCopyOption.REPLACE_EXISTING);
            }
            ok = true;
            return new GridExportSummary(sink.cells, sink.tiles, rs, csv == null ? null : csv.toAbsolutePath());
        } catch (IOException | UncheckedIOException e) {
            throw new IllegalStateException("cannot write the grid export: " + e.getMessage(), e);
        } finally {
            if (w != null) {
                w.close();
            }
            if (!ok && csvPart != null) {
                try {
                    if (printer != null) {
                        printer.close();
                    }
                    Files.deleteIfExists(csvPart);
                } catch (IOException ignored) {
                    // the ".part" name marks the file incomplete
                }
            }
        }
    }

    /** Receives tiles in delivery order and feeds the writers. */
    private final class Sink {
        private final Grid grid;
        private final int[] index;
        private final List<Integer> withInterval;
        private final int columns;
        private final List<String> names;
        private final GeoTiffWriter writer;
        private final CSVPrinter printer;
        private final int tileSize;
        long cells;
        int tiles;
        private double[][] values = new double[0][];

        Sink(Grid grid, int[] index, List<Integer> withInterval, List<String> names, GeoTiffWriter writer,
                CSVPrinter printer, int tileSize) {
            this.grid = grid;
            this.index = index;
            this.withInterval = withInterval;
            this.names = names;
            this.columns = names.size();
            this.writer = writer;
            this.printer = printer;
            this.tileSize = tileSize;
        }

        /** The interval layer of band b in the tile's intervals. */
        private IntervalLayer layer(UncertaintyTile u, GridBand band, int b) {
            switch (band.kind) {
                case QUANTILE:
                    return u.quantiles().get(index[b]);
                case EXCEEDANCE:
                    return u.exceedances().get(index[b]);
                default:
                    return u.mean();
            }
        }

        void accept(GridTile t, UncertaintyTile u) {
            int n = t.size();
            int r0 = t.tileRow() * tileSize;
            int[] rows = t.rows();
            for (int q = 0; q < n; q++) {
                if (rows[q] < r0 || rows[q] >= r0 + tileSize) {
                    throw new IllegalStateException("grid tile " + t.tileRow() + " holds row " + rows[q]
                            + ", outside rows " + r0 + ".." + (r0 + tileSize - 1) + " of the tile size "
                            + tileSize);
                }
            }
            if (values.length != columns || (values.length > 0 && values[0].length < n)) {
                values = new double[columns][Math.max(n, tileSize * tileSize)];
            }
            for (int b = 0; b < bands.size(); b++) {
                GridBand band = bands.get(b);
                for (int q = 0; q < n; q++) {
                    values[b][q] = band.value(t, q, index[b]);
                }
            }
            int col = bands.size();
            for (int b : withInterval) {
                GridBand band = bands.get(b);
                IntervalLayer l = layer(u, band, b);
                for (int q = 0; q < n; q++) {
                    double lo = band.map(l.lowers()[q]), hi = band.map(l.uppers()[q]);
                    values[col][q] = Math.min(lo, hi);
                    values[col + 1][q] = Math.max(lo, hi);
                }
                col += 2;
            }
            if (writer != null) {
                writer.finishRowsBelow(r0);
                writer.writeCells(n, t.columns(), rows, values);
            }
            if (printer != null) {
                try {
                    for (int q = 0; q < n; q++) {
                        int c = t.columns()[q], j = rows[q];
                        printer.print(c);
                        printer.print(j);
                        printer.print(Double.toString(grid.x(c)));
                        printer.print(Double.toString(grid.y(j)));
                        for (int b = 0; b < columns; b++) {
                            double v = values[b][q];
                            if (!Double.isFinite(v)) {
                                throw new IllegalArgumentException("cell (column " + c + ", row " + j + "), band '"
                                        + names.get(b) + "': value " + v + " is not finite");
                            }
                            printer.print(Double.toString(v));
                        }
                        printer.println();
                    }
                } catch (IOException e) {
                    throw new UncheckedIOException(e);
                }
            }
            cells += n;
            tiles++;
        }
    }
}
