// Corners: detection and radius on synthetic courses built here, road-state path radius, and
// safe corner speed against the published check values.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <numbers>
#include <random>
#include <vector>

#include "coursewarden/corners.hpp"
#include "coursewarden/error.hpp"

namespace coursewarden {
namespace {

constexpr double kPi = std::numbers::pi;
double deg(double d) { return d * kPi / 180.0; }

struct Vertex {
  double x_m;
  double y_m;
};

// Draws a course as vertices: straights and circular arcs, heading clockwise from north like
// Station. Arc vertices lie on the circle with a fixed chord (the vertex spacing).
class CourseDrawer {
public:
  CourseDrawer() { vertices_.push_back({x_, y_}); }

  // Straight of `length_m` with vertices every `spacing_m` (0: only its end).
  CourseDrawer& straight(double length_m, double spacing_m = 0.0) {
    const int steps = spacing_m > 0 ? std::max(1, static_cast<int>(std::ceil(length_m / spacing_m))) : 1;
    const double x0 = x_, y0 = y_;
    for (int k = 1; k <= steps; ++k) {
      const double d = length_m * k / steps;
      vertices_.push_back({x0 + d * std::sin(h_), y0 + d * std::cos(h_)});
    }
    x_ = vertices_.back().x_m;
    y_ = vertices_.back().y_m;
    return *this;
  }

  // Arc of radius `radius_m` turning `turn_rad` (positive: right, clockwise), vertices on the
  // circle `chord_m` apart; the last chord is shorter so the arc ends at the exact turn.
  CourseDrawer& arc(double radius_m, double turn_rad, double chord_m) {
    const double sign = turn_rad >= 0 ? 1.0 : -1.0;
    const double total = std::abs(turn_rad);
    const double step = 2.0 * std::asin(std::min(1.0, chord_m / (2.0 * radius_m)));
    // right-hand normal of heading h is (cos h, -sin h)
    const double cx = x_ + sign * radius_m * std::cos(h_);
    const double cy = y_ - sign * radius_m * std::sin(h_);
    const double h0 = h_;
    double done = 0.0;
    while (done < total - 1e-12) {
      done = std::min(total, done + step);
      const double h = h0 + sign * done;
      vertices_.push_back({cx - sign * radius_m * std::cos(h), cy + sign * radius_m * std::sin(h)});
    }
    h_ = h0 + sign * total;
    x_ = vertices_.back().x_m;
    y_ = vertices_.back().y_m;
    return *this;
  }

  // A single vertex: the course turns by `turn_rad` on the spot.
  CourseDrawer& kink(double turn_rad) {
    h_ += turn_rad;
    return *this;
  }

