// Grading for clubs: each class against the event's limits, walking sections and hazards, and
// the course on our own five-level scale (docs/operations.md).
#include "coursewarden/grading.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <string>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr std::array<GradeLevel, 5> kScale{{
    {1, "open to all",
     "Every class in the field rides it comfortably: one group can ride it together.", 1.0},
    {2, "most riders",
     "Most of the field rides it comfortably; some classes will find it hard going: plan "
     "regrouping points and a sweep rider.",
     0.75},
    {3, "split group",
     "Only part of the field rides it comfortably: run separate groups or offer a shorter option.",
     0.5},
    {4, "strong riders",
     "Most of the field finds it hard going and some classes cannot ride it: a course for strong "
     "riders; the rest of the field needs another course.",
     0.25},
    {5, "few riders",
     "Hardly any class in the field rides it comfortably: not a course for a mixed-ability group.",
     0.0},
}};

std::string two_digits(long v) { return (v < 10 ? "0" : "") + std::to_string(v); }

// "5h07" for a duration.
std::string duration_text(double s) {
  const long total_min = std::lround(s / 60.0);
  return std::to_string(total_min / 60) + "h" + two_digits(total_min % 60);
}

// "12:05" for a clock time (minutes rounded; past midnight goes on counting hours).
std::string clock_text(double s) {
  const long total_min = std::lround(s / 60.0);
  const long h = total_min / 60, m = total_min % 60;
  return two_digits(h) + ":" + two_digits(m);
}

std::string minutes_text(double s) { return fmt_fixed(std::max(s, 0.0) / 60.0, 0) + " min"; }

std::string km_text(double m) { return "km " + fmt_fixed(m / 1000.0, 1); }

std::string hazard_code(int number, std::size_t count) {
  std::string digits = std::to_string(number);
  const std::size_t width = std::max<std::size_t>(2, std::to_string(count).size());
  if (digits.size() < width) digits.insert(0, width - digits.size(), '0');
  return "H" + digits;
}

std::string joined(const std::vector<std::string>& parts) {
  std::string out;
  for (const auto& p : parts) out += (out.empty() ? "" : ", ") + p;
  return out;
}

void add(ClassGrade& g, Suitability level, std::string text) {
  g.reasons.push_back({level, std::move(text)});
  g.verdict = std::max(g.verdict, level);
}

void grade_time(ClassGrade& g, const OperationsRules& rules) {
  const double limit = rules.time_limit_s;
  if (!std::isfinite(limit)) return;
  const double t = g.ride_time_s;
  if (t > limit) {
    add(g, Suitability::unsuitable,
        "predicted ride time " + duration_text(t) + " is over the time limit of " + duration_text(limit));
    g.missed_cutoffs.push_back("finish");
  } else if (t > rules.demanding_time_share * limit) {
    add(g, Suitability::demanding,
        "predicted ride time " + duration_text(t) + " uses " + fmt_fixed(100.0 * t / limit, 0) +
            " % of the time limit of " + duration_text(limit));
  }
}

void grade_cutoffs(ClassGrade& g, std::size_t c, const CheckResult& r, const Schedule& s,
                   const OperationsRules& rules) {
  const auto& d = r.analysis.profile.distance_m;
  for (const ScheduleRow& row : s.rows) {
    if (row.kind != ScheduleKind::checkpoint || !std::isfinite(row.cutoff_s)) continue;
    double arrival = -1e300;
    std::string wave;
    for (const ScheduledGroup& grp : s.groups) {
      if (grp.class_index != c) continue;
      const double t = grp.start_s + elapsed_at_s(d, r.speeds[c], row.at_m);
      if (t > arrival) {
        arrival = t;
        wave = grp.wave_name;
      }
    }
    if (wave.empty()) continue;
    const std::string where = "reaches " + row.label + " (" + km_text(row.at_m) + ") at " +
                              clock_text(arrival) + (s.waves.size() > 1 ? " in wave " + wave : "");
    if (arrival > row.cutoff_s) {
      add(g, Suitability::unsuitable, where + ", after its cut-off at " + clock_text(row.cutoff_s));
      g.missed_cutoffs.push_back(row.label);
    } else if (row.cutoff_s - arrival < rules.cutoff_margin_s) {
      add(g, Suitability::demanding,
          where + ", only " + minutes_text(row.cutoff_s - arrival) + " before its cut-off");
    }
  }
}

