#!/usr/bin/env bash
# The single source of truth for what coursewarden needs on a fresh Debian 12 machine.
# Installs the build and test packages with apt-get, then unpacks the open DEMs that two Debian
# packages ship (r-cran-terra, r-cran-stars) into tests/data/external/ for the tests, without
# installing R. Safe to run again.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi

packages=(
  build-essential cmake pkg-config
  libgdal-dev gdal-bin libproj-dev proj-bin
  libboost-dev libgeographiclib-dev geographiclib-tools
  libcli11-dev libtomlplusplus-dev nlohmann-json3-dev
  libgtest-dev libgmock-dev libbenchmark-dev
  locales
  chromium fonts-dejavu-core nodejs
)
missing=()
for p in "${packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ "${#missing[@]}" -gt 0 ]; then
  export DEBIAN_FRONTEND=noninteractive
  $SUDO apt-get update -qq
  $SUDO apt-get install -y -qq --no-install-recommends "${missing[@]}"
fi

# Open DEMs shipped by Debian packages, used as outside reference data by the tests.
ext="$here/tests/data/external"
if [ ! -f "$ext/terra/ex/elev.tif" ] || [ ! -f "$ext/stars/tif/olinda_dem_utm25s.tif" ]; then
  tmp="$(mktemp -d)"
  trap 'rm -rf "$tmp"' EXIT
  (cd "$tmp" && apt-get download r-cran-terra r-cran-stars >/dev/null 2>&1) || {
    $SUDO apt-get update -qq
    (cd "$tmp" && apt-get download r-cran-terra r-cran-stars)
  }
  for deb in "$tmp"/r-cran-terra_*.deb "$tmp"/r-cran-stars_*.deb; do
    dpkg-deb -x "$deb" "$tmp/root"
  done
  mkdir -p "$ext/terra" "$ext/stars"
  cp -r "$tmp/root/usr/lib/R/site-library/terra/ex" "$ext/terra/"
  cp -r "$tmp/root/usr/lib/R/site-library/stars/tif" "$ext/stars/"
  echo "unpacked reference DEMs into $ext"
fi