  const std::vector<Vertex>& vertices() const { return vertices_; }

private:
  double x_ = 0.0, y_ = 0.0, h_ = 0.0;
  std::vector<Vertex> vertices_;
};

// Adds independent normal noise (GPS-like) to each vertex.
std::vector<Vertex> with_noise(std::vector<Vertex> v, double sigma_m, unsigned seed) {
  std::mt19937 rng(seed);
  std::normal_distribution<double> noise(0.0, sigma_m);
  for (auto& p : v) {
    p.x_m += noise(rng);
    p.y_m += noise(rng);
  }
  return v;
}

// Uniform resampling by linear interpolation along the vertex line, like the course pipeline:
// stations every `spacing_m`, the last one on the end exactly.
std::vector<Station> resample(const std::vector<Vertex>& v, double spacing_m = 5.0) {
  std::vector<Station> out;
  double along = 0.0, next = 0.0;
  for (std::size_t i = 0; i + 1 < v.size(); ++i) {
    const double dx = v[i + 1].x_m - v[i].x_m, dy = v[i + 1].y_m - v[i].y_m;
    const double len = std::hypot(dx, dy);
    while (next < along + len) {
      const double t = (next - along) / len;
      Station s;
      s.distance_m = next;
      s.x_m = v[i].x_m + t * dx;
      s.y_m = v[i].y_m + t * dy;
      out.push_back(s);
      next += spacing_m;
    }
    along += len;
  }
  if (!out.empty() && along - out.back().distance_m < 1e-6) out.pop_back();
  Station end;
  end.distance_m = along;
  end.x_m = v.back().x_m;
  end.y_m = v.back().y_m;
  out.push_back(end);
  for (std::size_t i = 0; i < out.size(); ++i) {
    const std::size_t lo = i == 0 ? 0 : i - 1, hi = std::min(i + 1, out.size() - 1);
    double h = std::atan2(out[hi].x_m - out[lo].x_m, out[hi].y_m - out[lo].y_m);
    if (h < 0) h += 2 * kPi;
    out[i].heading_rad = h;
  }
  return out;
}

TEST(CornerExplore, Table) {
  for (double turn : {90.0, 60.0, 180.0}) {
    for (double r : {8.0, 10.0, 15.0, 20.0, 30.0, 50.0, 100.0, 200.0, 300.0}) {
      for (double c : {1.0, 3.0, 5.0, 7.0, 10.0}) {
        CourseDrawer d;
        d.straight(200, 10).arc(r, deg(turn), c).straight(200, 10);
        const auto st = resample(d.vertices());
        const auto cs = find_corners(st);
        std::printf("turn %5.0f R %5.0f c %4.1f: n=%zu", turn, r, c, cs.size());
        for (const auto& k : cs)
          std::printf("  [R %.2f (%+.1f%%) defl %.1f kink %d cmp %d win %.0f e %.1f a %.1f x %.1f]", k.turn_radius_m,
                      100 * (k.turn_radius_m / r - 1), k.deflection_rad * 180 / kPi, k.from_kink, k.compound, k.fit_window_m,
                      k.entry_m - 200, k.apex_m - 200, k.exit_m - 200);
        std::printf("\n");
      }
    }
  }
}

TEST(CornerExplore, Noise) {
  for (double sigma : {0.0, 0.5, 1.0, 2.0, 2.5, 3.0}) {
    for (unsigned seed = 1; seed <= 5; ++seed) {
      CourseDrawer d;
      d.straight(3000, 5);
      const auto st = resample(with_noise(d.vertices(), sigma, seed));
      const auto cs = find_corners(st);
      std::printf("sigma %.1f seed %u: est %.2f corners %zu\n", sigma, seed, estimate_track_noise_m(st), cs.size());
    }
    for (double r : {20.0, 50.0, 100.0}) {
      CourseDrawer d;
      d.straight(300, 5).arc(r, deg(90), 5).straight(300, 5);
      const auto st = resample(with_noise(d.vertices(), sigma, 7));
      const auto cs = find_corners(st);
      std::printf("  sigma %.1f R %.0f: n=%zu", sigma, r, cs.size());
      for (const auto& k : cs)
        std::printf("  [R %.1f defl %.1f win %.0f a %.1f]", k.turn_radius_m, k.deflection_rad * 180 / kPi,
                    k.fit_window_m, k.apex_m);
      std::printf("\n");
    }
  }
}

}  // namespace
}  // namespace coursewarden
namespace coursewarden { namespace {
double lsq_heading(const std::vector<Station>& st, std::size_t a, std::size_t b) {
  double mx = 0, my = 0; int n = 0;
  for (std::size_t i = a; i <= b; ++i) { mx += st[i].x_m; my += st[i].y_m; ++n; }
  mx /= n; my /= n;
  double sxx = 0, syy = 0, sxy = 0;
  for (std::size_t i = a; i <= b; ++i) { double dx = st[i].x_m - mx, dy = st[i].y_m - my; sxx += dx*dx; syy += dy*dy; sxy += dx*dy; }
  double th = 0.5 * std::atan2(2 * sxy, sxx - syy);
  double ux = std::cos(th), uy = std::sin(th);
  if (ux * (st[b].x_m - st[a].x_m) + uy * (st[b].y_m - st[a].y_m) < 0) { ux = -ux; uy = -uy; }
  return std::atan2(ux, uy);
}
TEST(CornerExplore, NoiseScale) {
  for (double sigma : {1.0, 2.0, 3.0}) {
   for (double vs : {3.0, 5.0, 10.0}) {
    CourseDrawer d;
    d.straight(20000, vs);
    const auto st = resample(with_noise(d.vertices(), sigma, 3));
    const double est = estimate_track_noise_m(st);
    for (int q : {4, 8, 12, 16}) {
      std::vector<double> psi, lsq; double chord = 0;
      for (std::size_t j = 0; j + q < st.size(); ++j) {
        psi.push_back(std::atan2(st[j + q].x_m - st[j].x_m, st[j + q].y_m - st[j].y_m));
        lsq.push_back(lsq_heading(st, j, j + q));
        chord += std::hypot(st[j + q].x_m - st[j].x_m, st[j + q].y_m - st[j].y_m);
      }
      chord /= psi.size();
      double sum2 = 0, sl2 = 0; int cnt = 0;
      for (std::size_t j = 0; j + q < psi.size(); ++j) { double t = std::remainder(psi[j + q] - psi[j], 2 * kPi); sum2 += t * t; double u = std::remainder(lsq[j + q] - lsq[j], 2 * kPi); sl2 += u*u; ++cnt; }
      std::printf("sigma %.1f vs %.0f est %.2f q %d chord %.1f: chord-turn sd %.4f pred %.4f | lsq-turn sd %.4f pred %.4f\n", sigma, vs, est, q, chord, std::sqrt(sum2 / cnt), 2 * est / chord,
        std::sqrt(sl2/cnt), std::sqrt(24.0) * est / (chord * std::sqrt(q + 1.0)));
    }
   }
  }
}
}}
namespace coursewarden { namespace {
TEST(CornerExplore, One) {
  CourseDrawer d;
  d.straight(200, 10).arc(300, deg(90), 1).straight(200, 10);
  const auto st = resample(d.vertices());
  const auto cs = find_corners(st);
  for (const auto& k : cs) std::printf("R %.2f win %.1f e %.1f x %.1f\n", k.turn_radius_m, k.fit_window_m, k.entry_m, k.exit_m);
  std::printf("n stations %zu\n", st.size());
}
}}
namespace coursewarden { namespace {
TEST(CornerExplore, NoisyHairpin) {
  for (double sigma : {0.0, 1.0, 2.0, 3.0}) for (double r : {10.0, 15.0, 30.0, 60.0}) {
    CourseDrawer d;
    d.straight(300, 5).arc(r, deg(-180), 3).straight(300, 5);
    const auto st = resample(with_noise(d.vertices(), sigma, 11));
    const auto cs = find_corners(st);
    std::printf("hairpin sigma %.0f R %.0f: n=%zu", sigma, r, cs.size());
    for (const auto& k : cs) std::printf(" [R %.1f defl %.1f %s win %.0f]", k.turn_radius_m, k.deflection_rad * 180 / kPi, turn_direction_name(k.direction), k.fit_window_m);
    std::printf("\n");
  }
}
}}
namespace coursewarden { namespace {
void show(const char* name, const std::vector<Vertex>& v) {
  const auto st = resample(v);
  const auto cs = find_corners(st);
  std::printf("%s: len %.1f n=%zu\n", name, st.back().distance_m, cs.size());
  for (const auto& k : cs)
    std::printf("   %s R %.2f defl %.1f e %.1f a %.1f x %.1f kink %d hp %d s %d cmp %d sb %.1f sa %.1f win %.1f\n", turn_direction_name(k.direction), k.turn_radius_m,
                k.deflection_rad * 180 / kPi, k.entry_m, k.apex_m, k.exit_m, k.from_kink, k.hairpin, k.s_bend, k.compound, k.straight_before_m, k.straight_after_m, k.fit_window_m);
}
TEST(CornerExplore, Scenarios) {
  { CourseDrawer d; d.straight(100, 5).arc(30, deg(90), 2).arc(30, deg(-90), 2).straight(100, 5); show("S-bend zero straight R30", d.vertices()); }
  { CourseDrawer d; d.straight(100, 5).arc(15, deg(-70), 2).arc(15, deg(70), 2).straight(100, 5); show("S-bend zero straight R15", d.vertices()); }
  { CourseDrawer d; d.straight(100, 5).arc(20, deg(90), 2).arc(60, deg(90), 2).straight(100, 5); show("compound 20/60", d.vertices()); }
  { CourseDrawer d; d.straight(100, 5).arc(20, deg(60), 2).straight(10, 2).arc(20, deg(60), 2).straight(100, 5); show("double 60 gap 10", d.vertices()); }
  { CourseDrawer d; d.arc(25, deg(90), 1).straight(150, 5); show("corner at start", d.vertices()); }
  { CourseDrawer d; d.straight(150, 5).arc(25, deg(-90), 1); show("corner at end", d.vertices()); }
  { CourseDrawer d; d.straight(150).kink(deg(90)).straight(150); show("kink 90", d.vertices()); }
  { CourseDrawer d; d.straight(152.5).kink(deg(-45)).straight(150); show("kink -45 on station", d.vertices()); }
  { CourseDrawer d; d.straight(150).kink(deg(180)).straight(150); show("reversal", d.vertices()); }
  { CourseDrawer d; d.straight(150).kink(deg(60)).straight(7).kink(deg(-60)).straight(150); show("two kinks 7 m", d.vertices()); }
  { CourseDrawer d; d.straight(500, 50); show("straight", d.vertices()); }
  { CourseDrawer d; d.straight(100, 5).arc(8, deg(180), 1).straight(100, 5); show("hairpin 8", d.vertices()); }
  { CourseDrawer d; d.straight(100, 5).arc(12, deg(270), 1).straight(100, 5); show("loop 270", d.vertices()); }
  { CourseDrawer d; d.straight(7); show("tiny", d.vertices()); }
}
}}
