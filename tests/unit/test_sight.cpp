// Sight distance: crest limit on the profile, terrain limit past a hillside, hidden stretches.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <numbers>
#include <vector>

#include "coursewarden/error.hpp"
#include "coursewarden/sight.hpp"

using namespace coursewarden;

namespace {

struct Profile1D {
  std::vector<double> d, z;
};

// Stations every `spacing_m` from x0 to x1 with heights z(x).
template <class F>
Profile1D make_profile(double x0, double x1, double spacing_m, F z_of_x) {
  Profile1D p;
  const auto n = static_cast<std::size_t>(std::llround((x1 - x0) / spacing_m)) + 1;
  for (std::size_t i = 0; i < n; ++i) {
    const double x = x0 + spacing_m * static_cast<double>(i);
    p.d.push_back(x - x0);
    p.z.push_back(z_of_x(x));
  }
  return p;
}

struct Road {
  std::vector<double> x, y, z, d;
};

// A road on a circle of radius R around the origin, counter-clockwise from angle 0, stations
// every `spacing_m` of arc, at height 0.
Road circle_road(double radius_m, double arc_m, double spacing_m) {
  Road r;
  const auto n = static_cast<std::size_t>(std::llround(arc_m / spacing_m)) + 1;
  for (std::size_t i = 0; i < n; ++i) {
    const double s = spacing_m * static_cast<double>(i);
    r.x.push_back(radius_m * std::cos(s / radius_m));
    r.y.push_back(radius_m * std::sin(s / radius_m));
    r.z.push_back(0.0);
    r.d.push_back(s);
  }
  return r;
}

// A winding road: heading follows a sine of distance (bends of about 60 deg either way).
Road winding_road(double length_m, double spacing_m) {
  Road r;
  double x = 0.0, y = 0.0;
  const auto n = static_cast<std::size_t>(std::llround(length_m / spacing_m)) + 1;
  for (std::size_t i = 0; i < n; ++i) {
    const double s = spacing_m * static_cast<double>(i);
    if (i > 0) {
      const double heading = 1.0 * std::sin((s - 0.5 * spacing_m) / 60.0);
      x += spacing_m * std::cos(heading);
      y += spacing_m * std::sin(heading);
    }
    r.x.push_back(x);
    r.y.push_back(y);
    r.z.push_back(0.0);
    r.d.push_back(s);
  }
  return r;
}

}  // namespace

// ---- crest limit

TEST(SightCrest, MatchesTangentGeometryOnAParabolicCrest) {
  // derived: on y = -x^2 / (2K) the line through the eye (x0, y(x0) + h1) tangent to the road
  // touches it at x_t with (x_t - x0)^2 = 2 K h1, so the view ends S = sqrt(2 K h1) ahead wherever
  // the whole view lies on the curve. This is the AASHTO crest-curve relation for S < L,
  // L = A S^2 / (200 (sqrt(h1) + sqrt(h2))^2) with K = 100 L / A and h2 = 0 (from memory).
  // Tolerance: the result is the last visible station, within one spacing of the tangent point.
  const double K = 2000.0, h1 = 1.4, spacing = 2.0;
  const auto p = make_profile(-400.0, 400.0, spacing, [&](double x) { return -x * x / (2 * K); });
  const auto sight = crest_sight_distance_m(p.d, p.z, h1, 0.0, 500.0);
  const double expected = std::sqrt(2.0 * K * h1);  // 74.83 m
  for (double x0 : {-300.0, -120.0, -40.0, 0.0, 50.0, 200.0, 300.0}) {
    const auto i = static_cast<std::size_t>(std::llround((x0 + 400.0) / spacing));
    EXPECT_NEAR(sight[i], expected, spacing) << "eye at x = " << x0;
  }
}

TEST(SightCrest, AddsTheObjectHeightTermOfTheCrestRelation) {
  // derived: with an object h2 above the road the line grazes the crest between eye and object:
  // S = sqrt(2 K h1) + sqrt(2 K h2) (tangent from each end; the AASHTO relation above with h2 > 0).
  const double K = 2000.0, h1 = 1.4, h2 = 0.5, spacing = 2.0;
  const auto p = make_profile(-400.0, 400.0, spacing, [&](double x) { return -x * x / (2 * K); });
  const auto sight = crest_sight_distance_m(p.d, p.z, h1, h2, 500.0);
  const double expected = std::sqrt(2.0 * K * h1) + std::sqrt(2.0 * K * h2);  // 119.55 m
  for (double x0 : {-300.0, -60.0, 0.0, 100.0, 250.0}) {
    const auto i = static_cast<std::size_t>(std::llround((x0 + 400.0) / spacing));
    EXPECT_NEAR(sight[i], expected, spacing) << "eye at x = " << x0;
  }
}

