#!/usr/bin/env bash
# Reaction-diffusion engine benchmark (by hand, not CI): the SciPy method-of-lines runs and the fine-grid
# references (engine_scipy.py), then the engine on the same problems (EngineBenchmark), one thread each, and last
# the tree engine on a five-branch tree against a cable of the same node count (two "nagumo-tree5-..." lines).
# Figures go into docs/benchmarks.md, section "Reaction-diffusion engine", with the uptime lines printed here.
# The tree lines alone, without SciPy: java -cp "$(bench/test-classpath.sh)" org.dendrokin.bench.EngineBenchmark --tree
#
# Usage: bench/engine/run-engine-benchmark.sh [WORK]   (WORK holds the references; default /tmp/dendrokin-engine-bench)
set -euo pipefail
ROOT="$(cd "$(dirname "$0")/../.." && pwd)"
WORK="${1:-/tmp/dendrokin-engine-bench}"
mkdir -p "$WORK"
cd "$ROOT"
mvn -B -q test-compile
uptime
python3 bench/engine/engine_scipy.py "$WORK"
uptime
mvn -B -q -pl plugin exec:exec -Dexec.executable=java -Dexec.classpathScope=test \
    -Dexec.args="-cp %classpath org.dendrokin.bench.EngineBenchmark $WORK"
uptime
