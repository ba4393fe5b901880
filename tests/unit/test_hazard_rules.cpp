// Hazard rules: braking and stopping sight distances, warning-sign siting, severity, marshals.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>

#include "coursewarden/error.hpp"
#include "coursewarden/hazard_rules.hpp"

using namespace coursewarden;

namespace {

constexpr double kG = 9.80665;
constexpr double kMps_per_mph = 0.44704;  // exact: 1609.344 m / 3600 s
constexpr double kM_per_ft = 0.3048;      // exact
double kmh(double v_kmh) { return v_kmh / 3.6; }
double mph(double v_mph) { return v_mph * kMps_per_mph; }

}  // namespace

// ---- stopping sight distance

TEST(HazardStoppingSight, MatchesAashto1999AtTwentyMphOnTheLevel) {
  // AASHTO 1999 (read, as quoted): 20 mph, level -> 127 ft (38.7 m) (read, as quoted by FHWA).
  // Tolerance: the quoted value is rounded to the foot.
  const double s_m = stopping_sight_distance_m(mph(20.0), 0.0);
  EXPECT_NEAR(s_m / kM_per_ft, 127.0, 0.5);
}

TEST(HazardStoppingSight, MatchesAashto1999AtThirtyKmhOnTheLevel) {
  // AASHTO 1999 (read, as quoted): 30 km/h level -> 35.0 m. Tolerance: rounding to 0.1 m.
  EXPECT_NEAR(stopping_sight_distance_m(kmh(30.0), 0.0, kAashto1999Friction, 2.5), 35.0, 0.05);
}

TEST(HazardStoppingSight, MatchesAashto2012WetFrictionAtThirtyKmh) {
  // AASHTO 2012 (from memory): f = 0.16 (wet), t = 2.5 s. Check: 30 km/h level -> 43.0 m.
  EXPECT_NEAR(stopping_sight_distance_m(kmh(30.0), 0.0, kAashto2012WetFriction, 2.5), 43.0, 0.05);
}

TEST(HazardStoppingSight, GrowsOnADescentAsAashto2012Predicts) {
  // AASHTO 2012 (from memory): 20 mph on -5 % -> 194.7 ft (derived). The derivation used the US
  // customary constants 30 and 1.47, which differ from the SI form by up to 0.2 %; tolerance 0.5 ft.
  const double s_m = stopping_sight_distance_m(mph(20.0), -0.05, kAashto2012WetFriction, 2.5);
  EXPECT_NEAR(s_m / kM_per_ft, 194.7, 0.5);
  EXPECT_GT(s_m, stopping_sight_distance_m(mph(20.0), 0.0, kAashto2012WetFriction, 2.5));
  EXPECT_LT(stopping_sight_distance_m(mph(20.0), +0.05, kAashto2012WetFriction, 2.5),
            stopping_sight_distance_m(mph(20.0), 0.0, kAashto2012WetFriction, 2.5));
}

TEST(HazardStoppingSight, IsInfiniteWhenTheDescentExceedsFriction) {
  // derived: f + G <= 0 leaves no deceleration in the AASHTO formula.
  EXPECT_TRUE(std::isinf(stopping_sight_distance_m(kmh(30.0), -0.30, 0.25, 2.5)));
  EXPECT_DOUBLE_EQ(stopping_sight_distance_m(0.0, -0.30, 0.25, 2.5), 0.0);
}

TEST(HazardStoppingSight, RejectsBadInput) {
  EXPECT_THROW(stopping_sight_distance_m(-1.0, 0.0), Error);
  EXPECT_THROW(stopping_sight_distance_m(std::nan(""), 0.0), Error);
  EXPECT_THROW(stopping_sight_distance_m(5.0, 0.0, 0.0), Error);
  EXPECT_THROW(stopping_sight_distance_m(5.0, 0.0, 0.25, -1.0), Error);
  EXPECT_THROW(stopping_sight_distance_m(5.0, std::nan("")), Error);
}

// ---- braking distance

