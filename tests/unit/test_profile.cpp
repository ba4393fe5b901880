// Profile stages: smoothing, sustained gradients, repairs, climbs and categories.
#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "coursewarden/error.hpp"
#include "coursewarden/profile.hpp"

using namespace coursewarden;

namespace {

std::vector<Station> stations_every(double spacing_m, std::size_t n) {
  std::vector<Station> s(n);
  for (std::size_t i = 0; i < n; ++i) s[i].distance_m = spacing_m * static_cast<double>(i);
  return s;
}

std::vector<double> distances(const std::vector<Station>& s) {
  std::vector<double> d;
  for (const auto& st : s) d.push_back(st.distance_m);
  return d;
}

}  // namespace

TEST(ProfileSmoothing, KeepsAStraightSlopeExactlyIncludingTheEnds) {
  // A Gaussian filter with odd reflection reproduces a linear function exactly
  // (derived: the kernel is symmetric and sums to one, and the reflection continues the line).
  std::vector<double> line;
  for (int i = 0; i < 400; ++i) line.push_back(100.0 + 0.07 * 5.0 * i);
  const auto out = smooth_gaussian(line, 5.0, 30.0);
  for (std::size_t i = 0; i < line.size(); ++i) EXPECT_NEAR(out[i], line[i], 1e-9) << i;
}

TEST(ProfileSmoothing, DampsAShortWaveMoreThanALongOne) {
  // Gaussian frequency response exp(-(2 pi sigma / lambda)^2 / 2) (derived: Fourier transform of
  // the Gaussian kernel): sigma 20 m damps a 60 m wave to 1.5 % and a 2000 m wave hardly at all.
  const double sigma = 20.0, dx = 5.0;
  std::vector<double> short_wave, long_wave;
  for (int i = 0; i < 2000; ++i) {
    short_wave.push_back(std::sin(2 * M_PI * i * dx / 60.0));
    long_wave.push_back(std::sin(2 * M_PI * i * dx / 2000.0));
  }
  const auto s = smooth_gaussian(short_wave, dx, sigma);
  const auto l = smooth_gaussian(long_wave, dx, sigma);
  const double expect_short = std::exp(-0.5 * std::pow(2 * M_PI * sigma / 60.0, 2));
  const double expect_long = std::exp(-0.5 * std::pow(2 * M_PI * sigma / 2000.0, 2));
  double amp_s = 0, amp_l = 0;
  for (int i = 500; i < 1500; ++i) {
    amp_s = std::max(amp_s, std::abs(s[i]));
    amp_l = std::max(amp_l, std::abs(l[i]));
  }
  EXPECT_NEAR(amp_s, expect_short, 0.01);
  EXPECT_NEAR(amp_l, expect_long, 0.01);
}

TEST(ProfileSustained, FindsTheSteepestWindowUpAndDown) {
  // Flat 1 km, then 400 m at 10 %, flat, then 800 m at -6 %: by hand, the steepest 100 m is
  // +10 % and -6 %; the steepest 500 m climbs 40 m (8 %) and the steepest 1 km falls 48 m (-4.8 %).
  std::vector<double> d, e;
  double h = 0;
  for (int i = 0; i <= 1000; ++i) {
    const double s = 5.0 * i;
    d.push_back(s);
    if (s > 1000 && s <= 1400) h += 0.10 * 5.0;
    if (s > 2500 && s <= 3300) h -= 0.06 * 5.0;
    e.push_back(h);
  }
  const auto w100 = steepest_over(d, e, 100.0);
  EXPECT_NEAR(w100.climb_pct, 10.0, 1e-9);
  EXPECT_NEAR(w100.descent_pct, -6.0, 1e-9);
  EXPECT_NEAR(steepest_over(d, e, 500.0).climb_pct, 8.0, 1e-9);
  EXPECT_NEAR(steepest_over(d, e, 1000.0).descent_pct, -4.8, 1e-9);
}

TEST(ProfileBuild, AscentOfAUniformSlopeIsTheHeightDifference) {
  auto st = stations_every(5.0, 2001);  // 10 km
  std::vector<double> raw;
  for (const auto& s : st) raw.push_back(200.0 + 0.04 * s.distance_m);
  const Profile p = build_profile(st, raw, 30.0, {}, "test");
  EXPECT_NEAR(p.totals.ascent_m, 400.0, 1e-6);  // derived: 4 % of 10 km
  EXPECT_NEAR(p.totals.descent_m, 0.0, 1e-6);
  EXPECT_NEAR(p.totals.length_m, 10000.0, 1e-9);
  EXPECT_NEAR(p.grade[1000], 0.04, 1e-9);
  EXPECT_TRUE(p.repairs.empty());
  EXPECT_DOUBLE_EQ(p.smoothing_sigma_m, 30.0);  // max(2 x 5 m, 30 m pixel)
}

