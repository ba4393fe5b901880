// coursewarden command line: parses options, calls the library, prints and writes outputs.
#include "cli/run.hpp"

#include <CLI/CLI.hpp>

#include <exception>
#include <iostream>
#include <map>
#include <sstream>

#include "coursewarden/analysis.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/outputs.hpp"
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