TEST(SightCrest, SeesToTheLookAheadOnStraightsAndSags) {
  // derived: a straight grade or a sag (y = +x^2 / 2K) never rises above a line from a point
  // above it to a point on it, so only the look-ahead and the course end limit the view.
  const auto straight = make_profile(0.0, 1200.0, 5.0, [](double x) { return 100.0 - 0.07 * x; });
  const auto sag = make_profile(-600.0, 600.0, 5.0, [](double x) { return x * x / 4000.0; });
  for (const auto* p : {&straight, &sag}) {
    const auto sight = crest_sight_distance_m(p->d, p->z, 1.4, 0.0, 300.0);
    for (std::size_t i = 0; i < sight.size(); ++i) {
      const double remaining = p->d.back() - p->d[i];
      EXPECT_NEAR(sight[i], std::min(300.0, remaining), 1e-9) << "station " << i;
    }
  }
}

TEST(SightCrest, EndsAtTheBrowOfAPlateauUnlessTheEyeIsCloseToIt) {
  // derived: level road to x = 100 m, then -10 %. From x0 the descent is hidden behind the brow
  // unless 100 - x0 <= h1 / 0.1 = 14 m (compare the slopes from the eye to the brow and to the
  // descent); otherwise the view ends at the brow, S = 100 - x0.
  const auto p = make_profile(0.0, 400.0, 1.0,
                              [](double x) { return x <= 100.0 ? 0.0 : -0.1 * (x - 100.0); });
  const auto sight = crest_sight_distance_m(p.d, p.z, 1.4, 0.0, 200.0);
  EXPECT_NEAR(sight[50], 50.0, 1.0);
  EXPECT_NEAR(sight[80], 20.0, 1.0);
  EXPECT_NEAR(sight[87], 200.0, 1e-9);  // 13 m from the brow: sees down the slope
  EXPECT_NEAR(sight[95], 200.0, 1e-9);
}

TEST(SightCrest, RejectsBadInput) {
  EXPECT_THROW(crest_sight_distance_m({0.0}, {0.0}), Error);
  EXPECT_THROW(crest_sight_distance_m({0.0, 5.0}, {0.0}), Error);
  EXPECT_THROW(crest_sight_distance_m({0.0, 5.0, 5.0}, {0.0, 0.0, 0.0}), Error);
  EXPECT_THROW(crest_sight_distance_m({0.0, 5.0}, {0.0, std::nan("")}), Error);
  EXPECT_THROW(crest_sight_distance_m({0.0, 5.0}, {0.0, 0.0}, 0.0), Error);
  EXPECT_THROW(crest_sight_distance_m({0.0, 5.0}, {0.0, 0.0}, 1.4, -0.1), Error);
  EXPECT_THROW(crest_sight_distance_m({0.0, 5.0}, {0.0, 0.0}, 1.4, 0.0, 0.0), Error);
}

// ---- terrain limit

TEST(SightTerrain, LineOfSightIsBlockedByAWallButNotByGroundBelowIt) {
  const TerrainHeight wall = [](double x, double) { return std::abs(x - 50.0) < 1.0 ? 5.0 : 0.0; };
  const SightPoint eye{0.0, 0.0, 1.4}, target{100.0, 0.0, 0.0};
  EXPECT_FALSE(line_of_sight_clear(eye, target, wall, 0.5));
  const TerrainHeight plain = [](double, double) { return 0.0; };
  EXPECT_TRUE(line_of_sight_clear(eye, target, plain, 0.5));
  // Unknown ground (NaN) does not block.
  const TerrainHeight unknown = [](double, double) { return std::nan(""); };
  EXPECT_TRUE(line_of_sight_clear(eye, target, unknown, 0.5));
}

