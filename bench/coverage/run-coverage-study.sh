#!/usr/bin/env bash
# Coverage of the diffusion-decay fit's 95% intervals of D and k on realistic synthetic sessions (by hand, not CI):
# each seed of each scenario is made by org.dendrokin.synth.SessionGenerator (test code), analysed by the full
# pipeline, and compared with the truth; prints a markdown table (CoverageStudy).
#
# Usage: bench/coverage/run-coverage-study.sh [CoverageStudy options]
#   e.g. bench/coverage/run-coverage-study.sh --seeds 100 --scenarios realistic --threads 2 --csv /tmp/coverage.csv
#   --help lists the options (seeds, first seed, scenarios, threads, models, work folder, keep, csv).
set -euo pipefail
ROOT="$(cd "$(dirname "$0")/../.." && pwd)"
cd "$ROOT"
mvn -B -q test-compile
uptime
mvn -B -q -pl plugin exec:exec -Dexec.executable=java -Dexec.classpathScope=test \
    -Dexec.args="-Xmx2g -Djava.awt.headless=true -Dscijava.log.level=warn -cp %classpath org.dendrokin.bench.CoverageStudy $*"
uptime
