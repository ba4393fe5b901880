// DEM draping: bilinear sampling at pixel centres, nodata, units, CRS handling, reference DEMs.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <memory>
#include <string>

#include <GeographicLib/Geodesic.hpp>

#include "coursewarden/dem.hpp"
#include "coursewarden/error.hpp"
#include "support/support.hpp"
#include "util/text.hpp"

using namespace coursewarden;

namespace {

const std::string kExternal = COURSEWARDEN_EXTERNAL_DATA;

// A plane in UTM 31N metres: z = 300 + 0.02 (x - 500000) - 0.01 (y - 5100000).
double plane(double x, double y) { return 300.0 + 0.02 * (x - 500000.0) - 0.01 * (y - 5100000.0); }

std::string gdallocationinfo_value(const std::string& file, double x, double y) {
  // GDAL's own tool as the reference reader of one pixel's value.
  const std::string cmd = "GDAL_PAM_ENABLED=NO gdallocationinfo -valonly -geoloc '" + file + "' " +
                          coursewarden::fmt_fixed(x, 9) + " " + coursewarden::fmt_fixed(y, 9) + " 2>/dev/null";
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(cmd.c_str(), "r"), pclose);
  if (!pipe) return "";
  char buf[128] = {0};
  if (!fgets(buf, sizeof buf, pipe.get())) return "";
  std::string s(buf);
  while (!s.empty() && (s.back() == '\n' || s.back() == '\r')) s.pop_back();
  return s;
}

double num(const std::string& text) { return coursewarden::parse_number(text).value_or(NAN); }

// GTEST_SKIP only leaves the function it is in, so this is a macro used in the test body.
#define SKIP_WITHOUT(path) \
  if (!std::filesystem::exists(path)) GTEST_SKIP() << (path) << " missing: run scripts/install-deps.sh"

}  // namespace

TEST(DemSample, BilinearIsExactOnATiltedPlane) {
  cwtest::TempDir dir;
  cwtest::RasterSpec spec;
  cwtest::write_raster(dir.file("plane.tif"), spec, plane);
  Dem dem = Dem::open(dir.file("plane.tif"));
  EXPECT_NEAR(dem.info().pixel_size_m, 30.0, 1e-9);
  EXPECT_FALSE(dem.info().geographic);
  // Bilinear interpolation reproduces a plane exactly between pixel centres (derived).
  for (double fx : {0.13, 0.5, 0.77}) {
    for (double fy : {0.21, 0.64}) {
      const double x = 500000.0 + 30.0 * (20 + fx * 150), y = 5100000.0 - 30.0 * (10 + fy * 150);
      EXPECT_NEAR(dem.sample_native(x, y), plane(x, y), 2e-3);
    }
  }
  // Through lon/lat: PROJ maps the point into UTM, where the plane formula is the reference.
  const auto [lon, lat] = cwtest::from_crs("EPSG:32631", 502345.0, 5096789.0);
  const auto z = dem.sample_lonlat({lon}, {lat});
  EXPECT_NEAR(z[0], plane(502345.0, 5096789.0), 2e-3);
  // Pixel centres hold their own value (registration: centre at corner + half a pixel).
  EXPECT_NEAR(dem.sample_native(500015.0, 5099985.0), plane(500015.0, 5099985.0), 1e-3);
  // Outside the raster: no data.
  EXPECT_TRUE(std::isnan(dem.sample_native(400000.0, 5000000.0)));
}

TEST(DemSample, RenormalisesOverValidNeighboursAtNodata) {
  cwtest::TempDir dir;
  cwtest::RasterSpec spec;
  spec.width = spec.height = 4;
  spec.has_nodata = true;
  // Pixel (1,1) holds nodata; the rest hold 10 x column + row.
  cwtest::write_raster(dir.file("holes.tif"), spec, [](double x, double y) {
    const int i = static_cast<int>((x - 500000.0) / 30.0), j = static_cast<int>((5100000.0 - y) / 30.0);
    return (i == 1 && j == 1) ? -9999.0 : 10.0 * i + j;
  });
  Dem dem = Dem::open(dir.file("holes.tif"));
  // Midway between the centres of (0,0), (1,0), (0,1), (1,1): weights 1/4 each; (1,1) missing,
  // so the mean of the other three: (0 + 10 + 1) / 3 (derived).
  EXPECT_NEAR(dem.sample_native(500030.0, 5099970.0), 11.0 / 3.0, 1e-6);
  // All four neighbours missing only outside the raster.
  spec.width = spec.height = 2;
  cwtest::write_raster(dir.file("none.tif"), spec, [](double, double) { return -9999.0; });
  Dem empty = Dem::open(dir.file("none.tif"));
  EXPECT_TRUE(std::isnan(empty.sample_native(500030.0, 5099970.0)));
}

