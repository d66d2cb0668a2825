package io.densa.io.model;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.kriging.Drift;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The payloads of bayes-spatial's model types (locations, variogram models and fits, kriging,
 * spatial weights), written and read member by member (see docs/model-format.md). Package-private,
 * used through {@link Codecs}.
 */
final class SpatialCodecs {
    private SpatialCodecs() {
    }

    static void locations(Out o, String name, Locations l) {
        o.begin(name).text("kind", l.kind().name()).doubles("x", l.xs()).doubles("y", l.ys()).end();
    }

    static void variogram(Out o, String name, VariogramModel m) {
        o.begin(name).beginList("structures");
        for (VariogramModel.Structure s : m.structures()) {
            o.beginItem().text("family", s.family().name()).real("partialSill", s.partialSill())
                    .real("range", s.range()).real("smoothness", s.smoothness()).end();
        }
        o.endList().end();
    }

    static void variogramFit(Out o, VariogramFit f) {
        o.begin();
        variogram(o, "model", f.model());
        o.text("method", f.method().name()).real("criterion", f.criterion()).real("rmse", f.rmse())
                .doubles("fitted", f.fitted()).integer("binsUsed", f.binsUsed()).integer("evaluations", f.evaluations())
                .bool("converged", f.converged()).bool("rangeAtBound", f.rangeAtBound())
                .real("largestLag", f.largestLag()).beginList("warnings");
        for (VariogramFit.Warning w : f.warnings()) {
            o.beginItem().text("kind", w.kind().name()).text("message", w.message()).end();
        }
        o.endList().end();
    }

    static void kriging(Out o, Kriging k) {
        o.begin().text("type", k.type().name());
        locations(o, "locations", k.locations());
        CoreCodecs.densities(o, "densities", k.densities());
        variogram(o, "model", k.model());
        KrigingOptions opt = k.options();
        Neighbourhood nb = opt.neighbourhood();
        o.begin("options").begin("neighbourhood")
                .text("kind", nb.isGlobal() ? "GLOBAL" : Double.isInfinite(nb.radius()) ? "NEAREST" : "RADIUS")
                .integer("count", nb.count()).real("radius", nb.radius()).end();
        double[] ev = opt.errorVariances();
        if (ev == null) {
            o.nul("errorVariances");
        } else {
            o.doubles("errorVariances", ev);
        }
        o.real("coincidentNugget", opt.coincidentNugget()).real("conditionLimit", opt.conditionLimit())
                .bool("parallel", opt.parallel()).end();
        Drift d = k.drift();
        if (d == null) {
            o.nul("drift");
        } else {
            o.begin("drift").integer("degree", d.degree());
            double[][] cov = d.covariates();
            if (d.covariateCount() == 0) {
                o.nul("covariates");
            } else {
                int q = d.covariateCount();
                double[] flat = new double[cov.length * q];
                for (int i = 0; i < cov.length; i++) {
                    System.arraycopy(cov[i], 0, flat, i * q, q);
                }
                o.doubles("covariates", flat, cov.length, q);
            }
            o.end();
        }
        if (k.mean() == null) {
            o.nul("mean");
        } else {
            o.doubles("mean", k.mean().coordinates());
        }
        o.end();
    }

    static void weights(Out o, SpatialWeights w) {
        o.begin().ints("rowStarts", w.rowStarts()).ints("columns", w.columnIndices())
                .doubles("weights", w.linkWeights()).bool("rowStandardised", w.isRowStandardised()).end();
    }

    static Locations readLocations(Node n) {
        Locations.Kind kind = n.get("kind").enumValue(Locations.Kind.class);
        double[] x = n.get("x").doubles(-1);
        double[] y = n.get("y").doubles(x.length);
        return Codecs.restoring(n, () -> kind == Locations.Kind.PLANAR ? Locations.planar(x, y) : Locations.geographic(x, y));
    }

    static VariogramModel readVariogram(Node n) {
        List<Node> parts = n.get("structures").list();
        if (parts.isEmpty() || parts.size() > 64) {
            throw n.get("structures").error("has " + parts.size() + " structures; 1 to 64 are accepted");
        }
        VariogramModel m = null;
        for (Node s : parts) {
            VariogramModel.Family f = s.get("family").enumValue(VariogramModel.Family.class);
            double c = s.get("partialSill").real();
            double a = s.get("range").real();
            double nu = s.get("smoothness").real();
            VariogramModel one = Codecs.restoring(s, () -> {
                switch (f) {
                    case NUGGET: return VariogramModel.nugget(c);
                    case SPHERICAL: return VariogramModel.spherical(c, a);
                    case EXPONENTIAL: return VariogramModel.exponential(c, a);
                    case GAUSSIAN: return VariogramModel.gaussian(c, a);
                    case MATERN: return VariogramModel.matern(c, a, nu);
                    default: return VariogramModel.power(c, a);
                }
            });
            VariogramModel prev = m;
            m = prev == null ? one : Codecs.restoring(s, () -> prev.plus(one));
        }
        return m;
    }

