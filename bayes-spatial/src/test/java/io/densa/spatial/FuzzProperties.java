package io.densa.spatial;

import static io.densa.spatial.FuzzValues.extreme;
import static io.densa.spatial.FuzzValues.vector;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.autocorrelation.AutocorrelationOptions;
import io.densa.spatial.autocorrelation.GearyC;
import io.densa.spatial.autocorrelation.IslandPolicy;
import io.densa.spatial.autocorrelation.LocalMoran;
import io.densa.spatial.autocorrelation.MoranI;
import io.densa.spatial.kriging.Drift;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.ShrinkingMode;

/**
 * Seeded fuzz of the spatial module (issue 9 §4): locations and distances, the neighbour index,
 * spatial weights, Moran's I, Geary's c and local Moran, the empirical trace-variogram, variogram
 * fitting and kriging, on finite but extreme inputs — coordinates from subnormal to near the
 * double limit, duplicate and collinear sites, constant and extreme values, tiny networks. Each
 * call must give finite output or an {@link IllegalArgumentException} /
 * {@link IllegalStateException} / {@link io.densa.core.DensaException} thrown by Densa, and must
 * not modify its inputs (see {@link FuzzCheck}). Fixed seeds; 29,500 tries in all; each try draws
 * its inputs from a case seed that jqwik reports on failure.
 */
class FuzzProperties {
    private static final FuzzCheck CHECK = new FuzzCheck();

    /** In exploration mode (see {@link FuzzCheck}), writes what was collected to target/fuzz-collected.txt. */
    @net.jqwik.api.lifecycle.AfterContainer
    static void report() throws java.io.IOException {
        FuzzCheck.writeCollected(java.nio.file.Path.of("target", "fuzz-collected.txt"));
    }

    @Provide
    Arbitrary<Long> cases() {
        return Arbitraries.longs();
    }

    private static final List<BayesSpace> SPACES = List.of(BayesSpace.splines(0, 1, 3, 1), BayesSpace.steps(0, 1, 3),
            BayesSpace.polynomials(-1, 1, 2));

    /** Planar coordinates: spread, clustered, duplicated, collinear, tiny or huge scale. */
    private static double[][] sites(Random r, int n) {
        double scale = r.nextInt(3) == 0 ? Math.abs(FuzzValues.magnitude(r, -300, 300)) : 1 + 100 * r.nextDouble();
        double[] x = new double[n];
        double[] y = new double[n];
        int layout = r.nextInt(6);
        for (int i = 0; i < n; i++) {
            if (i > 0 && r.nextInt(8) == 0) { // a coincident site
                x[i] = x[i - 1];
                y[i] = y[i - 1];
                continue;
            }
            switch (layout) {
                case 0: // collinear
                    x[i] = scale * r.nextDouble();
                    y[i] = 2 * x[i];
                    break;
                case 1: // extreme values per coordinate
                    x[i] = extreme(r);
                    y[i] = extreme(r);
                    break;
                default:
                    x[i] = scale * r.nextDouble();
                    y[i] = scale * r.nextDouble();
            }
        }
        return new double[][] {x, y};
    }

    private static DensitySet densities(Random r, BayesSpace s, int n) {
        int kind = r.nextInt(4);
        FuzzValues.Draw draw = kind < 2 ? q -> 2 * q.nextGaussian() : kind == 2 ? FuzzValues::mild : FuzzValues::extreme;
        double[][] c = new double[n][];
        for (int i = 0; i < n; i++) {
            c[i] = i > 0 && r.nextInt(6) == 0 ? c[i - 1].clone() : vector(r, s.dimension(), draw);
        }
        return DensitySet.of(s, c);
    }

    // ------------------------------------------------------------------ locations and the index