TEST(DemSample, FeetDemsAreConvertedToMetres) {
  cwtest::TempDir dir;
  cwtest::RasterSpec spec;
  spec.unit = "ft";
  cwtest::write_raster(dir.file("feet.tif"), spec, [](double, double) { return 1000.0; });
  Dem dem = Dem::open(dir.file("feet.tif"));
  EXPECT_NEAR(dem.sample_native(501000.0, 5099000.0), 304.8, 1e-9);  // 1 ft = 0.3048 m exactly (international foot)
  spec.unit = "furlong";
  cwtest::write_raster(dir.file("odd.tif"), spec, [](double, double) { return 1.0; });
  EXPECT_THROW(Dem::open(dir.file("odd.tif")), Error);
}

TEST(DemSample, ADemWithoutCrsIsRefusedUnlessTheUserStatesOne) {
  cwtest::TempDir dir;
  cwtest::RasterSpec spec;
  spec.crs = "";
  cwtest::write_raster(dir.file("nocrs.tif"), spec, plane);
  try {
    Dem::open(dir.file("nocrs.tif"));
    FAIL();
  } catch (const Error& e) {
    EXPECT_NE(std::string(e.what()).find("--dem-crs"), std::string::npos);
    EXPECT_NE(std::string(e.what()).find("nocrs.tif"), std::string::npos);
  }
  DemOptions opt;
  opt.assume_crs = "EPSG:32631";
  Dem dem = Dem::open(dir.file("nocrs.tif"), opt);
  EXPECT_NEAR(dem.sample_native(502000.0, 5098000.0), plane(502000.0, 5098000.0), 2e-3);
}

TEST(DemSample, ReadsThroughTilesNotPixelByPixel) {
  cwtest::TempDir dir;
  cwtest::RasterSpec spec;
  spec.width = spec.height = 1000;
  cwtest::write_raster(dir.file("big.tif"), spec, plane);
  Dem dem = Dem::open(dir.file("big.tif"));
  // 6000 points along a diagonal cross ~4 tiles of 256 px: far fewer reads than points.
  const auto [lon_a, lat_a] = cwtest::from_crs("EPSG:32631", 500100.0, 5099900.0);
  const auto [lon_b, lat_b] = cwtest::from_crs("EPSG:32631", 528900.0, 5071100.0);
  std::vector<double> lon, lat;
  for (int k = 0; k < 6000; ++k) {
    lon.push_back(lon_a + (lon_b - lon_a) * k / 5999.0);
    lat.push_back(lat_a + (lat_b - lat_a) * k / 5999.0);
  }
  const auto z = dem.sample_lonlat(lon, lat);
  EXPECT_LE(dem.tiles_read(), 12u);
  const auto [x, y] = cwtest::to_crs("EPSG:32631", lon[3000], lat[3000]);
  EXPECT_NEAR(z[3000], plane(x, y), 2e-3);
}

TEST(DemSample, VrtMosaicOfTiles) {
  cwtest::TempDir dir;
  cwtest::RasterSpec a, b;
  a.width = b.width = 100;
  b.origin_x = a.origin_x + 100 * 30.0;
  cwtest::write_raster(dir.file("a.tif"), a, plane);
  cwtest::write_raster(dir.file("b.tif"), b, plane);
  const std::string cmd = "cd '" + dir.path().string() + "' && gdalbuildvrt -q mosaic.vrt a.tif b.tif";
  ASSERT_EQ(std::system(cmd.c_str()), 0);
  Dem dem = Dem::open(dir.file("mosaic.vrt"));
  EXPECT_EQ(dem.info().width_px, 200u);
  // Across the seam between the two tiles the plane is still exact.
  EXPECT_NEAR(dem.sample_native(503000.0, 5098000.0), plane(503000.0, 5098000.0), 2e-3);
}

