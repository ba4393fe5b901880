// Pure hazard rules: braking and stopping sight distances, warning-sign siting, severity and
// marshals. Sources and reasoning: docs/hazard-rules.md.
#include "coursewarden/hazard_rules.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <string>

#include "coursewarden/error.hpp"
#include "coursewarden/physics.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr double kMpsPerMph = 0.44704;             // exact: 1609.344 m / 3600 s
constexpr double kInfinity = std::numeric_limits<double>::infinity();

[[noreturn]] void bad_input(const char* function, const std::string& what) {
  fail("", function, what);
}

void require_speed(const char* function, const char* name, double v_mps) {
  if (!(std::isfinite(v_mps) && v_mps >= 0.0)) {
    bad_input(function, std::string(name) + " must be a finite speed >= 0 m/s, got " +
                            fmt_fixed(v_mps, 3));
  }
}

void require_reaction(const char* function, double t_s) {
  if (!(std::isfinite(t_s) && t_s >= 0.0)) {
    bad_input(function, "reaction time must be finite and >= 0 s, got " + fmt_fixed(t_s, 3));
  }
}

}  // namespace

double braking_deceleration_on_grade_mps2(double decel_mps2, double grade) {
  if (!(std::isfinite(decel_mps2) && decel_mps2 > 0.0)) {
    bad_input("braking", "braking deceleration must be finite and > 0 m/s^2, got " +
                             fmt_fixed(decel_mps2, 3));
  }
  if (!std::isfinite(grade)) bad_input("braking", "grade must be a finite fraction");
  // Along the road, gravity pulls downhill with g sin(slope angle); going down (grade < 0) it
  // opposes the brakes.
  return decel_mps2 - kGravity_mps2 * std::sin(std::atan(-grade));
}

double braking_distance_m(double v_from_mps, double v_to_mps, double decel_mps2, double grade,
                          double reaction_time_s) {
  require_speed("braking", "initial speed", v_from_mps);
  require_speed("braking", "target speed", v_to_mps);
  require_reaction("braking", reaction_time_s);
  const double a = braking_deceleration_on_grade_mps2(decel_mps2, grade);
  if (v_to_mps >= v_from_mps) return 0.0;
  if (a <= 0.0) return kInfinity;
  return v_from_mps * reaction_time_s + (v_from_mps * v_from_mps - v_to_mps * v_to_mps) / (2.0 * a);
}

double stopping_sight_distance_m(double speed_mps, double grade, double friction,
                                 double reaction_time_s) {
  require_speed("stopping sight distance", "speed", speed_mps);
  require_reaction("stopping sight distance", reaction_time_s);
  if (!(std::isfinite(friction) && friction > 0.0)) {
    bad_input("stopping sight distance",
              "friction coefficient must be finite and > 0, got " + fmt_fixed(friction, 3));
  }
  if (!std::isfinite(grade)) bad_input("stopping sight distance", "grade must be a finite fraction");
  const double f_plus_g = friction + grade;
  const double reaction_m = speed_mps * reaction_time_s;
  if (speed_mps == 0.0) return 0.0;
  if (f_plus_g <= 0.0) return kInfinity;
  return reaction_m + speed_mps * speed_mps / (2.0 * kGravity_mps2 * f_plus_g);
}

