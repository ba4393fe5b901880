// Speed profiles along the course: energy conservation, convergence, terminal speeds, braking
// for corners, walking sections and climb times.
#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <limits>
#include <numbers>
#include <string>
#include <thread>

#include "coursewarden/error.hpp"
#include "coursewarden/physics.hpp"
#include "coursewarden/riders.hpp"
#include "coursewarden/corners.hpp"
#include "coursewarden/speed.hpp"

namespace coursewarden {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kDegToRad = std::numbers::pi / 180.0;

// Stations every `spacing_m` over `length_m` with heights from `height`, heading north.
CourseSlice course_from(double length_m, double spacing_m,
                        const std::function<double(double)>& height) {
  CourseSlice s;
  const auto n = static_cast<std::size_t>(std::llround(length_m / spacing_m));
  for (std::size_t i = 0; i <= n; ++i) {
    const double d = static_cast<double>(i) * spacing_m;
    s.distance_m.push_back(d);
    s.elevation_m.push_back(height(d));
    s.heading_rad.push_back(0.0);
  }
  return s;
}

std::size_t station_at(const CourseSlice& s, double d_m) {
  for (std::size_t i = 0; i < s.distance_m.size(); ++i)
    if (std::abs(s.distance_m[i] - d_m) < 1e-6) return i;
  ADD_FAILURE() << "no station at " << d_m;
  return 0;
}

RiderClass builtin(const std::string& name) {
  const auto all = builtin_rider_classes();
  const int i = find_rider_class(all, name);
  EXPECT_GE(i, 0) << name;
  return all[static_cast<std::size_t>(i)];
}

// A rider and bicycle with no losses and no power: only gravity and kinetic energy.
RiderClass lossless_rider() {
  RiderClass r = builtin("club");
  r.name = "lossless";
  r.mass_kg = 80.0;
  r.cda_riding_m2 = r.cda_descending_m2 = 0.0;
  r.crr_smooth = r.crr_rough = r.crr_gravel = 0.0;
  r.power_flat_w = r.power_climb_w = 0.0;
  r.max_speed_mps = 1000.0;
  return r;
}

SimulationOptions lossless_options() {
  SimulationOptions o;
  o.model.wheel_drag_area_m2 = 0.0;
  o.model.bearing_losses = false;
  o.model.wheel_inertia_kgm2 = 0.0;
  return o;
}

TEST(SpeedModel, TenMetreDropFromRestGivesFourteenMetresPerSecondWithoutLosses) {
  const CourseSlice s = course_from(100.0, 5.0, [](double d) { return 10.0 - 0.1 * d; });
  const SpeedProfile p = simulate_class(lossless_rider(), s, Environment{}, lossless_options());
  // derived: v = sqrt(2 g h) = 14.0 m/s (50.4 km/h) for h = 10 m (issue 3's check value).
  EXPECT_NEAR(p.planned_speed_mps.back(), 14.0047, 0.005);
  EXPECT_NEAR(p.unbraked_speed_mps.back(), 14.0047, 0.005);
  EXPECT_DOUBLE_EQ(p.planned_speed_mps.front(), 0.0);  // starts from rest
}

// Height gained when coasting up a 10 % slope from 50 km/h until the speed is down to 30 km/h.
double height_gained_50_to_30(const RiderClass& rider, const SimulationOptions& base) {
  const CourseSlice s = course_from(200.0, 5.0, [](double d) { return 0.1 * d; });
  SimulationOptions o = base;
  o.initial_speed_mps = 50.0 / 3.6;
  const SpeedProfile p = simulate_class(rider, s, Environment{}, o);
  const double target = 30.0 / 3.6;
  for (std::size_t i = 1; i < p.planned_speed_mps.size(); ++i) {
    const double a = p.planned_speed_mps[i - 1], b = p.planned_speed_mps[i];
    if (b > target) continue;
    // Without losses v^2 falls linearly with height.
    const double w = (a * a - target * target) / (a * a - b * b);
    return s.elevation_m[i - 1] + w * (s.elevation_m[i] - s.elevation_m[i - 1]);
  }
  ADD_FAILURE() << "speed never fell to 30 km/h";
  return 0.0;
}

TEST(SpeedModel, SlowingFromFiftyToThirtyClimbsTheDifferenceOfSquaresNotOfSpeeds) {
  const double h = height_gained_50_to_30(lossless_rider(), lossless_options());
  // derived: (v1^2 - v2^2) / (2 g) = 6.29 m (issue 3's check value) ...
  EXPECT_NEAR(h, 6.2945, 0.01);
  // ... and not (v1 - v2)^2 / (2 g) = 1.57 m, the mistake of squaring the speed difference.
  EXPECT_GT(std::abs(h - 1.57), 4.0);
}

TEST(SpeedModel, SpinningWheelsCarryTheRiderHigher) {
  SimulationOptions o = lossless_options();
  o.model.wheel_inertia_kgm2 = 0.14;  // Martin et al. (1998) I and r
  o.model.wheel_radius_m = 0.311;
  // derived: the wheels' rotational energy adds I / r^2 to the mass that kinetic energy sees:
  // h = 6.2945 m x (80 + 1.4475) / 80.
  EXPECT_NEAR(height_gained_50_to_30(lossless_rider(), o), 6.2945 * 81.4475 / 80.0, 0.01);
}

// Hilly 40 km course with corners, for convergence checks.
CourseSlice hilly_course(double spacing_m) {
  CourseSlice s = course_from(40000.0, spacing_m, [](double d) {
    return 400.0 + 150.0 * std::sin(2.0 * std::numbers::pi * d / 6000.0) +
           40.0 * std::sin(2.0 * std::numbers::pi * d / 1300.0);
  });
  s.corner_limit_mps.assign(s.distance_m.size(), kInf);
  s.turn_radius_m.assign(s.distance_m.size(), kInf);
  for (double d = 2500.0; d < 40000.0; d += 2500.0) s.corner_limit_mps[station_at(s, d)] = 7.0;
  for (double d = 1250.0; d < 40000.0; d += 5000.0) s.turn_radius_m[station_at(s, d)] = 15.0;
  s.climbs = {{0.0, 1500.0}, {6000.0, 7500.0}};
  return s;
}

TEST(SpeedModel, HalvingTheStepChangesCourseTimeByLessThanAThousandth) {
  const CourseSlice s = hilly_course(5.0);
  for (const RiderClass& r : builtin_rider_classes()) {
    SimulationOptions one, two;
    two.substeps = 2;
    const double t1 = simulate_class(r, s, Environment{}, one).total_time_s;
    const double t2 = simulate_class(r, s, Environment{}, two).total_time_s;
    EXPECT_LT(std::abs(t1 - t2) / t2, 1e-3) << r.name;
  }
}

TEST(SpeedModel, HalvingTheStationSpacingChangesCourseTimeByLessThanAThousandth) {
  const CourseSlice coarse = hilly_course(5.0);
  const CourseSlice fine = hilly_course(2.5);
  for (const RiderClass& r : builtin_rider_classes()) {
    const double t1 = simulate_class(r, coarse, Environment{}).total_time_s;
    const double t2 = simulate_class(r, fine, Environment{}).total_time_s;
    EXPECT_LT(std::abs(t1 - t2) / t2, 1e-3) << r.name;
  }
}

// A class that coasts on descents like the coasting table's rider (80 kg, CdA 0.32, Crr 0.004).
RiderClass table_coaster() {
  RiderClass r = builtin("club");
  r.mass_kg = 80.0;
  r.cda_riding_m2 = 0.40;
  r.cda_descending_m2 = 0.32;
  r.crr_smooth = 0.004;
  r.coast_above_mps = 20.0 / 3.6;
  r.max_speed_mps = 150.0 / 3.6;
  return r;
}

TEST(SpeedModel, LongStraightDescentEndsAtTheCoastingSpeed) {
  // 4 km at -8 % ending at sea level, 15 C: the air there has the ISA sea-level density 1.225.
  const CourseSlice s = course_from(4000.0, 5.0, [](double d) { return 0.08 * (4000.0 - d); });
  const RiderClass r = table_coaster();
  const SpeedProfile p = simulate_class(r, s, Environment{});
  // check-values.md section 1 coasting table (derived, Martin et al. 1998 terms): 62.1 km/h.
  EXPECT_NEAR(p.unbraked_speed_mps.back() * 3.6, 62.1, 0.3);
  // Same as the steady coasting solver with the air density of the last interval.
  RideConditions ride;
  ride.mass_kg = r.mass_kg;
  ride.cda_m2 = r.cda_descending_m2;
  ride.crr = r.crr_smooth;
  ride.grade = -0.08;
  ride.air_density_kgpm3 = air_density_kgpm3(0.2, 15.0);
  EXPECT_NEAR(p.unbraked_speed_mps.back() / coasting_speed_mps(ride), 1.0, 2e-3);
  EXPECT_DOUBLE_EQ(p.planned_speed_mps.back(), p.unbraked_speed_mps.back());  // no corners
}

TEST(SpeedModel, DescentFasterThanTheWillingMaximumIsHeldAtThatMaximum) {
  const CourseSlice s = course_from(4000.0, 5.0, [](double d) { return 0.08 * (4000.0 - d); });
  RiderClass r = table_coaster();
  r.max_speed_mps = 50.0 / 3.6;
  const SpeedProfile p = simulate_class(r, s, Environment{});
  EXPECT_NEAR(p.unbraked_speed_mps.back(), r.max_speed_mps, 1e-12);
  EXPECT_LE(p.max_speed_mps, r.max_speed_mps + 1e-12);
  EXPECT_LE(p.max_unbraked_speed_mps, r.max_speed_mps + 1e-12);
}

TEST(SpeedModel, PlannedRideReachesEachCornerAtItsLimitBrakingNoHarderThanComfortable) {
  // 3 km at -6 %, a bend limited to 25 km/h at 2 km.
  CourseSlice s = course_from(3000.0, 5.0, [](double d) { return 0.06 * (3000.0 - d); });
  s.corner_limit_mps.assign(s.distance_m.size(), kInf);
  const std::size_t bend = station_at(s, 2000.0);
  const double limit = 25.0 / 3.6;
  s.corner_limit_mps[bend] = limit;
  const RiderClass r = builtin("club");
  const SpeedProfile p = simulate_class(r, s, Environment{});

  EXPECT_NEAR(p.planned_speed_mps[bend], limit, 1e-9);
  EXPECT_GT(p.unbraked_speed_mps[bend], limit + 15.0 / 3.6);  // not anticipating: much faster
  double hardest = 0.0;
  for (std::size_t i = 0; i + 1 < s.distance_m.size(); ++i) {
    EXPECT_LE(p.planned_speed_mps[i], p.unbraked_speed_mps[i] + 1e-9) << "station " << i;
    // Braking the brakes provide, at most: net deceleration minus the slope's share
    // (derived: a_net = a_brake + g sin(slope) + drag / m, drag >= 0).
    const double run = s.distance_m[i + 1] - s.distance_m[i];
    const double grade = (s.elevation_m[i + 1] - s.elevation_m[i]) / run;
    const double road = run * std::sqrt(1.0 + grade * grade);
    const double sin_slope = grade / std::sqrt(1.0 + grade * grade);
    const double v0 = p.planned_speed_mps[i], v1 = p.planned_speed_mps[i + 1];
    const double a_net = (v0 * v0 - v1 * v1) / (2.0 * road);
    const double a_brake = a_net - kGravity_mps2 * sin_slope;
    if (a_net > 0.0) {
      EXPECT_LE(a_brake, r.brake_comfort_dry_mps2 + 1e-9) << "station " << i;
      hardest = std::max(hardest, a_brake);
    }
  }
  // The class does brake, at its comfortable deceleration, before the bend.
  EXPECT_NEAR(hardest, r.brake_comfort_dry_mps2, 1e-6);
}

TEST(SpeedModel, WetRoadBrakesEarlierAndTakesBendsSlower) {
  CourseSlice s = course_from(3000.0, 5.0, [](double d) { return 0.06 * (3000.0 - d); });
  s.turn_radius_m.assign(s.distance_m.size(), kInf);
  const std::size_t bend = station_at(s, 2000.0);
  s.turn_radius_m[bend] = 20.0;
  const RiderClass r = builtin("club");
  Environment dry, wet;
  wet.wet = true;
  const SpeedProfile pd = simulate_class(r, s, dry);
  const SpeedProfile pw = simulate_class(r, s, wet);
  // derived: tan(lean) = V^2 / (g R) with the class's comfortable lean (check-values.md s. 3).
  EXPECT_NEAR(pd.planned_speed_mps[bend], lean_limited_speed_mps(20.0, r.lean_comfort_dry_rad), 1e-9);
  EXPECT_NEAR(pw.planned_speed_mps[bend], lean_limited_speed_mps(20.0, r.lean_comfort_wet_rad), 1e-9);
  // Braking starts earlier in the wet: 60 m before the bend the dry rider has not started to
  // brake (it needs about 48 m), the wet one has (about 106 m).
  const std::size_t before = station_at(s, 1940.0);
  EXPECT_LT(pw.planned_speed_mps[before], pd.planned_speed_mps[before]);
  EXPECT_GT(pw.total_time_s, pd.total_time_s);
}

TEST(SpeedModel, SteadyClimbTakesTheTimeOfTheInverseSpeedOfMartinsSecondCase) {
  // Martin et al. (1998) terms, check-values.md section 1 second case (derived): 75 kg,
  // CdA 0.31, Crr 0.004, rho 1.225, grade 8.125 %, 389.90 W -> 5.55 m/s. The climb is centred
  // on sea level at 15 C so that the mean air density is the ISA sea-level 1.225.
  const double g = 0.08125;
  CourseSlice s = course_from(2000.0, 5.0, [g](double d) { return g * (d - 1000.0); });
  s.climbs = {{0.0, 2000.0}};
  RiderClass r = builtin("racer");
  r.mass_kg = 75.0;
  r.cda_riding_m2 = 0.31;
  r.crr_smooth = 0.004;
  r.power_flat_w = r.power_climb_w = 389.90;
  SimulationOptions o;
  o.initial_speed_mps = 5.55;
  const SpeedProfile p = simulate_class(r, s, Environment{}, o);
  const double road_m = 2000.0 * std::sqrt(1.0 + g * g);
  ASSERT_EQ(p.climb_times_s.size(), 1u);
  EXPECT_NEAR(p.climb_times_s[0] / (road_m / 5.55), 1.0, 1e-3);
  EXPECT_NEAR(p.climb_times_s[0], p.total_time_s, 1e-9);
  EXPECT_NEAR(p.moving_avg_speed_mps, 2000.0 / p.total_time_s, 1e-12);
}

TEST(SpeedModel, WallTooSteepForTheClassIsAWalkingSection) {
  // Flat 500 m, 300 m at 20 %, flat 500 m.
  const CourseSlice s = course_from(1300.0, 5.0, [](double d) {
    return d < 500.0 ? 0.0 : d < 800.0 ? 0.2 * (d - 500.0) : 60.0;
  });
  const RiderClass novice = builtin("hesitant-novice");
  RideConditions ride;
  ride.mass_kg = novice.mass_kg;
  ride.cda_m2 = novice.cda_riding_m2;
  ride.crr = novice.crr_smooth;
  ride.grade = 0.2;
  // Precondition from the power balance: the novice cannot hold 6 km/h on 20 %.
  ASSERT_LT(steady_speed_mps(novice.power_climb_w, ride), 6.0 / 3.6);

  const SpeedProfile p = simulate_class(novice, s, Environment{});
  ASSERT_EQ(p.walking_sections.size(), 1u);
  EXPECT_GE(p.walking_sections[0].start_m, 500.0);
  EXPECT_LE(p.walking_sections[0].start_m, 540.0);  // momentum carries it a few metres
  EXPECT_GE(p.walking_sections[0].end_m, 790.0);
  EXPECT_LE(p.walking_sections[0].end_m, 800.0);
  EXPECT_NEAR(p.longest_walking_m, p.walking_sections[0].end_m - p.walking_sections[0].start_m,
              1e-9);
  EXPECT_TRUE(std::isfinite(p.total_time_s));

  const SpeedProfile elite = simulate_class(builtin("elite"), s, Environment{});
  EXPECT_TRUE(elite.walking_sections.empty());
  EXPECT_LT(elite.total_time_s, p.total_time_s);
}

TEST(SpeedModel, StartsFromRestWithoutDividingByZero) {
  const CourseSlice s = course_from(1000.0, 5.0, [](double d) { return 0.03 * d; });
  for (const RiderClass& r : builtin_rider_classes()) {
    const SpeedProfile p = simulate_class(r, s, Environment{});
    EXPECT_EQ(p.planned_speed_mps[0], 0.0);
    EXPECT_GT(p.planned_speed_mps[1], 1.0) << r.name;
    for (std::size_t i = 1; i < p.elapsed_s.size(); ++i)
      ASSERT_GT(p.elapsed_s[i], p.elapsed_s[i - 1]) << r.name << " station " << i;
    EXPECT_TRUE(std::isfinite(p.total_time_s));
    EXPECT_TRUE(p.walking_sections.empty()) << r.name;
  }
}

TEST(SpeedModel, FlatRideSettlesAtTheSteadySpeedIntoAHeadwind) {
  CourseSlice s = course_from(5000.0, 5.0, [](double) { return 200.0; });
  s.heading_rad.assign(s.distance_m.size(), 90.0 * kDegToRad);  // riding east
  Environment head;
  head.temperature_c = 25.0;
  head.wind_speed_mps = 5.0;
  head.wind_from_rad = 90.0 * kDegToRad;  // from the east: full headwind
  const RiderClass r = builtin("club");
  const SpeedProfile p = simulate_class(r, s, head);
  RideConditions ride;
  ride.mass_kg = r.mass_kg;
  ride.cda_m2 = r.cda_riding_m2;
  ride.crr = r.crr_smooth;
  ride.air_density_kgpm3 = air_density_kgpm3(200.0, 25.0);
  ride.headwind_mps = 5.0;
  EXPECT_NEAR(p.planned_speed_mps.back() / steady_speed_mps(r.power_flat_w, ride), 1.0, 1e-6);

  Environment tail = head;
  tail.wind_from_rad = 270.0 * kDegToRad;
  EXPECT_GT(simulate_class(r, s, tail).planned_speed_mps.back(), p.planned_speed_mps.back());
}

TEST(SpeedModel, MotorAssistanceStopsAtTheCutOffSpeedTheUserSets) {
  const CourseSlice s = course_from(5000.0, 5.0, [](double) { return 0.0; });
  const RiderClass r = builtin("pedal-assisted");
  ASSERT_GT(r.assist_power_w, 0.0);
  Environment eu;  // default cut-off 25 km/h
  const double assisted = simulate_class(r, s, eu).planned_speed_mps.back();
  EXPECT_LE(assisted, 25.0 / 3.6 + 1e-9);
  EXPECT_GE(assisted, 25.0 / 3.6 - 0.5);  // fades over the last 0.5 m/s
  Environment none = eu;
  none.assist_cutoff_mps = 0.0;
  const double unassisted = simulate_class(r, s, none).planned_speed_mps.back();
  EXPECT_LT(unassisted, assisted - 0.5);
}

TEST(SpeedModel, RoughSurfaceIsSlowerThanSmooth) {
  CourseSlice s = course_from(5000.0, 5.0, [](double d) { return 0.02 * d; });
  const RiderClass r = builtin("leisure");
  const double smooth = simulate_class(r, s, Environment{}).total_time_s;
  s.surface.assign(s.distance_m.size(), SurfaceClass::gravel);
  const double gravel = simulate_class(r, s, Environment{}).total_time_s;
  EXPECT_GT(gravel, smooth * 1.05);
}

TEST(SpeedModel, ArrivalTimesCountFromTheStartTime) {
  const CourseSlice s = course_from(2000.0, 5.0, [](double) { return 0.0; });
  Environment env;
  env.start_time_s = 8.5 * 3600.0;
  const SpeedProfile p = simulate_class(builtin("club"), s, env);
  EXPECT_DOUBLE_EQ(p.arrival_time_s.front(), env.start_time_s);
  EXPECT_DOUBLE_EQ(p.arrival_time_s.back(), env.start_time_s + p.total_time_s);
}

TEST(SpeedModel, ParallelRunsGiveTheSameResultsAsSequentialOnes) {
  const PreparedCourse course = prepare_course(hilly_course(5.0), Environment{});
  const auto classes = builtin_rider_classes();
  std::vector<SpeedProfile> sequential, parallel(classes.size());
  for (const RiderClass& r : classes) sequential.push_back(simulate_class(r, course));
  std::vector<std::thread> threads;
  for (std::size_t k = 0; k < classes.size(); ++k)
    threads.emplace_back([&, k] { parallel[k] = simulate_class(classes[k], course); });
  for (auto& t : threads) t.join();
  for (std::size_t k = 0; k < classes.size(); ++k) {
    EXPECT_EQ(parallel[k].planned_speed_mps, sequential[k].planned_speed_mps);
    EXPECT_EQ(parallel[k].unbraked_speed_mps, sequential[k].unbraked_speed_mps);
    EXPECT_EQ(parallel[k].total_time_s, sequential[k].total_time_s);
  }
}

TEST(SpeedModel, FasterClassesFinishSooner) {
  const CourseSlice s = hilly_course(5.0);
  double previous = kInf;
  for (const char* name : {"hesitant-novice", "leisure", "club", "fast-club", "racer", "elite"}) {
    const double t = simulate_class(builtin(name), s, Environment{}).total_time_s;
    EXPECT_LT(t, previous) << name;
    previous = t;
  }
}

TEST(SpeedModel, UnusableCoursesAreRefusedWithTheStation) {
  CourseSlice s = course_from(100.0, 5.0, [](double) { return 0.0; });
  CourseSlice short_heading = s;
  short_heading.heading_rad.pop_back();
  EXPECT_THROW(simulate_class(builtin("club"), short_heading, Environment{}), Error);

  CourseSlice backwards = s;
  backwards.distance_m[3] = backwards.distance_m[2];
  try {
    simulate_class(builtin("club"), backwards, Environment{});
    FAIL() << "expected Error";
  } catch (const Error& e) {
    EXPECT_NE(std::string(e.what()).find("station 3"), std::string::npos) << e.what();
  }

  CourseSlice bad_climb = s;
  bad_climb.climbs = {{80.0, 20.0}};
  EXPECT_THROW(simulate_class(builtin("club"), bad_climb, Environment{}), Error);

  CourseSlice one = s;
  one.distance_m.resize(1);
  one.elevation_m.resize(1);
  one.heading_rad.resize(1);
  EXPECT_THROW(simulate_class(builtin("club"), one, Environment{}), Error);
}

}  // namespace
}  // namespace coursewarden
