// Reading courses from every supported format, cleaning, and refusing bad input clearly.
#include <gtest/gtest.h>

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include <GeographicLib/Geodesic.hpp>

#include <cmath>
#include <string>

#include "coursewarden/course.hpp"
#include "coursewarden/course_io.hpp"
#include "coursewarden/error.hpp"
#include "support/support.hpp"

using namespace coursewarden;
using cwtest::LonLat;

namespace {

// Expects read_course + clean_course to throw an Error whose one line contains every fragment.
void expect_refused(const std::string& path, std::initializer_list<std::string> fragments,
                    const CourseReadOptions& options = {}) {
  try {
    RawCourse c = read_course(path, options);
    clean_course(c);
    FAIL() << "expected an error for " << path;
  } catch (const Error& e) {
    const std::string msg = e.what();
    EXPECT_EQ(msg.find('\n'), std::string::npos) << "one line: " << msg;
    for (const auto& f : fragments) EXPECT_NE(msg.find(f), std::string::npos) << "'" << f << "' in: " << msg;
  }
}

std::vector<LonLat> line_east(double lon0, double lat0, int n, double step_deg, double ele0 = NAN) {
  std::vector<LonLat> pts;
  for (int i = 0; i < n; ++i) {
    LonLat p{lon0 + step_deg * i, lat0};
    if (!std::isnan(ele0)) {
      p.ele = ele0 + i;
      p.has_ele = true;
    }
    pts.push_back(p);
  }
  return pts;
}

}  // namespace

TEST(CourseReader, GpxJoinsSegmentsInOrderAndReportsTheGap) {
  cwtest::TempDir dir;
  const auto a = line_east(3.0, 46.0, 10, 0.001, 300.0);
  const auto b = line_east(3.0105, 46.0, 10, 0.001, 320.0);
  cwtest::write_gpx(dir.file("c.gpx"), {{"Loop", {a, b}}});
  RawCourse c = read_course(dir.file("c.gpx"));
  ASSERT_EQ(c.vertices.size(), 20u);
  EXPECT_EQ(c.name, "Loop");
  ASSERT_EQ(c.gaps.size(), 1u);
  EXPECT_EQ(c.gaps[0].after_vertex, 9u);
  // Gap from lon 3.009 to 3.0105 at 46 N, WGS84 geodesic (GeographicLib, reference library).
  double expected = 0;
  GeographicLib::Geodesic::WGS84().Inverse(46.0, 3.009, 46.0, 3.0105, expected);
  EXPECT_NEAR(c.gaps[0].gap_m, expected, 1e-6);
  EXPECT_TRUE(c.has_elevations);
  EXPECT_DOUBLE_EQ(c.vertices[12].elevation_m, 322.0);
}

TEST(CourseReader, PicksATrackByNameOrIndexAndSaysWhichItTook) {
  cwtest::TempDir dir;
  cwtest::write_gpx(dir.file("two.gpx"), {{"Short", {line_east(3.0, 46.0, 5, 0.001)}},
                                          {"Long", {line_east(3.0, 46.1, 9, 0.001)}}});
  RawCourse first = read_course(dir.file("two.gpx"));
  EXPECT_EQ(first.name, "Short");
  EXPECT_EQ(first.vertices.size(), 5u);
  ASSERT_FALSE(first.notes.empty());
  EXPECT_NE(first.notes[0].find("2 tracks"), std::string::npos);
  EXPECT_EQ(read_course(dir.file("two.gpx"), {"Long"}).vertices.size(), 9u);
  EXPECT_EQ(read_course(dir.file("two.gpx"), {"1"}).name, "Long");
  expect_refused(dir.file("two.gpx"), {"--track Nope", "0 'Short'", "1 'Long'"}, {"Nope"});
}

TEST(CourseReader, GeoJsonMultiLineStringAndKml) {
  cwtest::TempDir dir;
  cwtest::write_text(dir.file("c.geojson"), R"({"type":"FeatureCollection","features":[
    {"type":"Feature","properties":{"name":"Ridge"},"geometry":{"type":"MultiLineString",
     "coordinates":[[[3.0,46.0,100],[3.001,46.0,101]],[[3.002,46.0,102],[3.003,46.0,103]]]}}]})");
  RawCourse g = read_course(dir.file("c.geojson"));
  EXPECT_EQ(g.name, "Ridge");
  EXPECT_EQ(g.vertices.size(), 4u);
  EXPECT_EQ(g.gaps.size(), 1u);
  EXPECT_DOUBLE_EQ(g.vertices[3].elevation_m, 103.0);

  cwtest::write_text(dir.file("c.kml"), R"(<?xml version="1.0" encoding="UTF-8"?>
<kml xmlns="http://www.opengis.net/kml/2.2"><Document><Placemark><name>Valley</name>
<LineString><coordinates>3.0,46.0,0 3.001,46.0,0 3.002,46.001,0</coordinates></LineString>
</Placemark></Document></kml>)");
  RawCourse k = read_course(dir.file("c.kml"));
  EXPECT_EQ(k.name, "Valley");
  EXPECT_EQ(k.vertices.size(), 3u);
  EXPECT_FALSE(k.has_elevations);  // Z = 0 everywhere is "clamped to ground", not heights
}

