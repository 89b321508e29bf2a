#!/usr/bin/env bash
# One-command set-up on Debian 12: installs the Debian packages that the
# build, the tests and the benchmarks need (only those missing), then
# configures and builds one CMake preset.
#
#   scripts/setup.sh                    # release build (default)
#   scripts/setup.sh debug-sanitize     # address + undefined-behaviour sanitizers
#
# Safe to run again: installed packages are skipped, the build is incremental.
set -euo pipefail

preset="${1:-release}"
root_dir="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"

# Build toolchain plus every library the project links (see DEVELOPERS.md),
# and python3 for the check scripts that scripts/test runs.
packages=(
  build-essential cmake git ca-certificates
  libeigen3-dev libgmsh-dev libvtk9-dev libcli11-dev catch2
  libtomlplusplus-dev libsuitesparse-dev libopenblas-dev nlohmann-json3-dev ccache
  python3
)

missing=()
for package in "${packages[@]}"; do
  status="$(dpkg-query -W -f='${Status}' "${package}" 2>/dev/null || true)"
  if [[ "${status}" != "install ok installed" ]]; then
    missing+=("${package}")
  fi
done

if ((${#missing[@]} > 0)); then
  echo "setup: installing ${#missing[@]} missing package(s): ${missing[*]}"
  runner=()
  if [[ "$(id -u)" -ne 0 ]]; then
    if command -v sudo >/dev/null 2>&1; then
      runner=(sudo)
    else
      echo "setup: need root (or sudo) to install: ${missing[*]}" >&2
      exit 1
    fi
  fi
  # Recommends would pull in the Gmsh GUI, Mesa, GTK and Qt Quick.
  "${runner[@]}" env DEBIAN_FRONTEND=noninteractive apt-get update -q
  "${runner[@]}" env DEBIAN_FRONTEND=noninteractive \
    apt-get install -y -q --no-install-recommends "${missing[@]}"
else
  echo "setup: all ${#packages[@]} packages present"
fi

cd "${root_dir}"
cmake --preset "${preset}" >/dev/null
cmake --build --preset "${preset}"