TEST(SightTerrain, ToleranceAndEndSkipAreHonoured) {
  // A 0.3 m bump above the line at mid-distance (the line is 0.7 m high there).
  const TerrainHeight bump = [](double x, double) { return std::abs(x - 50.0) < 1.0 ? 1.0 : 0.0; };
  const SightPoint eye{0.0, 0.0, 1.4}, target{100.0, 0.0, 0.0};
  TerrainSightTuning strict;
  strict.terrain_tolerance_m = 0.0;
  EXPECT_FALSE(line_of_sight_clear(eye, target, bump, 0.5, strict));
  EXPECT_TRUE(line_of_sight_clear(eye, target, bump, 0.5));  // default tolerance 0.5 m
  // A kerb 1.5 m before the target is inside the default 2 m end skip.
  const TerrainHeight kerb = [](double x, double) { return std::abs(x - 98.5) < 0.3 ? 0.8 : 0.0; };
  EXPECT_TRUE(line_of_sight_clear(eye, target, kerb, 0.1));
  TerrainSightTuning no_skip;
  no_skip.end_skip_m = 0.0;
  EXPECT_FALSE(line_of_sight_clear(eye, target, kerb, 0.1, no_skip));
  EXPECT_THROW(line_of_sight_clear(eye, target, kerb, 0.0), Error);
  TerrainSightTuning bad;
  bad.terrain_tolerance_m = std::nan("");
  EXPECT_THROW(line_of_sight_clear(eye, target, kerb, 0.1, bad), Error);
  bad = {};
  bad.end_skip_m = -1.0;
  EXPECT_THROW(line_of_sight_clear(eye, target, kerb, 0.1, bad), Error);
}

TEST(SightTerrain, MatchesChordGeometryAroundACylindricalHill) {
  // derived: road on a circle of radius R around a vertical cylinder of radius r (30 m high,
  // flat ground elsewhere). The chord between two road points an arc angle theta apart passes
  // R cos(theta / 2) from the axis, so the view ends at theta = 2 acos(r / R): an arc of
  // 2 R acos(r / R) = 70.28 m for R = 60 m, r = 50 m. Tolerance: one station spacing (last
  // visible station) plus the sampling of the line (negligible at 0.25 m steps).
  const double R = 60.0, r = 50.0, spacing = 1.0;
  const Road road = circle_road(R, 1.5 * std::numbers::pi * R, spacing);
  const TerrainHeight hill = [&](double x, double y) { return std::hypot(x, y) < r ? 30.0 : 0.0; };
  const auto sight = terrain_sight_distance_m(road.x, road.y, road.z, road.d, hill, 1.4, 0.0, 300.0,
                                              0.25);
  const double expected = 2.0 * R * std::acos(r / R);
  for (std::size_t i = 0; i < sight.size(); ++i) {
    if (road.d.back() - road.d[i] < expected + 2.0) break;  // view would reach the course end
    EXPECT_NEAR(sight[i], expected, spacing + 0.05) << "station " << i;
  }
}

TEST(SightTerrain, EvaluatesOnlyMaskedStationsWithTheSameAnswer) {
  const double R = 60.0, r = 50.0;
  const Road road = circle_road(R, 200.0, 1.0);
  const TerrainHeight hill = [&](double x, double y) { return std::hypot(x, y) < r ? 30.0 : 0.0; };
  const auto all = terrain_sight_distance_m(road.x, road.y, road.z, road.d, hill, 1.4, 0.0, 300.0,
                                            0.25);
  std::vector<std::uint8_t> mask(road.d.size(), 0);
  for (std::size_t i = 20; i < 60; i += 7) mask[i] = 1;
  const auto some = terrain_sight_distance_m(road.x, road.y, road.z, road.d, hill, 1.4, 0.0, 300.0,
                                             0.25, {}, mask);
  for (std::size_t i = 0; i < mask.size(); ++i) {
    if (mask[i]) {
      EXPECT_NEAR(some[i], all[i], 1e-12) << "station " << i;
    } else {
      EXPECT_TRUE(std::isnan(some[i])) << "station " << i;
    }
  }
}

TEST(SightTerrain, SeesToTheLookAheadOverAFlatPlainAndATiltedPlane) {
  // derived: a straight segment between two points on or above a plane stays on or above it, so
  // a winding road over a plane is never hidden by the ground.
  Road road = winding_road(2000.0, 5.0);
  const TerrainHeight flat = [](double, double) { return 0.0; };
  const TerrainHeight tilted = [](double x, double y) { return 0.05 * x - 0.03 * y; };
  for (const auto* terrain : {&flat, &tilted}) {
    for (std::size_t i = 0; i < road.z.size(); ++i) road.z[i] = (*terrain)(road.x[i], road.y[i]);
    TerrainSightTuning strict;
    strict.terrain_tolerance_m = 0.0;
    const auto sight = terrain_sight_distance_m(road.x, road.y, road.z, road.d, *terrain, 1.4, 0.0,
                                                400.0, 5.0, strict);
    for (std::size_t i = 0; i < sight.size(); ++i) {
      EXPECT_NEAR(sight[i], std::min(400.0, road.d.back() - road.d[i]), 1e-9) << "station " << i;
    }
  }
}