TEST(ProfileBuild, RepairsABridgeDeckTheDemPutInTheValley) {
  // A road at a steady 1 % crossing a 50 m deep valley on a bridge from km 2.0 to 2.3: the DEM
  // follows the valley floor. The repair must restore the 1 % line across and list the stretch.
  auto st = stations_every(5.0, 1001);
  std::vector<double> raw;
  for (const auto& s : st) {
    double z = 100.0 + 0.01 * s.distance_m;
    if (s.distance_m > 2000 && s.distance_m < 2300) z -= 50.0;  // deck read as valley floor
    raw.push_back(z);
  }
  const Profile p = build_profile(st, raw, 30.0, {}, "test");
  ASSERT_EQ(p.repairs.size(), 1u);
  EXPECT_LE(p.repairs[0].start_m, 2000.0);
  EXPECT_GE(p.repairs[0].end_m, 2300.0);
  EXPECT_GT(p.repairs[0].worst_grade_pct, 40.0);
  // Ascent is the road's: 1 % of 5 km = 50 m (derived), not 50 m more for the valley.
  EXPECT_NEAR(p.totals.ascent_m, 50.0, 0.5);
  EXPECT_NEAR(p.elevation_m[430], 100.0 + 0.01 * 2150.0, 0.5);
}

TEST(ProfileBuild, BridgesShortNodataGapsAndRefusesLongOnes) {
  auto st = stations_every(5.0, 1001);
  std::vector<double> raw;
  for (const auto& s : st) raw.push_back(50.0 + 0.02 * s.distance_m);
  for (int i = 300; i < 340; ++i) raw[i] = NAN;  // 200 m hole
  const Profile p = build_profile(st, raw, 30.0, {}, "dem.tif");
  ASSERT_EQ(p.repairs.size(), 1u);
  EXPECT_DOUBLE_EQ(p.repairs[0].start_m, 1495.0);
  EXPECT_DOUBLE_EQ(p.repairs[0].end_m, 1700.0);
  EXPECT_NEAR(p.elevation_m[320], 50.0 + 0.02 * 1600.0, 1e-6);  // straight across a plane slope
  EXPECT_NEAR(p.coverage_pct, 100.0 * 961.0 / 1001.0, 1e-9);

  for (int i = 100; i < 400; ++i) raw[i] = NAN;  // 1.5 km hole
  try {
    build_profile(st, raw, 30.0, {}, "dem.tif");
    FAIL() << "a 1.5 km hole must be refused";
  } catch (const Error& e) {
    const std::string msg = e.what();
    EXPECT_NE(msg.find("dem.tif"), std::string::npos);
    EXPECT_NE(msg.find("km 0.49 to 2.00"), std::string::npos) << msg;
    EXPECT_NE(msg.find("--max-gap"), std::string::npos);
  }
}

TEST(ClimbCategory, FollowsTheScoreScale) {
  // Score = (mean gradient %)^2 x length km; 8.5 % over 15.7 km -> 1134, hors categorie
  // (published organiser cross-check, press reports 2016-2025, read; check-values.md section 7).
  const CategoryScale scale;
  const double score = 8.5 * 8.5 * 15.7;
  EXPECT_NEAR(score, 1134.0, 0.5);
  EXPECT_EQ(climb_category(score, scale), "HC");
  // Band edges from the same source: cat 4 from 35, cat 3 from 80, cat 2 from 180, cat 1 from 300.
  EXPECT_EQ(climb_category(34.9, scale), "");
  EXPECT_EQ(climb_category(35.0, scale), "4");
  EXPECT_EQ(climb_category(80.0, scale), "3");
  EXPECT_EQ(climb_category(179.9, scale), "3");
  EXPECT_EQ(climb_category(180.0, scale), "2");
  EXPECT_EQ(climb_category(300.0, scale), "1");
  EXPECT_EQ(climb_category(599.0, scale), "1");
  CategoryScale strict;
  strict.cat2_min = 150.0;  // the other published cat 2 bound
  EXPECT_EQ(climb_category(160.0, strict), "2");
}

TEST(Climbs, AShortDipDoesNotSplitAClimbButADeepOneDoes) {
  // 3 km at 6 % with a 200 m dip of 6 m in the middle: one climb with the default 10 m
  // hysteresis; with a 5 m hysteresis it becomes two.
  std::vector<double> d, e;
  double h = 0;
  for (int i = 0; i <= 1000; ++i) {
    const double s = 5.0 * i;
    d.push_back(s);
    if (s > 500 && s <= 3500) {
      const bool in_dip = s > 2000 && s <= 2200;
      h += (in_dip ? -0.03 : 0.06) * 5.0;
    }
    e.push_back(h);
  }
  ClimbOptions opt;
  const auto one = find_climbs(d, e, opt);
  ASSERT_EQ(one.size(), 1u);
  EXPECT_NEAR(one[0].start_m, 500.0, 5.0);
  EXPECT_NEAR(one[0].end_m, 3500.0, 5.0);
  // derived: 2800 m at 6 % minus 200 m at 3 % = 168 - 6 = 162 m over 3000 m = 5.4 %
  EXPECT_NEAR(one[0].gain_m, 162.0, 1e-6);
  EXPECT_NEAR(one[0].mean_grade_pct, 5.4, 1e-6);
  EXPECT_NEAR(one[0].max_grade_100m_pct, 6.0, 1e-9);
  EXPECT_EQ(one[0].category, "3");  // derived: 5.4^2 x 3.0 km = 87.5, in the cat 3 band
  opt.hysteresis_m = 5.0;
  EXPECT_EQ(find_climbs(d, e, opt).size(), 2u);
}
