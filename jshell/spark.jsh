// Densa-on-Spark JShell startup script: imports and a local Spark session (local[2], no UI, loopback).
// See bayes-spark/README.md for the class path and the JVM options (-R...) to start JShell with.
import io.densa.core.*;
import io.densa.core.estimate.*;
import io.densa.regression.*;
import io.densa.regression.surveillance.*;
import io.densa.spatial.*;
import io.densa.spatial.variogram.*;
import io.densa.spatial.kriging.*;
import io.densa.spatial.uncertainty.*;
import io.densa.spatial.autocorrelation.*;
import io.densa.spark.*;
import java.util.*;
import java.util.stream.*;
import org.apache.spark.sql.*;
import org.apache.spark.sql.types.*;
var spark = SparkSession.builder().master("local[2]").appName("densa-jshell").config("spark.ui.enabled", "false").config("spark.driver.host", "127.0.0.1").config("spark.driver.bindAddress", "127.0.0.1").config("spark.sql.shuffle.partitions", "4").getOrCreate();
spark.sparkContext().setLogLevel("ERROR");
