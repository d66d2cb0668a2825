package io.densa.io.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.Reference;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.SmoothingCriterion;
import io.densa.core.estimate.SmoothingSplineEstimator;
import io.densa.core.estimate.ZeroReplacement;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.Design;
import io.densa.regression.Fpca;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionOnScalarFit;
import io.densa.regression.FunctionOnScalarRegression;
import io.densa.regression.FunctionalRegression;
import io.densa.regression.ScalarOnFunctionFit;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.kriging.Drift;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Base64;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Every saved type predicts or scores after loading exactly as before saving: results are compared
 * on their raw IEEE 754 bits. The data are invented (seeded).
 */
class ModelFileRoundTripTest {
    @TempDir
    Path dir;

    private static final BayesSpace SPACE = BayesSpace.splines(0, 100, 4, 5).withReference(Reference.normal(45, 25));
    private static final BayesSpace PREDICTOR_SPACE = BayesSpace.splines(0, 80, 3, 4);

    @SuppressWarnings("unchecked")
    private <T> T roundTrip(T model) throws Exception {
        Path f = dir.resolve("m" + System.nanoTime() + ".densa.json");
        ModelFile.save(f, model);
        T back = (T) ModelFile.load(f, model.getClass());
        assertNotSame(model, back);
        return back;
    }

    private static void assertBits(double[] expected, double[] actual) {
        assertEquals(expected.length, actual.length, "length");
        for (int i = 0; i < expected.length; i++) {
            assertEquals(Double.doubleToRawLongBits(expected[i]), Double.doubleToRawLongBits(actual[i]),
                    "element " + i + ": " + expected[i] + " vs " + actual[i]);
        }
    }

    private static void assertBits(double expected, double actual) {
        assertEquals(Double.doubleToRawLongBits(expected), Double.doubleToRawLongBits(actual), expected + " vs " + actual);
    }

    static DensitySet profiles(BayesSpace space, int n, long seed, String prefix) {
        Random r = new Random(seed);
        double lo = space.lower();
        double w = space.upper() - lo;
        double[][] c = new double[n][];
        String[] ids = new String[n];
        for (int i = 0; i < n; i++) {
            double m = lo + w * (0.3 + 0.4 * r.nextDouble());
            double s = w * (0.1 + 0.15 * r.nextDouble());
            double b1 = 0.5 * r.nextGaussian();
            double b2 = 0.5 * r.nextGaussian();
            double b3 = 0.3 * r.nextGaussian();
            c[i] = space.projectLogPdf(x -> -0.5 * Math.pow((x - m) / s, 2) + b1 * Math.sin(2 * Math.PI * (x - lo) / w)
                    + b2 * Math.cos(3 * Math.PI * (x - lo) / w) + b3 * Math.sin(5 * Math.PI * (x - lo) / w))
                    .density().coordinates();
            ids[i] = prefix + i;
        }
        return DensitySet.of(space, c, ids);
    }

    @Test
    void spacesOfEveryBasisAndReference() throws Exception {
        List<BayesSpace> spaces = List.of(SPACE, BayesSpace.splines(-1, 3, 2, new double[] {-0.5, 0.25, 2}),
                BayesSpace.polynomials(0, 1, 4).withReference(Reference.uniform()),
                BayesSpace.steps(0, 1, 2.5, 7).withReference(Reference.beta(2, 3)),
                // circles, one with an end that does not round-trip through a + (b − a) naively
                BayesSpace.periodicSplines(0.1, 0.2, 4, 6), BayesSpace.periodicSplines(0.7, 0.1, 3, 5),
                BayesSpace.fourier(-3, 365, 2).withReference(Reference.uniform()));
        for (BayesSpace s : spaces) {
            BayesSpace back = roundTrip(s);
            assertEquals(s, back);
            double[] c = new double[s.dimension()];
            for (int j = 0; j < c.length; j++) {
                c[j] = 0.3 * (j + 1) - 0.5;
            }
            double x = s.lower() + 0.37 * (s.upper() - s.lower());
            assertBits(s.density(c).pdf(x), back.density(c).pdf(x));
            assertBits(s.density(c).quantile(0.8), back.density(c).quantile(0.8));
        }
    }

