/**
 * Densa regression: functional principal components, function-on-scalar and functional
 * regression ({@code io.densa.regression}); surveillance: anomaly scoring, excess counts and
 * period-by-period monitoring from a rolling baseline ({@code io.densa.regression.surveillance}).
 */
module io.densa.regression {
    requires transitive io.densa.core;
    // CommonOps_DDRM, decompositions
    requires ejml.ddense;

    exports io.densa.regression;
    exports io.densa.regression.surveillance;
}