TEST(SightTerrain, RejectsBadInput) {
  const Road road = circle_road(60.0, 50.0, 5.0);
  const TerrainHeight flat = [](double, double) { return 0.0; };
  std::vector<double> short_x(road.x.begin(), road.x.end() - 1);
  EXPECT_THROW(terrain_sight_distance_m(short_x, road.y, road.z, road.d, flat, 1.4, 0, 100, 5), Error);
  EXPECT_THROW(terrain_sight_distance_m(road.x, road.y, road.z, road.d, {}, 1.4, 0, 100, 5), Error);
  EXPECT_THROW(terrain_sight_distance_m(road.x, road.y, road.z, road.d, flat, 1.4, 0, 100, 0), Error);
  std::vector<double> bad_z = road.z;
  bad_z[3] = std::nan("");
  EXPECT_THROW(terrain_sight_distance_m(road.x, road.y, bad_z, road.d, flat, 1.4, 0, 100, 5), Error);
  std::vector<std::uint8_t> wrong_mask(2, 1);
  EXPECT_THROW(terrain_sight_distance_m(road.x, road.y, road.z, road.d, flat, 1.4, 0, 100, 5, {},
                                        wrong_mask),
               Error);
}

TEST(SightTerrain, VerifiedScanMatchesTheDefinitionAndNeverUnderstates) {
  // Reference: the definition itself, a brute-force scan of line_of_sight_clear over every
  // station ahead until the first hidden one (a consistency check of the search, not an outside
  // value). On these hills the view drops out and comes back; the carried scan alone can only
  // overstate then, and checked at every station it must give the definition exactly.
  const TerrainHeight hills = [](double x, double y) {
    return 150.0 * std::sin(x / 2100.0) * std::cos(y / 1700.0) +
           40.0 * std::sin(x / 530.0 + 0.7) * std::sin(y / 610.0) +
           6.0 * std::sin(x / 97.0) * std::cos(y / 131.0);
  };
  Road road;
  double x = 0.0, y = 0.0;
  for (int i = 0; i <= 1000; ++i) {
    const double s = 5.0 * i, m = s - 2.5;
    if (i > 0) {
      const double heading =
          0.6 * std::sin(m / 900.0) + 0.5 * std::sin(m / 230.0) + 0.35 * std::sin(m / 55.0);
      x += 5.0 * std::cos(heading);
      y += 5.0 * std::sin(heading);
    }
    road.x.push_back(x);
    road.y.push_back(y);
    road.z.push_back(hills(x, y));
    road.d.push_back(s);
  }
  const double look = 500.0, step = 10.0;
  const std::size_t n = road.d.size();
  std::vector<double> reference(n);
  for (std::size_t i = 0; i < n; ++i) {
    const SightPoint eye{road.x[i], road.y[i], road.z[i] + 1.4};
    std::size_t last = i;
    bool whole = true;
    for (std::size_t j = i + 1; j < n && road.d[j] - road.d[i] <= look; ++j) {
      if (!line_of_sight_clear(eye, {road.x[j], road.y[j], road.z[j]}, hills, step)) {
        whole = false;
        break;
      }
      last = j;
    }
    reference[i] = whole ? std::min(look, road.d.back() - road.d[i]) : road.d[last] - road.d[i];
  }
  TerrainSightTuning every_station;
  every_station.verify_step_m = 5.0;
  const auto checked = terrain_sight_distance_m(road.x, road.y, road.z, road.d, hills, 1.4, 0.0,
                                                look, step, every_station);
  TerrainSightTuning carried;
  carried.verify_step_m = 0.0;
  const auto fast = terrain_sight_distance_m(road.x, road.y, road.z, road.d, hills, 1.4, 0.0, look,
                                             step, carried);
  const auto standard = terrain_sight_distance_m(road.x, road.y, road.z, road.d, hills, 1.4, 0.0,
                                                 look, step);
  std::size_t overstated = 0, short_views = 0;
  for (std::size_t i = 0; i < n; ++i) {
    EXPECT_NEAR(checked[i], reference[i], 1e-9) << "station " << i;
    EXPECT_GE(fast[i], reference[i] - 1e-9) << "station " << i;
    EXPECT_GE(standard[i], reference[i] - 1e-9) << "station " << i;
    if (fast[i] > reference[i] + 1e-9) ++overstated;
    if (reference[i] < std::min(look, road.d.back() - road.d[i]) - 1e-9) ++short_views;
  }
  EXPECT_GT(short_views, n / 10);  // the terrain really does cut views short here
  EXPECT_GT(overstated, 0u);       // ... and the unchecked carried scan really does overstate
}

