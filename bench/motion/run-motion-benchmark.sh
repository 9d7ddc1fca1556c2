#!/usr/bin/env bash
# Motion-correction benchmark (by hand, not CI): writes a 1 GB drifting 16-bit movie to a temporary folder (or
# to DIR), then times a plain kymograph extraction and motion measurement + corrected extraction in one JVM with
# -Xmx512m (MotionCorrectionBenchmark), and deletes the movie. Figures go into docs/benchmarks.md, section "Motion
# correction", with the uptime lines printed here.
#
# Usage: bench/motion/run-motion-benchmark.sh [DIR]   (DIR needs about 1.1 GB free)
set -euo pipefail
ROOT="$(cd "$(dirname "$0")/../.." && pwd)"
cd "$ROOT"
mvn -B -q test-compile
uptime
mvn -B -q -pl plugin exec:exec -Dexec.executable=java -Dexec.classpathScope=test \
    -Dexec.args="-Xmx512m -Djava.awt.headless=true -cp %classpath org.dendrokin.bench.MotionCorrectionBenchmark ${1:-}"
uptime
