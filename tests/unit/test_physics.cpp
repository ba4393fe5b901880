// The power model, air density and wind against published and derived values.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "coursewarden/error.hpp"
#include "coursewarden/physics.hpp"

namespace coursewarden {
namespace {

constexpr double kDegToRad = std::numbers::pi / 180.0;

// Martin et al. (1998), worked example (inputs as reproduced, terms derived with the paper's
// formulas; ../shared/reference/check-values.md section 1).
RideConditions martin_example() {
  RideConditions ride;
  ride.mass_kg = 90.0;
  ride.cda_m2 = 0.2565;
  ride.crr = 0.0032;
  ride.grade = 0.003;
  ride.air_density_kgpm3 = 1.225;
  ride.headwind_mps = headwind_mps(2.94, 310.0 * kDegToRad, 340.0 * kDegToRad);
  return ride;
}

TEST(PowerModel, WorkedExampleOfMartinEtAlGivesEachTermAndTheTotal) {
  const RideConditions ride = martin_example();
  // Air speed 10.906 m/s for 8.36 m/s ground speed: check-values.md section 1 (derived).
  EXPECT_NEAR(8.36 + ride.headwind_mps, 10.906, 0.001);
  const PowerTerms p = power_terms(ride, 8.36, ModelConstants{}, SpeedChange{8.28, 8.45, 56.42});
  // Martin et al. (1998) worked example, terms as derived in check-values.md section 1.
  EXPECT_NEAR(p.air_w, 158.90, 0.01);
  EXPECT_NEAR(p.rolling_w, 23.61, 0.01);
  EXPECT_NEAR(p.bearing_w, 1.369, 0.001);
  EXPECT_NEAR(p.gravity_w, 22.14, 0.01);
  EXPECT_NEAR(p.kinetic_w, 2.305, 0.001);
  EXPECT_NEAR(p.pedal_w, 213.44, 0.02);  // about 213 W in the paper (from memory)
  EXPECT_NEAR(p.wheel_w, p.pedal_w * 0.976, 1e-9);
}

TEST(PowerModel, SecondCaseAndItsInverseSpeed) {
  RideConditions ride;
  ride.mass_kg = 75.0;
  ride.cda_m2 = 0.31;
  ride.crr = 0.004;
  ride.grade = 0.08125;
  ride.air_density_kgpm3 = 1.225;
  // check-values.md section 1, second case (derived with Martin et al. 1998 terms): 389.90 W.
  EXPECT_NEAR(steady_power_w(ride, 5.55), 389.90, 0.01);
  // ... and solving for speed at 389.90 W gives 5.55 m/s (same source).
  EXPECT_NEAR(steady_speed_mps(389.90, ride), 5.55, 1e-4);
}

TEST(PowerModel, EffectiveMassAddsWheelInertiaOverRadiusSquared) {
  // derived: I / r^2 = 0.14 / 0.311^2 = 1.4475 kg with Martin et al. (1998) constants.
  EXPECT_NEAR(effective_mass_kg(90.0), 91.4475, 1e-4);
  ModelConstants no_wheels;
  no_wheels.wheel_inertia_kgm2 = 0.0;
  EXPECT_DOUBLE_EQ(effective_mass_kg(90.0, no_wheels), 90.0);
}

struct CoastCase {
  double grade;
  double cda_m2;
  double speed_kmh;
};

TEST(PowerModel, CoastingSpeedsMatchTheTable) {
  // check-values.md section 1 coasting table: derived with the Martin et al. (1998) terms,
  // bearing losses and F_w included (E_c plays no part at zero power); 80 kg, rho 1.225,
  // Crr 0.004. Tolerance 0.3 km/h.
  const CoastCase cases[] = {
      {-0.05, 0.40, 43.3}, {-0.05, 0.32, 48.3}, {-0.05, 0.25, 54.6}, {-0.05, 0.20, 60.9},
      {-0.08, 0.40, 55.7}, {-0.08, 0.32, 62.1}, {-0.08, 0.25, 70.2}, {-0.08, 0.20, 78.3},
      {-0.10, 0.40, 62.5}, {-0.10, 0.32, 69.8}, {-0.10, 0.25, 78.8}, {-0.10, 0.20, 87.9},
  };
  for (const CoastCase& c : cases) {
    RideConditions ride;
    ride.mass_kg = 80.0;
    ride.cda_m2 = c.cda_m2;
    ride.crr = 0.004;
    ride.grade = c.grade;
    ride.air_density_kgpm3 = 1.225;
    EXPECT_NEAR(coasting_speed_mps(ride) * 3.6, c.speed_kmh, 0.3)
        << "grade " << c.grade << " CdA " << c.cda_m2;
  }
}

TEST(PowerModel, GradeHeldAtTwentyAndThirtyKmhMatchesTheTradeTable) {
  // common practice, no source (issue 3's seed facts): 80 kg, Crr 0.004, CdA 0.321,
  // rho 1.225, drivetrain efficiency 0.97. Tested with the full model (bearing losses and F_w
  // on); the table holds within 0.15 percentage points with or without those two terms.
  RideConditions ride;
  ride.mass_kg = 80.0;
  ride.cda_m2 = 0.321;
  ride.crr = 0.004;
  ride.air_density_kgpm3 = 1.225;
  ModelConstants model;
  model.drivetrain_efficiency = 0.97;
  const double at20[][2] = {{150, 2.1}, {200, 3.3}, {250, 4.4},
                            {300, 5.5}, {350, 6.6}, {400, 7.7}};
  for (const auto& row : at20)
    EXPECT_NEAR(grade_at_power(row[0], 20.0 / 3.6, ride, model) * 100.0, row[1], 0.15)
        << row[0] << " W at 20 km/h";
  const double at30[][2] = {{150, 0.0}, {200, 0.8}, {250, 1.5}, {300, 2.3},
                            {350, 3.0}, {400, 3.8}, {450, 4.5}, {500, 5.3}};
  for (const auto& row : at30)
    EXPECT_NEAR(grade_at_power(row[0], 30.0 / 3.6, ride, model) * 100.0, row[1], 0.15)
        << row[0] << " W at 30 km/h";
}

TEST(PowerModel, GradeAtPowerInvertsTheSteadyPower) {
  // derived: grade_at_power solves the same balance as steady_power_w for the grade.
  RideConditions ride;
  ride.mass_kg = 84.0;
  ride.cda_m2 = 0.34;
  ride.crr = 0.0045;
  ride.air_density_kgpm3 = 1.1;
  ride.headwind_mps = 2.0;
  for (double grade : {-0.04, 0.0, 0.05, 0.12}) {
    ride.grade = grade;
    const double p = steady_power_w(ride, 4.0);
    if (p <= 0.0) continue;
    EXPECT_NEAR(grade_at_power(p, 4.0, ride), grade, 1e-9);
  }
}

TEST(PowerModel, ZeroPowerGivesNoSpeedOnClimbsAndOnTheFlatInStillAir) {
  RideConditions ride;
  ride.mass_kg = 80.0;
  ride.cda_m2 = 0.32;
  ride.crr = 0.004;
  ride.grade = 0.02;
  EXPECT_EQ(coasting_speed_mps(ride), 0.0);
  ride.grade = 0.0;
  EXPECT_EQ(coasting_speed_mps(ride), 0.0);
  // A tailwind strong enough to beat rolling resistance pushes a coasting rider along the flat,
  // below the wind's own speed.
  ride.headwind_mps = -10.0;
  const double v = coasting_speed_mps(ride);
  EXPECT_GT(v, 0.0);
  EXPECT_LT(v, 10.0);
  EXPECT_NEAR(resistive_force_n(ride, v), 0.0, 1e-6);
}

TEST(PowerModel, SteadySpeedRisesWithPowerAndOnDescents) {
  RideConditions ride;
  ride.mass_kg = 80.0;
  ride.cda_m2 = 0.32;
  ride.crr = 0.004;
  ride.grade = -0.05;
  const double coast = coasting_speed_mps(ride);
  const double pedal = steady_speed_mps(200.0, ride);
  EXPECT_GT(pedal, coast);
  EXPECT_NEAR(steady_power_w(ride, pedal), 200.0, 1e-6);
  ride.grade = 0.05;
  EXPECT_LT(steady_speed_mps(200.0, ride), pedal);
}

TEST(PowerModel, NegativeOrNonFinitePowerIsRefused) {
  RideConditions ride;
  ride.mass_kg = 80.0;
  ride.cda_m2 = 0.32;
  ride.crr = 0.004;
  EXPECT_THROW(steady_speed_mps(-1.0, ride), Error);
  EXPECT_THROW(steady_speed_mps(std::nan(""), ride), Error);
}

TEST(AirDensity, StandardAtmosphereTableValues) {
  // ISO 2533:1975 / U.S. Standard Atmosphere 1976 table values (check-values.md section 2).
  EXPECT_NEAR(isa_air_density_kgpm3(0.0), 1.2250, 1e-3);
  EXPECT_NEAR(isa_air_density_kgpm3(1000.0), 1.1117, 1e-3);
  EXPECT_NEAR(isa_air_density_kgpm3(2000.0), 1.0066, 1e-3);
  EXPECT_NEAR(isa_air_density_kgpm3(3000.0), 0.9093, 1e-3);
  // ISA sea-level pressure 101325 Pa and temperature 288.15 K (same standard).
  EXPECT_DOUBLE_EQ(isa_pressure_pa(0.0), 101325.0);
  EXPECT_DOUBLE_EQ(isa_temperature_k(0.0), 288.15);
}

TEST(AirDensity, ActualTemperatureWithStandardPressure) {
  // check-values.md section 2 (derived): 1000 m at 20 C -> 1.068; sea level at 25 C -> 1.184.
  EXPECT_NEAR(air_density_kgpm3(1000.0, 20.0), 1.068, 1e-3);
  EXPECT_NEAR(air_density_kgpm3(0.0, 25.0), 1.184, 1e-3);
  // At the standard temperature the two agree.
  EXPECT_NEAR(air_density_kgpm3(0.0, 15.0), isa_air_density_kgpm3(0.0), 1e-12);
}

TEST(Wind, HeadwindComponentFromDirectionItBlowsFrom) {
  // derived: component = W cos(from - heading).
  EXPECT_NEAR(headwind_mps(5.0, 0.0, 0.0), 5.0, 1e-12);  // northerly, riding north: headwind
  EXPECT_NEAR(headwind_mps(5.0, std::numbers::pi, 0.0), -5.0, 1e-12);  // tailwind
  EXPECT_NEAR(headwind_mps(5.0, 90.0 * kDegToRad, 0.0), 0.0, 1e-12);  // crosswind
  EXPECT_NEAR(headwind_mps(5.0, 350.0 * kDegToRad, 10.0 * kDegToRad),
              5.0 * std::cos(20.0 * kDegToRad), 1e-12);  // across north
}

// The flat-turn speed V = sqrt(g R tan(lean)) lives with the corners (corners.hpp) and is
// checked against check-values.md section 3 in test_corners.cpp.

}  // namespace
}  // namespace coursewarden
