// Speed profiles of a rider class along the course: energy integrated along distance.
#include "coursewarden/speed.hpp"

#include "coursewarden/corners.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
// Smallest net deceleration the braking pass plans with, m/s^2, on descents so steep that even
// the hardest braking barely holds the speed.
constexpr double kMinPlannedDecel_mps2 = 0.05;

[[noreturn]] void bad_station(std::size_t i, const std::string& what) {
  fail("", "speed model: station " + std::to_string(i), what);
}

// Forces on one interval for one class, with pedalling or coasting.
struct Drive {
  double wheel_power_w;  // E_c * pedal power
  double assist_wheel_w; // E_c * motor power (before the fade)
  double cutoff_mps;
  double fade_mps;
  double k_air;          // 0.5 rho (CdA + F_w)
  double headwind_mps;
  double bearing_per_mps;  // 8.7e-3 N per m/s when bearing losses are on
  double constant_n;       // m g (sin + Crr cos) + bearing constant
  double standstill_mps;

  // Net force along the road (drive minus resistance), N, and its derivative in v.
  void force(double v, double& f, double& df) const {
    double p = wheel_power_w, dp = 0.0;
    if (assist_wheel_w > 0.0) {
      const double share = std::clamp((cutoff_mps - v) / fade_mps, 0.0, 1.0);
      p += assist_wheel_w * share;
      if (share > 0.0 && share < 1.0) dp = -assist_wheel_w / fade_mps;
    }
    double drive, ddrive;
    if (v > standstill_mps) {
      const double inv_v = 1.0 / v;
      drive = p * inv_v;
      ddrive = (dp - drive) * inv_v;
    } else {
      drive = p / standstill_mps;
      ddrive = dp / standstill_mps;
    }
    const double va = v + headwind_mps;
    const double abs_va = std::abs(va);
    f = drive - k_air * va * abs_va - bearing_per_mps * v - constant_n;
    df = ddrive - 2.0 * k_air * abs_va - bearing_per_mps;
  }
};

// One implicit trapezoidal step in v^2 over road length h:
//   v1^2 = v0^2 + (h / M) (F(v0) + F(v1)).
// F never rises with v, so the residual rises monotonically in v1 and has at most one root on
// [0, inf); none means the rider stalls within the step. Newton, with bisection on a bracket
// whenever Newton leaves it. The error left after a Newton step of size s is about
// s^2 / (2 v) (r'' / 2 r'), so stopping at s < 1e-6 (1 + v) leaves well under 1e-10 m/s.
double trapezoid_step(const Drive& d, double v0, double h, double m_eff) {
  double f0, df0;
  d.force(v0, f0, df0);
  const double c = h / m_eff;
  const double base = v0 * v0 + c * f0;  // residual r(v) = v^2 - base - c F(v)
  double lo = 0.0, hi = kInf;
  bool bounded = false;
  // Upper bound from F(v) <= F(0); also tells whether the step stalls. Computed only when
  // Newton needs a bracket, which the common steps never do.
  auto bound = [&]() -> bool {
    double fz, dfz;
    d.force(0.0, fz, dfz);
    if (-base - c * fz >= 0.0) return false;  // r(0) >= 0: stalls
    hi = std::min(hi, std::sqrt(std::max(0.0, base + c * fz)));
    bounded = true;
    return true;
  };
  // Predictor: one Newton step from v0, which needs only F(v0) and F'(v0), already at hand
  // (r(v0) = -2 c F(v0)); explicit Euler from rest.
  const double dr0 = 2.0 * v0 - c * df0;
  double v = (v0 > 0.0 && dr0 > 0.0) ? v0 + 2.0 * c * f0 / dr0
                                     : std::sqrt(std::max(0.0, v0 * v0 + 2.0 * c * f0));
  if (!(v > 0.0) && !bound()) return 0.0;
  if (!(v > 0.0)) v = 0.5 * hi;
  for (int it = 0; it < 80; ++it) {
    double f, df;
    d.force(v, f, df);
    const double r = v * v - base - c * f;
    if (r == 0.0) return v;
    if (r > 0.0) hi = std::min(hi, v); else lo = std::max(lo, v);
    const double dr = 2.0 * v - c * df;
    if (dr > 0.0) {
      const double step = r / dr;
      if (std::abs(step) <= 1e-6 * (1.0 + v)) return std::clamp(v - step, lo, hi);
      const double next = v - step;
      if (next > lo && next < hi) {
        v = next;
        continue;
      }
    }
    if (!bounded && !bound()) return 0.0;
    if (hi - lo <= 1e-13 * (1.0 + hi)) return 0.5 * (lo + hi);
    v = 0.5 * (lo + hi);  // bisect
  }
  return v;
}

