// Summary JSON, per-station CSV and terminal text of a check.
#include "coursewarden/check_outputs.hpp"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <sstream>

#include "coursewarden/compare.hpp"
#include "coursewarden/operations.hpp"
#include "coursewarden/ops_outputs.hpp"
#include "coursewarden/outputs.hpp"
#include "io/json_out.hpp"
#include "io/riders_output.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

using json_out::r;
constexpr double kRadToDeg = 180.0 / 3.14159265358979323846;

nlohmann::json finite_or_null(double v, int decimals) { return json_out::finite_or_null<nlohmann::json>(v, decimals); }

nlohmann::json conditions_json(const CheckResult& c) {
  const auto& e = c.environment;
  return {{"surface", e.wet ? "wet" : "dry"},
          {"road", c.road.closed ? "closed" : "open"},
          {"road_width_m", c.road.road_width_m},
          {"lane_width_m", c.road.lane_width_m},
          {"traffic_side", c.road.right_hand_traffic ? "right" : "left"},
          {"temperature_c", e.temperature_c},
          {"wind_speed_kmh", r(e.wind_speed_mps * 3.6, 1)},
          {"wind_from_deg", r(e.wind_from_rad * kRadToDeg, 0)},
          {"start_time_s", e.start_time_s},
          {"assist_cutoff_kmh", r(e.assist_cutoff_mps * 3.6, 1)}};
}

nlohmann::json corner_json(const Corner& c, double path_radius, double visible_m) {
  return {{"visible_approach_m", finite_or_null(visible_m, 0)},
          {"entry_m", r(c.entry_m, 1)},
          {"apex_m", r(c.apex_m, 1)},
          {"exit_m", r(c.exit_m, 1)},
          {"radius_m", r(c.turn_radius_m, 1)},
          {"path_radius_m", r(path_radius, 1)},
          {"deflection_deg", r(c.deflection_rad * kRadToDeg, 1)},
          {"direction", turn_direction_name(c.direction)},
          {"hairpin", c.hairpin},
          {"s_bend", c.s_bend},
          {"compound", c.compound},
          {"straight_before_m", r(c.straight_before_m, 1)}};
}

nlohmann::json hazard_json(const Hazard& h) {
  nlohmann::json j;
  j["number"] = h.number;
  j["at_m"] = r(h.at_m, 1);
  j["end_m"] = r(h.end_m, 1);
  j["kind"] = hazard_kind_key(h.kind);
  j["severity"] = std::string(severity_name(h.severity));
  auto classes = nlohmann::json::array();
  for (const auto& a : h.classes) classes.push_back(json_out::class_at_corner<nlohmann::json>(a));
  for (const auto& name : h.section_classes) classes.push_back({{"name", name}});
  j["classes"] = classes;
  j["peak_speed_kmh"] = r(h.peak_speed_mps * 3.6, 1);
  if (h.corner) j["corner"] = *h.corner;
  if (h.kind == HazardKind::steep_descent) j["steepest_pct"] = r(h.steepest_pct, 1);
  j["hidden"] = h.hidden;
  j["after_descent"] = h.after_descent;
  j["sign_distance_m"] = r(h.sign.distance_m, 0);
  j["sign_visibility_m"] = r(h.sign.min_clear_visibility_m, 0);
  j["sign_speed_band"] = std::string(h.sign.speed_band);
  j["sign_at_m"] = r(h.sign_at_m, 1);
  j["sign_lon"] = r(h.sign_lon_deg, 7);
  j["sign_lat"] = r(h.sign_lat_deg, 7);
  j["marshals"] = h.marshals;
  j["lon"] = r(h.lon_deg, 7);
  j["lat"] = r(h.lat_deg, 7);
  j["reason"] = h.reason;
  return j;
}

std::string pad(const std::string& s, std::size_t width, bool right = true) {
  if (s.size() >= width) return s;
  return right ? std::string(width - s.size(), ' ') + s : s + std::string(width - s.size(), ' ');
}

// A duration as "4h15", rounded to the minute (as the grading and the report round it).
std::string clock(double seconds) {
  const long total_min = std::lround(seconds / 60.0);
  const long h = total_min / 60, m = total_min % 60;
  return std::to_string(h) + "h" + (m < 10 ? "0" : "") + std::to_string(m);
}