TEST(CourseReader, CsvWithLatitudeLongitudeColumns) {
  cwtest::TempDir dir;
  cwtest::write_text(dir.file("c.csv"), "latitude,longitude,ele\n46.0,3.0,200.5\n46.0,3.001,201\n46.001,3.002,202\n");
  RawCourse c = read_course(dir.file("c.csv"));
  ASSERT_EQ(c.vertices.size(), 3u);
  EXPECT_DOUBLE_EQ(c.vertices[1].lon_deg, 3.001);
  EXPECT_DOUBLE_EQ(c.vertices[0].elevation_m, 200.5);
  cwtest::write_text(dir.file("bad.csv"), "lat,lon\n46.0,3.0\nabc,3.001\n");
  expect_refused(dir.file("bad.csv"), {"bad.csv", "row 3"});
}

TEST(CourseReader, ShapefileAndGeoPackageInAProjectedCrsAreBroughtToLonLat) {
  cwtest::TempDir dir;
  GDALAllRegister();
  const auto [x0, y0] = cwtest::to_crs("EPSG:32631", 3.0, 46.0);
  for (const std::string drv : {"ESRI Shapefile", "GPKG"}) {
    const std::string path = dir.file(drv == "GPKG" ? "c.gpkg" : "c.shp");
    GDALDataset* ds = GetGDALDriverManager()->GetDriverByName(drv.c_str())->Create(
        path.c_str(), 0, 0, 0, GDT_Unknown, nullptr);
    OGRSpatialReference utm;
    utm.importFromEPSG(32631);
    OGRLayer* layer = ds->CreateLayer("course", &utm, wkbLineString, nullptr);
    OGRFieldDefn name("name", OFTString);
    layer->CreateField(&name);
    OGRFeature f(layer->GetLayerDefn());
    f.SetField("name", "Plain");
    OGRLineString line;
    line.addPoint(x0, y0);
    line.addPoint(x0 + 1000.0, y0);
    f.SetGeometry(&line);
    ASSERT_EQ(layer->CreateFeature(&f), OGRERR_NONE);
    GDALClose(ds);
    RawCourse c = read_course(path);
    ASSERT_EQ(c.vertices.size(), 2u) << drv;
    EXPECT_NEAR(c.vertices[0].lon_deg, 3.0, 1e-8) << drv;  // PROJ round trip
    EXPECT_NEAR(c.vertices[0].lat_deg, 46.0, 1e-8) << drv;
    EXPECT_EQ(c.name, "Plain");
  }
}

TEST(CourseClean, DropsDuplicatesAndRemovesASpikeButKeepsASparseHairpin) {
  RawCourse c;
  c.source_path = "dense.gpx";
  for (int i = 0; i < 100; ++i) c.vertices.push_back({3.0 + 0.0001 * i, 46.0});  // ~7.7 m steps
  c.vertices.insert(c.vertices.begin() + 20, c.vertices[20]);           // duplicate
  c.vertices[51].lat_deg += 0.003;                                      // ~330 m spike
  const auto report = clean_course(c);
  EXPECT_EQ(report.duplicates_dropped, 1u);
  ASSERT_EQ(report.spikes.size(), 1u);
  EXPECT_EQ(report.spikes[0].input_index, 51u);
  EXPECT_GT(report.spikes[0].offset_m, 300.0);
  EXPECT_EQ(c.vertices.size(), 99u);

  // A route drawn with few vertices: a hairpin apex 400 m up the slope from two vertices 30 m
  // apart is a real bend, not a spike, because the route's spacing is that coarse everywhere.
  RawCourse sparse;
  sparse.source_path = "sparse.gpx";
  sparse.vertices = {{3.0, 46.0}, {3.0, 46.004}, {3.0004, 46.0}, {3.0004, 46.004}, {3.0008, 46.0}};
  EXPECT_TRUE(clean_course(sparse).spikes.empty());
  EXPECT_EQ(sparse.vertices.size(), 5u);

  // A dense track with one vertex 1.5 km out and back: too long to be GPS noise (legs over
  // 500 m), so it is kept and flagged rather than cutting 3 km from the course.
  RawCourse spur;
  spur.source_path = "spur.gpx";
  for (int i = 0; i < 100; ++i) spur.vertices.push_back({3.0 + 0.0001 * i, 46.0});
  spur.vertices[50].lat_deg += 0.0135;  // ~1.5 km north
  const auto spur_report = clean_course(spur);
  EXPECT_TRUE(spur_report.spikes.empty());
  ASSERT_EQ(spur_report.suspect_spikes.size(), 1u);
  EXPECT_EQ(spur.vertices.size(), 100u);
  EXPECT_NE(spur.notes.back().find("check it"), std::string::npos);
}