    @Test
    void densitySetWithIds() throws Exception {
        DensitySet d = profiles(SPACE, 12, 1, "unit-é-");
        DensitySet back = roundTrip(d);
        assertEquals(d.ids(), back.ids());
        assertBits(d.coordinatesRowMajor(), back.coordinatesRowMajor());
        assertBits(d.quantiles(0.5), back.quantiles(0.5));
        DensitySet noIds = DensitySet.of(SPACE, d.coordinates());
        assertTrue(!roundTrip(noIds).hasIds());
    }

    @Test
    void estimatorsFitAsTheOriginal() throws Exception {
        double[] edges = {0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100};
        int[][] counts = new int[6][10];
        Random r = new Random(2);
        for (int[] row : counts) {
            for (int j = 0; j < row.length; j++) {
                row[j] = r.nextInt(12) + (j == 3 ? 20 : 0);
            }
        }
        String[] ids = {"a", "b", "c", "d", "e", "f"};
        PenalizedLikelihoodEstimator ple = PenalizedLikelihoodEstimator.withDefaults(SPACE).withCrossValidation(3, 77)
                .withSmoothingGrid(-5, 2, 0.5).withReferencePrior(2).withMaxIterations(60).withTolerance(1e-11);
        PenalizedLikelihoodEstimator pleBack = roundTrip(ple);
        assertEquals(ple.settings(), pleBack.settings());
        assertBits(ple.fitAll(edges, counts, ids).densities().coordinatesRowMajor(),
                pleBack.fitAll(edges, counts, ids).densities().coordinatesRowMajor());
        PenalizedLikelihoodEstimator fixed = PenalizedLikelihoodEstimator.withDefaults(SPACE).withSmoothing(0.25)
                .withCriterion(SmoothingCriterion.AIC).withSmoothing(0.25);
        assertEquals(fixed.settings(), roundTrip(fixed).settings());

        SmoothingSplineEstimator sse = SmoothingSplineEstimator.withDefaults(SPACE)
                .withZeroReplacement(ZeroReplacement.multiplicative(0.01)).withGcv(-8, 4).withParallel(false);
        SmoothingSplineEstimator sseBack = roundTrip(sse);
        assertBits(sse.fitAll(edges, counts, ids).densities().coordinatesRowMajor(),
                sseBack.fitAll(edges, counts, ids).densities().coordinatesRowMajor());
        SmoothingSplineEstimator bayes = SmoothingSplineEstimator.withDefaults(SPACE).withSmoothing(3);
        assertBits(bayes.fitAll(edges, counts, ids).densities().coordinatesRowMajor(),
                roundTrip(bayes).fitAll(edges, counts, ids).densities().coordinatesRowMajor());
    }

    @Test
    void fpcaScoresAndReconstructions() throws Exception {
        DensitySet d = profiles(SPACE, 40, 3, "u");
        Fpca f = Fpca.fit(d);
        Fpca back = roundTrip(f);
        DensitySet fresh = profiles(SPACE, 9, 4, "v");
        assertBits(f.scores(fresh, 4).values(), back.scores(fresh, 4).values());
        assertBits(f.reconstruct(fresh, 3).coordinatesRowMajor(), back.reconstruct(fresh, 3).coordinatesRowMajor());
        assertBits(f.explainedVariance(), back.explainedVariance());
        assertBits(f.totalVariance(), back.totalVariance());
    }

    private static Design design(int n, long seed) {
        Random r = new Random(seed);
        double[] age = new double[n];
        String[] zone = new String[n];
        for (int i = 0; i < n; i++) {
            age[i] = 20 + 40 * r.nextDouble();
            zone[i] = i < 3 ? new String[] {"north", "south", "west"}[i] : new String[] {"north", "south", "west"}[r.nextInt(3)];
        }
        return Design.builder().numeric("age", age).categorical("zone", zone, "south").build();
    }

    @Test
    void designColumnsAndTerms() throws Exception {
        Design d = design(15, 5);
        Design back = roundTrip(d);
        assertEquals(d.columnNames(), back.columnNames());
        assertEquals(d.terms(), back.terms());
        assertBits(d.matrix().data, back.matrix().data);
        Design plain = Design.builder().withoutIntercept().numeric("x", new double[] {1, 2, 3}).build();
        assertEquals(plain.columnNames(), roundTrip(plain).columnNames());
    }

