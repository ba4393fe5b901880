// The profile command end to end, in-process: tilted-plane DEM with known answers, outputs and
// errors.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <GeographicLib/Geodesic.hpp>

#include <filesystem>
#include <sstream>

#include "cli/run.hpp"
#include "support/support.hpp"

namespace {

struct Result {
  int code;
  std::string out, err;
};

Result run_cli(std::vector<std::string> args) {
  args.insert(args.begin(), "coursewarden");
  std::ostringstream out, err;
  const int code = coursewarden::cli::run(args, out, err);
  return {code, out.str(), err.str()};
}

// z = 250 + 0.03 (x - 500000) in UTM 31N: rises 3 % to the east (derived reference plane).
double east_rise(double x, double) { return 250.0 + 0.03 * (x - 500000.0); }

struct PlaneScene {
  cwtest::TempDir dir;
  std::string dem, course;
  double x0 = 501000.0, x1 = 505000.0, y = 5097000.0;
  PlaneScene() {
    cwtest::RasterSpec spec;
    dem = dir.file("plane.tif");
    cwtest::write_raster(dem, spec, east_rise);
    course = dir.file("east.gpx");
    cwtest::write_gpx(course, {{"Eastward", {cwtest::straight_line("EPSG:32631", x0, y, x1, y, 41)}}});
  }
};

}  // namespace

TEST(CliProfile, TiltedPlaneGivesClosedFormAscentAndLength) {
  PlaneScene s;
  const auto r = run_cli({"profile", s.course, "--dem", s.dem, "--json", "-"});
  ASSERT_EQ(r.code, 0) << r.err;
  const auto j = nlohmann::json::parse(r.out);
  // Closed form on the plane: ascent = z(end) - z(start) = 0.03 x 4000 m = 120 m (derived).
  EXPECT_NEAR(j["ascent_m"].get<double>(), 120.0, 0.2);
  EXPECT_NEAR(j["descent_m"].get<double>(), 0.0, 0.2);
  EXPECT_NEAR(j["min_elevation_m"].get<double>(), east_rise(s.x0, 0), 0.1);
  EXPECT_NEAR(j["max_elevation_m"].get<double>(), east_rise(s.x1, 0), 0.1);
  // Length: GeographicLib's geodesic sum of the input vertices (reference library), 0.05 %.
  auto pts = cwtest::straight_line("EPSG:32631", s.x0, s.y, s.x1, s.y, 41);
  double ref = 0;
  for (std::size_t i = 1; i < pts.size(); ++i) {
    double d = 0;
    GeographicLib::Geodesic::WGS84().Inverse(pts[i - 1].lat, pts[i - 1].lon, pts[i].lat, pts[i].lon, d);
    ref += d;
  }
  EXPECT_NEAR(j["length_m"].get<double>(), ref, ref * 0.0005);
  EXPECT_DOUBLE_EQ(j["dem_coverage_pct"].get<double>(), 100.0);
  EXPECT_TRUE(j["repairs"].empty());
  ASSERT_EQ(j["climbs"].size(), 1u);
  // One climb, 3 % over ~4 km: score 3^2 x 4 = 36 -> category 4 (scale in check-values.md sec. 7).
  EXPECT_NEAR(j["climbs"][0]["mean_grade_pct"].get<double>(), 3.0, 0.05);
  EXPECT_EQ(j["climbs"][0]["category"], "4");
  EXPECT_NE(j["disclaimer"].get<std::string>().find("safety officers"), std::string::npos);
}

TEST(CliProfile, WritesCsvAndJsonFilesAndAReadableSummary) {
  PlaneScene s;
  const std::string json = s.dir.file("out.json"), csv = s.dir.file("out.csv");
  const auto r = run_cli({"profile", s.course, "--dem", s.dem, "--json", json, "--csv", csv, "--spacing", "10"});
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_NE(r.out.find("Length"), std::string::npos);
  EXPECT_NE(r.out.find("Climbs"), std::string::npos);
  EXPECT_NE(r.out.find("safety officers"), std::string::npos);
  for (const auto& line : [&] {
         std::vector<std::string> v;
         std::istringstream in(r.out);
         for (std::string l; std::getline(in, l);) v.push_back(l);
         return v;
       }()) {
    EXPECT_LE(line.size(), 100u) << line;
  }
  const std::string text = cwtest::read_text(csv);
  EXPECT_EQ(text.rfind("distance_m,lon,lat,elevation_m,grade_pct\n", 0), 0u);
  std::istringstream in(text);
  std::string header, first, second;
  std::getline(in, header);
  std::getline(in, first);
  std::getline(in, second);
  EXPECT_EQ(second.rfind("10.0,", 0), 0u) << second;  // spacing honoured
  EXPECT_NE(second.find(",3.00"), std::string::npos) << second;  // 3 % plane gradient
  EXPECT_NO_THROW((void)nlohmann::json::parse(cwtest::read_text(json)));
}

