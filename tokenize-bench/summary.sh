#!/usr/bin/env bash
# Builds the benchmark jar and runs every benchmark, writing tokenize-bench/target/bench-summary.json.
# Usage: tokenize-bench/summary.sh [--only REGEX]     (about 5 minutes on 2 cores)
set -euo pipefail
cd "$(dirname "$0")/.."
./mvnw -B -q -pl tokenize-bench -am package -DskipTests
java -Xmx4g -jar tokenize-bench/target/morsel-bench.jar --out tokenize-bench/target/bench-summary.json "$@"
