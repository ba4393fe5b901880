// The check pipeline: profile, rider speeds, corners, sight lines and hazards for one course.
#include "coursewarden/check.hpp"

#include <cmath>
#include <algorithm>
#include <limits>
#include <optional>
#include <unordered_map>

#include "coursewarden/compare.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/sight.hpp"

namespace coursewarden {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

// Ground heights at local-plane points, from the DEM. The exact mapping local plane -> lon/lat
// -> DEM CRS costs two PROJ calls; within one square kilometre it is affine to well under a
// millimetre, so each 1 km cell gets an affine map fitted on three exact points (cached).
class TerrainFromDem {
public:
  TerrainFromDem(Dem& dem, const LocalProjection& projection) : dem_(dem), projection_(projection) {}

  double operator()(double x_m, double y_m) {
    const long cx = static_cast<long>(std::floor(x_m / kCell)), cy = static_cast<long>(std::floor(y_m / kCell));
    const long long key = (static_cast<long long>(cx) << 32) ^ (cy & 0xffffffffLL);
    auto it = cells_.find(key);
    if (it == cells_.end()) it = cells_.emplace(key, fit(static_cast<double>(cx) * kCell, static_cast<double>(cy) * kCell)).first;
    const Affine& a = it->second;
    const double u = x_m - a.x0, v = y_m - a.y0;
    return dem_.sample_native(a.nx + a.dxu * u + a.dxv * v, a.ny + a.dyu * u + a.dyv * v);
  }

private:
  static constexpr double kCell = 1000.0;
  struct Affine {
    double x0, y0, nx, ny, dxu, dxv, dyu, dyv;
  };
  void native(double x, double y, double& nx, double& ny) const {
    double lon = 0, lat = 0;
    projection_.inverse(x, y, lon, lat);
    dem_.lonlat_to_native(lon, lat, nx, ny);
  }
  Affine fit(double x0, double y0) const {
    Affine a{};
    a.x0 = x0 + kCell / 2;
    a.y0 = y0 + kCell / 2;
    double ex = 0, ey = 0, nx = 0, ny = 0;
    native(a.x0, a.y0, a.nx, a.ny);
    native(a.x0 + 100.0, a.y0, ex, ey);
    native(a.x0, a.y0 + 100.0, nx, ny);
    a.dxu = (ex - a.nx) / 100.0;
    a.dyu = (ey - a.ny) / 100.0;
    a.dxv = (nx - a.nx) / 100.0;
    a.dyv = (ny - a.ny) / 100.0;
    return a;
  }
  Dem& dem_;
  const LocalProjection& projection_;
  std::unordered_map<long long, Affine> cells_;
};

double median_vertex_step_m(const RawCourse& course) {
  std::vector<double> steps;
  for (std::size_t i = 1; i < course.vertices.size(); ++i) {
    steps.push_back(geodesic_length_m({course.vertices[i - 1], course.vertices[i]}));
  }
  if (steps.empty()) return 0.0;
  std::nth_element(steps.begin(), steps.begin() + static_cast<long>(steps.size() / 2), steps.end());
  return steps[steps.size() / 2];
}

}  // namespace

std::vector<RiderClass> select_classes(const std::vector<RiderClass>& known,
                                       const std::vector<std::string>& names,
                                       const std::string& source) {
  if (names.empty()) return known;
  std::vector<RiderClass> out;
  for (const auto& n : names) {
    const int k = find_rider_class(known, n);
    if (k < 0) {
      std::string list;
      for (const auto& c : known) list += (list.empty() ? "" : ", ") + c.name;
      fail(source, "class '" + n + "'", "no such rider class; known classes: " + list);
    }
    out.push_back(known[static_cast<std::size_t>(k)]);
  }
  return out;
}

RoadState road_state_at(const CheckOptions& options, double at_m) {
  RoadState road = options.road;
  // Sections are given along the course as drawn (like the checkpoints).
  for (const RoadSection& sec : options.sections) {
    if (at_m < sec.from_m || at_m > sec.to_m) continue;
    if (sec.closed) road.closed = *sec.closed;
    if (sec.road_width_m) road.road_width_m = *sec.road_width_m;
    if (sec.lane_width_m) road.lane_width_m = *sec.lane_width_m;
  }
  return road;
}

