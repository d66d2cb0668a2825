package io.densa.spatial.uncertainty;

/**
 * Per-cell Monte Carlo summaries of one derived quantity for the cells of one tile, in the cell
 * order of its {@link io.densa.spatial.kriging.GridTile}: the arrays of a {@link DerivedInterval} per cell. Like
 * {@link io.densa.spatial.kriging.GridTile}, a per-tile buffer: the arrays are fresh for each tile, belong to the consumer
 * and are returned without copying; equality is by reference.
 *
 * @param estimates plug-in values at the kriged densities
 * @param means     means over the draws
 * @param sds       standard deviations over the draws
 * @param lowers    lower ends of the central intervals
 * @param uppers    upper ends of the central intervals
 */
public record IntervalLayer(double[] estimates, double[] means, double[] sds, double[] lowers, double[] uppers) {

    /** Interval widths upper − lower (a fresh array). */
    public double[] widths() {
        double[] w = new double[lowers.length];
        for (int i = 0; i < w.length; i++) {
            w[i] = uppers[i] - lowers[i];
        }
        return w;
    }

    /** The summary of cell q of the tile as a record. */
    public DerivedInterval cell(int q, double level, int draws) {
        return new DerivedInterval(estimates[q], means[q], sds[q], lowers[q], uppers[q], level, draws);
    }

    /** The number of cells (not the arrays). */
    @Override
    public String toString() {
        return "IntervalLayer[" + estimates.length + " cells]";
    }
}
