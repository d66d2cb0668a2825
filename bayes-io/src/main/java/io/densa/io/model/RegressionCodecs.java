package io.densa.io.model;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.Design;
import io.densa.regression.Fpca;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionOnScalarFit;
import io.densa.regression.FunctionOnScalarRegression;
import io.densa.regression.FunctionalFitState;
import io.densa.regression.FunctionalRegression;
import io.densa.regression.ScalarOnFunctionFit;
import io.densa.regression.surveillance.AnomalyScoring;
import java.util.ArrayList;
import java.util.List;
import java.util.OptionalDouble;
import org.ejml.data.DMatrixRMaj;

/**
 * The payloads of bayes-regression's model types (designs, FPCA, the three functional regressions,
 * anomaly scoring and its calibration), written and read member by member (see docs/model-format.md).
 * Package-private, used through {@link Codecs}.
 */
final class RegressionCodecs {
    private RegressionCodecs() {
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
        CoreCodecs.space(o, "space", f.space());
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
        CoreCodecs.densities(o, "response", f.response());
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
            CoreCodecs.space(o, "space", sp);
            o.end();
        }
        o.endList().end();
    }

    static void functionOnFunction(Out o, FunctionOnFunctionFit f) {
        o.begin();
        functional(o, "configuration", f.configuration());
        design(o, "design", f.design());
        CoreCodecs.space(o, "responseSpace", f.space());
        DensitySet fitted = f.fitted();
        CoreCodecs.ids(o, "ids", fitted.hasIds() ? fitted.ids() : null);
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
        CoreCodecs.space(o, "space", c.space());
        o.doubles("calibrationNorms", c.calibrationNorms()).doubles("grid", x).doubles("lower", lo)
                .doubles("upper", hi).end();
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
                Codecs.restoring(t, () -> b.numeric(name, v));
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
                Codecs.restoring(t, () -> b.categorical(name, values, ref, levels));
            } else {
                throw t.get("kind").error("'" + kind + "' is not one of [NUMERIC, CATEGORICAL]");
            }
        }
        return Codecs.restoring(n, b::build);
    }

    static Fpca readFpca(Node n) {
        BayesSpace s = CoreCodecs.readSpace(n.get("space"));
        int k = s.dimension();
        int size = n.get("sampleSize").integer(2, Integer.MAX_VALUE);
        double[] mean = n.get("mean").doubles(k);
        double[] values = n.get("eigenvalues").doubles(k);
        double[] vectors = n.get("eigenvectors").doubles(k, k);
        return Codecs.restoring(n, () -> Fpca.restore(s, size, mean, values, vectors));
    }

    static FunctionOnScalarFit readFunctionOnScalar(Node p) {
        Node c = p.get("configuration");
        double lambda = c.get("lambda").real();
        Node pen = c.optional("penalty");
        Design d = readDesign(p.get("design"));
        DensitySet y = CoreCodecs.readDensities(p.get("response"));
        int k = y.dimension();
        FunctionOnScalarRegression cfg = pen == null ? FunctionOnScalarRegression.withDefaults()
                : Codecs.restoring(c, () -> FunctionOnScalarRegression.withDefaults().withPenalty(lambda,
                        DMatrixRMaj.wrap(k, k, pen.doubles(k, k))));
        if (pen == null && lambda != 0) {
            throw c.get("lambda").error("is " + lambda + " without a penalty matrix; 0 is required then");
        }
        Node w = p.optional("weights");
        double[] weights = w == null ? null : w.doubles(y.size());
        // a closed-form weighted least-squares solve: refitting the stored inputs reproduces the fit bit for bit
        return Codecs.restoring(p, () -> cfg.fit(d, y, weights));
    }

    static FunctionalRegression readFunctional(Node n) {
        FunctionalRegression.Method m = n.get("method").enumValue(FunctionalRegression.Method.class);
        int min = n.get("minComponents").integer(0, Integer.MAX_VALUE);
        int max = n.get("maxComponents").integer(0, Integer.MAX_VALUE);
        Node rcn = n.optional("responseComponents");
        Node ln = n.optional("lambdas");
        int folds = n.get("folds").integer(2, Integer.MAX_VALUE);
        long seed = n.get("seed").longValue();
        return Codecs.restoring(n, () -> {
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
        return Codecs.restoring(n, () -> new FunctionalRegression.Candidate(n.get("predictorComponents").integer(0,
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
            sp.add(CoreCodecs.readSpace(s.get("space")));
        }
        return Codecs.restoring(n, () -> new FunctionalFitState(coef, off, chosen, cands, fitted, resid, r2, fp, sp));
    }

    static FunctionOnFunctionFit readFunctionOnFunction(Node p) {
        FunctionalRegression cfg = readFunctional(p.get("configuration"));
        Design d = readDesign(p.get("design"));
        BayesSpace s = CoreCodecs.readSpace(p.get("responseSpace"));
        String[] ids = CoreCodecs.readIds(p.optional("ids"), d.rows());
        FunctionalFitState st = readState(p.get("state"), d.rows(), s.dimension());
        return Codecs.restoring(p, () -> FunctionOnFunctionFit.restore(cfg, d, s, ids, st));
    }

    static ScalarOnFunctionFit readScalarOnFunction(Node p) {
        FunctionalRegression cfg = readFunctional(p.get("configuration"));
        Design d = readDesign(p.get("design"));
        FunctionalFitState st = readState(p.get("state"), d.rows(), 1);
        return Codecs.restoring(p, () -> ScalarOnFunctionFit.restore(cfg, d, st));
    }

    static AnomalyScoring readScoring(Node n) {
        double fdr = n.get("fdr").real();
        double level = n.get("bandLevel").real();
        return Codecs.restoring(n, () -> AnomalyScoring.withDefaults().withFdr(fdr).withBandLevel(level));
    }

    static AnomalyScoring.Calibrated readCalibration(Node p) {
        AnomalyScoring cfg = readScoring(p.get("scoring"));
        BayesSpace s = CoreCodecs.readSpace(p.get("space"));
        double[] norms = p.get("calibrationNorms").doubles(-1);
        double[] x = p.get("grid").doubles(-1);
        double[] lo = p.get("lower").doubles(x.length);
        double[] hi = p.get("upper").doubles(x.length);
        List<AnomalyScoring.BandPoint> band = new ArrayList<>(x.length);
        for (int q = 0; q < x.length; q++) {
            band.add(new AnomalyScoring.BandPoint(x[q], lo[q], hi[q]));
        }
        return Codecs.restoring(p, () -> cfg.restore(s, norms, band));
    }
}
