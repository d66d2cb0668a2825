package io.densa.io.model;

import io.densa.core.Basis;
import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.Reference;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.SmoothingCriterion;
import io.densa.core.estimate.SmoothingSplineEstimator;
import io.densa.core.estimate.ZeroReplacement;
import io.densa.core.estimate.ZeroTotalPolicy;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.Design;
import io.densa.regression.Fpca;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionOnScalarFit;
import io.densa.regression.FunctionOnScalarRegression;
import io.densa.regression.FunctionalFitState;
import io.densa.regression.FunctionalRegression;
import io.densa.regression.ScalarOnFunctionFit;
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
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.OptionalDouble;
import org.ejml.data.DMatrixRMaj;

/**
 * The payload of each model type, written and read member by member (see docs/model-format.md).
 * Package-private; a closed list of types, never chosen by a class name from the file.
 */
final class Codecs {
    private Codecs() {
    }

    /** Type names in the file and the classes they load as, in the order the docs list them. */
    static final Map<String, Class<?>> TYPES = new LinkedHashMap<>();

    static {
        TYPES.put("bayes-space", BayesSpace.class);
        TYPES.put("density-set", DensitySet.class);
        TYPES.put("penalized-likelihood-estimator", PenalizedLikelihoodEstimator.class);
        TYPES.put("smoothing-spline-estimator", SmoothingSplineEstimator.class);
        TYPES.put("design", Design.class);
        TYPES.put("fpca", Fpca.class);
        TYPES.put("function-on-scalar-fit", FunctionOnScalarFit.class);
        TYPES.put("function-on-function-fit", FunctionOnFunctionFit.class);
        TYPES.put("scalar-on-function-fit", ScalarOnFunctionFit.class);
        TYPES.put("anomaly-scoring", AnomalyScoring.class);
        TYPES.put("anomaly-calibration", AnomalyScoring.Calibrated.class);
        TYPES.put("locations", Locations.class);
        TYPES.put("variogram-model", VariogramModel.class);
        TYPES.put("variogram-fit", VariogramFit.class);
        TYPES.put("kriging", Kriging.class);
        TYPES.put("spatial-weights", SpatialWeights.class);
        TYPES.put("bundle", ModelBundle.class);
    }

    static String typeOf(Object model) {
        java.util.Objects.requireNonNull(model, "model");
        for (Map.Entry<String, Class<?>> e : TYPES.entrySet()) {
            if (e.getValue() == model.getClass()) {
                return e.getKey();
            }
        }
        throw new IllegalArgumentException("a " + model.getClass().getName() + " cannot be saved; accepted are "
                + acceptedClasses());
    }

    static String typeOf(Class<?> type) {
        for (Map.Entry<String, Class<?>> e : TYPES.entrySet()) {
            if (e.getValue() == type) {
                return e.getKey();
            }
        }
        throw new IllegalArgumentException(type.getName() + " is not a model type; accepted are " + acceptedClasses());
    }

    static String acceptedClasses() {
        List<String> names = new ArrayList<>();
        for (Class<?> c : TYPES.values()) {
            names.add(c.getSimpleName());
        }
        return String.join(", ", names);
    }

    // ================================================================ writing

    static void write(Out o, String type, Object m) {
        switch (type) {
            case "bayes-space": o.begin(); space(o, "space", (BayesSpace) m); o.end(); break;
            case "density-set": o.begin(); densities(o, "densities", (DensitySet) m); o.end(); break;
            case "penalized-likelihood-estimator": penalized(o, (PenalizedLikelihoodEstimator) m); break;
            case "smoothing-spline-estimator": smoothing(o, (SmoothingSplineEstimator) m); break;
            case "design": o.begin(); design(o, "design", (Design) m); o.end(); break;
            case "fpca": o.begin(); fpca(o, "fpca", (Fpca) m); o.end(); break;
            case "function-on-scalar-fit": functionOnScalar(o, (FunctionOnScalarFit) m); break;
            case "function-on-function-fit": functionOnFunction(o, (FunctionOnFunctionFit) m); break;
            case "scalar-on-function-fit": scalarOnFunction(o, (ScalarOnFunctionFit) m); break;
            case "anomaly-scoring": o.begin(); scoring(o, "scoring", (AnomalyScoring) m); o.end(); break;
            case "anomaly-calibration": calibration(o, (AnomalyScoring.Calibrated) m); break;
            case "locations": o.begin(); locations(o, "locations", (Locations) m); o.end(); break;
            case "variogram-model": o.begin(); variogram(o, "model", (VariogramModel) m); o.end(); break;
            case "variogram-fit": variogramFit(o, (VariogramFit) m); break;
            case "kriging": kriging(o, (Kriging) m); break;
            case "spatial-weights": weights(o, (SpatialWeights) m); break;
            case "bundle": bundle(o, (ModelBundle) m); break;
            default: throw new IllegalStateException("no codec for " + type);
        }
    }

