// coursewarden: local metric projection and uniform resampling of the course.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "coursewarden/course.hpp"

namespace coursewarden {

/// A projected CRS in metres used for all plane geometry: a transverse Mercator centred on the
/// course unless the user names an EPSG code. Wraps PROJ; copyable handles are not needed, so the
/// object is move-only. Not thread-safe; make one per thread.
class LocalProjection {
public:
  /// Transverse Mercator (scale 1, false origin 0) through (lon0, lat0) on WGS84.
  static LocalProjection centred_on(double lon0_deg, double lat0_deg);
  /// A projected CRS given by the user, "EPSG:nnnn". Throws Error if it is not projected/metric.
  static LocalProjection from_user_crs(const std::string& crs);

  LocalProjection(LocalProjection&&) noexcept;
  LocalProjection& operator=(LocalProjection&&) noexcept;
  ~LocalProjection();

  void forward(double lon_deg, double lat_deg, double& x_m, double& y_m) const;
  void inverse(double x_m, double y_m, double& lon_deg, double& lat_deg) const;
  const std::string& description() const;

  struct Impl;  ///< opaque (PROJ/GDAL handles live in src/io)

private:
  explicit LocalProjection(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

/// A point of the course at uniform spacing along its length.
struct Station {
  double distance_m = 0.0;  ///< geodesic distance from the start
  double lon_deg = 0.0;
  double lat_deg = 0.0;
  double x_m = 0.0;  ///< local projected easting
  double y_m = 0.0;  ///< local projected northing
  double heading_rad = 0.0;  ///< direction of travel, clockwise from grid north, in [0, 2 pi)
  double file_elevation_m = kNoValue;  ///< the course file's own elevation, interpolated
};

/// Resamples the cleaned course at `spacing_m` along its geodesic length. Positions between
/// vertices follow the geodesic; the last station is the end of the course exactly.
std::vector<Station> resample_course(const RawCourse& course, double spacing_m,
                                     const LocalProjection& projection);

/// Centre of the course's lon/lat bounding box (for centring the projection).
void course_centre(const RawCourse& course, double& lon_deg, double& lat_deg);

}  // namespace coursewarden
