// coursewarden command line: parses options, calls the library, prints and writes outputs.
#include "cli/run.hpp"

#include <CLI/CLI.hpp>

#include <cmath>
#include <exception>
#include <filesystem>
#include <optional>
#include <iostream>
#include <map>
#include <sstream>

#include "coursewarden/analysis.hpp"
#include "coursewarden/check.hpp"
#include "coursewarden/check_outputs.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/outputs.hpp"
#include "coursewarden/report_files.hpp"
#include "io/riders_output.hpp"
#include "util/text.hpp"

namespace coursewarden::cli {
namespace {

struct ProfileArgs {
  AnalysisOptions analysis;
  std::string elevation = "dem";
  std::string json_path;
  std::string csv_path;
  std::vector<double> category_scale;
};

void add_course_options(CLI::App& cmd, ProfileArgs& a) {
  cmd.add_option("COURSE", a.analysis.course_path,
                 "course file: GPX, GeoJSON, KML, GeoPackage, Shapefile or CSV")
      ->required();
  cmd.add_option("--dem", a.analysis.dem_path, "elevation raster (GeoTIFF, VRT, any GDAL raster)");
  cmd.add_option("--dem-crs", a.analysis.dem.assume_crs,
                 "CRS of a DEM that declares none, e.g. EPSG:32632");
  cmd.add_option("--track", a.analysis.read.track,
                 "track to use when the file holds several (name or 0-based index)");
  cmd.add_flag("--reverse", a.analysis.reverse, "ride the course the other way round");
  cmd.add_option("--crs", a.analysis.crs,
                 "projected CRS for plane geometry (default: transverse Mercator on the course)");
  cmd.add_option("--spacing", a.analysis.spacing_m, "station spacing along the course, metres")
      ->capture_default_str();
  cmd.add_option("--elevation", a.elevation,
                 "heights from: dem, course (the file's own), compare (DEM, and report the file's "
                 "disagreement)")
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
  cmd.add_option("--climb-dip", a.analysis.climbs.hysteresis_m,
                 "a dip shallower than this (m) does not split a climb")
      ->capture_default_str();
  cmd.add_option("--category-scale", a.category_scale,
                 "five lower bounds of the climb score for categories 4,3,2,1,HC "
                 "(score = mean gradient % squared x length km)")
      ->expected(5)
      ->delimiter(',');
}

ElevationSource parse_source(const std::string& s) {
  if (s == "course") return ElevationSource::course;
  if (s == "compare") return ElevationSource::compare;
  return ElevationSource::dem;
}

void apply_scale(ProfileArgs& a) {
  if (a.category_scale.empty()) return;
  auto& s = a.analysis.climbs.scale;
  for (std::size_t i = 1; i < a.category_scale.size(); ++i) {
    if (!(a.category_scale[i] > a.category_scale[i - 1])) {
      fail("", "--category-scale", "the five bounds must increase (category 4 first, HC last)");
    }
  }
  s.cat4_min = a.category_scale[0];
  s.cat3_min = a.category_scale[1];
  s.cat2_min = a.category_scale[2];
  s.cat1_min = a.category_scale[3];
  s.hc_min = a.category_scale[4];
}

int run_profile(ProfileArgs& a, std::ostream& out) {
  a.analysis.elevation_source = parse_source(a.elevation);
  apply_scale(a);
  const CourseAnalysis analysis = analyse_course(a.analysis);
  // Build every output before writing any, so a failure never leaves a partial set.
  const std::string json = profile_summary_json(analysis);
  const bool json_to_stdout = a.json_path == "-";
  if (!json_to_stdout) out << profile_text(analysis);
  if (!a.csv_path.empty()) write_file_atomic(a.csv_path, profile_csv(analysis));
  if (json_to_stdout) {
    out << json;
  } else if (!a.json_path.empty()) {
    write_file_atomic(a.json_path, json);
  }
  if (!json_to_stdout) {
    if (!a.json_path.empty()) out << "Summary written to " << a.json_path << "\n";
    if (!a.csv_path.empty()) out << "Profile written to " << a.csv_path << "\n";
  }
  return 0;
}

struct CheckArgs {
  ProfileArgs profile;
  CheckOptions check;
  std::string condition = "dry";
  std::string road = "open";
  std::string traffic_side = "right";
  double wind_kmh = 0.0;
  double wind_from_deg = 0.0;
  double assist_cutoff_kmh = 25.0;
  double fast_kmh = 60.0;
  std::string start = "08:00";
  std::string out_dir;
};

double parse_clock_s(const std::string& text) {
  const auto colon = text.find(':');
  const auto h = parse_number(text.substr(0, colon));
  const auto m = colon == std::string::npos ? std::optional<double>(0.0) : parse_number(text.substr(colon + 1));
  if (!h || !m || *h < 0 || *h > 23 || *m < 0 || *m >= 60 || std::floor(*h) != *h || std::floor(*m) != *m) {
    fail("", "--start " + text, "give the start time as HH:MM, e.g. 08:30");
  }
  return *h * 3600.0 + *m * 60.0;
}

void add_check_options(CLI::App& cmd, CheckArgs& a) {
  add_course_options(cmd, a.profile);
  cmd.add_option("--riders", a.check.riders_path, "TOML file adding or overriding rider classes");
  cmd.add_option("--classes", a.check.class_names, "rider classes in the field (default: all)")
      ->delimiter(',');
  cmd.add_option("--condition", a.condition, "road surface: dry or wet")
      ->check(CLI::IsMember({"dry", "wet"}))
      ->capture_default_str();
  cmd.add_option("--road", a.road, "closed (riders use the road width) or open (own lane)")
      ->check(CLI::IsMember({"closed", "open"}))
      ->capture_default_str();
  cmd.add_option("--road-width", a.check.road.road_width_m, "usable road width on a closed road, m")
      ->capture_default_str();
  cmd.add_option("--lane-width", a.check.road.lane_width_m, "lane width on an open road, m")
      ->capture_default_str();
  cmd.add_option("--traffic-side", a.traffic_side, "side of the road traffic keeps to: right or left")
      ->check(CLI::IsMember({"right", "left"}))
      ->capture_default_str();
  cmd.add_option("--temperature", a.check.environment.temperature_c, "air temperature, deg C")
      ->capture_default_str();
  cmd.add_option("--wind", a.wind_kmh, "wind speed, km/h")->capture_default_str();
  cmd.add_option("--wind-from", a.wind_from_deg, "direction the wind blows from, deg clockwise from north")
      ->capture_default_str();
  cmd.add_option("--start", a.start, "start time of the first rider, HH:MM")->capture_default_str();
  cmd.add_option("--assist-cutoff", a.assist_cutoff_kmh,
                 "speed at which pedal-assist motors stop helping (legal limit), km/h")
      ->capture_default_str();
  cmd.add_option("--fast-speed", a.fast_kmh, "speed above which a section counts as fast, km/h")
      ->capture_default_str();
  cmd.add_option("--no-terrain-sight", [&a](const std::vector<std::string>&) { a.check.terrain_sight = false; return true; },
                 "check sight over the road's crests only, not over the DEM's terrain")
      ->expected(0);
  cmd.add_flag("--no-reverse-check", [&a](std::int64_t) { a.check.check_reverse = false; },
               "do not also check the course ridden the other way");
  cmd.add_option("--out", a.out_dir, "folder for summary.json and profile.csv (created if needed)");
  cmd.add_option("--json", a.profile.json_path, "write the summary JSON here ('-' = stdout)");
}

void check_finite(double v, const std::string& option, double lo, double hi, const std::string& unit) {
  if (!(std::isfinite(v) && v >= lo && v <= hi)) {
    fail("", option, "must be between " + fmt_fixed(lo, 0) + " and " + fmt_fixed(hi, 0) + " " + unit);
  }
}

void finish_check_options(CheckArgs& a);

int run_check_command(CheckArgs& a, std::ostream& out) {
  finish_check_options(a);
  const CheckOptions& c = a.check;
  const CheckResult result = run_check(c);
  // Build every output before writing any, so a failure never leaves a partial set.
  const std::string json = check_summary_json(result);
  const bool json_to_stdout = a.profile.json_path == "-";
  if (!json_to_stdout) out << check_text(result);
  if (!a.out_dir.empty()) {
    const auto written = write_check_folder(result, a.out_dir);
    if (!json_to_stdout) {
      out << "Report folder: " << a.out_dir << " (";
      for (std::size_t i = 0; i < written.size(); ++i) out << (i ? ", " : "") << written[i];
      out << ")\n";
    }
  }
  if (json_to_stdout) {
    out << json;
  } else if (!a.profile.json_path.empty()) {
    write_file_atomic(a.profile.json_path, json);
  }
  return 0;
}

// Check options and conditions from the parsed arguments into CheckOptions (shared by check
// and compare).
void finish_check_options(CheckArgs& a) {
  a.profile.analysis.elevation_source = parse_source(a.profile.elevation);
  apply_scale(a.profile);
  CheckOptions& c = a.check;
  c.analysis = a.profile.analysis;
  check_finite(c.environment.temperature_c, "--temperature", -30, 50, "deg C");
  check_finite(a.wind_kmh, "--wind", 0, 150, "km/h");
  check_finite(a.wind_from_deg, "--wind-from", 0, 360, "deg");
  check_finite(a.assist_cutoff_kmh, "--assist-cutoff", 5, 60, "km/h");
  check_finite(a.fast_kmh, "--fast-speed", 20, 150, "km/h");
  check_finite(c.road.road_width_m, "--road-width", 2, 30, "m");
  check_finite(c.road.lane_width_m, "--lane-width", 1, 10, "m");
  c.environment.wet = a.condition == "wet";
  c.environment.wind_speed_mps = a.wind_kmh / 3.6;
  c.environment.wind_from_rad = a.wind_from_deg * 3.14159265358979323846 / 180.0;
  c.environment.assist_cutoff_mps = a.assist_cutoff_kmh / 3.6;
  c.environment.start_time_s = parse_clock_s(a.start);
  c.road.closed = a.road == "closed";
  c.road.right_hand_traffic = a.traffic_side == "right";
  c.hazards.fast_speed_mps = a.fast_kmh / 3.6;
}

int run_compare_command(CheckArgs& a, const std::string& other, std::ostream& out) {
  finish_check_options(a);
  CheckOptions first = a.check;
  first.check_reverse = false;
  CheckOptions second = first;
  std::string label_a = first.analysis.course_path, label_b;
  if (other.empty()) {
    if (!first.analysis.reverse) {
      second.analysis.reverse = true;
    } else {
      first.analysis.reverse = false;
    }
    label_a += " (as drawn)";
    label_b = second.analysis.course_path + " (reversed)";
  } else {
    second.analysis.course_path = other;
    label_b = other + (second.analysis.reverse ? " (reversed)" : "");
    if (first.analysis.reverse) label_a += " (reversed)";
  }
  const CheckResult ra = run_check(first);
  const CheckResult rb = run_check(second);
  if (a.profile.json_path == "-") {
    out << compare_json(ra, rb, label_a, label_b);
  } else {
    out << compare_text(ra, rb, label_a, label_b);
    if (!a.profile.json_path.empty()) write_file_atomic(a.profile.json_path, compare_json(ra, rb, label_a, label_b));
  }
  return 0;
}

}  // namespace

int run(const std::vector<std::string>& args, std::ostream& out, std::ostream& err) {
  CLI::App app{
      "coursewarden: vet a proposed cycling event course for difficulty and danger.\n"
      "Advice only: local regulations, the road authority and the event's safety officers decide.",
      "coursewarden"};
  app.require_subcommand(1);
  app.set_version_flag("--version", "coursewarden 0.1.0");

  ProfileArgs profile_args;
  CLI::App* profile = app.add_subcommand(
      "profile", "drape a course on a DEM and report its cleaned profile, gradients and climbs");
  add_course_options(*profile, profile_args);
  profile->add_option("--json", profile_args.json_path, "write the summary JSON here ('-' = stdout)");
  profile->add_option("--csv", profile_args.csv_path, "write one row per station here");

  CheckArgs check_args;
  CLI::App* check = app.add_subcommand(
      "check", "the safety check: profile, rider-class speeds, corners, sight lines and hazards");
  add_check_options(*check, check_args);

  CheckArgs compare_args;
  std::string compare_other;
  CLI::App* compare = app.add_subcommand(
      "compare", "check two courses (or one course both ways with --reverse) side by side");
  add_check_options(*compare, compare_args);
  compare->add_option("OTHER", compare_other, "the second course (omit to compare COURSE with its reverse)");

  std::string riders_file;
  CLI::App* riders = app.add_subcommand("riders", "list the rider classes and their parameters");
  riders->add_option("--riders", riders_file, "TOML file adding or overriding rider classes");

  std::vector<std::string> rest(args.begin() + (args.empty() ? 0 : 1), args.end());
  std::reverse(rest.begin(), rest.end());  // CLI11 takes the arguments in reverse order
  try {
    app.parse(rest);
  } catch (const CLI::ParseError& e) {
    std::ostringstream o, eo;
    const int code = app.exit(e, o, eo);
    out << o.str();
    err << eo.str();
    return code == 0 ? 0 : 2;
  }
  try {
    if (profile->parsed()) return run_profile(profile_args, out);
    if (check->parsed()) return run_check_command(check_args, out);
    if (compare->parsed()) return run_compare_command(compare_args, compare_other, out);
    if (riders->parsed()) {
      const auto classes = riders_file.empty() ? builtin_rider_classes() : load_rider_classes(riders_file);
      out << riders_table_text(classes);
      return 0;
    }
  } catch (const Error& e) {
    err << "coursewarden: " << e.what() << "\n";
    return 1;
  } catch (const std::exception& e) {
    err << "coursewarden: unexpected failure: " << e.what() << "\n";
    return 1;
  }
  return 2;
}

}  // namespace coursewarden::cli
