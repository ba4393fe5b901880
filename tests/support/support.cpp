#include "support/support.hpp"

#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <proj.h>

#include <clocale>
#include <fstream>
#include <map>
#include <locale>
#include <random>
#include <sstream>
#include <stdexcept>

namespace cwtest {

TempDir::TempDir() {
  std::random_device rd;
  path_ = std::filesystem::temp_directory_path() /
          ("coursewarden-test-" + std::to_string(rd()) + std::to_string(rd()));
  std::filesystem::create_directories(path_);
}
TempDir::~TempDir() {
  std::error_code ec;
  std::filesystem::remove_all(path_, ec);
}

void write_raster(const std::string& path, const RasterSpec& spec,
                  const std::function<double(double, double)>& height) {
  GDALAllRegister();
  GDALDriver* drv = GetGDALDriverManager()->GetDriverByName(spec.format.c_str());
  if (!drv) throw std::runtime_error("no GDAL driver " + spec.format);
  GDALDataset* ds = drv->Create(path.c_str(), spec.width, spec.height, 1, GDT_Float32, nullptr);
  if (!ds) throw std::runtime_error("cannot create " + path);
  double gt[6] = {spec.origin_x, spec.pixel_m, 0, spec.origin_y, 0, -spec.pixel_m};
  ds->SetGeoTransform(gt);
  if (!spec.crs.empty()) {
    OGRSpatialReference srs;
    srs.SetFromUserInput(spec.crs.c_str());
    ds->SetSpatialRef(&srs);
  }
  GDALRasterBand* band = ds->GetRasterBand(1);
  if (!spec.unit.empty()) band->SetUnitType(spec.unit.c_str());
  if (spec.has_nodata) band->SetNoDataValue(spec.nodata);
  std::vector<float> row(static_cast<std::size_t>(spec.width));
  for (int j = 0; j < spec.height; ++j) {
    for (int i = 0; i < spec.width; ++i) {
      const double x = spec.origin_x + (i + 0.5) * spec.pixel_m;
      const double y = spec.origin_y - (j + 0.5) * spec.pixel_m;
      row[static_cast<std::size_t>(i)] = static_cast<float>(height(x, y));
    }
    if (band->RasterIO(GF_Write, 0, j, spec.width, 1, row.data(), spec.width, 1, GDT_Float32, 0, 0) != CE_None)
      throw std::runtime_error("write failed");
  }
  GDALClose(ds);
}

namespace {
// One transformation per CRS, kept for the life of the test program (tests are single-threaded).
std::pair<double, double> trans(const std::string& crs, double a, double b, PJ_DIRECTION dir) {
  static std::map<std::string, PJ*> cache;
  PJ*& pj = cache[crs];
  if (!pj) {
    PJ* raw = proj_create_crs_to_crs(nullptr, "EPSG:4326", crs.c_str(), nullptr);
    pj = proj_normalize_for_visualization(nullptr, raw);
    proj_destroy(raw);
  }
  PJ_COORD c = proj_trans(pj, dir, proj_coord(a, b, 0, 0));
  return {c.xy.x, c.xy.y};
}
}  // namespace

std::pair<double, double> to_crs(const std::string& crs, double lon, double lat) {
  return trans(crs, lon, lat, PJ_FWD);
}
std::pair<double, double> from_crs(const std::string& crs, double x, double y) {
  return trans(crs, x, y, PJ_INV);
}

static std::string num(double v) {
  std::ostringstream o;
  o.imbue(std::locale::classic());
  o.precision(10);
  o << v;
  return o.str();
}

void write_gpx(const std::string& path,
               const std::vector<std::pair<std::string, std::vector<std::vector<LonLat>>>>& tracks) {
  std::ostringstream o;
  o << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
       "<gpx version=\"1.1\" creator=\"coursewarden tests\" xmlns=\"http://www.topografix.com/GPX/1/1\">\n";
  for (const auto& [name, segments] : tracks) {
    o << " <trk><name>" << name << "</name>\n";
    for (const auto& seg : segments) {
      o << "  <trkseg>\n";
      for (const auto& p : seg) {
        o << "   <trkpt lat=\"" << num(p.lat) << "\" lon=\"" << num(p.lon) << "\">";
        if (p.has_ele) o << "<ele>" << num(p.ele) << "</ele>";
        o << "</trkpt>\n";
      }
      o << "  </trkseg>\n";
    }
    o << " </trk>\n";
  }
  o << "</gpx>\n";
  write_text(path, o.str());
}

void write_text(const std::string& path, const std::string& text) {
  std::ofstream out(path, std::ios::binary);
  out << text;
}

std::string read_text(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::vector<LonLat> straight_line(const std::string& crs, double x0, double y0, double x1,
                                  double y1, int points) {
  std::vector<LonLat> out;
  for (int k = 0; k < points; ++k) {
    const double t = points == 1 ? 0.0 : static_cast<double>(k) / (points - 1);
    auto [lon, lat] = from_crs(crs, x0 + t * (x1 - x0), y0 + t * (y1 - y0));
    out.push_back({lon, lat});
  }
  return out;
}

}  // namespace cwtest

namespace {
// The suite runs in the user's locale, as a real program embedded in a localised application
// might: .ci/run repeats it under de_DE.UTF-8 (decimal comma) to prove that no parsing or
// formatting of numbers depends on the C or C++ locale.
struct LocaleFromEnvironment {
  LocaleFromEnvironment() {
    std::setlocale(LC_ALL, "");
    try {
      std::locale::global(std::locale(""));
    } catch (const std::exception&) {
      // An unknown LANG leaves the classic locale; the run then proves less but still runs.
    }
  }
} g_locale_from_environment;
}  // namespace
