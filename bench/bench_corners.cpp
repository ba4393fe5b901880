// Corner detection on a 300 km synthetic winding course at 5 m spacing (issue 4: corners and
// hazards for 8 classes under 50 ms; corners alone should be a small part of that).
#include <benchmark/benchmark.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <random>
#include <vector>

#include "coursewarden/corners.hpp"

namespace {

using coursewarden::Station;

struct Point {
  double x_m;
  double y_m;
};

// A winding course of our own: straights of 20-400 m and circular bends of radius 8-300 m
// turning 10-180 deg either way, drawn with a vertex every 2 m on bends, then resampled every
// `spacing_m` by linear interpolation (as the course pipeline does). Optional GPS-like noise
// (independent, normal) on the drawn vertices.
std::vector<Station> winding_course(double length_m, double spacing_m, double noise_m,
                                    unsigned seed, std::size_t& bends_over_20_deg) {
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> straight_m(20.0, 400.0);
  std::uniform_real_distribution<double> log_radius(std::log(8.0), std::log(300.0));
  std::uniform_real_distribution<double> turn_deg(10.0, 180.0);
  std::bernoulli_distribution right(0.5);
  std::normal_distribution<double> noise(0.0, noise_m > 0 ? noise_m : 1.0);

  bends_over_20_deg = 0;
  std::vector<Point> v{{0.0, 0.0}};
  double x = 0.0, y = 0.0, h = 0.0, drawn = 0.0;
  while (drawn < length_m) {
    const double l = straight_m(rng);
    for (double d = 10.0; d <= l; d += 10.0) {
      v.push_back({x + d * std::sin(h), y + d * std::cos(h)});
    }
    x += l * std::sin(h);
    y += l * std::cos(h);
    v.push_back({x, y});
    const double r = std::exp(log_radius(rng));
    const double sign = right(rng) ? 1.0 : -1.0;
    const double turn_d = turn_deg(rng);
    if (turn_d >= 20.0) ++bends_over_20_deg;
    const double turn = turn_d * std::numbers::pi / 180.0;
    const double cx = x + sign * r * std::cos(h), cy = y - sign * r * std::sin(h);
    const double step = 2.0 / r;
    for (double a = step; a < turn + 0.5 * step; a += step) {
      const double hh = h + sign * std::min(a, turn);
      v.push_back({cx - sign * r * std::cos(hh), cy + sign * r * std::sin(hh)});
    }
    h += sign * turn;
    x = v.back().x_m;
    y = v.back().y_m;
    drawn += l + r * turn;
  }
  if (noise_m > 0) {
    for (auto& p : v) {
      p.x_m += noise(rng);
      p.y_m += noise(rng);
    }
  }

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
  return out;
}

void BM_FindCorners(benchmark::State& state) {
  const double noise_m = static_cast<double>(state.range(0)) / 10.0;
  std::size_t drawn = 0;
  const auto stations = winding_course(300000.0, 5.0, noise_m, 2024, drawn);
  std::size_t found = 0;
  for (auto _ : state) {
    const auto corners = coursewarden::find_corners(stations);
    found = corners.size();
    benchmark::DoNotOptimize(corners.data());
  }
  state.counters["stations"] = static_cast<double>(stations.size());
  state.counters["corners"] = static_cast<double>(found);
  state.counters["drawn_20deg"] = static_cast<double>(drawn);
}
// Argument: GPS noise in tenths of a metre (0: a drawn course; 25: sigma 2.5 m).
BENCHMARK(BM_FindCorners)->Arg(0)->Arg(25)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
