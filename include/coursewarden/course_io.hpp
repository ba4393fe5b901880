// coursewarden: reading a course line from GPX, GeoJSON, KML, GeoPackage, Shapefile or CSV.
#pragma once

#include <string>

#include "coursewarden/course.hpp"

namespace coursewarden {

struct CourseReadOptions {
  /// Which track to take when the file holds several: a name, a 0-based index, or "" = first.
  std::string track;
};

/// Reads the course with GDAL/OGR. GPX: tracks (all segments joined in order, gaps reported),
/// else routes. Line layers (GeoJSON, KML, GeoPackage, Shapefile): LineString/MultiLineString
/// features, one feature a track. CSV: point rows in file order with latitude/longitude columns.
/// Throws Error with a one-line message for missing, unreadable or unusable files.
RawCourse read_course(const std::string& path, const CourseReadOptions& options = {});

}  // namespace coursewarden
