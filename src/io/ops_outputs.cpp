// schedule.csv, marshal-plan.csv, marshal-plan.gpx and the terminal block of the event
// operations (docs/operations.md).
#include "coursewarden/ops_outputs.hpp"

#include "coursewarden/report.hpp"
#include "io/gpx_text.hpp"
#include "io/report_svg.hpp"

#include <algorithm>
#include <cmath>
#include <string>
#include <string_view>

#include "coursewarden/outputs.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr std::size_t kTextWidth = 100;

std::string two(long v) { return (v < 10 ? "0" : "") + std::to_string(v); }

std::string seconds(double s) { return std::isfinite(s) ? fmt_fixed(s, 0) : std::string(); }

std::string boolean(bool b) { return b ? "true" : "false"; }

std::string join(const std::vector<std::string>& parts, const char* sep) {
  std::string out;
  for (std::size_t k = 0; k < parts.size(); ++k) out += (k ? sep : "") + parts[k];
  return out;
}

std::string pad(const std::string& s, std::size_t width, bool right = false) {
  if (s.size() >= width) return s;
  return right ? std::string(width - s.size(), ' ') + s : s + std::string(width - s.size(), ' ');
}

// Cut to `width` characters, marking the cut with "..." (byte-based: names are expected ASCII;
// a cut inside a multi-byte character is avoided by stepping back to a character boundary).
std::string fit(const std::string& s, std::size_t width) {
  if (s.size() <= width) return s;
  std::size_t cut = width >= 3 ? width - 3 : 0;
  while (cut > 0 && (static_cast<unsigned char>(s[cut]) & 0xC0) == 0x80) --cut;
  return s.substr(0, cut) + "...";
}

// "7h05" for a duration.
std::string duration_hm(double s) {
  const long minutes = std::lround(s / 60.0);
  return std::to_string(minutes / 60) + "h" + two(minutes % 60);
}

std::string km(double m) { return fmt_fixed(m / 1000.0, 2); }

std::string marshals_word(int n) { return std::to_string(n) + (n == 1 ? " marshal" : " marshals"); }

// Lines of `text` wrapped to fit after an indent of `indent` spaces.
std::string wrapped(const std::string& text, std::size_t indent) {
  const std::string body = word_wrap(text, kTextWidth - indent);
  std::string out;
  std::size_t start = 0;
  while (start < body.size()) {
    const std::size_t end = body.find('\n', start);
    out += std::string(indent, ' ') + body.substr(start, end - start) + "\n";
    start = end + 1;
  }
  return out;
}

}  // namespace

std::string clock_hms(double clock_s) {
  if (!std::isfinite(clock_s)) return "";
  const long long total = std::llround(clock_s);
  const long long a = total < 0 ? -total : total;
  return (total < 0 ? "-" : "") + two(static_cast<long>(a / 3600)) + ":" +
         two(static_cast<long>(a % 3600 / 60)) + ":" + two(static_cast<long>(a % 60));
}

std::string schedule_csv(const Schedule& s) {
  std::string o =
      "kind,label,at_m,km,earliest,earliest_s,earliest_class,earliest_wave,latest,latest_s,"
      "latest_class,latest_wave,closing,closing_s,closure_open,closure_open_s,closure_close,"
      "closure_close_s,latest_behind_closing,cutoff,cutoff_s,slowest_makes_cutoff,"
      "classes_missing_cutoff\n";
  for (const ScheduleRow& r : s.rows) {
    o += std::string(schedule_kind_key(r.kind)) + "," + csv_field(r.label) + "," + fmt_fixed(r.at_m, 1) +
         "," + fmt_fixed(r.at_m / 1000.0, 3) + "," + clock_hms(r.earliest_s) + "," + seconds(r.earliest_s) +
         "," + csv_field(r.earliest_class) + "," + csv_field(r.earliest_wave) + "," + clock_hms(r.latest_s) +
         "," + seconds(r.latest_s) + "," + csv_field(r.latest_class) + "," + csv_field(r.latest_wave) + "," +
         clock_hms(r.closing_s) + "," + seconds(r.closing_s) + "," + clock_hms(r.closure_open_s) + "," +
         seconds(r.closure_open_s) + "," + clock_hms(r.closure_close_s) + "," + seconds(r.closure_close_s) +
         "," + boolean(r.latest_behind_closing) + "," + clock_hms(r.cutoff_s) + "," + seconds(r.cutoff_s) +
         "," + boolean(r.slowest_makes_cutoff) + "," + csv_field(join(r.classes_missing_cutoff, ";")) + "\n";
  }
  return o;
}

