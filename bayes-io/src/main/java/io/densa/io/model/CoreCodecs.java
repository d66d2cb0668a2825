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
import java.util.Arrays;
import java.util.List;

/**
 * The payloads of bayes-core's model types (spaces, density sets, estimator settings), written and
 * read member by member (see docs/model-format.md). Package-private, used through {@link Codecs}.
 */
final class CoreCodecs {
    private CoreCodecs() {
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
                .bool("parallel", s.parallel()).real("referencePriorWeight", s.referencePriorWeight())
                .text("emptyEnds", s.emptyEnds().name()).end();
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

    /**
     * The period P with a + P == b exactly (b − a, or a neighbouring double when a + (b − a) rounds
     * away from b), so that the restored circle ends at the stored upper end.
     */
    private static double period(double a, double b) {
        double p = b - a;
        for (int i = 0; i < 4 && a + p != b; i++) {
            p = a + p < b ? Math.nextUp(p) : Math.nextDown(p);
        }
        return p;
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
        BayesSpace s = Codecs.restoring(basis, () -> {
            switch (kind) {
                case SPLINE: return BayesSpace.splines(a, b, order, Arrays.copyOfRange(bp, 1, bp.length - 1));
                case POLYNOMIAL: return BayesSpace.polynomials(a, b, order);
                case PERIODIC_SPLINE:
                    return BayesSpace.periodicSplines(a, period(a, b), order, Arrays.copyOf(bp, bp.length - 1));
                case FOURIER: return BayesSpace.fourier(a, period(a, b), order);
                default: return BayesSpace.steps(bp);
            }
        });
        if (kind == Basis.Kind.FOURIER && bp.length != 2) {
            throw basis.get("breakpoints").error("must be [" + a + ", " + b + "] for a Fourier basis");
        }
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
                return Codecs.restoring(ref, () -> s.withReference(Reference.normal(m, sd)));
            }
            case BETA: {
                double al = ref.get("alpha").real();
                double be = ref.get("beta").real();
                return Codecs.restoring(ref, () -> s.withReference(Reference.beta(al, be)));
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
        return Codecs.restoring(n, () -> DensitySet.ofRowMajor(s, c, rows, ids));
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
        Node ends = t.optional("emptyEnds");
        PenalizedLikelihoodEstimator.Settings st = new PenalizedLikelihoodEstimator.Settings(
                t.get("penaltyOrder").integer(1, 64), t.get("smoothing").real(),
                t.get("criterion").enumValue(SmoothingCriterion.class), t.get("folds").integer(2, 50),
                t.get("seed").longValue(), t.get("gridLog10Lo").real(), t.get("gridLog10Hi").real(),
                t.get("gridStep").real(), t.get("maxIterations").integer(1, PenalizedLikelihoodEstimator.MAX_ITERATIONS_LIMIT),
                t.get("tolerance").real(), t.get("quadraturePoints").integer(0, 16),
                t.get("zeroTotal").enumValue(ZeroTotalPolicy.class), t.get("fractionalCounts").bool(),
                t.get("parallel").bool(), t.get("referencePriorWeight").real(),
                // files written before the setting existed read every bin as recorded, as they were fitted
                ends == null ? PenalizedLikelihoodEstimator.EmptyEnds.COUNTED
                        : ends.enumValue(PenalizedLikelihoodEstimator.EmptyEnds.class));
        return Codecs.restoring(t, () -> PenalizedLikelihoodEstimator.withDefaults(s).withSettings(st));
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
            zr = Codecs.restoring(z, () -> ZeroReplacement.multiplicative(delta));
        } else {
            throw z.get("kind").error("'" + kind + "' is not one of [BAYESIAN_MULTIPLICATIVE, MULTIPLICATIVE]");
        }
        SmoothingSplineEstimator.Settings st = new SmoothingSplineEstimator.Settings(zr,
                t.get("penaltyOrder").integer(1, 64), t.get("smoothing").real(), t.get("gcvLog10Lo").real(),
                t.get("gcvLog10Hi").real(), t.get("zeroTotal").enumValue(ZeroTotalPolicy.class),
                t.get("parallel").bool());
        return Codecs.restoring(t, () -> SmoothingSplineEstimator.withDefaults(s).withSettings(st));
    }
}
