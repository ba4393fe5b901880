// The profile pipeline: I/O at the edges (course file, DEM), pure stages in between.
#include <cmath>
#include <string>

#include "coursewarden/analysis.hpp"
#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

std::string extent_text(double w, double s, double e, double n) {
  return "lon " + fmt_fixed(w, 4) + " to " + fmt_fixed(e, 4) + ", lat " + fmt_fixed(s, 4) +
         " to " + fmt_fixed(n, 4);
}

}  // namespace

std::optional<ElevationComparison> compare_elevations(const std::vector<Station>& stations,
                                                      const std::vector<double>& dem_m) {
  ElevationComparison c;
  double sum = 0.0, sum2 = 0.0;
  for (std::size_t i = 0; i < stations.size() && i < dem_m.size(); ++i) {
    const double diff = stations[i].file_elevation_m - dem_m[i];
    if (!std::isfinite(diff)) continue;
    ++c.stations;
    sum += diff;
    sum2 += diff * diff;
    if (std::abs(diff) > c.max_abs_difference_m) {
      c.max_abs_difference_m = std::abs(diff);
      c.max_abs_at_m = stations[i].distance_m;
    }
  }
  if (c.stations == 0) return std::nullopt;
  c.mean_difference_m = sum / static_cast<double>(c.stations);
  c.rms_difference_m = std::sqrt(sum2 / static_cast<double>(c.stations));
  return c;
}

std::vector<Station> reverse_stations(const std::vector<Station>& stations) {
  std::vector<Station> out(stations.rbegin(), stations.rend());
  if (out.empty()) return out;
  const double length_m = stations.back().distance_m;
  for (auto& s : out) {
    s.distance_m = length_m - s.distance_m;
    s.heading_rad = std::fmod(s.heading_rad + M_PI, 2.0 * M_PI);
  }
  out.front().distance_m = 0.0;
  return out;
}

CourseAnalysis analyse_course(const AnalysisOptions& options) {
  CourseAnalysis a;
  a.course = read_course(options.course_path, options.read);
  a.cleaning = clean_course(a.course, options.clean);
  a.vertex_geodesic_length_m = geodesic_length_m(a.course.vertices);

  double lon0 = 0.0, lat0 = 0.0;
  course_centre(a.course, lon0, lat0);
  const LocalProjection projection = options.crs.empty()
                                         ? LocalProjection::centred_on(lon0, lat0)
                                         : LocalProjection::from_user_crs(options.crs);
  a.projection = projection.description();
  a.stations = resample_course(a.course, options.spacing_m, projection);
  a.spacing_m = options.spacing_m;
  if (options.reverse) {
    a.stations = reverse_stations(a.stations);
    a.reversed = true;
    a.course.notes.push_back("ridden in reverse (from the file's last point to its first)");
  }

  std::vector<double> raw_m;
  double resolution_m = options.spacing_m;
  if (options.elevation_source == ElevationSource::course) {
    if (!a.course.has_elevations) {
      fail(options.course_path, "",
           "the course file has no elevations for every point; drop --elevation course and give a --dem");
    }
    for (const auto& s : a.stations) raw_m.push_back(s.file_elevation_m);
  } else {
    if (options.dem_path.empty()) fail(options.course_path, "", "no DEM given; add --dem RASTER");
    Dem dem = Dem::open(options.dem_path, options.dem);
    a.dem = dem.info();
    a.used_dem = true;
    resolution_m = a.dem.pixel_size_m;
    std::vector<double> lon, lat;
    lon.reserve(a.stations.size());
    lat.reserve(a.stations.size());
    for (const auto& s : a.stations) {
      lon.push_back(s.lon_deg);
      lat.push_back(s.lat_deg);
    }
    raw_m = dem.sample_lonlat(lon, lat);
    std::size_t valid = 0;
    for (double v : raw_m) valid += std::isnan(v) ? 0 : 1;
    const double coverage_pct = 100.0 * static_cast<double>(valid) / static_cast<double>(raw_m.size());
    if (coverage_pct < options.profile.min_coverage_pct) {
      double w = 180, s = 90, e = -180, n = -90;
      for (const auto& st : a.stations) {
        w = std::min(w, st.lon_deg);
        e = std::max(e, st.lon_deg);
        s = std::min(s, st.lat_deg);
        n = std::max(n, st.lat_deg);
      }
      fail(options.dem_path, "",
           "the course lies mostly outside the DEM (" + fmt_fixed(coverage_pct, 1) +
               " % on valid cells): course " + extent_text(w, s, e, n) + "; DEM " +
               extent_text(a.dem.west_deg, a.dem.south_deg, a.dem.east_deg, a.dem.north_deg) +
               "; use a DEM that covers the course");
    }
    if (options.elevation_source == ElevationSource::compare) {
      if (!a.course.has_elevations) {
        fail(options.course_path, "", "the course file has no elevations to compare with the DEM");
      }
      a.comparison = compare_elevations(a.stations, raw_m);
    }
  }
  a.profile = build_profile(a.stations, raw_m, resolution_m, options.profile,
                            a.used_dem ? options.dem_path : options.course_path);
  a.climbs = find_climbs(a.profile.distance_m, a.profile.elevation_m, options.climbs);
  a.category_scale = options.climbs.scale;
  return a;
}

}  // namespace coursewarden
