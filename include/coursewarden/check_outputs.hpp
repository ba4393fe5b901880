// coursewarden: outputs of a check (summary JSON, per-station CSV, terminal summary).
#pragma once

#include <string>

#include "coursewarden/check.hpp"

namespace coursewarden {

/// Summary JSON: every key of the profile summary plus conditions, riders[], corners[] and
/// hazards[] (docs/output-formats.md).
std::string check_summary_json(const CheckResult& result);

/// One row per station: the profile columns, then per class `<name>_planned_kmh`,
/// `<name>_unbraked_kmh` and `<name>_arrival` (HH:MM:SS), then `sight_m`.
std::string check_profile_csv(const CheckResult& result);

/// The terminal summary: course totals, one line per class, the hazards table (fits 100
/// columns), counts by severity, and the caution.
std::string check_text(const CheckResult& result);

/// Side-by-side comparison of two checked courses (<= 100 columns): length, ascent, climbs,
/// predicted time per class, hazards by severity, and which is safer and why.
std::string compare_text(const CheckResult& a, const CheckResult& b, const std::string& label_a,
                         const std::string& label_b);

/// {"a": summary of a, "b": summary of b, "comparison": {safer, score_a, score_b, why}}.
std::string compare_json(const CheckResult& a, const CheckResult& b, const std::string& label_a,
                         const std::string& label_b);

}  // namespace coursewarden
