// GeoJSON, GPX and CSV files of a check, for GIS users, marshal coordinators and scripts.
#include "coursewarden/gis_outputs.hpp"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <charconv>
#include <cmath>

#include "coursewarden/error.hpp"
#include "coursewarden/outputs.hpp"
#include "coursewarden/report.hpp"
#include "io/gpx_text.hpp"
#include "io/json_out.hpp"
#include "io/report_svg.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

using ordered_json = nlohmann::ordered_json;

using json_out::r;

ordered_json finite_or_null(double v, int decimals) { return json_out::finite_or_null<ordered_json>(v, decimals); }

// RFC 7946 position: [longitude, latitude], 7 decimals (about 1 cm).
ordered_json position(double lon_deg, double lat_deg) { return {r(lon_deg, 7), r(lat_deg, 7)}; }

ordered_json line_coordinates(const std::vector<Station>& stations, std::size_t first, std::size_t last) {
  auto coords = ordered_json::array();
  for (std::size_t i = first; i <= last && i < stations.size(); ++i) {
    coords.push_back(position(stations[i].lon_deg, stations[i].lat_deg));
  }
  return coords;
}

// Compact JSON. Floating-point numbers are written as the shortest text that reads back to the
// same double (std::to_chars), so a value rounded to 7 decimals prints with at most 7; text that
// is not valid UTF-8 (a course name from an odd file) gets U+FFFD instead of an exception.
void dump_to(const ordered_json& j, std::string& out) {
  switch (j.type()) {
    case ordered_json::value_t::object: {
      out += '{';
      bool first = true;
      for (auto it = j.begin(); it != j.end(); ++it) {
        if (!first) out += ',';
        first = false;
        out += ordered_json(it.key()).dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
        out += ':';
        dump_to(it.value(), out);
      }
      out += '}';
      break;
    }
    case ordered_json::value_t::array: {
      out += '[';
      for (std::size_t k = 0; k < j.size(); ++k) {
        if (k) out += ',';
        dump_to(j[k], out);
      }
      out += ']';
      break;
    }
    case ordered_json::value_t::number_float: {
      const double v = j.get<double>();
      if (!std::isfinite(v)) {
        out += "null";
        break;
      }
      char buffer[64];
      const auto result = std::to_chars(buffer, buffer + sizeof buffer, v);
      out.append(buffer, result.ptr);
      break;
    }
    default:
      out += j.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
  }
}

std::string dump(const ordered_json& j) {
  std::string out;
  dump_to(j, out);
  return out;
}

// One feature per line: compact, readable and friendly to line-based diffs. "name" and
// "disclaimer" are foreign members (RFC 7946 section 6.1); GDAL takes "name" as the layer name.
// No "crs" member: coordinates are WGS84 longitude, latitude by definition.
std::string feature_collection(const std::string& name, const ordered_json& features) {
  std::string out = "{\"type\":\"FeatureCollection\",\"name\":" + dump(name) +
                    ",\"disclaimer\":" + dump(kDisclaimer) + ",\"features\":[\n";
  for (std::size_t k = 0; k < features.size(); ++k) {
    out += dump(features[k]) + (k + 1 < features.size() ? ",\n" : "\n");
  }
  return out + "]}\n";
}

// Station index at or after distance d (clamped).
std::size_t station_at_or_after(const std::vector<Station>& s, double d) {
  auto it = std::lower_bound(s.begin(), s.end(), d,
                             [](const Station& st, double v) { return st.distance_m < v; });
  return it == s.end() ? s.size() - 1 : static_cast<std::size_t>(it - s.begin());
}
std::size_t station_at_or_before(const std::vector<Station>& s, double d) {
  auto it = std::upper_bound(s.begin(), s.end(), d,
                             [](double v, const Station& st) { return v < st.distance_m; });
  return it == s.begin() ? 0 : static_cast<std::size_t>(it - s.begin()) - 1;
}

std::vector<std::string> affected_names(const Hazard& h) {
  std::vector<std::string> names;
  for (const auto& c : h.classes) names.push_back(c.class_name);
  for (const auto& n : h.section_classes) names.push_back(n);
  return names;
}


