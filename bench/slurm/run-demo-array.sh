#!/usr/bin/env bash
# Tries the batch command's SLURM job array end to end on the local one-host SLURM: writes a demo study,
# plans it as an array of shards, submits the array and the merge (which waits for the array), waits, and
# prints what SLURM and the merge reported. Run start-local-slurm.sh first, and build the jar
# (mvn -B -q package -DskipTests). Not part of CI: it needs root, SLURM daemons and a few minutes.
#
# Usage: bench/slurm/run-demo-array.sh [SESSIONS [SHARDS [WORK_DIR]]]     (defaults 12, 3, /tmp/dendrokin-slurm-demo)
set -euo pipefail

SESSIONS="${1:-12}"
SHARDS="${2:-3}"
WORK="${3:-/tmp/dendrokin-slurm-demo}"
HERE="$(cd "$(dirname "$0")" && pwd)"
JAR="$(cd "$HERE/../.." && pwd)/plugin/target/dendrokin-cli.jar"
export SLURM_CONF="${SLURM_CONF:-${DENDROKIN_SLURM_DIR:-/tmp/dendrokin-slurm}/slurm.conf}"

[ -f "$JAR" ] || { echo "Build the jar first: mvn -B -q package -DskipTests" >&2; exit 2; }
[ -f "$SLURM_CONF" ] || { echo "Start SLURM first: bench/slurm/start-local-slurm.sh" >&2; exit 2; }

rm -rf "$WORK"
mkdir -p "$WORK"
# The demo study's generator lives beside the tests, not in the jar.
java -cp "$("$HERE/../test-classpath.sh")" org.dendrokin.io.batch.DemoStudy "$WORK/study" "$SESSIONS"
java -jar "$JAR" batch "$WORK/study" --out "$WORK/out" --plan-slurm "$SHARDS" --slurm-cpus 1 --slurm-time-min 20
echo "--- $WORK/out/slurm/batch.sbatch"
cat "$WORK/out/slurm/batch.sbatch"

cd "$WORK"
array=$(sbatch --parsable "$WORK/out/slurm/batch.sbatch")
merge=$(sbatch --parsable --dependency=afterany:"$array" "$WORK/out/slurm/merge.sbatch")
echo "submitted array job $array and merge job $merge"
sleep 2
squeue -o '%.12i %.16j %.8T %.10M %.6C %.8m %R'
while squeue -h -j "$array,$merge" 2>/dev/null | grep -q .; do
    sleep 5
    squeue -h -o '%.12i %.16j %.8T %.10M %.6C %.8m %R'
done
echo "--- finished jobs (scontrol / jobcomp)"
grep -E "JobId=($array|$merge)" "$(dirname "$SLURM_CONF")/log/jobcomp.txt" \
    | sed -E 's/.*JobId=([0-9_]+).*Name=([^ ]+).*JobState=([A-Z]+).*StartTime=([^ ]+) EndTime=([^ ]+).*ExitCode=([0-9:]+).*/\1 \2 \3 \4 \5 exit \6/'
echo "--- shard logs"
tail -n 3 "$WORK"/out/slurm/logs/*.log
echo "--- summary ($WORK/out/summary.csv), first columns"
cut -d, -f1-8 "$WORK/out/summary.csv" | head -n $((SESSIONS + 1))
echo "Report: $WORK/out/index.html"