TEST(HazardBraking, EqualsAashtoStoppingDistanceOnTheLevel) {
  // AASHTO 1999 (read, as quoted): 30 km/h level -> 35.0 m with f = 0.25, t = 2.5 s; braking to
  // a stop at 0.25 g is the same physics on the level.
  EXPECT_NEAR(braking_distance_m(kmh(30.0), 0.0, 0.25 * kG, 0.0, 2.5), 35.0, 0.05);
}

TEST(HazardBraking, FollowsAashto2012OnAFivePercentDescent) {
  // AASHTO 2012 (from memory): 20 mph on -5 % -> 194.7 ft (derived). Our model subtracts
  // g sin(atan 0.05) = 0.04994 g instead of AASHTO's 0.05 g: 0.06 % apart, inside the 0.5 ft.
  const double d_m = braking_distance_m(mph(20.0), 0.0, 0.16 * kG, -0.05, 2.5);
  EXPECT_NEAR(d_m / kM_per_ft, 194.7, 0.5);
}

TEST(HazardBraking, UsesReactionDistanceAndKinematics) {
  // derived: v t + v^2 / (2 a) with a = 0.35 g, the typical dry level braking of ordinary riders
  // (Pein, High Speed Bicycling; read): 50 km/h, t = 1 s -> 13.889 + 28.101 = 41.990 m.
  EXPECT_NEAR(braking_distance_m(kmh(50.0), 0.0, 0.35 * kG, 0.0, 1.0), 41.990, 0.001);
  // derived: 60 -> 30 km/h at 0.5 g on -8 %: a = g (0.5 - sin(atan 0.08)) = 4.1213 m/s^2,
  // 16.667 * 1 + (16.667^2 - 8.333^2) / (2 * 4.1213) = 41.942 m.
  EXPECT_NEAR(braking_distance_m(kmh(60.0), kmh(30.0), 0.5 * kG, -0.08, 1.0), 41.942, 0.001);
}

TEST(HazardBraking, GradeTermMatchesPeinPitchOverValues) {
  // Pein, High Speed Bicycling (read), pitch-over limit a_max = g (l_f/h cos(theta) - sin(theta))
  // with l_f/h = 0.6: 0.549 / 0.498 g at -5 / -10 % (derived). The brakes supply the cos term.
  const double theta5 = std::atan(0.05), theta10 = std::atan(0.10);
  EXPECT_NEAR(braking_deceleration_on_grade_mps2(0.6 * kG * std::cos(theta5), -0.05) / kG, 0.549,
              0.0005);
  EXPECT_NEAR(braking_deceleration_on_grade_mps2(0.6 * kG * std::cos(theta10), -0.10) / kG, 0.498,
              0.0005);
  // Uphill, gravity helps.
  EXPECT_GT(braking_deceleration_on_grade_mps2(3.0, 0.05), 3.0);
}

TEST(HazardBraking, IsInfiniteWhenTheGradeOverwhelmsTheBrakes) {
  // derived: sin(atan 0.4) = 0.371 > 0.3, so 0.3 g of braking cannot slow a rider on -40 %.
  EXPECT_TRUE(std::isinf(braking_distance_m(10.0, 5.0, 0.3 * kG, -0.40, 1.0)));
  EXPECT_LT(braking_deceleration_on_grade_mps2(0.3 * kG, -0.40), 0.0);
  // ... while 0.4 g can.
  EXPECT_TRUE(std::isfinite(braking_distance_m(10.0, 5.0, 0.4 * kG, -0.40, 1.0)));
}

TEST(HazardBraking, NeedsNoDistanceWhenNotSlowingDown) {
  EXPECT_DOUBLE_EQ(braking_distance_m(8.0, 8.0, 3.0, -0.1, 1.0), 0.0);
  EXPECT_DOUBLE_EQ(braking_distance_m(8.0, 10.0, 3.0, 0.0, 1.0), 0.0);
}

