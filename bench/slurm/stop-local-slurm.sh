#!/usr/bin/env bash
# Stops the daemons that start-local-slurm.sh started, by the process ids it recorded.
set -uo pipefail
DIR="${DENDROKIN_SLURM_DIR:-/tmp/dendrokin-slurm}"
for name in slurmd slurmctld munged; do
    f="$DIR/run/$name.pid"
    if [ -s "$f" ]; then
        pid="$(cat "$f")"
        if kill "$pid" 2>/dev/null; then
            for _ in $(seq 1 20); do kill -0 "$pid" 2>/dev/null || break; sleep 0.5; done
            echo "stopped $name ($pid)"
        fi
        rm -f "$f"
    fi
done
