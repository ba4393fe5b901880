// Rider classes: built-in set, field descriptions at the edge, validation.
#include "coursewarden/riders.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <numbers>
#include <string_view>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr double kKmh = 3.6;                        // m/s -> km/h
constexpr double kDeg = 180.0 / std::numbers::pi;   // rad -> degrees
constexpr double kPct = 100.0;                      // fraction -> %

double kmh(double v) { return v / kKmh; }
double deg(double a) { return a / kDeg; }

// The plausible ranges are wide on purpose: they catch typing and unit mistakes (a speed in
// m/s given as km/h, a lean angle in radians), not unusual riders.
constexpr std::array<RiderField, 22> kFields{{
    {"mass_kg", "system mass (rider, bicycle, kit)", "kg", &RiderClass::mass_kg, 1.0, 30, 300, 0},
    {"cda_riding_m2", "drag area, pedalling", "m^2", &RiderClass::cda_riding_m2, 1.0, 0.1, 1.2, 3},
    {"cda_descending_m2", "drag area, coasting", "m^2", &RiderClass::cda_descending_m2, 1.0, 0.1,
     1.2, 3},
    {"crr_smooth", "rolling resistance, smooth asphalt", "-", &RiderClass::crr_smooth, 1.0, 0.001,
     0.05, 4},
    {"crr_rough", "rolling resistance, rough/chip seal", "-", &RiderClass::crr_rough, 1.0, 0.001,
     0.05, 4},
    {"crr_gravel", "rolling resistance, gravel", "-", &RiderClass::crr_gravel, 1.0, 0.001, 0.05, 4},
    {"power_flat_w", "power on the flat", "W", &RiderClass::power_flat_w, 1.0, 20, 2000, 0},
    {"power_climb_w", "power on climbs", "W", &RiderClass::power_climb_w, 1.0, 20, 2000, 0},
    {"climb_power_from_pct", "climb power blend starts at", "%",
     &RiderClass::climb_power_from_grade, kPct, 0, 20, 1},
    {"climb_power_full_pct", "climb power in full from", "%", &RiderClass::climb_power_full_grade,
     kPct, 0, 30, 1},
    {"coast_above_kmh", "coasts above", "km/h", &RiderClass::coast_above_mps, kKmh, 5, 120, 0},
    {"max_speed_kmh", "willing maximum speed", "km/h", &RiderClass::max_speed_mps, kKmh, 10, 140,
     0},
    {"brake_comfort_dry_mps2", "comfortable braking, dry", "m/s^2",
     &RiderClass::brake_comfort_dry_mps2, 1.0, 0.3, 6.0, 1},
    {"brake_max_dry_mps2", "hardest braking, dry", "m/s^2", &RiderClass::brake_max_dry_mps2, 1.0,
     0.5, 9.8, 1},
    {"brake_comfort_wet_mps2", "comfortable braking, wet", "m/s^2",
     &RiderClass::brake_comfort_wet_mps2, 1.0, 0.3, 6.0, 1},
    {"brake_max_wet_mps2", "hardest braking, wet", "m/s^2", &RiderClass::brake_max_wet_mps2, 1.0,
     0.5, 9.8, 1},
    {"lean_comfort_dry_deg", "comfortable lean, dry", "deg", &RiderClass::lean_comfort_dry_rad,
     kDeg, 5, 45, 0},
    {"lean_max_dry_deg", "largest lean, dry", "deg", &RiderClass::lean_max_dry_rad, kDeg, 5, 55, 0},
    {"lean_comfort_wet_deg", "comfortable lean, wet", "deg", &RiderClass::lean_comfort_wet_rad,
     kDeg, 5, 45, 0},
    {"lean_max_wet_deg", "largest lean, wet", "deg", &RiderClass::lean_max_wet_rad, kDeg, 5, 55, 0},
    {"reaction_time_s", "reaction time", "s", &RiderClass::reaction_time_s, 1.0, 0.3, 5.0, 1},
    {"assist_power_w", "motor assistance (0 = none)", "W", &RiderClass::assist_power_w, 1.0, 0,
     1000, 0},
}};

const RiderField& field(const char* key) {
  for (const auto& f : kFields)
    if (std::string_view(f.key) == key) return f;
  throw Error(std::string("internal: unknown rider field ") + key);
}

std::string human(const RiderClass& r, const RiderField& f) {
  return fmt_fixed(r.*f.member * f.si_to_unit, f.decimals + 1);
}

