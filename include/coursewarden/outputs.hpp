// coursewarden: machine and terminal outputs of an analysis, and atomic file writing.
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "coursewarden/analysis.hpp"

namespace coursewarden {

/// The caution every output carries: the tool advises, people on the ground decide.
extern const char* const kDisclaimer;

/// Summary JSON (documented in docs/output-formats.md), pretty-printed.
std::string profile_summary_json(const CourseAnalysis& analysis);

/// One row per station: distance_m, lon, lat, elevation_m, grade_pct.
std::string profile_csv(const CourseAnalysis& analysis);

/// A readable summary for the terminal (totals, repairs, climbs), at most 100 columns wide.
std::string profile_text(const CourseAnalysis& analysis);

/// Writes `content` to `path` through a temporary file in the same folder and a rename, so a
/// reader never sees a half-written file. Throws Error naming the path on failure.
void write_file_atomic(const std::string& path, const std::string& content);

/// Writes several files as one step: every file goes to a temporary name first, and only when
/// all of them are written are they renamed into place, so a failure (disk full) leaves the old
/// set untouched rather than a mix of old and new. Throws Error naming the file that failed.
void write_files_atomic(const std::vector<std::pair<std::string, std::string>>& path_and_content);

}  // namespace coursewarden
