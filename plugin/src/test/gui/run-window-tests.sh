#!/usr/bin/env bash
# Real-window tests of the ImageJ plug-in, run by hand (not in CI): each macro in shots/ runs in a fresh
# ImageJ under a virtual display with the plug-in jar and its dependencies installed in plugins/, and leaves a
# screenshot. Usage, from anywhere:
#   mvn -B -q package -DskipTests          # at the repository root, builds the jar and plugin-deps
#   plugin/src/test/gui/run-window-tests.sh [--docs] [OUT_DIR] [SHOT ...]
# OUT_DIR defaults to plugin/target/gui-shots. With --docs, each good shot also replaces
# docs/images/imagej-<shot>.png (trimmed of the empty screen around the windows). A shot fails when two of
# its windows overlap (the harness's list of window bounds), except in the menu and dialog shots. Shots whose
# name ends in -dialog leave a dialog open on purpose; the harness then reports "blocked", which is what they
# test. Needs ij-window-snapshot.sh (set IJ_WINDOW_SNAPSHOT to its path if it is not in shared/tools/ beside
# the repository or beside its worktree folder).
set -u
here="$(cd "$(dirname "$0")" && pwd)"
repo="$(cd "$here/../../../.." && pwd)"
docs=0
if [ "${1:-}" = "--docs" ]; then
    docs=1
    shift
fi
out="${1:-$repo/plugin/target/gui-shots}"
shift || true
snap="${IJ_WINDOW_SNAPSHOT:-}"
if [ -z "$snap" ]; then
    # beside the repository, or beside the folder of a git worktree
    for candidate in "$repo/../shared/tools/ij-window-snapshot.sh" "$repo/../../shared/tools/ij-window-snapshot.sh"; do
        [ -f "$candidate" ] && { snap="$candidate"; break; }
    done
fi
[ -n "$snap" ] && [ -f "$snap" ] || { echo "ij-window-snapshot.sh not found: set IJ_WINDOW_SNAPSHOT to its path" >&2; exit 2; }
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
# pairs of windows whose areas overlap, from the harness's list of '"title" WxH+X+Y' lines
overlapping() {
    [ -f "$1" ] || return 0
    sed -E 's/^"(.*)" ([0-9]+)x([0-9]+)\+(-?[0-9]+)\+(-?[0-9]+)$/\2 \3 \4 \5 \1/' "$1" | awk '
        { w[NR] = $1; h[NR] = $2; x[NR] = $3; y[NR] = $4; $1 = $2 = $3 = $4 = ""; t[NR] = substr($0, 5) }
        END {
            for (i = 1; i <= NR; i++) for (j = i + 1; j <= NR; j++)
                if (x[i] < x[j] + w[j] && x[j] < x[i] + w[i] && y[i] < y[j] + h[j] && y[j] < y[i] + h[i])
                    printf "[%s] and [%s]; ", t[i], t[j]
        }'
}

failed=0
for name in "${shots[@]}"; do
    cat "$here/common.ijm" "$here/shots/$name.ijm" > "$work/$name.ijm"
    rm -f "$out/$name".*
    "$snap" --jar "$jar" --jar "$work/Gui_Test_Helpers.jar" --deps "$deps" --ij-jar "$ij" \
        --macro "$work/$name.ijm" --macro-arg "$repo" --out "$out/$name.png" --wait 180 --settle 3 \
        --size 1920x1080 > "$out/$name.run.txt" 2>&1
    rc=$?
    status="$(cat "$out/$name.status.txt" 2>/dev/null)"
    overlaps="$(overlapping "$out/$name.windows.txt")"
    if [ -n "$overlaps" ] && [[ "$name" != *-dialog ]] && [[ "$name" != menu ]]; then
        echo "FAILED  $name: windows overlap: $overlaps"
        failed=$((failed + 1))
    elif [ $rc -eq 0 ] || { [[ "$name" == *-dialog ]] && [[ "$status" == blocked* ]]; }; then
        echo "ok      $name: $status"
        if [ $docs -eq 1 ]; then
            # the screen without its empty margins, as the user guide shows it
            convert "$out/$name.png" -trim +repage -bordercolor black -border 8 "$repo/docs/images/imagej-$name.png"
        fi
    else
        echo "FAILED  $name (exit $rc): $status"
        failed=$((failed + 1))
    fi
done
echo "screenshots in $out"
exit $failed