std::string join(const std::vector<std::string>& items, const char* sep) {
  std::string out;
  for (const auto& s : items) out += (out.empty() ? "" : sep) + s;
  return out;
}

}  // namespace

std::vector<CourseSection> course_sections(const CheckResult& c, const CourseSectionOptions& options) {
  if (!(options.block_m > 0.0) || !(options.max_section_m > 0.0) || !std::isfinite(options.block_m) ||
      !std::isfinite(options.max_section_m)) {
    fail("", "course sections", "block and section lengths must be positive");
  }
  const auto& st = c.analysis.stations;
  const auto& elev = c.analysis.profile.elevation_m;
  std::vector<CourseSection> out;
  if (st.size() < 2 || elev.size() != st.size()) return out;
  const double spacing = std::max(c.analysis.spacing_m, 1e-9);
  const std::size_t step = std::max<std::size_t>(1, static_cast<std::size_t>(std::lround(options.block_m / spacing)));
  auto grade_pct = [&](std::size_t a, std::size_t b) {
    const double len = st[b].distance_m - st[a].distance_m;
    return len > 0.0 ? 100.0 * (elev[b] - elev[a]) / len : 0.0;
  };
  // Blocks of whole stations; a last block shorter than half a block joins the one before.
  std::vector<std::size_t> edges = {0};
  while (edges.back() + step < st.size() - 1) edges.push_back(edges.back() + step);
  if (edges.size() > 1 && (st.size() - 1 - edges.back()) * 2 < step) edges.pop_back();
  edges.push_back(st.size() - 1);
  // Runs of blocks with the same band.
  std::vector<std::pair<std::size_t, std::size_t>> runs;  // station indices
  std::size_t run_band = gradient_band_index(grade_pct(edges[0], edges[1]));
  std::size_t run_start = edges[0];
  for (std::size_t k = 1; k + 1 < edges.size(); ++k) {
    const std::size_t band = gradient_band_index(grade_pct(edges[k], edges[k + 1]));
    if (band != run_band) {
      runs.emplace_back(run_start, edges[k]);
      run_start = edges[k];
      run_band = band;
    }
  }
  runs.emplace_back(run_start, edges.back());
  for (const auto& [a, b] : runs) {
    const double len = st[b].distance_m - st[a].distance_m;
    const std::size_t parts = std::max<std::size_t>(1, static_cast<std::size_t>(std::ceil(len / options.max_section_m - 1e-9)));
    std::size_t from = a;
    for (std::size_t p = 1; p <= parts; ++p) {
      std::size_t to = p == parts ? b : station_at_or_before(st, st[a].distance_m + len * static_cast<double>(p) / static_cast<double>(parts));
      if (to <= from) continue;
      CourseSection s;
      s.first_station = from;
      s.last_station = to;
      s.start_m = st[from].distance_m;
      s.end_m = st[to].distance_m;
      s.mean_grade_pct = grade_pct(from, to);
      s.band = gradient_band_index(s.mean_grade_pct);
      out.push_back(s);
      from = to;
    }
  }
  return out;
}

std::string hazards_geojson(const CheckResult& c) {
  const auto& p = c.analysis.profile;
  auto features = ordered_json::array();
  for (const Hazard& h : c.hazards) {
    ordered_json props;
    props["number"] = h.number;
    props["name"] = report_detail::hazard_code(h.number, c.hazards.size());
    props["at_m"] = r(h.at_m, 1);
    props["end_m"] = r(h.end_m, 1);
    props["at_km"] = r(h.at_m / 1000.0, 3);
    props["kind"] = hazard_kind_key(h.kind);
    props["kind_label"] = hazard_kind_label(h.kind);
    props["severity"] = std::string(severity_name(h.severity));
    props["severity_rank"] = static_cast<int>(h.severity);
    props["classes"] = affected_names(h);
    auto detail = ordered_json::array();
    for (const auto& a : h.classes) detail.push_back(json_out::class_at_corner<ordered_json>(a));
    props["class_speeds"] = detail;
    props["peak_speed_kmh"] = r(h.peak_speed_mps * 3.6, 1);
    props["corner"] = h.corner ? ordered_json(*h.corner) : ordered_json(nullptr);
    props["steepest_pct"] = h.kind == HazardKind::steep_descent ? ordered_json(r(h.steepest_pct, 1)) : ordered_json(nullptr);
    props["hidden"] = h.hidden;
    props["after_descent"] = h.after_descent;
    props["sign_distance_m"] = r(h.sign.distance_m, 0);
    props["sign_visibility_m"] = r(h.sign.min_clear_visibility_m, 0);
    props["sign_speed_band"] = std::string(h.sign.speed_band);
    props["marshals"] = h.marshals;
    props["elevation_m"] = finite_or_null(report_detail::interpolate(p.distance_m, p.elevation_m, h.at_m), 1);
    props["lon"] = r(h.lon_deg, 7);
    props["lat"] = r(h.lat_deg, 7);
    props["reason"] = h.reason;
    features.push_back({{"type", "Feature"},
                        {"geometry", {{"type", "Point"}, {"coordinates", position(h.lon_deg, h.lat_deg)}}},
                        {"properties", props}});
  }
  return feature_collection("hazards", features);
}

