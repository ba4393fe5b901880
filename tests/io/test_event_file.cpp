// The event file: reading, errors with line numbers, command-line overrides, batches.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <sstream>

#include "cli/options.hpp"
#include "cli/run.hpp"
#include "coursewarden/batch.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/event_file.hpp"
#include "support/support.hpp"

using namespace coursewarden;

namespace {

const std::string kSample = std::string(COURSEWARDEN_SOURCE_DIR) + "/sample_courses/ronde-orvalune";

void expect_error(const std::string& path, std::initializer_list<std::string> parts) {
  try {
    load_event_file(path);
    FAIL() << "expected an error";
  } catch (const Error& e) {
    const std::string msg = e.what();
    EXPECT_EQ(msg.find('\n'), std::string::npos);
    for (const auto& p : parts) EXPECT_NE(msg.find(p), std::string::npos) << "'" << p << "' in: " << msg;
  }
}

int run_cli(std::vector<std::string> args, std::string& out, std::string& err) {
  args.insert(args.begin(), "coursewarden");
  std::ostringstream o, e;
  const int code = cli::run(args, o, e);
  out = o.str();
  err = e.str();
  return code;
}

}  // namespace

TEST(EventFile, TheInitExampleReadsBackWithPathsResolvedAgainstTheFile) {
  cwtest::TempDir dir;
  std::filesystem::create_directories(dir.path() / "events");
  const std::string path = dir.file("events/spring.toml");
  cwtest::write_text(path, example_event_file("../c/course.gpx", "../c/dem.tif", "Spring \"Hills\" Ride"));
  const EventFile ev = load_event_file(path);
  EXPECT_EQ(ev.name, "Spring \"Hills\" Ride");
  EXPECT_EQ(ev.date, "2027-06-13");
  EXPECT_EQ(ev.course_path, (dir.path() / "c/course.gpx").lexically_normal().string());
  EXPECT_EQ(ev.dem_path, (dir.path() / "c/dem.tif").lexically_normal().string());
  ASSERT_EQ(ev.waves.size(), 2u);
  EXPECT_DOUBLE_EQ(ev.waves[1].start_time_s, 8 * 3600 + 20 * 60);  // "08:20"
  EXPECT_EQ(ev.waves[0].classes, (std::vector<std::string>{"racer", "fast-club"}));
  ASSERT_EQ(ev.weather.size(), 2u);
  EXPECT_TRUE(ev.weather[1].wet);
  EXPECT_NEAR(ev.weather[0].wind_speed_mps, 10.0 / 3.6, 1e-12);
  ASSERT_EQ(ev.checkpoints.size(), 2u);
  EXPECT_DOUBLE_EQ(ev.checkpoints[1].checkpoint.at_m, 45000.0);
  EXPECT_DOUBLE_EQ(ev.checkpoints[1].checkpoint.cutoff_time_s, 12.5 * 3600);
  EXPECT_DOUBLE_EQ(ev.rules.time_limit_s, 7 * 3600.0);
  EXPECT_DOUBLE_EQ(ev.rules.marshal_lead_s, 15 * 60.0);
}

