// Sight distances on a 300 km synthetic course at 5 m spacing (60 001 stations).
//
// The course winds over analytic hills (no files): heading is a sum of sines of distance (bends
// down to about 110 m radius), the road lies on the terrain, and the terrain callback evaluates
// the same analytic function. Figures are recorded in docs/hazard-rules.md.
#include <benchmark/benchmark.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <vector>

#include "coursewarden/sight.hpp"

namespace {

using coursewarden::TerrainHeight;

double hills_m(double x, double y) {
  return 150.0 * std::sin(x / 2100.0) * std::cos(y / 1700.0) +
         40.0 * std::sin(x / 530.0 + 0.7) * std::sin(y / 610.0) +
         6.0 * std::sin(x / 97.0) * std::cos(y / 131.0);
}

struct Course {
  std::vector<double> x, y, z, d;
};

const Course& course() {
  static const Course c = [] {
    Course k;
    const double spacing_m = 5.0, length_m = 300000.0;
    const auto n = static_cast<std::size_t>(length_m / spacing_m) + 1;
    k.x.reserve(n);
    k.y.reserve(n);
    k.z.reserve(n);
    k.d.reserve(n);
    double x = 0.0, y = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
      const double s = spacing_m * static_cast<double>(i);
      if (i > 0) {
        const double m = s - 0.5 * spacing_m;
        const double heading =
            0.6 * std::sin(m / 900.0) + 0.5 * std::sin(m / 230.0) + 0.35 * std::sin(m / 55.0);
        x += spacing_m * std::cos(heading);
        y += spacing_m * std::sin(heading);
      }
      k.x.push_back(x);
      k.y.push_back(y);
      k.z.push_back(hills_m(x, y));
      k.d.push_back(s);
    }
    return k;
  }();
  return c;
}

// The same hills as a 25 m raster read by bilinear interpolation: what a DEM callback costs
// (the analytic function above spends most of its time in six sines and cosines).
struct Raster {
  double x0 = 0.0, y0 = 0.0, cell_m = 25.0;
  std::size_t columns = 0, rows = 0;
  std::vector<float> heights;
  double at(double x, double y) const {
    const double fx = (x - x0) / cell_m, fy = (y - y0) / cell_m;
    if (!(fx >= 0.0 && fy >= 0.0)) return std::nan("");
    const auto c = static_cast<std::size_t>(fx), r = static_cast<std::size_t>(fy);
    if (c + 1 >= columns || r + 1 >= rows) return std::nan("");
    const double tx = fx - static_cast<double>(c), ty = fy - static_cast<double>(r);
    const float* row0 = &heights[r * columns + c];
    const float* row1 = row0 + columns;
    return (1.0 - ty) * ((1.0 - tx) * row0[0] + tx * row0[1]) +
           ty * ((1.0 - tx) * row1[0] + tx * row1[1]);
  }
};

const Raster& raster() {
  static const Raster g = [] {
    const Course& c = course();
    Raster r;
    double x_min = c.x[0], x_max = c.x[0], y_min = c.y[0], y_max = c.y[0];
    for (std::size_t i = 0; i < c.x.size(); ++i) {
      x_min = std::min(x_min, c.x[i]);
      x_max = std::max(x_max, c.x[i]);
      y_min = std::min(y_min, c.y[i]);
      y_max = std::max(y_max, c.y[i]);
    }
    r.x0 = x_min - 600.0;
    r.y0 = y_min - 600.0;
    r.columns = static_cast<std::size_t>((x_max - x_min + 1200.0) / r.cell_m) + 2;
    r.rows = static_cast<std::size_t>((y_max - y_min + 1200.0) / r.cell_m) + 2;
    r.heights.resize(r.columns * r.rows);
    for (std::size_t row = 0; row < r.rows; ++row) {
      for (std::size_t col = 0; col < r.columns; ++col) {
        r.heights[row * r.columns + col] = static_cast<float>(
            hills_m(r.x0 + r.cell_m * static_cast<double>(col), r.y0 + r.cell_m * static_cast<double>(row)));
      }
    }
    return r;
  }();
  return g;
}

void BM_CrestSight300km(benchmark::State& state) {
  const Course& c = course();
  for (auto _ : state) {
    auto sight = coursewarden::crest_sight_distance_m(c.d, c.z, 1.4, 0.0, 500.0);
    benchmark::DoNotOptimize(sight.data());
  }
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(c.d.size()));
}
BENCHMARK(BM_CrestSight300km)->Unit(benchmark::kMillisecond);

// Whole course; argument = sample step along each sight line, m.
void BM_TerrainSight300km(benchmark::State& state) {
  const Course& c = course();
  const TerrainHeight terrain = [](double x, double y) { return hills_m(x, y); };
  const auto step_m = static_cast<double>(state.range(0));
  for (auto _ : state) {
    auto sight = coursewarden::terrain_sight_distance_m(c.x, c.y, c.z, c.d, terrain, 1.4, 0.0,
                                                        500.0, step_m);
    benchmark::DoNotOptimize(sight.data());
  }
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(c.d.size()));
}
BENCHMARK(BM_TerrainSight300km)->Arg(5)->Arg(10)->Arg(25)->Unit(benchmark::kMillisecond);