    @Property(tries = 20_000, seed = "9201", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void locations(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "locations seed=" + seed);
        int n = FuzzValues.size(r, 12);
        double[][] xy = sites(r, n);
        double[] x = xy[0];
        double[] y = xy[1];
        boolean geographic = r.nextInt(3) == 0;
        double[] lon = vector(r, n, q -> q.nextInt(5) == 0 ? extreme(q) : 360 * q.nextDouble() - 180);
        double[] lat = vector(r, n, q -> q.nextInt(5) == 0 ? extreme(q) : 180 * q.nextDouble() - 90);
        FuzzCheck.context(() -> "locations seed=" + seed + " x=" + Arrays.toString(x) + " y=" + Arrays.toString(y)
                + (geographic ? " lon=" + Arrays.toString(lon) + " lat=" + Arrays.toString(lat) : ""));
        Locations loc = geographic ? CHECK.run("geographic", () -> Locations.geographic(lon, lat), lon, lat)
                : CHECK.run("planar", () -> Locations.planar(x, y), x, y);
        double px = geographic ? (r.nextBoolean() ? extreme(r) : 360 * r.nextDouble() - 180) : extreme(r);
        double py = geographic ? (r.nextBoolean() ? extreme(r) : 180 * r.nextDouble() - 90) : extreme(r);
        CHECK.run("greatCircleKm", () -> Locations.greatCircleKm(px, py, lon.length > 0 ? lon[0] : 0,
                lat.length > 0 ? lat[0] : 0));
        if (loc == null) {
            return;
        }
        int i = r.nextInt(Math.max(1, n)), j = r.nextInt(Math.max(1, n));
        CHECK.run("distance(i, j)", () -> loc.distance(i, j));
        CHECK.run("distanceTo", () -> loc.distanceTo(i, px, py));
        CHECK.run("distance(points)", () -> loc.distance(px, py, extreme(r), extreme(r)));
        CHECK.run("boundingBox", loc::boundingBox);
        int[] rows = {n - 1, 0, j};
        CHECK.run("subset", () -> loc.subset(rows), rows);
        if (r.nextInt(4) > 0) {
            return; // building the index (an STRtree) is the expensive part: a quarter of the tries
        }
        NeighbourIndex index = CHECK.run("NeighbourIndex.of", () -> NeighbourIndex.of(loc));
        if (index == null) {
            return;
        }
        double radius = Math.abs(extreme(r));
        int k = r.nextInt(n + 2);
        CHECK.run("within", () -> index.within(px, py, radius));
        CHECK.run("nearest", () -> index.nearest(px, py, k));
        CHECK.run("kthDistance", () -> index.kthDistance(px, py, Math.max(1, k)));
        CHECK.run("pairsWithin", () -> index.pairsWithin(radius));
    }

    // ------------------------------------------------------------------ weights and autocorrelation

    @Property(tries = 4_000, seed = "9202", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void weightsAndAutocorrelation(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "weightsAndAutocorrelation seed=" + seed);
        int n = 2 + FuzzValues.size(r, 14);
        double[][] xy = sites(r, n);
        Locations loc = CHECK.run("planar", () -> Locations.planar(xy[0], xy[1]));
        if (loc == null) {
            return;
        }
        int kind = r.nextInt(4);
        double d = Math.abs(extreme(r));
        double power = extreme(r);
        int k = r.nextInt(n + 1);
        SpatialWeights.Symmetry sym = SpatialWeights.Symmetry.values()[r.nextInt(3)];
        FuzzCheck.context(() -> "weightsAndAutocorrelation seed=" + seed + " x=" + Arrays.toString(xy[0]) + " y="
                + Arrays.toString(xy[1]) + " weights kind=" + kind + " k=" + k + " " + sym + " d=" + d + " power="
                + power);
        SpatialWeights w = CHECK.run("weights", () -> {
            switch (kind) {
                case 0:
                    return SpatialWeights.nearestNeighbours(loc, k, sym);
                case 1:
                    return SpatialWeights.distanceBand(loc, d);
                case 2:
                    return SpatialWeights.inverseDistance(loc, power, d);
                default:
                    double[][] m = new double[n][n];
                    for (int a = 0; a < n; a++) {
                        for (int b = 0; b < n; b++) {
                            m[a][b] = a == b ? 0 : Math.abs(FuzzValues.mild(r));
                        }
                    }
                    return SpatialWeights.fromMatrix(m);
            }
        });
        if (w == null) {
            return;
        }
        CHECK.run("rowStandardised", w::rowStandardised);
        CHECK.run("s0", w::s0);
        CHECK.run("s1", w::s1);
        CHECK.run("s2", w::s2);
        double[] values = vector(r, n, r.nextBoolean() ? FuzzValues::extreme : FuzzValues::mild);
        CHECK.run("spatialLag", () -> w.spatialLag(values), values);
        AutocorrelationOptions opt = AutocorrelationOptions.withDefaults()
                .withIslandPolicy(IslandPolicy.values()[r.nextInt(IslandPolicy.values().length)])
                .withPermutations(19, 5L).withParallel(false);
        CHECK.run("MoranI.statistic", () -> MoranI.statistic(w, values), values);
        CHECK.run("MoranI.test", () -> MoranI.test(w, values, opt), values);
        CHECK.run("GearyC.test", () -> GearyC.test(w, values, opt), values);
        if (n <= 8) {
            CHECK.run("LocalMoran.test", () -> LocalMoran.test(w, values, opt), values);
        }
        DensitySet dens = densities(r, SPACES.get(r.nextInt(SPACES.size())), n);
        CHECK.run("MoranI densities", () -> MoranI.test(w, dens, opt));
    }

    // ------------------------------------------------------------------ variogram and fitting

