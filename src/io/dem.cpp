// Dem: a GDAL raster read through a cache of square tiles, sampled bilinearly.
#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <proj.h>

#include <GeographicLib/Geodesic.hpp>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <filesystem>
#include <memory>
#include <string>
#include <unordered_map>
#include <vector>

#include "coursewarden/dem.hpp"
#include "coursewarden/error.hpp"
#include "io/gdal_common.hpp"
#include "util/text.hpp"

namespace coursewarden {

struct Dem::Impl {
  std::unique_ptr<GDALDataset> ds;
  GDALRasterBand* band = nullptr;
  DemInfo info;
  double gt[6] = {0, 1, 0, 0, 0, 1};     // pixel/line -> CRS
  double inv_gt[6] = {0, 1, 0, 0, 0, 1};  // CRS -> pixel/line
  double scale = 1.0, offset = 0.0;
  std::size_t tile = 256;
  std::unordered_map<std::uint64_t, std::vector<float>> tiles;
  std::size_t tiles_read = 0;
  PJ_CONTEXT* ctx = nullptr;
  PJ* to_dem = nullptr;  // WGS84 lon/lat -> DEM CRS (x, y)

  ~Impl() {
    if (to_dem) proj_destroy(to_dem);
    if (ctx) proj_context_destroy(ctx);
  }

  const std::vector<float>& tile_at(std::size_t tx, std::size_t ty) {
    const std::uint64_t key = (static_cast<std::uint64_t>(ty) << 32) | tx;
    auto it = tiles.find(key);
    if (it != tiles.end()) return it->second;
    const std::size_t x0 = tx * tile, y0 = ty * tile;
    const std::size_t w = std::min(tile, info.width_px - x0);
    const std::size_t h = std::min(tile, info.height_px - y0);
    std::vector<float> data(w * h);
    const CPLErr err = band->RasterIO(GF_Read, static_cast<int>(x0), static_cast<int>(y0),
                                      static_cast<int>(w), static_cast<int>(h), data.data(),
                                      static_cast<int>(w), static_cast<int>(h), GDT_Float32, 0, 0);
    if (err != CE_None) {
      fail(info.path, "pixels " + std::to_string(x0) + "," + std::to_string(y0),
           "GDAL could not read this part of the DEM; check the file and its tiles");
    }
    ++tiles_read;
    return tiles.emplace(key, std::move(data)).first->second;
  }