// ---- visible approach (exact, per target)

TEST(SightApproach, MatchesTangentGeometryOnAParabolicCrest) {
  // derived: as in SightCrest.MatchesTangentGeometryOnAParabolicCrest, an eye sees the road
  // surface up to sqrt(2 K h1) ahead on the curve, so a road point is in view from that far
  // back. Tolerance: one station spacing.
  const double K = 2000.0, h1 = 1.4, spacing = 2.0;
  const auto p = make_profile(-400.0, 400.0, spacing, [&](double x) { return -x * x / (2 * K); });
  const std::vector<double> y(p.d.size(), 0.0);
  std::vector<std::size_t> targets;
  for (double x_t : {-250.0, -60.0, 0.0, 40.0, 300.0}) {
    targets.push_back(static_cast<std::size_t>(std::llround((x_t + 400.0) / spacing)));
  }
  const auto back = visible_approach_m(p.d, y, p.z, p.d, targets, {}, h1, 0.0, 500.0, 5.0);
  ASSERT_EQ(back.size(), targets.size());
  for (std::size_t k = 0; k < targets.size(); ++k) {
    EXPECT_NEAR(back[k], std::sqrt(2.0 * K * h1), spacing) << "target " << targets[k];
  }
}

TEST(SightApproach, MatchesThePlateauBrowClosedForm) {
  // derived: level road to x = 100 m, then -10 %. A point b metres down the slope is seen from
  // eyes at most h1 / 0.1 = 14 m before the brow (the brow must lie below the line), so from
  // b + 14 m back; a point on the level is seen from the start of the course.
  const auto p = make_profile(0.0, 400.0, 1.0,
                              [](double x) { return x <= 100.0 ? 0.0 : -0.1 * (x - 100.0); });
  const std::vector<double> y(p.d.size(), 0.0);
  const auto back = visible_approach_m(p.d, y, p.z, p.d, {110, 130, 95}, {}, 1.4, 0.0, 200.0, 5.0);
  EXPECT_NEAR(back[0], 24.0, 1.0);
  EXPECT_NEAR(back[1], 44.0, 1.0);
  EXPECT_NEAR(back[2], 95.0, 1e-9);
  // Consistent with the per-station view: the corner at 110 m is hidden at a 40 m need.
  const auto sight = crest_sight_distance_m(p.d, p.z, 1.4, 0.0, 200.0);
  const std::vector<double> need(p.d.size(), 40.0);
  EXPECT_EQ(back[0] < 40.0, hidden_in_time(p.d, sight, need, 110.0, 200.0));
}

TEST(SightApproach, MatchesChordGeometryAroundACylindricalHill) {
  // derived: as in SightTerrain.MatchesChordGeometryAroundACylindricalHill, by symmetry a road
  // point is seen from 2 R acos(r / R) = 70.28 m of arc back. Tolerance: one station spacing.
  const double R = 60.0, r = 50.0, spacing = 1.0;
  const Road road = circle_road(R, 1.5 * std::numbers::pi * R, spacing);
  const TerrainHeight hill = [&](double x, double y) { return std::hypot(x, y) < r ? 30.0 : 0.0; };
  const auto back = visible_approach_m(road.x, road.y, road.z, road.d, {100, 150, 250}, hill, 1.4,
                                       0.0, 300.0, 0.25);
  for (double b : back) EXPECT_NEAR(b, 2.0 * R * std::acos(r / R), spacing + 0.05);
  // Without the terrain only the (flat) profile counts: seen from the look-ahead or the start.
  const auto flat = visible_approach_m(road.x, road.y, road.z, road.d, {100, 250}, {}, 1.4, 0.0,
                                       200.0, 0.25);
  EXPECT_NEAR(flat[0], 100.0, 1e-9);
  EXPECT_NEAR(flat[1], 200.0, 1e-9);
}

TEST(SightApproach, RejectsATargetBeyondTheCourse) {
  const Road road = circle_road(60.0, 50.0, 5.0);
  EXPECT_THROW(visible_approach_m(road.x, road.y, road.z, road.d, {road.d.size()}, {}, 1.4, 0.0,
                                  100.0, 5.0),
               Error);
}

// ---- hidden stretches

