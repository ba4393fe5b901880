// The event's timetable: first and last groups, the closing vehicle, closure windows and
// cut-offs at every kilometre, checkpoint, hazard and the finish (docs/operations.md).
#include "coursewarden/schedule.hpp"

#include <algorithm>
#include <cmath>
#include <string>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

// Distances a checkpoint may lie outside the course and still count as its start or end.
constexpr double kEndTolerance_m = 1.0;

std::string quoted(const std::string& s) { return "'" + s + "'"; }

std::string km_text(double m) { return "km " + fmt_fixed(m / 1000.0, 1); }

void check_result_shape(const CheckResult& r, const std::string& source) {
  const auto& d = r.analysis.profile.distance_m;
  if (d.empty()) fail(source, "schedule", "the check has no stations; run the check first");
  if (r.speeds.size() != r.classes.size() || r.classes.empty()) {
    fail(source, "schedule", "the check has no speed profile for every rider class");
  }
  for (const auto& sp : r.speeds) {
    if (sp.elapsed_s.size() != d.size()) {
      fail(source, "schedule", "speed profile of class " + quoted(sp.class_name) +
                                   " does not match the stations; run the check again");
    }
  }
}

bool finite_non_negative(double v) { return std::isfinite(v) && v >= 0.0; }

void check_rules(const OperationsRules& r, const std::string& source) {
  auto need = [&](bool ok, const char* key, const std::string& what) {
    if (!ok) fail(source, std::string("rules: ") + key, what);
  };
  need(finite_non_negative(r.marshal_lead_s), "marshal_lead", "must be a duration of 0 or more");
  need(std::isfinite(r.marshal_lead_max_s) && r.marshal_lead_max_s >= r.marshal_lead_s,
       "marshal_lead_max", "must be at least the marshal lead time");
  need(finite_non_negative(r.marshal_release_after_closing_s), "marshal_release_after_closing",
       "must be a duration of 0 or more");
  need(r.marshals_per_turn >= 0, "marshals_per_turn", "must be 0 or more");
  need(finite_non_negative(r.merge_posts_within_m), "merge_posts_within", "must be 0 m or more");
  need(finite_non_negative(r.merged_post_extra_from_m), "merged_post_extra_from",
       "must be 0 m or more");
  need(std::isfinite(r.sector_length_m) && r.sector_length_m > 0.0, "sector_length",
       "must be more than 0 m");
  need(r.max_posts_per_sector >= 1, "max_posts_per_sector", "must be 1 or more");
  need(std::isfinite(r.closing_speed_mps) && r.closing_speed_mps > 0.0, "closing_speed",
       "must be a speed above 0");
  need(finite_non_negative(r.closing_grace_s), "closing_grace", "must be a duration of 0 or more");
  need(finite_non_negative(r.closure_margin_before_s), "closure_margin_before",
       "must be a duration of 0 or more");
  need(finite_non_negative(r.closure_margin_after_s), "closure_margin_after",
       "must be a duration of 0 or more");
  need(std::isfinite(r.schedule_step_m) && r.schedule_step_m >= 100.0, "schedule_step",
       "must be 100 m or more");
  need(std::isnan(r.time_limit_s) || (std::isfinite(r.time_limit_s) && r.time_limit_s > 0.0),
       "time_limit", "must be a duration above 0, or left out");
  need(std::isfinite(r.demanding_time_share) && r.demanding_time_share > 0.0 &&
           r.demanding_time_share <= 1.0,
       "demanding_time_share", "must be a share above 0 and at most 1");
  need(finite_non_negative(r.cutoff_margin_s), "cutoff_margin", "must be a duration of 0 or more");
  need(finite_non_negative(r.max_walking_m), "max_walking", "must be 0 m or more");
  need(r.critical_hazards_unsuitable >= 1, "critical_hazards_unsuitable", "must be 1 or more");
}

void check_checkpoints(const std::vector<Checkpoint>& cps, double length_m, const std::string& source) {
  for (std::size_t k = 0; k < cps.size(); ++k) {
    const Checkpoint& c = cps[k];
    const std::string where = "checkpoint " + (c.name.empty() ? "#" + std::to_string(k + 1) : quoted(c.name));
    if (c.kind != "feed" && c.kind != "cut-off" && c.kind != "other") {
      fail(source, where, "kind must be \"feed\", \"cut-off\" or \"other\", got \"" + c.kind + "\"");
    }
    if (!std::isfinite(c.at_m) || c.at_m < -kEndTolerance_m || c.at_m > length_m + kEndTolerance_m) {
      fail(source, where, "lies at " + km_text(c.at_m) + ", outside the course (km 0 to " +
                              fmt_fixed(length_m / 1000.0, 1) + "); give a distance on the course");
    }
    if (std::isinf(c.cutoff_time_s)) fail(source, where, "cut-off time must be a clock time");
    if (c.kind == "cut-off" && std::isnan(c.cutoff_time_s)) {
      fail(source, where, "is a cut-off point but gives no cut-off time; add one or make it \"other\"");
    }
  }
}

