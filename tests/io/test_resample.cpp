// Projection and uniform resampling: lengths are ground (geodesic) lengths.
#include <gtest/gtest.h>

#include <GeographicLib/Geodesic.hpp>

#include <cmath>

#include "coursewarden/geometry.hpp"

using namespace coursewarden;

namespace {
RawCourse winding_course() {
  // An invented wiggly line ~60 km long at mid latitude.
  RawCourse c;
  for (int i = 0; i <= 600; ++i) {
    const double t = i / 600.0;
    c.vertices.push_back({3.0 + 0.7 * t + 0.01 * std::sin(40 * t), 46.0 + 0.25 * t + 0.02 * std::cos(23 * t)});
  }
  return c;
}
}  // namespace

TEST(Resample, CourseLengthAgreesWithGeographicLibWithin0p05Percent) {
  const RawCourse c = winding_course();
  // Reference: GeographicLib's geodesic sum of the input vertices, computed here directly.
  const auto& geod = GeographicLib::Geodesic::WGS84();
  double reference_m = 0.0;
  for (std::size_t i = 1; i < c.vertices.size(); ++i) {
    double s = 0;
    geod.Inverse(c.vertices[i - 1].lat_deg, c.vertices[i - 1].lon_deg, c.vertices[i].lat_deg,
                 c.vertices[i].lon_deg, s);
    reference_m += s;
  }
  double lon0, lat0;
  course_centre(c, lon0, lat0);
  const auto proj = LocalProjection::centred_on(lon0, lat0);
  const auto st = resample_course(c, 5.0, proj);
  EXPECT_NEAR(st.back().distance_m, reference_m, reference_m * 0.0005);
  // Uniform spacing except the last step.
  for (std::size_t i = 1; i + 1 < st.size(); ++i) ASSERT_NEAR(st[i].distance_m - st[i - 1].distance_m, 5.0, 1e-9);
  EXPECT_GT(st.back().distance_m - st[st.size() - 2].distance_m, 0.0);
  EXPECT_LE(st.back().distance_m - st[st.size() - 2].distance_m, 5.0 + 1e-9);
  // In the local plane, neighbouring stations are ~5 m apart (TM scale error < 1e-4 within
  // ~60 km of the centre: derived from k = 1 + x^2 / (2 R^2)).
  for (std::size_t i = 1; i + 1 < st.size(); i += 97) {
    const double plane = std::hypot(st[i].x_m - st[i - 1].x_m, st[i].y_m - st[i - 1].y_m);
    EXPECT_NEAR(plane, 5.0, 5.0 * 2e-4);
  }
}

TEST(Resample, HeadingIsClockwiseFromNorth) {
  RawCourse east;
  east.vertices = {{3.0, 46.0}, {3.01, 46.0}};
  const auto proj = LocalProjection::centred_on(3.005, 46.0);
  const auto st = resample_course(east, 5.0, proj);
  EXPECT_NEAR(st[10].heading_rad, M_PI / 2, 1e-3);  // due east = 90 deg
  RawCourse south;
  south.vertices = {{3.0, 46.01}, {3.0, 46.0}};
  const auto st2 = resample_course(south, 5.0, LocalProjection::centred_on(3.0, 46.005));
  EXPECT_NEAR(st2[10].heading_rad, M_PI, 1e-3);
}

TEST(Resample, UserCrsMustBeProjected) {
  EXPECT_NO_THROW(LocalProjection::from_user_crs("EPSG:32631"));
  EXPECT_THROW(LocalProjection::from_user_crs("EPSG:4326"), std::exception);
  EXPECT_THROW(LocalProjection::from_user_crs("EPSG:nonsense"), std::exception);
}
