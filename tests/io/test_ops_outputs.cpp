// Files of the event operations: schedule.csv and marshal-plan.csv headers and values,
// marshal-plan.gpx read back with GDAL/OGR's GPX driver, clock formatting and the terminal width.
#include <gtest/gtest.h>

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include <sstream>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/grading.hpp"
#include "coursewarden/marshal_plan.hpp"
#include "coursewarden/ops_outputs.hpp"
#include "coursewarden/schedule.hpp"
#include "support/support.hpp"

namespace coursewarden {
namespace {

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) out.push_back(line);
  return out;
}

// 12 km, stations every 500 m, fast at 10 m/s and slow at 5 m/s; a hazard needing 2 marshals at
// km 2 and a 90 deg turn at km 5.
CheckResult hand_course() {
  CheckResult r;
  r.analysis.course.name = "Boucle des Essarts";
  for (double x = 0.0; x <= 12000.0 + 1e-9; x += 500.0) {
    r.analysis.profile.distance_m.push_back(x);
    r.analysis.profile.elevation_m.push_back(400.0 + x / 100.0);
    Station s;
    s.distance_m = x;
    s.lon_deg = 5.0 + x / 100000.0;
    s.lat_deg = 44.5;
    r.analysis.stations.push_back(s);
  }
  for (const auto& [name, v] : std::vector<std::pair<std::string, double>>{{"fast", 10.0}, {"slow", 5.0}}) {
    RiderClass c;
    c.name = name;
    r.classes.push_back(c);
    SpeedProfile sp;
    sp.class_name = name;
    for (double x : r.analysis.profile.distance_m) sp.elapsed_s.push_back(x / v);
    r.speeds.push_back(sp);
  }
  Hazard h;
  h.number = 1;
  h.kind = HazardKind::fast_section;
  h.severity = Severity::serious;
  h.at_m = 2000.0;
  h.end_m = 2800.0;
  h.peak_speed_mps = 20.0;
  h.marshals = 2;
  h.section_classes = {"fast"};
  h.lon_deg = 5.02;
  h.lat_deg = 44.5;
  r.hazards = {h};
  Corner c;
  c.entry_m = 5000.0;
  c.apex_m = 5010.0;
  c.apex_station = 10;
  c.deflection_rad = 3.14159265358979323846 / 2.0;
  c.direction = TurnDirection::right;
  r.corners = {c};
  return r;
}

EventOps two_waves() {
  EventOps ops;
  ops.waves = {{"A", 8.0 * 3600.0, {}}, {"B, late", 8.0 * 3600.0 + 1200.0, {"slow"}}};
  ops.checkpoints = {{"Feed, village hall", "feed", 6000.0, 31500.0}};
  ops.rules.closing_speed_mps = 4.0;
  return ops;
}

}  // namespace

TEST(OpsOutputs, ClockTimesAreHoursMinutesSecondsPastMidnight) {
  EXPECT_EQ(clock_hms(30600.0), "08:30:00");    // derived: 8.5 h x 3600
  EXPECT_EQ(clock_hms(29100.4), "08:05:00");    // rounded to the second
  EXPECT_EQ(clock_hms(90000.0), "25:00:00");    // derived: 25 h, next day
  EXPECT_EQ(clock_hms(-600.0), "-00:10:00");
  EXPECT_EQ(clock_hms(std::numeric_limits<double>::quiet_NaN()), "");
}

TEST(OpsOutputs, ScheduleCsvHasItsHeaderAndHandComputedTimes) {
  const CheckResult r = hand_course();
  const Schedule s = make_schedule(r, two_waves());
  const auto lines = lines_of(schedule_csv(s));
  ASSERT_FALSE(lines.empty());
  EXPECT_EQ(lines[0],
            "kind,label,at_m,km,earliest,earliest_s,earliest_class,earliest_wave,latest,latest_s,"
            "latest_class,latest_wave,closing,closing_s,closure_open,closure_open_s,closure_close,"
            "closure_close_s,latest_behind_closing,cutoff,cutoff_s,slowest_makes_cutoff,"
            "classes_missing_cutoff");
  EXPECT_EQ(lines.size(), s.rows.size() + 1);
  // derived: km 3: first 28800 + 300 = 29100 s (08:05:00, fast, A); last 30000 + 600 = 30600 s
  // (08:30:00, slow, late wave); closing 30000 + 750 = 30750 s (08:32:30).
  // Rows: header, km 0, km 1, km 2, the hazard at km 2, km 3, ...
  EXPECT_EQ(lines[5],
            "km,km 3,3000.0,3.000,08:05:00,29100,fast,A,08:30:00,30600,slow,\"B, late\",08:32:30,"
            "30750,07:35:00,27300,08:42:30,31350,false,,,true,");
  // derived: feed at 6000 m: slow in B arrives 30000 + 1200 = 31200 s, before 08:45:00 (31500 s).
  bool found = false;
  for (const auto& l : lines) {
    if (l.rfind("checkpoint,\"Feed, village hall\",6000.0,", 0) == 0) {
      found = true;
      EXPECT_NE(l.find(",08:45:00,31500,true,"), std::string::npos) << l;
    }
  }
  EXPECT_TRUE(found);
}