TEST(DemReference, TerraMeuseBilinearValues) {
  // r-cran-terra's own tests publish bilinear values on ex/meuse.tif (Debian package r-cran-terra):
  // 378 at (178900, 329900), 270.75 at (179000, 330000), 197.25 at (180000, 331000).
  const std::string f = kExternal + "/terra/ex/meuse.tif";
  SKIP_WITHOUT(f);
  Dem dem = Dem::open(f);
  EXPECT_NEAR(dem.sample_native(178900, 329900), 378.0, 1e-6);
  EXPECT_NEAR(dem.sample_native(179000, 330000), 270.75, 1e-6);
  EXPECT_NEAR(dem.sample_native(180000, 331000), 197.25, 1e-6);
}

TEST(DemReference, TerraElevGeographicWithNodataMatchesGdallocationinfo) {
  // ex/elev.tif (r-cran-terra): geographic WGS84, Int16 with nodata -32768. At a pixel centre
  // the bilinear value is the pixel's own value, which GDAL's gdallocationinfo reports.
  const std::string f = kExternal + "/terra/ex/elev.tif";
  SKIP_WITHOUT(f);
  Dem dem = Dem::open(f);
  EXPECT_TRUE(dem.info().geographic);
  EXPECT_TRUE(dem.info().has_nodata);
  // Ground size of one pixel's larger (north-south) side at the raster's mid latitude, from
  // GeographicLib's geodesic (reference library); our figure is a display approximation (1 %).
  double ns_m = 0;
  GeographicLib::Geodesic::WGS84().Inverse(49.8, 6.1, 49.8 + 0.008333333333333, 6.1, ns_m);
  EXPECT_NEAR(dem.info().pixel_size_m, ns_m, 0.01 * ns_m);
  const double res = 0.008333333333333;
  int checked = 0;
  for (int col : {10, 40, 70}) {
    for (int row : {20, 45, 60}) {
      const double lon = 5.741666666666666 + (col + 0.5) * res;
      const double lat = 50.191666666666663 - (row + 0.5) * res;
      const std::string ref = gdallocationinfo_value(f, lon, lat);
      if (ref.empty()) continue;
      const double expected = num(ref);
      const double got = dem.sample_lonlat({lon}, {lat})[0];
      if (expected == -32768) {
        EXPECT_TRUE(std::isnan(got)) << col << "," << row;
      } else {
        EXPECT_NEAR(got, expected, 1e-6) << col << "," << row;
      }
      ++checked;
    }
  }
  EXPECT_GE(checked, 6);
  // Far outside the extent: no data.
  EXPECT_TRUE(std::isnan(dem.sample_lonlat({20.0}, {10.0})[0]));
}

TEST(DemReference, StarsOlindaUtm25SouthMatchesGdallocationinfo) {
  // tif/olinda_dem_utm25s.tif (Debian package r-cran-stars): UTM zone 25S, ~90 m pixels.
  const std::string f = kExternal + "/stars/tif/olinda_dem_utm25s.tif";
  SKIP_WITHOUT(f);
  Dem dem = Dem::open(f);
  EXPECT_FALSE(dem.info().geographic);
  EXPECT_NEAR(dem.info().pixel_size_m, 89.994067349451157, 1e-6);  // gdalinfo's pixel size
  const double x0 = 288776.250000803149305, y0 = 9120760.750028736889362, px = 89.994067349451157;
  for (int col : {15, 55, 95}) {
    for (int row : {15, 55, 95}) {
      const double x = x0 + (col + 0.5) * px, y = y0 - (row + 0.5) * px;
      const std::string ref = gdallocationinfo_value(f, x, y);
      ASSERT_FALSE(ref.empty());
      EXPECT_NEAR(dem.sample_native(x, y), num(ref), 1e-4) << col << "," << row;
    }
  }
  // Midway between four centres: the mean of the four values GDAL reports (bilinear, derived).
  const double xm = x0 + 50 * px, ym = y0 - 50 * px;
  double sum = 0;
  for (int dc : {0, 1})
    for (int dr : {0, 1}) sum += num(gdallocationinfo_value(f, x0 + (49 + dc + 0.5) * px, y0 - (49 + dr + 0.5) * px));
  EXPECT_NEAR(dem.sample_native(xm, ym), sum / 4.0, 1e-4);
}
