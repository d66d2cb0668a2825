/**
 * Densa regression: functional principal components, function-on-scalar and functional
 * regression, anomaly scoring ({@code io.densa.regression}).
 */
module io.densa.regression {
    requires transitive io.densa.core;
    // CommonOps_DDRM, decompositions
    requires ejml.ddense;

    exports io.densa.regression;
}
