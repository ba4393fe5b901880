// coursewarden: pure hazard rules: braking and stopping sight distances, warning-sign siting,
// severity of a corner hazard and the marshals it calls for.
//
// Every function takes plain SI numbers (m, s, m/s, m/s^2; grade as a signed fraction, negative
// downhill) and returns plain numbers, so the corner, speed and sight stages can call them
// without knowing each other. All functions are pure and thread-safe. Method, sources and the
// reasoning behind every default are in docs/hazard-rules.md.
#pragma once

#include <optional>
#include <string_view>

namespace coursewarden {

// ---- braking and stopping

/// Deceleration left for slowing down on a grade, m/s^2: the brakes' deceleration `decel_mps2`
/// minus the along-road pull of gravity downhill, decel - g sin(atan(-grade)) (g = 9.80665).
/// Uphill (grade > 0) gravity helps and the result is larger than `decel_mps2`. May be <= 0 when
/// the grade overwhelms the brakes. Throws Error on non-finite input or decel_mps2 <= 0.
double braking_deceleration_on_grade_mps2(double decel_mps2, double grade);

/// Road length, m, needed to slow from `v_from_mps` to `v_to_mps`: the distance covered during
/// the reaction time at the initial speed, v_from t, plus (v_from^2 - v_to^2) / (2 a), where a is
/// braking_deceleration_on_grade_mps2(decel_mps2, grade). Returns 0 when v_to_mps >= v_from_mps
/// (no braking needed) and +infinity when a <= 0 (the grade overwhelms braking: the rider cannot
/// slow down there at that deceleration). The length is measured along the road surface.
/// Throws Error on negative or non-finite speeds, decel_mps2 <= 0 or a negative reaction time.
double braking_distance_m(double v_from_mps, double v_to_mps, double decel_mps2, double grade,
                          double reaction_time_s);

/// Coefficient of friction for bicycle stopping sight distance, AASHTO Guide for the Development
/// of Bicycle Facilities (1999).
inline constexpr double kAashto1999Friction = 0.25;
/// Wet-pavement coefficient of the 2012 edition of the same guide (recalled, not read).
inline constexpr double kAashto2012WetFriction = 0.16;
/// Perception-reaction time of both editions, s.
inline constexpr double kAashtoReactionTime_s = 2.5;

/// Bicycle stopping sight distance, m: S = v t + v^2 / (2 g (f + G)), the SI form of the AASHTO
/// design formula S = V^2 / (254 (f + G)) + V t / 3.6 (V km/h). `grade` G is signed (negative
/// downhill). Returns +infinity when f + G <= 0. Throws Error on a negative or non-finite speed,
/// friction <= 0 or a negative reaction time.
double stopping_sight_distance_m(double speed_mps, double grade,
                                 double friction = kAashto1999Friction,
                                 double reaction_time_s = kAashtoReactionTime_s);

// ---- warning signs

/// Where to put a warning sign before a hazard, from the UK Traffic Signs Manual, Chapter 4
/// (2013), Appendix A, by the approach speed (85th percentile in the manual; for us the fastest
/// predicted class speed on the approach).
struct WarningSignSiting {
  double distance_m = 0.0;              ///< distance of the sign before the hazard
  double min_clear_visibility_m = 0.0;  ///< how far ahead the sign itself must be visible
  std::string_view speed_band;          ///< the manual's band, e.g. "31-40 mph"
};

/// Sign siting for an approach speed. Within a band with a distance range the distance is
/// interpolated linearly in speed between the band's edges (30, 40, 50, 60 mph; the open band
/// "over 60 mph" is taken to end at 70 mph, above which 305 m is kept). Throws Error on a negative
/// or non-finite speed. See docs/hazard-rules.md for the reading of the visibility column.
WarningSignSiting warning_sign_siting(double speed_mps);

/// warning_sign_siting(speed_mps).distance_m.
double warning_sign_distance_m(double speed_mps);

// ---- severity and marshals

/// How much attention a hazard needs, in increasing order. Our own scale, defined in
/// docs/hazard-rules.md from the quantities passed to severity_for_corner().
enum class Severity {
  none,      ///< entry speed not above the safe speed: no hazard
  note,      ///< slightly fast; tell riders in the briefing and the route book
  caution,   ///< clearly fast or with other aggravating factors; sign it
  serious,   ///< much too fast, or fast with no room to brake; sign it and post a marshal
  critical,  ///< several aggravating factors together; sign it, marshals, consider changes
};

/// "none", "note", "caution", "serious", "critical".
std::string_view severity_name(Severity severity);
/// The inverse of severity_name (exact, lower case); nullopt for anything else.
std::optional<Severity> severity_from_name(std::string_view name);

/// Thresholds of the severity scale and the marshal counts. Every default is our own assumption
/// (see docs/hazard-rules.md), not taken from a standard; an organiser may change them.
struct SeverityRules {
  /// Excess of entry over safe speed, as a share of the safe speed, from which a corner is at
  /// least `caution` (10 % too fast needs 21 % more lateral acceleration than the safe speed).
  double caution_excess_ratio = 0.10;
  /// ... and at least `serious` (25 % too fast: 56 % more lateral acceleration).
  double serious_excess_ratio = 0.25;
  /// Entry speed from which the severity is raised one level (crashes hurt more): 50 km/h.
  double fast_entry_mps = 50.0 / 3.6;
  /// Marshals per severity: none, note, caution, serious, critical.
  int marshals_none = 0;
  int marshals_note = 0;
  int marshals_caution = 0;
  int marshals_serious = 1;
  int marshals_critical = 2;
  /// Extra marshal upstream (with a flag) when the hazard lies in a stretch the riders cannot
  /// see in time, for severities from `caution` up.
  int extra_marshals_if_hidden = 1;
};

/// Severity of a corner reached too fast. `excess_mps` = predicted entry speed minus the safe
/// speed `safe_mps` (> 0); `braking_needed_m` the distance to brake down to the safe speed (may be
/// +infinity); `straight_available_m` the road before the corner available for braking.
///   excess <= 0                                   -> none
///   otherwise note, raised to caution at excess/safe >= caution_excess_ratio and to serious at
///   >= serious_excess_ratio; then one level up if braking_needed_m > straight_available_m, and
///   one more if the entry speed (safe + excess) >= fast_entry_mps; capped at critical.
/// Throws Error on NaN input, safe_mps <= 0 or negative distances.
Severity severity_for_corner(double excess_mps, double safe_mps, double braking_needed_m,
                             double straight_available_m, const SeverityRules& rules = {});

/// Marshals recommended at a hazard of `severity`; `hidden` = the hazard lies where riders cannot
/// see it at their stopping sight distance (adds rules.extra_marshals_if_hidden from caution up).
int marshals_for(Severity severity, bool hidden, const SeverityRules& rules = {});

}  // namespace coursewarden
