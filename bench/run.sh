#!/usr/bin/env bash
# Builds Release and runs every Google Benchmark program, then times the CLI end to end on the
# bundled sample course with peak memory (GNU time). Figures go to bench/README.md by hand.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cmake -S "$here" -B "$here/build-bench" -DCMAKE_BUILD_TYPE=Release -DCOURSEWARDEN_BUILD_TESTS=OFF >/dev/null
cmake --build "$here/build-bench" -j"$(nproc)"
for b in "$here"/build-bench/bench/bench_*; do
  [ -x "$b" ] || continue
  echo "== $(basename "$b")"
  "$b" --benchmark_min_time=1
done
sample="$here/sample_courses/ronde-orvalune"
if [ -f "$sample/course.gpx" ]; then
  echo "== end to end: profile on the sample course"
  tmp="$(mktemp -d)"
  /usr/bin/time -f "wall %e s, peak RSS %M kB" "$here/build-bench/coursewarden" profile \
    "$sample/course.gpx" --dem "$sample/dem.tif" --json "$tmp/s.json" >/dev/null
  rm -rf "$tmp"
fi
