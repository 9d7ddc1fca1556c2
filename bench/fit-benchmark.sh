#!/usr/bin/env bash
# Fitting benchmark: the Java fits (FitBenchmark) and the same fits by SciPy (fit_scipy.py) on the same data.
# Usage: bench/fit-benchmark.sh [OUT_DIR] [repeats] [all|diffusion-decay|nagumo]
# FitBenchmark lives beside the tests; bench/test-classpath.sh compiles them and gives their classpath.
set -euo pipefail
cd "$(dirname "$0")/.."
out="${1:-bench/out/fit}"
repeats="${2:-3}"
cases="${3:-all}"
cp="$(bench/test-classpath.sh)"
uptime
java -cp "$cp" org.dendrokin.bench.FitBenchmark "$out" "$repeats" "$cases"
python3 bench/fit_scipy.py "$out" "$repeats" "$cases"
uptime
