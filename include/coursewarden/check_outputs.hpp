// coursewarden: outputs of a check (summary JSON, per-station CSV, terminal summary).
#pragma once

#include <string>

#include "coursewarden/check.hpp"

namespace coursewarden {

/// Summary JSON: every key of the profile summary plus conditions, riders[], corners[] and
/// hazards[] (docs/output-formats.md).
std::string check_summary_json(const CheckResult& result);

/// One row per station: the profile columns, then per class `<name>_planned_kmh` and
/// `<name>_unbraked_kmh`, then `sight_m`.
std::string check_profile_csv(const CheckResult& result);

/// The terminal summary: course totals, one line per class, the hazards table (fits 100
/// columns), counts by severity, and the caution.
std::string check_text(const CheckResult& result);

}  // namespace coursewarden
