// coursewarden: the event file, a TOML description of an event that makes a check reproducible
// and shareable (docs/event-file.md). Paths inside it are relative to the file.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "coursewarden/corners.hpp"
#include "coursewarden/event.hpp"
#include "coursewarden/riders.hpp"

namespace coursewarden {

/// One set of conditions to check the course in.
struct WeatherScenario {
  std::string name;  ///< "dry", "wet morning"
  bool wet = false;
  double temperature_c = 15.0;
  double wind_speed_mps = 0.0;
  double wind_from_rad = 0.0;  ///< direction the wind blows from, clockwise from north
};

/// A stretch of the course whose road differs from the event's default.
struct RoadSection {
  double from_m = 0.0;
  double to_m = 0.0;
  std::optional<bool> closed;
  std::optional<double> road_width_m;
  std::optional<double> lane_width_m;
  std::optional<SurfaceClass> surface;
};

/// A checkpoint as written in the file: at a distance, or at coordinates to be placed on the
/// course (nearest station) once it is read.
struct CheckpointSpec {
  Checkpoint checkpoint;
  std::optional<double> lon_deg, lat_deg;
};

struct EventFile {
  std::string path;  ///< the event file itself
  std::string name;  ///< event name
  std::string date;  ///< YYYY-MM-DD, "" when not given
  std::string course_path;  ///< resolved against the file's folder
  std::string dem_path;     ///< resolved; "" = use the course file's heights
  std::string dem_crs;
  std::string track;
  std::optional<double> spacing_m;
  std::string riders_path;           ///< resolved; "" = built-in classes only
  std::vector<std::string> classes;  ///< the field; empty = every known class
  RoadState road;
  SurfaceClass surface = SurfaceClass::smooth_asphalt;
  std::vector<RoadSection> sections;
  std::vector<WeatherScenario> weather;  ///< empty = one dry scenario at 15 C, no wind
  std::vector<StartWave> waves;
  std::vector<CheckpointSpec> checkpoints;
  OperationsRules rules;
  std::optional<double> fast_speed_mps;
  std::optional<double> assist_cutoff_mps;
};

/// Reads and validates an event file. Unknown keys, wrong types and implausible values throw
/// Error naming the file, the line and the key.
EventFile load_event_file(const std::string& path);

/// A commented example event file for the given course (and DEM), paths relative to the folder
/// the file will be written to.
std::string example_event_file(const std::string& course_relative, const std::string& dem_relative,
                               const std::string& event_name);

/// Parses "HH:MM" or "HH:MM:SS" into seconds after midnight; nullopt if malformed.
std::optional<double> parse_clock(const std::string& text);

}  // namespace coursewarden