    static void space(Out o, String name, BayesSpace s) {
        Reference r = s.reference();
        if (r.kind() == Reference.Kind.CUSTOM) {
            throw new IllegalArgumentException("the space " + s + " has a custom reference weight ('" + r
                    + "'), a Java function, which a model file cannot hold; accepted are the Lebesgue, uniform,"
                    + " normal and beta references");
        }
        Basis b = s.basis();
        o.begin(name).real("lower", s.lower()).real("upper", s.upper());
        o.begin("basis").text("kind", b.kind().name()).integer("order", b.order())
                .doubles("breakpoints", b.breakpoints()).end();
        o.begin("reference").text("kind", r.kind().name());
        double[] p = r.parameters();
        if (r.kind() == Reference.Kind.NORMAL) {
            o.real("mean", p[0]).real("sd", p[1]);
        } else if (r.kind() == Reference.Kind.BETA) {
            o.real("alpha", p[0]).real("beta", p[1]);
        }
        o.end().end();
    }

    static void densities(Out o, String name, DensitySet d) {
        o.begin(name);
        space(o, "space", d.space());
        o.integer("rows", d.size());
        o.doubles("coordinates", d.coordinatesRowMajor(), d.size(), d.dimension());
        ids(o, "ids", d.hasIds() ? d.ids() : null);
        o.end();
    }

    static void ids(Out o, String name, List<String> ids) {
        if (ids == null) {
            o.nul(name);
            return;
        }
        o.beginList(name);
        for (String id : ids) {
            o.textItem(id);
        }
        o.endList();
    }

    static void penalized(Out o, PenalizedLikelihoodEstimator e) {
        PenalizedLikelihoodEstimator.Settings s = e.settings();
        o.begin();
        space(o, "space", e.space());
        o.begin("settings").integer("penaltyOrder", s.penaltyOrder()).real("smoothing", s.smoothing())
                .text("criterion", s.criterion().name()).integer("folds", s.folds()).int64("seed", s.seed())
                .real("gridLog10Lo", s.gridLog10Lo()).real("gridLog10Hi", s.gridLog10Hi())
                .real("gridStep", s.gridStep()).integer("maxIterations", s.maxIterations())
                .real("tolerance", s.tolerance()).integer("quadraturePoints", s.quadraturePoints())
                .text("zeroTotal", s.zeroTotal().name()).bool("fractionalCounts", s.fractionalCounts())
                .bool("parallel", s.parallel()).real("referencePriorWeight", s.referencePriorWeight()).end();
        o.end();
    }

    static void smoothing(Out o, SmoothingSplineEstimator e) {
        SmoothingSplineEstimator.Settings s = e.settings();
        o.begin();
        space(o, "space", e.space());
        o.begin("settings");
        ZeroReplacement z = s.zeroReplacement();
        o.begin("zeroReplacement");
        if (z.prior() != null) {
            o.text("kind", "BAYESIAN_MULTIPLICATIVE").text("prior", z.prior().name());
        } else {
            o.text("kind", "MULTIPLICATIVE").real("delta", z.delta());
        }
        o.end();
        o.integer("penaltyOrder", s.penaltyOrder()).real("smoothing", s.smoothing()).real("gcvLog10Lo", s.gcvLog10Lo())
                .real("gcvLog10Hi", s.gcvLog10Hi()).text("zeroTotal", s.zeroTotal().name())
                .bool("parallel", s.parallel()).end();
        o.end();
    }

