// Internal: rider classes and their speed results as terminal text and JSON (for the CLI and
// the summary file). Not installed; may use nlohmann::json.
#pragma once

#include <nlohmann/json.hpp>

#include <string>
#include <vector>

#include "coursewarden/riders.hpp"
#include "coursewarden/speed.hpp"

namespace coursewarden {

/// The classes and their parameters for `coursewarden riders`: one row per field (labelled with
/// its file key, so the table doubles as a guide to the TOML keys), one column per class, split
/// into blocks so that no line is wider than 100 columns; then one line per class description.
std::string riders_table_text(const std::vector<RiderClass>& classes);

/// One entry of the summary's riders[]: name, mass_kg, time_s, avg_speed_kmh, max_speed_kmh,
/// walking_sections[] ({start_m, end_m}) and climb_times_s[].
nlohmann::json rider_result_json(const RiderClass& rider, const SpeedProfile& profile);

}  // namespace coursewarden
