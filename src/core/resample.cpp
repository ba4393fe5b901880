// Uniform resampling of the course along its geodesic length.
#include <GeographicLib/Geodesic.hpp>
#include <GeographicLib/GeodesicLine.hpp>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "coursewarden/error.hpp"
#include "coursewarden/geometry.hpp"

namespace coursewarden {

void course_centre(const RawCourse& course, double& lon_deg, double& lat_deg) {
  double west = 180, east = -180, south = 90, north = -90;
  for (const auto& v : course.vertices) {
    west = std::min(west, v.lon_deg);
    east = std::max(east, v.lon_deg);
    south = std::min(south, v.lat_deg);
    north = std::max(north, v.lat_deg);
  }
  lon_deg = 0.5 * (west + east);
  lat_deg = 0.5 * (south + north);
}

std::vector<Station> resample_course(const RawCourse& course, double spacing_m,
                                     const LocalProjection& projection) {
  if (!(std::isfinite(spacing_m) && spacing_m >= 0.5 && spacing_m <= 1000.0)) {
    fail("", "--spacing", "station spacing must be between 0.5 m and 1000 m");
  }
  const auto& geod = GeographicLib::Geodesic::WGS84();
  const auto& v = course.vertices;
  std::vector<Station> stations;
  stations.reserve(static_cast<std::size_t>(geodesic_length_m(v) / spacing_m) + 2);

  double segment_start_m = 0.0;  // distance of vertex i from the start
  double next_m = 0.0;           // distance of the next station to place
  for (std::size_t i = 0; i + 1 < v.size(); ++i) {
    const auto& a = v[i];
    const auto& b = v[i + 1];
    GeographicLib::GeodesicLine line = geod.InverseLine(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg);
    const double length_m = line.Distance();
    const bool last_segment = i + 2 == v.size();
    while (next_m < segment_start_m + length_m || (last_segment && stations.empty())) {
      const double along = next_m - segment_start_m;
      Station s;
      s.distance_m = next_m;
      double azi = 0.0;
      line.Position(along, s.lat_deg, s.lon_deg, azi);
      const double t = length_m > 0 ? along / length_m : 0.0;
      s.file_elevation_m = a.elevation_m + t * (b.elevation_m - a.elevation_m);
      stations.push_back(s);
      next_m += spacing_m;
    }
    segment_start_m += length_m;
  }
  // The last station sits on the end of the course exactly.
  Station end;
  end.distance_m = segment_start_m;
  end.lon_deg = v.back().lon_deg;
  end.lat_deg = v.back().lat_deg;
  end.file_elevation_m = v.back().elevation_m;
  if (!stations.empty() && segment_start_m - stations.back().distance_m < 1e-6) stations.pop_back();
  stations.push_back(end);

  for (auto& s : stations) projection.forward(s.lon_deg, s.lat_deg, s.x_m, s.y_m);
  // Heading of travel from the plane coordinates (central difference; one-sided at the ends).
  for (std::size_t i = 0; i < stations.size(); ++i) {
    const std::size_t lo = i == 0 ? 0 : i - 1;
    const std::size_t hi = std::min(i + 1, stations.size() - 1);
    const double dx = stations[hi].x_m - stations[lo].x_m;
    const double dy = stations[hi].y_m - stations[lo].y_m;
    double h = std::atan2(dx, dy);
    if (h < 0) h += 2.0 * std::numbers::pi;
    stations[i].heading_rad = h;
  }
  return stations;
}

}  // namespace coursewarden
