// Speed model throughput: 8 rider classes, both profiles, over a 300 km synthetic course at
// 5 m spacing (60 001 stations). Target: under 50 ms on two cores, Release build.
// Measured figures: bench/README-speed.md.
#include <benchmark/benchmark.h>

#include <cmath>
#include <limits>
#include <numbers>
#include <thread>
#include <vector>

#include "coursewarden/riders.hpp"
#include "coursewarden/speed.hpp"

namespace {

using namespace coursewarden;

// Rolling hills with a few long climbs and descents, bends every 1.5 km, some tight turns and
// gravel sectors, the road turning slowly so the wind comes from every side.
CourseSlice synthetic_course() {
  constexpr double kLength_m = 300000.0;
  constexpr double kSpacing_m = 5.0;
  const double two_pi = 2.0 * std::numbers::pi;
  CourseSlice s;
  const std::size_t n = static_cast<std::size_t>(kLength_m / kSpacing_m) + 1;
  s.distance_m.reserve(n);
  s.elevation_m.reserve(n);
  s.heading_rad.reserve(n);
  s.corner_limit_mps.assign(n, std::numeric_limits<double>::infinity());
  s.turn_radius_m.assign(n, std::numeric_limits<double>::infinity());
  s.surface.assign(n, SurfaceClass::smooth_asphalt);
  for (std::size_t i = 0; i < n; ++i) {
    const double d = static_cast<double>(i) * kSpacing_m;
    s.distance_m.push_back(d);
    // Steepest where the three waves meet: about 13 %.
    s.elevation_m.push_back(600.0 + 300.0 * std::sin(two_pi * d / 40000.0) +
                            50.0 * std::sin(two_pi * d / 7000.0) +
                            6.0 * std::sin(two_pi * d / 900.0));
    s.heading_rad.push_back(std::fmod(two_pi * d / 25000.0, two_pi));
    if (i > 0 && i % 300 == 0) s.corner_limit_mps[i] = 6.0 + static_cast<double>(i % 7);
    if (i > 0 && i % 1000 == 500) s.turn_radius_m[i] = 12.0;
    if ((i / 2000) % 10 == 3) s.surface[i] = SurfaceClass::gravel;
  }
  for (double start = 5000.0; start < kLength_m; start += 40000.0)
    s.climbs.push_back({start, start + 15000.0});
  return s;
}

std::vector<RiderClass> eight_classes() {
  auto classes = builtin_rider_classes();
  classes.resize(8);
  return classes;
}

Environment breezy() {
  Environment env;
  env.temperature_c = 22.0;
  env.wind_speed_mps = 4.0;
  env.wind_from_rad = 1.2;
  return env;
}

void BM_PrepareCourse300km(benchmark::State& state) {
  const CourseSlice course = synthetic_course();
  const Environment env = breezy();
  for (auto _ : state) benchmark::DoNotOptimize(prepare_course(course, env));
}
BENCHMARK(BM_PrepareCourse300km)->Unit(benchmark::kMillisecond);

void BM_OneClass300km(benchmark::State& state) {
  const PreparedCourse course = prepare_course(synthetic_course(), breezy());
  const RiderClass rider = builtin_rider_classes()[2];
  for (auto _ : state) benchmark::DoNotOptimize(simulate_class(rider, course));
}
BENCHMARK(BM_OneClass300km)->Unit(benchmark::kMillisecond);

// The whole job: prepare once, then 8 classes (planned and unbraked profiles each) split over
// `threads` worker threads.
void BM_EightClasses300km(benchmark::State& state) {
  const CourseSlice slice = synthetic_course();
  const Environment env = breezy();
  const auto classes = eight_classes();
  const auto threads = static_cast<std::size_t>(state.range(0));
  for (auto _ : state) {
    const PreparedCourse course = prepare_course(slice, env);
    std::vector<SpeedProfile> results(classes.size());
    std::vector<std::thread> workers;
    for (std::size_t w = 0; w < threads; ++w) {
      workers.emplace_back([&, w] {
        for (std::size_t k = w; k < classes.size(); k += threads)
          results[k] = simulate_class(classes[k], course);
      });
    }
    for (auto& t : workers) t.join();
    benchmark::DoNotOptimize(results.data());
  }
  state.counters["stations"] = static_cast<double>(slice.distance_m.size());
}
BENCHMARK(BM_EightClasses300km)->Arg(1)->Arg(2)->Unit(benchmark::kMillisecond)->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
