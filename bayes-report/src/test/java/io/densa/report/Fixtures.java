package io.densa.report;

import io.densa.report.map.GridValues;
import io.densa.report.map.MapFrame;
import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.regression.Fpca;
import io.densa.spatial.autocorrelation.AutocorrelationOptions;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.autocorrelation.LocalMoran;
import io.densa.spatial.Locations;
import io.densa.spatial.autocorrelation.MoranI;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.GeometryFactory;

/**
 * Invented test data for the figures (seeded, no reference value comes from them): a 9 × 6 grid
 * of 5 km square units whose age-like densities shift smoothly across the area, with a raised
 * corner, and the results Densa computes from them.
 */
public final class Fixtures {
    static final GeometryFactory GEOMETRY = new GeometryFactory();
    static final int NX = 9;
    static final int NY = 6;
    static final double CELL = 5;

    final List<Geometry> units = new ArrayList<>();
    final Geometry outline;
    final double[] x;
    final double[] y;
    final double[] value;
    final BayesSpace space = BayesSpace.splines(0, 100, 4, 8);
    final DensitySet densities;
    final int[][] counts;
    final EmpiricalVariogram variogram;
    final VariogramFit fit;
    final Fpca fpca;
    final LocalMoran.Result local;
    final MoranI.Result moran;

    public Fixtures(long seed) {
        Random random = new Random(seed);
        int n = NX * NY;
        x = new double[n];
        y = new double[n];
        value = new double[n];
        List<Density> list = new ArrayList<>();
        counts = new int[n][100];
        String[] ids = new String[n];
        for (int j = 0; j < NY; j++) {
            for (int i = 0; i < NX; i++) {
                int k = j * NX + i;
                ids[k] = "U" + k;
                units.add(square(i * CELL, j * CELL));
                x[k] = (i + 0.5) * CELL;
                y[k] = (j + 0.5) * CELL;
                double corner = i >= NX - 3 && j >= NY - 3 ? 2.0 : 0;
                value[k] = Math.sin(x[k] / 9) + y[k] / 15 + corner + 0.3 * random.nextGaussian();
                double mu = 35 + 3 * value[k];
                double sd = 14 + i;
                Density d = space.projectLogPdf(a -> -0.5 * Math.pow((a - mu) / sd, 2)).density();
                list.add(d);
                double[] pdf = d.pdf(mids());
                int total = 200 + 40 * k;
                for (int a = 0; a < 100; a++) {
                    counts[k][a] = (int) Math.max(0, Math.round(pdf[a] * total + Math.sqrt(pdf[a] * total)
                            * random.nextGaussian()));
                }
            }
        }
        outline = square(0, 0, NX * CELL, NY * CELL);
        densities = DensitySet.of(list, ids);
        Locations loc = Locations.planar(x, y);
        variogram = EmpiricalVariogram.of(loc, densities, VariogramOptions.withDefaults().withBinCount(8)
                .withMaxLag(25));
        fit = VariogramFitting.fit(variogram, VariogramFitOptions.withDefaults()
                .withFamily(VariogramModel.Family.EXPONENTIAL));
        fpca = Fpca.fit(densities);
        SpatialWeights w = SpatialWeights.contiguity(units, SpatialWeights.Contiguity.QUEEN, 1e-6).rowStandardised();
        AutocorrelationOptions opt = AutocorrelationOptions.withDefaults().withPermutations(199, seed);
        local = LocalMoran.test(w, value, opt);
        moran = MoranI.test(w, value, opt);
    }

    static double[] mids() {
        double[] m = new double[100];
        for (int a = 0; a < 100; a++) {
            m[a] = a + 0.5;
        }
        return m;
    }

    static double[] lower() {
        double[] m = new double[100];
        for (int a = 0; a < 100; a++) {
            m[a] = a;
        }
        return m;
    }

    static double[] upper() {
        double[] m = new double[100];
        for (int a = 0; a < 100; a++) {
            m[a] = a + 1;
        }
        return m;
    }

    static Geometry square(double x0, double y0) {
        return square(x0, y0, CELL, CELL);
    }

    static Geometry square(double x0, double y0, double w, double h) {
        return GEOMETRY.createPolygon(new Coordinate[] {new Coordinate(x0, y0), new Coordinate(x0 + w, y0),
            new Coordinate(x0 + w, y0 + h), new Coordinate(x0, y0 + h), new Coordinate(x0, y0)});
    }

    public MapFrame frame() {
        return MapFrame.km(units, outline, "Invented test units in planar km.");
    }

    /** A grid over the area with values from a function of the cell centre. */
    public GridValues grid(int nx, int ny, java.util.function.DoubleBinaryOperator f) {
        double w = NX * CELL;
        double h = NY * CELL;
        double[] v = new double[nx * ny];
        for (int j = 0; j < ny; j++) {
            for (int i = 0; i < nx; i++) {
                v[j * nx + i] = f.applyAsDouble((i + 0.5) * w / nx, (j + 0.5) * h / ny);
            }
        }
        return GridValues.of(0, 0, w, h, nx, ny, v);
    }
}