nlohmann::json clock_json(double s) {
  return std::isfinite(s) ? nlohmann::json(clock_hms(s)) : nlohmann::json(nullptr);
}

void add_operations_json(nlohmann::json& j, const CheckResult& c, const Operations& ops) {
  auto rows = nlohmann::json::array();
  for (const ScheduleRow& row : ops.schedule.rows) {
    nlohmann::json rj = {{"kind", schedule_kind_key(row.kind)},
                         {"label", row.label},
                         {"at_m", r(row.at_m, 1)},
                         {"earliest", clock_json(row.earliest_s)},
                         {"earliest_class", row.earliest_class},
                         {"latest", clock_json(row.latest_s)},
                         {"latest_class", row.latest_class},
                         {"closing_vehicle", clock_json(row.closing_s)},
                         {"road_closed_from", clock_json(row.closure_open_s)},
                         {"road_closed_until", clock_json(row.closure_close_s)}};
    if (std::isfinite(row.cutoff_s)) {
      rj["cutoff"] = clock_json(row.cutoff_s);
      rj["classes_missing_cutoff"] = row.classes_missing_cutoff;
    }
    rows.push_back(rj);
  }
  j["schedule"] = rows;
  auto posts = nlohmann::json::array();
  for (const MarshalPost& p : ops.marshal_plan.posts) {
    posts.push_back({{"code", p.code},
                     {"at_m", r(p.at_m, 1)},
                     {"marshals", p.count},
                     {"on_post", clock_json(p.on_post_s)},
                     {"off_post", clock_json(p.off_post_s)},
                     {"warn", p.warn},
                     {"hazards", p.hazards},
                     {"lon", r(p.lon_deg, 7)},
                     {"lat", r(p.lat_deg, 7)}});
  }
  j["marshal_plan"] = {{"posts", posts},
                       {"marshals_needed", ops.marshal_plan.marshals_needed},
                       {"peak_posts", ops.marshal_plan.peak_posts},
                       {"peak_marshals", ops.marshal_plan.peak_marshals}};
  auto classes = nlohmann::json::array();
  for (const ClassGrade& g : ops.grading.classes) {
    auto reasons = nlohmann::json::array();
    for (const GradeReason& why : g.reasons) reasons.push_back(why.text);
    classes.push_back({{"name", g.class_name}, {"verdict", suitability_name(g.verdict)}, {"reasons", reasons}});
  }
  const CourseGrade& cg = ops.grading.course;
  j["grading"] = {{"classes", classes},
                  {"course", {{"level", cg.level}, {"name", cg.name}, {"meaning", cg.meaning}}}};
  (void)c;
}

}  // namespace

std::string check_summary_json(const CheckResult& c) {
  nlohmann::json j = profile_json(c.analysis);
  j["conditions"] = conditions_json(c);
  auto riders = nlohmann::json::array();
  for (std::size_t k = 0; k < c.classes.size(); ++k) {
    auto rj = rider_result_json(c.classes[k], c.speeds[k]);
    rj["description"] = c.classes[k].description;
    riders.push_back(rj);
  }
  j["riders"] = riders;
  auto corners = nlohmann::json::array();
  for (std::size_t k = 0; k < c.corners.size(); ++k) corners.push_back(corner_json(c.corners[k], c.path_radius_m[k],
                                  k < c.corner_visible_m.size() ? c.corner_visible_m[k] : NAN));
  j["corners"] = corners;
  auto hazards = nlohmann::json::array();
  for (const auto& h : c.hazards) hazards.push_back(hazard_json(h));
  j["hazards"] = hazards;
  nlohmann::json counts = nlohmann::json::object();
  for (Severity s : {Severity::note, Severity::caution, Severity::serious, Severity::critical}) {
    counts[std::string(severity_name(s))] =
        std::count_if(c.hazards.begin(), c.hazards.end(), [s](const Hazard& h) { return h.severity == s; });
  }
  j["hazard_counts"] = counts;
  if (c.reverse.checked) {
    j["reverse_direction"] = {{"note", c.reverse.counts[0]},
                              {"caution", c.reverse.counts[1]},
                              {"serious", c.reverse.counts[2]},
                              {"critical", c.reverse.counts[3]},
                              {"markedly_safer", c.reverse.markedly_safer}};
  }
  j["direction"] = c.analysis.reversed ? "reverse" : "as drawn";
  if (!c.event_name.empty()) j["event"] = {{"name", c.event_name}, {"date", c.event_date}, {"file", c.event_path}};
  if (!c.scenario_name.empty()) j["conditions"]["scenario"] = c.scenario_name;
  add_operations_json(j, c, plan_operations(c));
  return j.dump(2) + "\n";
}

