#!/usr/bin/env bash
# Builds the library and examples (tests skipped) and runs the main demo study.
# Usage: bash demo.sh [options passed to the examples' Main]
set -euo pipefail
cd "$(dirname "$0")"
mvn -B -q -ntp -DskipTests -Dmaven.javadoc.skip=true -Dmaven.source.skip=true -pl examples -am package
exec java -jar examples/target/densa-all.jar "$@"
