// The files beside the report (GeoJSON, GPX, CSV), read back with GDAL/OGR and compared with
// summary.json and with the sample course's design (sample_courses/ronde-orvalune/README.md,
// features.csv).
#include <gtest/gtest.h>

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include <nlohmann/json.hpp>

#include <cmath>
#include <map>
#include <memory>
#include <regex>
#include <string>

#include "coursewarden/check.hpp"
#include "coursewarden/check_outputs.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/gis_outputs.hpp"
#include "coursewarden/report.hpp"
#include "coursewarden/report_files.hpp"
#include "support/support.hpp"
#include "util/text.hpp"

using namespace coursewarden;

namespace {

const std::string kSample = std::string(COURSEWARDEN_SOURCE_DIR) + "/sample_courses/ronde-orvalune";

const CheckResult& sample() {
  static const CheckResult result = [] {
    CheckOptions options;
    options.analysis.course_path = kSample + "/course.gpx";
    options.analysis.dem_path = kSample + "/dem.tif";
    return run_check(options);
  }();
  return result;
}

// The sample's output folder, written once for the whole file.
const std::string& folder() {
  static cwtest::TempDir dir;
  static const std::string out = [] {
    ReportInfo info;
    info.check_date = "2025-01-01";
    write_check_folder(sample(), dir.file("out"), info);
    return dir.file("out");
  }();
  return out;
}

const nlohmann::json& summary() {
  static const nlohmann::json j = nlohmann::json::parse(cwtest::read_text(folder() + "/summary.json"));
  return j;
}

struct DatasetCloser {
  void operator()(GDALDataset* ds) const { GDALClose(ds); }
};
using Dataset = std::unique_ptr<GDALDataset, DatasetCloser>;

// Opens a vector file with exactly one GDAL driver, as a GIS user's tool would.
Dataset open_vector(const std::string& path, const char* driver, const char* const* open_options = nullptr) {
  GDALAllRegister();
  const char* drivers[] = {driver, nullptr};
  return Dataset(static_cast<GDALDataset*>(
      GDALOpenEx(path.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY, drivers, open_options, nullptr)));
}

struct FeatureCloser {
  void operator()(OGRFeature* f) const { OGRFeature::DestroyFeature(f); }
};
using Feature = std::unique_ptr<OGRFeature, FeatureCloser>;

std::vector<Feature> features_of(OGRLayer* layer) {
  std::vector<Feature> out;
  layer->ResetReading();
  while (OGRFeature* f = layer->GetNextFeature()) out.emplace_back(f);
  return out;
}

}  // namespace

