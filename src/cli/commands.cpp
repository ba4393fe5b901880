#include "cli/commands.hpp"

#include <filesystem>
#include <map>
#include <memory>
#include <ostream>

#include "cli/progress.hpp"
#include "coursewarden/batch.hpp"
#include "coursewarden/check_outputs.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/outputs.hpp"
#include "coursewarden/report_files.hpp"
#include "util/text.hpp"

namespace coursewarden::cli {
namespace {

void attach_progress(CheckOptions& options, Progress* p, const std::string& label) {
  if (!p) return;
  options.progress = [p, label](const std::string& what) { p->step(label.empty() ? what : label + ": " + what); };
}

bool is_event_file(const std::string& path) {
  const std::string ext = std::filesystem::path(path).extension().string();
  return ext == ".toml" || ext == ".TOML";
}

// The check options for one input: event file (and scenario) first, the command line on top.
CheckArgs args_for(const std::vector<std::string>& subcommand_args, const EventFile* event,
                   const WeatherScenario* weather, const std::string& course) {
  CheckArgs a;
  if (event) apply_event(a, *event, weather);
  CLI::App app;
  add_check_options(app, a);
  std::vector<std::string> ignored;
  app.add_option("INPUTS", ignored);
  app.add_option("--jobs", a.jobs);
  std::vector<std::string> rest(subcommand_args.rbegin(), subcommand_args.rend());
  app.parse(rest);  // already parsed once successfully: cannot fail here
  if (!event) a.profile.analysis.course_path = course;
  finish_check_options(a);
  return a;
}

std::vector<BatchItem> batch_items(const CheckArgs& parsed, const std::vector<std::string>& subcommand_args) {
  std::vector<BatchItem> items;
  for (const std::string& input : parsed.inputs) {
    const std::string stem = std::filesystem::path(input).stem().string();
    if (!is_event_file(input)) {
      items.push_back({input, slugify(stem), args_for(subcommand_args, nullptr, nullptr, input).check});
      continue;
    }
    const EventFile ev = load_event_file(input);
    if (ev.weather.empty()) {
      items.push_back({input, slugify(stem), args_for(subcommand_args, &ev, nullptr, "").check});
    }
    for (const WeatherScenario& w : ev.weather) {
      const std::string label = ev.weather.size() > 1 ? input + " (" + w.name + ")" : input;
      const std::string slug = slugify(ev.weather.size() > 1 ? stem + "-" + w.name : stem);
      items.push_back({label, slug, args_for(subcommand_args, &ev, &w, "").check});
    }
  }
  // Report folders must not collide (two inputs called course.gpx): number repeated names.
  std::map<std::string, int> seen;
  for (BatchItem& item : items) {
    const int n = ++seen[item.slug];
    if (n > 1) item.slug += "-" + std::to_string(n);
  }
  return items;
}

void write_outputs(const CheckResult& result, const std::string& dir, std::ostream& out, bool quiet) {
  const auto written = write_check_folder(result, dir);
  if (quiet) return;
  std::string files;
  for (std::size_t i = 0; i < written.size(); ++i) files += (i ? ", " : "") + written[i];
  out << "Report folder: " << dir << "\n" << word_wrap("Files: " + files, 96);
}

}  // namespace

int run_profile(ProfileArgs& a, std::ostream& out) {
  finish_profile_options(a);
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

int run_check_command(CheckArgs& parsed, const std::vector<std::string>& subcommand_args, std::ostream& out,
                      std::ostream& err, Progress* progress) {
  std::vector<BatchItem> items = batch_items(parsed, subcommand_args);
  for (BatchItem& item : items) attach_progress(item.options, progress, items.size() > 1 ? item.label : "");
  const bool json_to_stdout = parsed.profile.json_path == "-";
  if (items.size() == 1) {
    const CheckResult result = run_check(items.front().options);
    // Build every output before writing any, so a failure never leaves a partial set.
    const std::string json = check_summary_json(result);
    if (!json_to_stdout) out << check_text(result);
    if (!parsed.out_dir.empty()) write_outputs(result, parsed.out_dir, out, json_to_stdout);
    if (json_to_stdout) {
      out << json;
    } else if (!parsed.profile.json_path.empty()) {
      write_file_atomic(parsed.profile.json_path, json);
    }
    return 0;
  }

  // A batch: every item runs, errors are reported one line each, a ranked table closes.
  if (json_to_stdout || !parsed.profile.json_path.empty()) {
    fail("", "--json", "a batch writes one summary.json per course: use --out DIR instead");
  }
  const std::vector<BatchOutcome> outcomes = run_batch(items, parsed.jobs);
  bool failed = false;
  for (const BatchOutcome& o : outcomes) {
    if (!o.result) {
      err << "coursewarden: " << o.label << ": " << o.error << "\n";
      failed = true;
      continue;
    }
    if (!parsed.out_dir.empty()) {
      try {
        write_check_folder(*o.result, (std::filesystem::path(parsed.out_dir) / o.slug).string());
      } catch (const Error& e) {
        err << "coursewarden: " << o.label << ": " << e.what() << "\n";
        failed = true;
      }
    }
  }
  out << batch_text(outcomes);
  if (!parsed.out_dir.empty()) {
    const std::string path = (std::filesystem::path(parsed.out_dir) / "batch.csv").string();
    std::error_code ec;
    std::filesystem::create_directories(parsed.out_dir, ec);
    write_file_atomic(path, batch_csv(outcomes));
    out << "Batch table: " << path << "; one report folder per check under " << parsed.out_dir << "\n";
  }
  out << "\n" << word_wrap(kDisclaimer, 96);
  return failed ? 1 : 0;
}

int run_compare_command(CheckArgs& a, const std::string& first_course, const std::string& other, std::ostream& out) {
  a.profile.analysis.course_path = first_course;
  finish_check_options(a);
  CheckOptions first = a.check;
  first.check_reverse = false;
  CheckOptions second = first;
  std::string label_a = first.analysis.course_path, label_b;
  if (other.empty()) {
    second.analysis.reverse = !first.analysis.reverse;
    label_a += first.analysis.reverse ? " (reversed)" : " (as drawn)";
    label_b = second.analysis.course_path + (second.analysis.reverse ? " (reversed)" : " (as drawn)");
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

int run_init_command(const std::string& course, const std::string& dem, const std::string& output,
                     const std::string& name, bool force, std::ostream& out) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (!fs::exists(course, ec)) fail(course, "", "course file not found; check the path");
  const fs::path target = output.empty() ? fs::path(course).replace_extension(".event.toml") : fs::path(output);
  if (fs::exists(target, ec) && !force) {
    fail(target.string(), "", "already exists; choose another name with --output or replace it with --force");
  }
  const fs::path folder = target.has_parent_path() ? target.parent_path() : fs::path(".");
  auto relative = [&folder](const std::string& p) {
    if (p.empty()) return std::string();
    std::error_code e;
    const fs::path rel = fs::relative(fs::absolute(p, e), fs::absolute(folder, e), e);
    return (e || rel.empty()) ? p : rel.generic_string();
  };
  const std::string event_name = name.empty() ? fs::path(course).stem().string() : name;
  write_file_atomic(target.string(), example_event_file(relative(course), relative(dem), event_name));
  out << "Event file written to " << target.string() << "; edit it, then run: coursewarden check "
      << target.string() << " --out report\n";
  return 0;
}

}  // namespace coursewarden::cli