    static void design(Out o, String name, Design d) {
        int n = d.rows();
        DMatrixRMaj x = d.matrix();
        List<String> cols = d.columnNames();
        o.begin(name).integer("rows", n).bool("intercept", d.hasIntercept()).beginList("terms");
        for (Design.Term t : d.terms()) {
            if (t.name().equals(Design.INTERCEPT)) {
                continue;
            }
            o.beginItem().text("name", t.name());
            if (!t.categorical()) {
                int j = t.columns().get(0);
                double[] v = new double[n];
                for (int i = 0; i < n; i++) {
                    v[i] = x.get(i, j);
                }
                o.text("kind", "NUMERIC").doubles("values", v);
            } else {
                o.text("kind", "CATEGORICAL").text("reference", t.reference()).beginList("levels");
                for (int j : t.columns()) {
                    o.textItem(cols.get(j).substring(t.name().length() + 1));
                }
                o.endList();
                int[] codes = new int[n];
                for (int i = 0; i < n; i++) {
                    for (int c = 0; c < t.columns().size(); c++) {
                        if (x.get(i, t.columns().get(c)) == 1.0) {
                            codes[i] = c + 1;
                        }
                    }
                }
                o.ints("codes", codes);
            }
            o.end();
        }
        o.endList().end();
    }

    static void fpca(Out o, String name, Fpca f) {
        int k = f.space().dimension();
        double[] v = new double[k * k];
        for (int j = 0; j < k; j++) {
            double[] c = f.componentCoordinates(j);
            for (int i = 0; i < k; i++) {
                v[i * k + j] = c[i];
            }
        }
        o.begin(name);
        space(o, "space", f.space());
        o.integer("sampleSize", f.sampleSize()).doubles("mean", f.mean().coordinates())
                .doubles("eigenvalues", f.eigenvalues()).doubles("eigenvectors", v, k, k).end();
    }

    static void functionOnScalar(Out o, FunctionOnScalarFit f) {
        FunctionOnScalarRegression c = f.configuration();
        o.begin().begin("configuration").real("lambda", c.lambda());
        DMatrixRMaj p = c.penalty();
        if (p == null) {
            o.nul("penalty");
        } else {
            o.doubles("penalty", p.data, p.numRows, p.numCols);
        }
        o.end();
        design(o, "design", f.design());
        densities(o, "response", f.response());
        double[] w = f.weights();
        if (w == null) {
            o.nul("weights");
        } else {
            o.doubles("weights", w);
        }
        o.end();
    }

    static void functional(Out o, String name, FunctionalRegression c) {
        o.begin(name).text("method", c.method().name()).integer("minComponents", c.minComponents())
                .integer("maxComponents", c.maxComponents());
        int[] rc = c.responseComponents();
        if (rc == null) {
            o.nul("responseComponents");
        } else {
            o.beginList("responseComponents");
            for (int v : rc) {
                o.integerItem(v);
            }
            o.endList();
        }
        double[] l = c.lambdas();
        if (l == null) {
            o.nul("lambdas");
        } else {
            o.doubles("lambdas", l);
        }
        o.integer("folds", c.folds()).int64("seed", c.seed()).end();
    }

    static void candidate(Out o, FunctionalRegression.Candidate c) {
        o.integer("predictorComponents", c.predictorComponents()).integer("responseComponents", c.responseComponents())
                .real("lambda", c.lambda());
        if (c.cvError().isPresent()) {
            o.real("cvError", c.cvError().getAsDouble());
        } else {
            o.nul("cvError");
        }
    }