TEST(GisOutputs, HazardsGeoJsonReadsBackWithGdalAndMatchesTheSummary) {
  const auto ds = open_vector(folder() + "/hazards.geojson", "GeoJSON");
  ASSERT_TRUE(ds) << CPLGetLastErrorMsg();
  ASSERT_EQ(ds->GetLayerCount(), 1);
  OGRLayer* layer = ds->GetLayer(0);
  EXPECT_STREQ(layer->GetName(), "hazards");
  EXPECT_EQ(wkbFlatten(layer->GetGeomType()), wkbPoint);
  // RFC 7946: WGS84 longitude/latitude; GDAL reads it as EPSG:4326.
  ASSERT_NE(layer->GetSpatialRef(), nullptr);
  EXPECT_STREQ(layer->GetSpatialRef()->GetAuthorityCode(nullptr), "4326");
  const auto& hazards = summary()["hazards"];
  const auto features = features_of(layer);
  ASSERT_EQ(features.size(), hazards.size());
  ASSERT_FALSE(features.empty());
  for (std::size_t k = 0; k < features.size(); ++k) {
    const OGRFeature& f = *features[k];
    const auto& h = hazards[k];
    EXPECT_EQ(f.GetFieldAsInteger("number"), h["number"].get<int>());
    EXPECT_DOUBLE_EQ(f.GetFieldAsDouble("at_m"), h["at_m"].get<double>());
    EXPECT_DOUBLE_EQ(f.GetFieldAsDouble("end_m"), h["end_m"].get<double>());
    EXPECT_EQ(std::string(f.GetFieldAsString("severity")), h["severity"].get<std::string>());
    EXPECT_EQ(std::string(f.GetFieldAsString("kind")), h["kind"].get<std::string>());
    EXPECT_EQ(f.GetFieldAsInteger("marshals"), h["marshals"].get<int>());
    EXPECT_DOUBLE_EQ(f.GetFieldAsDouble("sign_distance_m"), h["sign_distance_m"].get<double>());
    EXPECT_EQ(std::string(f.GetFieldAsString("reason")), h["reason"].get<std::string>());
    char** names = f.GetFieldAsStringList("classes");
    EXPECT_EQ(static_cast<std::size_t>(CSLCount(names)), h["classes"].size());
    const OGRPoint* p = f.GetGeometryRef()->toPoint();
    // x = longitude, y = latitude (RFC 7946 section 3.1.1), to 7 decimals like the summary.
    EXPECT_NEAR(p->getX(), h["lon"].get<double>(), 1e-9);
    EXPECT_NEAR(p->getY(), h["lat"].get<double>(), 1e-9);
    // The sample lies near 46.3 N, 3.2 E (README): longitude first, not latitude.
    EXPECT_NEAR(p->getX(), 3.3, 0.3);
    EXPECT_NEAR(p->getY(), 46.3, 0.2);
  }
}

TEST(GisOutputs, GeoJsonFilesFollowRfc7946) {
  for (const char* name : {"hazards.geojson", "course.geojson", "climbs.geojson"}) {
    const std::string text = cwtest::read_text(folder() + "/" + name);
    const auto j = nlohmann::json::parse(text);
    EXPECT_EQ(j["type"], "FeatureCollection") << name;
    EXPECT_FALSE(j.contains("crs")) << name << ": RFC 7946 section 4 removed the crs member";
    for (const auto& f : j["features"]) {
      EXPECT_EQ(f["type"], "Feature");
      ASSERT_TRUE(f.contains("properties"));
      const auto& g = f["geometry"];
      const auto& coords = g["type"] == "Point" ? nlohmann::json::array({g["coordinates"]}) : g["coordinates"];
      for (const auto& c : coords) {
        ASSERT_EQ(c.size(), 2u);
        EXPECT_GE(c[0].get<double>(), -180.0);
        EXPECT_LE(c[0].get<double>(), 180.0);
        EXPECT_GE(c[1].get<double>(), -90.0);
        EXPECT_LE(c[1].get<double>(), 90.0);
      }
    }
    // No number with more than 7 decimals anywhere (coordinates to about 1 cm).
    EXPECT_FALSE(std::regex_search(text, std::regex("[0-9]\\.[0-9]{8}"))) << name;
  }
}

