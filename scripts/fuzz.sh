#!/usr/bin/env bash
# Fuzzes the case-file reader and validator (tests/fuzz/fuzz_case_parse.cpp) with clang-14's
# libFuzzer under AddressSanitizer (leak detection on) and UndefinedBehaviorSanitizer, starting from
# the committed seed corpus tests/fuzz/corpus (written by tests/fuzz/make_corpus.py), for a fixed
# time budget. Fails on a crash, an uncaught exception, undefined behaviour, a leak, an input that
# takes longer than 10 s (a hang) or more than 2 GB. scripts/sanitize.sh runs it first.
# Usage: ./scripts/fuzz.sh [seconds, default $SHARPEY_FUZZ_SECONDS or 60]
source "$(dirname "$0")/common.sh"
sharpey_install_packages

seconds=${1:-${SHARPEY_FUZZ_SECONDS:-60}}
build=${SHARPEY_FUZZ_BUILD:-$SHARPEY_ROOT/build-fuzz}
mkdir -p "$build/objects" "$build/corpus" "$build/artifacts"

# The parser, the validator and the parts of mesh they call (geometry checks, tooth library);
# nothing that needs TetGen, CHOLMOD or BLAS. Instrumented for coverage (fuzzer-no-link), linked
# with libFuzzer's main.
sources=(
  analysis/src/case_spec.cpp analysis/src/case_spec_parse.cpp analysis/src/case_spec_validate.cpp
  analysis/src/case_spec_vary.cpp analysis/src/case_spec_write.cpp analysis/src/write_file_atomic.cpp
  mesh/src/model_validate.cpp mesh/src/model_names.cpp mesh/src/model_queries.cpp
  mesh/src/tooth_library.cpp mesh/src/detail/tooth_shape.cpp mesh/src/detail/model_frame.cpp
  mesh/src/tooth_surface.cpp mesh/src/cgal/tooth_surface_read.cpp
)
flags=(-std=c++17 -O1 -g -fno-omit-frame-pointer -fsanitize=address,undefined
  -fno-sanitize-recover=all -I"$SHARPEY_ROOT/analysis/include" -I"$SHARPEY_ROOT/fem/include"
  -I"$SHARPEY_ROOT/mesh/include" -I"$SHARPEY_ROOT/core/include" -isystem /usr/include/eigen3)
objects=()
for src in "${sources[@]}" tests/fuzz/fuzz_case_parse.cpp; do
  obj="$build/objects/$(echo "$src" | tr / _).o"
  if [ ! -f "$obj" ] || [ "$SHARPEY_ROOT/$src" -nt "$obj" ] ||
    [ -n "$(find "$SHARPEY_ROOT/analysis/include" "$SHARPEY_ROOT/mesh/include" "$SHARPEY_ROOT/core/include" \
      "$SHARPEY_ROOT/analysis/src" "$SHARPEY_ROOT/mesh/src" -name '*.h' -newer "$obj")" ]; then
    # CGAL's interval arithmetic needs -frounding-math (as mesh/CMakeLists.txt gives it).
    extra=()
    [[ "$src" == mesh/src/cgal/* ]] && extra=(-frounding-math)
    clang++-14 "${flags[@]}" "${extra[@]}" -fsanitize=fuzzer-no-link -c "$SHARPEY_ROOT/$src" -o "$obj"
  fi
  objects+=("$obj")
done
clang++-14 "${flags[@]}" -fsanitize=fuzzer "${objects[@]}" -lgmpxx -lgmp -lmpfr -o "$build/fuzz_case_parse"

# New inputs the fuzzer finds go to build-fuzz/corpus (the first folder), never into the
# committed seeds; a failing input is saved in build-fuzz/artifacts and printed below.
export ASAN_OPTIONS="detect_leaks=1"
export UBSAN_OPTIONS="print_stacktrace=1:halt_on_error=1"
status=0
"$build/fuzz_case_parse" -max_total_time="$seconds" -timeout=10 -rss_limit_mb=2048 \
  -max_len=65536 -print_final_stats=1 -artifact_prefix="$build/artifacts/" \
  "$build/corpus" "$SHARPEY_ROOT/tests/fuzz/corpus" || status=$?
if [ "$status" -ne 0 ]; then
  echo "sharpey: the case-file fuzzer failed (exit $status); reproduce with" \
    "$build/fuzz_case_parse <file in $build/artifacts>" >&2
fi
exit "$status"
