// coursewarden: hazards — where a rider class arrives too fast, cannot see far enough, rides
// very fast, or descends steeply — with the warning sign and marshals each one calls for
// (pure computation over the outputs of the earlier stages).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "coursewarden/corners.hpp"
#include "coursewarden/geometry.hpp"
#include "coursewarden/hazard_rules.hpp"
#include "coursewarden/profile.hpp"
#include "coursewarden/sight.hpp"
#include "coursewarden/riders.hpp"
#include "coursewarden/speed.hpp"

namespace coursewarden {

/// Thresholds of the hazard checks. Defaults are documented in docs/hazards.md; those not from a
/// standard are our own assumptions, and an organiser may change every one.
struct HazardOptions {
  double fast_speed_mps = 60.0 / 3.6;  ///< a section is fast where any class rides above this
  double fast_min_length_m = 200.0;    ///< ... for at least this far
  double fast_serious_margin_mps = 15.0 / 3.6;  ///< raised to serious this far above the limit
  double steep_window_m = 500.0;        ///< steep descents are judged over this length
  double steep_descent_pct = -8.0;      ///< mean gradient at or below this is a steep descent
  double steep_serious_pct = -12.0;     ///< ... and at or below this a serious one
  double sharp_turn_rad = 60.0 * 3.14159265358979323846 / 180.0;  ///< a junction-type turn turns this much
  double sharp_turn_max_radius_m = 40.0;  ///< ... on a radius no larger than this (a sweep is not a junction)
  /// Approaches less steep downhill than this (fraction) count as level: a corner seen in time
  /// with room to brake there is only a note.
  double level_approach_grade = -0.02;
  double descent_lookback_m = 500.0;    ///< a turn "ends a descent" if the road before it ...
  double descent_before_turn_pct = -4.0;  ///< ... falls at least this steeply on average
  // Sight lines (AASHTO bicycle guide eye and object heights; see docs/hazards.md).
  double eye_height_m = kRiderEyeHeight_m;
  double object_height_m = 0.0;
  double max_look_m = kDefaultMaxLook_m;
  double sight_friction_dry = kAashto1999Friction;
  double sight_friction_wet = kAashto2012WetFriction;
  double sight_reaction_time_s = kAashtoReactionTime_s;
  // Grip between tyre and road for the corner speed limit, and the road's cross fall.
  double grip_friction_dry = 0.8;  ///< our assumption for clean dry asphalt
  double grip_friction_wet = 0.5;  ///< wet asphalt (check-values.md section 3: mu 0.5 wet)
  double superelevation = 0.0;     ///< unknown from a DEM; 0 = flat turn (conservative)
  SeverityRules severity;
};

/// One rider class at one corner.
struct ClassAtCorner {
  std::string class_name;
  double entry_speed_mps = 0.0;    ///< unbraked approach speed at the corner's entry
  double planned_speed_mps = 0.0;  ///< speed of the planned ride at the entry
  double safe_speed_mps = 0.0;     ///< comfortable lean and grip limit on the path radius
  double braking_distance_m = 0.0;       ///< to the safe speed at comfortable deceleration
  double braking_distance_hard_m = 0.0;  ///< ... at the class's hardest braking
  bool room_enough = true;         ///< braking_distance_m fits in room_m
  double room_m = 0.0;             ///< straight road before the corner (from the previous one)
  bool too_fast = false;           ///< entry speed above the safe speed
  bool hidden = false;             ///< the corner is out of sight at this class's stopping distance
  Severity severity = Severity::none;
};

enum class HazardKind {
  corner_too_fast,     ///< some class arrives faster than it can corner
  hidden_corner,       ///< no class too fast, but a crest or the hillside hides the corner
  turn_after_descent,  ///< a sharp (junction-type) turn at the bottom of a descent
  fast_section,        ///< a class rides above the fast-speed threshold for a distance
  steep_descent,       ///< a sustained steep descent
};

/// Key used in files: "corner-too-fast", "hidden-corner", "turn-after-descent",
/// "fast-section", "steep-descent".
const char* hazard_kind_key(HazardKind kind);
/// Plain words for reports: "Corner reached too fast", ...
const char* hazard_kind_label(HazardKind kind);

struct Hazard {
  int number = 0;  ///< 1-based, in course order
  HazardKind kind = HazardKind::corner_too_fast;
  double at_m = 0.0;   ///< the hazard's place (corner entry, section start)
  double end_m = 0.0;  ///< corner exit or section end
  Severity severity = Severity::note;
  std::optional<std::size_t> corner;  ///< index into the corners, for corner kinds
  std::vector<ClassAtCorner> classes;  ///< affected classes (corner kinds: those too fast or hidden)
  std::vector<std::string> section_classes;  ///< fast sections: classes above the threshold
  double peak_speed_mps = 0.0;     ///< fastest class's speed there (approach or in the section)
  double steepest_pct = 0.0;       ///< steep descents: steepest mean over the window
  bool hidden = false;
  bool after_descent = false;
  WarningSignSiting sign;          ///< from the UK Traffic Signs Manual chapter 4 table
  double sign_at_m = 0.0;          ///< where along the course the sign stands (at_m - distance, >= 0)
  double sign_lon_deg = 0.0, sign_lat_deg = 0.0;
  int marshals = 0;
  double lon_deg = 0.0, lat_deg = 0.0;
  std::string reason;  ///< one line of plain English
};

/// Everything the checks look at. The per-class vectors are parallel to `classes`.
struct HazardInputs {
  const std::vector<Station>* stations = nullptr;
  const Profile* profile = nullptr;
  const std::vector<Corner>* corners = nullptr;
  const std::vector<double>* path_radius_m = nullptr;  ///< per corner, from path_radius_m()
  const std::vector<RiderClass>* classes = nullptr;
  const std::vector<SpeedProfile>* speeds = nullptr;
  /// Per corner: how far back along the course its entry stays in view (visible_approach_m,
  /// over the road profile and the terrain). Null: sight is not checked.
  const std::vector<double>* corner_visible_m = nullptr;
  bool wet = false;
};

/// A junction-type turn: sharp (sharp_turn_rad or more) and tight (sharp_turn_max_radius_m or
/// less), where riders must be directed.
bool is_junction_type_turn(const Corner& corner, const HazardOptions& options);

/// Grip friction used for the corner speed limit in the given condition.
double grip_friction(const HazardOptions& options, bool wet);

/// Safe corner speed of a class on a path radius: the lower of its comfortable-lean limit and
/// the grip limit (docs/hazards.md).
double class_safe_speed_mps(const RiderClass& rider, double path_radius_m, bool wet,
                            const HazardOptions& options);

/// Runs every check and returns the hazards in course order, numbered from 1.
std::vector<Hazard> find_hazards(const HazardInputs& inputs, const HazardOptions& options = {});

/// True when a rider of this class, somewhere on the approach, needs to see the corner entry at
/// `entry_m` (it lies within the stopping sight distance) but cannot (it is further back than
/// `visible_m`, how far back the entry stays in view).
bool corner_hidden_for(const std::vector<double>& distance_m, const std::vector<double>& needed_m,
                       double entry_m, double visible_m);

/// Stopping sight distance needed at each station for a class's unbraked speeds (a rider who
/// has not seen a corner has not slowed for it; AASHTO form).
std::vector<double> needed_sight_m(const SpeedProfile& speed, const Profile& profile, bool wet,
                                   const HazardOptions& options);

}  // namespace coursewarden
