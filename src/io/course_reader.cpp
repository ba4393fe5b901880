// Reading a course line with GDAL/OGR. Returns our own plain RawCourse.
#include <gdal.h>
#include <ogr_api.h>
#include <ogr_spatialref.h>
#include <ogrsf_frmts.h>

#include <GeographicLib/Geodesic.hpp>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <filesystem>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "coursewarden/course_io.hpp"
#include "coursewarden/error.hpp"
#include "io/gdal_common.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

struct Candidate {
  std::string name;
  std::vector<std::vector<CourseVertex>> segments;
};

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return std::tolower(c); });
  return s;
}

// Seconds since 1970-01-01T00:00Z for a civil date (proleptic Gregorian), H. Hinnant's algorithm.
double epoch_seconds(int y, int m, int d, int hh, int mm, double ss, int tz_flag) {
  y -= m <= 2;
  const int era = (y >= 0 ? y : y - 399) / 400;
  const int yoe = y - era * 400;
  const int doy = (153 * (m + (m > 2 ? -3 : 9)) + 2) / 5 + d - 1;
  const int doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  const double days = static_cast<double>(era) * 146097.0 + doe - 719468.0;
  double t = days * 86400.0 + hh * 3600.0 + mm * 60.0 + ss;
  // OGR time zone flag: 100 = UTC, 100 + n = UTC + n quarter hours.
  if (tz_flag > 1) t -= (tz_flag - 100) * 900.0;
  return t;
}

double feature_time_s(OGRFeature& f, const char* field) {
  const int idx = f.GetFieldIndex(field);
  if (idx < 0 || !f.IsFieldSetAndNotNull(idx)) return kNoValue;
  int y, mo, d, h, mi, tz;
  float s;
  if (!f.GetFieldAsDateTime(idx, &y, &mo, &d, &h, &mi, &s, &tz)) return kNoValue;
  return epoch_seconds(y, mo, d, h, mi, s, tz);
}

double feature_double(OGRFeature& f, const char* field) {
  const int idx = f.GetFieldIndex(field);
  if (idx < 0 || !f.IsFieldSetAndNotNull(idx)) return kNoValue;
  return f.GetFieldAsDouble(idx);
}

std::string feature_name(OGRFeature& f) {
  for (const char* key : {"name", "Name", "NAME", "title", "Title"}) {
    const int idx = f.GetFieldIndex(key);
    if (idx >= 0 && f.IsFieldSetAndNotNull(idx)) return f.GetFieldAsString(idx);
  }
  return "";
}

// Transformation of a layer's coordinates to WGS84 lon/lat, or null when already so.
std::unique_ptr<OGRCoordinateTransformation> to_wgs84(OGRLayer& layer) {
  const OGRSpatialReference* src = layer.GetSpatialRef();
  if (!src) return nullptr;  // GPX, GeoJSON and CSV are WGS84 by definition
  OGRSpatialReference wgs84;
  wgs84.SetWellKnownGeogCS("WGS84");
  wgs84.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  OGRSpatialReference source(*src);
  source.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  if (source.IsSame(&wgs84)) return nullptr;
  return std::unique_ptr<OGRCoordinateTransformation>(
      OGRCreateCoordinateTransformation(&source, &wgs84));
}

void append_line(const OGRLineString& line, OGRCoordinateTransformation* ct,
                 std::vector<CourseVertex>& out) {
  const bool has_z = line.Is3D();
  for (int i = 0; i < line.getNumPoints(); ++i) {
    double x = line.getX(i), y = line.getY(i), z = has_z ? line.getZ(i) : kNoValue;
    if (ct) ct->Transform(1, &x, &y);
    out.push_back({x, y, z, kNoValue});
  }
}

std::vector<std::vector<CourseVertex>> line_parts(const OGRGeometry& g,
                                                  OGRCoordinateTransformation* ct) {
  std::vector<std::vector<CourseVertex>> parts;
  const auto type = wkbFlatten(g.getGeometryType());
  if (type == wkbLineString) {
    parts.emplace_back();
    append_line(*g.toLineString(), ct, parts.back());
  } else if (type == wkbMultiLineString) {
    for (const OGRLineString* part : *g.toMultiLineString()) {
      parts.emplace_back();
      append_line(*part, ct, parts.back());
    }
  } else if (type == wkbGeometryCollection) {
    for (const OGRGeometry* part : *g.toGeometryCollection()) {
      for (auto& p : line_parts(*part, ct)) parts.push_back(std::move(p));
    }
  }
  return parts;
}

