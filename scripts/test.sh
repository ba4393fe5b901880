#!/usr/bin/env bash
# README command (2): install what is needed, build, and run the whole test suite.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
bash "$here/scripts/install-deps.sh"
cmake -S "$here" -B "$here/build" -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build "$here/build" -j"$(nproc)"
cd "$here/build"
GDAL_PAM_ENABLED=NO ctest --output-on-failure -j"$(nproc)"
