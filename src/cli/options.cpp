#include "cli/options.hpp"

#include <cmath>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden::cli {
namespace {

constexpr double kPi = 3.14159265358979323846;

ElevationSource parse_source(const std::string& s) {
  if (s == "course") return ElevationSource::course;
  if (s == "compare") return ElevationSource::compare;
  return ElevationSource::dem;
}

void check_range(double v, const std::string& option, double lo, double hi, const std::string& unit) {
  if (!(std::isfinite(v) && v >= lo && v <= hi)) {
    fail("", option, "must be between " + fmt_fixed(lo, 0) + " and " + fmt_fixed(hi, 0) + " " + unit);
  }
}

std::string clock_text(double s) {
  const long t = std::lround(s);
  const long h = t / 3600, m = (t % 3600) / 60;
  return (h < 10 ? "0" : "") + std::to_string(h) + ":" + (m < 10 ? "0" : "") + std::to_string(m);
}

}  // namespace

void add_course_options(CLI::App& cmd, ProfileArgs& a) {
  cmd.add_option("--dem", a.analysis.dem_path, "elevation raster (GeoTIFF, VRT, any GDAL raster)");
  cmd.add_option("--dem-crs", a.analysis.dem.assume_crs, "CRS of a DEM that declares none, e.g. EPSG:32632");
  cmd.add_option("--track", a.analysis.read.track, "track to use when the file holds several (name or 0-based index)");
  cmd.add_flag("--reverse", a.analysis.reverse, "ride the course the other way round");
  cmd.add_option("--crs", a.analysis.crs, "projected CRS for plane geometry (default: transverse Mercator on the course)");
  cmd.add_option("--spacing", a.analysis.spacing_m, "station spacing along the course, metres")->capture_default_str();
  cmd.add_option("--elevation", a.elevation,
                 "heights from: dem, course (the file's own), compare (DEM, and report the file's disagreement)")
      ->check(CLI::IsMember({"dem", "course", "compare"}))
      ->capture_default_str();
  cmd.add_option("--max-grade", a.analysis.profile.max_plausible_grade_pct,
                 "raw gradients steeper than this (%) are DEM artefacts and are repaired")
      ->capture_default_str();
  cmd.add_option("--max-gap", a.analysis.profile.max_gap_m,
                 "longest stretch without DEM data bridged by interpolation, metres")
      ->capture_default_str();
  cmd.add_option("--smoothing", a.analysis.profile.smoothing_sigma_m,
                 "Gaussian smoothing sigma in metres (default: max(2 x spacing, DEM pixel))");
  cmd.add_option("--climb-dip", a.analysis.climbs.hysteresis_m, "a dip shallower than this (m) does not split a climb")
      ->capture_default_str();
  cmd.add_option("--category-scale", a.category_scale,
                 "five lower bounds of the climb score for categories 4,3,2,1,HC "
                 "(score = mean gradient % squared x length km)")
      ->expected(5)
      ->delimiter(',');
}

void add_check_options(CLI::App& cmd, CheckArgs& a) {
  add_course_options(cmd, a.profile);
  cmd.add_option("--riders", a.check.riders_path, "TOML file adding or overriding rider classes");
  cmd.add_option("--classes", a.check.class_names, "rider classes in the field (default: all)")->delimiter(',');
  cmd.add_option("--condition", a.condition, "road surface: dry or wet")
      ->check(CLI::IsMember({"dry", "wet"}))
      ->capture_default_str();
  cmd.add_option("--road", a.road, "closed (riders use the road width) or open (own lane)")
      ->check(CLI::IsMember({"closed", "open"}))
      ->capture_default_str();
  cmd.add_option("--road-width", a.check.road.road_width_m, "usable road width on a closed road, m")->capture_default_str();
  cmd.add_option("--lane-width", a.check.road.lane_width_m, "lane width on an open road, m")->capture_default_str();
  cmd.add_option("--traffic-side", a.traffic_side, "side of the road traffic keeps to: right or left")
      ->check(CLI::IsMember({"right", "left"}))
      ->capture_default_str();
  cmd.add_option("--temperature", a.check.environment.temperature_c, "air temperature, deg C")->capture_default_str();
  cmd.add_option("--wind", a.wind_kmh, "wind speed, km/h")->capture_default_str();
  cmd.add_option("--wind-from", a.wind_from_deg, "direction the wind blows from, deg clockwise from north")
      ->capture_default_str();
  cmd.add_option("--start", a.start, "start time of the first rider, HH:MM")->capture_default_str();
  cmd.add_option("--assist-cutoff", a.assist_cutoff_kmh,
                 "speed at which pedal-assist motors stop helping (legal limit), km/h")
      ->capture_default_str();
  cmd.add_option("--fast-speed", a.fast_kmh, "speed above which a section counts as fast, km/h")->capture_default_str();
  cmd.add_flag("--no-terrain-sight", [&a](std::int64_t) { a.check.terrain_sight = false; },
               "judge sight over the road's crests only, not over the DEM's terrain");
  cmd.add_flag("--no-reverse-check", [&a](std::int64_t) { a.check.check_reverse = false; },
               "do not also check the course ridden the other way");
  cmd.add_option("--out", a.out_dir, "report folder (created if needed; only our own files are replaced)");
  cmd.add_option("--json", a.profile.json_path, "write the summary JSON here ('-' = stdout)");
}

