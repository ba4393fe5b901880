// Command-line options shared by the subcommands, and how they become library options.
#pragma once

#include <CLI/CLI.hpp>

#include <string>
#include <vector>

#include "coursewarden/analysis.hpp"
#include "coursewarden/check.hpp"
#include "coursewarden/event_file.hpp"

namespace coursewarden::cli {

struct ProfileArgs {
  AnalysisOptions analysis;
  std::string elevation = "dem";
  std::string json_path;
  std::string csv_path;
  std::vector<double> category_scale;
};

struct CheckArgs {
  ProfileArgs profile;
  CheckOptions check;
  std::vector<std::string> inputs;  ///< courses and/or event files
  std::string condition = "dry";
  std::string road = "open";
  std::string traffic_side = "right";
  double wind_kmh = 0.0;
  double wind_from_deg = 0.0;
  double assist_cutoff_kmh = 25.0;
  double fast_kmh = 60.0;
  std::string start = "08:00";
  std::string out_dir;
  unsigned jobs = 0;
};

/// Options about the course and its profile (no positional arguments).
void add_course_options(CLI::App& cmd, ProfileArgs& a);
/// Everything `check` and `compare` accept besides their positional arguments.
void add_check_options(CLI::App& cmd, CheckArgs& a);

/// Validates the human-unit options and fills ProfileArgs::analysis (elevation source, scale).
void finish_profile_options(ProfileArgs& a);
/// ... and CheckArgs::check (conditions, road, thresholds).
void finish_check_options(CheckArgs& a);

/// Fills the arguments from an event file and one of its weather scenarios (before the command
/// line is applied on top, so that command-line options win).
void apply_event(CheckArgs& a, const EventFile& event, const WeatherScenario* weather);

}  // namespace coursewarden::cli