// GPX: read points of tracks (else routes) so that <ele> and <time> are kept.
std::vector<Candidate> read_gpx(GDALDataset& ds) {
  std::vector<Candidate> out;
  for (const auto& [lines, points, fid_field] :
       {std::tuple{"tracks", "track_points", "track_fid"},
        std::tuple{"routes", "route_points", "route_fid"}}) {
    OGRLayer* line_layer = ds.GetLayerByName(lines);
    OGRLayer* point_layer = ds.GetLayerByName(points);
    if (!line_layer || !point_layer) continue;
    std::vector<std::string> names;
    for (auto& f : *line_layer) names.push_back(feature_name(*f));
    std::map<long long, std::size_t> slot_of_fid;  // track fid -> candidate index
    long long last_seg = -1;
    for (auto& f : *point_layer) {
      const long long fid = f->GetFieldAsInteger64(fid_field);
      auto [it, inserted] = slot_of_fid.emplace(fid, out.size());
      if (inserted) {
        Candidate c;
        const std::size_t k = slot_of_fid.size() - 1;
        c.name = k < names.size() ? names[k] : "";
        out.push_back(std::move(c));
        last_seg = -1;
      }
      Candidate& c = out[it->second];
      const int seg_idx = f->GetFieldIndex("track_seg_id");
      const long long seg = seg_idx >= 0 ? f->GetFieldAsInteger64(seg_idx) : 0;
      if (c.segments.empty() || seg != last_seg) c.segments.emplace_back();
      last_seg = seg;
      const OGRGeometry* g = f->GetGeometryRef();
      if (!g || wkbFlatten(g->getGeometryType()) != wkbPoint) continue;
      const OGRPoint* p = g->toPoint();
      c.segments.back().push_back(
          {p->getX(), p->getY(), feature_double(*f, "ele"), feature_time_s(*f, "time")});
    }
    if (!out.empty()) return out;
  }
  return out;
}

// Line layers: one feature with LineString/MultiLineString geometry is one candidate track.
std::vector<Candidate> read_lines(GDALDataset& ds, std::size_t& point_features) {
  std::vector<Candidate> out;
  for (OGRLayer* layer : ds.GetLayers()) {
    auto ct = to_wgs84(*layer);
    long long index = 0;
    for (auto& f : *layer) {
      ++index;
      const OGRGeometry* g = f->GetGeometryRef();
      if (!g) continue;
      if (wkbFlatten(g->getGeometryType()) == wkbPoint) {
        ++point_features;
        continue;
      }
      auto parts = line_parts(*g, ct.get());
      if (parts.empty()) continue;
      Candidate c;
      c.name = feature_name(*f);
      if (c.name.empty()) c.name = std::string(layer->GetName()) + " #" + std::to_string(index);
      c.segments = std::move(parts);
      out.push_back(std::move(c));
    }
  }
  return out;
}

// CSV (or any point layer when no lines exist): points in file order form one line.
Candidate read_points(GDALDataset& ds, const std::string& path) {
  Candidate c;
  c.segments.emplace_back();
  for (OGRLayer* layer : ds.GetLayers()) {
    auto ct = to_wgs84(*layer);
    long long row = 0;
    for (auto& f : *layer) {
      ++row;
      const OGRGeometry* g = f->GetGeometryRef();
      if (!g || wkbFlatten(g->getGeometryType()) != wkbPoint || g->IsEmpty()) {
        fail(path, "row " + std::to_string(row + 1),
             "no valid latitude/longitude on this line; fix or remove the row");
      }
      const OGRPoint* p = g->toPoint();
      double x = p->getX(), y = p->getY();
      if (ct) ct->Transform(1, &x, &y);
      double ele = p->Is3D() ? p->getZ() : kNoValue;
      if (std::isnan(ele)) ele = feature_double(*f, "elevation");
      c.segments.back().push_back({x, y, ele, kNoValue});
    }
    if (!c.segments.back().empty()) break;
  }
  return c;
}

