#!/usr/bin/env bash
# Global-fit benchmark: 100 seeded diffusion-decay sessions of 200 positions x 400 frames, fitted one by one and
# jointly by the Java code (GlobalFitBenchmark, which also writes the data), then jointly by SciPy
# (global_scipy.py) on the same files.
# Usage: bench/global/run-global-benchmark.sh [OUT_DIR] [sessions] [java repeats] [scipy repeats]
set -euo pipefail
cd "$(dirname "$0")/../.."
out="${1:-$(mktemp -d)}"
sessions="${2:-100}"
cp="$(bench/test-classpath.sh)"
uptime
java -cp "$cp" org.dendrokin.bench.GlobalFitBenchmark "$out" "$sessions" 200 400 "${3:-3}"
python3 bench/global/global_scipy.py "$out" "${4:-1}"
uptime
