package io.densa.spatial;

import java.util.Arrays;
import java.util.Objects;

/**
 * The compressed-row form of {@link SpatialWeights} built from neighbour lists or a dense matrix,
 * with the checks every builder shares (package-private).
 */
final class WeightsAssembly {
    private WeightsAssembly() {
    }

    static SpatialWeights fromMatrix(double[][] matrix) {
        Objects.requireNonNull(matrix, "matrix");
        int n = matrix.length;
        checkUnits(n);
        int[][] nb = new int[n][];
        double[][] wt = new double[n][];
        for (int i = 0; i < n; i++) {
            if (matrix[i] == null || matrix[i].length != n) {
                throw new IllegalArgumentException("weights matrix row " + i + " has "
                        + (matrix[i] == null ? "no" : String.valueOf(matrix[i].length))
                        + " entries; a square " + n + " x " + n + " matrix is required");
            }
            int count = 0;
            for (int j = 0; j < n; j++) {
                checkWeight(matrix[i][j], i, j);
                if (matrix[i][j] > 0) {
                    count++;
                }
            }
            nb[i] = new int[count];
            wt[i] = new double[count];
            int c = 0;
            for (int j = 0; j < n; j++) {
                if (matrix[i][j] > 0) {
                    nb[i][c] = j;
                    wt[i][c++] = matrix[i][j];
                }
            }
        }
        return assemble(n, nb, wt);
    }

    static SpatialWeights fromNeighbours(int[][] neighbours, double[][] weights) {
        Objects.requireNonNull(neighbours, "neighbours");
        Objects.requireNonNull(weights, "weights");
        int n = neighbours.length;
        checkUnits(n);
        if (weights.length != n) {
            throw new IllegalArgumentException("weights has " + weights.length + " rows but neighbours has " + n);
        }
        int[][] nb = new int[n][];
        double[][] wt = new double[n][];
        for (int i = 0; i < n; i++) {
            if (neighbours[i] == null || weights[i] == null || neighbours[i].length != weights[i].length) {
                throw new IllegalArgumentException("unit " + i + ": neighbour list and weight list must both be"
                        + " given and have the same length");
            }
            nb[i] = neighbours[i].clone();
            wt[i] = weights[i].clone();
            for (int m = 0; m < nb[i].length; m++) {
                int j = nb[i][m];
                if (j < 0 || j >= n) {
                    throw new IllegalArgumentException("unit " + i + " lists neighbour " + j
                            + ", outside 0.." + (n - 1));
                }
                if (j == i) {
                    throw new IllegalArgumentException("unit " + i + " lists itself as a neighbour;"
                            + " the diagonal of the weights must be zero");
                }
                if (!(wt[i][m] > 0 && wt[i][m] < Double.POSITIVE_INFINITY)) {
                    throw new IllegalArgumentException("weight of link " + i + " -> " + j + " is " + wt[i][m]
                            + "; weights must be finite and positive");
                }
            }
        }
        return assemble(n, nb, wt);
    }

    static void checkUnits(int n) {
        if (n < 2) {
            throw new IllegalArgumentException("spatial weights need at least 2 units, got " + n);
        }
    }

    static void checkWeight(double w, int i, int j) {
        if (!(w >= 0 && w < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException("weight (" + i + ", " + j + ") = " + w
                    + "; weights must be finite and >= 0");
        }
        if (i == j && w != 0) {
            throw new IllegalArgumentException("diagonal weight (" + i + ", " + i + ") = " + w
                    + "; a unit cannot be its own neighbour (diagonal must be 0)");
        }
    }

    /** Sorts every row by column, optionally checking for duplicates, and builds the CSR arrays. */
    static SpatialWeights assemble(int n, int[][] nb, double[][] wt) {
        int[] start = new int[n + 1];
        for (int i = 0; i < n; i++) {
            start[i + 1] = start[i] + nb[i].length;
        }
        int[] cols = new int[start[n]];
        double[] vals = new double[start[n]];
        for (int i = 0; i < n; i++) {
            int len = nb[i].length;
            int[] c = nb[i];
            double[] w = wt[i];
            Integer[] order = new Integer[len];
            for (int a = 0; a < len; a++) {
                order[a] = a;
            }
            Arrays.sort(order, (a, b) -> Integer.compare(c[a], c[b]));
            for (int a = 0; a < len; a++) {
                cols[start[i] + a] = c[order[a]];
                vals[start[i] + a] = w[order[a]];
                if (a > 0 && cols[start[i] + a] == cols[start[i] + a - 1]) {
                    throw new IllegalArgumentException("unit " + i + " lists neighbour "
                            + cols[start[i] + a] + " more than once");
                }
            }
        }
        return new SpatialWeights(n, start, cols, vals, false);
    }
}
