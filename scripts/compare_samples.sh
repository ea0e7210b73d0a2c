#!/bin/bash
# Runs every sample case with two sharpey-batch binaries and compares the result files byte for
# byte: the check that a change meant to leave results alone (a refactoring, a speed-up on the same
# mesh) did. Every output file but the .vtu meshes (which hold the fields the other files report)
# is compared, with the run-time lines (JSON keys ending in _s) left out.
#
#   scripts/compare_samples.sh OLD_BATCH NEW_BATCH [SAMPLE.json ...]
#
# Build the old binary from a worktree of the earlier commit, e.g.
#   git worktree add --detach ../base <commit> && cmake -S ../base -B ../base/build ... &&
#   cmake --build ../base/build --target sharpey-batch sharpey-mesher
# Exit 0 when every sample's results agree, 1 otherwise (the differing files are named).
set -euo pipefail
if [ $# -lt 2 ]; then
  echo "usage: $0 OLD_BATCH NEW_BATCH [SAMPLE.json ...]" >&2
  exit 2
fi
old=$1 new=$2
shift 2
root=$(cd "$(dirname "$0")/.." && pwd)
samples=("$@")
if [ ${#samples[@]} -eq 0 ]; then
  for f in "$root"/samples/*.json; do
    grep -q '"schema_version"' "$f" && samples+=("$f")  # case files, not study designs
  done
fi
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
status=0
for sample in "${samples[@]}"; do
  name=$(basename "$sample" .json)
  for side in old new; do
    binary=$old
    [ $side = new ] && binary=$new
    # A multi-rooted case goes through `molar` (docs/molars.md), which prints no progress and
    # takes no --quiet (older binaries refuse it); `run` is quietened.
    command=(run --quiet)
    grep -q '"kind": *"multi_root_estimate"' "$sample" && command=(molar)
    "$binary" "${command[0]}" "$sample" --out "$work/$name.$side" "${command[@]:1}"
  done
  for file in $(cd "$work/$name.old" && ls | grep -v '\.vtu$'); do
    [ -f "$work/$name.old/$file" ] || continue
    if ! diff -q <(grep -v -E '"[a-z_]+_s": ' \
                     "$work/$name.old/$file") \
                 <(grep -v -E '"[a-z_]+_s": ' \
                     "$work/$name.new/$file") > /dev/null; then
      echo "DIFFERENT: $name/$file"
      status=1
    fi
  done
  [ $status -eq 0 ] && echo "same: $name"
done
exit $status
