// Comparing variants: a course against its own reverse, and the reverse-direction line.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <sstream>

#include "cli/run.hpp"
#include "coursewarden/check.hpp"
#include "coursewarden/compare.hpp"

using namespace coursewarden;

namespace {
const std::string kSample = std::string(COURSEWARDEN_SOURCE_DIR) + "/sample_courses/ronde-orvalune";
}

TEST(Compare, ReversingSwapsAscentAndDescentExactly) {
  CheckOptions fwd;
  fwd.analysis.course_path = kSample + "/course.gpx";
  fwd.analysis.dem_path = kSample + "/dem.tif";
  fwd.check_reverse = false;
  CheckOptions back = fwd;
  back.analysis.reverse = true;
  const CheckResult a = run_check(fwd), b = run_check(back);
  const auto& ta = a.analysis.profile.totals;
  const auto& tb = b.analysis.profile.totals;
  // Both directions sample the same points, so the climbing of one is the descending of the
  // other (derived: the sum of positive steps of a reversed series is the sum of negative steps).
  EXPECT_NEAR(ta.ascent_m, tb.descent_m, 1e-6);
  EXPECT_NEAR(ta.descent_m, tb.ascent_m, 1e-6);
  EXPECT_DOUBLE_EQ(ta.length_m, tb.length_m);
  EXPECT_DOUBLE_EQ(ta.max_elevation_m, tb.max_elevation_m);
  // The designed long descent with six hairpins (features.csv km 39.72-47.65) is climbed in
  // reverse, so it is a climb there and the hairpins are no longer reached fast.
  const auto ca = count_by_severity(a.hazards), cb = count_by_severity(b.hazards);
  EXPECT_GT(ca[3], cb[3]);
  EXPECT_EQ(a.corners.size(), b.corners.size());
}

TEST(Compare, CliSaysWhichDirectionIsSaferAndTheCheckMentionsTheReverse) {
  std::ostringstream out, err;
  ASSERT_EQ(cli::run({"coursewarden", "compare", kSample + "/course.gpx", "--dem", kSample + "/dem.tif", "--json", "-"},
                     out, err),
            0)
      << err.str();
  const auto j = nlohmann::json::parse(out.str());
  EXPECT_EQ(j["comparison"]["safer"], "b");
  EXPECT_NEAR(j["a"]["ascent_m"].get<double>(), j["b"]["descent_m"].get<double>(), 0.1);
  EXPECT_NE(j["disclaimer"].get<std::string>().find("safety officers"), std::string::npos);

  std::ostringstream text, err2;
  ASSERT_EQ(cli::run({"coursewarden", "check", kSample + "/course.gpx", "--dem", kSample + "/dem.tif"}, text, err2), 0);
  std::string flat = text.str();  // the line is wrapped to the terminal width
  std::replace(flat.begin(), flat.end(), '\n', ' ');
  EXPECT_NE(flat.find("The reverse direction has markedly fewer severe hazards"), std::string::npos);
}

TEST(Compare, MarkedlySaferNeedsTwoFewerAndAtMostHalf) {
  // Our rule (docs/operations.md): at least two fewer serious+critical hazards and at most half.
  EXPECT_TRUE(reverse_markedly_safer({0, 0, 2, 2}, {5, 5, 1, 1}));
  EXPECT_FALSE(reverse_markedly_safer({0, 0, 1, 2}, {0, 0, 1, 1}));
  EXPECT_FALSE(reverse_markedly_safer({0, 0, 3, 0}, {0, 0, 2, 0}));
  EXPECT_TRUE(reverse_markedly_safer({0, 0, 1, 1}, {9, 9, 0, 0}));
  EXPECT_DOUBLE_EQ(hazard_score({1, 1, 1, 1}), 44.0);
}