TEST(GisOutputs, HazardsGpxLoadsAsGpx11Waypoints) {
  const auto ds = open_vector(folder() + "/hazards.gpx", "GPX");
  ASSERT_TRUE(ds) << CPLGetLastErrorMsg();
  OGRLayer* layer = ds->GetLayerByName("waypoints");
  ASSERT_NE(layer, nullptr);
  const auto& hazards = summary()["hazards"];
  const auto features = features_of(layer);
  ASSERT_EQ(features.size(), hazards.size());
  const std::regex name_re("H[0-9]{2,3} (note|caution|serious|critical)");
  for (std::size_t k = 0; k < features.size(); ++k) {
    const OGRFeature& f = *features[k];
    const auto& h = hazards[k];
    const std::string name = f.GetFieldAsString("name");
    EXPECT_TRUE(std::regex_match(name, name_re)) << name;
    char code[8];
    std::snprintf(code, sizeof code, "H%02d ", h["number"].get<int>());
    EXPECT_EQ(name, std::string(code) + h["severity"].get<std::string>());
    EXPECT_EQ(std::string(f.GetFieldAsString("desc")), h["reason"].get<std::string>());
    EXPECT_EQ(std::string(f.GetFieldAsString("type")), h["severity"].get<std::string>());
    const OGRPoint* p = f.GetGeometryRef()->toPoint();
    EXPECT_NEAR(p->getX(), h["lon"].get<double>(), 1e-9);
    EXPECT_NEAR(p->getY(), h["lat"].get<double>(), 1e-9);
  }
  // GPX 1.1 namespace (the GPX 1.1 schema, topografix.com) and version attribute.
  const std::string text = cwtest::read_text(folder() + "/hazards.gpx");
  EXPECT_NE(text.find("<gpx version=\"1.1\""), std::string::npos);
  EXPECT_NE(text.find("xmlns=\"http://www.topografix.com/GPX/1/1\""), std::string::npos);
}

TEST(GisOutputs, HazardsCsvReadsBackWithGdalAndMatchesTheSummary) {
  const char* options[] = {"AUTODETECT_TYPE=NO", nullptr};
  const auto ds = open_vector(folder() + "/hazards.csv", "CSV", options);
  ASSERT_TRUE(ds) << CPLGetLastErrorMsg();
  const auto& hazards = summary()["hazards"];
  const auto features = features_of(ds->GetLayer(0));
  ASSERT_EQ(features.size(), hazards.size());
  for (std::size_t k = 0; k < features.size(); ++k) {
    const OGRFeature& f = *features[k];
    const auto& h = hazards[k];
    EXPECT_EQ(std::atoi(f.GetFieldAsString("number")), h["number"].get<int>());
    EXPECT_EQ(std::string(f.GetFieldAsString("severity")), h["severity"].get<std::string>());
    // Reasons hold commas ("Sharp right bend of 90 deg, path radius ..."): quoting survives.
    EXPECT_EQ(std::string(f.GetFieldAsString("reason")), h["reason"].get<std::string>());
    EXPECT_NEAR(parse_number(f.GetFieldAsString("lat")).value(), h["lat"].get<double>(), 1e-9);
    EXPECT_NEAR(parse_number(f.GetFieldAsString("lon")).value(), h["lon"].get<double>(), 1e-9);
  }
}

TEST(GisOutputs, CourseSectionsCoverTheCourseAndCarryEveryClass) {
  const auto ds = open_vector(folder() + "/course.geojson", "GeoJSON");
  ASSERT_TRUE(ds) << CPLGetLastErrorMsg();
  OGRLayer* layer = ds->GetLayer(0);
  EXPECT_EQ(wkbFlatten(layer->GetGeomType()), wkbLineString);
  const auto features = features_of(layer);
  ASSERT_GE(features.size(), 68u);  // no section is longer than 1 km on a 68 km course
  const double length = summary()["length_m"].get<double>();
  std::map<std::string, double> class_time;
  double previous_end = 0.0;
  const OGRLineString* previous_line = nullptr;
  for (const auto& f : features) {
    const double start = f->GetFieldAsDouble("start_m"), end = f->GetFieldAsDouble("end_m");
    EXPECT_NEAR(start, previous_end, 0.11);  // contiguous (rounded to 0.1 m)
    EXPECT_LE(end - start, 1000.0 + 0.1);
    EXPECT_GT(end - start, 0.0);
    // Mean gradient = height change / length (derived: the definition of the property).
    const double grade = 100.0 * (f->GetFieldAsDouble("elevation_end_m") - f->GetFieldAsDouble("elevation_start_m")) /
                         (end - start);
    EXPECT_NEAR(f->GetFieldAsDouble("mean_grade_pct"), grade, 0.05 + 100.0 * 0.1 / (end - start));
    const OGRLineString* line = f->GetGeometryRef()->toLineString();
    ASSERT_GE(line->getNumPoints(), 2);
    if (previous_line) {  // each section starts where the previous one ended
      EXPECT_DOUBLE_EQ(line->getX(0), previous_line->getX(previous_line->getNumPoints() - 1));
      EXPECT_DOUBLE_EQ(line->getY(0), previous_line->getY(previous_line->getNumPoints() - 1));
    }
    previous_line = line;
    previous_end = end;
    for (const auto& rider : summary()["riders"]) {
      const std::string name = rider["name"].get<std::string>();
      ASSERT_GE(f->GetFieldIndex((name + "_avg_kmh").c_str()), 0) << name;
      ASSERT_GE(f->GetFieldIndex((name + "_max_unbraked_kmh").c_str()), 0) << name;
      class_time[name] += f->GetFieldAsDouble((name + "_time_s").c_str());
    }
  }
  EXPECT_NEAR(previous_end, length, 0.11);
  // Sections partition the course, so their times add up to each class's course time (derived;
  // 0.05 s rounding per section).
  for (const auto& rider : summary()["riders"]) {
    const std::string name = rider["name"].get<std::string>();
    EXPECT_NEAR(class_time[name], rider["time_s"].get<double>(), 0.05 * static_cast<double>(features.size()) + 0.1)
        << name;
  }
}