std::size_t choose(const std::vector<Candidate>& candidates, const std::string& wanted,
                   const std::string& path) {
  if (wanted.empty()) return 0;
  for (std::size_t i = 0; i < candidates.size(); ++i)
    if (candidates[i].name == wanted) return i;
  if (auto n = parse_number(wanted); n && *n >= 0 && std::floor(*n) == *n) {
    if (*n < static_cast<double>(candidates.size())) return static_cast<std::size_t>(*n);
  }
  std::string list;
  for (std::size_t i = 0; i < candidates.size() && i < 10; ++i) {
    if (!list.empty()) list += ", ";
    list += std::to_string(i) + " '" + candidates[i].name + "'";
  }
  fail(path, "--track " + wanted,
       "no such track; choose by name or 0-based index among: " + list);
}

}  // namespace

RawCourse read_course(const std::string& path, const CourseReadOptions& options) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (!fs::exists(path, ec)) fail(path, "", "file not found; check the path");
  if (fs::is_directory(path, ec)) fail(path, "", "is a folder, not a course file");
  if (fs::file_size(path, ec) == 0) fail(path, "", "file is empty; export the course again");
  gdal_init();

  const std::string ext = lower(fs::path(path).extension().string());
  const char* csv_options[] = {"X_POSSIBLE_NAMES=lon,lng,long,longitude,x",
                               "Y_POSSIBLE_NAMES=lat,latitude,y",
                               "Z_POSSIBLE_NAMES=ele,elevation,alt,altitude,z",
                               "KEEP_GEOM_COLUMNS=NO", nullptr};
  GdalQuiet quiet;
  std::unique_ptr<GDALDataset> ds(GDALDataset::Open(
      path.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY, nullptr,
      ext == ".csv" ? csv_options : nullptr, nullptr));
  if (!ds) {
    fail(path, "", "not a course file GDAL can read (" + quiet.last_message() +
                       "); export it as GPX, GeoJSON, KML, GeoPackage, Shapefile or CSV");
  }
  const std::string driver = ds->GetDriver() ? ds->GetDriver()->GetDescription() : "";

  std::vector<Candidate> candidates;
  std::size_t point_features = 0;
  if (driver == "GPX") candidates = read_gpx(*ds);
  if (candidates.empty()) candidates = read_lines(*ds, point_features);
  if (candidates.empty() && driver == "CSV") candidates.push_back(read_points(*ds, path));
  if (candidates.empty()) {
    fail(path, "",
         point_features > 0
             ? "no line geometry, only " + std::to_string(point_features) +
                   " separate point(s); give the course as a track, route or line"
             : "no track, route or line found; give the course as a line");
  }

  const std::size_t chosen = choose(candidates, options.track, path);
  RawCourse course;
  course.source_path = path;
  course.chosen_index = chosen;
  for (const auto& c : candidates) course.track_names.push_back(c.name);
  course.name = candidates[chosen].name.empty() ? fs::path(path).stem().string()
                                                : candidates[chosen].name;
  if (candidates.size() > 1) {
    course.notes.push_back("the file holds " + std::to_string(candidates.size()) +
                           " tracks; using " + std::to_string(chosen) + " '" + course.name +
                           "' (choose another with --track)");
  }
  const auto& geod = GeographicLib::Geodesic::WGS84();
  for (auto& seg : candidates[chosen].segments) {
    if (seg.empty()) continue;
    if (!course.vertices.empty()) {
      const auto& a = course.vertices.back();
      const auto& b = seg.front();
      double gap_m = 0.0;
      geod.Inverse(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg, gap_m);
      course.gaps.push_back({course.vertices.size() - 1, gap_m});
      if (gap_m > 1.0) {
        course.notes.push_back("joined segments with a gap of " + fmt_fixed(gap_m, 0) +
                               " m after point " + std::to_string(course.vertices.size()));
      }
    }
    course.vertices.insert(course.vertices.end(), seg.begin(), seg.end());
  }
  const auto& v = course.vertices;
  course.has_elevations = !v.empty() && std::all_of(v.begin(), v.end(), [](const auto& p) {
    return std::isfinite(p.elevation_m);
  });
  // KML clamped to ground and many exports write Z = 0 everywhere: that is no elevation.
  if (course.has_elevations && std::all_of(v.begin(), v.end(), [](const auto& p) {
        return p.elevation_m == 0.0;
      })) {
    course.has_elevations = false;
  }
  course.has_times = !v.empty() && std::all_of(v.begin(), v.end(), [](const auto& p) {
    return std::isfinite(p.time_s);
  });
  return course;
}

}  // namespace coursewarden