CheckResult run_check(const CheckOptions& options) {
  CheckResult r;
  r.environment = options.environment;
  r.road = options.road;
  r.hazard_options = options.hazards;
  auto step = [&options](const std::string& what) {
    if (options.progress) options.progress(what);
  };
  // Classes first: a bad riders file should fail before the slow work.
  const std::vector<RiderClass> known =
      options.riders_path.empty() ? builtin_rider_classes() : load_rider_classes(options.riders_path);
  r.classes = select_classes(known, options.class_names,
                             options.riders_path.empty() ? "--classes" : options.riders_path);
  step("reading " + options.analysis.course_path + " and draping it on the DEM");
  r.analysis = analyse_course(options.analysis);
  const CourseAnalysis& a = r.analysis;
  // Road sections are written along the course as drawn; ridden in reverse they are mirrored.
  CheckOptions mirrored;
  const CheckOptions& opts = options.analysis.reverse ? mirrored : options;
  if (options.analysis.reverse) {
    mirrored = options;
    for (RoadSection& sec : mirrored.sections) {
      const double from = sec.from_m;
      sec.from_m = std::max(0.0, a.profile.totals.length_m - sec.to_m);
      sec.to_m = std::max(0.0, a.profile.totals.length_m - from);
    }
  }
  for (const RoadSection& sec : options.sections) {
    if (sec.from_m > a.profile.totals.length_m + 1.0) {
      fail(options.event_path, "road section from km " + std::to_string(static_cast<int>(sec.from_m / 1000.0)),
           "starts beyond the end of the course; check from_km and to_km");
    }
  }
  const bool wet = options.environment.wet;

  step("finding corners");
  // A line drawn with sparse vertices turns only at its vertices: a bend drawn every 25 m is a
  // run of kinks 25 m apart, each below the corner threshold on its own. The fitting window is
  // therefore at least two of the file's typical vertex steps.
  CornerOptions corner_options = options.corners;
  corner_options.min_window_m = std::max(corner_options.min_window_m, 2.0 * median_vertex_step_m(a.course));
  r.corners = find_corners(a.stations, corner_options);
  for (const Corner& c : r.corners) r.path_radius_m.push_back(path_radius_m(c, road_state_at(opts, c.apex_m)));

  // Speeds: corner paths cap each class by its own comfortable lean (turn radius) and all
  // classes by grip (corner limit).
  CourseSlice slice = make_course_slice(a.stations, a.profile, a.climbs);
  const std::size_t n = a.stations.size();
  slice.turn_radius_m.assign(n, kInf);
  slice.corner_limit_mps.assign(n, kInf);
  for (std::size_t k = 0; k < r.corners.size(); ++k) {
    const Corner& c = r.corners[k];
    const double grip = grip_limited_speed_mps(r.path_radius_m[k], grip_friction(options.hazards, wet),
                                               options.hazards.superelevation);
    for (std::size_t i = 0; i < n; ++i) {
      if (a.stations[i].distance_m < c.entry_m || a.stations[i].distance_m > c.exit_m) continue;
      slice.turn_radius_m[i] = std::min(slice.turn_radius_m[i], r.path_radius_m[k]);
      slice.corner_limit_mps[i] = std::min(slice.corner_limit_mps[i], grip);
    }
  }
  if (opts.surface != SurfaceClass::smooth_asphalt ||
      std::any_of(opts.sections.begin(), opts.sections.end(), [](const RoadSection& s) { return s.surface.has_value(); })) {
    slice.surface.assign(n, opts.surface);
    for (const RoadSection& sec : opts.sections) {
      if (!sec.surface) continue;
      for (std::size_t i = 0; i < n; ++i)
        if (a.stations[i].distance_m >= sec.from_m && a.stations[i].distance_m <= sec.to_m) slice.surface[i] = *sec.surface;
    }
  }
  step("simulating " + std::to_string(r.classes.size()) + " rider classes");
  const PreparedCourse prepared = prepare_course(slice, options.environment);
  for (const RiderClass& rider : r.classes) r.speeds.push_back(simulate_class(rider, prepared, options.simulation));

  // Sight: how far ahead the road is seen over its own crests (every station, for the outputs),
  // and for each corner how far back its entry stays in view over the road and the terrain
  // (hillside on the inside of a bend), exactly, per corner.
  step("checking sight lines");
  const HazardOptions& ho = options.hazards;
  r.sight_m = crest_sight_distance_m(a.profile.distance_m, a.profile.elevation_m, ho.eye_height_m,
                                     ho.object_height_m, ho.max_look_m);
  if (!r.corners.empty()) {
    std::vector<double> x(n), y(n);
    for (std::size_t i = 0; i < n; ++i) {
      x[i] = a.stations[i].x_m;
      y[i] = a.stations[i].y_m;
    }
    std::vector<std::size_t> targets;
    for (const Corner& c : r.corners) {
      const auto it = std::lower_bound(a.profile.distance_m.begin(), a.profile.distance_m.end(), c.entry_m);
      targets.push_back(std::min<std::size_t>(static_cast<std::size_t>(it - a.profile.distance_m.begin()), n - 1));
    }
    TerrainHeight terrain;  // empty: road profile only
    std::optional<Dem> dem;
    std::optional<LocalProjection> projection;
    std::optional<TerrainFromDem> from_dem;
    if (options.terrain_sight && a.used_dem) {
      double lon0 = 0, lat0 = 0;
      course_centre(a.course, lon0, lat0);
      projection.emplace(options.analysis.crs.empty() ? LocalProjection::centred_on(lon0, lat0)
                                                      : LocalProjection::from_user_crs(options.analysis.crs));
      dem.emplace(Dem::open(options.analysis.dem_path, options.analysis.dem));
      from_dem.emplace(*dem, *projection);
      terrain = [&from_dem](double px, double py) { return (*from_dem)(px, py); };
    }
    const double step_m = std::max(5.0, a.used_dem ? a.dem.pixel_size_m / 2.0 : 5.0);
    r.corner_visible_m = visible_approach_m(x, y, a.profile.elevation_m, a.profile.distance_m, targets,
                                            terrain, ho.eye_height_m, ho.object_height_m, ho.max_look_m,
                                            step_m);
  }

  HazardInputs in;
  in.stations = &a.stations;
  in.profile = &a.profile;
  in.corners = &r.corners;
  in.path_radius_m = &r.path_radius_m;
  in.classes = &r.classes;
  in.speeds = &r.speeds;
  in.corner_visible_m = r.corners.empty() ? nullptr : &r.corner_visible_m;
  in.wet = wet;
  r.hazards = find_hazards(in, ho);

  r.event_name = options.event_name;
  r.event_date = options.event_date;
  r.event_path = options.event_path;
  r.scenario_name = options.scenario_name;
  r.ops = options.ops;
  r.ops.checkpoints.clear();
  for (const CheckpointSpec& spec : options.checkpoints) {
    Checkpoint cp = spec.checkpoint;
    if (spec.lon_deg && spec.lat_deg) {
      // The nearest station, by an equirectangular approximation (ample for 500 m).
      double best = std::numeric_limits<double>::infinity();
      for (const Station& st : a.stations) {
        const double dx = (st.lon_deg - *spec.lon_deg) * std::cos(st.lat_deg * 3.14159265358979323846 / 180.0);
        const double dy = st.lat_deg - *spec.lat_deg;
        const double d2 = dx * dx + dy * dy;
        if (d2 < best) {
          best = d2;
          cp.at_m = st.distance_m;
        }
      }
      if (std::sqrt(best) * 111195.0 > 500.0) {
        fail(options.event_path, "checkpoint '" + cp.name + "'",
             "its coordinates are more than 500 m from the course; check lat and lon");
      }
    } else {
      if (cp.at_m > a.profile.totals.length_m + 1.0) {
        fail(options.event_path, "checkpoint '" + cp.name + "'",
             "at_km lies beyond the end of the course; check the distance");
      }
      // Distances in the event file are along the course as drawn.
      if (options.analysis.reverse) cp.at_m = std::max(0.0, a.profile.totals.length_m - cp.at_m);
    }
    r.ops.checkpoints.push_back(cp);
  }

  if (options.check_reverse) {
    step("checking the course ridden the other way");
    CheckOptions back = options;
    back.check_reverse = false;
    back.analysis.reverse = !options.analysis.reverse;
    const CheckResult other = run_check(back);
    r.reverse.checked = true;
    r.reverse.counts = count_by_severity(other.hazards);
    r.reverse.markedly_safer = reverse_markedly_safer(count_by_severity(r.hazards), r.reverse.counts);
  }
  return r;
}

}  // namespace coursewarden
