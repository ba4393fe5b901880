// make_sample_course: the plan of the bundled sample event. The course is a chain of straights
// and circular arcs in local metres (x east, y north) with a designed height h(s) along it.
// Pure computation: no GDAL or PROJ here.
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
#include <string>
#include <vector>

namespace coursewarden::sample {

struct Vec2 {
  double x_m = 0.0;
  double y_m = 0.0;
};

/// A corner of the planned polyline. The path runs straight between corners and turns through a
/// circular arc tangent to both legs (a fillet).
///  radius_m > 0: exactly that radius; the arc must fit between its neighbours.
///  radius_m < 0: at most |radius_m|, reduced so the fillet uses at most 45 % of either leg.
///  radius_m == 0: no turn allowed (a named point on a straight).
struct Corner {
  Vec2 at;
  double radius_m = 0.0;
  std::string mark;  ///< name to find it again ("" = anonymous)
};

/// A straight (curvature 0) or a circular arc (curvature = +-1/radius, positive turns left).
struct Element {
  Vec2 start;
  double heading_rad = 0.0;  ///< direction at the start, counter-clockwise from east
  double length_m = 0.0;
  double curvature_per_m = 0.0;
  double s0_m = 0.0;  ///< distance along the path at the start
};

/// Where a corner ended up on the path.
struct CornerInfo {
  Vec2 at;
  double s_m = 0.0;          ///< middle of its arc (the corner itself for ends and marks)
  double arc_start_m = 0.0;
  double arc_end_m = 0.0;
  double turn_deg = 0.0;     ///< signed deflection, positive = left
  double radius_m = 0.0;
};

struct Path {
  std::vector<Element> elements;
  std::vector<CornerInfo> corners;  ///< one per Corner, same order
  std::map<std::string, std::size_t> marks;
  double length_m = 0.0;

  Vec2 point_at(double s_m) const;
  double heading_at(double s_m) const;
  const CornerInfo& mark(const std::string& name) const;
};

/// Straights and fillet arcs through the corners. Throws std::runtime_error naming the corner
/// when an arc of the requested radius does not fit.
Path build_path(const std::vector<Corner>& corners);

struct PathPoint {
  Vec2 at;
  double s_m = 0.0;
};

/// Points along the path, including every element's ends: straights split into steps of at most
/// `max_step_m`, arcs also so that no chord is more than `max_sagitta_m` off the arc.
std::vector<PathPoint> sample_path(const Path& path, double max_step_m, double max_sagitta_m);

struct Knot {
  double s_m = 0.0;
  double h_m = 0.0;
};

/// A stretch of gentle undulation added on top of the knots (valley roads).
struct Rolling {
  double from_m = 0.0;
  double to_m = 0.0;
};

struct ProfileDesign {
  std::vector<Knot> knots;     ///< increasing s; linear between them
  std::vector<Rolling> rolling;
  double smoothing_sigma_m = 20.0;   ///< Gaussian rounding of grade changes (vertical curves)
  double rolling_amplitude_m = 2.5;  ///< amplitude of the main undulation wave
};

/// Designed heights on a uniform grid along the path.
struct DesignedProfile {
  double step_m = 1.0;
  std::vector<double> h_m;
  double at(double s_m) const;  ///< linear between grid points, clamped at the ends
};

DesignedProfile build_profile(const ProfileDesign& design, double length_m);

/// A designed feature, for the README, features.csv and the lead's golden tests.
struct Feature {
  std::string name;
  std::string kind;     ///< town, climb, descent, crest, bend, junction, hairpin, start, finish
  double start_m = 0.0;
  double end_m = 0.0;
  std::string detail;
  double gain_m = 0.0;         ///< climbs and descents: designed height change (else 0)
  double turn_deg = 0.0;       ///< corners: signed deflection, positive = left (else 0)
  double radius_m = 0.0;       ///< corners: arc radius (else 0)
};

struct SamplePlan {
  std::string event_name;
  std::string slug;
  Path path;
  DesignedProfile profile;
  std::vector<Feature> features;
  Vec2 town_centre;               ///< local metres
  double town_flat_radius_m = 0.0;  ///< ground is level within this distance of the town centre
  double town_edge_m = 0.0;         ///< and blends into the hills over this further distance
  double other_max_turn_deg = 0.0;  ///< sharpest deflection among corners not listed as features
  double other_min_radius_m = 0.0;  ///< tightest radius among those corners
};

/// The invented event. Deterministic: the same seed gives the same plan bit for bit.
SamplePlan make_plan(std::uint64_t seed);

/// splitmix64: a tiny, fully specified pseudo-random generator (the same numbers on every
/// platform, unlike the distributions of <random>).
class Rng {
public:
  explicit Rng(std::uint64_t seed) : state_(seed) {}
  std::uint64_t next();
  double uniform(double lo, double hi);  ///< [lo, hi)
private:
  std::uint64_t state_;
};

/// 3x^2 - 2x^3 on [0, 1], clamped outside.
double smoothstep(double x);

}  // namespace coursewarden::sample