    @Test
    void functionOnScalarPredictions() throws Exception {
        int n = 30;
        Design x = design(n, 6);
        DensitySet y = profiles(SPACE, n, 7, "r");
        int k = SPACE.dimension();
        DMatrixRMaj pen = new DMatrixRMaj(k, k);
        for (int i = 0; i < k; i++) {
            pen.set(i, i, 1 + i);
        }
        double[] w = new double[n];
        Arrays.fill(w, 1.0);
        w[0] = 2.5;
        FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().withPenalty(0.3, pen).fit(x, y, w);
        FunctionOnScalarFit back = roundTrip(fit);
        Design fresh = design(8, 8);
        assertBits(fit.predict(fresh).coordinatesRowMajor(), back.predict(fresh).coordinatesRowMajor());
        assertBits(fit.coefficients().data, back.coefficients().data);
        assertBits(fit.residualNorms(), back.residualNorms());
        FunctionOnScalarFit plain = FunctionOnScalarRegression.withDefaults().fit(x, y);
        assertBits(plain.predict(fresh).coordinatesRowMajor(), roundTrip(plain).predict(fresh).coordinatesRowMajor());
    }

    @Test
    void functionOnFunctionPredictionsAndResiduals() throws Exception {
        int n = 40;
        DensitySet past = profiles(PREDICTOR_SPACE, n, 9, "d");
        DensitySet now = profiles(SPACE, n, 10, "d");
        Design cov = Design.builder().numeric("rate", new Random(11).doubles(n, 0, 1).toArray()).build();
        FunctionOnFunctionFit fit = FunctionalRegression.truncation().withComponents(1, 4).withCrossValidation(4, 12)
                .fit(List.of(past), cov, now);
        FunctionOnFunctionFit back = roundTrip(fit);
        DensitySet pastNew = profiles(PREDICTOR_SPACE, 7, 13, "e");
        DensitySet nowNew = profiles(SPACE, 7, 14, "e");
        Design covNew = Design.builder().numeric("rate", new Random(15).doubles(7, 0, 1).toArray()).build();
        assertBits(fit.predict(List.of(pastNew), covNew).coordinatesRowMajor(),
                back.predict(List.of(pastNew), covNew).coordinatesRowMajor());
        assertBits(fit.residuals(List.of(pastNew), covNew, nowNew).coordinatesRowMajor(),
                back.residuals(List.of(pastNew), covNew, nowNew).coordinatesRowMajor());
        assertEquals(fit.fitted().ids(), back.fitted().ids());
        assertBits(fit.residualNorms(), back.residualNorms());
        assertEquals(fit.chosen(), back.chosen());
        assertEquals(fit.crossValidation(), back.crossValidation());
        assertBits(fit.predictorFpca(0).scores(pastNew, 3).values(), back.predictorFpca(0).scores(pastNew, 3).values());
        assertBits(fit.kernel(0, new double[] {5, 40}, new double[] {10, 90}).data,
                back.kernel(0, new double[] {5, 40}, new double[] {10, 90}).data);

        FunctionOnFunctionFit ridge = FunctionalRegression.ridge().withLambdas(0.01, 0.1, 1).withCrossValidation(3, 1)
                .fit(List.of(past), null, now);
        assertBits(ridge.predict(List.of(pastNew), null).coordinatesRowMajor(),
                roundTrip(ridge).predict(List.of(pastNew), null).coordinatesRowMajor());
    }

    @Test
    void scalarOnFunctionPredictions() throws Exception {
        int n = 35;
        DensitySet x = profiles(PREDICTOR_SPACE, n, 16, "s");
        double[] y = new double[n];
        Random r = new Random(17);
        for (int i = 0; i < n; i++) {
            y[i] = x.get(i).mean() * 0.1 + r.nextGaussian();
        }
        ScalarOnFunctionFit fit = FunctionalRegression.truncation().withComponents(1, 3).fit(List.of(x),
                null, y);
        ScalarOnFunctionFit back = roundTrip(fit);
        DensitySet fresh = profiles(PREDICTOR_SPACE, 6, 18, "t");
        assertBits(fit.predict(List.of(fresh), null), back.predict(List.of(fresh), null));
        assertBits(fit.fitted(), back.fitted());
        assertEquals(fit.sampleSize(), back.sampleSize());
    }

