package io.densa.spark;

import io.densa.core.DensitySet;
import io.densa.regression.surveillance.AnomalyScoring;
import io.densa.regression.Design;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionalRegression;
import java.io.Serializable;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * A fitted baseline for anomaly scoring — a function-on-function regression
 * ({@link FunctionalRegression#fit(java.util.List, io.densa.regression.Design, io.densa.core.DensitySet)}) of a density response on density predictors and
 * numeric covariates, calibrated by {@link AnomalyScoring} on a separate calibration set — held as the
 * inputs it is fitted from (spaces, training and calibration coordinates and covariates, the
 * regression and scoring settings), to broadcast to executors. {@link #model()} fits and calibrates
 * once per JVM; the fit (including its seeded cross-validation) and the calibration are
 * deterministic, so executors hold a model bit-identical to the driver's and score exactly as it
 * would. The training and calibration sets are those of one machine (the model is fitted on the
 * driver); the data scored can be of any size.
 *
 * <p>Immutable. Build with {@link #builder}.
 */
public final class BaselineSpec implements Serializable {
    private static final long serialVersionUID = 1L;

    private final SpaceSpec response;
    private final SpaceSpec[] predictors;
    private final String[] covariates;
    private final boolean ridge;
    private final int minComponents;
    private final int maxComponents;
    private final int[] responseComponents;
    private final double[] lambdas;
    private final int folds;
    private final long seed;
    private final double[][] trainY;
    private final double[][][] trainX; // [predictor][1][n·K_j]
    private final double[][] trainZ;
    private final int trainN;
    private final double[][] calY;
    private final double[][][] calX;
    private final double[][] calZ;
    private final int calN;
    private final double fdr;
    private final double bandLevel;
    private final double[] grid;
    private final PerJvm<Model> model = new PerJvm<>();

    /** The fitted regression and the calibrated scorer. */
    public record Model(FunctionOnFunctionFit fit, AnomalyScoring.Calibrated calibrated, double fdr) {
    }

    private BaselineSpec(Builder b) {
        this.response = b.response;
        this.predictors = b.predictors.toArray(new SpaceSpec[0]);
        this.covariates = b.covariates;
        this.ridge = b.ridge;
        this.minComponents = b.minComponents;
        this.maxComponents = b.maxComponents;
        this.responseComponents = b.responseComponents;
        this.lambdas = b.lambdas;
        this.folds = b.folds;
        this.seed = b.seed;
        this.trainY = new double[][] {b.trainY};
        this.trainX = b.trainX;
        this.trainZ = b.trainZ;
        this.trainN = b.trainN;
        this.calY = new double[][] {b.calY};
        this.calX = b.calX;
        this.calZ = b.calZ;
        this.calN = b.calN;
        this.fdr = b.fdr;
        this.bandLevel = b.bandLevel;
        this.grid = b.grid;
        model(); // fails on the driver for bad settings or data
    }

    /** A builder for the response space. */
    public static Builder builder(SpaceSpec response) {
        return new Builder(Objects.requireNonNull(response, "response"));
    }

    /** The response space. */
    public SpaceSpec response() {
        return response;
    }

    /** Number of density predictors. */
    public int predictorCount() {
        return predictors.length;
    }

    /** Names of the numeric covariates, in design order (fresh copy). */
    public String[] covariates() {
        return covariates.clone();
    }

    /** The fitted and calibrated model (built once per JVM). */
    public Model model() {
        return model.get(() -> build());
    }

    FunctionalRegression configuration() {
        FunctionalRegression r;
        if (ridge) {
            r = FunctionalRegression.ridge();
            if (lambdas != null) {
                r = r.withLambdas(lambdas);
            }
        } else {
            r = FunctionalRegression.truncation().withComponents(minComponents, maxComponents);
        }
        if (responseComponents != null) {
            r = r.withResponseComponents(responseComponents);
        }
        return r.withCrossValidation(folds, seed);
    }

    /** The design of n rows of covariate values [covariate][row], or null without covariates. */
    Design design(double[][] z, int n) {
        if (covariates.length == 0) {
            return null;
        }
        Design.Builder d = Design.builder().rows(n);
        for (int c = 0; c < covariates.length; c++) {
            d.numeric(covariates[c], z[c]);
        }
        return d.build();
    }

    List<DensitySet> predictorSets(double[][] x, int n) {
        List<DensitySet> l = new ArrayList<>();
        for (int j = 0; j < predictors.length; j++) {
            l.add(DensitySet.ofRowMajor(predictors[j].space(), x[j], n, null));
        }
        return l;
    }

    SpaceSpec predictor(int j) {
        return predictors[j];
    }

    private Model build() {
        double[][] tx = new double[predictors.length][];
        double[][] cx = new double[predictors.length][];
        for (int j = 0; j < predictors.length; j++) {
            tx[j] = trainX[j][0];
            cx[j] = calX[j][0];
        }
        FunctionOnFunctionFit fit = configuration().fit(predictorSets(tx, trainN), design(trainZ, trainN),
                DensitySet.ofRowMajor(response.space(), trainY[0], trainN, null));
        DensitySet residuals = fit.residuals(predictorSets(cx, calN), design(calZ, calN),
                DensitySet.ofRowMajor(response.space(), calY[0], calN, null));
        AnomalyScoring.Calibrated c = AnomalyScoring.withDefaults().withFdr(fdr).withBandLevel(bandLevel)
                .fit(residuals, grid);
        return new Model(fit, c, fdr);
    }

    /** Builder of a {@link BaselineSpec}; not thread-safe. */
    public static final class Builder {
        private final SpaceSpec response;
        private final List<SpaceSpec> predictors = new ArrayList<>();
        private String[] covariates = new String[0];
        private boolean ridge;
        private int minComponents = 1;
        private int maxComponents = 20;
        private int[] responseComponents;
        private double[] lambdas;
        private int folds = 5;
        private long seed;
        private double[] trainY;
        private double[][][] trainX;
        private double[][] trainZ;
        private int trainN;
        private double[] calY;
        private double[][][] calX;
        private double[][] calZ;
        private int calN;
        private double fdr = 0.05;
        private double bandLevel = 0.95;
        private double[] grid;

        private Builder(SpaceSpec response) {
            this.response = response;
        }

        /** Adds a density predictor of the given space (in column order of the data). */
        public Builder predictor(SpaceSpec space) {
            predictors.add(Objects.requireNonNull(space, "space"));
            return this;
        }

        /** Names of numeric covariates, in design order. */
        public Builder covariates(String... names) {
            covariates = Objects.requireNonNull(names, "names").clone();
            return this;
        }

        /** FPCA truncation with m in [min, max] chosen by cross-validation (the default, 1..20). */
        public Builder truncation(int min, int max) {
            ridge = false;
            minComponents = min;
            maxComponents = max;
            return this;
        }

        /** Ridge with λ chosen from the given values (none: the default grid) by cross-validation. */
        public Builder ridge(double... lambdaValues) {
            ridge = true;
            lambdas = lambdaValues == null || lambdaValues.length == 0 ? null : lambdaValues.clone();
            return this;
        }

        /** See {@link FunctionalRegression#withResponseComponents}. */
        public Builder responseComponents(int... counts) {
            responseComponents = counts.clone();
            return this;
        }

        /** Folds and seed of the cross-validation (default 5 and 0). */
        public Builder crossValidation(int k, long s) {
            folds = k;
            seed = s;
            return this;
        }

        /**
         * The training set: responses, predictors (one set per predictor, in order) and covariate values
         * [covariate][row] (null without covariates).
         */
        public Builder training(DensitySet y, List<DensitySet> x, double[][] z) {
            trainN = y.size();
            trainY = y.coordinatesRowMajor();
            trainX = coordinates(x, trainN);
            trainZ = copy(z, trainN);
            return this;
        }

        /** The calibration set (not used for the fit), as {@link #training}. */
        public Builder calibration(DensitySet y, List<DensitySet> x, double[][] z) {
            calN = y.size();
            calY = y.coordinatesRowMajor();
            calX = coordinates(x, calN);
            calZ = copy(z, calN);
            return this;
        }

        /** FDR level of the flags, pointwise band level and the grid of the bands (defaults 0.05, 0.95). */
        public Builder anomaly(double fdrLevel, double band, double... gridPoints) {
            fdr = fdrLevel;
            bandLevel = band;
            grid = gridPoints.clone();
            return this;
        }

        private double[][][] coordinates(List<DensitySet> x, int n) {
            Objects.requireNonNull(x, "predictors");
            if (x.size() != predictors.size()) {
                throw new IllegalArgumentException(x.size() + " predictor sets for " + predictors.size()
                        + " predictors");
            }
            double[][][] out = new double[x.size()][][];
            for (int j = 0; j < x.size(); j++) {
                if (x.get(j).size() != n) {
                    throw new IllegalArgumentException("predictor " + j + " has " + x.get(j).size() + " rows, the"
                            + " response " + n);
                }
                out[j] = new double[][] {x.get(j).coordinatesRowMajor()};
            }
            return out;
        }

        private double[][] copy(double[][] z, int n) {
            int c = covariates.length;
            if (c == 0) {
                if (z != null && z.length > 0) {
                    throw new IllegalArgumentException(z.length + " covariate columns given; name them first with"
                            + " covariates(...)");
                }
                return new double[0][];
            }
            if (z == null || z.length != c) {
                throw new IllegalArgumentException((z == null ? 0 : z.length) + " covariate columns for " + c
                        + " covariates");
            }
            double[][] out = new double[c][];
            for (int i = 0; i < c; i++) {
                if (z[i].length != n) {
                    throw new IllegalArgumentException("covariate '" + covariates[i] + "' has " + z[i].length
                            + " values for " + n + " rows");
                }
                out[i] = z[i].clone();
            }
            return out;
        }

        /**
         * Fits and calibrates the baseline on this machine.
         *
         * @throws IllegalArgumentException as the regression and the scorer do, or when a set is missing
         */
        public BaselineSpec build() {
            if (predictors.isEmpty()) {
                throw new IllegalArgumentException("the baseline needs at least one density predictor");
            }
            if (trainY == null || calY == null || grid == null) {
                throw new IllegalArgumentException("give the training set, the calibration set and the anomaly grid");
            }
            return new BaselineSpec(this);
        }
    }
}
