package io.densa.spark;

import io.densa.spatial.variogram.VariogramOptions;
import java.io.Serializable;
import java.util.ArrayList;
import java.util.List;

/**
 * {@link VariogramOptions} as primitives, to broadcast to executors: the {@code with…} methods mirror
 * the options' and are recorded in order; {@link #options()} replays them on
 * {@link VariogramOptions#withDefaults()} (single-threaded: Spark runs the blocks in parallel), so an
 * executor resolves exactly the bins the driver resolves. The variogram cloud and progress listeners
 * are not offered. Immutable.
 */
public final class VariogramSpec implements Serializable {
    private static final long serialVersionUID = 1L;
    private static final int MIN_PAIRS = 0;
    private static final int BIN_COUNT = 1;
    private static final int BIN_WIDTH = 2;
    private static final int EDGES = 3;
    private static final int MAX_LAG = 4;
    private static final int DIRECTIONS = 5;

    /** Each step: {operation, arguments...}. */
    private final List<double[]> steps;

    private VariogramSpec(List<double[]> steps) {
        this.steps = steps;
        options(); // validates
    }

    /** The defaults of {@link VariogramOptions#withDefaults()}. */
    public static VariogramSpec withDefaults() {
        return new VariogramSpec(List.of());
    }

    private VariogramSpec then(double[] step) {
        List<double[]> l = new ArrayList<>(steps);
        l.add(step);
        return new VariogramSpec(List.copyOf(l));
    }

    private static double[] step(int op, double... args) {
        double[] s = new double[args.length + 1];
        s[0] = op;
        System.arraycopy(args, 0, s, 1, args.length);
        return s;
    }

    /** See {@link VariogramOptions#withMinimumPairs}. */
    public VariogramSpec withMinimumPairs(int count) {
        return then(step(MIN_PAIRS, count));
    }

    /** See {@link VariogramOptions#withBinCount}. */
    public VariogramSpec withBinCount(int count) {
        return then(step(BIN_COUNT, count));
    }

    /** See {@link VariogramOptions#withBinWidth}. */
    public VariogramSpec withBinWidth(double width) {
        return then(step(BIN_WIDTH, width));
    }

    /** See {@link VariogramOptions#withEdges}. */
    public VariogramSpec withEdges(double... binEdges) {
        return then(step(EDGES, binEdges.clone()));
    }

    /** See {@link VariogramOptions#withMaxLag}. */
    public VariogramSpec withMaxLag(double lag) {
        return then(step(MAX_LAG, lag));
    }

    /** See {@link VariogramOptions#withDirections}. */
    public VariogramSpec withDirections(double toleranceDegrees, double... directionsDegrees) {
        double[] a = new double[directionsDegrees.length + 1];
        a[0] = toleranceDegrees;
        System.arraycopy(directionsDegrees, 0, a, 1, directionsDegrees.length);
        return then(step(DIRECTIONS, a));
    }

    /** The options: the recorded steps replayed on the defaults, single-threaded. */
    public VariogramOptions options() {
        VariogramOptions o = VariogramOptions.withDefaults().withParallel(false);
        for (double[] s : steps) {
            switch ((int) s[0]) {
                case MIN_PAIRS:
                    o = o.withMinimumPairs((int) s[1]);
                    break;
                case BIN_COUNT:
                    o = o.withBinCount((int) s[1]);
                    break;
                case BIN_WIDTH:
                    o = o.withBinWidth(s[1]);
                    break;
                case EDGES:
                    o = o.withEdges(java.util.Arrays.copyOfRange(s, 1, s.length));
                    break;
                case MAX_LAG:
                    o = o.withMaxLag(s[1]);
                    break;
                default:
                    o = o.withDirections(s[1], java.util.Arrays.copyOfRange(s, 2, s.length));
                    break;
            }
        }
        return o;
    }

    @Override
    public String toString() {
        return "VariogramSpec[" + options() + "]";
    }
}
