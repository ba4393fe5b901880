// make_sample_course: writes the bundled sample event (an invented course on synthetic terrain).
//
//   make_sample_course OUTPUT_DIR [--threads N]
//
// Writes OUTPUT_DIR/dem.tif (Float32 GeoTIFF, UTM zone 31N, 30 m pixels, DEFLATE), course.gpx
// (one track, heights sampled from that DEM), features.csv and README.md. The output depends on
// nothing but this program: running it twice gives the same bytes. docs/sample-course.md
// describes the method.
#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <proj.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <stdexcept>
#include <string>
#include <thread>
#include <vector>

#include "sample_plan.hpp"
#include "sample_terrain.hpp"
#include "util/text.hpp"

namespace cs = coursewarden::sample;
using coursewarden::fmt_fixed;

namespace {

constexpr std::uint64_t kSeed = 0x5EED0A1EULL;  // fixed: the sample must not change between runs
constexpr double kAnchorLon = 3.2, kAnchorLat = 46.3;  // arbitrary, unremarkable spot
constexpr int kEpsg = 32631;                              // WGS 84 / UTM zone 31N
constexpr double kPixel = 30.0;
constexpr double kMargin = 1500.0;     // terrain beyond the course's extent, metres
constexpr double kQuantum = 1.0 / 16.0;  // heights rounded to 1/16 m: compresses well, exact in float
constexpr float kNoData = -9999.0f;

/// WGS84 lon/lat <-> UTM through PROJ, axis order lon/lat and easting/northing.
class Utm {
public:
  Utm() {
    ctx_ = proj_context_create();
    proj_log_level(ctx_, PJ_LOG_NONE);
    const std::string target = "EPSG:" + std::to_string(kEpsg);
    PJ* raw = proj_create_crs_to_crs(ctx_, "EPSG:4326", target.c_str(), nullptr);
    if (!raw) throw std::runtime_error("PROJ cannot build WGS84 -> " + target);
    pj_ = proj_normalize_for_visualization(ctx_, raw);
    proj_destroy(raw);
    geod_ = proj_create(ctx_, "+proj=longlat +ellps=WGS84");
    if (!pj_ || !geod_) throw std::runtime_error("PROJ set-up failed");
  }
  ~Utm() {
    proj_destroy(pj_);
    proj_destroy(geod_);
    proj_context_destroy(ctx_);
  }
  Utm(const Utm&) = delete;
  Utm& operator=(const Utm&) = delete;

