// Internal: JSON building blocks shared by the summary writers (may use nlohmann::json).
#pragma once

#include <nlohmann/json.hpp>

#include <cmath>

#include "coursewarden/analysis.hpp"
#include "coursewarden/hazards.hpp"

namespace coursewarden {

namespace json_out {
/// Rounds for output so files do not carry meaningless digits (and stay diff-friendly).
inline double r(double v, int decimals) {
  const double f = std::pow(10.0, decimals);
  return std::round(v * f) / f;
}
/// A number rounded for output, or null when it is not finite (an infinite braking distance).
template <class Json>
Json finite_or_null(double v, int decimals) {
  return std::isfinite(v) ? Json(r(v, decimals)) : Json(nullptr);
}

/// One rider class at a corner hazard, in human units (summary.json and hazards.geojson).
template <class Json>
Json class_at_corner(const ClassAtCorner& a) {
  Json j;
  j["name"] = a.class_name;
  j["entry_speed_kmh"] = r(a.entry_speed_mps * 3.6, 1);
  j["planned_speed_kmh"] = r(a.planned_speed_mps * 3.6, 1);
  j["safe_speed_kmh"] = r(a.safe_speed_mps * 3.6, 1);
  j["braking_distance_m"] = finite_or_null<Json>(a.braking_distance_m, 1);
  j["braking_distance_hard_m"] = finite_or_null<Json>(a.braking_distance_hard_m, 1);
  j["room_m"] = r(a.room_m, 1);
  j["room_enough"] = a.room_enough;
  j["too_fast"] = a.too_fast;
  j["hidden"] = a.hidden;
  j["severity"] = std::string(severity_name(a.severity));
  return j;
}
}  // namespace json_out

/// The profile part of every summary: course, totals, repairs, climbs, DEM (docs/output-formats.md).
nlohmann::json profile_json(const CourseAnalysis& analysis);

}  // namespace coursewarden