// Net deceleration the braking pass plans with on an interval: the brakes' comfortable
// deceleration plus the slope's (gravity helps uphill, works against braking downhill). Air
// drag and rolling resistance, which also slow the rider, are left out: braking starts a
// little early rather than late.
double planned_decel_mps2(const RiderClass& r, bool wet, double sin_slope) {
  double a = brake_comfort_mps2(r, wet) + kGravity_mps2 * sin_slope;
  if (a < kMinPlannedDecel_mps2) a = brake_max_mps2(r, wet) + kGravity_mps2 * sin_slope;
  return std::max(a, kMinPlannedDecel_mps2);
}

struct PassInput {
  const RiderClass& rider;
  const PreparedCourse& course;
  const SimulationOptions& options;
  double m_eff;
};

// Forward pass. `envelope` (per station) caps the speed; within an interval the cap follows the
// braking curve sqrt(env[i+1]^2 + 2 a (L - s)). Writes speeds and, if `elapsed` is given, times.
void forward_pass(const PassInput& in, const std::vector<double>& envelope,
                  std::vector<double>& speed, std::vector<double>* elapsed) {
  const PreparedCourse& c = in.course;
  const RiderClass& r = in.rider;
  const SimulationOptions& o = in.options;
  const ModelConstants& mc = o.model;
  const std::size_t n = c.distance_m.size();
  const bool wet = c.environment.wet;
  const int sub = std::max(1, o.substeps);
  speed.assign(n, 0.0);
  if (elapsed) elapsed->assign(n, 0.0);

  double v = std::min(o.initial_speed_mps, envelope[0]);
  speed[0] = v;
  double t = 0.0;
  const double bearing_const = mc.bearing_losses ? 0.091 : 0.0;
  const double bearing_lin = mc.bearing_losses ? 8.7e-3 : 0.0;
  const double e_c = mc.drivetrain_efficiency;
  const double assist_wheel_w =
      (r.assist_power_w > 0.0 && c.environment.assist_cutoff_mps > 0.0) ? e_c * r.assist_power_w
                                                                        : 0.0;
  const double fade = std::max(o.assist_fade_mps, 1e-6);

  for (std::size_t i = 0; i + 1 < n; ++i) {
    const double L = c.road_length_m[i];
    const double h = L / sub;
    const double rho = c.air_density_kgpm3[i];
    const double crr = crr_on(r, c.surface[i]);
    const double constant_n =
        r.mass_kg * kGravity_mps2 * (c.sin_slope[i] + crr * c.cos_slope[i]) + bearing_const;
    Drive pedal{e_c * power_at_grade_w(r, c.grade[i]),
                assist_wheel_w,
                c.environment.assist_cutoff_mps,
                fade,
                0.5 * rho * (r.cda_riding_m2 + mc.wheel_drag_area_m2),
                c.headwind_mps[i],
                bearing_lin,
                constant_n,
                o.standstill_speed_mps};
    Drive coast = pedal;
    coast.wheel_power_w = 0.0;
    coast.assist_wheel_w = 0.0;
    coast.k_air = 0.5 * rho * (r.cda_descending_m2 + mc.wheel_drag_area_m2);
    const double a_brake = planned_decel_mps2(r, wet, c.sin_slope[i]);
    const double env_end = envelope[i + 1];
    const double vc = r.coast_above_mps;

    for (int k = 1; k <= sub; ++k) {
      const double v0 = v;
      double v1;
      if (v0 < vc) {
        // Pedalling; once the speed passes the coasting threshold the class stops pedalling.
        v1 = trapezoid_step(pedal, v0, h, in.m_eff);
        if (v1 > vc) v1 = std::max(vc, trapezoid_step(coast, v0, h, in.m_eff));
      } else {
        // Coasting in the descending position; pedals again below the threshold.
        v1 = trapezoid_step(coast, v0, h, in.m_eff);
        if (v1 < vc) {
          const double vp = trapezoid_step(pedal, v0, h, in.m_eff);
          v1 = std::min(vc, std::max(vp, v1));
        }
      }
      // Brakes: never above the willing maximum nor the braking curve to the next limit
      // (which never lies below env_end, so it is only evaluated above that).
      v1 = std::min(v1, r.max_speed_mps);
      if (v1 > env_end) {
        const double remaining = std::max(0.0, L - h * k);
        v1 = std::min(v1, std::sqrt(env_end * env_end + 2.0 * a_brake * remaining));
      }
      // A class that cannot keep the bicycle moving walks beside it.
      v1 = std::max(v1, o.push_speed_mps);
      if (elapsed) t += 2.0 * h / (v0 + v1);  // constant acceleration over the step
      v = v1;
    }
    speed[i + 1] = v;
    if (elapsed) (*elapsed)[i + 1] = t;
  }
}