void grade_closing(ClassGrade& g, std::size_t c, const CheckResult& r, const Schedule& s) {
  const auto& d = r.analysis.profile.distance_m;
  const auto& t = r.speeds[c].elapsed_s;
  double worst_finish = -1e300, worst_behind = 0.0, worst_at = 0.0;
  for (const ScheduledGroup& grp : s.groups) {
    if (grp.class_index != c) continue;
    for (std::size_t i = 0; i < d.size(); ++i) {
      const double behind = grp.start_s + t[i] - (s.last_start_s + d[i] / s.closing_speed_mps);
      if (behind > worst_behind) {
        worst_behind = behind;
        worst_at = d[i];
      }
    }
    worst_finish = std::max(worst_finish, grp.start_s + t.back() - (s.last_start_s + d.back() / s.closing_speed_mps));
  }
  const std::string vehicle = "the closing vehicle (" + fmt_fixed(s.closing_speed_mps * 3.6, 1) +
                              " km/h from the last start)";
  // Gaps within the grace are no finding (start from rest, constant-pace vehicle model).
  if (worst_finish > s.closing_grace_s) {
    add(g, Suitability::unsuitable,
        "finishes " + minutes_text(worst_finish) + " after " + vehicle +
            ": slower than the event's minimum speed");
  } else if (worst_behind > s.closing_grace_s) {
    add(g, Suitability::demanding,
        "falls up to " + minutes_text(worst_behind) + " behind " + vehicle + " around " +
            km_text(worst_at) + " and catches up by the finish");
  }
}

void grade_walking(ClassGrade& g, const SpeedProfile& sp, const OperationsRules& rules) {
  if (sp.walking_sections.empty()) return;
  double longest = 0.0, at = 0.0;
  for (const DistanceRange& w : sp.walking_sections) {
    if (w.end_m - w.start_m > longest) {
      longest = w.end_m - w.start_m;
      at = w.start_m;
    }
  }
  longest = std::max(longest, sp.longest_walking_m);
  g.longest_walking_m = longest;
  const std::size_t n = sp.walking_sections.size();
  const std::string text = "cannot hold walking pace on the bicycle over " + std::to_string(n) +
                           (n == 1 ? " stretch" : " stretches") + ", longest " +
                           fmt_fixed(longest, 0) + " m from " + km_text(at);
  if (longest > rules.max_walking_m) {
    add(g, Suitability::unsuitable, text + " (more than " + fmt_fixed(rules.max_walking_m, 0) + " m)");
  } else {
    add(g, Suitability::demanding, text);
  }
}

// True when the class, arriving unbraked, cannot reach its safe speed even with its hardest
// braking on the straight before the corner: a misjudgement there cannot be rescued.
bool beyond_hardest_braking(const Hazard& h, const std::string& name) {
  for (const ClassAtCorner& a : h.classes)
    if (a.class_name == name) return a.too_fast && a.braking_distance_hard_m > a.room_m;
  return false;
}