  void forward(double lon, double lat, double& e, double& n) const {
    const PJ_COORD c = proj_trans(pj_, PJ_FWD, proj_coord(lon, lat, 0, 0));
    e = c.xy.x;
    n = c.xy.y;
  }
  void inverse(double e, double n, double& lon, double& lat) const {
    const PJ_COORD c = proj_trans(pj_, PJ_INV, proj_coord(e, n, 0, 0));
    lon = c.lp.lam;
    lat = c.lp.phi;
  }
  /// Geodesic distance on the WGS84 ellipsoid between two lon/lat points in degrees.
  double geodesic_m(double lon1, double lat1, double lon2, double lat2) const {
    const double r = M_PI / 180.0;
    return proj_lp_dist(geod_, proj_coord(lon1 * r, lat1 * r, 0, 0),
                        proj_coord(lon2 * r, lat2 * r, 0, 0));
  }

private:
  PJ_CONTEXT* ctx_ = nullptr;
  PJ* pj_ = nullptr;
  PJ* geod_ = nullptr;
};

/// Bilinear height between the four nearest pixel centres (centre registration, as the
/// coursewarden DEM reader does).
double sample(const cs::Grid& g, const std::vector<float>& z, double x, double y) {
  const double fx = (x - g.west_m) / g.pixel_m - 0.5, fy = (g.north_m - y) / g.pixel_m - 0.5;
  const double i0 = std::floor(fx), j0 = std::floor(fy);
  const double tx = fx - i0, ty = fy - j0;
  const auto i = static_cast<std::size_t>(std::clamp(i0, 0.0, static_cast<double>(g.cols - 2)));
  const auto j = static_cast<std::size_t>(std::clamp(j0, 0.0, static_cast<double>(g.rows - 2)));
  auto at = [&](std::size_t c, std::size_t r) { return static_cast<double>(z[r * g.cols + c]); };
  return (1 - tx) * (1 - ty) * at(i, j) + tx * (1 - ty) * at(i + 1, j) +
         (1 - tx) * ty * at(i, j + 1) + tx * ty * at(i + 1, j + 1);
}

void write_dem(const std::string& path, const cs::Grid& g, const std::vector<float>& z,
               double east0, double north0, const std::string& description) {
  GDALAllRegister();
  CPLSetConfigOption("GDAL_PAM_ENABLED", "NO");  // no .aux.xml beside the file
  GDALDriver* driver = GetGDALDriverManager()->GetDriverByName("GTiff");
  if (!driver) throw std::runtime_error("GDAL has no GTiff driver");
  std::error_code ec;
  std::filesystem::remove(path, ec);
  CPLStringList options;
  options.AddNameValue("COMPRESS", "DEFLATE");
  options.AddNameValue("PREDICTOR", "3");  // floating-point predictor
  options.AddNameValue("ZLEVEL", "9");
  options.AddNameValue("TILED", "YES");
  options.AddNameValue("BLOCKXSIZE", "256");
  options.AddNameValue("BLOCKYSIZE", "256");
  GDALDataset* ds = driver->Create(path.c_str(), static_cast<int>(g.cols), static_cast<int>(g.rows),
                                   1, GDT_Float32, options.List());
  if (!ds) throw std::runtime_error("cannot create " + path);
  // Outer corner of the first pixel (GDAL's area convention), north-up.
  double gt[6] = {east0 + g.west_m, g.pixel_m, 0.0, north0 + g.north_m, 0.0, -g.pixel_m};
  ds->SetGeoTransform(gt);
  OGRSpatialReference srs;
  srs.importFromEPSG(kEpsg);
  ds->SetSpatialRef(&srs);
  ds->SetMetadataItem("TIFFTAG_IMAGEDESCRIPTION", description.c_str());
  GDALRasterBand* band = ds->GetRasterBand(1);
  band->SetNoDataValue(kNoData);
  band->SetUnitType("metre");
  band->SetDescription("elevation");
  std::vector<float> copy = z;
  const CPLErr err = band->RasterIO(GF_Write, 0, 0, static_cast<int>(g.cols), static_cast<int>(g.rows),
                                    copy.data(), static_cast<int>(g.cols), static_cast<int>(g.rows),
                                    GDT_Float32, 0, 0);
  GDALClose(ds);
  if (err != CE_None) throw std::runtime_error("writing " + path + " failed");
}

std::string xml_escape(const std::string& s) {
  std::string out;
  for (char ch : s) {
    switch (ch) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      default: out += ch;
    }
  }
  return out;
}

struct GroundScale {
  std::vector<double> s_m, ground_m;
  double at(double s) const {
    auto it = std::upper_bound(s_m.begin(), s_m.end(), s);
    if (it == s_m.begin()) return ground_m.front();
    if (it == s_m.end()) return ground_m.back();
    const auto k = static_cast<std::size_t>(it - s_m.begin());
    const double t = (s - s_m[k - 1]) / (s_m[k] - s_m[k - 1]);
    return ground_m[k - 1] + t * (ground_m[k] - ground_m[k - 1]);
  }
};

std::string km(double m) { return fmt_fixed(m / 1000.0, 2); }

}  // namespace

