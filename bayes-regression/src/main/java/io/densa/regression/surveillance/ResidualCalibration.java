package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.Arrays;
import java.util.List;
import org.ejml.data.DMatrixRMaj;

/** The rolling calibration set's arithmetic: the variance line, standardisation, covariance. */
final class ResidualCalibration {
    private ResidualCalibration() {
    }

    /**
     * (a, b) ≥ 0 minimising Σ (‖r‖² − a x − b)² over the calibration residuals (rows × K per period,
     * the rows a period keeps), or null when a calibration period lacks estimation variances.
     */
    static double[] varianceLine(List<double[]> calibration, List<double[]> calibrationX, int k) {
        double sw = 0;
        double sx = 0;
        double sxx = 0;
        double sy = 0;
        double sxy = 0;
        for (int c = 0; c < calibration.size(); c++) {
            double[] x = calibrationX.get(c);
            if (x == null) {
                return null;
            }
            double[] r = calibration.get(c);
            int n = r.length / k;
            for (int i = 0; i < n; i++) {
                double s = 0;
                for (int j = 0; j < k; j++) {
                    s += r[i * k + j] * r[i * k + j];
                }
                sw += 1;
                sx += x[i];
                sxx += x[i] * x[i];
                sy += s;
                sxy += x[i] * s;
            }
        }
        double det = sw * sxx - sx * sx;
        double a = det > 0 ? (sw * sxy - sx * sy) / det : 0;
        double b = (sy - a * sx) / sw;
        if (a < 0) {
            a = 0;
            b = sy / sw;
        } else if (b < 0) {
            b = 0;
            a = sxx > 0 ? sxy / sxx : 0;
        }
        if (!(sw > 0) || !(a * (sx / sw) + b > 0)) {
            return null;
        }
        return new double[] {a, b};
    }

    /** Residual rows powered by 1/√(a x_i + b) (unchanged without the line). */
    static DensitySet standardised(BayesSpace space, double[] r, double[] x, double[] ab, int k, String[] rowIds) {
        int n = r.length / k;
        double[] s = r.clone();
        if (ab != null && x != null) {
            double floor = 1e-12 * (ab[1] + ab[0] * Arrays.stream(x).average().orElse(0));
            for (int i = 0; i < n; i++) {
                double f = 1 / Math.sqrt(Math.max(ab[0] * x[i] + ab[1], floor));
                for (int j = 0; j < k; j++) {
                    s[i * k + j] *= f;
                }
            }
        }
        return DensitySet.ofRowMajor(space, s, n, rowIds);
    }

    /**
     * The residual law of {@link PeriodReport#residualCovariance}: returns the shape S (K × K) and
     * writes the per-unit scales into {@code scales} (n) — with the variance line (ab) and the
     * period's x values, S the covariance of the standardised calibration residuals {@code cal} and
     * scale a x_i + b; otherwise S the raw covariance over its trace and every scale that trace.
     * The baseline's own part of each scale goes into {@code baselineScales} (n): a u_i + b with u_i
     * the previous period's estimation variance ({@code previous}, the x values' second term), the
     * line without the current period's counting noise; without the variance line, the whole scale.
     */
    static double[][] residualLaw(DensitySet cal, double[] ab, double[] x, double[] previous,
            double[][] rawCovariance, double[] scales, double[] baselineScales) {
        int k = rawCovariance.length;
        if (ab != null && x != null) {
            for (int i = 0; i < scales.length; i++) {
                scales[i] = Math.max(ab[0] * x[i] + ab[1], 0.0);
                baselineScales[i] = Math.max(ab[0] * previous[i] + ab[1], 0.0);
            }
            return cal.size() >= 2 ? rows(cal.covariance().data, k) : new double[k][k];
        }
        double tr = 0;
        for (int a = 0; a < k; a++) {
            tr += rawCovariance[a][a];
        }
        double[][] shape = new double[k][];
        for (int a = 0; a < k; a++) {
            shape[a] = rawCovariance[a].clone();
            for (int b = 0; b < k && tr > 0; b++) {
                shape[a][b] /= tr;
            }
        }
        Arrays.fill(scales, tr > 0 ? tr : 1.0);
        Arrays.fill(baselineScales, tr > 0 ? tr : 1.0);
        return shape;
    }

    private static double[][] rows(double[] flat, int k) {
        double[][] out = new double[k][];
        for (int a = 0; a < k; a++) {
            out[a] = Arrays.copyOfRange(flat, a * k, (a + 1) * k);
        }
        return out;
    }

    /** Covariance (K × K, divisor m − 1, {@link DensitySet#covariance()}) of the raw calibration residuals. */
    static double[][] covariance(BayesSpace space, List<double[]> calibration, int k) {
        int m = 0;
        for (double[] r : calibration) {
            m += r.length / k;
        }
        if (m < 2) {
            return new double[k][k];
        }
        double[] all = new double[m * k];
        int o = 0;
        for (double[] r : calibration) {
            System.arraycopy(r, 0, all, o, r.length);
            o += r.length;
        }
        DMatrixRMaj cov = DensitySet.ofRowMajor(space, all, m, null).covariance();
        return rows(cov.data, k);
    }

    /**
     * The calibration residuals and x values of the kept rows only, per calibration period (periods
     * with no kept row are left out); {@code kept} holds per period 1/0 flags, or null for all kept.
     */
    static List<double[][]> kept(List<double[]> calibration, List<double[]> calibrationX, List<int[]> kept, int n,
            int k) {
        List<double[][]> out = new java.util.ArrayList<>(calibration.size());
        for (int c = 0; c < calibration.size(); c++) {
            int[] flags = kept.get(c);
            double[] r = calibration.get(c);
            double[] x = calibrationX.get(c);
            if (flags == null) {
                out.add(new double[][] {r, x});
                continue;
            }
            int m = Arrays.stream(flags).sum();
            if (m == 0) {
                continue;
            }
            double[] rr = new double[m * k];
            double[] xx = x == null ? null : new double[m];
            int o = 0;
            for (int i = 0; i < n; i++) {
                if (flags[i] == 1) {
                    System.arraycopy(r, i * k, rr, o * k, k);
                    if (xx != null) {
                        xx[o] = x[i];
                    }
                    o++;
                }
            }
            out.add(new double[][] {rr, xx});
        }
        return out;
    }

    /**
     * The kept flags of calibration period t from a saved state (n values from t·n), checked to be 0
     * or 1; null when all are 1.
     *
     * @throws IllegalArgumentException on a value other than 0 or 1, naming its index
     */
    static int[] keptFlags(int[] all, int t, int n) {
        int[] flags = Arrays.copyOfRange(all, t * n, (t + 1) * n);
        boolean every = true;
        for (int i = 0; i < n; i++) {
            if (flags[i] != 0 && flags[i] != 1) {
                throw new IllegalArgumentException("monitor state member calibrationKept[" + (t * n + i) + "] is "
                        + flags[i] + "; 0 or 1 are accepted");
            }
            every &= flags[i] == 1;
        }
        return every ? null : flags;
    }
}