std::string check_profile_csv(const CheckResult& c) {
  const auto& a = c.analysis;
  std::string out = "distance_m,lon,lat,elevation_m,grade_pct";
  for (const auto& rc : c.classes) {
    out += "," + rc.name + "_planned_kmh," + rc.name + "_unbraked_kmh," + rc.name + "_arrival";
  }
  out += ",sight_m\n";
  for (std::size_t i = 0; i < a.stations.size(); ++i) {
    const auto& s = a.stations[i];
    out += fmt_fixed(s.distance_m, 1) + "," + fmt_fixed(s.lon_deg, 7) + "," + fmt_fixed(s.lat_deg, 7) +
           "," + fmt_fixed(a.profile.elevation_m[i], 2) + "," + fmt_fixed(a.profile.grade[i] * 100.0, 2);
    for (const auto& sp : c.speeds) {
      out += "," + fmt_fixed(sp.planned_speed_mps[i] * 3.6, 1) + "," + fmt_fixed(sp.unbraked_speed_mps[i] * 3.6, 1) +
             "," + clock_hms(sp.arrival_time_s[i]);
    }
    out += "," + fmt_fixed(c.sight_m[i], 0) + "\n";
  }
  return out;
}

std::string check_text(const CheckResult& c) {
  const Operations ops = plan_operations(c);
  std::string text = profile_text(c.analysis);
  // profile_text ends with the caution; keep it for the very end of the check's text.
  const std::string caution = word_wrap(kDisclaimer, 96);
  if (text.size() >= caution.size() && text.compare(text.size() - caution.size(), caution.size(), caution) == 0) {
    text.resize(text.size() - caution.size());
  }
  std::ostringstream o;
  o << text;
  const auto& e = c.environment;
  o << "Conditions  " << (e.wet ? "wet" : "dry") << " road, " << (c.road.closed ? "closed" : "open")
    << " to traffic, " << fmt_fixed(e.temperature_c, 0) << " C, wind " << fmt_fixed(e.wind_speed_mps * 3.6, 0)
    << " km/h from " << fmt_fixed(e.wind_from_rad * kRadToDeg, 0) << " deg\n\n";
  o << "Rider classes                   time   avg km/h   max km/h   walking\n";
  for (std::size_t k = 0; k < c.classes.size(); ++k) {
    const auto& sp = c.speeds[k];
    o << "  " << pad(c.classes[k].name, 24, false) << pad(clock(sp.total_time_s), 10)
      << pad(fmt_fixed(sp.moving_avg_speed_mps * 3.6, 1), 11) << pad(fmt_fixed(sp.max_speed_mps * 3.6, 1), 11)
      << "   "
      << (sp.walking_sections.empty() ? "-" : fmt_fixed(sp.longest_walking_m, 0) + " m longest") << "\n";
  }
  o << "\n" << c.corners.size() << " corners found; " << c.hazards.size() << " hazards";
  for (Severity s : {Severity::critical, Severity::serious, Severity::caution, Severity::note}) {
    const auto n = std::count_if(c.hazards.begin(), c.hazards.end(), [s](const Hazard& h) { return h.severity == s; });
    o << ", " << n << " " << severity_name(s);
  }
  o << "\n";
  if (!c.hazards.empty()) {
    o << "   #      km  severity  what                         classes  peak km/h  sign m  marshals\n";
    for (const auto& h : c.hazards) {
      const std::size_t affected = h.classes.empty() ? h.section_classes.size() : h.classes.size();
      o << pad(std::to_string(h.number), 4) << pad(fmt_fixed(h.at_m / 1000.0, 2), 8) << "  "
        << pad(std::string(severity_name(h.severity)), 8, false) << "  "
        << pad(hazard_kind_label(h.kind), 27, false) << pad(std::to_string(affected), 9)
        << pad(fmt_fixed(h.peak_speed_mps * 3.6, 0), 11) << pad(fmt_fixed(h.sign.distance_m, 0), 8)
        << pad(std::to_string(h.marshals), 10) << "\n";
    }
  }
  if (c.reverse.checked) {
    const auto& rc = c.reverse.counts;
    std::string line = "Ridden the other way: " + std::to_string(rc[3]) + " critical, " + std::to_string(rc[2]) +
                       " serious, " + std::to_string(rc[1]) + " caution, " + std::to_string(rc[0]) + " note.";
    if (c.reverse.markedly_safer) line += " The reverse direction has markedly fewer severe hazards: consider it.";
    o << "\n" << word_wrap(line, 96);
  }
  o << "\n" << operations_text(ops.schedule, ops.marshal_plan, ops.grading);
  o << "\n" << caution;
  return o.str();
}

