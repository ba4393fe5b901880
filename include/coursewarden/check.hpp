// coursewarden: the whole safety check of one course (profile, rider speeds, corners, sight
// lines, hazards) as one call. Reads the inputs; everything after is the pure stages.
#pragma once

#include <array>
#include <functional>
#include <string>
#include <vector>

#include "coursewarden/analysis.hpp"
#include "coursewarden/corners.hpp"
#include "coursewarden/event_file.hpp"
#include "coursewarden/hazards.hpp"
#include "coursewarden/riders.hpp"
#include "coursewarden/speed.hpp"

namespace coursewarden {

struct CheckOptions {
  AnalysisOptions analysis;
  std::string riders_path;               ///< TOML file adding or overriding classes; "" = built-in
  std::vector<std::string> class_names;  ///< classes in the field; empty = all known classes
  Environment environment;               ///< weather, wet/dry, start time, assistance cut-off
  RoadState road;                    ///< the event's default road state
  SurfaceClass surface = SurfaceClass::smooth_asphalt;  ///< the event's default surface
  std::vector<RoadSection> sections;  ///< stretches that differ (later sections win)
  CornerOptions corners;
  HazardOptions hazards;
  SimulationOptions simulation;
  bool terrain_sight = true;  ///< also test sight lines against the DEM (hillside on bends)
  bool check_reverse = true;  ///< also check the course ridden the other way (for one line)
  // The event around the check (from an event file; all optional).
  std::string event_name;
  std::string event_date;     ///< YYYY-MM-DD
  std::string event_path;     ///< the event file
  std::string scenario_name;  ///< weather scenario
  EventOps ops;               ///< waves, rules (checkpoints are placed from `checkpoints`)
  std::vector<CheckpointSpec> checkpoints;
  /// Told the name of each step as it starts (for a progress line); must be thread-safe when
  /// checks run in a batch. Empty: silent.
  std::function<void(const std::string&)> progress;
};

/// Hazard counts of the same course ridden the other way.
struct ReverseSummary {
  bool checked = false;
  std::array<int, 4> counts{0, 0, 0, 0};  ///< note, caution, serious, critical
  bool markedly_safer = false;            ///< markedly fewer serious and critical hazards
};

struct CheckResult {
  CourseAnalysis analysis;
  std::vector<RiderClass> classes;
  std::vector<SpeedProfile> speeds;  ///< parallel to classes
  std::vector<Corner> corners;
  std::vector<double> path_radius_m;  ///< per corner, for the road state
  std::vector<double> sight_m;           ///< per station: how far the road ahead is seen over crests
  std::vector<double> corner_visible_m;  ///< per corner: how far back its entry stays in view
  std::vector<Hazard> hazards;
  Environment environment;
  RoadState road;
  HazardOptions hazard_options;
  ReverseSummary reverse;
  std::string event_name, event_date, event_path, scenario_name;
  EventOps ops;  ///< with every checkpoint placed on the course (at_m)
};

/// The road state at a distance along the course: the default, overridden by the sections that
/// cover it.
RoadState road_state_at(const CheckOptions& options, double at_m);

/// Runs the check. Throws Error with a one-line message for unusable input.
CheckResult run_check(const CheckOptions& options);

/// Selects classes by name (all when `names` is empty); throws Error naming an unknown class.
std::vector<RiderClass> select_classes(const std::vector<RiderClass>& known,
                                       const std::vector<std::string>& names,
                                       const std::string& source);

}  // namespace coursewarden
