package io.densa.core.estimate;

import io.densa.core.DensitySet;
import java.util.ArrayList;
import java.util.List;

/**
 * Densities estimated for many units, in input order, with per-unit diagnostics.
 *
 * @param densities   the estimates (ids kept when given)
 * @param diagnostics one record per unit, same order (unmodifiable)
 */
public record BatchEstimate(DensitySet densities, List<EstimationDiagnostics> diagnostics) {
    /**
     * Copies the list into an unmodifiable one.
     *
     * @throws IllegalArgumentException unless there is one diagnostics record per density
     */
    public BatchEstimate {
        java.util.Objects.requireNonNull(densities, "densities");
        diagnostics = List.copyOf(diagnostics);
        if (diagnostics.size() != densities.size()) {
            throw new IllegalArgumentException(densities.size() + " densities but " + diagnostics.size()
                    + " diagnostics records: one per unit, in the same order");
        }
    }

    /** The count, the space and the first few units' diagnostics. */
    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder("BatchEstimate[n=").append(size()).append(", ")
                .append(densities.space()).append(']');
        for (int i = 0; i < Math.min(3, size()); i++) {
            sb.append("\n  ").append(diagnostics.get(i));
        }
        if (size() > 3) {
            sb.append("\n  … (").append(size() - 3).append(" more units)");
        }
        return sb.toString();
    }

    /** Number of units. */
    public int size() {
        return densities.size();
    }

    /** Row i as a single estimate (density and diagnostics). */
    public UnitEstimate unit(int i) {
        return new UnitEstimate(densities.get(i), diagnostics.get(i));
    }

    /** B2 estimation variance of every unit (trace of its coordinate covariance). */
    public double[] estimationVariances() {
        double[] v = new double[diagnostics.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = diagnostics.get(i).estimationVariance();
        }
        return v;
    }

    /** {@link EstimationDiagnostics#extrapolationShare()} of every unit, in input order. */
    public double[] extrapolationShares() {
        double[] v = new double[diagnostics.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = diagnostics.get(i).extrapolationShare();
        }
        return v;
    }

    /**
     * Ids of the units whose estimate is carried by extrapolation
     * ({@link EstimationDiagnostics#extrapolated()}), in input order ("#i" for row i without ids).
     */
    public List<String> extrapolatedIds() {
        List<String> out = new ArrayList<>();
        for (EstimationDiagnostics d : diagnostics) {
            if (d.extrapolated()) {
                out.add(d.id());
            }
        }
        return out;
    }

    /** Rows whose status is not {@link EstimationDiagnostics.Status#CONVERGED}. */
    public List<Integer> flaggedRows() {
        List<Integer> out = new ArrayList<>();
        for (int i = 0; i < diagnostics.size(); i++) {
            if (!diagnostics.get(i).converged()) {
                out.add(i);
            }
        }
        return out;
    }
}
