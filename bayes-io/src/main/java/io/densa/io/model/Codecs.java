package io.densa.io.model;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.SmoothingSplineEstimator;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.Design;
import io.densa.regression.Fpca;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionOnScalarFit;
import io.densa.regression.ScalarOnFunctionFit;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramModel;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

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
        TYPES.put("baseline-monitor", io.densa.regression.surveillance.BaselineMonitor.class);
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
            case "bayes-space": o.begin(); CoreCodecs.space(o, "space", (BayesSpace) m); o.end(); break;
            case "density-set": o.begin(); CoreCodecs.densities(o, "densities", (DensitySet) m); o.end(); break;
            case "penalized-likelihood-estimator": CoreCodecs.penalized(o, (PenalizedLikelihoodEstimator) m); break;
            case "smoothing-spline-estimator": CoreCodecs.smoothing(o, (SmoothingSplineEstimator) m); break;
            case "design": o.begin(); RegressionCodecs.design(o, "design", (Design) m); o.end(); break;
            case "fpca": o.begin(); RegressionCodecs.fpca(o, "fpca", (Fpca) m); o.end(); break;
            case "function-on-scalar-fit": RegressionCodecs.functionOnScalar(o, (FunctionOnScalarFit) m); break;
            case "function-on-function-fit": RegressionCodecs.functionOnFunction(o, (FunctionOnFunctionFit) m); break;
            case "scalar-on-function-fit": RegressionCodecs.scalarOnFunction(o, (ScalarOnFunctionFit) m); break;
            case "anomaly-scoring": o.begin(); RegressionCodecs.scoring(o, "scoring", (AnomalyScoring) m); o.end(); break;
            case "anomaly-calibration": RegressionCodecs.calibration(o, (AnomalyScoring.Calibrated) m); break;
            case "locations": o.begin(); SpatialCodecs.locations(o, "locations", (Locations) m); o.end(); break;
            case "variogram-model": o.begin(); SpatialCodecs.variogram(o, "model", (VariogramModel) m); o.end(); break;
            case "variogram-fit": SpatialCodecs.variogramFit(o, (VariogramFit) m); break;
            case "kriging": SpatialCodecs.kriging(o, (Kriging) m); break;
            case "spatial-weights": SpatialCodecs.weights(o, (SpatialWeights) m); break;
            case "baseline-monitor": MonitorCodec.write(o, (io.densa.regression.surveillance.BaselineMonitor) m); break;
            case "bundle": bundle(o, (ModelBundle) m); break;
            default: throw new IllegalStateException("no codec for " + type);
        }
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
            case "bayes-space": return CoreCodecs.readSpace(p.get("space"));
            case "density-set": return CoreCodecs.readDensities(p.get("densities"));
            case "penalized-likelihood-estimator": return CoreCodecs.readPenalized(p);
            case "smoothing-spline-estimator": return CoreCodecs.readSmoothing(p);
            case "design": return RegressionCodecs.readDesign(p.get("design"));
            case "fpca": return RegressionCodecs.readFpca(p.get("fpca"));
            case "function-on-scalar-fit": return RegressionCodecs.readFunctionOnScalar(p);
            case "function-on-function-fit": return RegressionCodecs.readFunctionOnFunction(p);
            case "scalar-on-function-fit": return RegressionCodecs.readScalarOnFunction(p);
            case "anomaly-scoring": return RegressionCodecs.readScoring(p.get("scoring"));
            case "anomaly-calibration": return RegressionCodecs.readCalibration(p);
            case "locations": return SpatialCodecs.readLocations(p.get("locations"));
            case "variogram-model": return SpatialCodecs.readVariogram(p.get("model"));
            case "variogram-fit": return SpatialCodecs.readVariogramFit(p);
            case "kriging": return SpatialCodecs.readKriging(p);
            case "spatial-weights": return SpatialCodecs.readWeights(p);
            case "baseline-monitor": return MonitorCodec.read(p);
            case "bundle": return readBundle(p);
            default: throw p.error("unknown model type '" + type + "'; this Densa reads " + TYPES.keySet());
        }
    }

    /** Runs a library restore step; its IllegalArgumentException is reported against the field. */
    static <T> T restoring(Node at, java.util.function.Supplier<T> step) {
        try {
            return step.get();
        } catch (IllegalArgumentException | IllegalStateException | NullPointerException e) {
            throw at.error("cannot be restored: " + e.getMessage());
        }
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
