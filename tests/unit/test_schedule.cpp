// Schedule: pass times of the first and last groups and of the closing vehicle, closure windows
// and cut-offs on a course built by hand with constant speeds, so every time is computed by hand.
#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/event.hpp"
#include "coursewarden/schedule.hpp"

namespace coursewarden {
namespace {

constexpr double kA_s = 8.0 * 3600.0;           // wave A: 08:00:00 = 28800 s
constexpr double kB_s = 8.0 * 3600.0 + 1200.0;  // wave B: 08:20:00 = 30000 s

// A 12 km course with a station every 1000 m and one class per entry, whose ride time to d is
// elapsed(d). Only what the schedule reads is filled in.
CheckResult hand_course(const std::vector<std::pair<std::string, std::function<double(double)>>>& classes,
                        double length_m = 12000.0, double spacing_m = 1000.0) {
  CheckResult r;
  auto& d = r.analysis.profile.distance_m;
  for (double x = 0.0; x <= length_m + 1e-9; x += spacing_m) {
    d.push_back(x);
    Station s;
    s.distance_m = x;
    s.lon_deg = 6.0 + x / 100000.0;
    s.lat_deg = 45.0;
    r.analysis.stations.push_back(s);
    r.analysis.profile.elevation_m.push_back(500.0);
  }
  for (const auto& [name, elapsed] : classes) {
    RiderClass c;
    c.name = name;
    r.classes.push_back(c);
    SpeedProfile sp;
    sp.class_name = name;
    for (double x : d) sp.elapsed_s.push_back(elapsed(x));
    sp.total_time_s = sp.elapsed_s.back();
    r.speeds.push_back(sp);
  }
  return r;
}

// fast rides 10 m/s, slow 5 m/s, everywhere.
CheckResult two_class_course() {
  return hand_course({{"fast", [](double d) { return d / 10.0; }}, {"slow", [](double d) { return d / 5.0; }}});
}

// Wave A at 08:00 with both classes, wave B at 08:20 with slow only; closing vehicle 4 m/s.
EventOps two_waves() {
  EventOps ops;
  ops.waves = {{"A", kA_s, {}}, {"B", kB_s, {"slow"}}};
  ops.rules.closing_speed_mps = 4.0;
  return ops;
}

const ScheduleRow& row_labelled(const Schedule& s, const std::string& label) {
  for (const auto& r : s.rows)
    if (r.label == label) return r;
  ADD_FAILURE() << "no row " << label;
  return s.rows.front();
}

Hazard hazard_at(int number, double at_m) {
  Hazard h;
  h.number = number;
  h.kind = HazardKind::corner_too_fast;
  h.severity = Severity::serious;
  h.at_m = at_m;
  h.end_m = at_m + 20.0;
  return h;
}

}  // namespace

TEST(Schedule, KilometreRowGivesFirstAndLastGroupAndClosingVehicleComputedByHand) {
  const CheckResult r = two_class_course();
  const Schedule s = make_schedule(r, two_waves());
  const ScheduleRow& km3 = row_labelled(s, "km 3");
  EXPECT_EQ(km3.kind, ScheduleKind::km);
  EXPECT_DOUBLE_EQ(km3.at_m, 3000.0);
  // derived: first = wave A + 3000 m / 10 m/s = 28800 + 300 = 29100 s (08:05:00), class fast.
  EXPECT_NEAR(km3.earliest_s, 29100.0, 1e-9);
  EXPECT_EQ(km3.earliest_class, "fast");
  EXPECT_EQ(km3.earliest_wave, "A");
  // derived: last = wave B + 3000 / 5 = 30000 + 600 = 30600 s (08:30:00), class slow in B.
  EXPECT_NEAR(km3.latest_s, 30600.0, 1e-9);
  EXPECT_EQ(km3.latest_class, "slow");
  EXPECT_EQ(km3.latest_wave, "B");
  // derived: closing vehicle = last start + 3000 / 4 = 30000 + 750 = 30750 s.
  EXPECT_NEAR(km3.closing_s, 30750.0, 1e-9);
  // derived: closure 29100 - 30 min = 27300 s; 30750 + 10 min = 31350 s (default margins).
  EXPECT_NEAR(km3.closure_open_s, 27300.0, 1e-9);
  EXPECT_NEAR(km3.closure_close_s, 31350.0, 1e-9);
  EXPECT_FALSE(km3.latest_behind_closing);  // derived: 5 m/s is faster than the 4 m/s vehicle
}

TEST(Schedule, HazardBetweenStationsIsInterpolatedInDistance) {
  // A class riding 10 m/s to km 6 and 2.5 m/s after it: ride time is linear between stations.
  CheckResult r = hand_course({{"climber", [](double d) { return d <= 6000.0 ? d / 10.0 : 600.0 + (d - 6000.0) / 2.5; }}});
  r.hazards = {hazard_at(1, 7500.0)};
  EventOps ops;
  ops.waves = {{"solo", kA_s, {}}};
  const Schedule s = make_schedule(r, ops);
  const ScheduleRow& h = row_labelled(s, "H01 Corner reached too fast (serious)");
  EXPECT_EQ(h.kind, ScheduleKind::hazard);
  EXPECT_EQ(h.hazard_number, 1);
  // derived: 600 s to km 6, then 1500 m / 2.5 m/s = 600 s: 28800 + 1200 = 30000 s.
  EXPECT_NEAR(h.earliest_s, 30000.0, 1e-9);
  EXPECT_NEAR(h.latest_s, 30000.0, 1e-9);
  // derived: closing vehicle at the default 15 km/h: 7500 m / (15 / 3.6 m/s) = 1800 s.
  EXPECT_NEAR(h.closing_s, kA_s + 1800.0, 1e-9);
  EXPECT_NEAR(elapsed_at_s(r.analysis.profile.distance_m, r.speeds[0], 7500.0), 1200.0, 1e-9);
}

TEST(Schedule, RowsAreInCourseOrderWithKilometresFirstOnTies) {
  CheckResult r = two_class_course();
  r.hazards = {hazard_at(1, 3000.0), hazard_at(2, 3000.5)};
  EventOps ops = two_waves();
  ops.checkpoints = {{"Feed", "feed", 3000.0}};
  const Schedule s = make_schedule(r, ops);
  // derived: km 0..11 (12 rows) + 1 checkpoint + 2 hazards + finish.
  ASSERT_EQ(s.rows.size(), 16u);
  for (std::size_t k = 1; k < s.rows.size(); ++k) EXPECT_LE(s.rows[k - 1].at_m, s.rows[k].at_m);
  EXPECT_EQ(s.rows[3].label, "km 3");
  EXPECT_EQ(s.rows[4].kind, ScheduleKind::checkpoint);
  EXPECT_EQ(s.rows[5].hazard_number, 1);
  EXPECT_EQ(s.rows[6].hazard_number, 2);
  EXPECT_EQ(s.rows.back().kind, ScheduleKind::finish);
  EXPECT_DOUBLE_EQ(s.rows.back().at_m, 12000.0);
  // derived: finish last = 30000 + 12000 / 5 = 32400 s; closing = 30000 + 12000 / 4 = 33000 s.
  EXPECT_NEAR(s.rows.back().latest_s, 32400.0, 1e-9);
  EXPECT_NEAR(s.rows.back().closing_s, 33000.0, 1e-9);
}

TEST(Schedule, GroupsListEveryClassOfEveryWaveWithItsFinish) {
  const Schedule s = make_schedule(two_class_course(), two_waves());
  ASSERT_EQ(s.groups.size(), 3u);  // derived: A has fast and slow, B has slow
  EXPECT_EQ(s.groups[2].wave_name, "B");
  EXPECT_EQ(s.groups[2].class_name, "slow");
  EXPECT_NEAR(s.groups[2].finish_s, 32400.0, 1e-9);  // derived: 30000 + 12000 / 5
  EXPECT_NEAR(s.groups[0].finish_s, 30000.0, 1e-9);  // derived: 28800 + 12000 / 10
  EXPECT_DOUBLE_EQ(s.first_start_s, kA_s);
  EXPECT_DOUBLE_EQ(s.last_start_s, kB_s);
}

TEST(Schedule, CutOffMissedOnlyByTheClassArrivingLate) {
  EventOps ops = two_waves();
  // derived: at km 10 slow in B arrives 30000 + 2000 = 32000 s, slow in A 28800 + 2000 = 30800 s,
  // fast in A 28800 + 1000 = 29800 s. A cut-off at 08:45:00 (31500 s) is missed by slow in B only.
  ops.checkpoints = {{"Col", "cut-off", 10000.0, 31500.0}, {"Feed", "feed", 6000.0, 32400.0}};
  const Schedule s = make_schedule(two_class_course(), ops);
  const ScheduleRow& col = row_labelled(s, "Col");
  EXPECT_DOUBLE_EQ(col.cutoff_s, 31500.0);
  ASSERT_EQ(col.classes_missing_cutoff.size(), 1u);
  EXPECT_EQ(col.classes_missing_cutoff[0], "slow");
  EXPECT_FALSE(col.slowest_makes_cutoff);
  EXPECT_EQ(col.checkpoint_kind, "cut-off");
  // derived: at km 6 the last group arrives 30000 + 1200 = 31200 s, before 32400 s.
  const ScheduleRow& feed = row_labelled(s, "Feed");
  EXPECT_TRUE(feed.classes_missing_cutoff.empty());
  EXPECT_TRUE(feed.slowest_makes_cutoff);
}

TEST(Schedule, ArrivingExactlyAtTheCutOffMakesIt) {
  EventOps ops = two_waves();
  ops.checkpoints = {{"Col", "cut-off", 10000.0, 32000.0}};  // derived: slow in B arrives 32000 s
  const ScheduleRow& col = row_labelled(make_schedule(two_class_course(), ops), "Col");
  EXPECT_TRUE(col.classes_missing_cutoff.empty());
}

TEST(Schedule, TimeLimitAtTheFinishHoldsEachGroupToItsOwnWaveStart) {
  EventOps ops = two_waves();
  ops.rules.time_limit_s = 2300.0;  // derived: slow needs 12000 / 5 = 2400 s > 2300; fast 1200 s
  const Schedule s = make_schedule(two_class_course(), ops);
  const ScheduleRow& fin = s.rows.back();
  EXPECT_NEAR(fin.cutoff_s, kB_s + 2300.0, 1e-9);  // derived: last start + limit
  ASSERT_EQ(fin.classes_missing_cutoff.size(), 1u);
  EXPECT_EQ(fin.classes_missing_cutoff[0], "slow");
  ops.rules.time_limit_s = 2400.0;  // derived: exactly the slow class's ride time
  EXPECT_TRUE(make_schedule(two_class_course(), ops).rows.back().classes_missing_cutoff.empty());
}

TEST(Schedule, ClassSlowerThanTheClosingVehicleIsFlaggedBehindIt) {
  EventOps ops = two_waves();
  ops.rules.closing_speed_mps = 6.0;  // derived: slow (5 m/s) in the last wave falls behind at once
  const Schedule s = make_schedule(two_class_course(), ops);
  EXPECT_FALSE(s.rows.front().latest_behind_closing);  // derived: km 0, both at 30000 s
  // derived: km 1: slow 30200 s, vehicle 30000 + 1000 / 6 = 30166.7 s: 33 s, within the 2 min grace.
  EXPECT_FALSE(row_labelled(s, "km 1").latest_behind_closing);
  // derived: km 5: slow 31000 s, vehicle 30833.3 s: 167 s behind, beyond the grace.
  EXPECT_TRUE(row_labelled(s, "km 5").latest_behind_closing);
}

TEST(Schedule, NoWavesMeansOneMassStartAtTheCheckStartTime) {
  CheckResult r = two_class_course();
  r.environment.start_time_s = 9.0 * 3600.0;
  const Schedule s = make_schedule(r, EventOps{});
  ASSERT_EQ(s.waves.size(), 1u);
  EXPECT_EQ(s.waves[0].classes.size(), 2u);
  // derived: 32400 + 5000 / 10 = 32900 s; last 32400 + 5000 / 5 = 33400 s.
  EXPECT_NEAR(row_labelled(s, "km 5").earliest_s, 32900.0, 1e-9);
  EXPECT_NEAR(row_labelled(s, "km 5").latest_s, 33400.0, 1e-9);
}

TEST(Schedule, RefusesAWaveNamingAClassNotInTheField) {
  EventOps ops = two_waves();
  ops.source = "event.toml";
  ops.waves[1].classes = {"tandem"};
  try {
    make_schedule(two_class_course(), ops);
    FAIL() << "expected an error";
  } catch (const Error& e) {
    const std::string m = e.what();
    EXPECT_NE(m.find("event.toml"), std::string::npos) << m;
    EXPECT_NE(m.find("'B'"), std::string::npos) << m;
    EXPECT_NE(m.find("tandem"), std::string::npos) << m;
  }
}

TEST(Schedule, RefusesAFieldClassThatStartsInNoWave) {
  EventOps ops;
  ops.waves = {{"A", kA_s, {"fast"}}};
  EXPECT_THROW(make_schedule(two_class_course(), ops), Error);
}

TEST(Schedule, RefusesCheckpointsOffTheCourseOrCutOffsWithoutATime) {
  EventOps ops = two_waves();
  ops.checkpoints = {{"Far", "feed", 12500.0}};
  EXPECT_THROW(make_schedule(two_class_course(), ops), Error);
  ops.checkpoints = {{"Col", "cut-off", 5000.0}};
  EXPECT_THROW(make_schedule(two_class_course(), ops), Error);
  ops.checkpoints = {{"Col", "lunch", 5000.0}};
  EXPECT_THROW(make_schedule(two_class_course(), ops), Error);
}

TEST(Schedule, RefusesRulesOutOfRange) {
  EventOps ops = two_waves();
  ops.rules.closing_speed_mps = 0.0;
  EXPECT_THROW(make_schedule(two_class_course(), ops), Error);
  ops = two_waves();
  ops.rules.marshal_lead_s = 40.0 * 60.0;  // more than the 30 min maximum
  EXPECT_THROW(make_schedule(two_class_course(), ops), Error);
}

}  // namespace coursewarden