    static VariogramFit readVariogramFit(Node p) {
        VariogramModel m = readVariogram(p.get("model"));
        List<VariogramFit.Warning> ws = new ArrayList<>();
        for (Node w : p.get("warnings").list()) {
            VariogramFit.WarningKind k = w.get("kind").enumValue(VariogramFit.WarningKind.class);
            String msg = w.get("message").text();
            ws.add(new VariogramFit.Warning(k, msg));
        }
        return Codecs.restoring(p, () -> new VariogramFit(m, p.get("method").enumValue(VariogramFitOptions.Method.class),
                p.get("criterion").real(), p.get("rmse").real(), p.get("fitted").doubles(-1),
                p.get("binsUsed").integer(0, Integer.MAX_VALUE), p.get("evaluations").integer(0, Integer.MAX_VALUE),
                p.get("converged").bool(), p.get("rangeAtBound").bool(), p.get("largestLag").real(), ws));
    }

    static Kriging readKriging(Node p) {
        Kriging.Type type = p.get("type").enumValue(Kriging.Type.class);
        Locations loc = readLocations(p.get("locations"));
        DensitySet d = CoreCodecs.readDensities(p.get("densities"));
        VariogramModel m = readVariogram(p.get("model"));
        Node o = p.get("options");
        Node nb = o.get("neighbourhood");
        String nk = nb.get("kind").text();
        int count = nb.get("count").integer(1, Integer.MAX_VALUE);
        double radius = nb.get("radius").real();
        Neighbourhood hood = Codecs.restoring(nb, () -> {
            switch (nk) {
                case "GLOBAL": return Neighbourhood.global();
                case "NEAREST": return Neighbourhood.nearest(count);
                case "RADIUS": return Neighbourhood.radius(radius, count);
                default: throw new IllegalArgumentException("kind '" + nk + "' is not one of [GLOBAL, NEAREST, RADIUS]");
            }
        });
        Node evn = o.optional("errorVariances");
        double[] ev = evn == null ? null : evn.doubles(loc.size());
        double nugget = o.get("coincidentNugget").real();
        double limit = o.get("conditionLimit").real();
        boolean parallel = o.get("parallel").bool();
        KrigingOptions opt = Codecs.restoring(o, () -> {
            KrigingOptions k = KrigingOptions.withDefaults().withNeighbourhood(hood);
            if (ev != null) {
                k = k.withErrorVariances(ev);
            }
            return k.withCoincidentNugget(nugget).withConditionLimit(limit).withParallel(parallel);
        });
        Node dn = p.optional("drift");
        Drift drift = null;
        if (dn != null) {
            int degree = dn.get("degree").integer(0, 4);
            Node cn = dn.optional("covariates");
            double[][] cov = null;
            if (cn != null) {
                int[] shape = cn.declaredShape();
                if (shape.length != 2) {
                    throw cn.error("must be a matrix (locations × covariates)");
                }
                double[] flat = cn.doubles(loc.size(), -1);
                int q = shape[1];
                cov = new double[loc.size()][];
                for (int i = 0; i < cov.length; i++) {
                    cov[i] = Arrays.copyOfRange(flat, i * q, (i + 1) * q);
                }
            }
            double[][] c = cov;
            drift = Codecs.restoring(dn, () -> c == null ? Drift.polynomial(degree) : Drift.polynomial(degree).withCovariates(c));
        }
        Node mn = p.optional("mean");
        double[] mean = mn == null ? null : mn.doubles(d.dimension());
        Drift dr = drift;
        return Codecs.restoring(p, () -> {
            switch (type) {
                case SIMPLE:
                    if (mean == null) {
                        throw new IllegalArgumentException("simple kriging needs the member 'mean'");
                    }
                    return Kriging.simple(loc, d, d.space().density(mean), m, opt);
                case ORDINARY:
                    return Kriging.ordinary(loc, d, m, opt);
                default:
                    if (dr == null) {
                        throw new IllegalArgumentException("universal kriging needs the member 'drift'");
                    }
                    return Kriging.universal(loc, d, dr, m, opt);
            }
        });
    }

    static SpatialWeights readWeights(Node p) {
        int[] starts = p.get("rowStarts").ints(-1);
        int[] cols = p.get("columns").ints(-1);
        double[] w = p.get("weights").doubles(cols.length);
        boolean rs = p.get("rowStandardised").bool();
        return Codecs.restoring(p, () -> SpatialWeights.fromCompressedRows(starts, cols, w, rs));
    }
}