TEST(HazardBraking, RejectsBadInput) {
  EXPECT_THROW(braking_distance_m(-1.0, 0.0, 3.0, 0.0, 1.0), Error);
  EXPECT_THROW(braking_distance_m(10.0, -1.0, 3.0, 0.0, 1.0), Error);
  EXPECT_THROW(braking_distance_m(10.0, 0.0, 0.0, 0.0, 1.0), Error);
  EXPECT_THROW(braking_distance_m(10.0, 0.0, 3.0, 0.0, -0.5), Error);
  EXPECT_THROW(braking_distance_m(10.0, 0.0, 3.0, std::nan(""), 1.0), Error);
  EXPECT_THROW(braking_distance_m(std::numeric_limits<double>::infinity(), 0.0, 3.0, 0.0, 1.0),
               Error);
}

// ---- warning signs

struct SignCase {
  double speed_mph;
  double distance_m;
  double visibility_m;
};

TEST(HazardWarningSign, MatchesTrafficSignsManualBandEdges) {
  // UK Traffic Signs Manual, Chapter 4 (2013), Appendix A (read): up to 30 mph 45 m; 31-40 mph
  // 45-110 m; 41-50 mph 110-180 m; 51-60 mph 180-245 m; over 60 mph 245-305 m; minimum clear
  // visibility 45/60/60/75/90/105 m. Band edges give the range ends; the visibility of the
  // last two values follows our reading (61-70 mph -> 90 m, over 70 mph -> 105 m).
  const SignCase cases[] = {
      {10.0, 45.0, 45.0},   {30.0, 45.0, 45.0},   {40.0, 110.0, 60.0},  {50.0, 180.0, 60.0},
      {60.0, 245.0, 75.0},  {70.0, 305.0, 90.0},  {80.0, 305.0, 105.0},
  };
  for (const auto& c : cases) {
    const WarningSignSiting s = warning_sign_siting(mph(c.speed_mph));
    EXPECT_NEAR(s.distance_m, c.distance_m, 1e-6) << c.speed_mph << " mph";
    EXPECT_DOUBLE_EQ(s.min_clear_visibility_m, c.visibility_m) << c.speed_mph << " mph";
    EXPECT_DOUBLE_EQ(warning_sign_distance_m(mph(c.speed_mph)), s.distance_m);
  }
  EXPECT_EQ(warning_sign_siting(mph(30.0)).speed_band, "up to 30 mph");
  EXPECT_EQ(warning_sign_siting(mph(35.0)).speed_band, "31-40 mph");
  EXPECT_EQ(warning_sign_siting(mph(65.0)).speed_band, "over 60 mph");
}

TEST(HazardWarningSign, InterpolatesLinearlyInsideABand) {
  // derived: our documented choice of linear interpolation in speed between the band edges of
  // the Traffic Signs Manual, Chapter 4 (2013), Appendix A table: 35 mph is half way from 45 m
  // to 110 m; 45 mph half way from 110 m to 180 m; 65 mph half way from 245 m to 305 m.
  EXPECT_NEAR(warning_sign_distance_m(mph(35.0)), 77.5, 1e-6);
  EXPECT_NEAR(warning_sign_distance_m(mph(45.0)), 145.0, 1e-6);
  EXPECT_NEAR(warning_sign_distance_m(mph(65.0)), 275.0, 1e-6);
  // Just above a band edge the visibility changes to the next band's value.
  EXPECT_DOUBLE_EQ(warning_sign_siting(mph(30.1)).min_clear_visibility_m, 60.0);
  EXPECT_NEAR(warning_sign_siting(mph(30.1)).distance_m, 45.0 + 0.1 * 6.5, 1e-6);
}

TEST(HazardWarningSign, NeverShrinksWithSpeed) {
  double previous = 0.0;
  for (double v = 0.0; v <= 40.0; v += 0.05) {
    const double d = warning_sign_distance_m(v);
    EXPECT_GE(d, previous - 1e-9) << v << " m/s";
    previous = d;
  }
}

TEST(HazardWarningSign, RejectsBadSpeed) {
  EXPECT_THROW(warning_sign_siting(-0.1), Error);
  EXPECT_THROW(warning_sign_siting(std::nan("")), Error);
}

// ---- severity and marshals (our own scale; thresholds from SeverityRules' documented defaults)

TEST(HazardSeverity, IsNoneWhenNotFasterThanSafe) {
  EXPECT_EQ(severity_for_corner(0.0, 10.0, 0.0, 50.0), Severity::none);
  EXPECT_EQ(severity_for_corner(-2.0, 10.0, 0.0, 50.0), Severity::none);
}