std::string course_geojson(const CheckResult& c, const CourseSectionOptions& options) {
  const auto& st = c.analysis.stations;
  const auto& p = c.analysis.profile;
  const auto bands = gradient_bands();
  auto features = ordered_json::array();
  const auto sections = course_sections(c, options);
  for (std::size_t k = 0; k < sections.size(); ++k) {
    const CourseSection& s = sections[k];
    ordered_json props;
    props["section"] = k + 1;
    props["start_m"] = r(s.start_m, 1);
    props["end_m"] = r(s.end_m, 1);
    props["length_m"] = r(s.end_m - s.start_m, 1);
    props["elevation_start_m"] = r(p.elevation_m[s.first_station], 1);
    props["elevation_end_m"] = r(p.elevation_m[s.last_station], 1);
    props["mean_grade_pct"] = r(s.mean_grade_pct, 2);
    double lo = INFINITY, hi = -INFINITY;
    for (std::size_t i = s.first_station; i <= s.last_station; ++i) {
      lo = std::min(lo, p.grade[i] * 100.0);
      hi = std::max(hi, p.grade[i] * 100.0);
    }
    props["max_grade_pct"] = r(hi, 2);
    props["min_grade_pct"] = r(lo, 2);
    props["gradient_band"] = bands[s.band].key;
    props["gradient_label"] = bands[s.band].label;
    for (std::size_t j = 0; j < c.classes.size() && j < c.speeds.size(); ++j) {
      const SpeedProfile& sp = c.speeds[j];
      const std::string& name = c.classes[j].name;
      if (sp.elapsed_s.size() != st.size()) continue;
      const double dt = sp.elapsed_s[s.last_station] - sp.elapsed_s[s.first_station];
      const double len = s.end_m - s.start_m;
      double vmax = 0.0, umax = 0.0;
      for (std::size_t i = s.first_station; i <= s.last_station; ++i) {
        vmax = std::max(vmax, sp.planned_speed_mps[i]);
        umax = std::max(umax, sp.unbraked_speed_mps[i]);
      }
      props[name + "_avg_kmh"] = dt > 0.0 ? ordered_json(r(len / dt * 3.6, 1)) : ordered_json(nullptr);
      props[name + "_max_kmh"] = r(vmax * 3.6, 1);
      props[name + "_max_unbraked_kmh"] = r(umax * 3.6, 1);
      props[name + "_time_s"] = r(dt, 1);
    }
    features.push_back({{"type", "Feature"},
                        {"geometry", {{"type", "LineString"},
                                      {"coordinates", line_coordinates(st, s.first_station, s.last_station)}}},
                        {"properties", props}});
  }
  return feature_collection("course", features);
}