TEST(EventFile, MistakesAreNamedWithFileLineAndKey) {
  cwtest::TempDir dir;
  const std::string f = dir.file("e.toml");
  cwtest::write_text(f, "[event]\ncourse = \"c.gpx\"\ncolour = \"red\"\n");
  expect_error(f, {"e.toml", "line 3", "event.colour", "unknown key"});
  cwtest::write_text(f, "[event]\ncourse = \"c.gpx\"\n\n[[start]]\ntime = \"8h30\"\n");
  expect_error(f, {"line 5", "start.time", "HH:MM"});
  cwtest::write_text(f, "[event]\ncourse = \"c.gpx\"\n[rules]\nclosing_speed_kmh = 900\n");
  expect_error(f, {"line 4", "rules.closing_speed_kmh", "between"});
  cwtest::write_text(f, "[event]\ncourse = \"c.gpx\"\n[road]\nstate = \"shut\"\n");
  expect_error(f, {"line 4", "road.state", "\"closed\" or \"open\""});
  cwtest::write_text(f, "[event]\nname = \"x\"\n");
  expect_error(f, {"event.course", "missing"});
  cwtest::write_text(f, "[event\ncourse = 1\n");
  expect_error(f, {"e.toml", "line 1", "TOML"});
  cwtest::write_text(f, "[event]\ncourse = \"c.gpx\"\n[[checkpoint]]\nname = \"feed\"\n");
  expect_error(f, {"line 3", "checkpoint", "at_km"});
  expect_error(dir.file("missing.toml"), {"missing.toml", "not found"});
}

TEST(EventFile, CheckRunsEveryScenarioAndTheCommandLineWins) {
  cwtest::TempDir dir;
  const std::string f = dir.file("ronde.toml");
  cwtest::write_text(f, "[event]\nname = \"Test ride\"\ncourse = \"" + kSample + "/course.gpx\"\ndem = \"" + kSample +
                            "/dem.tif\"\n[field]\nclasses = [\"club\", \"racer\"]\n[[weather]]\nname = \"wet\"\n"
                            "condition = \"wet\"\ntemperature_c = 9\n");
  std::string out, err;
  ASSERT_EQ(run_cli({"check", f, "--no-reverse-check", "--json", "-"}, out, err), 0) << err;
  auto j = nlohmann::json::parse(out);
  EXPECT_EQ(j["conditions"]["surface"], "wet");
  EXPECT_DOUBLE_EQ(j["conditions"]["temperature_c"].get<double>(), 9.0);
  ASSERT_EQ(j["riders"].size(), 2u);
  // The command line overrides the file.
  ASSERT_EQ(run_cli({"check", f, "--no-reverse-check", "--condition", "dry", "--classes", "elite", "--json", "-"}, out, err), 0)
      << err;
  j = nlohmann::json::parse(out);
  EXPECT_EQ(j["conditions"]["surface"], "dry");
  ASSERT_EQ(j["riders"].size(), 1u);
  EXPECT_EQ(j["riders"][0]["name"], "elite");
}

TEST(Batch, DuplicateInputsGiveTheSameResultsAsSequentialRunsAndErrorsDoNotStopOthers) {
  CheckOptions o;
  o.analysis.course_path = kSample + "/course.gpx";
  o.analysis.dem_path = kSample + "/dem.tif";
  o.check_reverse = false;
  CheckOptions bad = o;
  bad.analysis.course_path = kSample + "/no-such-course.gpx";
  const std::vector<BatchItem> items = {{"a", "a", o}, {"bad", "bad", bad}, {"b", "b", o}, {"c", "c", o}};
  const auto parallel = run_batch(items, 2);
  const CheckResult sequential = run_check(o);
  ASSERT_EQ(parallel.size(), 4u);
  EXPECT_FALSE(parallel[1].result.has_value());
  EXPECT_NE(parallel[1].error.find("no-such-course.gpx"), std::string::npos);
  for (std::size_t k : {0u, 2u, 3u}) {
    ASSERT_TRUE(parallel[k].result.has_value()) << parallel[k].error;
    const CheckResult& r = *parallel[k].result;
    EXPECT_EQ(r.analysis.profile.elevation_m, sequential.analysis.profile.elevation_m);
    ASSERT_EQ(r.hazards.size(), sequential.hazards.size());
    for (std::size_t h = 0; h < r.hazards.size(); ++h) {
      EXPECT_EQ(r.hazards[h].at_m, sequential.hazards[h].at_m);
      EXPECT_EQ(r.hazards[h].severity, sequential.hazards[h].severity);
      EXPECT_EQ(r.hazards[h].reason, sequential.hazards[h].reason);
    }
    for (std::size_t c = 0; c < r.speeds.size(); ++c) {
      EXPECT_EQ(r.speeds[c].planned_speed_mps, sequential.speeds[c].planned_speed_mps);
    }
  }
  const std::string csv = batch_csv(parallel);
  EXPECT_NE(csv.find("no-such-course.gpx"), std::string::npos);
  EXPECT_EQ(csv.rfind("rank,course,", 0), 0u);
}

