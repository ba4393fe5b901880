// Marshal plan: which places get posts, how close posts merge, counts, numbering, shift times
// (French sport code lead and release by default), peaks and sectors, on a course built by hand.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/event.hpp"
#include "coursewarden/marshal_plan.hpp"
#include "coursewarden/schedule.hpp"

namespace coursewarden {
namespace {

constexpr double kDeg = std::numbers::pi / 180.0;
constexpr double kA_s = 8.0 * 3600.0;           // wave A 08:00:00
constexpr double kB_s = 8.0 * 3600.0 + 1200.0;  // wave B 08:20:00

// 12 km, stations every 100 m, fast at 10 m/s and slow at 5 m/s.
CheckResult hand_course() {
  CheckResult r;
  for (double x = 0.0; x <= 12000.0 + 1e-9; x += 100.0) {
    r.analysis.profile.distance_m.push_back(x);
    r.analysis.profile.elevation_m.push_back(300.0);
    Station s;
    s.distance_m = x;
    s.lon_deg = 6.0 + x / 100000.0;
    s.lat_deg = 45.0;
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
  return r;
}

EventOps two_waves() {
  EventOps ops;
  ops.waves = {{"A", kA_s, {}}, {"B", kB_s, {"slow"}}};
  ops.rules.closing_speed_mps = 4.0;
  return ops;
}

Hazard hazard(int number, double at_m, int marshals, Severity severity) {
  Hazard h;
  h.number = number;
  h.kind = HazardKind::steep_descent;
  h.severity = severity;
  h.at_m = at_m;
  h.end_m = at_m + 600.0;
  h.steepest_pct = -11.0;
  h.marshals = marshals;
  h.lon_deg = 6.0 + at_m / 100000.0;
  h.lat_deg = 45.0;
  return h;
}

Corner corner(double entry_m, double deflection_deg) {
  Corner c;
  c.entry_m = entry_m;
  c.apex_m = entry_m + 10.0;
  c.exit_m = entry_m + 20.0;
  c.apex_station = static_cast<std::size_t>(std::lround(c.apex_m / 100.0));
  c.direction = TurnDirection::left;
  c.deflection_rad = deflection_deg * kDeg;
  c.turn_radius_m = 15.0;
  return c;
}

// A serious hazard (2 marshals) at 2000 m with a junction turn 100 m later; a hazard (1 marshal)
// at 5000 m with a junction turn 300 m later; a bend of 45 deg and a hazard needing no marshal.
CheckResult course_with_posts() {
  CheckResult r = hand_course();
  r.hazards = {hazard(1, 2000.0, 2, Severity::serious), hazard(2, 5000.0, 1, Severity::serious),
               hazard(3, 8000.0, 0, Severity::caution)};
  r.corners = {corner(2100.0, 90.0), corner(5300.0, 75.0), corner(9000.0, 45.0)};
  return r;
}

}  // namespace

TEST(MarshalPlan, CandidatesAreMarshalledHazardsAndJunctionTypeTurns) {
  const auto c = post_candidates(course_with_posts(), two_waves());
  // derived: hazards 1 and 2 (hazard 3 asks for no marshal), turns at 2100 and 5300 (90 and 75
  // deg >= 60 deg); the 45 deg bend is not a junction-type turn.
  ASSERT_EQ(c.size(), 4u);
  EXPECT_DOUBLE_EQ(c[0].at_m, 2000.0);
  EXPECT_DOUBLE_EQ(c[1].at_m, 2100.0);
  EXPECT_TRUE(c[1].turn);
  EXPECT_EQ(c[1].count, 1);  // OperationsRules::marshals_per_turn default
  EXPECT_DOUBLE_EQ(c[3].at_m, 5300.0);
}

TEST(MarshalPlan, TurnOfExactlySixtyDegreesIsJunctionType) {
  CheckResult r = hand_course();
  r.corners = {corner(1000.0, 60.0), corner(3000.0, 59.9)};
  const auto c = post_candidates(r, two_waves());
  ASSERT_EQ(c.size(), 1u);
  EXPECT_DOUBLE_EQ(c[0].at_m, 1000.0);
}

TEST(MarshalPlan, PostsHundredMetresApartMergeAndThreeHundredApartDoNot) {
  const CheckResult r = course_with_posts();
  const EventOps ops = two_waves();
  const MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  ASSERT_EQ(plan.posts.size(), 3u);
  EXPECT_EQ(plan.posts[0].code, "M01");
  EXPECT_EQ(plan.posts[1].code, "M02");
  EXPECT_EQ(plan.posts[2].code, "M03");
  // derived: hazard 1 (2) and the turn 100 m on (1) merge; 100 m > 50 m spread adds one: 3.
  EXPECT_EQ(plan.posts[0].count, 3);
  EXPECT_DOUBLE_EQ(plan.posts[0].at_m, 2000.0);  // the member asking for most marshals
  EXPECT_DOUBLE_EQ(plan.posts[0].spread_m, 100.0);
  ASSERT_EQ(plan.posts[0].hazards.size(), 1u);
  EXPECT_EQ(plan.posts[0].hazards[0], 1);
  ASSERT_EQ(plan.posts[0].turns.size(), 1u);
  EXPECT_EQ(plan.posts[0].turns[0], 0u);
  // The hazard's warning comes before the turn's.
  EXPECT_EQ(plan.posts[0].warn, "Steep descent: -11.0 %, 0.6 km long (serious); turn left 90 deg: direct riders");
  // derived: 5000 and 5300 are 300 m apart, more than 150 m: two posts of one marshal each.
  EXPECT_EQ(plan.posts[1].count, 1);
  EXPECT_EQ(plan.posts[2].count, 1);
  EXPECT_EQ(plan.marshals_needed, 5);  // derived: 3 + 1 + 1
}

TEST(MarshalPlan, MergedPostWithinTheSpreadLimitKeepsTheLargestCount) {
  std::vector<PostCandidate> c(2);
  c[0].at_m = 1000.0;
  c[0].count = 2;
  c[1].at_m = 1040.0;
  c[1].count = 1;
  const auto posts = merge_candidates(c, OperationsRules{});
  ASSERT_EQ(posts.size(), 1u);
  EXPECT_EQ(posts[0].count, 2);  // derived: max(2, 1); 40 m spread <= 50 m adds nobody
}

TEST(MarshalPlan, MergedTurnsShareOneWarningAndATurnAtAHazardOnlyAddsDirections) {
  CheckResult r = hand_course();
  r.corners = {corner(1000.0, 90.0), corner(1080.0, 75.0), corner(4000.0, 120.0)};
  r.corners[1].direction = TurnDirection::right;
  Hazard h = hazard(1, 4000.0, 2, Severity::critical);
  h.kind = HazardKind::corner_too_fast;
  h.corner = 2;
  r.hazards = {h};
  const EventOps ops = two_waves();
  const MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  ASSERT_EQ(plan.posts.size(), 2u);
  EXPECT_EQ(plan.posts[0].warn, "Turn left 90 deg, then right 75 deg: direct riders");
  EXPECT_EQ(plan.posts[1].warn, "Corner reached too fast: left 120 deg (critical); direct riders");
  EXPECT_EQ(plan.posts[1].count, 2);  // derived: max(2, 1), both members at 4000 m
}

TEST(MarshalPlan, MergingIsMeasuredFromThePostsFirstMember) {
  // Candidates every 100 m: each is within 150 m of its neighbour, but a post reaches only
  // 150 m from its first member, so 0/100 share a post, 200/300 the next, 400 the third.
  std::vector<PostCandidate> c(5);
  for (std::size_t k = 0; k < c.size(); ++k) {
    c[k].at_m = 100.0 * static_cast<double>(k);
    c[k].count = 1;
  }
  const auto posts = merge_candidates(c, OperationsRules{});
  ASSERT_EQ(posts.size(), 3u);
  EXPECT_DOUBLE_EQ(posts[1].first_m, 200.0);
  EXPECT_DOUBLE_EQ(posts[2].first_m, 400.0);
}

TEST(MarshalPlan, ShiftTimesFollowTheLeadAndReleaseRule) {
  const CheckResult r = course_with_posts();
  const EventOps ops = two_waves();
  const MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  const MarshalPost& m1 = plan.posts[0];
  // derived: first rider at 2000 m = 28800 + 200 = 29000 s; on post 15 min before = 28100 s,
  // not before 30 min before = 27200 s (Code du sport A331-37 to A331-40 defaults).
  EXPECT_NEAR(m1.earliest_pass_s, 29000.0, 1e-9);
  EXPECT_NEAR(m1.on_post_s, 28100.0, 1e-9);
  EXPECT_NEAR(m1.not_before_s, 27200.0, 1e-9);
  // derived: closing vehicle at the last member (2100 m) = 30000 + 2100 / 4 = 30525 s; released
  // 15 min after it = 31425 s.
  EXPECT_NEAR(m1.closing_s, 30525.0, 1e-9);
  EXPECT_NEAR(m1.off_post_s, 31425.0, 1e-9);
}

TEST(MarshalPlan, PeakCountsPostsAndMarshalsOnDutyTogether) {
  const CheckResult r = course_with_posts();
  const EventOps ops = two_waves();
  const MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  // derived: shifts M01 [28100, 31425), M02 [28800 + 500 - 900 = 28400, 30000 + 1250 + 900 =
  // 32150), M03 [28430, 32225): all three overlap from 28430 s: 3 posts, 3 + 1 + 1 marshals.
  EXPECT_EQ(plan.peak_posts, 3);
  EXPECT_EQ(plan.peak_marshals, 5);
  EXPECT_NEAR(plan.peak_at_s, 28430.0, 1e-9);
}

TEST(MarshalPlan, PeakOverlapTreatsShiftsAsHalfOpen) {
  // derived: [0,10) [5,15) [10,20): two at once from 5 s; at 10 s one ends as one starts.
  EXPECT_EQ(peak_overlap({0, 5, 10}, {10, 15, 20}).value, 2);
  EXPECT_DOUBLE_EQ(peak_overlap({0, 5, 10}, {10, 15, 20}).at_s, 5.0);
  // derived: weights 1, 3, 2: 1 + 3 = 4 from 5 s, 3 + 2 = 5 from 10 s.
  const Peak w = peak_overlap({0, 5, 10}, {10, 15, 20}, {1, 3, 2});
  EXPECT_EQ(w.value, 5);
  EXPECT_DOUBLE_EQ(w.at_s, 10.0);
  EXPECT_EQ(peak_overlap({}, {}).value, 0);
  EXPECT_TRUE(std::isnan(peak_overlap({}, {}).at_s));
  EXPECT_THROW(peak_overlap({10}, {5}), Error);
}

TEST(MarshalPlan, SectorsGroupPostsByDistanceAndSplitCrowdedOnes) {
  const CheckResult r = course_with_posts();
  EventOps ops = two_waves();
  ops.rules.sector_length_m = 2500.0;
  MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  // derived: M01 at 2000 m in block 0 (0-2500), M02 at 5000 and M03 at 5300 in block 2
  // (5000-7500); the empty block 1 gets no page.
  ASSERT_EQ(plan.sectors.size(), 2u);
  EXPECT_DOUBLE_EQ(plan.sectors[0].from_m, 0.0);
  EXPECT_DOUBLE_EQ(plan.sectors[0].to_m, 2500.0);
  EXPECT_EQ(plan.sectors[1].posts.size(), 2u);
  EXPECT_EQ(plan.sectors[1].marshals, 2);
  EXPECT_DOUBLE_EQ(plan.sectors[1].from_m, 5000.0);
  EXPECT_EQ(plan.posts[2].sector, 1u);

  ops.rules.max_posts_per_sector = 1;
  plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  ASSERT_EQ(plan.sectors.size(), 3u);
  // derived: block 2 is cut halfway between 5000 and 5300 m.
  EXPECT_DOUBLE_EQ(plan.sectors[1].to_m, 5150.0);
  EXPECT_DOUBLE_EQ(plan.sectors[2].from_m, 5150.0);
  EXPECT_DOUBLE_EQ(plan.sectors[2].to_m, 7500.0);
  EXPECT_EQ(plan.sectors[2].name, "Sector 3");
}

TEST(MarshalPlan, NoPostsGiveAnEmptyPlan) {
  const CheckResult r = hand_course();
  const EventOps ops = two_waves();
  const MarshalPlan plan = make_marshal_plan(r, ops, make_schedule(r, ops));
  EXPECT_TRUE(plan.posts.empty());
  EXPECT_TRUE(plan.sectors.empty());
  EXPECT_EQ(plan.marshals_needed, 0);
  EXPECT_EQ(plan.peak_posts, 0);
}

}  // namespace coursewarden
