// coursewarden: the files a check writes for GIS users, marshal coordinators and scripts:
// GeoJSON (RFC 7946: WGS84 longitude/latitude, no "crs" member, 7 decimals), GPX 1.1 waypoints
// and CSV. Every function is pure and returns the file's text. Layout: docs/report.md.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"

namespace coursewarden {

/// How the course is cut into sections for course.geojson.
struct CourseSectionOptions {
  double block_m = 100.0;         ///< gradients are judged over blocks of about this length
  double max_section_m = 1000.0;  ///< longer runs of one gradient band are cut into equal parts
};

/// A stretch of the course with one gradient band.
struct CourseSection {
  std::size_t first_station = 0;  ///< index of the first station (shared with the previous section)
  std::size_t last_station = 0;   ///< index of the last station (shared with the next section)
  double start_m = 0.0;
  double end_m = 0.0;
  double mean_grade_pct = 0.0;  ///< height change over length
  std::size_t band = 0;         ///< index into gradient_bands()
};

/// Cuts the course into sections: consecutive blocks of `block_m` (whole stations, at least one
/// interval) with the same gradient band form one run; runs longer than `max_section_m` are cut
/// into equal parts. The sections cover the course end to end in order. Throws Error for
/// non-positive lengths.
std::vector<CourseSection> course_sections(const CheckResult& result,
                                           const CourseSectionOptions& options = {});

/// hazards.geojson: one Point per hazard with every field of the hazard.
std::string hazards_geojson(const CheckResult& result);

/// course.geojson: one LineString per course section with its gradient and, per rider class,
/// the planned average speed over the section and the highest planned and unbraked speeds.
std::string course_geojson(const CheckResult& result, const CourseSectionOptions& options = {});

/// climbs.geojson: one LineString per climb with its figures, category and per-class times.
std::string climbs_geojson(const CheckResult& result);

/// hazards.gpx: GPX 1.1 waypoints for a handheld GPS, named "H07 critical", the reason as the
/// description.
std::string hazards_gpx(const CheckResult& result);

/// hazards.csv: one row per hazard, in course order.
std::string hazards_csv(const CheckResult& result);

}  // namespace coursewarden