// "a must not exceed b" for a pair of fields: problem reported on `key_small`.
void need_not_above(const RiderClass& r, const char* key_small, const char* key_big,
                    std::vector<RiderProblem>& out) {
  const RiderField& a = field(key_small);
  const RiderField& b = field(key_big);
  if (r.*a.member > r.*b.member * (1.0 + 1e-12)) {
    out.push_back({a.key, "must not exceed " + std::string(b.key) + " (" + human(r, b) + " " +
                              b.unit + "), got " + human(r, a) + " " + a.unit});
  }
}

RiderClass make(const char* name, const char* description, double mass_kg, double cda_ride,
                double cda_descend, std::array<double, 3> crr, double power_flat_w,
                double power_climb_w, double coast_kmh, double max_kmh,
                std::array<double, 4> brake_mps2, std::array<double, 4> lean_deg,
                double reaction_s, double assist_w) {
  RiderClass r;
  r.name = name;
  r.description = description;
  r.mass_kg = mass_kg;
  r.cda_riding_m2 = cda_ride;
  r.cda_descending_m2 = cda_descend;
  r.crr_smooth = crr[0];
  r.crr_rough = crr[1];
  r.crr_gravel = crr[2];
  r.power_flat_w = power_flat_w;
  r.power_climb_w = power_climb_w;
  r.climb_power_from_grade = 0.02;
  r.climb_power_full_grade = 0.06;
  r.coast_above_mps = kmh(coast_kmh);
  r.max_speed_mps = kmh(max_kmh);
  r.brake_comfort_dry_mps2 = brake_mps2[0];
  r.brake_max_dry_mps2 = brake_mps2[1];
  r.brake_comfort_wet_mps2 = brake_mps2[2];
  r.brake_max_wet_mps2 = brake_mps2[3];
  r.lean_comfort_dry_rad = deg(lean_deg[0]);
  r.lean_max_dry_rad = deg(lean_deg[1]);
  r.lean_comfort_wet_rad = deg(lean_deg[2]);
  r.lean_max_wet_rad = deg(lean_deg[3]);
  r.reaction_time_s = reaction_s;
  r.assist_power_w = assist_w;
  return r;
}

bool valid_name(const std::string& name) {
  if (name.empty() || name.size() > 24) return false;
  return std::all_of(name.begin(), name.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') ||
           c == '-' || c == '_';
  });
}

}  // namespace

const char* surface_class_name(SurfaceClass surface) {
  switch (surface) {
    case SurfaceClass::smooth_asphalt: return "smooth asphalt";
    case SurfaceClass::rough_asphalt: return "rough asphalt";
    case SurfaceClass::gravel: return "gravel";
  }
  return "?";
}

double crr_on(const RiderClass& rider, SurfaceClass surface) {
  switch (surface) {
    case SurfaceClass::smooth_asphalt: return rider.crr_smooth;
    case SurfaceClass::rough_asphalt: return rider.crr_rough;
    case SurfaceClass::gravel: return rider.crr_gravel;
  }
  return rider.crr_smooth;
}

double power_at_grade_w(const RiderClass& r, double grade) {
  const double span = r.climb_power_full_grade - r.climb_power_from_grade;
  double share = 0.0;
  if (span > 0.0) {
    share = std::clamp((grade - r.climb_power_from_grade) / span, 0.0, 1.0);
  } else {
    share = grade >= r.climb_power_full_grade ? 1.0 : 0.0;
  }
  return r.power_flat_w + (r.power_climb_w - r.power_flat_w) * share;
}

double brake_comfort_mps2(const RiderClass& r, bool wet) {
  return wet ? r.brake_comfort_wet_mps2 : r.brake_comfort_dry_mps2;
}
double brake_max_mps2(const RiderClass& r, bool wet) {
  return wet ? r.brake_max_wet_mps2 : r.brake_max_dry_mps2;
}
double lean_comfort_rad(const RiderClass& r, bool wet) {
  return wet ? r.lean_comfort_wet_rad : r.lean_comfort_dry_rad;
}
double lean_max_rad(const RiderClass& r, bool wet) {
  return wet ? r.lean_max_wet_rad : r.lean_max_dry_rad;
}

std::span<const RiderField> rider_fields() {
  return std::span<const RiderField>(kFields.data(), kFields.size());
}