  // Raw value at integer pixel (col, row), or NaN for outside / nodata.
  double pixel(long long col, long long row) {
    if (col < 0 || row < 0 || col >= static_cast<long long>(info.width_px) ||
        row >= static_cast<long long>(info.height_px)) {
      return kNoValue;
    }
    const auto c = static_cast<std::size_t>(col), r = static_cast<std::size_t>(row);
    const auto& t = tile_at(c / tile, r / tile);
    const std::size_t w = std::min(tile, info.width_px - (c / tile) * tile);
    const float v = t[(r % tile) * w + (c % tile)];
    if (std::isnan(v)) return kNoValue;
    if (info.has_nodata && v == static_cast<float>(info.nodata)) return kNoValue;
    return static_cast<double>(v);
  }
};

Dem::Dem(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
Dem::Dem(Dem&&) noexcept = default;
Dem& Dem::operator=(Dem&&) noexcept = default;
Dem::~Dem() = default;

namespace {

double unit_to_metres(const std::string& unit_raw, bool& known) {
  std::string unit;
  for (char c : unit_raw) unit += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  known = true;
  if (unit.empty() || unit == "m" || unit == "metre" || unit == "meter" || unit == "metres" ||
      unit == "meters")
    return 1.0;
  if (unit == "ft" || unit == "foot" || unit == "feet" || unit == "international foot")
    return 0.3048;  // international foot, exact by definition
  if (unit == "us-ft" || unit == "ftus" || unit == "us survey foot" || unit == "foot_us" ||
      unit == "us_survey_foot")
    return 1200.0 / 3937.0;  // US survey foot, exact by definition
  if (unit == "cm") return 0.01;
  if (unit == "dm") return 0.1;
  known = false;
  return 1.0;
}

}  // namespace

Dem Dem::open(const std::string& path, const DemOptions& options) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (!fs::exists(path, ec)) fail(path, "", "DEM file not found; check the --dem path");
  gdal_init();
  auto impl = std::make_unique<Impl>();
  impl->info.path = path;
  impl->tile = std::max<std::size_t>(16, options.tile_size);
  GdalQuiet quiet;
  impl->ds.reset(GDALDataset::Open(path.c_str(), GDAL_OF_RASTER | GDAL_OF_READONLY));
  if (!impl->ds) {
    fail(path, "", "not a raster GDAL can read (" + quiet.last_message() +
                       "); give a GeoTIFF, VRT or other GDAL raster");
  }
  if (options.band < 1 || options.band > impl->ds->GetRasterCount()) {
    fail(path, "band " + std::to_string(options.band),
         "no such band; the raster has " + std::to_string(impl->ds->GetRasterCount()));
  }
  impl->band = impl->ds->GetRasterBand(options.band);
  DemInfo& info = impl->info;
  info.width_px = static_cast<std::size_t>(impl->ds->GetRasterXSize());
  info.height_px = static_cast<std::size_t>(impl->ds->GetRasterYSize());

  // Pixel registration: GDAL's geotransform always maps (col, row) = (0, 0) to the outer corner
  // of the first pixel (GDAL shifts point-registered GeoTIFFs by half a pixel when it opens them),
  // so the centre of pixel (i, j) is at geotransform(i + 0.5, j + 0.5). Heights are taken to hold
  // at pixel centres and interpolated bilinearly between the four nearest centres.
  if (impl->ds->GetGeoTransform(impl->gt) != CE_None) {
    fail(path, "", "the raster has no georeferencing (geotransform); it cannot be placed on a map");
  }
  if (!GDALInvGeoTransform(impl->gt, impl->inv_gt)) {
    fail(path, "", "the raster's geotransform cannot be inverted; the file is damaged");
  }

  OGRSpatialReference srs;
  const OGRSpatialReference* declared = impl->ds->GetSpatialRef();
  if (declared && !declared->IsEmpty()) {
    srs = *declared;
  } else if (!options.assume_crs.empty()) {
    if (srs.SetFromUserInput(options.assume_crs.c_str()) != OGRERR_NONE) {
      fail(path, "--dem-crs " + options.assume_crs, "not a CRS GDAL/PROJ knows; use EPSG:nnnn");
    }
  } else {
    fail(path, "", "the DEM has no coordinate reference system; state it with --dem-crs EPSG:nnnn");
  }
  srs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  const char* name = srs.GetName();
  info.crs_name = name ? name : "unnamed CRS";
  info.geographic = srs.IsGeographic();

  // Vertical unit: the band's declared unit, else the vertical part of a compound CRS.
  std::string unit = impl->band->GetUnitType() ? impl->band->GetUnitType() : "";
  if (unit.empty() && srs.IsCompound()) {
    const char* vunit = nullptr;
    srs.GetTargetLinearUnits("VERT_CS", &vunit);
    if (vunit) unit = vunit;
  }
  bool known = true;
  info.to_metres = unit_to_metres(unit, known);
  if (!known) {
    fail(path, "band " + std::to_string(options.band),
         "unknown vertical unit '" + unit + "'; convert the DEM to metres or feet");
  }
  info.vertical_unit = unit.empty() ? "metre" : unit;
  int has = 0;
  impl->scale = impl->band->GetScale(&has);
  if (!has) impl->scale = 1.0;
  impl->offset = impl->band->GetOffset(&has);
  if (!has) impl->offset = 0.0;
  int has_nodata = 0;
  const double nodata = impl->band->GetNoDataValue(&has_nodata);
  info.has_nodata = has_nodata != 0;
  info.nodata = nodata;

  // WGS84 lon/lat -> DEM CRS.
  impl->ctx = proj_context_create();
  proj_log_level(impl->ctx, PJ_LOG_NONE);
  char* wkt = nullptr;
  const char* wkt_options[] = {"FORMAT=WKT2_2018", nullptr};
  srs.exportToWkt(&wkt, wkt_options);
  PJ* raw = proj_create_crs_to_crs(impl->ctx, "EPSG:4326", wkt, nullptr);
  CPLFree(wkt);
  if (!raw) fail(path, "", "PROJ cannot transform WGS84 into the DEM's CRS '" + info.crs_name + "'");
  impl->to_dem = proj_normalize_for_visualization(impl->ctx, raw);
  proj_destroy(raw);

  // Extent in lon/lat from the corners and edge midpoints, and the ground pixel size.
  double west = 1e9, east = -1e9, south = 1e9, north = -1e9;
  for (double fx : {0.0, 0.5, 1.0}) {
    for (double fy : {0.0, 0.5, 1.0}) {
      const double col = fx * static_cast<double>(info.width_px);
      const double row = fy * static_cast<double>(info.height_px);
      PJ_COORD c = proj_coord(impl->gt[0] + col * impl->gt[1] + row * impl->gt[2],
                              impl->gt[3] + col * impl->gt[4] + row * impl->gt[5], 0, 0);
      c = proj_trans(impl->to_dem, PJ_INV, c);
      if (!std::isfinite(c.xy.x) || !std::isfinite(c.xy.y)) continue;
      west = std::min(west, c.xy.x);
      east = std::max(east, c.xy.x);
      south = std::min(south, c.xy.y);
      north = std::max(north, c.xy.y);
    }
  }
  info.west_deg = west;
  info.east_deg = east;
  info.south_deg = south;
  info.north_deg = north;
  const double px = std::hypot(impl->gt[1], impl->gt[4]);
  const double py = std::hypot(impl->gt[2], impl->gt[5]);
  if (info.geographic) {
    // Ground size of one pixel at the raster's mid latitude, along both axes (WGS84 geodesic).
    const double lat = 0.5 * (south + north), lon = 0.5 * (west + east);
    double ew_m = 0.0, ns_m = 0.0;
    GeographicLib::Geodesic::WGS84().Inverse(lat, lon, lat, lon + px, ew_m);
    GeographicLib::Geodesic::WGS84().Inverse(lat, lon, lat + py, lon, ns_m);
    info.pixel_size_m = std::max(ew_m, ns_m);
  } else {
    double lin = srs.GetLinearUnits();
    if (!(lin > 0)) lin = 1.0;
    info.pixel_size_m = std::max(px, py) * lin;
  }
  return Dem(std::move(impl));
}

const DemInfo& Dem::info() const { return impl_->info; }
std::size_t Dem::tiles_read() const { return impl_->tiles_read; }

double Dem::sample_native(double x, double y) {
  Impl& d = *impl_;
  const double col = d.inv_gt[0] + x * d.inv_gt[1] + y * d.inv_gt[2];
  const double row = d.inv_gt[3] + x * d.inv_gt[4] + y * d.inv_gt[5];
  if (!std::isfinite(col) || !std::isfinite(row)) return kNoValue;
  // Centre-registered coordinates: pixel i's centre is at col = i + 0.5.
  const double fx = col - 0.5, fy = row - 0.5;
  const double i0 = std::floor(fx), j0 = std::floor(fy);
  const double tx = fx - i0, ty = fy - j0;
  const auto i = static_cast<long long>(i0), j = static_cast<long long>(j0);
  const double v[4] = {d.pixel(i, j), d.pixel(i + 1, j), d.pixel(i, j + 1), d.pixel(i + 1, j + 1)};
  const double w[4] = {(1 - tx) * (1 - ty), tx * (1 - ty), (1 - tx) * ty, tx * ty};
  double sum = 0.0, weight = 0.0;
  for (int k = 0; k < 4; ++k) {
    if (std::isnan(v[k])) continue;  // renormalise over the valid neighbours
    sum += w[k] * v[k];
    weight += w[k];
  }
  if (weight <= 1e-12) {
    // Only reachable when every neighbour with weight is missing.
    return kNoValue;
  }
  return (sum / weight * d.scale + d.offset) * d.info.to_metres;
}

void Dem::lonlat_to_native(double lon_deg, double lat_deg, double& x, double& y) const {
  PJ_COORD c = proj_trans(impl_->to_dem, PJ_FWD, proj_coord(lon_deg, lat_deg, 0, 0));
  x = c.xy.x;
  y = c.xy.y;
}

std::vector<double> Dem::sample_lonlat(const std::vector<double>& lon_deg,
                                       const std::vector<double>& lat_deg) {
  const std::size_t n = std::min(lon_deg.size(), lat_deg.size());
  std::vector<double> x(lon_deg.begin(), lon_deg.begin() + static_cast<long>(n));
  std::vector<double> y(lat_deg.begin(), lat_deg.begin() + static_cast<long>(n));
  proj_trans_generic(impl_->to_dem, PJ_FWD, x.data(), sizeof(double), n, y.data(), sizeof(double),
                     n, nullptr, 0, 0, nullptr, 0, 0);
  std::vector<double> out(n);
  for (std::size_t k = 0; k < n; ++k) out[k] = sample_native(x[k], y[k]);
  return out;
}

}  // namespace coursewarden
