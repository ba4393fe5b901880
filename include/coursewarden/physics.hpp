// coursewarden: the road-cycling power model, air density and wind (pure computation).
//
// Power balance after Martin, Milliken, Cobb, McFadden & Coggan (1998), "Validation of a
// mathematical model for road cycling power", Journal of Applied Biomechanics 14(3):276-291:
//
//   P_pedal = (P_air + P_roll + P_bearing + P_gravity + P_kinetic) / E_c
//   P_air     = 0.5 rho (CdA + F_w) V_a^2 V_g      (V_a: air speed along the path)
//   P_roll    = V_g cos(atan G) Crr m g
//   P_bearing = V_g (91 + 8.7 V_g) 1e-3
//   P_gravity = V_g m g sin(atan G)
//   P_kinetic = 0.5 (m + I / r^2) (V_f^2 - V_i^2) / (t_f - t_i)
//
// Air density from the International Standard Atmosphere (ISO 2533:1975) pressure at the
// elevation and an actual air temperature. All quantities SI; angles in radians.
#pragma once

namespace coursewarden {

/// Standard acceleration of gravity (ISO 80000-3), m/s^2.
inline constexpr double kGravity_mps2 = 9.80665;

/// Constants of the power model that are not properties of a rider class. Defaults are the
/// values of Martin et al. (1998).
struct ModelConstants {
  double drivetrain_efficiency = 0.976;  ///< E_c, share of pedal power reaching the wheel
  double wheel_drag_area_m2 = 0.0044;    ///< F_w, drag area added by the turning spokes
  double wheel_inertia_kgm2 = 0.14;      ///< I, both wheels together
  double wheel_radius_m = 0.311;         ///< r, outer radius of the wheels
  bool bearing_losses = true;            ///< include P_bearing = V (91 + 8.7 V) 1e-3
};

/// What the rider and the road are like at one moment.
struct RideConditions {
  double mass_kg = 0.0;    ///< system mass: rider, bicycle and kit
  double cda_m2 = 0.0;     ///< drag area of rider and bicycle, without F_w
  double crr = 0.0;        ///< rolling resistance coefficient
  double grade = 0.0;      ///< rise over horizontal run (fraction, negative downhill)
  double air_density_kgpm3 = 1.225;
  double headwind_mps = 0.0;  ///< wind component against the direction of travel (< 0: tailwind)
};

/// A change of speed over a time, for the kinetic term. duration_s <= 0 means no kinetic term.
struct SpeedChange {
  double initial_mps = 0.0;
  double final_mps = 0.0;
  double duration_s = 0.0;
};

/// The terms of the power balance, W. `wheel_w` is their sum (power needed at the rear wheel);
/// `pedal_w` is what the rider produces, wheel_w / E_c.
struct PowerTerms {
  double air_w = 0.0;
  double rolling_w = 0.0;
  double bearing_w = 0.0;
  double gravity_w = 0.0;
  double kinetic_w = 0.0;
  double wheel_w = 0.0;
  double pedal_w = 0.0;
};

/// Every term of the power balance at ground speed `ground_speed_mps`. The air term uses
/// V_a |V_a| so that a tailwind faster than the rider pushes instead of braking.
PowerTerms power_terms(const RideConditions& ride, double ground_speed_mps,
                       const ModelConstants& model = {}, const SpeedChange& change = {});

/// Pedal power, W, to hold `ground_speed_mps` steadily (no kinetic term).
double steady_power_w(const RideConditions& ride, double ground_speed_mps,
                      const ModelConstants& model = {});

/// Sum of the forces along the road that resist motion, N: air (with F_w), rolling, bearing
/// and gravity (negative on descents, where gravity drives).
double resistive_force_n(const RideConditions& ride, double ground_speed_mps,
                         const ModelConstants& model = {});

/// Mass that kinetic energy sees, m + I / r^2 (the wheels also spin up), kg.
double effective_mass_kg(double mass_kg, const ModelConstants& model = {});

/// Steady ground speed, m/s, at a given pedal power. Zero power gives the coasting speed; 0 is
/// returned where the rider cannot move at all (zero power on a climb or on the flat in still
/// air). Robust bisection on a function that has exactly one root; throws Error for a
/// negative or non-finite power.
double steady_speed_mps(double pedal_power_w, const RideConditions& ride,
                        const ModelConstants& model = {});

/// Coasting (zero power) terminal speed, m/s; 0 where gravity cannot overcome the losses.
double coasting_speed_mps(const RideConditions& ride, const ModelConstants& model = {});

/// Steepest grade (fraction) that `pedal_power_w` holds at `ground_speed_mps`; ride.grade is
/// ignored. Negative when the power does not even hold the speed on the flat.
double grade_at_power(double pedal_power_w, double ground_speed_mps, const RideConditions& ride,
                      const ModelConstants& model = {});

// ---- air

/// ISA temperature at a geopotential elevation in the troposphere, K.
double isa_temperature_k(double elevation_m);

/// ISA pressure at an elevation in the troposphere, Pa: 101325 (T / 288.15)^5.255876.
double isa_pressure_pa(double elevation_m);

/// Air density, kg/m^3, with the ISA pressure at `elevation_m` and the actual air temperature.
double air_density_kgpm3(double elevation_m, double temperature_c);

/// Air density of the standard atmosphere itself (ISA temperature at that elevation), kg/m^3.
double isa_air_density_kgpm3(double elevation_m);

/// Wind component against a rider heading `heading_rad` (clockwise from north) when the wind
/// blows FROM `wind_from_rad` (clockwise from north) at `wind_speed_mps`. Positive: headwind.
double headwind_mps(double wind_speed_mps, double wind_from_rad, double heading_rad);

}  // namespace coursewarden
