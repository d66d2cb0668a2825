package io.densa.spatial.kriging;

import io.densa.core.DensitySet;
import io.densa.core.internal.RecordArrays;
import io.densa.spatial.Locations;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.util.List;
import java.util.Objects;

/**
 * Universal kriging with the residual variogram re-estimated from the drift fit: starting from
 * ordinary-least-squares drift residuals, repeat (1) the empirical trace-variogram of the
 * residuals, (2) a variogram fit, (3) the generalised-least-squares drift
 * β̂ = (FᵀC⁻¹F)⁻¹FᵀC⁻¹Y under the fitted model and new residuals Y − Fβ̂, until the fitted
 * parameters change by less than a relative 10⁻⁴ or the iteration budget is spent ("A Universal
 * Kriging predictor for spatially dependent functional data of a Hilbert Space", Electron. J.
 * Statist. 7 (2013), doi:10.1214/13-EJS843 — from memory). The GLS step uses the global
 * neighbourhood (O(n³)); the returned predictor uses the caller's kriging options. Residual
 * variograms are biased low at large lags (the drift absorbs variation), a known limitation.
 *
 * <p>Immutable record: the coefficient array is copied on construction and by its accessor;
 * equality is by content.
 *
 * @param kriging             the universal kriging predictor with the final model
 * @param fit                 the final variogram fit of the residuals
 * @param residualVariogram   the final empirical residual variogram
 * @param driftCoefficients   the final GLS coefficients (p × K)
 * @param iterations          variogram fits performed
 * @param converged           whether the parameters settled within the budget
 */
public record UniversalFit(Kriging kriging, VariogramFit fit, EmpiricalVariogram residualVariogram,
        double[][] driftCoefficients, int iterations, boolean converged) {

    /** Copies the array components (the caller keeps its arrays). */
    public UniversalFit {
        driftCoefficients = RecordArrays.copy(driftCoefficients);
    }

    /** A copy of the {@code driftCoefficients} component. */
    @Override
    public double[][] driftCoefficients() {
        return RecordArrays.copy(driftCoefficients);
    }

    /** Equality by content of every component (arrays element by element). */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    /** The components, arrays printed by content. */
    @Override
    public String toString() {
        return RecordArrays.describe(this);
    }

    /**
     * Runs the iteration.
     *
     * @param maxIterations at least 1
     */
    public static UniversalFit estimate(Locations locations, DensitySet densities, Drift drift,
            VariogramOptions variogramOptions, VariogramFitOptions fitOptions, KrigingOptions options,
            int maxIterations) {
        Objects.requireNonNull(variogramOptions, "variogramOptions");
        Objects.requireNonNull(fitOptions, "fitOptions");
        Objects.requireNonNull(options, "options");
        if (maxIterations < 1) {
            throw new IllegalArgumentException("iteration budget must be >= 1, got " + maxIterations);
        }
        KrigingOptions glsOptions = options.withNeighbourhood(Neighbourhood.global());
        // OLS: GLS with C = I (a pure unit nugget)
        Kriging ols = Kriging.universal(locations, densities, drift, VariogramModel.nugget(1), glsOptions);
        double[][] beta = ols.driftCoefficients();
        double[] resid = ols.driftResiduals();
        VariogramFit fit = null;
        EmpiricalVariogram ev = null;
        boolean converged = false;
        int it = 0;
        while (it < maxIterations) {
            ev = EmpiricalVariogram.of(locations, DensitySet.ofRowMajor(densities.space(), resid, densities.size(), null),
                    variogramOptions);
            VariogramFit next = VariogramFitting.fit(ev, fitOptions);
            it++;
            boolean settled = fit != null && close(fit.model(), next.model());
            fit = next;
            Kriging gls = Kriging.universal(locations, densities, drift, fit.model(), glsOptions);
            beta = gls.driftCoefficients();
            resid = gls.driftResiduals();
            if (settled) {
                converged = true;
                break;
            }
        }
        Kriging result = Kriging.universal(locations, densities, drift, fit.model(), options);
        return new UniversalFit(result, fit, ev, beta, it, converged);
    }

    private static boolean close(VariogramModel a, VariogramModel b) {
        List<VariogramModel.Structure> sa = a.structures(), sb = b.structures();
        if (sa.size() != sb.size()) {
            return false;
        }
        for (int i = 0; i < sa.size(); i++) {
            if (!rel(sa.get(i).partialSill(), sb.get(i).partialSill()) || !rel(sa.get(i).range(), sb.get(i).range())) {
                return false;
            }
        }
        return true;
    }

    private static boolean rel(double x, double y) {
        if (Double.isNaN(x) && Double.isNaN(y)) {
            return true;
        }
        return Math.abs(x - y) <= 1e-4 * Math.max(Math.abs(x), Math.abs(y));
    }
}