TEST(GisOutputs, ClimbsGeoJsonHoldsTheDesignedClimbs) {
  const auto ds = open_vector(folder() + "/climbs.geojson", "GeoJSON");
  ASSERT_TRUE(ds) << CPLGetLastErrorMsg();
  const auto features = features_of(ds->GetLayer(0));
  const auto& climbs = summary()["climbs"];
  ASSERT_EQ(features.size(), climbs.size());
  std::vector<const OGRFeature*> categorised;
  for (std::size_t k = 0; k < features.size(); ++k) {
    EXPECT_DOUBLE_EQ(features[k]->GetFieldAsDouble("start_m"), climbs[k]["start_m"].get<double>());
    EXPECT_DOUBLE_EQ(features[k]->GetFieldAsDouble("gain_m"), climbs[k]["gain_m"].get<double>());
    EXPECT_EQ(wkbFlatten(features[k]->GetGeometryRef()->getGeometryType()), wkbLineString);
    if (features[k]->IsFieldSetAndNotNull(features[k]->GetFieldIndex("category"))) categorised.push_back(features[k].get());
  }
  // features.csv: climb 1 km 11.402-17.537, +369 m, score 222 -> category 2; climb 2 km
  // 35.775-39.722, +209 m, score 111 -> category 3 (bounds: docs/method.md section 7).
  ASSERT_EQ(categorised.size(), 2u);
  EXPECT_STREQ(categorised[0]->GetFieldAsString("category"), "2");
  EXPECT_NEAR(categorised[0]->GetFieldAsDouble("start_m"), 11402.0, 200.0);
  EXPECT_NEAR(categorised[0]->GetFieldAsDouble("gain_m"), 368.9, 5.0);
  EXPECT_STREQ(categorised[1]->GetFieldAsString("category"), "3");
  EXPECT_NEAR(categorised[1]->GetFieldAsDouble("start_m"), 35775.0, 200.0);
  EXPECT_NEAR(categorised[1]->GetFieldAsDouble("gain_m"), 208.9, 5.0);
}

TEST(GisOutputs, HazardPointsSitOnTheDesignedHairpins) {
  // features.csv: the six hairpins of the long descent start at these km (ground distance).
  const auto ds = open_vector(folder() + "/hazards.geojson", "GeoJSON");
  ASSERT_TRUE(ds);
  const auto features = features_of(ds->GetLayer(0));
  for (double design_km : {42.137, 42.377, 42.617, 42.857, 43.097, 43.336}) {
    bool found = false;
    for (const auto& f : features) {
      if (std::string(f->GetFieldAsString("kind")) == "corner-too-fast" &&
          std::fabs(f->GetFieldAsDouble("at_m") / 1000.0 - design_km) <= 0.06) {
        found = true;
      }
    }
    EXPECT_TRUE(found) << "no corner hazard at the hairpin of km " << design_km;
  }
}

