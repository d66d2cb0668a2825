package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import java.util.List;

/**
 * Everything a {@link BaselineMonitor} holds besides its configuration, as plain arrays, for
 * saving and loading ({@link BaselineMonitor#state()}, {@link BaselineMonitor#restore}). With
 * n units, K coordinates, q covariates, m lags in the lag set, the longest lag L and d = 1 + m K + q
 * (m = L for consecutive lags 1..L):
 *
 * @param space           the units' space
 * @param ids             the n unit ids
 * @param covariates      q
 * @param momentsZZ       d × d weighted moments Σ w z zᵀ
 * @param momentsZY       d × K weighted moments Σ w z yᵀ
 * @param windowCount     periods held in the window (0 without a window)
 * @param windowZZ        windowCount × d × d per-period moments, oldest first
 * @param windowZY        windowCount × d × K per-period moments, oldest first
 * @param recent          L × n × K coordinates of the last L periods, most recent first (L the longest lag)
 * @param recentVariances the latest period's n estimation variances, or an empty array
 * @param calibrationCount calibration periods held (≤ C)
 * @param calibration     calibrationCount × n × K raw residual coordinates, oldest first
 * @param calibrationX    calibrationCount × n values x_i (0 where {@code hasX} is 0)
 * @param hasX            per calibration period, 1 when it carried estimation variances, else 0
 * @param calibrationKept calibrationCount × n: 1 where a calibration residual is used, 0 where it was
 *                        left out because its unit was flagged in that period
 *                        ({@link RollingBaseline#withFlaggedKeptOutOfCalibration})
 * @param history         the n alert histories
 * @param lastPeriod      index of the latest absorbed period
 * @param absorbed        number of absorbed periods
 */
public record MonitorState(BayesSpace space, String[] ids, int covariates, double[] momentsZZ, double[] momentsZY,
        int windowCount, double[] windowZZ, double[] windowZY, double[] recent, double[] recentVariances,
        int calibrationCount, double[] calibration, double[] calibrationX, int[] hasX, int[] calibrationKept,
        List<AlertHistory> history, int lastPeriod, int absorbed) {
    /** Copies every array and the history list. */
    public MonitorState {
        calibrationKept = calibrationKept.clone();
        ids = ids.clone();
        momentsZZ = momentsZZ.clone();
        momentsZY = momentsZY.clone();
        windowZZ = windowZZ.clone();
        windowZY = windowZY.clone();
        recent = recent.clone();
        recentVariances = recentVariances.clone();
        calibration = calibration.clone();
        calibrationX = calibrationX.clone();
        hasX = hasX.clone();
        history = List.copyOf(history);
    }

    @Override
    public String[] ids() {
        return ids.clone();
    }

    @Override
    public double[] momentsZZ() {
        return momentsZZ.clone();
    }

    @Override
    public double[] momentsZY() {
        return momentsZY.clone();
    }

    @Override
    public double[] windowZZ() {
        return windowZZ.clone();
    }

    @Override
    public double[] windowZY() {
        return windowZY.clone();
    }

    @Override
    public double[] recent() {
        return recent.clone();
    }

    @Override
    public double[] recentVariances() {
        return recentVariances.clone();
    }

    @Override
    public double[] calibration() {
        return calibration.clone();
    }

    @Override
    public double[] calibrationX() {
        return calibrationX.clone();
    }

    @Override
    public int[] hasX() {
        return hasX.clone();
    }

    @Override
    public int[] calibrationKept() {
        return calibrationKept.clone();
    }

    /**
     * A state in which every calibration residual is used (what a monitor saved before flagged
     * residuals could be left out holds).
     */
    public MonitorState(BayesSpace space, String[] ids, int covariates, double[] momentsZZ, double[] momentsZY,
            int windowCount, double[] windowZZ, double[] windowZY, double[] recent, double[] recentVariances,
            int calibrationCount, double[] calibration, double[] calibrationX, int[] hasX, List<AlertHistory> history,
            int lastPeriod, int absorbed) {
        this(space, ids, covariates, momentsZZ, momentsZY, windowCount, windowZZ, windowZY, recent, recentVariances,
                calibrationCount, calibration, calibrationX, hasX, ones(Math.max(0, calibrationCount) * ids.length),
                history, lastPeriod, absorbed);
    }

    private static int[] ones(int length) {
        int[] a = new int[length];
        java.util.Arrays.fill(a, 1);
        return a;
    }

    @Override
    public String toString() {
        return "MonitorState[" + ids.length + " units, " + covariates + " covariates, " + calibrationCount
                + " calibration periods, last period " + lastPeriod + ", absorbed " + absorbed + "]";
    }
}
