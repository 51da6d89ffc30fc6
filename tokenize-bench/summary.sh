#!/usr/bin/env bash
# Builds the benchmark jar and runs every benchmark, writing tokenize-bench/target/bench-summary.json.
# Usage: tokenize-bench/summary.sh [--only REGEX]     (about 8 minutes on 2 cores)
# The virtual-thread figures need a JDK 21+: the newest one under /usr/lib/jvm is used (or set
# VTHREADS_JAVA_HOME); where none is found they are skipped with a note in the summary.
set -euo pipefail
cd "$(dirname "$0")/.."
./mvnw -B -q -pl tokenize-bench -am package -DskipTests
vt=()
home="${VTHREADS_JAVA_HOME:-}"
if [ -z "$home" ]; then
  for j in /usr/lib/jvm/*; do
    [ -x "$j/bin/java" ] || continue
    v=$("$j/bin/java" -XshowSettings:properties -version 2>&1 | sed -n 's/^ *java.specification.version = //p')
    if [ -n "$v" ] && [ "${v%%.*}" -ge 21 ] 2>/dev/null; then
      if [ -z "$home" ] || [ "${v%%.*}" -gt "$best" ]; then home="$j"; best="${v%%.*}"; fi
    fi
  done
fi
if [ -n "$home" ]; then
  vt=(--vthreads-jvm "$home/bin/java")
else
  echo "note: no JDK 21+ under /usr/lib/jvm; the vthreads_* figures are skipped" >&2
fi
java -Xmx4g -jar tokenize-bench/target/morsel-bench.jar --out tokenize-bench/target/bench-summary.json "${vt[@]}" "$@"