int main(int argc, char** argv) {
  try {
    std::string out_dir, debug_csv;
    unsigned threads = std::max(1u, std::thread::hardware_concurrency());
    for (int i = 1; i < argc; ++i) {
      const std::string a = argv[i];
      if (a == "--threads" && i + 1 < argc) {
        threads = static_cast<unsigned>(std::stoul(argv[++i]));
      } else if (a == "--debug-profile" && i + 1 < argc) {
        debug_csv = argv[++i];
      } else if (a == "-h" || a == "--help") {
        std::cout << "usage: make_sample_course OUTPUT_DIR [--threads N] [--debug-profile CSV]\n";
        return 0;
      } else if (out_dir.empty()) {
        out_dir = a;
      } else {
        std::cerr << "make_sample_course: unexpected argument '" << a << "'\n";
        return 2;
      }
    }
    if (out_dir.empty()) {
      std::cerr << "usage: make_sample_course OUTPUT_DIR [--threads N] [--debug-profile CSV]\n";
      return 2;
    }
    std::filesystem::create_directories(out_dir);

    const cs::SamplePlan plan = cs::make_plan(kSeed);
    const cs::Path& path = plan.path;
    Utm utm;
    double east0 = 0, north0 = 0;
    utm.forward(kAnchorLon, kAnchorLat, east0, north0);
    east0 = std::round(east0 / kPixel) * kPixel;  // local origin on a pixel corner
    north0 = std::round(north0 / kPixel) * kPixel;

    // ---- grid covering the course plus a margin
    const auto dense = cs::sample_path(path, 5.0, 0.02);
    double x0 = 1e18, x1 = -1e18, y0 = 1e18, y1 = -1e18;
    for (const auto& p : dense) {
      x0 = std::min(x0, p.at.x_m);
      x1 = std::max(x1, p.at.x_m);
      y0 = std::min(y0, p.at.y_m);
      y1 = std::max(y1, p.at.y_m);
    }
    cs::Grid grid;
    grid.pixel_m = kPixel;
    grid.west_m = std::floor((x0 - kMargin) / kPixel) * kPixel;
    grid.north_m = std::ceil((y1 + kMargin) / kPixel) * kPixel;
    grid.cols = static_cast<std::size_t>(std::ceil((x1 + kMargin - grid.west_m) / kPixel));
    grid.rows = static_cast<std::size_t>(std::ceil((grid.north_m - (y0 - kMargin)) / kPixel));

    const cs::TerrainOptions terrain_options;
    const auto z_m = cs::make_terrain(plan, grid, terrain_options, kSeed, threads);
    std::vector<float> z(z_m.size());
    for (std::size_t i = 0; i < z.size(); ++i) {
      z[i] = static_cast<float>(std::round(z_m[i] / kQuantum) * kQuantum);
    }
    const std::string dem_path = out_dir + "/dem.tif";
    write_dem(dem_path, grid, z, east0, north0,
              "Synthetic terrain for the invented sample event '" + plan.event_name +
                  "' (coursewarden tools/make_sample_course); not a survey of any real place");

    // ---- ground distance along the course (geodesic between dense points)
    GroundScale ground;
    double prev_lon = 0, prev_lat = 0, acc = 0;
    std::vector<double> lon(dense.size()), lat(dense.size());
    for (std::size_t i = 0; i < dense.size(); ++i) {
      utm.inverse(east0 + dense[i].at.x_m, north0 + dense[i].at.y_m, lon[i], lat[i]);
      if (i > 0) acc += utm.geodesic_m(prev_lon, prev_lat, lon[i], lat[i]);
      prev_lon = lon[i];
      prev_lat = lat[i];
      ground.s_m.push_back(dense[i].s_m);
      ground.ground_m.push_back(acc);
    }

    // ---- self-check: DEM along the course against the designed profile
    double worst_diff = 0, worst_at = 0, sum_sq = 0, worst_step = 0, worst_step_at = 0;
    double prev_z = 0;
    std::ofstream debug;
    if (!debug_csv.empty()) {
      debug.open(debug_csv, std::ios::binary);
      debug << "ground_m,design_m,dem_m\n";
    }
    for (std::size_t i = 0; i < dense.size(); ++i) {
      const double zd = sample(grid, z, dense[i].at.x_m, dense[i].at.y_m);
      const double diff = zd - plan.profile.at(dense[i].s_m);
      if (debug.is_open()) {
        debug << fmt_fixed(ground.ground_m[i], 2) << "," << fmt_fixed(plan.profile.at(dense[i].s_m), 3)
              << "," << fmt_fixed(zd, 3) << "\n";
      }
      sum_sq += diff * diff;
      if (std::abs(diff) > std::abs(worst_diff)) {
        worst_diff = diff;
        worst_at = ground.ground_m[i];
      }
      if (i > 0) {
        const double step = std::abs(zd - prev_z) /
                            std::max(ground.ground_m[i] - ground.ground_m[i - 1], 1e-6) * 100.0;
        if (step > worst_step) {
          worst_step = step;
          worst_step_at = ground.ground_m[i];
        }
      }
      prev_z = zd;
    }
    const double rms = std::sqrt(sum_sq / static_cast<double>(dense.size()));

    // ---- GPX: vertices every <= 25 m, arcs to within 0.1 m; heights from the DEM
    const auto vertices = cs::sample_path(path, 25.0, 0.1);
    {
      std::ofstream gpx(out_dir + "/course.gpx", std::ios::binary);
      gpx << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
          << "<gpx version=\"1.1\" creator=\"coursewarden make_sample_course\" "
             "xmlns=\"http://www.topografix.com/GPX/1/1\">\n"
          << "  <metadata>\n"
          << "    <name>" << xml_escape(plan.event_name) << " (invented event)</name>\n"
          << "    <desc>Sample course for coursewarden: an invented event on synthetic terrain "
             "made by tools/make_sample_course. Not a real route.</desc>\n"
          << "  </metadata>\n"
          << "  <trk>\n"
          << "    <name>" << xml_escape(plan.event_name) << " " << fmt_fixed(acc / 1000.0, 0)
          << " km</name>\n"
          << "    <trkseg>\n";
      for (const auto& v : vertices) {
        double vlon = 0, vlat = 0;
        utm.inverse(east0 + v.at.x_m, north0 + v.at.y_m, vlon, vlat);
        gpx << "      <trkpt lat=\"" << fmt_fixed(vlat, 7) << "\" lon=\"" << fmt_fixed(vlon, 7)
            << "\"><ele>" << fmt_fixed(sample(grid, z, v.at.x_m, v.at.y_m), 1) << "</ele></trkpt>\n";
      }
      gpx << "    </trkseg>\n  </trk>\n</gpx>\n";
      if (!gpx) throw std::runtime_error("writing " + out_dir + "/course.gpx failed");
    }

    // ---- features.csv (ground kilometres, as coursewarden reports them)
    {
      std::ofstream csv(out_dir + "/features.csv", std::ios::binary);
      csv << "feature,kind,start_km,end_km,gain_m,turn_deg,radius_m,detail\n";
      for (const auto& f : plan.features) {
        csv << f.name << "," << f.kind << "," << fmt_fixed(ground.at(f.start_m) / 1000.0, 3) << ","
            << fmt_fixed(ground.at(f.end_m) / 1000.0, 3) << "," << fmt_fixed(f.gain_m, 1) << ","
            << fmt_fixed(f.turn_deg, 1) << "," << fmt_fixed(f.radius_m, 1) << ",\"" << f.detail
            << "\"\n";
      }
      if (!csv) throw std::runtime_error("writing " + out_dir + "/features.csv failed");
    }

    // ---- README.md
    {
      std::ofstream md(out_dir + "/README.md", std::ios::binary);
      md << "# " << plan.event_name << ": sample course (invented event, synthetic terrain)\n\n"
         << "**Synthetic. Nothing here is real.** The event, the town of Orvalune, its roads and "
            "the terrain around them were invented and made by a program, "
            "`tools/make_sample_course`, from a fixed seed. The files are placed near "
            "46.3 N, 3.2 E (UTM zone 31N) only so that they carry real-world coordinates; the "
            "real ground there looks nothing like this, and no real road, climb or event was "
            "copied. Do not ride it.\n\n"
         << "This file is written by the generator; edit the generator, not this file.\n\n"
         << "## Files\n\n"
         << "| file | content |\n| --- | --- |\n"
         << "| `course.gpx` | the course: one `<trk>` with one `<trkseg>` of " << vertices.size()
         << " `<trkpt>` (WGS84 lat/lon, points at most 25 m apart and closer on "
            "bends), `<ele>` sampled from `dem.tif`, no times |\n"
         << "| `dem.tif` | the terrain: GeoTIFF, Float32, EPSG:" << kEpsg
         << " (WGS 84 / UTM zone 31N), " << fmt_fixed(kPixel, 0) << " m pixels, " << grid.cols
         << " x " << grid.rows
         << " pixels, DEFLATE with the floating-point predictor, 256 x 256 tiles, unit metre, "
            "nodata -9999 (declared; no pixel is nodata), heights rounded to 1/16 m |\n"
         << "| `features.csv` | the designed features and their ground distance from the start "
            "(km), for tests |\n\n"
         << "## The course\n\n"
         << fmt_fixed(acc / 1000.0, 1)
         << " km, a loop from the town of Orvalune (level ground at 300 m) and back: out along a "
            "valley, a first climb winding up to a plateau, a short ramp to a crest with a bend just "
            "beyond it, a descent that ends in a sharp left turn at a T-junction, a valley road to "
            "a second climb over a pass, a long fast descent with six switchback hairpins, and "
            "home along the southern valleys. Distances below are ground (geodesic) distances "
            "from the start; heights are as designed (the DEM reproduces them within "
         << fmt_fixed(std::abs(worst_diff), 1) << " m along the course, rms "
         << fmt_fixed(rms, 2) << " m).\n\n"
         << "| feature | km | detail |\n| --- | --- | --- |\n";
      for (const auto& f : plan.features) {
        md << "| " << f.name << " | " << km(ground.at(f.start_m));
        if (f.end_m != f.start_m) md << " - " << km(ground.at(f.end_m));
        md << " | " << f.detail << " |\n";
      }
      md << "\nEvery other bend of the course turns by at most "
         << fmt_fixed(plan.other_max_turn_deg, 0) << " deg, with a radius of at least "
         << fmt_fixed(plan.other_min_radius_m, 0) << " m.\n"
         << "\nClimb scores use the common cross-check score (mean gradient in % squared times "
            "length in km); `coursewarden profile` turns them into categories with its own, "
            "configurable thresholds.\n\n"
         << "## Look at it with coursewarden\n\n"
         << "```sh\n"
         << "coursewarden profile sample_courses/" << plan.slug << "/course.gpx \\\n"
         << "    --dem sample_courses/" << plan.slug << "/dem.tif\n"
         << "```\n\n"
         << "## Regenerate\n\n"
         << "```sh\n"
         << "cmake -S . -B build && cmake --build build --target make_sample_course\n"
         << "build/tools/make_sample_course sample_courses/" << plan.slug << "\n"
         << "```\n\n"
         << "The generator is deterministic: a second run writes the same bytes (check with "
            "`cmp`). How it works: `docs/sample-course.md`.\n";
      if (!md) throw std::runtime_error("writing " + out_dir + "/README.md failed");
    }

    std::cout << "make_sample_course: " << plan.event_name << "\n"
              << "  course: " << fmt_fixed(acc / 1000.0, 3) << " km ground, "
              << vertices.size() << " GPX points\n"
              << "  DEM: " << grid.cols << " x " << grid.rows << " pixels of "
              << fmt_fixed(kPixel, 0) << " m, EPSG:" << kEpsg << "\n"
              << "  DEM along the course vs designed profile: rms " << fmt_fixed(rms, 2)
              << " m, worst " << fmt_fixed(worst_diff, 2) << " m at km " << km(worst_at) << "\n"
              << "  steepest raw 5 m step on the DEM: " << fmt_fixed(worst_step, 1) << " % at km "
              << km(worst_step_at) << "\n";
    for (const auto& f : plan.features) {
      std::cout << "  " << f.name << ": km " << km(ground.at(f.start_m));
      if (f.end_m != f.start_m) std::cout << " - " << km(ground.at(f.end_m));
      std::cout << "  (" << f.detail << ")\n";
    }
    return 0;
  } catch (const std::exception& e) {
    std::cerr << "make_sample_course: " << e.what() << "\n";
    return 1;
  }
}
