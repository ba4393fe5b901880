// Internal: JSON building blocks shared by the summary writers (may use nlohmann::json).
#pragma once

#include <nlohmann/json.hpp>

#include <cmath>

#include "coursewarden/analysis.hpp"

namespace coursewarden {

namespace json_out {
/// Rounds for output so files do not carry meaningless digits (and stay diff-friendly).
inline double r(double v, int decimals) {
  const double f = std::pow(10.0, decimals);
  return std::round(v * f) / f;
}
}  // namespace json_out

/// The profile part of every summary: course, totals, repairs, climbs, DEM (docs/output-formats.md).
nlohmann::json profile_json(const CourseAnalysis& analysis);

}  // namespace coursewarden