    @Test
    void anomalyCalibrationScores() throws Exception {
        DensitySet base = profiles(SPACE, 30, 19, "c");
        DensitySet resid = base.centred();
        double[] grid = {5, 20, 35, 50, 65, 80, 95};
        AnomalyScoring.Calibrated cal = AnomalyScoring.withDefaults().withFdr(0.2).withBandLevel(0.8)
                .fit(resid, grid);
        AnomalyScoring.Calibrated back = roundTrip(cal);
        DensitySet fresh = profiles(SPACE, 10, 20, "n").perturb(SPACE.density(1.5, -1, 0.5, 0.2, 0, 0.3, -0.2, 0.1))
                .centred();
        AnomalyScoring.Report a = cal.score(fresh);
        AnomalyScoring.Report b = back.score(fresh);
        assertEquals(a, b); // records compare double components by their bits (Double.compare)
        for (int i = 0; i < a.units().size(); i++) {
            assertBits(a.units().get(i).adjustedPValue(), b.units().get(i).adjustedPValue());
            assertEquals(a.units().get(i).flagged(), b.units().get(i).flagged());
        }
        assertEquals(AnomalyScoring.withDefaults().withFdr(0.2).fdr(),
                roundTrip(AnomalyScoring.withDefaults().withFdr(0.2)).fdr());
    }

    @Test
    void variogramModelsAndFits() throws Exception {
        VariogramModel m = VariogramModel.exponential(2, 30).plus(VariogramModel.matern(0.5, 10, 1.5)).withNugget(0.1);
        VariogramModel back = roundTrip(m);
        assertEquals(m.structures(), back.structures());
        for (double h : new double[] {0.5, 3, 17.25, 80}) {
            assertBits(m.gamma(h), back.gamma(h));
        }
        VariogramModel p = VariogramModel.power(0.7, 1.3);
        assertBits(p.gamma(12), roundTrip(p).gamma(12));
        VariogramFit fit = new VariogramFit(m, VariogramFitOptions.Method.WEIGHTED_CRESSIE, 0.125, 0.03,
                new double[] {0.4, 0.9, 1.7}, 3, 211, true, false, 55.5,
                List.of(new VariogramFit.Warning(VariogramFit.WarningKind.RANGE_BEYOND_LAGS, "range 90 beyond 55.5")));
        VariogramFit fitBack = roundTrip(fit);
        assertEquals(fit, fitBack);
        assertBits(fit.model().gamma(7), fitBack.model().gamma(7));
    }

    static Locations stations(int n, long seed) {
        Random r = new Random(seed);
        return Locations.planar(r.doubles(n, 0, 100).toArray(), r.doubles(n, 0, 100).toArray());
    }

    private static void assertSame(KrigingPrediction a, KrigingPrediction b) {
        assertBits(a.density().coordinates(), b.density().coordinates());
        assertBits(a.variance(), b.variance());
    }

