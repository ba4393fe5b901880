// The folder of outputs of a check.
#include "coursewarden/report_files.hpp"

#include <filesystem>
#include <utility>

#include "coursewarden/check_outputs.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/gis_outputs.hpp"
#include "coursewarden/operations.hpp"
#include "coursewarden/ops_outputs.hpp"
#include "coursewarden/outputs.hpp"

namespace coursewarden {

const std::vector<std::string>& check_folder_files() {
  static const std::vector<std::string> names = {
      "summary.json",  "profile.csv",    "report.html",    "hazards.csv",
      "hazards.geojson", "hazards.gpx", "course.geojson", "climbs.geojson",
      "schedule.csv",  "marshal-plan.csv", "marshal-plan.gpx"};
  return names;
}

std::vector<std::string> write_check_folder(const CheckResult& result, const std::string& dir,
                                            const ReportInfo& info) {
  namespace fs = std::filesystem;
  // Everything is built before anything is written, in the order of check_folder_files().
  const Operations ops = plan_operations(result);
  std::vector<std::pair<std::string, std::string>> files = {
      {"summary.json", check_summary_json(result)},
      {"profile.csv", check_profile_csv(result)},
      {"report.html", report_html(result, ops, info)},
      {"hazards.csv", hazards_csv(result)},
      {"hazards.geojson", hazards_geojson(result)},
      {"hazards.gpx", hazards_gpx(result)},
      {"course.geojson", course_geojson(result)},
      {"climbs.geojson", climbs_geojson(result)},
  };
  files.emplace_back("schedule.csv", schedule_csv(ops.schedule));
  files.emplace_back("marshal-plan.csv", marshal_plan_csv(ops.marshal_plan));
  files.emplace_back("marshal-plan.gpx", marshal_plan_gpx(result, ops.marshal_plan));
  std::error_code ec;
  if (fs::exists(dir, ec) && !fs::is_directory(dir, ec)) {
    fail(dir, "--out", "exists and is not a folder; give a folder for the outputs");
  }
  fs::create_directories(dir, ec);
  if (!fs::is_directory(dir, ec)) fail(dir, "--out", "cannot create this folder; check the path and permissions");
  std::vector<std::string> written;
  std::vector<std::pair<std::string, std::string>> targets;
  for (auto& [name, content] : files) {
    targets.emplace_back((fs::path(dir) / name).string(), std::move(content));
    written.push_back(name);
  }
  write_files_atomic(targets);
  return written;
}

std::vector<std::string> write_check_folder(const CheckResult& result, const std::string& dir) {
  ReportInfo info;
  info.check_date = utc_date_today();
  return write_check_folder(result, dir, info);
}

}  // namespace coursewarden
