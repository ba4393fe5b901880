// coursewarden: speed of a rider class along the course (pure computation, thread-safe).
//
// The model integrates kinetic energy ALONG DISTANCE over the resampled stations:
//   d(0.5 M v^2) / ds = F_drive(v) - F_resist(v),   M = m + I / r^2,
// with the forces of the power model in physics.hpp, an implicit trapezoidal step in v^2 per
// (sub)interval, and the drive force capped at standstill (P E_c / max(v, v_standstill)), so a
// start from rest never divides by zero. Two profiles per class:
//   planned  - rides its power, brakes at its comfortable deceleration (grade-aware) in time for
//              every corner limit (a backward pass), never above its willing maximum;
//   unbraked - the same rider not anticipating corners: only the willing maximum caps it, so on
//              a long descent it arrives at a bend with min(terminal speed, willing maximum).
// Method, assumptions and sources: docs/riders-and-speed.md.
#pragma once

#include <string>
#include <vector>

#include "coursewarden/geometry.hpp"
#include "coursewarden/physics.hpp"
#include "coursewarden/profile.hpp"
#include "coursewarden/riders.hpp"

namespace coursewarden {

struct DistanceRange {
  double start_m = 0.0;
  double end_m = 0.0;
};

/// The course as the speed model needs it: one entry per station (uniform spacing, typically
/// 5 m). Optional vectors are either empty or as long as distance_m.
struct CourseSlice {
  std::vector<double> distance_m;   ///< horizontal distance from the start, strictly increasing
  std::vector<double> elevation_m;  ///< cleaned profile heights
  std::vector<double> heading_rad;  ///< direction of travel, clockwise from north
  /// Optional: speed cap from corners, m/s (+inf where there is no corner). Applies to every
  /// class as given.
  std::vector<double> corner_limit_mps;
  /// Optional: turn radius, m (+inf on straights). Each class turns it into a cap with its own
  /// comfortable lean angle: V = sqrt(g R tan(lean)).
  std::vector<double> turn_radius_m;
  std::vector<SurfaceClass> surface;  ///< optional; empty = smooth asphalt everywhere
  std::vector<DistanceRange> climbs;  ///< ranges whose riding time is reported, in order
};

/// Event conditions shared by all classes.
struct Environment {
  double temperature_c = 15.0;
  double wind_speed_mps = 0.0;
  double wind_from_rad = 0.0;  ///< direction the wind blows FROM, clockwise from north
  bool wet = false;            ///< wet road: wet braking and lean values
  double assist_cutoff_mps = 25.0 / 3.6;  ///< motor assistance ends at this speed (user-set)
  double start_time_s = 0.0;   ///< clock time at the start, s (e.g. since local midnight)
};

/// Numerical and behavioural settings of the integration (defaults documented in the docs).
struct SimulationOptions {
  ModelConstants model;
  int substeps = 1;                 ///< integration steps per station interval (>= 1)
  double initial_speed_mps = 0.0;   ///< speed at the first station; 0 = start from rest
  double standstill_speed_mps = 1.0;  ///< drive force is capped at P E_c / this speed
  double push_speed_mps = 1.0;      ///< pace of a rider walking beside the bicycle
  double walking_threshold_mps = 6.0 / 3.6;  ///< below this a class is likely walking
  double min_walking_length_m = 20.0;  ///< shorter dips below the threshold are not reported
  double assist_fade_mps = 0.5;     ///< motor power fades to zero over this band below cut-off
};

/// Result for one class. Per-station vectors are as long as the course's distance_m.
struct SpeedProfile {
  std::string class_name;
  std::vector<double> planned_speed_mps;
  std::vector<double> unbraked_speed_mps;
  std::vector<double> elapsed_s;       ///< planned ride, time since the start
  std::vector<double> arrival_time_s;  ///< start_time_s + elapsed_s
  double distance_m = 0.0;             ///< horizontal length covered
  double total_time_s = 0.0;
  double moving_avg_speed_mps = 0.0;   ///< distance_m / total_time_s (no stops are modelled)
  double max_speed_mps = 0.0;          ///< planned ride
  double max_unbraked_speed_mps = 0.0;
  /// Stretches where the unbraked (power-limited) speed stays below the walking threshold,
  /// at least min_walking_length_m long, in course order.
  std::vector<DistanceRange> walking_sections;
  double longest_walking_m = 0.0;
  std::vector<double> climb_times_s;  ///< planned time on each of CourseSlice::climbs
};

/// Per-interval quantities shared by every class (slopes, air density, wind), computed once.
struct PreparedCourse {
  std::vector<double> distance_m;        ///< stations
  std::vector<double> limit_mps;         ///< corner_limit_mps or +inf, per station
  std::vector<double> turn_radius_m;     ///< per station, +inf where none given
  std::vector<double> road_length_m;     ///< per interval: along the slope
  std::vector<double> grade;             ///< per interval: rise over horizontal run
  std::vector<double> sin_slope;         ///< per interval
  std::vector<double> cos_slope;         ///< per interval
  std::vector<double> air_density_kgpm3; ///< per interval, at its mean elevation
  std::vector<double> headwind_mps;      ///< per interval
  std::vector<SurfaceClass> surface;     ///< per interval
  std::vector<DistanceRange> climbs;
  Environment environment;
};

/// Checks the slice and the environment and computes the per-interval quantities. Throws Error
/// naming the station for unusable input (sizes, non-finite values, distances not increasing).
PreparedCourse prepare_course(const CourseSlice& course, const Environment& environment);

/// Both speed profiles and the summary for one class. Pure: safe to call from several threads.
SpeedProfile simulate_class(const RiderClass& rider, const PreparedCourse& course,
                            const SimulationOptions& options = {});

/// Same, preparing the course first.
SpeedProfile simulate_class(const RiderClass& rider, const CourseSlice& course,
                            const Environment& environment, const SimulationOptions& options = {});

/// The slice of an analysed course: distances and cleaned heights from the profile, headings
/// from the stations, climb ranges from the climbs. No corner limits or surfaces are set.
CourseSlice make_course_slice(const std::vector<Station>& stations, const Profile& profile,
                              const std::vector<Climb>& climbs);

}  // namespace coursewarden
