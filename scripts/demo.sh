#!/usr/bin/env bash
# README command (1): install what is needed, build, and run the main job on the bundled sample
# course. Prints where the outputs went.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
bash "$here/scripts/install-deps.sh"
cmake -S "$here" -B "$here/build" -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build "$here/build" -j"$(nproc)" --target coursewarden_exe
sample="$here/sample_courses/ronde-orvalune"
out="$here/out/ronde-orvalune"
"$here/build/coursewarden" check "$sample/course.gpx" --dem "$sample/dem.tif" --out "$out"
