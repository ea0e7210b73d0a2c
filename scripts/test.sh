#!/usr/bin/env bash
# Builds Sharpey (Release) and runs every test; GUI tests get a virtual display when none exists.
# Usage: ./scripts/test.sh [extra ctest arguments, e.g. -R mesh]
source "$(dirname "$0")/common.sh"
sharpey_install_packages
sharpey_build
cd "$SHARPEY_BUILD"
if [ -z "${DISPLAY:-}" ]; then
  exec xvfb-run -a -s "-screen 0 1600x1000x24" ctest --output-on-failure --timeout 1500 "$@"
fi
exec ctest --output-on-failure --timeout 1500 "$@"
