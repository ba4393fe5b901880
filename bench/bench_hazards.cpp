// Corners and hazards for 8 classes on a 300 km course at 5 m spacing, sight lines included
// (issue target: < 50 ms on two cores, Release). Speeds are simulated once outside the timing
// (bench_speed measures them); the terrain is an analytic function standing in for a DEM.
#include <benchmark/benchmark.h>

#include <cmath>
#include <vector>

#include "coursewarden/corners.hpp"
#include "coursewarden/hazards.hpp"
#include "coursewarden/riders.hpp"
#include "coursewarden/sight.hpp"
#include "coursewarden/speed.hpp"

using namespace coursewarden;

namespace {

double terrain(double x, double y) { return 300.0 + 120.0 * std::sin(x / 2300.0) * std::cos(y / 1900.0) + 15.0 * std::sin(x / 310.0 + y / 270.0); }

struct Course {
  std::vector<Station> stations;
  Profile profile;
  std::vector<RiderClass> classes;
  std::vector<SpeedProfile> speeds;
};

// A 300 km road that alternates straights with bends of radius 15-200 m (a bend every ~1.2 km).
const Course& course() {
  static const Course c = [] {
    Course out;
    const double step = 5.0;
    double x = 0, y = 0, heading = 0.3, s = 0;
    int k = 0;
    while (s < 300000.0) {
      const double straight = 600.0 + 400.0 * ((k * 37) % 11) / 10.0;
      const double radius = 15.0 + 185.0 * ((k * 53) % 13) / 12.0;
      const double turn = (0.6 + 1.8 * ((k * 29) % 7) / 6.0) * (k % 2 ? 1 : -1);
      const double arc = radius * std::abs(turn);
      for (double t = 0; t < straight + arc && s < 300000.0; t += step, s += step) {
        Station st;
        st.distance_m = s;
        st.x_m = x;
        st.y_m = y;
        st.heading_rad = heading;
        out.stations.push_back(st);
        if (t >= straight) heading += (turn > 0 ? step : -step) / radius;
        x += step * std::sin(heading);
        y += step * std::cos(heading);
      }
      ++k;
    }
    std::vector<double> raw;
    for (const auto& st : out.stations) raw.push_back(terrain(st.x_m, st.y_m));
    out.profile = build_profile(out.stations, raw, 30.0, {}, "bench");
    out.classes = builtin_rider_classes();
    const CourseSlice slice = make_course_slice(out.stations, out.profile, {});
    const PreparedCourse prepared = prepare_course(slice, Environment{});
    for (const auto& rc : out.classes) out.speeds.push_back(simulate_class(rc, prepared));
    return out;
  }();
  return c;
}

void BM_CornersAndHazards300km(benchmark::State& state) {
  const Course& c = course();
  const auto& d = c.profile.distance_m;
  std::vector<double> x, y;
  for (const auto& st : c.stations) {
    x.push_back(st.x_m);
    y.push_back(st.y_m);
  }
  const TerrainHeight ground = [](double px, double py) { return terrain(px, py); };
  std::size_t hazards = 0, corners = 0;
  for (auto _ : state) {
    const auto found = find_corners(c.stations);
    std::vector<double> radius;
    std::vector<std::size_t> targets;
    for (const auto& k : found) {
      radius.push_back(path_radius_m(k, RoadState{}));
      targets.push_back(static_cast<std::size_t>(std::lower_bound(d.begin(), d.end(), k.entry_m) - d.begin()));
    }
    const auto sight = crest_sight_distance_m(d, c.profile.elevation_m);
    const auto visible = visible_approach_m(x, y, c.profile.elevation_m, d, targets, ground, kRiderEyeHeight_m, 0.0,
                                            kDefaultMaxLook_m, 15.0);
    HazardInputs in;
    in.stations = &c.stations;
    in.profile = &c.profile;
    in.corners = &found;
    in.path_radius_m = &radius;
    in.classes = &c.classes;
    in.speeds = &c.speeds;
    in.corner_visible_m = &visible;
    const auto h = find_hazards(in);
    benchmark::DoNotOptimize(sight.data());
    hazards = h.size();
    corners = found.size();
  }
  state.counters["corners"] = static_cast<double>(corners);
  state.counters["hazards"] = static_cast<double>(hazards);
  state.counters["stations"] = static_cast<double>(c.stations.size());
}
BENCHMARK(BM_CornersAndHazards300km)->Unit(benchmark::kMillisecond)->MinTime(2.0);

}  // namespace

BENCHMARK_MAIN();