namespace {

// A course made by hand: 5 m stations; level for 1000 m, +6 % to 3500 m, -10 % to 4000 m.
CheckResult hand_made_course() {
  CheckResult r;
  r.analysis.spacing_m = 5.0;
  for (int i = 0; i <= 800; ++i) {
    const double d = 5.0 * i;
    Station s;
    s.distance_m = d;
    s.lon_deg = 3.0 + d * 1e-5;
    s.lat_deg = 46.0;
    r.analysis.stations.push_back(s);
    double h = 100.0;
    if (d > 1000.0) h += 0.06 * (std::min(d, 3500.0) - 1000.0);
    if (d > 3500.0) h -= 0.10 * (d - 3500.0);
    r.analysis.profile.distance_m.push_back(d);
    r.analysis.profile.elevation_m.push_back(h);
    r.analysis.profile.grade.push_back(0.0);
  }
  return r;
}

}  // namespace

TEST(CourseSections, SplitWhereTheGradientBandChangesAndCutLongRuns) {
  const CheckResult r = hand_made_course();
  const auto sections = course_sections(r);
  // Derived by hand: 0-1000 level; the 2500 m climb in three equal parts of 833.3 m ending on
  // the stations at or before 1833.3 m and 2666.7 m (1830 m, 2665 m); the 500 m descent whole.
  ASSERT_EQ(sections.size(), 5u);
  const double starts[] = {0, 1000, 1830, 2665, 3500};
  const double ends[] = {1000, 1830, 2665, 3500, 4000};
  const double grades[] = {0, 6, 6, 6, -10};
  for (std::size_t k = 0; k < sections.size(); ++k) {
    EXPECT_DOUBLE_EQ(sections[k].start_m, starts[k]) << k;
    EXPECT_DOUBLE_EQ(sections[k].end_m, ends[k]) << k;
    EXPECT_NEAR(sections[k].mean_grade_pct, grades[k], 1e-9) << k;
  }
  const auto bands = gradient_bands();
  EXPECT_STREQ(bands[sections[0].band].key, "level");
  EXPECT_STREQ(bands[sections[1].band].key, "up-5-8");
  EXPECT_STREQ(bands[sections[4].band].key, "down-over-8");
  // Sections share their boundary stations.
  for (std::size_t k = 1; k < sections.size(); ++k) EXPECT_EQ(sections[k].first_station, sections[k - 1].last_station);
}

TEST(CourseSections, RefuseLengthsThatAreNotPositive) {
  const CheckResult r = hand_made_course();
  CourseSectionOptions bad;
  bad.block_m = 0.0;
  EXPECT_THROW(course_sections(r, bad), Error);
  bad.block_m = 100.0;
  bad.max_section_m = -1.0;
  EXPECT_THROW(course_sections(r, bad), Error);
}

TEST(GisOutputs, EscapeTheCourseNameInGpx) {
  CheckResult r = sample();
  r.analysis.course.name = "Tour <des> & \"Monts\"";
  const std::string gpx = hazards_gpx(r);
  EXPECT_NE(gpx.find("<name>Hazards: Tour &lt;des&gt; &amp; &quot;Monts&quot;</name>"), std::string::npos);
  // And it still reads as GPX.
  cwtest::TempDir dir;
  cwtest::write_text(dir.file("h.gpx"), gpx);
  const auto ds = open_vector(dir.file("h.gpx"), "GPX");
  ASSERT_TRUE(ds);
  EXPECT_EQ(static_cast<std::size_t>(ds->GetLayerByName("waypoints")->GetFeatureCount()), r.hazards.size());
}
