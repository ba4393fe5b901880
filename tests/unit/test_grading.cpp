// Grading for clubs: each threshold of the class verdicts at its boundary (time limit, cut-off
// margin, walking length, critical hazards, closing vehicle) and the five-level course scale.
// All thresholds are our own assumptions (docs/operations.md); the expected verdicts follow from
// the rules as documented, on a course built by hand with constant speeds.
#include <gtest/gtest.h>

#include <algorithm>
#include <functional>
#include <set>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/event.hpp"
#include "coursewarden/grading.hpp"
#include "coursewarden/schedule.hpp"

namespace coursewarden {
namespace {

constexpr double kStart_s = 8.0 * 3600.0;  // 08:00:00

// 12 km, stations every 500 m, one class per entry with ride time elapsed(d).
CheckResult hand_course(const std::vector<std::pair<std::string, std::function<double(double)>>>& classes) {
  CheckResult r;
  for (double x = 0.0; x <= 12000.0 + 1e-9; x += 500.0) {
    r.analysis.profile.distance_m.push_back(x);
    Station s;
    s.distance_m = x;
    r.analysis.stations.push_back(s);
  }
  for (const auto& [name, elapsed] : classes) {
    RiderClass c;
    c.name = name;
    r.classes.push_back(c);
    SpeedProfile sp;
    sp.class_name = name;
    for (double x : r.analysis.profile.distance_m) sp.elapsed_s.push_back(elapsed(x));
    sp.total_time_s = sp.elapsed_s.back();
    r.speeds.push_back(sp);
  }
  return r;
}

// One class at 5 m/s: 12000 m in 2400 s, always ahead of the 15 km/h closing vehicle.
CheckResult steady() { return hand_course({{"steady", [](double d) { return d / 5.0; }}}); }

EventOps mass_start() {
  EventOps ops;
  ops.waves = {{"all", kStart_s, {}}};
  return ops;
}

ClassGrade grade_one(const CheckResult& r, const EventOps& ops) {
  const Grading g = grade_course(r, ops, make_schedule(r, ops));
  EXPECT_EQ(g.classes.size(), 1u);
  return g.classes.front();
}

Suitability verdict_with_time_limit(double limit_s) {
  EventOps ops = mass_start();
  ops.rules.time_limit_s = limit_s;
  ops.rules.demanding_time_share = 0.75;  // exact in binary, so the boundary is exact
  return grade_one(steady(), ops).verdict;
}

Suitability verdict_with_cutoff(double cutoff_s) {
  EventOps ops = mass_start();
  ops.checkpoints = {{"Col", "cut-off", 6000.0, cutoff_s}};
  return grade_one(steady(), ops).verdict;
}

Suitability verdict_with_walking(std::vector<DistanceRange> sections) {
  CheckResult r = steady();
  r.speeds[0].walking_sections = sections;
  for (const auto& w : sections) r.speeds[0].longest_walking_m = std::max(r.speeds[0].longest_walking_m, w.end_m - w.start_m);
  return grade_one(r, mass_start()).verdict;
}

Hazard corner_hazard(int number, const std::string& cls, Severity severity, bool beyond_braking = true) {
  Hazard h;
  h.number = number;
  h.kind = HazardKind::corner_too_fast;
  h.at_m = 1000.0 * number;
  h.severity = severity;
  ClassAtCorner a;
  a.class_name = cls;
  a.too_fast = true;
  a.severity = severity;
  a.room_m = 100.0;
  a.braking_distance_hard_m = beyond_braking ? 150.0 : 60.0;
  h.classes.push_back(a);
  return h;
}

Suitability verdict_with_hazards(const std::vector<Severity>& severities, bool beyond_braking = true) {
  CheckResult r = steady();
  int n = 0;
  for (Severity s : severities) r.hazards.push_back(corner_hazard(++n, "steady", s, beyond_braking));
  return grade_one(r, mass_start()).verdict;
}

}  // namespace

TEST(GradingTime, UsingAtMostTheShareOfTheLimitIsSuitable) {
  // derived: ride time 12000 m / 5 m/s = 2400 s = 0.75 x 3200 s: not above the share.
  EXPECT_EQ(verdict_with_time_limit(3200.0), Suitability::suitable);
  EXPECT_EQ(verdict_with_time_limit(3199.0), Suitability::demanding);  // 2400 > 0.75 x 3199
}

TEST(GradingTime, FinishingExactlyAtTheLimitIsDemandingAndOverItUnsuitable) {
  EXPECT_EQ(verdict_with_time_limit(2400.0), Suitability::demanding);   // derived: 2400 = limit
  EXPECT_EQ(verdict_with_time_limit(2399.0), Suitability::unsuitable);  // derived: 2400 > limit
  EventOps ops = mass_start();
  ops.rules.time_limit_s = 2399.0;
  const ClassGrade g = grade_one(steady(), ops);
  ASSERT_EQ(g.missed_cutoffs.size(), 1u);
  EXPECT_EQ(g.missed_cutoffs[0], "finish");
  ASSERT_FALSE(g.reasons.empty());
  EXPECT_NE(g.reasons[0].text.find("0h40"), std::string::npos) << g.reasons[0].text;
}

TEST(GradingCutOff, ArrivingAtLeastTheMarginBeforeIsSuitable) {
  // derived: arrival at 6000 m = 28800 + 1200 = 30000 s; margin 15 min = 900 s.
  EXPECT_EQ(verdict_with_cutoff(30900.0), Suitability::suitable);
  EXPECT_EQ(verdict_with_cutoff(30899.0), Suitability::demanding);
}

TEST(GradingCutOff, ArrivingAtTheCutOffIsDemandingAndAfterItUnsuitable) {
  EXPECT_EQ(verdict_with_cutoff(30000.0), Suitability::demanding);   // derived: arrives at it
  EXPECT_EQ(verdict_with_cutoff(29999.0), Suitability::unsuitable);  // derived: 1 s late
  EventOps ops = mass_start();
  ops.checkpoints = {{"Col", "cut-off", 6000.0, 29999.0}};
  const ClassGrade g = grade_one(steady(), ops);
  ASSERT_EQ(g.missed_cutoffs.size(), 1u);
  EXPECT_EQ(g.missed_cutoffs[0], "Col");
}

TEST(GradingWalking, AnyWalkingIsDemandingAndMoreThanTheLimitUnsuitable) {
  EXPECT_EQ(verdict_with_walking({}), Suitability::suitable);
  EXPECT_EQ(verdict_with_walking({{1000.0, 1120.0}, {4000.0, 4050.0}}), Suitability::demanding);
  EXPECT_EQ(verdict_with_walking({{1000.0, 1300.0}}), Suitability::demanding);   // 300 m = limit
  EXPECT_EQ(verdict_with_walking({{1000.0, 1301.0}}), Suitability::unsuitable);  // 301 m > 300 m
}

TEST(GradingHazards, SeriousOrOneCriticalIsDemandingAndTwoUnrescuableCriticalUnsuitable) {
  EXPECT_EQ(verdict_with_hazards({Severity::caution, Severity::caution}), Suitability::suitable);
  EXPECT_EQ(verdict_with_hazards({Severity::serious}), Suitability::demanding);
  EXPECT_EQ(verdict_with_hazards({Severity::critical, Severity::serious}), Suitability::demanding);
  EXPECT_EQ(verdict_with_hazards({Severity::critical, Severity::critical}), Suitability::unsuitable);
  // Critical corners the class could still rescue with its hardest braking only make it demanding.
  EXPECT_EQ(verdict_with_hazards({Severity::critical, Severity::critical}, false), Suitability::demanding);
}

TEST(GradingHazards, HazardsNotListingTheClassDoNotCount) {
  CheckResult r = steady();
  r.hazards = {corner_hazard(1, "other", Severity::critical), corner_hazard(2, "other", Severity::critical)};
  EXPECT_EQ(grade_one(r, mass_start()).verdict, Suitability::suitable);
}

TEST(GradingHazards, SeverityForAClassFollowsWhatTheHazardSaysOfIt) {
  Hazard h = corner_hazard(1, "novice", Severity::serious);
  ClassAtCorner hidden;
  hidden.class_name = "club";
  hidden.hidden = true;
  h.classes.push_back(hidden);
  EXPECT_EQ(severity_for_class(h, "novice"), Severity::serious);
  EXPECT_EQ(severity_for_class(h, "club"), Severity::caution);  // sees it late, not too fast
  EXPECT_EQ(severity_for_class(h, "elite"), Severity::none);
  h.kind = HazardKind::hidden_corner;
  EXPECT_EQ(severity_for_class(h, "club"), Severity::serious);
  Hazard fast;
  fast.kind = HazardKind::fast_section;
  fast.severity = Severity::serious;
  fast.section_classes = {"elite"};
  EXPECT_EQ(severity_for_class(fast, "elite"), Severity::serious);
}

TEST(GradingClosingVehicle, FinishingMoreThanTheGraceBehindItIsUnsuitable) {
  // derived: 3.75 m/s is slower than 15 km/h: 3200 s against 12000 / (15 / 3.6) = 2880 s,
  // 320 s behind, more than the 2 min grace.
  const CheckResult r = hand_course({{"slowest", [](double d) { return d / 3.75; }}});
  EXPECT_EQ(grade_one(r, mass_start()).verdict, Suitability::unsuitable);
}

TEST(GradingClosingVehicle, GapsUpToTheGraceAreNoFinding) {
  // Closing vehicle at 4 m/s: 12000 m in 3000 s. A class needing d/4 + d/100 is d/100 behind:
  // derived: 120 s at the finish, exactly the grace; d/96 gives 125 s, beyond it.
  EventOps ops = mass_start();
  ops.rules.closing_speed_mps = 4.0;
  const CheckResult within = hand_course({{"edge", [](double d) { return d / 4.0 + d / 100.0; }}});
  EXPECT_EQ(grade_one(within, ops).verdict, Suitability::suitable);
  const CheckResult beyond = hand_course({{"edge", [](double d) { return d / 4.0 + d / 96.0; }}});
  EXPECT_EQ(grade_one(beyond, ops).verdict, Suitability::unsuitable);
}

TEST(GradingClosingVehicle, FallingBehindOnTheWayButFinishingAheadIsDemanding) {
  // 3 m/s to km 6 (2000 s), then 10 m/s (600 s): closing vehicle at 4 m/s passes km 6 at
  // 1500 s (derived: 500 s ahead of the class) and the finish at 3000 s (class: 2600 s).
  const CheckResult r = hand_course({{"diesel", [](double d) { return d <= 6000.0 ? d / 3.0 : 2000.0 + (d - 6000.0) / 10.0; }}});
  EventOps ops = mass_start();
  ops.rules.closing_speed_mps = 4.0;
  const ClassGrade g = grade_one(r, ops);
  EXPECT_EQ(g.verdict, Suitability::demanding);
  ASSERT_EQ(g.reasons.size(), 1u);
  EXPECT_NE(g.reasons[0].text.find("km 6.0"), std::string::npos) << g.reasons[0].text;
}

TEST(GradingCourse, ScaleHasFiveLevelsWithDistinctNames) {
  const auto scale = course_grade_scale();
  ASSERT_EQ(scale.size(), 5u);
  std::set<std::string> names;
  for (std::size_t k = 0; k < scale.size(); ++k) {
    EXPECT_EQ(scale[k].level, static_cast<int>(k) + 1);
    names.insert(scale[k].name);
    if (k > 0) {
      EXPECT_LT(scale[k].min_fit_share, scale[k - 1].min_fit_share);
    }
  }
  EXPECT_EQ(names.size(), 5u);
}

TEST(GradingCourse, EachLevelBoundaryOfTheFitShare) {
  // fit share = (suitable + demanding / 2) / classes; derived values in the comments.
  EXPECT_EQ(course_grade_for(4, 0, 0).level, 1);  // 1
  EXPECT_EQ(course_grade_for(3, 1, 0).level, 2);  // 7/8
  EXPECT_EQ(course_grade_for(3, 0, 1).level, 2);  // 6/8 = 3/4, on the boundary
  EXPECT_EQ(course_grade_for(2, 1, 1).level, 3);  // 5/8
  EXPECT_EQ(course_grade_for(2, 0, 2).level, 3);  // 4/8 = 1/2, on the boundary
  EXPECT_EQ(course_grade_for(1, 1, 2).level, 4);  // 3/8
  EXPECT_EQ(course_grade_for(1, 0, 3).level, 4);  // 2/8 = 1/4, on the boundary
  EXPECT_EQ(course_grade_for(0, 1, 3).level, 5);  // 1/8
  EXPECT_EQ(course_grade_for(0, 0, 4).level, 5);  // 0
  EXPECT_DOUBLE_EQ(course_grade_for(2, 1, 1).fit_share, 0.625);
  EXPECT_THROW(course_grade_for(0, 0, 0), Error);
}

TEST(GradingCourse, CountsTheVerdictsOfTheField) {
  // steady: suitable; walker: 400 m walk (unsuitable); careful: one serious hazard (demanding).
  CheckResult r = hand_course({{"steady", [](double d) { return d / 5.0; }},
                               {"walker", [](double d) { return d / 4.5; }},
                               {"careful", [](double d) { return d / 5.0; }}});
  r.speeds[1].walking_sections = {{2000.0, 2400.0}};
  r.speeds[1].longest_walking_m = 400.0;
  r.hazards = {corner_hazard(1, "careful", Severity::serious)};
  const EventOps ops = mass_start();
  const Grading g = grade_course(r, ops, make_schedule(r, ops));
  ASSERT_EQ(g.classes.size(), 3u);
  EXPECT_EQ(g.classes[0].verdict, Suitability::suitable);
  EXPECT_EQ(g.classes[1].verdict, Suitability::unsuitable);
  EXPECT_EQ(g.classes[2].verdict, Suitability::demanding);
  EXPECT_EQ(g.classes[2].serious_hazards, 1);
  EXPECT_EQ(g.course.suitable, 1);
  EXPECT_EQ(g.course.demanding, 1);
  EXPECT_EQ(g.course.unsuitable, 1);
  EXPECT_EQ(g.course.level, 3);  // derived: (1 + 1/2) / 3 = 1/2
}

}  // namespace coursewarden
