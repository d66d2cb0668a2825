// Densa JShell startup script: imports for an interactive session.
// Start JShell from the repository root after `bash demo.sh` (or the package build) with:
//   jshell --class-path examples/target/densa-all.jar --startup DEFAULT --startup jshell/densa.jsh
// densa-all.jar bundles bayes-core, bayes-regression, bayes-spatial and their dependencies
// (EJML, Commons Math, JTS) plus the examples and JFreeChart.
import io.densa.core.*;
import io.densa.core.estimate.*;
import io.densa.regression.*;
import io.densa.regression.surveillance.*;
import io.densa.spatial.*;
import io.densa.spatial.variogram.*;
import io.densa.spatial.kriging.*;
import io.densa.spatial.uncertainty.*;
import io.densa.spatial.autocorrelation.*;
import io.densa.io.*;
import io.densa.io.tables.*;
import io.densa.io.geometry.*;
import io.densa.io.raster.*;
import java.nio.file.*;
import java.util.*;
import java.util.stream.*;
