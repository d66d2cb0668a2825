package io.densa.examples;

import java.util.Arrays;

/**
 * Split-conformal p-values (Vovk, Gammerman, Shafer (2005), Algorithmic Learning in a Random
 * World, Springer): p = (1 + #{calibration scores ≥ s}) / (n_cal + 1), valid when the test score is
 * exchangeable with the calibration scores.
 */
final class Conformal {
    private Conformal() {
    }

    static double[] pValues(double[] calibration, double[] test) {
        double[] cal = calibration.clone();
        Arrays.sort(cal);
        double[] p = new double[test.length];
        for (int i = 0; i < test.length; i++) {
            int idx = Arrays.binarySearch(cal, test[i]);
            int firstGe;
            if (idx < 0) {
                firstGe = -idx - 1;
            } else {
                firstGe = idx;
                while (firstGe > 0 && cal[firstGe - 1] >= test[i]) {
                    firstGe--;
                }
            }
            p[i] = (1.0 + cal.length - firstGe) / (cal.length + 1.0);
        }
        return p;
    }
}