ScheduleRow row_from(ScheduleKind kind, std::string label, double at_m, const PassTimes& p,
                     const OperationsRules& rules) {
  ScheduleRow row;
  row.kind = kind;
  row.label = std::move(label);
  row.at_m = at_m;
  row.earliest_s = p.earliest_s;
  row.earliest_class = p.earliest_class;
  row.earliest_wave = p.earliest_wave;
  row.latest_s = p.latest_s;
  row.latest_class = p.latest_class;
  row.latest_wave = p.latest_wave;
  row.closing_s = p.closing_s;
  row.closure_open_s = p.earliest_s - rules.closure_margin_before_s;
  row.closure_close_s = p.closing_s + rules.closure_margin_after_s;
  row.latest_behind_closing = p.latest_s > p.closing_s + rules.closing_grace_s;
  return row;
}

std::string hazard_label(const Hazard& h, std::size_t count) {
  std::string digits = std::to_string(h.number);
  const std::size_t width = std::max<std::size_t>(2, std::to_string(count).size());
  if (digits.size() < width) digits.insert(0, width - digits.size(), '0');
  return "H" + digits + " " + hazard_kind_label(h.kind) + " (" + std::string(severity_name(h.severity)) + ")";
}

std::string km_label(double d_m, double step_m) {
  const bool whole = std::fmod(step_m, 1000.0) == 0.0;
  return "km " + fmt_fixed(d_m / 1000.0, whole ? 0 : 1);
}

int kind_order(ScheduleKind k) { return static_cast<int>(k); }

}  // namespace

const char* schedule_kind_key(ScheduleKind kind) {
  switch (kind) {
    case ScheduleKind::km: return "km";
    case ScheduleKind::checkpoint: return "checkpoint";
    case ScheduleKind::hazard: return "hazard";
    case ScheduleKind::finish: return "finish";
  }
  return "unknown";
}

double elapsed_at_s(const std::vector<double>& d, const SpeedProfile& speed, double at_m) {
  const auto& t = speed.elapsed_s;
  if (d.empty() || t.size() != d.size()) {
    throw Error("speed profile of class '" + speed.class_name + "' does not match the stations");
  }
  if (at_m <= d.front()) return t.front();
  if (at_m >= d.back()) return t.back();
  const auto hi = static_cast<std::size_t>(std::upper_bound(d.begin(), d.end(), at_m) - d.begin());
  const std::size_t lo = hi - 1;
  const double f = (at_m - d[lo]) / (d[hi] - d[lo]);
  return t[lo] + f * (t[hi] - t[lo]);
}

std::vector<ScheduledWave> schedule_waves(const CheckResult& r, const EventOps& ops) {
  const std::string& src = ops.source;
  check_result_shape(r, src);
  check_rules(ops.rules, src);
  check_checkpoints(ops.checkpoints, r.analysis.profile.distance_m.back(), src);

  std::vector<ScheduledWave> waves;
  if (ops.waves.empty()) {
    ScheduledWave w;
    w.name = "mass start";
    w.start_time_s = r.environment.start_time_s;
    for (std::size_t c = 0; c < r.classes.size(); ++c) w.classes.push_back(c);
    waves.push_back(std::move(w));
    return waves;
  }
  std::vector<char> covered(r.classes.size(), 0);
  for (std::size_t k = 0; k < ops.waves.size(); ++k) {
    const StartWave& in = ops.waves[k];
    const std::string where = "start wave " + (in.name.empty() ? "#" + std::to_string(k + 1) : quoted(in.name));
    if (!std::isfinite(in.start_time_s)) fail(src, where, "start time must be a clock time");
    ScheduledWave w;
    w.name = in.name.empty() ? "wave " + std::to_string(k + 1) : in.name;
    w.start_time_s = in.start_time_s;
    if (in.classes.empty()) {
      for (std::size_t c = 0; c < r.classes.size(); ++c) w.classes.push_back(c);
    }
    for (const std::string& name : in.classes) {
      const int c = find_rider_class(r.classes, name);
      if (c < 0) {
        fail(src, where, "class " + quoted(name) +
                             " is not in the field of this check; name a class of the field");
      }
      const auto ci = static_cast<std::size_t>(c);
      if (std::find(w.classes.begin(), w.classes.end(), ci) == w.classes.end()) w.classes.push_back(ci);
    }
    for (std::size_t c : w.classes) covered[c] = 1;
    waves.push_back(std::move(w));
  }
  for (std::size_t c = 0; c < r.classes.size(); ++c) {
    if (!covered[c]) {
      fail(src, "start waves", "class " + quoted(r.classes[c].name) +
                                   " starts in no wave; add it to a wave or leave a wave's classes empty");
    }
  }
  return waves;
}

