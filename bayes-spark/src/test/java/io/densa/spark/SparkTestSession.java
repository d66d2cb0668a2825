package io.densa.spark;

import org.apache.spark.sql.SparkSession;

/**
 * The one local Spark session of the test suite: {@code local[2]}, four shuffle partitions, no UI,
 * bound to the loopback address. Started on first use and shared by every test class of the fork
 * (Spark allows one active context per JVM); stopped by Spark's own shutdown hook.
 */
final class SparkTestSession {
    private static SparkSession session;

    private SparkTestSession() {
    }

    static synchronized SparkSession get() {
        if (session == null) {
            session = SparkSession.builder()
                    .master("local[2]")
                    .appName("densa-tests")
                    .config("spark.ui.enabled", "false")
                    .config("spark.sql.shuffle.partitions", "4")
                    .config("spark.default.parallelism", "4")
                    .config("spark.driver.host", "127.0.0.1")
                    .config("spark.driver.bindAddress", "127.0.0.1")
                    .config("spark.sql.adaptive.enabled", "false")
                    .config("spark.ui.showConsoleProgress", "false")
                    .getOrCreate();
            session.sparkContext().setLogLevel("ERROR");
        }
        return session;
    }
}