double interpolate_time(const std::vector<double>& d, const std::vector<double>& t, double x) {
  if (x <= d.front()) return t.front();
  if (x >= d.back()) return t.back();
  const auto it = std::upper_bound(d.begin(), d.end(), x);
  const std::size_t j = static_cast<std::size_t>(it - d.begin());
  const std::size_t i = j - 1;
  const double w = (x - d[i]) / (d[j] - d[i]);
  return t[i] + w * (t[j] - t[i]);
}

void check_options(const SimulationOptions& o) {
  auto positive = [](double x) { return std::isfinite(x) && x > 0.0; };
  if (o.substeps < 1) fail("", "speed model", "substeps must be at least 1");
  if (!positive(o.standstill_speed_mps)) fail("", "speed model", "standstill speed must be > 0");
  if (!positive(o.push_speed_mps)) fail("", "speed model", "walking pace must be > 0");
  if (!(std::isfinite(o.initial_speed_mps) && o.initial_speed_mps >= 0.0))
    fail("", "speed model", "initial speed must be finite and >= 0");
  if (!(std::isfinite(o.walking_threshold_mps) && o.walking_threshold_mps >= 0.0))
    fail("", "speed model", "walking threshold must be finite and >= 0");
  if (!positive(o.model.drivetrain_efficiency) || o.model.drivetrain_efficiency > 1.0)
    fail("", "speed model", "drivetrain efficiency must be in (0, 1]");
}

}  // namespace