std::string climbs_geojson(const CheckResult& c) {
  const auto& st = c.analysis.stations;
  auto features = ordered_json::array();
  for (std::size_t k = 0; k < c.analysis.climbs.size(); ++k) {
    const Climb& cl = c.analysis.climbs[k];
    const std::size_t a = station_at_or_before(st, cl.start_m + 1e-6);
    std::size_t b = station_at_or_after(st, cl.end_m - 1e-6);
    if (b <= a) b = std::min(a + 1, st.size() - 1);
    ordered_json props;
    props["number"] = k + 1;
    props["label"] = report_detail::climb_label(cl, k + 1);
    props["start_m"] = r(cl.start_m, 1);
    props["end_m"] = r(cl.end_m, 1);
    props["length_m"] = r(cl.length_m(), 1);
    props["gain_m"] = r(cl.gain_m, 1);
    props["mean_grade_pct"] = r(cl.mean_grade_pct, 2);
    props["max_grade_100m_pct"] = r(cl.max_grade_100m_pct, 2);
    props["score"] = r(cl.score, 1);
    props["category"] = cl.category.empty() ? ordered_json(nullptr) : ordered_json(cl.category);
    for (std::size_t j = 0; j < c.classes.size() && j < c.speeds.size(); ++j) {
      const auto& times = c.speeds[j].climb_times_s;
      if (k < times.size()) props[c.classes[j].name + "_time_s"] = r(times[k], 1);
    }
    features.push_back({{"type", "Feature"},
                        {"geometry", {{"type", "LineString"}, {"coordinates", line_coordinates(st, a, b)}}},
                        {"properties", props}});
  }
  return feature_collection("climbs", features);
}

std::string hazards_gpx(const CheckResult& c) {
  const auto& p = c.analysis.profile;
  std::vector<GpxWaypoint> points;
  for (const Hazard& h : c.hazards) {
    GpxWaypoint w;
    w.lat_deg = h.lat_deg;
    w.lon_deg = h.lon_deg;
    w.elevation_m = report_detail::interpolate(p.distance_m, p.elevation_m, h.at_m);
    w.name = report_detail::hazard_code(h.number, c.hazards.size()) + " " + std::string(severity_name(h.severity));
    w.cmt = "km " + fmt_fixed(h.at_m / 1000.0, 2) + ", " + hazard_kind_label(h.kind) + "; sign " +
            fmt_fixed(h.sign.distance_m, 0) + " m before; " + std::to_string(h.marshals) +
            (h.marshals == 1 ? " marshal" : " marshals");
    w.desc = h.reason;
    w.type = severity_name(h.severity);
    points.push_back(std::move(w));
  }
  return gpx_waypoints("Hazards: " + c.analysis.course.name, points);
}

std::string hazards_csv(const CheckResult& c) {
  std::string o =
      "number,name,at_km,at_m,end_m,kind,severity,classes,peak_speed_kmh,fastest_entry_kmh,"
      "lowest_safe_kmh,steepest_pct,hidden,after_descent,sign_distance_m,sign_visibility_m,"
      "marshals,lat,lon,reason\n";
  for (const Hazard& h : c.hazards) {
    double entry = NAN, safe = NAN;
    for (const auto& a : h.classes) {
      entry = std::isnan(entry) ? a.entry_speed_mps : std::max(entry, a.entry_speed_mps);
      safe = std::isnan(safe) ? a.safe_speed_mps : std::min(safe, a.safe_speed_mps);
    }
    auto opt = [](double v, int d) { return std::isfinite(v) ? fmt_fixed(v, d) : std::string(); };
    o += std::to_string(h.number) + "," + report_detail::hazard_code(h.number, c.hazards.size()) + "," +
         fmt_fixed(h.at_m / 1000.0, 3) + "," + fmt_fixed(h.at_m, 1) + "," + fmt_fixed(h.end_m, 1) + "," +
         hazard_kind_key(h.kind) + "," + std::string(severity_name(h.severity)) + "," +
         csv_field(join(affected_names(h), ";")) + "," + fmt_fixed(h.peak_speed_mps * 3.6, 1) + "," +
         opt(entry * 3.6, 1) + "," + opt(safe * 3.6, 1) + "," +
         (h.kind == HazardKind::steep_descent ? fmt_fixed(h.steepest_pct, 1) : std::string()) + "," +
         (h.hidden ? "true" : "false") + "," + (h.after_descent ? "true" : "false") + "," +
         fmt_fixed(h.sign.distance_m, 0) + "," + fmt_fixed(h.sign.min_clear_visibility_m, 0) + "," +
         std::to_string(h.marshals) + "," + fmt_fixed(h.lat_deg, 7) + "," + fmt_fixed(h.lon_deg, 7) +
         "," + csv_field(h.reason) + "\n";
  }
  return o;
}

}  // namespace coursewarden