TEST(Batch, CliBatchWritesAFolderPerCourseAndARankedTable) {
  cwtest::TempDir dir;
  std::string out, err;
  const int code = run_cli({"check", kSample + "/course.gpx", dir.file("nothing.gpx"), "--dem", kSample + "/dem.tif",
                            "--no-reverse-check", "--jobs", "2", "--out", dir.file("out")},
                           out, err);
  EXPECT_EQ(code, 1);  // one input failed
  EXPECT_NE(err.find("nothing.gpx: file not found"), std::string::npos) << err;
  EXPECT_NE(out.find("Batch: 2 checks"), std::string::npos);
  EXPECT_TRUE(std::filesystem::exists(dir.file("out/course/summary.json")));
  EXPECT_TRUE(std::filesystem::exists(dir.file("out/batch.csv")));
  EXPECT_NE(out.find("safety officers"), std::string::npos);
}

TEST(EventFile, InitWritesAnExampleAndRefusesToOverwrite) {
  cwtest::TempDir dir;
  std::string out, err;
  const std::string target = dir.file("my.toml");
  ASSERT_EQ(run_cli({"init", kSample + "/course.gpx", "--dem", kSample + "/dem.tif", "--output", target}, out, err), 0) << err;
  const EventFile ev = load_event_file(target);
  EXPECT_TRUE(std::filesystem::exists(ev.course_path)) << ev.course_path;
  EXPECT_TRUE(std::filesystem::exists(ev.dem_path)) << ev.dem_path;
  EXPECT_EQ(run_cli({"init", kSample + "/course.gpx", "--output", target}, out, err), 1);
  EXPECT_NE(err.find("--force"), std::string::npos);
}

TEST(EventFile, WavesAndCheckpointsReachTheScheduleMarshalPlanAndGrading) {
  cwtest::TempDir dir;
  const std::string f = dir.file("ops.toml");
  cwtest::write_text(f, "[event]\nname = \"Ops test\"\ncourse = \"" + kSample + "/course.gpx\"\ndem = \"" + kSample +
                            "/dem.tif\"\n[field]\nclasses = [\"club\", \"racer\"]\n"
                            "[[start]]\nname = \"A\"\ntime = \"08:00\"\nclasses = [\"racer\"]\n"
                            "[[start]]\nname = \"B\"\ntime = \"08:30\"\nclasses = [\"club\"]\n"
                            "[[checkpoint]]\nname = \"col\"\nkind = \"cut-off\"\nat_km = 39.7\ncutoff = \"09:30\"\n"
                            "[rules]\ntime_limit_h = 6\n");
  std::string out, err;
  ASSERT_EQ(run_cli({"check", f, "--no-reverse-check", "--json", "-"}, out, err), 0) << err;
  const auto j = nlohmann::json::parse(out);
  EXPECT_EQ(j["event"]["name"], "Ops test");
  nlohmann::json col;
  for (const auto& row : j["schedule"])
    if (row["label"] == "col") col = row;
  ASSERT_FALSE(col.is_null());
  EXPECT_EQ(col["earliest_class"], "racer");
  EXPECT_EQ(col["latest_class"], "club");
  // Rough arrival at km 39.7 from each class's whole-course time (riders[].time_s) pro rata:
  // racer about 08:00 + 0.58 x 1 h 54 = 09:06, club about 08:30 + 0.58 x 2 h 31 = 09:58 (derived
  // from the summary's own times); with a 09:30 cut-off only the club misses it.
  for (const auto& rider : j["riders"]) {
    const double start = rider["name"] == "racer" ? 8 * 3600.0 : 8.5 * 3600.0;
    const double eta = start + rider["time_s"].get<double>() * 39700.0 / j["length_m"].get<double>();
    EXPECT_GT(std::abs(eta - 9.5 * 3600.0), 600.0) << "premise: not within 10 min of the cut-off";
  }
  EXPECT_EQ(col["classes_missing_cutoff"], nlohmann::json::array({"club"}));
  EXPECT_FALSE(j["marshal_plan"]["posts"].empty());
  EXPECT_GE(j["marshal_plan"]["marshals_needed"].get<int>(), static_cast<int>(j["marshal_plan"]["posts"].size()));
  ASSERT_EQ(j["grading"]["classes"].size(), 2u);
  for (const auto& g : j["grading"]["classes"]) {
    if (g["name"] == "club") EXPECT_EQ(g["verdict"], "unsuitable");  // misses the cut-off
  }
  EXPECT_GE(j["grading"]["course"]["level"].get<int>(), 1);
}

