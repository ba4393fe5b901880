// Summary JSON, profile CSV, terminal text and atomic writing.
#include <nlohmann/json.hpp>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>
#include <system_error>

#include "coursewarden/error.hpp"
#include "coursewarden/outputs.hpp"
#include "io/json_out.hpp"
#include "util/text.hpp"

namespace coursewarden {

const char* const kDisclaimer =
    "Advice from a model, not a certificate. Local regulations, the road authority and the "
    "event's safety officers decide. Inspect every place on the ground, flagged or not: the "
    "terrain model has no vegetation, buildings, parked vehicles, road surface or traffic, and "
    "its heights and speeds carry errors.";

using json_out::r;

namespace {


nlohmann::json climbs_json(const std::vector<Climb>& climbs) {
  auto out = nlohmann::json::array();
  for (const auto& c : climbs) {
    out.push_back({{"start_m", r(c.start_m, 1)},
                   {"end_m", r(c.end_m, 1)},
                   {"length_m", r(c.length_m(), 1)},
                   {"gain_m", r(c.gain_m, 1)},
                   {"mean_grade_pct", r(c.mean_grade_pct, 2)},
                   {"max_grade_100m_pct", r(c.max_grade_100m_pct, 2)},
                   {"score", r(c.score, 1)},
                   {"category", c.category.empty() ? nlohmann::json(nullptr) : nlohmann::json(c.category)}});
  }
  return out;
}

}  // namespace

nlohmann::json profile_json(const CourseAnalysis& a) {
  const auto& t = a.profile.totals;
  nlohmann::json j;
  j["disclaimer"] = kDisclaimer;
  j["course"] = {{"file", a.course.source_path},
                 {"name", a.course.name},
                 {"track_index", a.course.chosen_index},
                 {"tracks_in_file", a.course.track_names.size()},
                 {"notes", a.course.notes}};
  j["length_m"] = r(t.length_m, 1);
  j["ascent_m"] = r(t.ascent_m, 1);
  j["descent_m"] = r(t.descent_m, 1);
  j["min_elevation_m"] = r(t.min_elevation_m, 1);
  j["max_elevation_m"] = r(t.max_elevation_m, 1);
  j["dem_coverage_pct"] = r(a.profile.coverage_pct, 2);
  j["spacing_m"] = a.spacing_m;
  j["smoothing_sigma_m"] = r(a.profile.smoothing_sigma_m, 1);
  j["projection"] = a.projection;
  auto sustained = nlohmann::json::array();
  for (const auto& s : t.sustained) {
    sustained.push_back({{"window_m", s.window_m},
                         {"climb_pct", r(s.climb_pct, 2)},
                         {"climb_start_m", r(s.climb_at_m, 1)},
                         {"descent_pct", r(s.descent_pct, 2)},
                         {"descent_start_m", r(s.descent_at_m, 1)}});
  }
  j["steepest_sustained"] = sustained;
  auto repairs = nlohmann::json::array();
  for (const auto& rp : a.profile.repairs) {
    repairs.push_back({{"start_m", r(rp.start_m, 1)},
                       {"end_m", r(rp.end_m, 1)},
                       {"reason", rp.reason},
                       {"worst_grade_pct", r(rp.worst_grade_pct, 1)}});
  }
  j["repairs"] = repairs;
  j["climbs"] = climbs_json(a.climbs);
  if (a.used_dem) {
    j["dem"] = {{"file", a.dem.path},
                {"crs", a.dem.crs_name},
                {"pixel_size_m", r(a.dem.pixel_size_m, 2)},
                {"vertical_unit", a.dem.vertical_unit},
                {"extent_deg", {a.dem.west_deg, a.dem.south_deg, a.dem.east_deg, a.dem.north_deg}}};
  } else {
    j["dem"] = nullptr;
  }
  if (a.comparison) {
    const auto& c = *a.comparison;
    j["file_vs_dem"] = {{"stations", c.stations},
                        {"mean_difference_m", r(c.mean_difference_m, 2)},
                        {"rms_difference_m", r(c.rms_difference_m, 2)},
                        {"max_abs_difference_m", r(c.max_abs_difference_m, 2)},
                        {"max_abs_at_m", r(c.max_abs_at_m, 1)}};
  }
  return j;
}

std::string profile_summary_json(const CourseAnalysis& a) { return profile_json(a).dump(2) + "\n"; }

std::string profile_csv(const CourseAnalysis& a) {
  std::string out = "distance_m,lon,lat,elevation_m,grade_pct\n";
  out.reserve(a.stations.size() * 48);
  for (std::size_t i = 0; i < a.stations.size(); ++i) {
    const auto& s = a.stations[i];
    out += fmt_fixed(s.distance_m, 1) + "," + fmt_fixed(s.lon_deg, 7) + "," +
           fmt_fixed(s.lat_deg, 7) + "," + fmt_fixed(a.profile.elevation_m[i], 2) + "," +
           fmt_fixed(a.profile.grade[i] * 100.0, 2) + "\n";
  }
  return out;
}

namespace {
std::string pad(const std::string& s, std::size_t width, bool right = true) {
  if (s.size() >= width) return s;
  return right ? std::string(width - s.size(), ' ') + s : s + std::string(width - s.size(), ' ');
}
std::string km(double m, int decimals = 1) { return fmt_fixed(m / 1000.0, decimals); }
}  // namespace

std::string profile_text(const CourseAnalysis& a) {
  const auto& t = a.profile.totals;
  std::ostringstream o;
  o << "Course   " << a.course.name << "  (" << a.course.source_path << ")\n";
  for (const auto& n : a.course.notes) o << "  note: " << n << "\n";
  if (a.used_dem) {
    o << "Heights  " << a.dem.path << ", " << fmt_fixed(a.dem.pixel_size_m, 1)
      << " m pixels, coverage " << fmt_fixed(a.profile.coverage_pct, 1) << " %\n";
  } else {
    o << "Heights  from the course file\n";
  }
  o << "Length   " << km(t.length_m, 2) << " km    ascent " << fmt_fixed(t.ascent_m, 0)
    << " m    descent " << fmt_fixed(t.descent_m, 0) << " m    lowest "
    << fmt_fixed(t.min_elevation_m, 0) << " m    highest " << fmt_fixed(t.max_elevation_m, 0)
    << " m (km " << km(t.max_elevation_at_m) << ")\n";
  o << "Steepest sustained gradient:";
  for (const auto& s : t.sustained) {
    o << "  " << (s.window_m >= 1000 ? km(s.window_m, 0) + " km" : fmt_fixed(s.window_m, 0) + " m")
      << " +" << fmt_fixed(s.climb_pct, 1) << " % / " << fmt_fixed(s.descent_pct, 1) << " %";
  }
  o << "\n";
  if (a.comparison) {
    const auto& c = *a.comparison;
    o << "File heights minus DEM: mean " << fmt_fixed(c.mean_difference_m, 1) << " m, RMS "
      << fmt_fixed(c.rms_difference_m, 1) << " m, largest " << fmt_fixed(c.max_abs_difference_m, 1)
      << " m at km " << km(c.max_abs_at_m, 2) << "\n";
  }
  if (!a.profile.repairs.empty()) {
    o << "Height repairs (" << a.profile.repairs.size() << "):\n";
    for (const auto& rp : a.profile.repairs) {
      o << "  km " << km(rp.start_m, 2) << " - " << km(rp.end_m, 2) << "  " << rp.reason;
      if (rp.worst_grade_pct > 0) o << ", steepest raw step " << fmt_fixed(rp.worst_grade_pct, 0) << " %";
      o << "\n";
    }
  }
  if (a.climbs.empty()) {
    o << "Climbs   none\n";
  } else {
    o << "Climbs\n";
    o << "   #   from km    to km   length   gain m   mean %   max 100 m %   score   category\n";
    int k = 1;
    for (const auto& c : a.climbs) {
      o << pad(std::to_string(k++), 4) << pad(km(c.start_m), 10) << pad(km(c.end_m), 9)
        << pad(km(c.length_m()) + " km", 9) << pad(fmt_fixed(c.gain_m, 0), 9)
        << pad(fmt_fixed(c.mean_grade_pct, 1), 9) << pad(fmt_fixed(c.max_grade_100m_pct, 1), 14)
        << pad(fmt_fixed(c.score, 0), 8) << "   " << (c.category.empty() ? "-" : c.category) << "\n";
    }
  }
  o << "\n" << word_wrap(kDisclaimer, 96);
  return o.str();
}

namespace {

std::filesystem::path temporary_beside(const std::filesystem::path& target) {
  std::random_device rd;
  const auto dir = target.has_parent_path() ? target.parent_path() : std::filesystem::path(".");
  return dir / ("." + target.filename().string() + ".tmp" + std::to_string(rd()));
}

void write_temporary(const std::filesystem::path& tmp, const std::string& path, const std::string& content) {
  std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
  if (!out) fail(path, "", "cannot write here; check the folder exists and is writable");
  out.write(content.data(), static_cast<std::streamsize>(content.size()));
  out.flush();
  if (!out) {
    out.close();
    std::error_code ignored;
    std::filesystem::remove(tmp, ignored);
    fail(path, "", "writing failed (disk full?); nothing was written");
  }
}

}  // namespace

void write_file_atomic(const std::string& path, const std::string& content) {
  write_files_atomic({{path, content}});
}

void write_files_atomic(const std::vector<std::pair<std::string, std::string>>& files) {
  namespace fs = std::filesystem;
  std::vector<fs::path> temporaries;
  auto discard = [&temporaries] {
    std::error_code ignored;
    for (const auto& t : temporaries) fs::remove(t, ignored);
  };
  try {
    for (const auto& [path, content] : files) {
      temporaries.push_back(temporary_beside(path));
      write_temporary(temporaries.back(), path, content);
    }
  } catch (...) {
    discard();
    throw;
  }
  for (std::size_t i = 0; i < files.size(); ++i) {
    std::error_code ec;
    fs::rename(temporaries[i], files[i].first, ec);
    if (ec) {
      const std::string why = ec.message();
      discard();
      fail(files[i].first, "", "cannot replace the file (" + why + ")");
    }
  }
}

}  // namespace coursewarden