TEST(SightHidden, FindsTheStretchHiddenBehindAPlateauBrow) {
  // derived (see SightCrest.EndsAtTheBrowOfAPlateauUnlessTheEyeIsCloseToIt): with a need of
  // 40 m, riders between x = 60 m and x = 86 m see only to the brow at 100 m; from 86 m on they
  // see down the slope (100 - 86 = 14 = h1 / 0.1). Road not seen in time: from the brow (100 m)
  // to 86 + 40 = 126 m. Tolerances: one station spacing (1 m).
  const auto p = make_profile(0.0, 400.0, 1.0,
                              [](double x) { return x <= 100.0 ? 0.0 : -0.1 * (x - 100.0); });
  const auto sight = crest_sight_distance_m(p.d, p.z, 1.4, 0.0, 200.0);
  const std::vector<double> need(p.d.size(), 40.0);
  const auto stretches = hidden_stretches(p.d, sight, need, 200.0);
  ASSERT_EQ(stretches.size(), 1u);
  const HiddenStretch& h = stretches[0];
  EXPECT_NEAR(h.from_m, 60.0, 1.0);
  EXPECT_NEAR(h.to_m, 86.0, 1.0);
  EXPECT_NEAR(h.hidden_from_m, 100.0, 1.0);
  EXPECT_NEAR(h.hidden_to_m, 126.0, 1.0);
  EXPECT_NEAR(h.worst_shortfall_m, 40.0 - 14.0, 1.0);  // at the last position before 86 m
  EXPECT_NEAR(h.worst_at_m, 86.0, 1.0);
  // A corner 10 m down the slope lies in the hidden part; one before the brow and one beyond
  // 126 m do not.
  EXPECT_TRUE(hidden_in_time(p.d, sight, need, 110.0, 200.0));
  EXPECT_FALSE(hidden_in_time(p.d, sight, need, 95.0, 200.0));
  EXPECT_FALSE(hidden_in_time(p.d, sight, need, 130.0, 200.0));
}

TEST(SightHidden, CapsTheNeedAtTheCourseEndAndTheLookAhead) {
  const std::vector<double> d{0, 10, 20, 30, 40, 50};
  // The view reaches the finish everywhere (sight = remaining length).
  const std::vector<double> sight{50, 40, 30, 20, 10, 0};
  const std::vector<double> need(d.size(), 100.0);
  EXPECT_TRUE(hidden_stretches(d, sight, need, 500.0).empty());
  // Sights of 25 m are short of a 100 m need unless the look-ahead was 25 m.
  const std::vector<double> sight25(d.size(), 25.0);
  EXPECT_TRUE(hidden_stretches(d, sight25, need, 25.0).empty());
  const auto s = hidden_stretches(d, sight25, need, 500.0);
  ASSERT_EQ(s.size(), 1u);
  EXPECT_DOUBLE_EQ(s[0].from_m, 0.0);
  EXPECT_DOUBLE_EQ(s[0].to_m, 20.0);  // from 30 m on, the remaining length is at most 20 m
  EXPECT_DOUBLE_EQ(s[0].hidden_from_m, 25.0);
  EXPECT_DOUBLE_EQ(s[0].hidden_to_m, 50.0);
  EXPECT_DOUBLE_EQ(s[0].worst_shortfall_m, 25.0);
  EXPECT_DOUBLE_EQ(s[0].worst_at_m, 0.0);
}

TEST(SightHidden, SkipsStationsWithoutASightValueAndSplitsRuns) {
  const std::vector<double> d{0, 10, 20, 30, 40, 50, 60, 70};
  const double nan = std::nan("");
  const std::vector<double> sight{50, 5, nan, 5, 50, 5, 50, 0};
  const std::vector<double> need(d.size(), 8.0);
  const auto s = hidden_stretches(d, sight, need, 500.0);
  ASSERT_EQ(s.size(), 3u);
  EXPECT_DOUBLE_EQ(s[0].from_m, 10.0);
  EXPECT_DOUBLE_EQ(s[1].from_m, 30.0);
  EXPECT_DOUBLE_EQ(s[2].from_m, 50.0);
  EXPECT_DOUBLE_EQ(s[2].hidden_from_m, 55.0);
  EXPECT_DOUBLE_EQ(s[2].hidden_to_m, 58.0);
  EXPECT_THROW(hidden_stretches(d, sight, std::vector<double>(d.size(), nan), 500.0), Error);
  EXPECT_THROW(hidden_stretches(d, sight, std::vector<double>(3, 1.0), 500.0), Error);
}