TEST(HazardSeverity, RisesWithTheRelativeExcess) {
  // Slow corner (entry below 50 km/h), braking fits: only the relative excess counts.
  EXPECT_EQ(severity_for_corner(0.5, 10.0, 20.0, 100.0), Severity::note);      // 5 %
  EXPECT_EQ(severity_for_corner(1.0, 10.0, 20.0, 100.0), Severity::caution);   // 10 %
  EXPECT_EQ(severity_for_corner(2.0, 10.0, 20.0, 100.0), Severity::caution);   // 20 %
  EXPECT_EQ(severity_for_corner(2.5, 10.0, 20.0, 100.0), Severity::serious);   // 25 %
}

TEST(HazardSeverity, RisesOneLevelWhenBrakingDoesNotFitTheStraight) {
  EXPECT_EQ(severity_for_corner(0.5, 10.0, 120.0, 100.0), Severity::caution);
  EXPECT_EQ(severity_for_corner(2.5, 10.0, 120.0, 100.0), Severity::critical);
  EXPECT_EQ(severity_for_corner(0.5, 10.0, std::numeric_limits<double>::infinity(), 100.0),
            Severity::caution);
}

TEST(HazardSeverity, RisesOneLevelForAFastEntryAndCapsAtCritical) {
  // Entry 14 m/s = 50.4 km/h >= 50 km/h.
  EXPECT_EQ(severity_for_corner(0.5, 13.5, 20.0, 100.0), Severity::caution);
  EXPECT_EQ(severity_for_corner(4.0, 12.0, 200.0, 100.0), Severity::critical);
}

TEST(HazardSeverity, ThresholdsAreConfigurable) {
  SeverityRules strict;
  strict.caution_excess_ratio = 0.02;
  strict.serious_excess_ratio = 0.04;
  EXPECT_EQ(severity_for_corner(0.5, 10.0, 20.0, 100.0, strict), Severity::serious);
  SeverityRules no_speed_rule;
  no_speed_rule.fast_entry_mps = std::numeric_limits<double>::infinity();
  EXPECT_EQ(severity_for_corner(0.5, 13.5, 20.0, 100.0, no_speed_rule), Severity::note);
}

TEST(HazardSeverity, RejectsBadInput) {
  EXPECT_THROW(severity_for_corner(std::nan(""), 10.0, 0.0, 10.0), Error);
  EXPECT_THROW(severity_for_corner(1.0, 0.0, 0.0, 10.0), Error);
  EXPECT_THROW(severity_for_corner(1.0, 10.0, -1.0, 10.0), Error);
  EXPECT_THROW(severity_for_corner(1.0, 10.0, 1.0, std::nan("")), Error);
}

TEST(HazardMarshals, FollowSeverityAndHiddenApproach) {
  EXPECT_EQ(marshals_for(Severity::none, false), 0);
  EXPECT_EQ(marshals_for(Severity::note, true), 0);
  EXPECT_EQ(marshals_for(Severity::caution, false), 0);
  EXPECT_EQ(marshals_for(Severity::caution, true), 1);
  EXPECT_EQ(marshals_for(Severity::serious, false), 1);
  EXPECT_EQ(marshals_for(Severity::critical, false), 2);
  EXPECT_EQ(marshals_for(Severity::critical, true), 3);
  SeverityRules rules;
  rules.marshals_caution = 1;
  rules.extra_marshals_if_hidden = 2;
  EXPECT_EQ(marshals_for(Severity::caution, true, rules), 3);
}

TEST(HazardSeverity, NamesRoundTrip) {
  for (Severity s : {Severity::none, Severity::note, Severity::caution, Severity::serious,
                     Severity::critical}) {
    const auto back = severity_from_name(severity_name(s));
    ASSERT_TRUE(back.has_value());
    EXPECT_EQ(*back, s);
  }
  EXPECT_FALSE(severity_from_name("red").has_value());
  EXPECT_EQ(severity_name(Severity::serious), "serious");
}