    static void state(Out o, String name, FunctionalFitState s, int r) {
        int[] off = s.offsets();
        o.begin(name).doubles("coefficients", s.coefficients(), off[off.length - 1], r)
                .beginList("offsets");
        for (int v : off) {
            o.integerItem(v);
        }
        o.endList().begin("chosen");
        candidate(o, s.chosen());
        o.end().beginList("candidates");
        for (FunctionalRegression.Candidate c : s.candidates()) {
            o.beginItem();
            candidate(o, c);
            o.end();
        }
        o.endList();
        int n = s.fitted().length / r;
        o.doubles("fitted", s.fitted(), n, r).doubles("residuals", s.residuals(), n, r).real("rSquared", s.rSquared());
        o.beginList("predictorFpca");
        for (Fpca f : s.predictorFpca()) {
            o.beginItem();
            fpca(o, "fpca", f);
            o.end();
        }
        o.endList().beginList("predictorSpaces");
        for (BayesSpace sp : s.predictorSpaces()) {
            o.beginItem();
            space(o, "space", sp);
            o.end();
        }
        o.endList().end();
    }

    static void functionOnFunction(Out o, FunctionOnFunctionFit f) {
        o.begin();
        functional(o, "configuration", f.configuration());
        design(o, "design", f.design());
        space(o, "responseSpace", f.space());
        DensitySet fitted = f.fitted();
        ids(o, "ids", fitted.hasIds() ? fitted.ids() : null);
        state(o, "state", f.state(), f.space().dimension());
        o.end();
    }

    static void scalarOnFunction(Out o, ScalarOnFunctionFit f) {
        o.begin();
        functional(o, "configuration", f.configuration());
        design(o, "design", f.design());
        state(o, "state", f.state(), 1);
        o.end();
    }

    static void scoring(Out o, String name, AnomalyScoring a) {
        o.begin(name).real("fdr", a.fdr()).real("bandLevel", a.bandLevel()).end();
    }