std::string marshal_plan_csv(const MarshalPlan& plan) {
  std::string o =
      "post,sector,km,at_m,first_m,last_m,marshals,lon,lat,not_before,on_post,on_post_s,"
      "earliest_pass,earliest_pass_s,closing,closing_s,off_post,off_post_s,hazards,corner_indices,"
      "warn\n";
  for (const MarshalPost& p : plan.posts) {
    std::vector<std::string> hazards, turns;
    for (int h : p.hazards) hazards.push_back(std::to_string(h));
    for (std::size_t t : p.turns) turns.push_back(std::to_string(t));
    const std::string sector = p.sector < plan.sectors.size() ? plan.sectors[p.sector].name : "";
    o += csv_field(p.code) + "," + csv_field(sector) + "," + fmt_fixed(p.at_m / 1000.0, 3) + "," +
         fmt_fixed(p.at_m, 1) + "," + fmt_fixed(p.first_m, 1) + "," + fmt_fixed(p.last_m, 1) + "," +
         std::to_string(p.count) + "," + fmt_fixed(p.lon_deg, 7) + "," + fmt_fixed(p.lat_deg, 7) + "," +
         clock_hms(p.not_before_s) + "," + clock_hms(p.on_post_s) + "," + seconds(p.on_post_s) + "," +
         clock_hms(p.earliest_pass_s) + "," + seconds(p.earliest_pass_s) + "," + clock_hms(p.closing_s) +
         "," + seconds(p.closing_s) + "," + clock_hms(p.off_post_s) + "," + seconds(p.off_post_s) + "," +
         join(hazards, ";") + "," + join(turns, ";") + "," + csv_field(p.warn) + "\n";
  }
  return o;
}

std::string marshal_plan_gpx(const CheckResult& c, const MarshalPlan& plan) {
  const auto& profile = c.analysis.profile;
  std::vector<GpxWaypoint> points;
  for (const MarshalPost& p : plan.posts) {
    GpxWaypoint w;
    w.lat_deg = p.lat_deg;
    w.lon_deg = p.lon_deg;
    w.elevation_m = report_detail::interpolate(profile.distance_m, profile.elevation_m, p.at_m);
    w.name = p.code + " (" + std::to_string(p.count) + ")";
    w.cmt = "km " + km(p.at_m) + ", " + marshals_word(p.count);
    w.desc = p.warn + ". On post " + clock_hms(p.on_post_s) + " (not before " + clock_hms(p.not_before_s) +
             "), first rider " + clock_hms(p.earliest_pass_s) + ", closing vehicle " + clock_hms(p.closing_s) +
             ", off post " + clock_hms(p.off_post_s) + ".";
    w.type = "marshal post";
    points.push_back(std::move(w));
  }
  return gpx_waypoints("Marshal posts: " + c.analysis.course.name, points);
}