TEST(CliProfile, CourseOutsideTheDemNamesBothExtentsAndWritesNothing) {
  PlaneScene s;
  cwtest::write_gpx(s.dir.file("far.gpx"), {{"Far", {{{10.0, 50.0}, {10.01, 50.0}}}}});
  const std::string json = s.dir.file("never.json");
  const auto r = run_cli({"profile", s.dir.file("far.gpx"), "--dem", s.dem, "--json", json});
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("plane.tif"), std::string::npos);
  EXPECT_NE(r.err.find("mostly outside the DEM"), std::string::npos);
  EXPECT_NE(r.err.find("course lon 10.0000"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("DEM lon"), std::string::npos);
  EXPECT_EQ(std::count(r.err.begin(), r.err.end(), '\n'), 1);
  EXPECT_FALSE(std::filesystem::exists(json));
}

TEST(CliProfile, CourseElevationsCanReplaceOrBeComparedWithTheDem) {
  PlaneScene s;
  auto pts = cwtest::straight_line("EPSG:32631", s.x0, s.y, s.x1, s.y, 41);
  for (std::size_t i = 0; i < pts.size(); ++i) {
    auto [x, y] = cwtest::to_crs("EPSG:32631", pts[i].lon, pts[i].lat);
    pts[i].ele = east_rise(x, y) + 2.0;  // the file reads 2 m high everywhere
    pts[i].has_ele = true;
  }
  cwtest::write_gpx(s.dir.file("ele.gpx"), {{"WithEle", {pts}}});
  auto r = run_cli({"profile", s.dir.file("ele.gpx"), "--elevation", "compare", "--dem", s.dem, "--json", "-"});
  ASSERT_EQ(r.code, 0) << r.err;
  auto j = nlohmann::json::parse(r.out);
  EXPECT_NEAR(j["file_vs_dem"]["mean_difference_m"].get<double>(), 2.0, 0.01);
  EXPECT_NEAR(j["file_vs_dem"]["rms_difference_m"].get<double>(), 2.0, 0.01);
  r = run_cli({"profile", s.dir.file("ele.gpx"), "--elevation", "course", "--json", "-"});
  ASSERT_EQ(r.code, 0) << r.err;
  j = nlohmann::json::parse(r.out);
  EXPECT_TRUE(j["dem"].is_null());
  EXPECT_NEAR(j["min_elevation_m"].get<double>(), east_rise(s.x0, 0) + 2.0, 0.1);
  r = run_cli({"profile", s.course, "--elevation", "course"});
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("no elevations"), std::string::npos);
}

TEST(CliProfile, UsageErrorsAndBadInputExitNonZeroWithOneLine) {
  PlaneScene s;
  EXPECT_EQ(run_cli({}).code, 2);
  EXPECT_EQ(run_cli({"profile"}).code, 2);
  EXPECT_EQ(run_cli({"profile", s.course, "--elevation", "guess"}).code, 2);
  auto r = run_cli({"profile", s.dir.file("nope.gpx"), "--dem", s.dem});
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("nope.gpx: file not found"), std::string::npos) << r.err;
  r = run_cli({"profile", s.course, "--dem", s.dir.file("nope.tif")});
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("nope.tif"), std::string::npos);
  r = run_cli({"profile", s.course});
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("--dem"), std::string::npos);
  r = run_cli({"profile", s.course, "--dem", s.dem, "--spacing", "0"});
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("spacing"), std::string::npos);
  r = run_cli({"profile", s.course, "--dem", s.dem, "--category-scale", "35,80,70,300,600"});
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("--category-scale"), std::string::npos);
}
