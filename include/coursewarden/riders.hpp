// coursewarden: rider classes, the people an organiser plans for (plain data, pure functions).
//
// Every value is SI inside (kg, m^2, W, m/s, m/s^2, rad, s). Files and tables use the human
// units named in each field's key (`max_speed_kmh`, `lean_comfort_dry_deg`), converted at the
// edge through rider_fields(). Built-in values and their sources: docs/riders-and-speed.md.
#pragma once

#include <span>
#include <string>
#include <vector>

namespace coursewarden {

/// Road surface classes with their own rolling resistance.
enum class SurfaceClass {
  smooth_asphalt,  ///< good asphalt or concrete
  rough_asphalt,   ///< worn asphalt, chip seal, cobble-free but coarse
  gravel,          ///< compacted gravel or unsealed road
};

/// Display name of a surface class ("smooth asphalt", ...).
const char* surface_class_name(SurfaceClass surface);

struct RiderClass {
  std::string name;         ///< short identifier, letters, digits, '-' and '_' ("club")
  std::string description;  ///< one line of plain English for tables and reports

  double mass_kg = 0.0;            ///< system mass: rider, bicycle, kit, water
  double cda_riding_m2 = 0.0;      ///< drag area while pedalling
  double cda_descending_m2 = 0.0;  ///< drag area while coasting (descending position)

  double crr_smooth = 0.0;  ///< rolling resistance on smooth asphalt
  double crr_rough = 0.0;   ///< ... on rough asphalt or chip seal
  double crr_gravel = 0.0;  ///< ... on gravel

  double power_flat_w = 0.0;   ///< pedal power held on flat and rolling roads
  double power_climb_w = 0.0;  ///< pedal power held on climbs
  /// Pedal power blends linearly from power_flat_w at climb_power_from_grade to power_climb_w
  /// at climb_power_full_grade (fractions); descents use power_flat_w until coasting.
  double climb_power_from_grade = 0.0;
  double climb_power_full_grade = 0.0;

  double coast_above_mps = 0.0;  ///< pedals up to this speed, coasts (descending position) above
  double max_speed_mps = 0.0;    ///< highest speed the class is willing to hold; brakes above

  double brake_comfort_dry_mps2 = 0.0;  ///< braking deceleration used comfortably, dry road
  double brake_max_dry_mps2 = 0.0;      ///< hardest braking the class manages, dry road
  double brake_comfort_wet_mps2 = 0.0;
  double brake_max_wet_mps2 = 0.0;

  double lean_comfort_dry_rad = 0.0;  ///< lean angle taken comfortably in corners, dry road
  double lean_max_dry_rad = 0.0;      ///< largest lean angle the class manages, dry road
  double lean_comfort_wet_rad = 0.0;
  double lean_max_wet_rad = 0.0;

  double reaction_time_s = 0.0;  ///< perception and reaction time before braking

  double assist_power_w = 0.0;  ///< motor power added while pedalling below the cut-off; 0 = none
};

/// Rolling resistance of the class on a surface.
double crr_on(const RiderClass& rider, SurfaceClass surface);

/// Pedal power (W) the class holds at a grade (fraction), blended between flat and climb power.
double power_at_grade_w(const RiderClass& rider, double grade);

/// Comfortable / maximum braking deceleration and lean angle for the road state.
double brake_comfort_mps2(const RiderClass& rider, bool wet);
double brake_max_mps2(const RiderClass& rider, bool wet);
double lean_comfort_rad(const RiderClass& rider, bool wet);
double lean_max_rad(const RiderClass& rider, bool wet);

/// Describes one numeric field of RiderClass at the edge: its key in files and tables, its
/// human unit, the factor from SI to that unit, and its plausible range in that unit.
struct RiderField {
  const char* key;    ///< "max_speed_kmh"
  const char* label;  ///< "willing maximum speed"
  const char* unit;   ///< "km/h"
  double RiderClass::*member;
  double si_to_unit;  ///< value_in_unit = si_value * si_to_unit
  double min_value;   ///< plausible range, in `unit`, inclusive
  double max_value;
  int decimals;       ///< digits shown in tables
};

/// All numeric fields, in table order.
std::span<const RiderField> rider_fields();

/// One field that fails validation. `key` is the RiderField key (or "name").
struct RiderProblem {
  std::string key;
  std::string message;  ///< in the field's human unit: "must be between 5 and 140 km/h, got 200"
};

/// Every problem with a class: values not finite or outside the plausible ranges, and
/// inconsistent pairs (comfortable above maximum, wet above dry, descending drag above riding
/// drag, rolling resistance not rising from smooth to gravel, coasting above the willing
/// maximum, climb power blend grades out of order). Empty when the class is valid.
std::vector<RiderProblem> rider_class_problems(const RiderClass& rider);

/// Throws Error "rider class 'NAME': KEY: MESSAGE" for the first problem found.
void validate_rider_class(const RiderClass& rider);

/// The built-in classes, from a hesitant novice to an elite racer, plus a tandem and a
/// pedal-assisted bicycle. All pass validate_rider_class.
std::vector<RiderClass> builtin_rider_classes();

/// Index of the class named `name` in `classes`, or -1.
int find_rider_class(const std::vector<RiderClass>& classes, const std::string& name);

/// Loads rider classes from a TOML file on top of `base`: a table `[classes.NAME]` whose NAME
/// matches a class in `base` overrides only the keys it gives; any other NAME adds a class,
/// which must give every field unless it names a class to start from with `based_on = "NAME"`.
/// Keys use human units (see rider_fields()). Unknown keys, wrong types and implausible values
/// throw Error naming the file, the line and the key.
std::vector<RiderClass> load_rider_classes(const std::string& path,
                                           std::vector<RiderClass> base = builtin_rider_classes());

}  // namespace coursewarden
