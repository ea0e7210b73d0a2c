#!/usr/bin/env bash
# Builds Sharpey (Release) and runs the main job on the bundled sample case: the desktop app when
# a display is available, otherwise the batch report written to sharpey-output/.
# Usage: ./scripts/run.sh [CASE.json]
source "$(dirname "$0")/common.sh"
sharpey_install_packages
sharpey_build
case_file=${1:-$SHARPEY_ROOT/samples/maxillary_central_incisor_bone_loss.json}
if [ -n "${DISPLAY:-}" ] && [ -x "$SHARPEY_BUILD/app/gui/sharpey" ]; then
  exec "$SHARPEY_BUILD/app/gui/sharpey" "$case_file"
fi
out=$SHARPEY_ROOT/sharpey-output
echo "sharpey: no display; writing the batch report to $out" >&2
"$SHARPEY_BUILD/app/batch/sharpey-batch" run "$case_file" --out "$out"
cat "$out/summary.txt"
