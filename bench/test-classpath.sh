#!/usr/bin/env bash
# Prints the classpath of the test code: the benchmarks and the generators of the shipped sessions and of demo
# studies live beside the tests, not in the jar. Compiles the tests first (Maven's output goes to stderr), so it
# works from a fresh clone. Use it as
#
#     java -cp "$(bench/test-classpath.sh)" org.dendrokin.io.demo.DemoSessionGenerator test-images/demo-session
#
# from the repository root (or give the script's path from anywhere; the classpath it prints is absolute).
set -euo pipefail
ROOT="$(cd "$(dirname "$0")/.." && pwd)"
cd "$ROOT"
mvn -B -q -pl plugin test-compile dependency:build-classpath -Dmdep.includeScope=test \
    -Dmdep.outputFile=target/test-classpath.txt >&2
echo "$ROOT/plugin/target/test-classes:$ROOT/plugin/target/classes:$(cat "$ROOT/plugin/target/test-classpath.txt")"
