// Golden tests on the bundled sample course (invented event, synthetic terrain). The expected
// values are the generator's DESIGN (tools/sample_plan.cpp, features.csv), not the analysis's own
// output: the profile must recover what the terrain was built to contain.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <sstream>

#include "cli/run.hpp"

namespace {

const std::string kSample = std::string(COURSEWARDEN_SOURCE_DIR) + "/sample_courses/ronde-orvalune";

nlohmann::json profile_json() {
  std::ostringstream out, err;
  const int code = coursewarden::cli::run(
      {"coursewarden", "profile", kSample + "/course.gpx", "--dem", kSample + "/dem.tif", "--json", "-"},
      out, err);
  EXPECT_EQ(code, 0) << err.str();
  return nlohmann::json::parse(out.str());
}

}  // namespace

TEST(SampleCourse, ProfileRecoversTheDesignedClimbs) {
  const auto j = profile_json();
  // Designed: a 68.0 km loop (features.csv: finish at 68.02 km, ground distance).
  EXPECT_NEAR(j["length_m"].get<double>(), 68020.0, 30.0);
  EXPECT_DOUBLE_EQ(j["dem_coverage_pct"].get<double>(), 100.0);
  EXPECT_TRUE(j["repairs"].empty());  // the terrain has no artefacts by construction
  // Designed heights: lowest 240 m, highest 739 m at the top of climb 2 (the pass).
  EXPECT_NEAR(j["min_elevation_m"].get<double>(), 240.0, 3.0);
  EXPECT_NEAR(j["max_elevation_m"].get<double>(), 739.0, 3.0);
  // Designed climb 1: km 11.40-17.54, +369 m, 6.0 %, score 222 -> category 2;
  // climb 2: km 35.78-39.72, +209 m, 5.3 %, score 111 -> category 3 (scale: check-values.md sec. 7).
  std::vector<nlohmann::json> categorised;
  for (const auto& c : j["climbs"])
    if (!c["category"].is_null()) categorised.push_back(c);
  ASSERT_EQ(categorised.size(), 2u);
  EXPECT_NEAR(categorised[0]["start_m"].get<double>(), 11400.0, 150.0);
  EXPECT_NEAR(categorised[0]["end_m"].get<double>(), 17540.0, 150.0);
  EXPECT_NEAR(categorised[0]["gain_m"].get<double>(), 369.0, 5.0);
  EXPECT_NEAR(categorised[0]["mean_grade_pct"].get<double>(), 6.0, 0.2);
  EXPECT_EQ(categorised[0]["category"], "2");
  EXPECT_NEAR(categorised[1]["start_m"].get<double>(), 35780.0, 150.0);
  EXPECT_NEAR(categorised[1]["end_m"].get<double>(), 39720.0, 150.0);
  EXPECT_NEAR(categorised[1]["gain_m"].get<double>(), 209.0, 5.0);
  EXPECT_EQ(categorised[1]["category"], "3");
  // Designed steepest pitch: 307 m at 9.2 % in climb 1 (smoothing may shave a little).
  EXPECT_NEAR(categorised[0]["max_grade_100m_pct"].get<double>(), 9.2, 0.4);
}
