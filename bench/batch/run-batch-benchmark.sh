#!/usr/bin/env bash
# Batch benchmark (by hand, not CI): sessions per second with 1 and 2 threads on 100 small generated
# sessions, and peak memory (the heap is not capped below what a batch would use: -Xmx4g, -Xmx8g); with "large", 10 sessions of 1 GB movies (512 x 512 x 2000, 16-bit) and their
# peak memory. Everything is generated under WORK (default /tmp/dendrokin-batch-bench) and deleted at the
# end. DemoStudy and BatchBenchmark live beside the tests; bench/test-classpath.sh compiles them and gives their
# classpath.
#
# Usage: bench/batch/run-batch-benchmark.sh [small|large] [WORK]
set -euo pipefail
WHAT="${1:-small}"
WORK="${2:-/tmp/dendrokin-batch-bench}"
CP="$("$(dirname "$0")/../test-classpath.sh")"
rm -rf "$WORK"
mkdir -p "$WORK"
trap 'rm -rf "$WORK"' EXIT
uptime
if [ "$WHAT" = small ]; then
    java -cp "$CP" org.dendrokin.io.batch.DemoStudy "$WORK/study" 100
    du -sh "$WORK/study"
    /usr/bin/time -f "process peak RSS %M KB, wall %e s" \
        java -Xmx4g -cp "$CP" org.dendrokin.bench.BatchBenchmark "$WORK/study" "$WORK/out" 1 2
else
    # One 1 GB movie is rendered (about a minute) and copied into 10 session folders.
    java -Xmx6g -cp "$CP" org.dendrokin.io.batch.DemoStudy "$WORK/one" 1 512 512 2000
    src="$(dirname "$(find "$WORK/one" -name session.json | head -1)")"
    for i in $(seq -w 1 10); do
        g=$([ $((10#$i % 2)) = 1 ] && echo control || echo drug)
        mkdir -p "$WORK/study/$g"
        cp -r "$src" "$WORK/study/$g/cell$i"
        sed -i "s/\"group\": \"[a-z]*\"/\"group\": \"$g\"/" "$WORK/study/$g/cell$i/session.json"
    done
    rm -rf "$WORK/one"
    du -sh "$WORK/study"
    /usr/bin/time -f "process peak RSS %M KB, wall %e s" \
        java -Xmx8g -cp "$CP" org.dendrokin.bench.BatchBenchmark "$WORK/study" "$WORK/out" 2 --no-warm-up
fi
uptime