std::string compare_text(const CheckResult& a, const CheckResult& b, const std::string& label_a,
                         const std::string& label_b) {
  const Comparison cmp = compare_courses(a, b);
  std::ostringstream o;
  auto row = [&o](const std::string& what, const std::string& va, const std::string& vb) {
    o << pad(what, 30, false) << pad(va, 20) << pad(vb, 20) << "\n";
  };
  auto cut = [](const std::string& s) { return s.size() > 19 ? s.substr(0, 18) + "~" : s; };
  o << "Comparing  A = " << label_a << "\n           B = " << label_b << "\n\n";
  row("", "A", "B");
  const auto& ta = a.analysis.profile.totals;
  const auto& tb = b.analysis.profile.totals;
  row("length km", fmt_fixed(ta.length_m / 1000, 2), fmt_fixed(tb.length_m / 1000, 2));
  row("ascent m", fmt_fixed(ta.ascent_m, 0), fmt_fixed(tb.ascent_m, 0));
  row("descent m", fmt_fixed(ta.descent_m, 0), fmt_fixed(tb.descent_m, 0));
  row("highest point m", fmt_fixed(ta.max_elevation_m, 0), fmt_fixed(tb.max_elevation_m, 0));
  auto climbs = [](const CheckResult& c) {
    std::string s;
    for (const auto& k : c.analysis.climbs)
      if (!k.category.empty()) s += (s.empty() ? "" : " ") + k.category;
    return s.empty() ? std::string("none") : s;
  };
  row("categorised climbs", cut(climbs(a)), cut(climbs(b)));
  row("corners", std::to_string(a.corners.size()), std::to_string(b.corners.size()));
  const auto sa = count_by_severity(a.hazards), sb = count_by_severity(b.hazards);
  const char* names[4] = {"note", "caution", "serious", "critical"};
  for (int k = 3; k >= 0; --k) row(std::string("hazards: ") + names[k], std::to_string(sa[k]), std::to_string(sb[k]));
  o << "Predicted time\n";
  for (std::size_t k = 0; k < a.classes.size() && k < b.classes.size(); ++k) {
    row("  " + a.classes[k].name, clock(a.speeds[k].total_time_s), clock(b.speeds[k].total_time_s));
  }
  o << "\n";
  if (cmp.safer < 0) {
    o << word_wrap(cmp.why, 96);
  } else {
    o << word_wrap(std::string(cmp.safer == 0 ? "A" : "B") + " is safer: " + cmp.why, 96);
  }
  o << "\n" << word_wrap(kDisclaimer, 96);
  return o.str();
}

std::string compare_json(const CheckResult& a, const CheckResult& b, const std::string& label_a,
                         const std::string& label_b) {
  const Comparison cmp = compare_courses(a, b);
  nlohmann::json j;
  j["disclaimer"] = kDisclaimer;
  j["a"] = nlohmann::json::parse(check_summary_json(a));
  j["a"]["label"] = label_a;
  j["b"] = nlohmann::json::parse(check_summary_json(b));
  j["b"]["label"] = label_b;
  j["comparison"] = {{"safer", cmp.safer == 0 ? nlohmann::json("a") : cmp.safer == 1 ? nlohmann::json("b") : nlohmann::json(nullptr)},
                     {"score_a", cmp.score_a},
                     {"score_b", cmp.score_b},
                     {"why", cmp.why}};
  return j.dump(2) + "\n";
}

}  // namespace coursewarden