void finish_profile_options(ProfileArgs& a) {
  a.analysis.elevation_source = parse_source(a.elevation);
  if (a.category_scale.empty()) return;
  for (std::size_t i = 1; i < a.category_scale.size(); ++i) {
    if (!(a.category_scale[i] > a.category_scale[i - 1])) {
      fail("", "--category-scale", "the five bounds must increase (category 4 first, HC last)");
    }
  }
  auto& s = a.analysis.climbs.scale;
  s.cat4_min = a.category_scale[0];
  s.cat3_min = a.category_scale[1];
  s.cat2_min = a.category_scale[2];
  s.cat1_min = a.category_scale[3];
  s.hc_min = a.category_scale[4];
}

void finish_check_options(CheckArgs& a) {
  finish_profile_options(a.profile);
  CheckOptions& c = a.check;
  c.analysis = a.profile.analysis;
  if (c.analysis.spacing_m > 10.0) {
    fail("", "--spacing " + fmt_fixed(c.analysis.spacing_m, 1),
         "corners and sight lines need stations at most 10 m apart; use 10 m or less for check and compare");
  }
  check_range(c.environment.temperature_c, "--temperature", -30, 50, "deg C");
  check_range(a.wind_kmh, "--wind", 0, 150, "km/h");
  check_range(a.wind_from_deg, "--wind-from", 0, 360, "deg");
  check_range(a.assist_cutoff_kmh, "--assist-cutoff", 5, 60, "km/h");
  check_range(a.fast_kmh, "--fast-speed", 20, 150, "km/h");
  check_range(c.road.road_width_m, "--road-width", 2, 30, "m");
  check_range(c.road.lane_width_m, "--lane-width", 1, 10, "m");
  const auto start = parse_clock(a.start);
  if (!start) fail("", "--start " + a.start, "give the start time as HH:MM, e.g. 08:30");
  c.environment.wet = a.condition == "wet";
  c.environment.wind_speed_mps = a.wind_kmh / 3.6;
  c.environment.wind_from_rad = a.wind_from_deg * kPi / 180.0;
  c.environment.assist_cutoff_mps = a.assist_cutoff_kmh / 3.6;
  c.environment.start_time_s = *start;
  c.road.closed = a.road == "closed";
  c.road.right_hand_traffic = a.traffic_side == "right";
  c.hazards.fast_speed_mps = a.fast_kmh / 3.6;
}

void apply_event(CheckArgs& a, const EventFile& ev, const WeatherScenario* weather) {
  AnalysisOptions& an = a.profile.analysis;
  an.course_path = ev.course_path;
  an.dem_path = ev.dem_path;
  if (ev.dem_path.empty()) a.profile.elevation = "course";
  an.dem.assume_crs = ev.dem_crs;
  an.read.track = ev.track;
  if (ev.spacing_m) an.spacing_m = *ev.spacing_m;
  a.check.riders_path = ev.riders_path;
  a.check.class_names = ev.classes;
  a.road = ev.road.closed ? "closed" : "open";
  a.traffic_side = ev.road.right_hand_traffic ? "right" : "left";
  a.check.road = ev.road;
  a.check.surface = ev.surface;
  a.check.sections = ev.sections;
  if (weather) {
    a.condition = weather->wet ? "wet" : "dry";
    a.check.environment.temperature_c = weather->temperature_c;
    a.wind_kmh = weather->wind_speed_mps * 3.6;
    a.wind_from_deg = weather->wind_from_rad * 180.0 / kPi;
    a.check.scenario_name = weather->name;
  }
  if (!ev.waves.empty()) {
    double first = ev.waves.front().start_time_s;
    for (const auto& w : ev.waves) first = std::min(first, w.start_time_s);
    a.start = clock_text(first);
  }
  if (ev.fast_speed_mps) a.fast_kmh = *ev.fast_speed_mps * 3.6;
  if (ev.assist_cutoff_mps) a.assist_cutoff_kmh = *ev.assist_cutoff_mps * 3.6;
  a.check.event_name = ev.name;
  a.check.event_date = ev.date;
  a.check.event_path = ev.path;
  a.check.ops.waves = ev.waves;
  a.check.ops.rules = ev.rules;
  a.check.ops.source = ev.path;
  a.check.checkpoints = ev.checkpoints;
}

}  // namespace coursewarden::cli