std::vector<RiderProblem> rider_class_problems(const RiderClass& r) {
  std::vector<RiderProblem> out;
  if (!valid_name(r.name)) {
    out.push_back({"name", "must be 1 to 24 letters, digits, '-' or '_', got '" + r.name + "'"});
  }
  for (const RiderField& f : rider_fields()) {
    const double v = r.*f.member * f.si_to_unit;
    // Compare with a small relative slack so that values typed at the bounds pass after the
    // round trip through SI.
    const double slack = 1e-9 * std::max(1.0, std::abs(f.max_value));
    if (!std::isfinite(v) || v < f.min_value - slack || v > f.max_value + slack) {
      out.push_back({f.key, "must be between " + fmt_fixed(f.min_value, f.decimals) + " and " +
                                fmt_fixed(f.max_value, f.decimals) + " " + f.unit + ", got " +
                                (std::isfinite(v) ? fmt_fixed(v, f.decimals + 2) : "not a number")});
    }
  }
  if (!out.empty()) return out;  // pair checks only make sense on values in range
  need_not_above(r, "cda_descending_m2", "cda_riding_m2", out);
  need_not_above(r, "crr_smooth", "crr_rough", out);
  need_not_above(r, "crr_rough", "crr_gravel", out);
  need_not_above(r, "climb_power_from_pct", "climb_power_full_pct", out);
  need_not_above(r, "coast_above_kmh", "max_speed_kmh", out);
  need_not_above(r, "brake_comfort_dry_mps2", "brake_max_dry_mps2", out);
  need_not_above(r, "brake_comfort_wet_mps2", "brake_max_wet_mps2", out);
  need_not_above(r, "brake_comfort_wet_mps2", "brake_comfort_dry_mps2", out);
  need_not_above(r, "brake_max_wet_mps2", "brake_max_dry_mps2", out);
  need_not_above(r, "lean_comfort_dry_deg", "lean_max_dry_deg", out);
  need_not_above(r, "lean_comfort_wet_deg", "lean_max_wet_deg", out);
  need_not_above(r, "lean_comfort_wet_deg", "lean_comfort_dry_deg", out);
  need_not_above(r, "lean_max_wet_deg", "lean_max_dry_deg", out);
  return out;
}

void validate_rider_class(const RiderClass& rider) {
  const auto problems = rider_class_problems(rider);
  if (problems.empty()) return;
  fail("", "rider class '" + rider.name + "'", problems.front().key + ": " + problems.front().message);
}

std::vector<RiderClass> builtin_rider_classes() {
  // Values and their sources: docs/riders-and-speed.md. Order: crr {smooth, rough, gravel};
  // braking {comfort dry, max dry, comfort wet, max wet} m/s^2; lean {same order} degrees.
  return {
      make("hesitant-novice", "new to group riding, upright, brakes early, sits up downhill", 95,
           0.45, 0.42, {0.0060, 0.0090, 0.0150}, 90, 125, 22, 40, {1.5, 3.4, 1.0, 2.2},
           {15, 24, 10, 18}, 2.5, 0),
      make("leisure", "rides most weekends at a chatting pace", 90, 0.40, 0.36,
           {0.0055, 0.0085, 0.0140}, 130, 160, 28, 50, {2.0, 3.9, 1.3, 2.5}, {18, 28, 12, 20}, 2.0,
           0),
      make("club", "regular club rider on the hoods, tucks on descents", 84, 0.34, 0.28,
           {0.0045, 0.0075, 0.0120}, 180, 220, 32, 60, {2.5, 4.4, 1.6, 2.8}, {22, 33, 14, 22},
           1.5, 0),
      make("fast-club", "fast club rider, front of the group ride", 80, 0.32, 0.25,
           {0.0042, 0.0070, 0.0110}, 230, 270, 36, 70, {3.0, 4.9, 2.0, 3.1}, {25, 36, 16, 23},
           1.3, 0),
      make("racer", "licensed amateur racer", 76, 0.30, 0.22, {0.0040, 0.0065, 0.0100}, 280, 320,
           42, 80, {3.2, 5.4, 2.1, 3.4}, {28, 40, 18, 24}, 1.0, 0),
      make("elite", "elite racer at the front of the field", 72, 0.28, 0.20,
           {0.0035, 0.0060, 0.0100}, 330, 380, 48, 90, {3.4, 5.8, 2.2, 3.7}, {30, 42, 20, 25},
           0.9, 0),
      make("tandem", "two club riders on one tandem", 170, 0.45, 0.40, {0.0045, 0.0075, 0.0120},
           340, 360, 34, 65, {2.0, 4.4, 1.3, 2.8}, {18, 28, 12, 20}, 1.5, 0),
      make("pedal-assisted", "leisure rider on a pedal-assisted bicycle", 110, 0.45, 0.42,
           {0.0060, 0.0090, 0.0140}, 100, 120, 24, 40, {2.0, 3.9, 1.3, 2.5}, {17, 26, 11, 19},
           2.0, 250),
  };
}

int find_rider_class(const std::vector<RiderClass>& classes, const std::string& name) {
  for (std::size_t i = 0; i < classes.size(); ++i)
    if (classes[i].name == name) return static_cast<int>(i);
  return -1;
}

}  // namespace coursewarden