std::string operations_text(const Schedule& s, const MarshalPlan& plan, const Grading& grading) {
  std::string o = "Operations\n";
  std::string waves;
  for (const ScheduledWave& w : s.waves) {
    waves += (waves.empty() ? "" : ", ") + w.name + " " + clock_hms(w.start_time_s) + " (" +
             std::to_string(w.classes.size()) + (w.classes.size() == 1 ? " class)" : " classes)");
  }
  o += wrapped("Start: " + waves, 2);
  const ScheduleRow* finish = s.rows.empty() ? nullptr : &s.rows.back();
  o += wrapped("Closing vehicle at " + fmt_fixed(s.closing_speed_mps * 3.6, 1) + " km/h from " +
                   clock_hms(s.last_start_s) +
                   (finish ? ", at the finish " + clock_hms(finish->closing_s) : std::string()) +
                   (std::isfinite(s.time_limit_s)
                        ? "; time limit " + duration_hm(s.time_limit_s) + " from each wave's start"
                        : std::string()),
               2);

  o += "\nCheckpoints and finish (full timetable in schedule.csv)\n";
  o += pad("km", 10, true) + "  " + pad("where", 24) + "  " + pad("first", 8) + "  " + pad("last", 8) +
       "  " + pad("closing", 8) + "  " + pad("road closed", 11) + "    cut-off\n";
  for (const ScheduleRow& r : s.rows) {
    if (r.kind != ScheduleKind::checkpoint && r.kind != ScheduleKind::finish) continue;
    std::string cut = "-";
    if (std::isfinite(r.cutoff_s)) {
      cut = clock_hms(r.cutoff_s).substr(0, 5) + (r.classes_missing_cutoff.empty() ? " ok" : " missed");
    }
    const std::string line = pad(km(r.at_m), 10, true) + "  " + pad(fit(r.label, 24), 24) + "  " +
                             clock_hms(r.earliest_s) + "  " + clock_hms(r.latest_s) + "  " +
                             clock_hms(r.closing_s) + "  " + clock_hms(r.closure_open_s).substr(0, 5) +
                             "-" + clock_hms(r.closure_close_s).substr(0, 5) + "  " +
                             (r.latest_behind_closing ? "*" : " ") + " " + cut;
    o += fit(line, kTextWidth) + "\n";
    if (!r.classes_missing_cutoff.empty()) {
      o += wrapped("missed by " + join(r.classes_missing_cutoff, ", "), 12);
    }
  }
  const bool behind = std::any_of(s.rows.begin(), s.rows.end(), [](const ScheduleRow& r) { return r.latest_behind_closing; });
  if (behind) {
    o += wrapped("* somewhere on the course the last riders pass after the closing vehicle (column "
                 "latest_behind_closing of schedule.csv): they are slower than the event's minimum speed "
                 "and ride outside the road closure.", 2);
  }

  o += "\nMarshal plan: " + std::to_string(plan.posts.size()) + (plan.posts.size() == 1 ? " post, " : " posts, ") +
       std::to_string(plan.marshals_needed) + " marshals needed";
  if (!plan.posts.empty()) {
    o += "; at most " + std::to_string(plan.peak_posts) + " posts and " +
         std::to_string(plan.peak_marshals) + " marshals at once (from " + clock_hms(plan.peak_at_s) + ")";
  }
  o += "\n";
  for (const Sector& sec : plan.sectors) {
    o += "  " + sec.name + ", km " + fmt_fixed(sec.from_m / 1000.0, 1) + " to " +
         fmt_fixed(sec.to_m / 1000.0, 1) + ": " + marshals_word(sec.marshals) + ", " +
         clock_hms(sec.first_on_post_s) + " to " + clock_hms(sec.last_off_post_s) + "\n";
    o += "    " + pad("post", 6) + pad("km", 8, true) + pad("n", 4, true) + "  " + pad("on post", 8) + "  " +
         pad("off post", 8) + "  warn riders of\n";
    for (std::size_t i : sec.posts) {
      const MarshalPost& p = plan.posts[i];
      const std::string line = "    " + pad(p.code, 6) + pad(km(p.at_m), 8, true) +
                               pad(std::to_string(p.count), 4, true) + "  " + clock_hms(p.on_post_s) +
                               "  " + clock_hms(p.off_post_s) + "  " + p.warn;
      o += fit(line, kTextWidth) + "\n";
    }
  }

  o += "\nGrading for clubs\n";
  for (const ClassGrade& g : grading.classes) {
    o += "  " + pad(fit(g.class_name, 22), 22) + "  " + pad(suitability_name(g.verdict), 10) + "  " +
         duration_hm(g.ride_time_s) + "\n";
    for (const GradeReason& r : g.reasons) {
      o += wrapped("- " + std::string(suitability_name(r.level)) + ": " + r.text, 6);
    }
  }
  const CourseGrade& cg = grading.course;
  o += "\n";
  o += wrapped("Course grade for mixed-ability groups: level " + std::to_string(cg.level) + " of 5, \"" +
                   cg.name + "\" (" + std::to_string(cg.suitable) + " suitable, " +
                   std::to_string(cg.demanding) + " demanding, " + std::to_string(cg.unsuitable) +
                   " unsuitable). " + cg.meaning,
               0);
  return o;
}

}  // namespace coursewarden
