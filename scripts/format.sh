#!/usr/bin/env bash
# Formats Sharpey's C++ sources with .clang-format (clang-format 14), or with --check only reports
# the files that differ and fails (the CI check). Every tracked .cpp and .h file counts.
# Usage: ./scripts/format.sh [--check]
source "$(dirname "$0")/common.sh"
sharpey_install_packages
cd "$SHARPEY_ROOT"
mapfile -t files < <(git ls-files '*.cpp' '*.h')
if [ "${1:-}" = "--check" ]; then
  if ! clang-format-14 --dry-run --Werror "${files[@]}" 2>/tmp/sharpey-format.log; then
    grep -o '^[^:]*\.\(cpp\|h\)' /tmp/sharpey-format.log | sort -u | sed 's/^/not formatted: /' >&2
    echo "sharpey: run ./scripts/format.sh to format them (clang-format 14, .clang-format)" >&2
    exit 1
  fi
  echo "sharpey: ${#files[@]} C++ files formatted as .clang-format says"
else
  clang-format-14 -i "${files[@]}"
fi