    @Test
    void krigingPredictions() throws Exception {
        int n = 60;
        Locations loc = stations(n, 21);
        DensitySet d = profiles(SPACE, n, 22, "k");
        VariogramModel m = VariogramModel.exponential(0.8, 40).withNugget(0.05);
        double[] ev = new double[n];
        ev[3] = 0.01;
        Kriging ok = Kriging.ordinary(loc, d, m, KrigingOptions.withDefaults()
                .withNeighbourhood(Neighbourhood.nearest(12)).withErrorVariances(ev));
        double[][] cov = new double[n][];
        for (int i = 0; i < n; i++) {
            cov[i] = new double[] {Math.sin(loc.x(i) / 10)};
        }
        Kriging uk = Kriging.universal(loc, d, Drift.polynomial(1).withCovariates(cov), m,
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.radius(45, 20)));
        Kriging sk = Kriging.simple(loc, d, d.mean(), m, KrigingOptions.withDefaults().withParallel(false));
        Kriging global = Kriging.ordinary(loc, d, m, KrigingOptions.withDefaults());
        for (Kriging k : List.of(ok, sk, global)) {
            Kriging back = roundTrip(k);
            assertEquals(k.type(), back.type());
            for (double[] t : new double[][] {{10, 10}, {55.5, 42.25}, {99, 1}}) {
                assertSame(k.predict(t[0], t[1]), back.predict(t[0], t[1]));
            }
        }
        Kriging ukBack = roundTrip(uk);
        assertSame(uk.predict(50, 50, new double[] {0.3}), ukBack.predict(50, 50, new double[] {0.3}));
    }

    @Test
    void spatialWeightsStatistics() throws Exception {
        Locations loc = stations(50, 23);
        for (SpatialWeights w : List.of(SpatialWeights.nearestNeighbours(loc, 4, SpatialWeights.Symmetry.UNION),
                SpatialWeights.inverseDistance(loc, 2, 30).rowStandardised())) {
            SpatialWeights back = roundTrip(w);
            assertArrayEquals(w.rowStarts(), back.rowStarts());
            assertArrayEquals(w.columnIndices(), back.columnIndices());
            assertBits(w.linkWeights(), back.linkWeights());
            assertEquals(w.isRowStandardised(), back.isRowStandardised());
            assertBits(new double[] {w.s0(), w.s1(), w.s2()}, new double[] {back.s0(), back.s1(), back.s2()});
            double[] v = new Random(24).doubles(50).toArray();
            assertBits(w.spatialLag(v), back.spatialLag(v));
        }
        Locations geo = Locations.geographic(new double[] {10.5, 11, 12.25}, new double[] {45, 46.5, 44});
        Locations geoBack = roundTrip(geo);
        assertBits(geo.distance(0, 2), geoBack.distance(0, 2));
        assertEquals(geo.kind(), geoBack.kind());
    }

    @Test
    void bundleKeepsNamesOrderAndTypes() throws Exception {
        DensitySet d = profiles(SPACE, 10, 25, "b");
        Fpca f = Fpca.fit(d);
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("space", SPACE);
        m.put("fpca", f);
        m.put("data", d);
        ModelBundle back = roundTrip(ModelBundle.of(m));
        assertEquals(List.copyOf(m.keySet()), new ArrayList<>(back.entries().keySet()));
        assertBits(f.scores(d, 2).values(), back.get("fpca", Fpca.class).scores(d, 2).values());
        assertEquals(SPACE, back.get("space", BayesSpace.class));
        assertTrue(ModelFile.load(writeBytes(ModelFile.toBytes(SPACE)), Object.class) instanceof BayesSpace);
    }

    private Path writeBytes(byte[] b) throws Exception {
        Path p = dir.resolve("raw" + System.nanoTime());
        Files.write(p, b);
        return p;
    }

    /**
     * The file read with an independent JSON parser (Gson) by the rules of docs/model-format.md: the
     * envelope members, SHA-256 (FIPS 180-4) over the payload's bytes, and an array decoded as base64
     * (RFC 4648) little-endian IEEE 754 doubles give back the saved coordinates.
     */
    @Test
    void formatReadableByTheSpecificationAlone() throws Exception {
        DensitySet d = profiles(SPACE, 5, 26, "g");
        byte[] file = ModelFile.toBytes(d);
        String text = new String(file, StandardCharsets.UTF_8);
        JsonObject root = JsonParser.parseString(text).getAsJsonObject();
        assertEquals("densa-model", root.get("format").getAsString());
        assertEquals(1, root.get("version").getAsInt());
        assertEquals("density-set", root.get("type").getAsString());
        // the payload is the last member: its bytes end right before the document's closing brace
        int end = text.stripTrailing().length() - 1;
        int len = root.get("payloadBytes").getAsInt();
        byte[] payload = Arrays.copyOfRange(file, end - len, end);
        assertEquals(root.get("sha256").getAsString(),
                HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(payload)));
        JsonObject coords = root.getAsJsonObject("payload").getAsJsonObject("densities").getAsJsonObject("coordinates");
        assertEquals(5, coords.getAsJsonArray("shape").get(0).getAsInt());
        assertEquals(SPACE.dimension(), coords.getAsJsonArray("shape").get(1).getAsInt());
        ByteBuffer b = ByteBuffer.wrap(Base64.getDecoder().decode(coords.get("f64le").getAsString()))
                .order(ByteOrder.LITTLE_ENDIAN);
        double[] c = new double[b.remaining() / 8];
        b.asDoubleBuffer().get(c);
        assertBits(d.coordinatesRowMajor(), c);
    }
}
