#!/usr/bin/env bash
# Real-window tests of the ImageJ plug-in, run by hand (not in CI): each macro in shots/ runs in a fresh
# ImageJ under a virtual display with the plug-in jar and its dependencies installed in plugins/, and leaves a
# screenshot. Usage, from anywhere:
#   mvn -B -q package -DskipTests          # at the repository root, builds the jar and plugin-deps
#   plugin/src/test/gui/run-window-tests.sh [OUT_DIR] [SHOT ...]
# OUT_DIR defaults to plugin/target/gui-shots. Shots whose name ends in -dialog leave a dialog open on
# purpose; the harness then reports "blocked", which is what they test. Needs ij-window-snapshot.sh
# (set IJ_WINDOW_SNAPSHOT to its path if it is not in shared/tools/ beside the repository).
set -u
here="$(cd "$(dirname "$0")" && pwd)"
repo="$(cd "$here/../../../.." && pwd)"
out="${1:-$repo/plugin/target/gui-shots}"
shift || true
snap="${IJ_WINDOW_SNAPSHOT:-$repo/../shared/tools/ij-window-snapshot.sh}"
jar="$repo/plugin/target/Dendrokin_-0.1.0-SNAPSHOT.jar"
deps="$repo/plugin/target/plugin-deps"
ij="${IJ_JAR:-$HOME/.m2/repository/net/imagej/ij/1.54p/ij-1.54p.jar}"
[ -f "$jar" ] || { echo "build first: mvn -B -q package -DskipTests" >&2; exit 2; }
[ -f "$ij" ] || (cd "$repo" && mvn -B -q dependency:get -Dartifact=net.imagej:ij:1.54p) || exit 2
mkdir -p "$out"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT

# the helper that opens a menu for the menu screenshot
mkdir -p "$work/classes"
javac -d "$work/classes" -cp "$ij" "$here/MenuOpener.java" || exit 2
(cd "$work/classes" && jar cf "$work/Gui_Test_Helpers.jar" MenuOpener*.class)

shots=("$@")
if [ ${#shots[@]} -eq 0 ]; then
    shots=()
    for f in "$here"/shots/*.ijm; do shots+=("$(basename "$f" .ijm)"); done
fi
failed=0
for name in "${shots[@]}"; do
    cat "$here/common.ijm" "$here/shots/$name.ijm" > "$work/$name.ijm"
    "$snap" --jar "$jar" --jar "$work/Gui_Test_Helpers.jar" --deps "$deps" --ij-jar "$ij" \
        --macro "$work/$name.ijm" --macro-arg "$repo" --out "$out/$name.png" --wait 180 --settle 3 \
        --size 1600x1000 > "$out/$name.run.txt" 2>&1
    rc=$?
    status="$(cat "$out/$name.status.txt" 2>/dev/null)"
    if [ $rc -eq 0 ] || { [[ "$name" == *-dialog ]] && [[ "$status" == blocked* ]]; }; then
        echo "ok      $name: $status"
    else
        echo "FAILED  $name (exit $rc): $status"
        failed=$((failed + 1))
    fi
done
echo "screenshots in $out"
exit $failed
