// coursewarden: the course as read from a file, and the cleaning applied to it.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

namespace coursewarden {

inline constexpr double kNoValue = std::numeric_limits<double>::quiet_NaN();

/// One vertex of the course line, in WGS84 degrees (edges only; everything after uses metres).
struct CourseVertex {
  double lon_deg = 0.0;
  double lat_deg = 0.0;
  double elevation_m = kNoValue;  ///< from the file when present (GPX <ele>, a Z coordinate)
  double time_s = kNoValue;       ///< seconds since 1970-01-01T00:00Z when the file has times
};

/// A jump between two segments of the file that were joined in order.
struct SegmentGap {
  std::size_t after_vertex = 0;  ///< index of the last vertex of the earlier segment
  double gap_m = 0.0;            ///< geodesic distance bridged by the join
};

/// A removed vertex that jumped far off the line and came back (a GPS spike).
struct Spike {
  std::size_t input_index = 0;  ///< index of the vertex in the file's joined order
  double lon_deg = 0.0;
  double lat_deg = 0.0;
  double offset_m = 0.0;  ///< distance from the line through its neighbours
};

struct RawCourse {
  std::string source_path;
  std::string name;                       ///< track/feature name, or the file's stem
  std::size_t chosen_index = 0;           ///< which of the file's tracks was taken
  std::vector<std::string> track_names;   ///< every candidate track found in the file
  std::vector<CourseVertex> vertices;
  std::vector<SegmentGap> gaps;
  std::vector<std::string> notes;         ///< human-readable remarks made while reading
  bool has_elevations = false;            ///< every vertex has a finite elevation_m
  bool has_times = false;
};

struct CleanOptions {
  double min_step_m = 0.05;       ///< steps shorter than this are dropped as duplicates
  double spike_min_offset_m = 50.0;  ///< a spike sits at least this far off its neighbours' line
  double spike_return_ratio = 4.0;   ///< ...and both its legs are this many times the direct step
  double spike_spacing_ratio = 8.0;  ///< ...and its legs are this many times the typical spacing
  /// A jump with legs longer than this is not removed (it may be a drawn out-and-back spur):
  /// it is kept and flagged in the notes for the organiser to look at.
  double spike_max_leg_m = 500.0;
};

struct CleanReport {
  std::size_t duplicates_dropped = 0;
  std::vector<Spike> spikes;          ///< removed
  std::vector<Spike> suspect_spikes;  ///< spike-shaped but too long to be GPS noise: kept, flagged
};

/// Validates coordinates (finite, in range, not crossing the antimeridian, at least two distinct
/// points) and drops duplicate/zero-length steps and GPS spikes. Throws Error naming the file and
/// vertex on invalid input.
CleanReport clean_course(RawCourse& course, const CleanOptions& options = {});

/// Geodesic (WGS84, GeographicLib) length of the polyline through the vertices, metres.
double geodesic_length_m(const std::vector<CourseVertex>& vertices);

}  // namespace coursewarden
