// coursewarden command line: parses options and dispatches to the subcommands.
#include "cli/run.hpp"

#include <CLI/CLI.hpp>

#include <algorithm>
#include <exception>
#include <ostream>
#include <sstream>

#include "cli/commands.hpp"
#include "cli/options.hpp"
#include "cli/progress.hpp"
#include "coursewarden/error.hpp"
#include "io/riders_output.hpp"

namespace coursewarden::cli {

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
  profile->add_option("COURSE", profile_args.analysis.course_path,
                      "course file: GPX, GeoJSON, KML, GeoPackage, Shapefile or CSV")
      ->required();
  add_course_options(*profile, profile_args);
  profile->add_option("--json", profile_args.json_path, "write the summary JSON here ('-' = stdout)");
  profile->add_option("--csv", profile_args.csv_path, "write one row per station here");

  CheckArgs check_args;
  CLI::App* check = app.add_subcommand(
      "check", "the safety check: profile, rider-class speeds, corners, sight lines and hazards");
  check->add_option("INPUTS", check_args.inputs,
                    "course files and/or event files (.toml); several make a batch")
      ->required();
  add_check_options(*check, check_args);
  check->add_option("--jobs", check_args.jobs, "checks to run at once in a batch (default: one per core)");

  CheckArgs compare_args;
  std::string compare_first, compare_other;
  CLI::App* compare = app.add_subcommand(
      "compare", "check two courses (or one course both ways) side by side");
  compare->add_option("COURSE", compare_first, "the first course")->required();
  compare->add_option("OTHER", compare_other, "the second course (omit to compare COURSE with its reverse)");
  add_check_options(*compare, compare_args);

  std::string riders_file;
  CLI::App* riders = app.add_subcommand("riders", "list the rider classes and their parameters");
  riders->add_option("--riders", riders_file, "TOML file adding or overriding rider classes");

  std::string init_course, init_dem, init_output, init_name;
  bool init_force = false;
  CLI::App* init = app.add_subcommand("init", "write a commented example event file next to a course");
  init->add_option("COURSE", init_course, "the course file")->required();
  init->add_option("--dem", init_dem, "the elevation raster to name in the file");
  init->add_option("--output", init_output, "event file to write (default: COURSE with .event.toml)");
  init->add_option("--name", init_name, "event name (default: the course file's name)");
  init->add_flag("--force", init_force, "replace an existing event file");

  std::vector<std::string> rest(args.begin() + (args.empty() ? 0 : 1), args.end());
  std::vector<std::string> reversed(rest.rbegin(), rest.rend());  // CLI11 takes them reversed
  try {
    app.parse(reversed);
  } catch (const CLI::ParseError& e) {
    std::ostringstream o, eo;
    const int code = app.exit(e, o, eo);
    out << o.str();
    err << eo.str();
    return code == 0 ? 0 : 2;
  }
  Progress progress(err, Progress::for_terminal(err));
  try {
    if (profile->parsed()) return run_profile(profile_args, out);
    if (check->parsed()) {
      const auto at = std::find(rest.begin(), rest.end(), "check");
      const std::vector<std::string> subcommand_args(at == rest.end() ? rest.end() : at + 1, rest.end());
      return run_check_command(check_args, subcommand_args, out, err, &progress);
    }
    if (compare->parsed()) return run_compare_command(compare_args, compare_first, compare_other, out);
    if (init->parsed()) return run_init_command(init_course, init_dem, init_output, init_name, init_force, out);
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