TEST(EventFile, RoadSectionsAreMirroredWhenTheCourseIsRidden) {
  // A closed-road section over the designed switchbacks (features.csv km 41.86-43.65): the
  // hairpins get the closed-road path radius both ways round.
  cwtest::TempDir dir;
  const std::string f = dir.file("sec.toml");
  cwtest::write_text(f, "[event]\ncourse = \"" + kSample + "/course.gpx\"\ndem = \"" + kSample +
                            "/dem.tif\"\n[road]\nstate = \"open\"\n[[road.section]]\nfrom_km = 41.5\nto_km = 44.0\n"
                            "state = \"closed\"\n");
  CheckOptions fwd;
  cli::CheckArgs a;
  cli::apply_event(a, load_event_file(f), nullptr);
  cli::finish_check_options(a);
  fwd = a.check;
  fwd.check_reverse = false;
  CheckOptions back = fwd;
  back.analysis.reverse = true;
  const CheckResult rf = run_check(fwd), rb = run_check(back);
  auto hairpin_radii = [](const CheckResult& r) {
    std::vector<double> out;
    for (std::size_t k = 0; k < r.corners.size(); ++k)
      if (r.corners[k].hairpin) out.push_back(r.path_radius_m[k]);
    std::sort(out.begin(), out.end());
    return out;
  };
  const auto f_radii = hairpin_radii(rf), b_radii = hairpin_radii(rb);
  ASSERT_EQ(f_radii.size(), 6u);
  ASSERT_EQ(b_radii.size(), 6u);
  // Closed road: every hairpin gets the same road-width path (no lane side to keep to).
  for (std::size_t i = 0; i < 6; ++i) EXPECT_NEAR(f_radii[i], b_radii[i], 0.5);
  EXPECT_NEAR(f_radii.front(), f_radii.back(), 0.5);
}

TEST(Batch, TwoInputsWithTheSameNameGetTheirOwnFolders) {
  cwtest::TempDir dir;
  std::filesystem::create_directories(dir.path() / "a");
  std::filesystem::create_directories(dir.path() / "b");
  std::filesystem::copy_file(kSample + "/course.gpx", dir.file("a/course.gpx"));
  std::filesystem::copy_file(kSample + "/course.gpx", dir.file("b/course.gpx"));
  std::string out, err;
  ASSERT_EQ(run_cli({"check", dir.file("a/course.gpx"), dir.file("b/course.gpx"), "--dem", kSample + "/dem.tif",
                     "--no-reverse-check", "--out", dir.file("out")},
                    out, err),
            0)
      << err;
  EXPECT_TRUE(std::filesystem::exists(dir.file("out/course/report.html")));
  EXPECT_TRUE(std::filesystem::exists(dir.file("out/course-2/report.html")));
}