PreparedCourse prepare_course(const CourseSlice& s, const Environment& env) {
  const std::size_t n = s.distance_m.size();
  if (n < 2) fail("", "speed model", "the course needs at least two stations");
  if (s.elevation_m.size() != n || s.heading_rad.size() != n)
    fail("", "speed model", "distance, elevation and heading must have one value per station");
  auto optional_size_ok = [n](std::size_t size) { return size == 0 || size == n; };
  if (!optional_size_ok(s.corner_limit_mps.size()) || !optional_size_ok(s.turn_radius_m.size()) ||
      !optional_size_ok(s.surface.size()))
    fail("", "speed model", "corner limits, turn radii and surfaces must be empty or per station");
  if (!std::isfinite(env.temperature_c) || env.temperature_c < -60.0 || env.temperature_c > 60.0)
    fail("", "speed model", "air temperature must be between -60 and 60 C, got " +
                                fmt_fixed(env.temperature_c, 1));
  if (!(std::isfinite(env.wind_speed_mps) && env.wind_speed_mps >= 0.0) ||
      !std::isfinite(env.wind_from_rad))
    fail("", "speed model", "wind speed must be finite and >= 0 with a finite direction");
  if (!(std::isfinite(env.assist_cutoff_mps) && env.assist_cutoff_mps >= 0.0))
    fail("", "speed model", "assistance cut-off speed must be finite and >= 0");
  if (!std::isfinite(env.start_time_s)) fail("", "speed model", "start time must be finite");

  PreparedCourse c;
  c.environment = env;
  c.distance_m = s.distance_m;
  c.limit_mps.assign(n, kInf);
  c.turn_radius_m.assign(n, kInf);
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isfinite(s.distance_m[i]) || !std::isfinite(s.elevation_m[i]) ||
        !std::isfinite(s.heading_rad[i]))
      bad_station(i, "distance, elevation and heading must be finite");
    if (i > 0 && !(s.distance_m[i] > s.distance_m[i - 1]))
      bad_station(i, "distances must increase strictly");
    if (!s.corner_limit_mps.empty()) {
      const double lim = s.corner_limit_mps[i];
      if (!(lim > 0.0)) bad_station(i, "corner speed limit must be > 0 (+inf for none)");
      c.limit_mps[i] = lim;
    }
    if (!s.turn_radius_m.empty()) {
      const double rad = s.turn_radius_m[i];
      if (!(rad > 0.0)) bad_station(i, "turn radius must be > 0 (+inf on straights)");
      c.turn_radius_m[i] = rad;
    }
  }
  const std::size_t m = n - 1;
  c.road_length_m.resize(m);
  c.grade.resize(m);
  c.sin_slope.resize(m);
  c.cos_slope.resize(m);
  c.air_density_kgpm3.resize(m);
  c.headwind_mps.resize(m);
  c.surface.assign(m, SurfaceClass::smooth_asphalt);
  for (std::size_t i = 0; i < m; ++i) {
    const double run = s.distance_m[i + 1] - s.distance_m[i];
    const double grade = (s.elevation_m[i + 1] - s.elevation_m[i]) / run;
    const double secant = std::sqrt(1.0 + grade * grade);
    // Distances are horizontal; the rider covers the slope. With forces along the slope over
    // the slope length, gravity's work is exactly m g (height change).
    c.road_length_m[i] = run * secant;
    c.grade[i] = grade;
    c.sin_slope[i] = grade / secant;
    c.cos_slope[i] = 1.0 / secant;
    c.air_density_kgpm3[i] =
        air_density_kgpm3(0.5 * (s.elevation_m[i] + s.elevation_m[i + 1]), env.temperature_c);
    c.headwind_mps[i] = headwind_mps(env.wind_speed_mps, env.wind_from_rad, s.heading_rad[i]);
    if (!s.surface.empty()) c.surface[i] = s.surface[i];
  }
  for (std::size_t k = 0; k < s.climbs.size(); ++k) {
    const DistanceRange& r = s.climbs[k];
    if (!(std::isfinite(r.start_m) && std::isfinite(r.end_m) && r.end_m >= r.start_m))
      fail("", "speed model: climb " + std::to_string(k + 1),
           "needs finite start_m <= end_m");
  }
  c.climbs = s.climbs;
  return c;
}

