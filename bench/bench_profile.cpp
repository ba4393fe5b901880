// Drape and profile a 300 km course at 5 m spacing over a 30 m DEM (issue target: < 100 ms after
// GDAL has started, two cores, Release). The DEM and course are synthetic, made at start-up.
#include <benchmark/benchmark.h>

#include <gdal_priv.h>
#include <ogr_spatialref.h>

#include <cmath>
#include <filesystem>
#include <string>
#include <vector>

#include "coursewarden/dem.hpp"
#include "coursewarden/geometry.hpp"
#include "coursewarden/profile.hpp"

using namespace coursewarden;

namespace {

constexpr double kOriginX = 400000.0, kOriginY = 5200000.0, kPixel = 30.0;
constexpr int kSize = 2400;  // 72 km square at 30 m

double terrain(double x, double y) {
  const double u = (x - kOriginX) / 1000.0, v = (kOriginY - y) / 1000.0;
  return 400.0 + 300.0 * std::sin(u / 9.0) * std::cos(v / 7.0) + 40.0 * std::sin(u / 1.3 + v / 1.7);
}

const std::string& dem_path() {
  static const std::string path = [] {
    const std::string p = (std::filesystem::temp_directory_path() / "coursewarden-bench-dem.tif").string();
    if (std::filesystem::exists(p)) return p;
    GDALAllRegister();
    const char* opts[] = {"TILED=YES", "COMPRESS=DEFLATE", "PREDICTOR=3", nullptr};
    GDALDataset* ds = GetGDALDriverManager()->GetDriverByName("GTiff")->Create(
        p.c_str(), kSize, kSize, 1, GDT_Float32, const_cast<char**>(opts));
    double gt[6] = {kOriginX, kPixel, 0, kOriginY, 0, -kPixel};
    ds->SetGeoTransform(gt);
    OGRSpatialReference srs;
    srs.importFromEPSG(32631);
    ds->SetSpatialRef(&srs);
    std::vector<float> row(kSize);
    for (int j = 0; j < kSize; ++j) {
      for (int i = 0; i < kSize; ++i)
        row[i] = static_cast<float>(terrain(kOriginX + (i + 0.5) * kPixel, kOriginY - (j + 0.5) * kPixel));
      (void)ds->GetRasterBand(1)->RasterIO(GF_Write, 0, j, kSize, 1, row.data(), kSize, 1, GDT_Float32, 0, 0);
    }
    GDALClose(ds);
    return p;
  }();
  return path;
}

// A 300 km winding course (a rose curve with wiggles) inside the DEM, as lon/lat vertices 20 m apart.
RawCourse course_300km() {
  RawCourse c;
  const auto proj = LocalProjection::from_user_crs("EPSG:32631");
  const double cx = kOriginX + kSize * kPixel / 2, cy = kOriginY - kSize * kPixel / 2;
  double length = 0, px = 0, py = 0;
  for (int k = 0; length < 300000.0; ++k) {
    const double t = k * 1e-4;
    const double r = 28000.0 * std::cos(3 * t) + 1500.0 * std::sin(37 * t);
    const double x = cx + r * std::cos(t), y = cy + r * std::sin(t);
    if (k > 0) {
      const double step = std::hypot(x - px, y - py);
      if (step < 20.0) continue;
      length += step;
    }
    px = x;
    py = y;
    double lon, lat;
    proj.inverse(x, y, lon, lat);
    c.vertices.push_back({lon, lat});
  }
  return c;
}

void BM_DrapeAndProfile300km(benchmark::State& state) {
  const std::string dem_file = dem_path();
  const RawCourse course = course_300km();
  double lon0, lat0;
  course_centre(course, lon0, lat0);
  const auto projection = LocalProjection::centred_on(lon0, lat0);
  std::size_t stations = 0, tiles = 0;
  for (auto _ : state) {
    Dem dem = Dem::open(dem_file);
    const auto st = resample_course(course, 5.0, projection);
    std::vector<double> lon(st.size()), lat(st.size());
    for (std::size_t i = 0; i < st.size(); ++i) {
      lon[i] = st[i].lon_deg;
      lat[i] = st[i].lat_deg;
    }
    const auto raw = dem.sample_lonlat(lon, lat);
    const Profile p = build_profile(st, raw, dem.info().pixel_size_m, {}, dem_file);
    const auto climbs = find_climbs(p.distance_m, p.elevation_m, {});
    benchmark::DoNotOptimize(climbs.data());
    stations = st.size();
    tiles = dem.tiles_read();
  }
  state.counters["stations"] = static_cast<double>(stations);
  state.counters["tiles_read"] = static_cast<double>(tiles);
}
BENCHMARK(BM_DrapeAndProfile300km)->Unit(benchmark::kMillisecond)->MinTime(2.0);

}  // namespace

BENCHMARK_MAIN();
