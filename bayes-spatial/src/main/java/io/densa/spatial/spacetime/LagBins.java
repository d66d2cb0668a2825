package io.densa.spatial.spacetime;

/**
 * Lag classes along one axis (space or time) of a space–time variogram: class 0 holds the pairs
 * at lag exactly 0 (the same location, or the same time), class b ≥ 1 the lags in
 * ((b − 1) w, b w]; lags beyond {@code count · width} are not binned. With integer period indices
 * and width 1, class b holds exactly the pairs b periods apart.
 *
 * @param width the class width w &gt; 0 (finite)
 * @param count the number of classes after class 0, at least 1
 */
public record LagBins(double width, int count) {
    /**
     * @throws IllegalArgumentException unless width is finite and &gt; 0 and count ≥ 1 with
     *                                  count · width finite
     */
    public LagBins {
        if (!(width > 0) || Double.isInfinite(width)) {
            throw new IllegalArgumentException("lag class width must be finite and > 0, got " + width);
        }
        if (count < 1) {
            throw new IllegalArgumentException("lag class count must be at least 1, got " + count);
        }
        if (Double.isInfinite(width * count)) {
            throw new IllegalArgumentException("the largest binned lag " + count + " x " + width
                    + " overflows a double; accepted are smaller widths or counts");
        }
    }

    /** The largest lag binned, {@code count · width}. */
    public double maxLag() {
        return width * count;
    }

    /** Class of lag h ≥ 0, or −1 beyond {@link #maxLag()}. */
    int classOf(double h) {
        if (h == 0) {
            return 0;
        }
        double b = Math.ceil(h / width);
        return b <= count ? (int) b : -1;
    }

    /** Number of classes including class 0. */
    int size() {
        return count + 1;
    }
}
