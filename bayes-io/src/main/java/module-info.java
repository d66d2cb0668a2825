/**
 * Densa io: count tables, samples and observations from CSV files and JDBC queries, bulk files
 * through an embedded SQL engine, GeoJSON and GeoTIFF output ({@code io.densa.io}); saved models
 * ({@code io.densa.io.model}).
 */
module io.densa.io {
    requires transitive io.densa.core;
    // Kriging, Grid and Locations in public signatures
    requires transitive io.densa.spatial;
    // Geometry in public signatures
    requires transitive org.locationtech.jts;
    // Connection and ResultSet in public signatures; the optional SQL engine is found through JDBC
    requires transitive java.sql;
    // CSVFormat in public signatures (TableSource)
    requires transitive org.apache.commons.csv;
    // Fpca, regression fits and AnomalyScoring in the model files' public signatures
    requires transitive io.densa.regression;
    // saved model files: streaming JSON only
    requires com.fasterxml.jackson.core;
    requires org.locationtech.jts.io;
    // json-simple 1.1.1 has no module name: the name comes from its file name
    requires json.simple;

    exports io.densa.io;
    exports io.densa.io.geometry;
    exports io.densa.io.raster;
    exports io.densa.io.tables;
    exports io.densa.io.model;
}