WarningSignSiting warning_sign_siting(double speed_mps) {
  require_speed("warning sign", "approach speed", speed_mps);
  // UK Traffic Signs Manual, Chapter 4 (2013), Appendix A: band upper edges in mph, the sign
  // distance at the band's lower and upper edge, and the minimum clear visibility to the sign.
  // The last distance band ("over 60 mph", 245-305 m) has two visibility values (90 and 105 m);
  // we read them as 61-70 mph and over 70 mph (docs/hazard-rules.md).
  struct Band {
    double upper_mph;
    double distance_low_m;
    double distance_high_m;
    double visibility_m;
    std::string_view label;
  };
  static constexpr std::array<Band, 6> kBands{{
      {30.0, 45.0, 45.0, 45.0, "up to 30 mph"},
      {40.0, 45.0, 110.0, 60.0, "31-40 mph"},
      {50.0, 110.0, 180.0, 60.0, "41-50 mph"},
      {60.0, 180.0, 245.0, 75.0, "51-60 mph"},
      {70.0, 245.0, 305.0, 90.0, "over 60 mph"},
      {kInfinity, 305.0, 305.0, 105.0, "over 60 mph"},
  }};
  // A hair of tolerance so that e.g. exactly 30 mph converted to m/s and back stays in its band.
  const double v_mph = speed_mps / kMpsPerMph - 1e-9;
  double lower_mph = 0.0;
  for (const Band& band : kBands) {
    if (v_mph <= band.upper_mph) {
      double distance = band.distance_low_m;
      if (std::isfinite(band.upper_mph) && band.distance_high_m != band.distance_low_m) {
        const double t = std::clamp((v_mph - lower_mph) / (band.upper_mph - lower_mph), 0.0, 1.0);
        distance = band.distance_low_m + t * (band.distance_high_m - band.distance_low_m);
      }
      return {distance, band.visibility_m, band.label};
    }
    lower_mph = band.upper_mph;
  }
  return {305.0, 105.0, "over 60 mph"};  // not reached: the last band is open
}

double warning_sign_distance_m(double speed_mps) { return warning_sign_siting(speed_mps).distance_m; }

std::string_view severity_name(Severity severity) {
  switch (severity) {
    case Severity::none: return "none";
    case Severity::note: return "note";
    case Severity::caution: return "caution";
    case Severity::serious: return "serious";
    case Severity::critical: return "critical";
  }
  return "none";
}

std::optional<Severity> severity_from_name(std::string_view name) {
  for (Severity s : {Severity::none, Severity::note, Severity::caution, Severity::serious,
                     Severity::critical}) {
    if (severity_name(s) == name) return s;
  }
  return std::nullopt;
}

Severity severity_for_corner(double excess_mps, double safe_mps, double braking_needed_m,
                             double straight_available_m, const SeverityRules& rules) {
  if (!std::isfinite(excess_mps)) bad_input("corner severity", "speed excess must be finite");
  if (!(std::isfinite(safe_mps) && safe_mps > 0.0)) {
    bad_input("corner severity", "safe speed must be finite and > 0 m/s, got " + fmt_fixed(safe_mps, 3));
  }
  if (std::isnan(braking_needed_m) || braking_needed_m < 0.0 || std::isnan(straight_available_m) ||
      straight_available_m < 0.0) {
    bad_input("corner severity", "braking and straight distances must be >= 0 m (not NaN)");
  }
  if (excess_mps <= 0.0) return Severity::none;
  int level = static_cast<int>(Severity::note);
  const double ratio = excess_mps / safe_mps;
  if (ratio >= rules.caution_excess_ratio) level = static_cast<int>(Severity::caution);
  if (ratio >= rules.serious_excess_ratio) level = static_cast<int>(Severity::serious);
  if (braking_needed_m > straight_available_m) ++level;
  if (safe_mps + excess_mps >= rules.fast_entry_mps) ++level;
  return static_cast<Severity>(std::min(level, static_cast<int>(Severity::critical)));
}

int marshals_for(Severity severity, bool hidden, const SeverityRules& rules) {
  int count = 0;
  switch (severity) {
    case Severity::none: count = rules.marshals_none; break;
    case Severity::note: count = rules.marshals_note; break;
    case Severity::caution: count = rules.marshals_caution; break;
    case Severity::serious: count = rules.marshals_serious; break;
    case Severity::critical: count = rules.marshals_critical; break;
  }
  if (hidden && severity >= Severity::caution) count += rules.extra_marshals_if_hidden;
  return std::max(count, 0);
}

}  // namespace coursewarden