// Only the 300 m before one corner per kilometre (30 % of the stations); step 10 m.
void BM_TerrainSightCornerApproaches300km(benchmark::State& state) {
  const Course& c = course();
  const TerrainHeight terrain = [](double x, double y) { return hills_m(x, y); };
  std::vector<std::uint8_t> mask(c.d.size(), 0);
  std::int64_t evaluated = 0;
  for (std::size_t i = 0; i < c.d.size(); ++i) {
    const double to_next_km = 1000.0 - std::fmod(c.d[i], 1000.0);
    if (to_next_km <= 300.0) {
      mask[i] = 1;
      ++evaluated;
    }
  }
  for (auto _ : state) {
    auto sight = coursewarden::terrain_sight_distance_m(c.x, c.y, c.z, c.d, terrain, 1.4, 0.0,
                                                        500.0, 10.0, {}, mask);
    benchmark::DoNotOptimize(sight.data());
  }
  state.SetItemsProcessed(state.iterations() * evaluated);
}
BENCHMARK(BM_TerrainSightCornerApproaches300km)->Unit(benchmark::kMillisecond);

// Whole course with the raster callback; argument = sample step, m.
void BM_TerrainSightRaster300km(benchmark::State& state) {
  const Course& c = course();
  const Raster& r = raster();
  const TerrainHeight terrain = [&r](double x, double y) { return r.at(x, y); };
  const auto step_m = static_cast<double>(state.range(0));
  for (auto _ : state) {
    auto sight = coursewarden::terrain_sight_distance_m(c.x, c.y, c.z, c.d, terrain, 1.4, 0.0,
                                                        500.0, step_m);
    benchmark::DoNotOptimize(sight.data());
  }
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(c.d.size()));
}
BENCHMARK(BM_TerrainSightRaster300km)->Arg(10)->Arg(25)->Unit(benchmark::kMillisecond);

// Raster, step 25 m, with the carried stretch re-checked every `verify` m (0 = never).
void BM_TerrainSightRasterVerify300km(benchmark::State& state) {
  const Course& c = course();
  const Raster& r = raster();
  const TerrainHeight terrain = [&r](double x, double y) { return r.at(x, y); };
  coursewarden::TerrainSightTuning tuning;
  tuning.verify_step_m = static_cast<double>(state.range(0));
  for (auto _ : state) {
    auto sight = coursewarden::terrain_sight_distance_m(c.x, c.y, c.z, c.d, terrain, 1.4, 0.0,
                                                        500.0, 25.0, tuning);
    benchmark::DoNotOptimize(sight.data());
  }
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(c.d.size()));
}
BENCHMARK(BM_TerrainSightRasterVerify300km)->Arg(0)->Arg(100)->Arg(25)->Unit(benchmark::kMillisecond);

// Corner approaches (as above) with the raster callback, step 12.5 m (half the raster cell).
void BM_TerrainSightRasterCornerApproaches300km(benchmark::State& state) {
  const Course& c = course();
  const Raster& r = raster();
  const TerrainHeight terrain = [&r](double x, double y) { return r.at(x, y); };
  std::vector<std::uint8_t> mask(c.d.size(), 0);
  std::int64_t evaluated = 0;
  for (std::size_t i = 0; i < c.d.size(); ++i) {
    if (1000.0 - std::fmod(c.d[i], 1000.0) <= 300.0) {
      mask[i] = 1;
      ++evaluated;
    }
  }
  for (auto _ : state) {
    auto sight = coursewarden::terrain_sight_distance_m(c.x, c.y, c.z, c.d, terrain, 1.4, 0.0,
                                                        500.0, 12.5, {}, mask);
    benchmark::DoNotOptimize(sight.data());
  }
  state.SetItemsProcessed(state.iterations() * evaluated);
}
BENCHMARK(BM_TerrainSightRasterCornerApproaches300km)->Unit(benchmark::kMillisecond);

// Exact per-corner check: how far back each of 300 corner apexes (one per km) stays in view,
// profile and terrain together; look-back 300 m, step 10 m. Argument 0 = analytic, 1 = raster.
void BM_VisibleApproach300Corners(benchmark::State& state) {
  const Course& c = course();
  const Raster& r = raster();
  const TerrainHeight analytic = [](double x, double y) { return hills_m(x, y); };
  const TerrainHeight gridded = [&r](double x, double y) { return r.at(x, y); };
  const TerrainHeight& terrain = state.range(0) == 0 ? analytic : gridded;
  std::vector<std::size_t> apexes;
  for (std::size_t i = 200; i < c.d.size(); i += 200) apexes.push_back(i);
  for (auto _ : state) {
    auto back = coursewarden::visible_approach_m(c.x, c.y, c.z, c.d, apexes, terrain, 1.4, 0.0,
                                                 300.0, 10.0);
    benchmark::DoNotOptimize(back.data());
  }
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(apexes.size()));
}
BENCHMARK(BM_VisibleApproach300Corners)->Arg(0)->Arg(1)->Unit(benchmark::kMillisecond);

// Sight-line statistics of the synthetic course, reported once as counters (not timed work).
void BM_CourseSightStatistics(benchmark::State& state) {
  const Course& c = course();
  const TerrainHeight terrain = [](double x, double y) { return hills_m(x, y); };
  std::vector<double> crest, ground;
  for (auto _ : state) {
    crest = coursewarden::crest_sight_distance_m(c.d, c.z, 1.4, 0.0, 500.0);
    ground = coursewarden::terrain_sight_distance_m(c.x, c.y, c.z, c.d, terrain, 1.4, 0.0, 500.0,
                                                    10.0);
  }
  double crest_sum = 0.0, ground_sum = 0.0;
  for (std::size_t i = 0; i < crest.size(); ++i) {
    crest_sum += crest[i];
    ground_sum += ground[i];
  }
  state.counters["mean_crest_sight_m"] = crest_sum / static_cast<double>(crest.size());
  state.counters["mean_terrain_sight_m"] = ground_sum / static_cast<double>(ground.size());
}
BENCHMARK(BM_CourseSightStatistics)->Iterations(1)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