TEST(OpsOutputs, MarshalPlanCsvHasItsHeaderAndOneRowPerPost) {
  const CheckResult r = hand_course();
  const EventOps ops = two_waves();
  const MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  const auto lines = lines_of(marshal_plan_csv(plan));
  ASSERT_EQ(lines.size(), 3u);  // derived: header, hazard post at km 2, turn post at km 5
  EXPECT_EQ(lines[0],
            "post,sector,km,at_m,first_m,last_m,marshals,lon,lat,not_before,on_post,on_post_s,"
            "earliest_pass,earliest_pass_s,closing,closing_s,off_post,off_post_s,hazards,"
            "corner_indices,warn");
  // derived: M01 at 2000 m: first rider 28800 + 200 = 29000 s; on post 15 min before = 28100 s
  // (07:48:20); not before 30 min before = 27200 s (07:33:20); closing 30000 + 500 = 30500 s,
  // off 15 min after = 31400 s (08:43:20).
  EXPECT_EQ(lines[1].rfind("M01,Sector 1,2.000,2000.0,2000.0,2000.0,2,5.0200000,44.5000000,07:33:20,"
                           "07:48:20,28100,08:03:20,29000,08:28:20,30500,08:43:20,31400,1,,",
                           0),
            0u)
      << lines[1];
  EXPECT_NE(lines[2].find(",,0,Turn right 90 deg: direct riders"), std::string::npos) << lines[2];
}

TEST(OpsOutputs, MarshalPlanGpxIsReadBackByGdalWithEscapedText) {
  const CheckResult r = hand_course();
  const EventOps ops = two_waves();
  MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  plan.posts[0].warn = "Cattle grid & gravel <slow down> \"here\"";
  cwtest::TempDir dir;
  const std::string path = dir.file("marshal-plan.gpx");
  cwtest::write_text(path, marshal_plan_gpx(r, plan));

  GDALAllRegister();
  const char* drivers[] = {"GPX", nullptr};
  GDALDataset* ds = static_cast<GDALDataset*>(
      GDALOpenEx(path.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY, drivers, nullptr, nullptr));
  ASSERT_NE(ds, nullptr) << "GDAL could not read the GPX file";
  OGRLayer* wpts = ds->GetLayerByName("waypoints");
  ASSERT_NE(wpts, nullptr);
  EXPECT_EQ(wpts->GetFeatureCount(), 2);
  wpts->ResetReading();
  OGRFeature* f = wpts->GetNextFeature();
  ASSERT_NE(f, nullptr);
  EXPECT_STREQ(f->GetFieldAsString("name"), "M01 (2)");
  const std::string desc = f->GetFieldAsString("desc");
  EXPECT_EQ(desc.rfind("Cattle grid & gravel <slow down> \"here\". On post 07:48:20", 0), 0u) << desc;
  EXPECT_NE(desc.find("off post 08:43:20"), std::string::npos) << desc;
  const OGRPoint* p = f->GetGeometryRef()->toPoint();
  EXPECT_NEAR(p->getX(), 5.02, 1e-7);
  EXPECT_NEAR(p->getY(), 44.5, 1e-7);
  EXPECT_NEAR(f->GetFieldAsDouble("ele"), 420.0, 1e-6);  // derived: 400 + 2000 / 100
  OGRFeature::DestroyFeature(f);
  f = wpts->GetNextFeature();
  ASSERT_NE(f, nullptr);
  EXPECT_STREQ(f->GetFieldAsString("name"), "M02 (1)");
  OGRFeature::DestroyFeature(f);
  GDALClose(ds);
}

TEST(OpsOutputs, TerminalTextFitsHundredColumnsAndNamesPostsAndGrade) {
  CheckResult r = hand_course();
  r.speeds[1].walking_sections = {{7000.0, 7400.0}};
  r.speeds[1].longest_walking_m = 400.0;
  EventOps ops = two_waves();
  ops.checkpoints[0].name = "A very long checkpoint name that would never fit in its column";
  const Schedule s = make_schedule(r, ops);
  const MarshalPlan plan = make_marshal_plan(r, ops, s);
  const Grading g = grade_course(r, ops, s);
  const std::string text = operations_text(s, plan, g);
  for (const auto& line : lines_of(text)) EXPECT_LE(line.size(), 100u) << line;
  EXPECT_NE(text.find("M01"), std::string::npos);
  EXPECT_NE(text.find("unsuitable"), std::string::npos);
  EXPECT_NE(text.find("level " + std::to_string(g.course.level) + " of 5"), std::string::npos);
}

}  // namespace coursewarden