SpeedProfile simulate_class(const RiderClass& rider, const PreparedCourse& course,
                            const SimulationOptions& options) {
  check_options(options);
  const std::size_t n = course.distance_m.size();
  const std::size_t m = n - 1;
  if (n < 2 || course.limit_mps.size() != n || course.turn_radius_m.size() != n ||
      course.road_length_m.size() != m || course.grade.size() != m ||
      course.sin_slope.size() != m || course.cos_slope.size() != m ||
      course.air_density_kgpm3.size() != m || course.headwind_mps.size() != m ||
      course.surface.size() != m)
    fail("", "speed model", "the prepared course is empty or inconsistent; use prepare_course");
  const bool wet = course.environment.wet;
  const double lean = lean_comfort_rad(rider, wet);
  const double floor_mps = options.push_speed_mps;

  // Caps per station: willing maximum, corner limits (given, and from the class's lean).
  std::vector<double> unbraked_cap(n, std::max(rider.max_speed_mps, floor_mps));
  std::vector<double> envelope(n);
  for (std::size_t i = 0; i < n; ++i) {
    double lim = std::min(rider.max_speed_mps, course.limit_mps[i]);
    if (std::isfinite(course.turn_radius_m[i]))
      lim = std::min(lim, lean_limited_speed_mps(course.turn_radius_m[i], lean));
    envelope[i] = std::max(lim, floor_mps);
  }
  // Backward pass: the highest speed at each station from which comfortable braking still
  // reaches every later limit.
  for (std::size_t i = n - 1; i-- > 0;) {
    const double a = planned_decel_mps2(rider, wet, course.sin_slope[i]);
    const double reach =
        std::sqrt(envelope[i + 1] * envelope[i + 1] + 2.0 * a * course.road_length_m[i]);
    envelope[i] = std::min(envelope[i], reach);
  }

  const PassInput in{rider, course, options, effective_mass_kg(rider.mass_kg, options.model)};
  SpeedProfile p;
  p.class_name = rider.name;
  forward_pass(in, envelope, p.planned_speed_mps, &p.elapsed_s);
  if (envelope == unbraked_cap) {
    p.unbraked_speed_mps = p.planned_speed_mps;  // no corners: the two rides are the same
  } else {
    forward_pass(in, unbraked_cap, p.unbraked_speed_mps, nullptr);
  }

  p.arrival_time_s.resize(n);
  for (std::size_t i = 0; i < n; ++i)
    p.arrival_time_s[i] = course.environment.start_time_s + p.elapsed_s[i];
  p.distance_m = course.distance_m.back() - course.distance_m.front();
  p.total_time_s = p.elapsed_s.back();
  p.moving_avg_speed_mps = p.total_time_s > 0.0 ? p.distance_m / p.total_time_s : 0.0;
  p.max_speed_mps = *std::max_element(p.planned_speed_mps.begin(), p.planned_speed_mps.end());
  p.max_unbraked_speed_mps =
      *std::max_element(p.unbraked_speed_mps.begin(), p.unbraked_speed_mps.end());

  // Walking sections: runs of stations where the unbraked speed (power-limited, never slowed
  // for corners) stays below the threshold.
  const auto& d = course.distance_m;
  for (std::size_t i = 0; i < n;) {
    if (!(p.unbraked_speed_mps[i] < options.walking_threshold_mps)) {
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j + 1 < n && p.unbraked_speed_mps[j + 1] < options.walking_threshold_mps) ++j;
    const double length = d[j] - d[i];
    if (length >= options.min_walking_length_m && length > 0.0) {
      p.walking_sections.push_back({d[i], d[j]});
      p.longest_walking_m = std::max(p.longest_walking_m, length);
    }
    i = j + 1;
  }

  p.climb_times_s.reserve(course.climbs.size());
  for (const DistanceRange& r : course.climbs) {
    p.climb_times_s.push_back(interpolate_time(d, p.elapsed_s, r.end_m) -
                              interpolate_time(d, p.elapsed_s, r.start_m));
  }
  return p;
}

SpeedProfile simulate_class(const RiderClass& rider, const CourseSlice& course,
                            const Environment& environment, const SimulationOptions& options) {
  return simulate_class(rider, prepare_course(course, environment), options);
}

CourseSlice make_course_slice(const std::vector<Station>& stations, const Profile& profile,
                              const std::vector<Climb>& climbs) {
  if (stations.size() != profile.distance_m.size() ||
      profile.elevation_m.size() != profile.distance_m.size())
    fail("", "speed model", "stations and profile differ in length");
  CourseSlice s;
  s.distance_m = profile.distance_m;
  s.elevation_m = profile.elevation_m;
  s.heading_rad.reserve(stations.size());
  for (const Station& st : stations) s.heading_rad.push_back(st.heading_rad);
  for (const Climb& c : climbs) s.climbs.push_back({c.start_m, c.end_m});
  return s;
}

}  // namespace coursewarden