    @Property(tries = 2_000, seed = "9203", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void variogram(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "variogram seed=" + seed);
        int n = 2 + FuzzValues.size(r, 18);
        double[][] xy = sites(r, n);
        Locations loc = CHECK.run("planar", () -> Locations.planar(xy[0], xy[1]));
        if (loc == null) {
            return;
        }
        DensitySet dens = densities(r, SPACES.get(r.nextInt(SPACES.size())), n);
        int bins = r.nextInt(12);
        double maxLag = Math.abs(extreme(r));
        VariogramOptions options = CHECK.run("VariogramOptions", () -> {
            VariogramOptions o = VariogramOptions.withDefaults().withParallel(false);
            if (r.nextBoolean()) {
                o = o.withBinCount(bins);
            }
            if (r.nextInt(3) == 0) {
                o = o.withMaxLag(maxLag);
            }
            return o;
        });
        if (options == null) {
            return;
        }
        FuzzCheck.context(() -> "variogram seed=" + seed + " x=" + Arrays.toString(xy[0]) + " y=" + Arrays.toString(xy[1])
                + " " + options + " densities=" + Arrays.deepToString(dens.coordinates()));
        EmpiricalVariogram ev = CHECK.run("EmpiricalVariogram.of", () -> EmpiricalVariogram.of(loc, dens, options));
        if (ev == null) {
            return;
        }
        CHECK.run("semivariances", ev::semivariances);
        CHECK.run("meanLags", ev::meanLags);
        CHECK.run("counts", ev::counts);
        CHECK.run("edges", ev::edges);
        if (r.nextInt(3) == 0) {
            VariogramModel.Family fam = VariogramModel.Family.values()[r.nextInt(VariogramModel.Family.values().length)];
            CHECK.run("VariogramFitting.fit", () -> VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()
                    .withFamily(fam).withNugget(r.nextBoolean()).withMaxEvaluations(200)));
        }
    }

    // ------------------------------------------------------------------ models and kriging

    @Property(tries = 3_500, seed = "9204", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void kriging(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "kriging seed=" + seed);
        double c = Math.abs(extreme(r));
        double a = Math.abs(extreme(r));
        double nugget = r.nextBoolean() ? 0 : Math.abs(extreme(r));
        int family = r.nextInt(5);
        VariogramModel model = CHECK.run("model", () -> {
            VariogramModel m;
            switch (family) {
                case 0:
                    m = VariogramModel.spherical(c, a);
                    break;
                case 1:
                    m = VariogramModel.exponential(c, a);
                    break;
                case 2:
                    m = VariogramModel.gaussian(c, a);
                    break;
                case 3:
                    m = VariogramModel.matern(c, a, 0.5 + 2 * r.nextDouble());
                    break;
                default:
                    m = VariogramModel.power(c, 2 * r.nextDouble());
            }
            return nugget > 0 ? m.withNugget(nugget) : m;
        });
        if (model == null) {
            return;
        }
        double h = Math.abs(extreme(r));
        CHECK.run("gamma", () -> model.gamma(h));
        CHECK.run("covariance", () -> model.bounded() ? model.covariance(h) : 0.0);
        CHECK.run("sill", model::sill); // an IllegalStateException for a power model, which has no sill
        FuzzCheck.context(() -> "kriging seed=" + seed + " model=" + model + " h=" + h);
        if (r.nextInt(4) > 0) {
            return; // model evaluation is cheap; kriging systems run on a quarter of the tries
        }
        int n = 2 + FuzzValues.size(r, 10);
        double[][] xy = sites(r, n);
        Locations loc = CHECK.run("planar", () -> Locations.planar(xy[0], xy[1]));
        if (loc == null) {
            return;
        }
        DensitySet dens = densities(r, SPACES.get(r.nextInt(SPACES.size())), n);
        int type = r.nextInt(3);
        KrigingOptions opt = CHECK.run("KrigingOptions", () -> {
            KrigingOptions o = KrigingOptions.withDefaults().withParallel(false);
            if (r.nextInt(3) == 0) {
                o = o.withNeighbourhood(Neighbourhood.nearest(1 + r.nextInt(n)));
            }
            if (r.nextInt(4) == 0) {
                o = o.withCoincidentNugget(Math.abs(extreme(r)));
            }
            return o;
        });
        if (opt == null) {
            return;
        }
        FuzzCheck.context(() -> "kriging seed=" + seed + " model=" + model + " type=" + type + " x=" + Arrays.toString(xy[0])
                + " y=" + Arrays.toString(xy[1]) + " densities=" + Arrays.deepToString(dens.coordinates()));
        Kriging kr = CHECK.run("Kriging", () -> type == 0 ? Kriging.ordinary(loc, dens, model, opt)
                : type == 1 ? Kriging.universal(loc, dens, Drift.polynomial(1), model, opt)
                : Kriging.simple(loc, dens, dens.mean(), model, opt));
        if (kr == null) {
            return;
        }
        double tx = r.nextBoolean() ? extreme(r) : xy[0][0] + r.nextGaussian();
        double ty = r.nextBoolean() ? extreme(r) : xy[1][0] + r.nextGaussian();
        CHECK.run("predict", () -> kr.predict(tx, ty));
        CHECK.run("predictWithWeights", () -> kr.predictWithWeights(tx, ty));
        if (n <= 8) {
            CHECK.run("crossValidate", kr::crossValidate);
        }
    }
}