void grade_hazards(ClassGrade& g, const CheckResult& r, const OperationsRules& rules) {
  std::vector<std::string> codes;
  int beyond = 0;
  for (const Hazard& h : r.hazards) {
    const Severity sev = severity_for_class(h, g.class_name);
    if (sev == Severity::critical) ++g.critical_hazards;
    if (sev == Severity::serious) ++g.serious_hazards;
    if (sev >= Severity::serious) codes.push_back(hazard_code(h.number, r.hazards.size()));
    if (sev == Severity::critical && beyond_hardest_braking(h, g.class_name)) ++beyond;
  }
  if (codes.empty()) return;
  std::string counts;
  if (g.critical_hazards > 0) counts = std::to_string(g.critical_hazards) + " critical";
  if (g.serious_hazards > 0) {
    counts += (counts.empty() ? "" : " and ") + std::to_string(g.serious_hazards) + " serious";
  }
  std::string text = counts + (codes.size() == 1 ? " hazard" : " hazards") + " for this class: " + joined(codes);
  if (beyond > 0) {
    text += "; at " + std::to_string(beyond) + " of them even its hardest braking cannot reach a safe speed "
            "in the straight before the corner";
  }
  // Serious and critical hazards make a course demanding for a class; it becomes unsuitable when
  // several critical ones could not be rescued by hard braking (our assumption, docs/operations.md).
  add(g, beyond >= rules.critical_hazards_unsuitable ? Suitability::unsuitable : Suitability::demanding, text);
}

}  // namespace

const char* suitability_name(Suitability s) {
  switch (s) {
    case Suitability::suitable: return "suitable";
    case Suitability::demanding: return "demanding";
    case Suitability::unsuitable: return "unsuitable";
  }
  return "unknown";
}

std::span<const GradeLevel> course_grade_scale() { return kScale; }

CourseGrade course_grade_for(int suitable, int demanding, int unsuitable) {
  if (suitable < 0 || demanding < 0 || unsuitable < 0 || suitable + demanding + unsuitable == 0) {
    throw Error("course grade: needs at least one rider class and no negative counts");
  }
  // Half-points in integers so that the boundaries are exact: suitable 2, demanding 1.
  const long points = 2L * suitable + demanding;
  const long total = 2L * (suitable + demanding + unsuitable);
  int level = 5;
  if (points == total) level = 1;
  else if (4 * points >= 3 * total) level = 2;
  else if (2 * points >= total) level = 3;
  else if (4 * points >= total) level = 4;
  const GradeLevel& l = kScale[static_cast<std::size_t>(level - 1)];
  CourseGrade g;
  g.level = l.level;
  g.name = l.name;
  g.meaning = l.meaning;
  g.fit_share = static_cast<double>(points) / static_cast<double>(total);
  g.suitable = suitable;
  g.demanding = demanding;
  g.unsuitable = unsuitable;
  return g;
}

Severity severity_for_class(const Hazard& h, const std::string& name) {
  for (const ClassAtCorner& a : h.classes) {
    if (a.class_name != name) continue;
    if (a.too_fast) return a.severity;
    if (h.kind == HazardKind::hidden_corner) return h.severity;
    return Severity::caution;
  }
  for (const std::string& n : h.section_classes)
    if (n == name) return h.severity;
  return Severity::none;
}

Grading grade_course(const CheckResult& r, const EventOps& ops, const Schedule& s) {
  if (r.speeds.size() != r.classes.size()) {
    fail(ops.source, "grading", "the check has no speed profile for every rider class");
  }
  Grading out;
  int counts[3] = {0, 0, 0};
  for (std::size_t c = 0; c < r.classes.size(); ++c) {
    if (r.speeds[c].elapsed_s.size() != r.analysis.profile.distance_m.size() ||
        r.speeds[c].elapsed_s.empty()) {
      fail(ops.source, "grading", "speed profile of class '" + r.classes[c].name +
                                      "' does not match the stations; run the check again");
    }
    ClassGrade g;
    g.class_name = r.classes[c].name;
    g.ride_time_s = r.speeds[c].elapsed_s.back();
    grade_time(g, ops.rules);
    grade_cutoffs(g, c, r, s, ops.rules);
    grade_closing(g, c, r, s);
    grade_walking(g, r.speeds[c], ops.rules);
    grade_hazards(g, r, ops.rules);
    ++counts[static_cast<int>(g.verdict)];
    out.classes.push_back(std::move(g));
  }
  out.course = course_grade_for(counts[0], counts[1], counts[2]);
  return out;
}

}  // namespace coursewarden
