# Shared by scripts/run.sh and scripts/test.sh: install missing Debian packages, configure a
# Release build in build/ once, build incrementally. Sourced, not run.
set -euo pipefail

SHARPEY_ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
SHARPEY_BUILD=${SHARPEY_BUILD:-$SHARPEY_ROOT/build}

# Debian 12 packages Sharpey needs to build, test and run.
SHARPEY_PACKAGES=(cmake ninja-build g++ pkg-config qt6-base-dev libvtk9-dev libeigen3-dev
  libtet1.5-dev libsuitesparse-dev libopenblas-dev libopenblas0-openmp libgtest-dev
  nlohmann-json3-dev libcli11-dev libqt6opengl6-dev libgl1-mesa-dri fonts-dejavu-core xvfb xauth
  poppler-utils clang-14 libclang-rt-14-dev libopenmpi-dev openmpi-bin libcgal-dev clang-format-14)

sharpey_install_packages() {
  local missing=()
  for p in "${SHARPEY_PACKAGES[@]}"; do
    dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
  done
  [ ${#missing[@]} -eq 0 ] && return 0
  echo "sharpey: installing missing Debian packages: ${missing[*]}" >&2
  local sudo=()
  if [ "$(id -u)" -ne 0 ]; then
    if command -v sudo >/dev/null 2>&1 && sudo -n true 2>/dev/null; then
      sudo=(sudo)
    else
      echo "sharpey: cannot install packages without root. Run:" >&2
      echo "  sudo apt-get update && sudo apt-get install -y ${missing[*]}" >&2
      exit 3
    fi
  fi
  "${sudo[@]}" apt-get update -qq
  # With recommends: the set the project is built and tested with.
  DEBIAN_FRONTEND=noninteractive "${sudo[@]}" apt-get install -y -qq "${missing[@]}" >/dev/null
}

sharpey_build() {
  local werror=${SHARPEY_WERROR:-OFF}
  if [ ! -f "$SHARPEY_BUILD/build.ninja" ]; then
    cmake -S "$SHARPEY_ROOT" -B "$SHARPEY_BUILD" -G Ninja -DCMAKE_BUILD_TYPE=Release \
      -DSHARPEY_WERROR="$werror" >/dev/null
  fi
  cmake --build "$SHARPEY_BUILD" -j "$(nproc)" "$@"
}