PassTimes pass_times(const CheckResult& r, const Schedule& s, double at_m) {
  const auto& d = r.analysis.profile.distance_m;
  PassTimes p;
  bool first = true;
  for (const ScheduledWave& w : s.waves) {
    for (std::size_t c : w.classes) {
      const double t = w.start_time_s + elapsed_at_s(d, r.speeds[c], at_m);
      // Ties keep the first group found (waves in order, classes in the wave's order).
      if (first || t < p.earliest_s) {
        p.earliest_s = t;
        p.earliest_class = r.classes[c].name;
        p.earliest_wave = w.name;
      }
      if (first || t > p.latest_s) {
        p.latest_s = t;
        p.latest_class = r.classes[c].name;
        p.latest_wave = w.name;
      }
      first = false;
    }
  }
  p.closing_s = s.last_start_s + std::max(at_m, 0.0) / s.closing_speed_mps;
  return p;
}

Schedule make_schedule(const CheckResult& r, const EventOps& ops) {
  Schedule s;
  s.waves = schedule_waves(r, ops);
  const OperationsRules& rules = ops.rules;
  const auto& d = r.analysis.profile.distance_m;
  s.course_length_m = d.back();
  s.closing_speed_mps = rules.closing_speed_mps;
  s.closing_grace_s = rules.closing_grace_s;
  s.time_limit_s = rules.time_limit_s;
  s.first_start_s = s.waves.front().start_time_s;
  s.last_start_s = s.waves.front().start_time_s;
  for (std::size_t k = 0; k < s.waves.size(); ++k) {
    const ScheduledWave& w = s.waves[k];
    s.first_start_s = std::min(s.first_start_s, w.start_time_s);
    s.last_start_s = std::max(s.last_start_s, w.start_time_s);
    for (std::size_t c : w.classes) {
      ScheduledGroup g;
      g.wave = k;
      g.class_index = c;
      g.wave_name = w.name;
      g.class_name = r.classes[c].name;
      g.start_s = w.start_time_s;
      g.elapsed_s = r.speeds[c].elapsed_s.back();
      g.finish_s = g.start_s + g.elapsed_s;
      s.groups.push_back(std::move(g));
    }
  }

  // Classes with a group arriving after `cutoff(group)`; the result is in the field's order.
  auto missing = [&](double at_m, auto cutoff_of) {
    std::vector<char> miss(r.classes.size(), 0);
    for (const ScheduledGroup& g : s.groups) {
      const double arrival = g.start_s + elapsed_at_s(d, r.speeds[g.class_index], at_m);
      if (arrival > cutoff_of(g)) miss[g.class_index] = 1;
    }
    std::vector<std::string> names;
    for (std::size_t c = 0; c < miss.size(); ++c)
      if (miss[c]) names.push_back(r.classes[c].name);
    return names;
  };

  const double length = s.course_length_m;
  for (std::size_t k = 0;; ++k) {
    const double at = static_cast<double>(k) * rules.schedule_step_m;
    if (at >= length - 1e-6) break;
    s.rows.push_back(row_from(ScheduleKind::km, km_label(at, rules.schedule_step_m), at,
                              pass_times(r, s, at), rules));
  }
  for (std::size_t k = 0; k < ops.checkpoints.size(); ++k) {
    const Checkpoint& c = ops.checkpoints[k];
    const double at = std::clamp(c.at_m, 0.0, length);
    ScheduleRow row = row_from(ScheduleKind::checkpoint,
                               c.name.empty() ? "checkpoint " + std::to_string(k + 1) : c.name, at,
                               pass_times(r, s, at), rules);
    row.checkpoint_kind = c.kind;
    if (!std::isnan(c.cutoff_time_s)) {
      row.cutoff_s = c.cutoff_time_s;
      row.classes_missing_cutoff = missing(at, [&](const ScheduledGroup&) { return c.cutoff_time_s; });
      row.slowest_makes_cutoff = row.classes_missing_cutoff.empty();
    }
    s.rows.push_back(std::move(row));
  }
  for (const Hazard& h : r.hazards) {
    const double at = std::clamp(h.at_m, 0.0, length);
    ScheduleRow row = row_from(ScheduleKind::hazard, hazard_label(h, r.hazards.size()), at,
                               pass_times(r, s, at), rules);
    row.hazard_number = h.number;
    s.rows.push_back(std::move(row));
  }
  {
    ScheduleRow row = row_from(ScheduleKind::finish, "finish", length, pass_times(r, s, length), rules);
    if (std::isfinite(rules.time_limit_s)) {
      row.cutoff_s = s.last_start_s + rules.time_limit_s;
      row.classes_missing_cutoff =
          missing(length, [&](const ScheduledGroup& g) { return g.start_s + rules.time_limit_s; });
      row.slowest_makes_cutoff = row.classes_missing_cutoff.empty();
    }
    s.rows.push_back(std::move(row));
  }
  std::stable_sort(s.rows.begin(), s.rows.end(), [](const ScheduleRow& a, const ScheduleRow& b) {
    if (a.at_m != b.at_m) return a.at_m < b.at_m;
    return kind_order(a.kind) < kind_order(b.kind);
  });
  return s;
}

}  // namespace coursewarden
