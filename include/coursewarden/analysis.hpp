// coursewarden: the whole profile job as one call (reads inputs, runs the pure stages).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "coursewarden/course.hpp"
#include "coursewarden/course_io.hpp"
#include "coursewarden/dem.hpp"
#include "coursewarden/geometry.hpp"
#include "coursewarden/profile.hpp"

namespace coursewarden {

enum class ElevationSource {
  dem,      ///< heights from the DEM (default)
  course,   ///< the course file's own heights, no DEM needed
  compare,  ///< heights from the DEM, and a comparison with the file's heights
};

struct AnalysisOptions {
  std::string course_path;
  std::string dem_path;
  CourseReadOptions read;
  CleanOptions clean;
  DemOptions dem;
  std::string crs;  ///< projected CRS for plane geometry; "" = transverse Mercator on the course
  double spacing_m = 5.0;
  /// Ride the course the other way round. The stations are the forward stations in reverse
  /// order (distance = length - forward distance), so both directions sample the same points.
  bool reverse = false;
  ElevationSource elevation_source = ElevationSource::dem;
  ProfileOptions profile;
  ClimbOptions climbs;
};

/// How the course file's own heights differ from the DEM's (file minus DEM).
struct ElevationComparison {
  std::size_t stations = 0;
  double mean_difference_m = 0.0;
  double rms_difference_m = 0.0;
  double max_abs_difference_m = 0.0;
  double max_abs_at_m = 0.0;
};

struct CourseAnalysis {
  RawCourse course;
  CleanReport cleaning;
  double vertex_geodesic_length_m = 0.0;  ///< sum of geodesics between cleaned vertices
  std::string projection;
  std::vector<Station> stations;
  double spacing_m = 0.0;
  bool reversed = false;
  bool used_dem = false;
  DemInfo dem;  ///< empty when heights came from the course file
  Profile profile;
  std::vector<Climb> climbs;
  CategoryScale category_scale;  ///< the scale the climbs were categorised on
  std::optional<ElevationComparison> comparison;
};

/// Reads the course and the DEM, cleans, projects, resamples, drapes and builds the profile and
/// climbs. Throws Error with a one-line message for any unusable input.
CourseAnalysis analyse_course(const AnalysisOptions& options);

/// The same stations ridden the other way: reversed order, distance = length - distance,
/// heading turned by 180 degrees.
std::vector<Station> reverse_stations(const std::vector<Station>& stations);

/// Compares the stations' file heights with the profile's raw DEM heights.
std::optional<ElevationComparison> compare_elevations(const std::vector<Station>& stations,
                                                      const std::vector<double>& dem_m);

}  // namespace coursewarden
