// make_sample_course: geometry and designed profile of the invented sample event.
#include "sample_plan.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <stdexcept>
#include <utility>

#include "util/text.hpp"

namespace coursewarden::sample {
namespace {

constexpr double kPi = std::numbers::pi;
constexpr double kDeg = kPi / 180.0;

double wrap_angle(double a_rad) {
  while (a_rad > kPi) a_rad -= 2.0 * kPi;
  while (a_rad <= -kPi) a_rad += 2.0 * kPi;
  return a_rad;
}

Vec2 operator+(Vec2 a, Vec2 b) { return {a.x_m + b.x_m, a.y_m + b.y_m}; }
Vec2 operator-(Vec2 a, Vec2 b) { return {a.x_m - b.x_m, a.y_m - b.y_m}; }
Vec2 operator*(double k, Vec2 a) { return {k * a.x_m, k * a.y_m}; }
double norm(Vec2 a) { return std::hypot(a.x_m, a.y_m); }
Vec2 unit_at(double heading_rad) { return {std::cos(heading_rad), std::sin(heading_rad)}; }

std::string text(double v, int decimals) { return fmt_fixed(v, decimals); }

}  // namespace

// ---------------------------------------------------------------- random numbers, helpers

std::uint64_t Rng::next() {
  // splitmix64 (Steele, Lea and Flood, "Fast splittable pseudorandom number generators", 2014).
  std::uint64_t z = (state_ += 0x9E3779B97F4A7C15ULL);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

double Rng::uniform(double lo, double hi) {
  const double u = static_cast<double>(next() >> 11) * 0x1.0p-53;  // 53 random bits in [0, 1)
  return lo + (hi - lo) * u;
}

double smoothstep(double x) {
  if (x <= 0.0) return 0.0;
  if (x >= 1.0) return 1.0;
  return x * x * (3.0 - 2.0 * x);
}

// ---------------------------------------------------------------- path

Path build_path(const std::vector<Corner>& c) {
  const std::size_t n = c.size();
  if (n < 2) throw std::runtime_error("a path needs at least two corners");
  std::vector<double> len(n - 1), dir(n - 1);
  for (std::size_t i = 0; i + 1 < n; ++i) {
    const Vec2 leg = c[i + 1].at - c[i].at;
    len[i] = norm(leg);
    if (!(len[i] > 1e-6)) throw std::runtime_error("two corners coincide at index " + std::to_string(i));
    dir[i] = std::atan2(leg.y_m, leg.x_m);
  }
  std::vector<double> turn(n, 0.0), radius(n, 0.0), tangent(n, 0.0);
  auto name = [&](std::size_t i) {
    return c[i].mark.empty() ? "corner " + std::to_string(i) : "corner '" + c[i].mark + "'";
  };
  for (std::size_t i = 1; i + 1 < n; ++i) {
    turn[i] = wrap_angle(dir[i] - dir[i - 1]);
    const double half_tan = std::tan(0.5 * std::abs(turn[i]));
    if (std::abs(turn[i]) < 1e-9) continue;  // no turn: a plain point on a straight
    if (c[i].radius_m == 0.0) {
      if (std::abs(turn[i]) < 1e-6) continue;  // collinear within rounding
      throw std::runtime_error(name(i) + " turns by " + text(turn[i] / kDeg, 3) +
                               " deg but has no radius");
    }
    if (std::abs(turn[i]) > 179.0 * kDeg) throw std::runtime_error(name(i) + " reverses the path");
    if (c[i].radius_m > 0.0) {
      radius[i] = c[i].radius_m;
    } else {
      radius[i] = std::min(-c[i].radius_m, 0.45 * std::min(len[i - 1], len[i]) / half_tan);
    }
    tangent[i] = radius[i] * half_tan;
  }
  for (std::size_t i = 0; i + 1 < n; ++i) {
    if (tangent[i] + tangent[i + 1] > len[i] + 1e-9) {
      throw std::runtime_error("the arcs at " + name(i) + " and " + name(i + 1) +
                               " overlap; lengthen the leg or reduce a radius");
    }
  }

  Path path;
  path.corners.resize(n);
  double s = 0.0;
  path.corners[0] = {c[0].at, 0.0, 0.0, 0.0, 0.0, 0.0};
  for (std::size_t i = 1; i < n; ++i) {
    const Vec2 u_in = unit_at(dir[i - 1]);
    const Vec2 from = c[i - 1].at + tangent[i - 1] * u_in;
    const double straight_m = len[i - 1] - tangent[i - 1] - tangent[i];
    if (straight_m > 1e-9) {
      path.elements.push_back({from, dir[i - 1], straight_m, 0.0, s});
      s += straight_m;
    }
    CornerInfo info{c[i].at, s, s, s, turn[i] / kDeg, radius[i]};
    if (i + 1 < n && radius[i] > 0.0) {
      const double arc_m = radius[i] * std::abs(turn[i]);
      const double k = (turn[i] > 0 ? 1.0 : -1.0) / radius[i];
      path.elements.push_back({c[i].at - tangent[i] * u_in, dir[i - 1], arc_m, k, s});
      info.arc_start_m = s;
      s += arc_m;
      info.arc_end_m = s;
      info.s_m = 0.5 * (info.arc_start_m + info.arc_end_m);
    }
    path.corners[i] = info;
  }
  path.length_m = s;
  for (std::size_t i = 0; i < n; ++i) {
    if (c[i].mark.empty()) continue;
    if (!path.marks.emplace(c[i].mark, i).second) {
      throw std::runtime_error("mark '" + c[i].mark + "' is used twice");
    }
  }
  return path;
}

namespace {

const Element& element_at(const Path& path, double s_m) {
  auto it = std::upper_bound(path.elements.begin(), path.elements.end(), s_m,
                             [](double s, const Element& e) { return s < e.s0_m; });
  if (it != path.elements.begin()) --it;
  return *it;
}

Vec2 element_point(const Element& e, double u_m) {
  if (e.curvature_per_m == 0.0) return e.start + u_m * unit_at(e.heading_rad);
  const double k = e.curvature_per_m;
  const double h1 = e.heading_rad + k * u_m;
  return {e.start.x_m + (std::sin(h1) - std::sin(e.heading_rad)) / k,
          e.start.y_m - (std::cos(h1) - std::cos(e.heading_rad)) / k};
}

}  // namespace

Vec2 Path::point_at(double s_m) const {
  const Element& e = element_at(*this, s_m);
  return element_point(e, std::clamp(s_m - e.s0_m, 0.0, e.length_m));
}

double Path::heading_at(double s_m) const {
  const Element& e = element_at(*this, s_m);
  return e.heading_rad + e.curvature_per_m * std::clamp(s_m - e.s0_m, 0.0, e.length_m);
}

const CornerInfo& Path::mark(const std::string& name) const {
  auto it = marks.find(name);
  if (it == marks.end()) throw std::runtime_error("no mark '" + name + "' on the path");
  return corners[it->second];
}

std::vector<PathPoint> sample_path(const Path& path, double max_step_m, double max_sagitta_m) {
  std::vector<PathPoint> out;
  for (const Element& e : path.elements) {
    double step_m = max_step_m;
    if (e.curvature_per_m != 0.0) {
      const double r = 1.0 / std::abs(e.curvature_per_m);
      const double max_angle = 2.0 * std::acos(std::max(-1.0, 1.0 - max_sagitta_m / r));
      step_m = std::min(step_m, r * max_angle);
    }
    const auto pieces = static_cast<std::size_t>(std::max(1.0, std::ceil(e.length_m / step_m - 1e-9)));
    for (std::size_t k = 0; k < pieces; ++k) {
      const double u = e.length_m * static_cast<double>(k) / static_cast<double>(pieces);
      out.push_back({element_point(e, u), e.s0_m + u});
    }
  }
  const Element& last = path.elements.back();
  out.push_back({element_point(last, last.length_m), path.length_m});
  return out;
}

// ---------------------------------------------------------------- profile

double DesignedProfile::at(double s_m) const {
  if (h_m.empty()) return 0.0;
  const double f = std::clamp(s_m / step_m, 0.0, static_cast<double>(h_m.size() - 1));
  const auto i = static_cast<std::size_t>(std::floor(f));
  if (i + 1 >= h_m.size()) return h_m.back();
  const double t = f - static_cast<double>(i);
  return h_m[i] + t * (h_m[i + 1] - h_m[i]);
}

DesignedProfile build_profile(const ProfileDesign& design, double length_m) {
  if (design.knots.empty()) throw std::runtime_error("a profile needs knots");
  for (std::size_t i = 1; i < design.knots.size(); ++i) {
    if (!(design.knots[i].s_m > design.knots[i - 1].s_m)) {
      throw std::runtime_error("profile knots must increase in distance (knot " +
                               std::to_string(i) + " at " + text(design.knots[i].s_m, 1) + " m)");
    }
  }
  DesignedProfile p;
  p.step_m = 1.0;
  const auto n = static_cast<std::size_t>(std::ceil(length_m / p.step_m)) + 1;
  std::vector<double> raw(n);
  std::size_t k = 0;
  const auto& kn = design.knots;
  for (std::size_t i = 0; i < n; ++i) {
    const double s = static_cast<double>(i) * p.step_m;
    while (k + 1 < kn.size() && kn[k + 1].s_m <= s) ++k;
    if (s <= kn.front().s_m) {
      raw[i] = kn.front().h_m;
    } else if (k + 1 >= kn.size()) {
      raw[i] = kn.back().h_m;
    } else {
      const double t = (s - kn[k].s_m) / (kn[k + 1].s_m - kn[k].s_m);
      raw[i] = kn[k].h_m + t * (kn[k + 1].h_m - kn[k].h_m);
    }
  }
  // Gaussian rounding of every grade change: vertical curves instead of kinks.
  const double sigma = design.smoothing_sigma_m / p.step_m;
  const auto half = static_cast<long>(std::ceil(3.0 * sigma));
  std::vector<double> kernel(static_cast<std::size_t>(2 * half + 1));
  double total = 0.0;
  for (long j = -half; j <= half; ++j) {
    const double x = static_cast<double>(j) / sigma;
    total += kernel[static_cast<std::size_t>(j + half)] = std::exp(-0.5 * x * x);
  }
  p.h_m.resize(n);
  const long last = static_cast<long>(n) - 1;
  for (long i = 0; i <= last; ++i) {
    double acc = 0.0;
    for (long j = -half; j <= half; ++j) {
      const long m = std::clamp(i + j, 0L, last);
      acc += kernel[static_cast<std::size_t>(j + half)] * raw[static_cast<std::size_t>(m)];
    }
    p.h_m[static_cast<std::size_t>(i)] = acc / total;
  }
  // Undulation on the valley roads: two incommensurate waves, faded in and out over 400 m.
  const double a = design.rolling_amplitude_m;
  for (const Rolling& r : design.rolling) {
    for (std::size_t i = 0; i < n; ++i) {
      const double s = static_cast<double>(i) * p.step_m;
      if (s <= r.from_m || s >= r.to_m) continue;
      const double fade = smoothstep((s - r.from_m) / 400.0) * smoothstep((r.to_m - s) / 400.0);
      const double wave = std::sin(2.0 * kPi * s / 2700.0 + 0.7) +
                          0.6 * std::sin(2.0 * kPi * s / 1100.0 + 2.1);
      p.h_m[i] += a * fade * wave;
    }
  }
  return p;
}

// ---------------------------------------------------------------- the event

namespace {

// Corners between `from` and `to` (both excluded) that make a straight leg wander: one every
// `step_m`, moved sideways by up to `amplitude_m`, with auto radii up to `radius_m`.
void wander(std::vector<Corner>& out, Vec2 from, Vec2 to, double step_m, double amplitude_m,
            double radius_m, Rng& rng) {
  const Vec2 leg = to - from;
  const double length = norm(leg);
  const auto pieces = static_cast<int>(std::max(1.0, std::round(length / step_m)));
  const Vec2 side{-leg.y_m / length, leg.x_m / length};
  for (int k = 1; k < pieces; ++k) {
    const double t = static_cast<double>(k) / pieces;
    const double offset = rng.uniform(-amplitude_m, amplitude_m);
    out.push_back({from + t * leg + offset * side, -radius_m, ""});
  }
}

}  // namespace

SamplePlan make_plan(std::uint64_t seed) {
  Rng rng(seed);
  std::vector<Corner> c;
  auto add = [&](double x, double y, double radius_m, const std::string& mark = "") {
    c.push_back({{x, y}, radius_m, mark});
  };
  auto roam = [&](Vec2 to, double step_m, double amplitude_m, double radius_m) {
    wander(c, c.back().at, to, step_m, amplitude_m, radius_m, rng);
  };

  // Town of Orvalune (invented): a street grid on level ground, corners of 8 m radius.
  add(-500, -400, 0, "start");
  add(-500, -180, 8, "town_turn_1");
  add(-300, -180, 8, "town_turn_2");
  add(-300, 0, 8, "town_turn_3");
  add(-80, 0, 8, "town_turn_4");
  add(-80, 150, 8, "town_turn_5");
  add(120, 150, 8, "town_turn_6");
  add(120, 350, 8, "town_turn_7");
  add(300, 350, 8, "town_turn_8");
  add(300, 550, 60, "town_exit");
  // Out along a valley to the foot of the first climb.
  roam({7000, 7500}, 800, 70, 350);
  add(7000, 7500, -300, "climb1_foot");
  // Climb 1, winding north-east then east.
  roam({8500, 8600}, 450, 45, 220);
  add(8500, 8600, -250);
  roam({9800, 9000}, 450, 45, 220);
  add(9800, 9000, -250);
  roam({11200, 9900}, 450, 45, 220);
  add(11200, 9900, -250);
  roam({12400, 10200}, 450, 45, 220);
  add(12400, 10200, -300, "climb1_top");
  // Plateau falling gently, then a short ramp to a crest with a bend 40 m beyond it.
  add(13300, 10150, -300);
  add(14000, 9500, -300, "ramp_foot");
  const double ramp_rad = -30.0 * kDeg;
  const Vec2 crest = Vec2{14000, 9500} + 578.0 * unit_at(ramp_rad);
  c.push_back({crest, 0, "crest"});
  const double bend_radius_m = 35.0, bend_turn_rad = -80.0 * kDeg, crest_to_bend_m = 40.0;
  const Vec2 bend =
      crest + (crest_to_bend_m + bend_radius_m * std::tan(0.5 * std::abs(bend_turn_rad))) *
                  unit_at(ramp_rad);
  c.push_back({bend, bend_radius_m, "crest_bend"});
  // Descent to a T-junction, where the course turns sharp left onto the valley road.
  const Vec2 d1 = bend + 1200.0 * unit_at(ramp_rad + bend_turn_rad);
  add(d1.x_m, d1.y_m, -300);
  add(14050, 6800, -300);
  add(14250, 5800, 10, "junction");
  // Valley road east then south.
  add(16500, 6900, -400);
  roam({19000, 5000}, 800, 60, 350);
  add(19000, 5000, -500);
  roam({19800, 1500}, 800, 60, 350);
  add(19800, 1500, -500);
  roam({19000, -1500}, 800, 60, 350);
  add(19000, -1500, -300, "climb2_foot");
  // Climb 2 to a pass.
  roam({15800, -3800}, 450, 40, 220);
  add(15800, -3800, -300, "climb2_top");
  // Long descent: sweeping, then switchbacks stacked on a west-facing slope, then sweeping.
  add(14800, -3950, -300);
  const Vec2 z0{13700, -4300};
  add(z0.x_m, z0.y_m, 25, "switchbacks_in");
  const double leg_m = 320.0, across_rad = 12.0 * kDeg;  // legs 12 deg off the contour
  Vec2 z = z0;
  const int hairpins = 6;
  for (int k = 1; k <= hairpins + 1; ++k) {
    const double north = (k % 2 == 1) ? 1.0 : -1.0;
    z = z + Vec2{-leg_m * std::sin(across_rad), north * leg_m * std::cos(across_rad)};
    if (k <= hairpins) {
      add(z.x_m, z.y_m, 12, "hairpin_" + std::to_string(k));
    } else {
      add(z.x_m, z.y_m, 25, "switchbacks_out");
    }
  }
  add(11800, -4100, -300);
  add(10500, -4600, -300);
  add(9300, -4700, -300, "descent_end");
  // Home along the southern valleys, into town from the west.
  roam({6000, -8500}, 800, 70, 400);
  add(6000, -8500, -400);
  roam({1500, -8000}, 800, 70, 400);
  add(1500, -8000, -400);
  roam({-2500, -5000}, 800, 70, 400);
  add(-2500, -5000, -400);
  roam({-2600, -1500}, 800, 70, 400);
  add(-2600, -1500, -300);
  add(-1300, -450, 40, "town_entry");
  add(-620, -450, 0, "finish");

  SamplePlan plan;
  plan.event_name = "Ronde d'Orvalune";
  plan.slug = "ronde-orvalune";
  plan.town_centre = {-100, 50};
  plan.town_flat_radius_m = 1300.0;
  plan.town_edge_m = 700.0;
  plan.path = build_path(c);
  const Path& path = plan.path;
  auto s_of = [&](const std::string& m) { return path.mark(m).s_m; };

  // ---- designed heights
  ProfileDesign d;
  auto knot = [&](double s_m, double h_m) { d.knots.push_back({s_m, h_m}); };
  const double town_h = 300.0;
  knot(0.0, town_h);
  knot(s_of("town_exit") + 700.0, town_h);
  // Each climb starts from a dip (a stream at its foot) so the valley road's gentle rise does not
  // run into the climb: the road rises gently, then drops 20 m in the last 1.5 km to the foot.
  knot(s_of("climb1_foot") - 1500.0, 350.0);
  knot(s_of("climb1_foot"), 330.0);
  // Climbs are not uniform: pieces of the climb's length (fractions) with relative steepness,
  // scaled so the climb gains exactly its designed height.
  auto climb = [&](const std::string& foot, const std::string& top, double h_foot, double h_top,
                   std::vector<std::pair<double, double>> pieces) {
    double weight = 0.0;
    for (const auto& [fraction, steepness] : pieces) weight += fraction * steepness;
    const double s0 = s_of(foot), len = s_of(top) - s0;
    double s = s0, h = h_foot, steepest_pct = 0.0, steepest_m = 0.0;
    for (const auto& [fraction, steepness] : pieces) {
      s += fraction * len;
      h += (h_top - h_foot) * fraction * steepness / weight;
      knot(s, h);
      const double pct = (h_top - h_foot) * steepness / weight / len * 100.0;
      if (pct > steepest_pct) {
        steepest_pct = pct;
        steepest_m = fraction * len;
      }
    }
    return "steepest " + text(steepest_m, 0) + " m at " + text(steepest_pct, 1) + " %";
  };
  const std::string climb1_pitch = climb("climb1_foot", "climb1_top", 330.0, 700.0,
        {{0.25, 0.8}, {0.2, 1.0}, {0.05, 1.5}, {0.2, 1.05}, {0.3, 1.0}});
  knot(s_of("ramp_foot"), 678.0);
  knot(s_of("crest"), 710.0);
  knot(s_of("junction"), 520.0);
  knot(s_of("climb2_foot") - 1500.0, 548.0);
  knot(s_of("climb2_foot"), 530.0);
  const std::string climb2_pitch =
      climb("climb2_foot", "climb2_top", 530.0, 740.0, {{0.4, 0.9}, {0.1, 1.4}, {0.5, 1.0}});
  knot(s_of("climb2_top") + 150.0, 737.0);
  // Switchbacks: 8 % on the legs, eased to 4 % through each hairpin (+-15 m beyond its arc).
  const double leg_grade = 0.08, hairpin_grade = 0.04, ease_m = 15.0;
  double s_prev = s_of("climb2_top") + 150.0, h_prev = 737.0;
  auto knot_at = [&](double s_m, double grade) {
    h_prev -= grade * (s_m - s_prev);
    s_prev = s_m;
    knot(s_prev, h_prev);
  };
  knot_at(s_of("switchbacks_in"), 0.055);
  for (int k = 1; k <= hairpins; ++k) {
    const CornerInfo& hp = path.mark("hairpin_" + std::to_string(k));
    knot_at(hp.arc_start_m - ease_m, leg_grade);
    knot_at(hp.arc_end_m + ease_m, hairpin_grade);
  }
  knot_at(s_of("switchbacks_out"), leg_grade);
  knot(s_of("descent_end"), 240.0);
  knot(path.length_m - 1300.0, town_h);
  knot(path.length_m, town_h);
  d.rolling = {{s_of("town_exit") + 1000.0, s_of("climb1_foot") - 1500.0},
               {s_of("junction") + 300.0, s_of("climb2_foot") - 1500.0},
               {s_of("descent_end") + 300.0, path.length_m - 1500.0}};
  plan.profile = build_profile(d, path.length_m);

  // ---- features
  auto grade_text = [&](double a_m, double b_m) {
    const double gain = plan.profile.at(b_m) - plan.profile.at(a_m);
    const double len_km = (b_m - a_m) / 1000.0;
    const double pct = gain / (b_m - a_m) * 100.0;
    std::string t = "designed " + text(len_km, 2) + " km, " + (gain > 0 ? "+" : "") +
                    text(gain, 0) + " m, " + text(pct, 1) + " % mean";
    if (gain > 0) t += ", score " + text(pct * pct * len_km, 0) + " (mean % squared x km)";
    return t;
  };
  auto turn_text = [&](const CornerInfo& ci) {
    return std::string(ci.turn_deg > 0 ? "left " : "right ") + text(std::abs(ci.turn_deg), 0) +
           " deg, radius " + text(ci.radius_m, 0) + " m";
  };
  auto& f = plan.features;
  auto stretch = [&](const std::string& name, const std::string& kind, double a_m, double b_m,
                     const std::string& extra) {
    Feature x{name, kind, a_m, b_m, grade_text(a_m, b_m) + extra};
    x.gain_m = plan.profile.at(b_m) - plan.profile.at(a_m);
    f.push_back(x);
  };
  std::vector<std::string> listed_marks;
  auto corner = [&](const std::string& name, const std::string& kind, const std::string& mark,
                    const std::string& extra) {
    listed_marks.push_back(mark);
    const CornerInfo& ci = path.mark(mark);
    Feature x{name, kind, ci.arc_start_m, ci.arc_end_m, turn_text(ci) + extra};
    x.turn_deg = ci.turn_deg;
    x.radius_m = ci.radius_m;
    f.push_back(x);
  };
  f.push_back({"start", "start", 0.0, 0.0, "in the town of Orvalune (level ground, 300 m)"});
  f.push_back({"town streets", "town", 0.0, path.mark("town_exit").arc_start_m,
               "8 right-angle turns (radius 8 m) on straights of 150-220 m, level"});
  for (int k = 1; k <= 8; ++k) {
    corner("town turn " + std::to_string(k), "town_turn", "town_turn_" + std::to_string(k), "");
  }
  corner("town exit bend", "bend", "town_exit", ", leaving town");
  stretch("climb 1", "climb", s_of("climb1_foot"), s_of("climb1_top"), ", " + climb1_pitch);
  f.push_back({"crest", "crest", s_of("crest"), s_of("crest"),
               "top of a 0.6 km ramp at " +
                   text((710.0 - 678.0) / (s_of("crest") - s_of("ramp_foot")) * 100.0, 1) +
                   " %; the road drops away beyond it"});
  corner("bend after crest", "bend", "crest_bend",
         ", arc begins " + text(path.mark("crest_bend").arc_start_m - s_of("crest"), 0) +
             " m after the crest");
  stretch("descent to junction", "descent", s_of("crest"), s_of("junction"), "");
  corner("junction turn", "junction", "junction", ", at the foot of the descent");
  stretch("climb 2", "climb", s_of("climb2_foot"), s_of("climb2_top"), ", " + climb2_pitch);
  stretch("long descent", "descent", s_of("climb2_top"), s_of("descent_end"), ", 6 hairpins");
  corner("bend into the switchbacks", "bend", "switchbacks_in", "");
  for (int k = 1; k <= hairpins; ++k) {
    corner("hairpin " + std::to_string(k), "hairpin", "hairpin_" + std::to_string(k), "");
  }
  corner("bend out of the switchbacks", "bend", "switchbacks_out", "");
  corner("town entry bend", "bend", "town_entry", ", onto the finishing street");
  f.push_back({"town approach", "town", path.mark("town_entry").arc_start_m, path.length_m,
               "level, into town from the west"});
  const Vec2 gap = path.point_at(path.length_m) - path.point_at(0.0);
  f.push_back({"finish", "finish", path.length_m, path.length_m,
               text(norm(gap), 0) + " m from the start"});

  // Every other corner is a gentle bend: record the sharpest, for tests that expect none.
  for (std::size_t i = 1; i + 1 < path.corners.size(); ++i) {
    const bool listed = !c[i].mark.empty() &&
                        std::find(listed_marks.begin(), listed_marks.end(), c[i].mark) !=
                            listed_marks.end();
    if (listed || path.corners[i].radius_m <= 0.0) continue;
    plan.other_max_turn_deg = std::max(plan.other_max_turn_deg, std::abs(path.corners[i].turn_deg));
    plan.other_min_radius_m = plan.other_min_radius_m == 0.0
                                  ? path.corners[i].radius_m
                                  : std::min(plan.other_min_radius_m, path.corners[i].radius_m);
  }
  return plan;
}

}  // namespace coursewarden::sample
