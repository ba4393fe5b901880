// The road-cycling power model (Martin et al. 1998), ISA air density and wind components.
#include "coursewarden/physics.hpp"

#include <cmath>
#include <limits>

#include "coursewarden/error.hpp"

namespace coursewarden {
namespace {

// Force terms along the road, N, at ground speed v. Air drag uses V_a |V_a|.
struct Forces {
  double air_n, rolling_n, bearing_n, gravity_n;
  double sum() const { return air_n + rolling_n + bearing_n + gravity_n; }
};

Forces forces_at(const RideConditions& ride, double v, const ModelConstants& model) {
  const double slope = std::atan(ride.grade);
  const double air_speed = v + ride.headwind_mps;
  Forces f{};
  f.air_n = 0.5 * ride.air_density_kgpm3 * (ride.cda_m2 + model.wheel_drag_area_m2) * air_speed *
            std::abs(air_speed);
  f.rolling_n = std::cos(slope) * ride.crr * ride.mass_kg * kGravity_mps2;
  f.bearing_n = model.bearing_losses ? (91.0 + 8.7 * v) * 1e-3 : 0.0;
  f.gravity_n = ride.mass_kg * kGravity_mps2 * std::sin(slope);
  return f;
}

}  // namespace

PowerTerms power_terms(const RideConditions& ride, double v, const ModelConstants& model,
                       const SpeedChange& change) {
  const Forces f = forces_at(ride, v, model);
  PowerTerms p;
  p.air_w = f.air_n * v;
  p.rolling_w = f.rolling_n * v;
  p.bearing_w = f.bearing_n * v;
  p.gravity_w = f.gravity_n * v;
  if (change.duration_s > 0.0) {
    p.kinetic_w = 0.5 * effective_mass_kg(ride.mass_kg, model) *
                  (change.final_mps * change.final_mps - change.initial_mps * change.initial_mps) /
                  change.duration_s;
  }
  p.wheel_w = p.air_w + p.rolling_w + p.bearing_w + p.gravity_w + p.kinetic_w;
  p.pedal_w = p.wheel_w / model.drivetrain_efficiency;
  return p;
}

double steady_power_w(const RideConditions& ride, double v, const ModelConstants& model) {
  return power_terms(ride, v, model).pedal_w;
}

double resistive_force_n(const RideConditions& ride, double v, const ModelConstants& model) {
  return forces_at(ride, v, model).sum();
}

double effective_mass_kg(double mass_kg, const ModelConstants& model) {
  if (model.wheel_radius_m <= 0.0) return mass_kg;
  return mass_kg + model.wheel_inertia_kgm2 / (model.wheel_radius_m * model.wheel_radius_m);
}

double steady_speed_mps(double pedal_power_w, const RideConditions& ride,
                        const ModelConstants& model) {
  if (!(std::isfinite(pedal_power_w) && pedal_power_w >= 0.0))
    fail("", "power model", "pedal power must be finite and not negative");
  const double wheel_w = pedal_power_w * model.drivetrain_efficiency;
  // The resistive force F(V) rises with V. With power, h(V) = P_wheel - V F(V) is positive
  // while F <= 0 and falls monotonically once F > 0: one root. Without power the root is F = 0.
  auto h = [&](double v) {
    const double f = resistive_force_n(ride, v, model);
    return wheel_w > 0.0 ? wheel_w - v * f : -f;
  };
  if (wheel_w <= 0.0 && resistive_force_n(ride, 0.0, model) >= 0.0) return 0.0;
  double lo = 0.0, hi = 10.0;
  while (h(hi) > 0.0) {
    lo = hi;
    hi *= 2.0;
    if (hi > 1e5) return std::numeric_limits<double>::infinity();  // nothing resists: no limit
  }
  for (int i = 0; i < 200 && hi - lo > 1e-12 * hi; ++i) {
    const double mid = 0.5 * (lo + hi);
    (h(mid) > 0.0 ? lo : hi) = mid;
  }
  return 0.5 * (lo + hi);
}

double coasting_speed_mps(const RideConditions& ride, const ModelConstants& model) {
  return steady_speed_mps(0.0, ride, model);
}

double grade_at_power(double pedal_power_w, double v, const RideConditions& ride,
                      const ModelConstants& model) {
  RideConditions flat = ride;
  flat.grade = 0.0;
  const Forces f = forces_at(flat, v, model);
  const double drive_n = pedal_power_w * model.drivetrain_efficiency / v;
  // m g (sin s + Crr cos s) = drive - air - bearing, and sin s + Crr cos s = sqrt(1 + Crr^2)
  // sin(s + atan Crr).
  const double a = (drive_n - f.air_n - f.bearing_n) / (ride.mass_kg * kGravity_mps2);
  const double k = std::sqrt(1.0 + ride.crr * ride.crr);
  const double ratio = std::fmax(-1.0, std::fmin(1.0, a / k));
  return std::tan(std::asin(ratio) - std::atan(ride.crr));
}

double isa_temperature_k(double elevation_m) { return 288.15 - 0.0065 * elevation_m; }

double isa_pressure_pa(double elevation_m) {
  return 101325.0 * std::pow(isa_temperature_k(elevation_m) / 288.15, 5.255876);
}

double air_density_kgpm3(double elevation_m, double temperature_c) {
  // Specific gas constant of dry air 287.05 J/(kg K), as in ISO 2533.
  return isa_pressure_pa(elevation_m) / (287.05 * (temperature_c + 273.15));
}

double isa_air_density_kgpm3(double elevation_m) {
  return isa_pressure_pa(elevation_m) / (287.05 * isa_temperature_k(elevation_m));
}

double headwind_mps(double wind_speed_mps, double wind_from_rad, double heading_rad) {
  return wind_speed_mps * std::cos(wind_from_rad - heading_rad);
}

}  // namespace coursewarden