TEST(CourseReader, BadInputGetsOneClearLine) {
  cwtest::TempDir dir;
  expect_refused(dir.file("missing.gpx"), {"missing.gpx", "not found"});
  cwtest::write_text(dir.file("empty.gpx"), "");
  expect_refused(dir.file("empty.gpx"), {"empty.gpx", "empty"});
  cwtest::write_text(dir.file("junk.gpx"), "this is not xml at all");
  expect_refused(dir.file("junk.gpx"), {"junk.gpx", "GDAL can"});
  cwtest::write_text(dir.file("points.geojson"), R"({"type":"FeatureCollection","features":[
    {"type":"Feature","properties":{},"geometry":{"type":"Point","coordinates":[3,46]}}]})");
  expect_refused(dir.file("points.geojson"), {"points.geojson", "no line geometry"});
  cwtest::write_gpx(dir.file("one.gpx"), {{"One", {line_east(3.0, 46.0, 1, 0.001)}}});
  expect_refused(dir.file("one.gpx"), {"one.gpx", "1 point(s)", "at least two"});
  cwtest::write_text(dir.file("range.csv"), "lat,lon\n46.0,3.0\n96.0,3.001\n");
  expect_refused(dir.file("range.csv"), {"range.csv", "point 2", "out of range"});
  cwtest::write_text(dir.file("nan.geojson"), R"({"type":"FeatureCollection","features":[
    {"type":"Feature","properties":{},"geometry":{"type":"LineString","coordinates":[[3,46],[3.1,46],[1e400,46]]}}]})");
  expect_refused(dir.file("nan.geojson"), {"nan.geojson", "point 3"});
  cwtest::write_gpx(dir.file("dateline.gpx"), {{"Across", {{{179.999, -17.0}, {-179.999, -17.0}}}}});
  expect_refused(dir.file("dateline.gpx"), {"dateline.gpx", "point 2", "antimeridian"});
  cwtest::write_gpx(dir.file("same.gpx"), {{"Same", {{{3.0, 46.0}, {3.0, 46.0}, {3.0, 46.0}}}}});
  expect_refused(dir.file("same.gpx"), {"same.gpx", "no length"});
}

TEST(CourseReader, GpxRoutesAndPointTimesAreKept) {
  cwtest::TempDir dir;
  cwtest::write_text(dir.file("route.gpx"), R"(<?xml version="1.0"?>
<gpx version="1.1" creator="t" xmlns="http://www.topografix.com/GPX/1/1">
 <rte><name>Planned</name>
  <rtept lat="46.0" lon="3.0"><ele>300</ele></rtept>
  <rtept lat="46.0" lon="3.01"><ele>310</ele></rtept>
  <rtept lat="46.01" lon="3.01"><ele>320</ele></rtept>
 </rte>
</gpx>)");
  RawCourse r = read_course(dir.file("route.gpx"));
  EXPECT_EQ(r.name, "Planned");
  ASSERT_EQ(r.vertices.size(), 3u);
  EXPECT_TRUE(r.has_elevations);
  EXPECT_FALSE(r.has_times);

  cwtest::write_text(dir.file("timed.gpx"), R"(<?xml version="1.0"?>
<gpx version="1.1" creator="t" xmlns="http://www.topografix.com/GPX/1/1">
 <trk><name>Ride</name><trkseg>
  <trkpt lat="46.0" lon="3.0"><time>2026-06-14T07:30:00Z</time></trkpt>
  <trkpt lat="46.0" lon="3.001"><time>2026-06-14T07:30:12Z</time></trkpt>
 </trkseg></trk>
</gpx>)");
  RawCourse t = read_course(dir.file("timed.gpx"));
  ASSERT_TRUE(t.has_times);
  // 2026-06-14T07:30:00Z as Unix time: 20618 days x 86400 s + 27000 s = 1781422200
  // (derived: days from 1970-01-01 by the proleptic Gregorian calendar; GNU date agrees).
  EXPECT_DOUBLE_EQ(t.vertices[0].time_s, 1781422200.0);
  EXPECT_DOUBLE_EQ(t.vertices[1].time_s - t.vertices[0].time_s, 12.0);
}