    static void calibration(Out o, AnomalyScoring.Calibrated c) {
        List<AnomalyScoring.BandPoint> band = c.band();
        int m = band.size();
        double[] x = new double[m];
        double[] lo = new double[m];
        double[] hi = new double[m];
        for (int q = 0; q < m; q++) {
            x[q] = band.get(q).x();
            lo[q] = band.get(q).lower();
            hi[q] = band.get(q).upper();
        }
        o.begin();
        scoring(o, "scoring", c.configuration());
        space(o, "space", c.space());
        o.doubles("calibrationNorms", c.calibrationNorms()).doubles("grid", x).doubles("lower", lo)
                .doubles("upper", hi).end();
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
        densities(o, "densities", k.densities());
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

    static void bundle(Out o, ModelBundle b) {
        o.begin().beginList("entries");
        for (Map.Entry<String, Object> e : b.entries().entrySet()) {
            String type = typeOf(e.getValue());
            if (type.equals("bundle")) {
                throw new IllegalArgumentException("bundle entry '" + e.getKey() + "' is itself a bundle; bundles do"
                        + " not nest");
            }
            o.beginItem().text("name", e.getKey()).text("type", type);
            o.field("payload");
            write(o, type, e.getValue());
            o.end();
        }
        o.endList().end();
    }

    // ================================================================ reading

    static Object read(Node p, String type) {
        switch (type) {
            case "bayes-space": return readSpace(p.get("space"));
            case "density-set": return readDensities(p.get("densities"));
            case "penalized-likelihood-estimator": return readPenalized(p);
            case "smoothing-spline-estimator": return readSmoothing(p);
            case "design": return readDesign(p.get("design"));
            case "fpca": return readFpca(p.get("fpca"));
            case "function-on-scalar-fit": return readFunctionOnScalar(p);
            case "function-on-function-fit": return readFunctionOnFunction(p);
            case "scalar-on-function-fit": return readScalarOnFunction(p);
            case "anomaly-scoring": return readScoring(p.get("scoring"));
            case "anomaly-calibration": return readCalibration(p);
            case "locations": return readLocations(p.get("locations"));
            case "variogram-model": return readVariogram(p.get("model"));
            case "variogram-fit": return readVariogramFit(p);
            case "kriging": return readKriging(p);
            case "spatial-weights": return readWeights(p);
            case "bundle": return readBundle(p);
            default: throw p.error("unknown model type '" + type + "'; this Densa reads " + TYPES.keySet());
        }
    }

    /** Runs a library restore step; its IllegalArgumentException is reported against the field. */
    private static <T> T restoring(Node at, java.util.function.Supplier<T> step) {
        try {
            return step.get();
        } catch (IllegalArgumentException | IllegalStateException | NullPointerException e) {
            throw at.error("cannot be restored: " + e.getMessage());
        }
    }

    static BayesSpace readSpace(Node n) {
        double a = n.get("lower").real();
        double b = n.get("upper").real();
        Node basis = n.get("basis");
        Basis.Kind kind = basis.get("kind").enumValue(Basis.Kind.class);
        int order = basis.get("order").integer(0, 64);
        double[] bp = basis.get("breakpoints").doubles(-1);
        if (bp.length < 2 || Double.compare(bp[0], a) != 0 || Double.compare(bp[bp.length - 1], b) != 0) {
            throw basis.get("breakpoints").error("must start at the lower end " + a + " and end at the upper end " + b);
        }
        BayesSpace s = restoring(basis, () -> {
            switch (kind) {
                case SPLINE: return BayesSpace.splines(a, b, order, Arrays.copyOfRange(bp, 1, bp.length - 1));
                case POLYNOMIAL: return BayesSpace.polynomials(a, b, order);
                default: return BayesSpace.steps(bp);
            }
        });
        Node ref = n.get("reference");
        Reference.Kind rk = ref.get("kind").enumValue(Reference.Kind.class);
        switch (rk) {
            case LEBESGUE:
                return s;
            case UNIFORM:
                return s.withReference(Reference.uniform());
            case NORMAL: {
                double m = ref.get("mean").real();
                double sd = ref.get("sd").real();
                return restoring(ref, () -> s.withReference(Reference.normal(m, sd)));
            }
            case BETA: {
                double al = ref.get("alpha").real();
                double be = ref.get("beta").real();
                return restoring(ref, () -> s.withReference(Reference.beta(al, be)));
            }
            default:
                throw ref.get("kind").error("a custom reference cannot be stored in a model file");
        }
    }

    static DensitySet readDensities(Node n) {
        BayesSpace s = readSpace(n.get("space"));
        int rows = n.get("rows").integer(1, n.context().limits.maxElements());
        double[] c = n.get("coordinates").doubles(rows, s.dimension());
        String[] ids = readIds(n.optional("ids"), rows);
        return restoring(n, () -> DensitySet.ofRowMajor(s, c, rows, ids));
    }

    static String[] readIds(Node n, int rows) {
        if (n == null) {
            return null;
        }
        List<Node> l = n.list(rows);
        String[] ids = new String[rows];
        for (int i = 0; i < rows; i++) {
            ids[i] = l.get(i).text();
        }
        return ids;
    }

    static PenalizedLikelihoodEstimator readPenalized(Node p) {
        BayesSpace s = readSpace(p.get("space"));
        Node t = p.get("settings");
        PenalizedLikelihoodEstimator.Settings st = new PenalizedLikelihoodEstimator.Settings(
                t.get("penaltyOrder").integer(1, 64), t.get("smoothing").real(),
                t.get("criterion").enumValue(SmoothingCriterion.class), t.get("folds").integer(2, 50),
                t.get("seed").longValue(), t.get("gridLog10Lo").real(), t.get("gridLog10Hi").real(),
                t.get("gridStep").real(), t.get("maxIterations").integer(1, PenalizedLikelihoodEstimator.MAX_ITERATIONS_LIMIT),
                t.get("tolerance").real(), t.get("quadraturePoints").integer(0, 16),
                t.get("zeroTotal").enumValue(ZeroTotalPolicy.class), t.get("fractionalCounts").bool(),
                t.get("parallel").bool(), t.get("referencePriorWeight").real());
        return restoring(t, () -> PenalizedLikelihoodEstimator.withDefaults(s).withSettings(st));
    }

    static SmoothingSplineEstimator readSmoothing(Node p) {
        BayesSpace s = readSpace(p.get("space"));
        Node t = p.get("settings");
        Node z = t.get("zeroReplacement");
        String kind = z.get("kind").text();
        ZeroReplacement zr;
        if (kind.equals("BAYESIAN_MULTIPLICATIVE")) {
            ZeroReplacement.Prior prior = z.get("prior").enumValue(ZeroReplacement.Prior.class);
            zr = ZeroReplacement.bayesianMultiplicative(prior);
        } else if (kind.equals("MULTIPLICATIVE")) {
            double delta = z.get("delta").real();
            zr = restoring(z, () -> ZeroReplacement.multiplicative(delta));
        } else {
            throw z.get("kind").error("'" + kind + "' is not one of [BAYESIAN_MULTIPLICATIVE, MULTIPLICATIVE]");
        }
        SmoothingSplineEstimator.Settings st = new SmoothingSplineEstimator.Settings(zr,
                t.get("penaltyOrder").integer(1, 64), t.get("smoothing").real(), t.get("gcvLog10Lo").real(),
                t.get("gcvLog10Hi").real(), t.get("zeroTotal").enumValue(ZeroTotalPolicy.class),
                t.get("parallel").bool());
        return restoring(t, () -> SmoothingSplineEstimator.withDefaults(s).withSettings(st));
    }

    static Design readDesign(Node n) {
        int rows = n.get("rows").integer(1, n.context().limits.maxElements());
        boolean intercept = n.get("intercept").bool();
        Design.Builder b = Design.builder();
        if (!intercept) {
            b.withoutIntercept();
        }
        b.rows(rows);
        for (Node t : n.get("terms").list()) {
            String name = t.get("name").text();
            String kind = t.get("kind").text();
            if (kind.equals("NUMERIC")) {
                double[] v = t.get("values").doubles(rows);
                restoring(t, () -> b.numeric(name, v));
            } else if (kind.equals("CATEGORICAL")) {
                String ref = t.get("reference").text();
                List<Node> lv = t.get("levels").list();
                String[] levels = new String[lv.size() + 1];
                levels[0] = ref;
                for (int i = 0; i < lv.size(); i++) {
                    levels[i + 1] = lv.get(i).text();
                }
                int[] codes = t.get("codes").ints(rows);
                String[] values = new String[rows];
                for (int i = 0; i < rows; i++) {
                    if (codes[i] < 0 || codes[i] > lv.size()) {
                        throw t.get("codes").error("row " + i + " has level code " + codes[i] + "; codes 0 (the"
                                + " reference) to " + lv.size() + " are accepted");
                    }
                    values[i] = levels[codes[i]];
                }
                restoring(t, () -> b.categorical(name, values, ref, levels));
            } else {
                throw t.get("kind").error("'" + kind + "' is not one of [NUMERIC, CATEGORICAL]");
            }
        }
        return restoring(n, b::build);
    }

    static Fpca readFpca(Node n) {
        BayesSpace s = readSpace(n.get("space"));
        int k = s.dimension();
        int size = n.get("sampleSize").integer(2, Integer.MAX_VALUE);
        double[] mean = n.get("mean").doubles(k);
        double[] values = n.get("eigenvalues").doubles(k);
        double[] vectors = n.get("eigenvectors").doubles(k, k);
        return restoring(n, () -> Fpca.restore(s, size, mean, values, vectors));
    }

    static FunctionOnScalarFit readFunctionOnScalar(Node p) {
        Node c = p.get("configuration");
        double lambda = c.get("lambda").real();
        Node pen = c.optional("penalty");
        Design d = readDesign(p.get("design"));
        DensitySet y = readDensities(p.get("response"));
        int k = y.dimension();
        FunctionOnScalarRegression cfg = pen == null ? FunctionOnScalarRegression.withDefaults()
                : restoring(c, () -> FunctionOnScalarRegression.withDefaults().withPenalty(lambda,
                        DMatrixRMaj.wrap(k, k, pen.doubles(k, k))));
        if (pen == null && lambda != 0) {
            throw c.get("lambda").error("is " + lambda + " without a penalty matrix; 0 is required then");
        }
        Node w = p.optional("weights");
        double[] weights = w == null ? null : w.doubles(y.size());
        // a closed-form weighted least-squares solve: refitting the stored inputs reproduces the fit bit for bit
        return restoring(p, () -> cfg.fit(d, y, weights));
    }

    static FunctionalRegression readFunctional(Node n) {
        FunctionalRegression.Method m = n.get("method").enumValue(FunctionalRegression.Method.class);
        int min = n.get("minComponents").integer(0, Integer.MAX_VALUE);
        int max = n.get("maxComponents").integer(0, Integer.MAX_VALUE);
        Node rcn = n.optional("responseComponents");
        Node ln = n.optional("lambdas");
        int folds = n.get("folds").integer(2, Integer.MAX_VALUE);
        long seed = n.get("seed").longValue();
        return restoring(n, () -> {
            FunctionalRegression c;
            if (m == FunctionalRegression.Method.TRUNCATION) {
                c = FunctionalRegression.truncation().withComponents(min, max);
                if (rcn != null) {
                    List<Node> l = rcn.list();
                    int[] rc = new int[l.size()];
                    for (int i = 0; i < rc.length; i++) {
                        rc[i] = l.get(i).integer(1, Integer.MAX_VALUE);
                    }
                    c = c.withResponseComponents(rc);
                }
            } else {
                c = FunctionalRegression.ridge();
                if (ln != null) {
                    c = c.withLambdas(ln.doubles(-1));
                }
            }
            return c.withCrossValidation(folds, seed);
        });
    }

    static FunctionalRegression.Candidate readCandidate(Node n) {
        Node e = n.optional("cvError");
        return restoring(n, () -> new FunctionalRegression.Candidate(n.get("predictorComponents").integer(0,
                Integer.MAX_VALUE), n.get("responseComponents").integer(0, Integer.MAX_VALUE), n.get("lambda").real(),
                e == null ? OptionalDouble.empty() : OptionalDouble.of(e.real())));
    }

    static FunctionalFitState readState(Node n, int rows, int r) {
        List<Node> offNodes = n.get("offsets").list();
        if (offNodes.size() < 2 || offNodes.size() > 1025) {
            throw n.get("offsets").error("has " + offNodes.size() + " entries; 2 to 1025 are accepted");
        }
        int[] off = new int[offNodes.size()];
        for (int i = 0; i < off.length; i++) {
            off[i] = offNodes.get(i).integer(0, n.context().limits.maxElements());
        }
        double[] coef = n.get("coefficients").doubles(off[off.length - 1], r);
        FunctionalRegression.Candidate chosen = readCandidate(n.get("chosen"));
        List<FunctionalRegression.Candidate> cands = new ArrayList<>();
        for (Node c : n.get("candidates").list()) {
            cands.add(readCandidate(c));
        }
        double[] fitted = n.get("fitted").doubles(rows, r);
        double[] resid = n.get("residuals").doubles(rows, r);
        double r2 = n.get("rSquared").real();
        List<Fpca> fp = new ArrayList<>();
        for (Node f : n.get("predictorFpca").list()) {
            fp.add(readFpca(f.get("fpca")));
        }
        List<BayesSpace> sp = new ArrayList<>();
        for (Node s : n.get("predictorSpaces").list()) {
            sp.add(readSpace(s.get("space")));
        }
        return restoring(n, () -> new FunctionalFitState(coef, off, chosen, cands, fitted, resid, r2, fp, sp));
    }

    static FunctionOnFunctionFit readFunctionOnFunction(Node p) {
        FunctionalRegression cfg = readFunctional(p.get("configuration"));
        Design d = readDesign(p.get("design"));
        BayesSpace s = readSpace(p.get("responseSpace"));
        String[] ids = readIds(p.optional("ids"), d.rows());
        FunctionalFitState st = readState(p.get("state"), d.rows(), s.dimension());
        return restoring(p, () -> FunctionOnFunctionFit.restore(cfg, d, s, ids, st));
    }

    static ScalarOnFunctionFit readScalarOnFunction(Node p) {
        FunctionalRegression cfg = readFunctional(p.get("configuration"));
        Design d = readDesign(p.get("design"));
        FunctionalFitState st = readState(p.get("state"), d.rows(), 1);
        return restoring(p, () -> ScalarOnFunctionFit.restore(cfg, d, st));
    }

    static AnomalyScoring readScoring(Node n) {
        double fdr = n.get("fdr").real();
        double level = n.get("bandLevel").real();
        return restoring(n, () -> AnomalyScoring.withDefaults().withFdr(fdr).withBandLevel(level));
    }

    static AnomalyScoring.Calibrated readCalibration(Node p) {
        AnomalyScoring cfg = readScoring(p.get("scoring"));
        BayesSpace s = readSpace(p.get("space"));
        double[] norms = p.get("calibrationNorms").doubles(-1);
        double[] x = p.get("grid").doubles(-1);
        double[] lo = p.get("lower").doubles(x.length);
        double[] hi = p.get("upper").doubles(x.length);
        List<AnomalyScoring.BandPoint> band = new ArrayList<>(x.length);
        for (int q = 0; q < x.length; q++) {
            band.add(new AnomalyScoring.BandPoint(x[q], lo[q], hi[q]));
        }
        return restoring(p, () -> cfg.restore(s, norms, band));
    }

    static Locations readLocations(Node n) {
        Locations.Kind kind = n.get("kind").enumValue(Locations.Kind.class);
        double[] x = n.get("x").doubles(-1);
        double[] y = n.get("y").doubles(x.length);
        return restoring(n, () -> kind == Locations.Kind.PLANAR ? Locations.planar(x, y) : Locations.geographic(x, y));
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
            VariogramModel one = restoring(s, () -> {
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
            m = prev == null ? one : restoring(s, () -> prev.plus(one));
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
        return restoring(p, () -> new VariogramFit(m, p.get("method").enumValue(VariogramFitOptions.Method.class),
                p.get("criterion").real(), p.get("rmse").real(), p.get("fitted").doubles(-1),
                p.get("binsUsed").integer(0, Integer.MAX_VALUE), p.get("evaluations").integer(0, Integer.MAX_VALUE),
                p.get("converged").bool(), p.get("rangeAtBound").bool(), p.get("largestLag").real(), ws));
    }

    static Kriging readKriging(Node p) {
        Kriging.Type type = p.get("type").enumValue(Kriging.Type.class);
        Locations loc = readLocations(p.get("locations"));
        DensitySet d = readDensities(p.get("densities"));
        VariogramModel m = readVariogram(p.get("model"));
        Node o = p.get("options");
        Node nb = o.get("neighbourhood");
        String nk = nb.get("kind").text();
        int count = nb.get("count").integer(1, Integer.MAX_VALUE);
        double radius = nb.get("radius").real();
        Neighbourhood hood = restoring(nb, () -> {
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
        KrigingOptions opt = restoring(o, () -> {
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
            drift = restoring(dn, () -> c == null ? Drift.polynomial(degree) : Drift.polynomial(degree).withCovariates(c));
        }
        Node mn = p.optional("mean");
        double[] mean = mn == null ? null : mn.doubles(d.dimension());
        Drift dr = drift;
        return restoring(p, () -> {
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
        return restoring(p, () -> SpatialWeights.fromCompressedRows(starts, cols, w, rs));
    }

    static ModelBundle readBundle(Node p) {
        Map<String, Object> out = new LinkedHashMap<>();
        for (Node e : p.get("entries").list()) {
            String name = e.get("name").text();
            String type = e.get("type").text();
            if (type.equals("bundle") || !TYPES.containsKey(type)) {
                throw e.get("type").error("'" + type + "' is not a type a bundle entry can have; accepted are "
                        + TYPES.keySet() + " except bundle");
            }
            if (out.containsKey(name)) {
                throw e.get("name").error("'" + name + "' names two entries");
            }
            out.put(name, read(e.get("payload"), type));
        }
        return ModelBundle.of(out);
    }
}
