// Hazard checks over corners, speeds, sight lines and the profile (pure computation).
#include "coursewarden/hazards.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "coursewarden/error.hpp"
#include "coursewarden/physics.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

std::size_t index_at(const std::vector<double>& d, double at_m) {
  auto it = std::lower_bound(d.begin(), d.end(), at_m);
  if (it == d.end()) return d.size() - 1;
  return static_cast<std::size_t>(it - d.begin());
}

std::string kmh(double mps) { return fmt_fixed(mps * 3.6, 0) + " km/h"; }
std::string deg(double rad) { return fmt_fixed(rad * 180.0 / 3.14159265358979323846, 0) + " deg"; }

Severity raise(Severity s, int levels) {
  const int v = std::min(static_cast<int>(s) + levels, static_cast<int>(Severity::critical));
  return static_cast<Severity>(v);
}

// Mean gradient (fraction) of the profile over [from_m, to_m].
double mean_grade(const Profile& p, double from_m, double to_m) {
  from_m = std::max(from_m, p.distance_m.front());
  to_m = std::min(to_m, p.distance_m.back());
  if (to_m - from_m < 1e-6) return 0.0;
  const std::size_t a = index_at(p.distance_m, from_m), b = index_at(p.distance_m, to_m);
  if (b <= a) return 0.0;
  return (p.elevation_m[b] - p.elevation_m[a]) / (p.distance_m[b] - p.distance_m[a]);
}

std::vector<Hazard> corner_hazards(const HazardInputs& in, const HazardOptions& opt) {
  std::vector<Hazard> out;
  const auto& corners = *in.corners;
  const auto& classes = *in.classes;
  const auto& speeds = *in.speeds;
  const auto& prof = *in.profile;
  const auto& d = prof.distance_m;
  std::vector<std::vector<double>> needed(classes.size());
  if (in.corner_visible_m) {
    for (std::size_t c = 0; c < classes.size(); ++c) needed[c] = needed_sight_m(speeds[c], prof, in.wet, opt);
  }
  for (std::size_t k = 0; k < corners.size(); ++k) {
    const Corner& corner = corners[k];
    const double radius_m = (*in.path_radius_m)[k];
    const std::size_t entry = index_at(d, corner.entry_m);
    // Braking happens on the approach: the gradient of the 100 m before the entry.
    const double approach_grade = mean_grade(prof, corner.entry_m - 100.0, corner.entry_m);
    const double descent_grade = mean_grade(prof, corner.entry_m - opt.descent_lookback_m, corner.entry_m);
    const bool sharp = is_junction_type_turn(corner, opt);
    const bool after_descent = sharp && descent_grade * 100.0 <= opt.descent_before_turn_pct;

    Hazard h;
    h.corner = k;
    h.at_m = corner.entry_m;
    h.end_m = corner.exit_m;
    h.after_descent = after_descent;
    Severity worst = Severity::none;
    std::size_t too_fast = 0, hidden_count = 0;
    double fastest_entry = 0.0, slowest_safe = kInf, worst_braking = 0.0;
    for (std::size_t c = 0; c < classes.size(); ++c) {
      const RiderClass& rider = classes[c];
      ClassAtCorner a;
      a.class_name = rider.name;
      a.entry_speed_mps = speeds[c].unbraked_speed_mps[entry];
      a.planned_speed_mps = speeds[c].planned_speed_mps[entry];
      a.safe_speed_mps = class_safe_speed_mps(rider, radius_m, in.wet, opt);
      a.room_m = corner.straight_before_m;
      a.braking_distance_m = braking_distance_m(a.entry_speed_mps, a.safe_speed_mps,
                                                brake_comfort_mps2(rider, in.wet), approach_grade,
                                                rider.reaction_time_s);
      a.braking_distance_hard_m = braking_distance_m(a.entry_speed_mps, a.safe_speed_mps,
                                                     brake_max_mps2(rider, in.wet), approach_grade,
                                                     rider.reaction_time_s);
      a.too_fast = a.entry_speed_mps > a.safe_speed_mps;
      a.room_enough = a.braking_distance_m <= a.room_m;
      if (in.corner_visible_m && !needed[c].empty()) {
        a.hidden = corner_hidden_for(d, needed[c], corner.entry_m, (*in.corner_visible_m)[k]);
      }
      if (a.too_fast) {
        a.severity = severity_for_corner(a.entry_speed_mps - a.safe_speed_mps, a.safe_speed_mps,
                                         a.braking_distance_m, a.room_m, opt.severity);
        // On a level or rising approach riders brake for a corner as a matter of course: when
        // they see it in time and the straight gives room to brake comfortably, it is a note
        // for the briefing, not a place that needs signs and marshals (our rule, docs/hazards.md).
        if (approach_grade > opt.level_approach_grade && a.braking_distance_m <= a.room_m && !a.hidden) {
          a.severity = std::min(a.severity, Severity::note);
        }
        ++too_fast;
        fastest_entry = std::max(fastest_entry, a.entry_speed_mps);
        slowest_safe = std::min(slowest_safe, a.safe_speed_mps);
        worst_braking = std::max(worst_braking, a.braking_distance_m);
      }
      if (a.hidden) ++hidden_count;
      if (a.hidden && a.too_fast) a.severity = raise(a.severity, 1);
      worst = std::max(worst, a.severity);
      if (a.too_fast || a.hidden) h.classes.push_back(a);
    }
    h.hidden = hidden_count > 0;
    double approach = 0.0;
    for (std::size_t c = 0; c < classes.size(); ++c) approach = std::max(approach, speeds[c].unbraked_speed_mps[entry]);
    h.peak_speed_mps = approach;

    const std::string shape = std::string(corner.hairpin ? "hairpin " : "") +
                              turn_direction_name(corner.direction) + " " +
                              (corner.hairpin ? "" : "bend ") + "of " + deg(corner.deflection_rad) +
                              ", path radius " + fmt_fixed(radius_m, 0) + " m";
    if (too_fast > 0) {
      h.kind = HazardKind::corner_too_fast;
      h.severity = worst;
      h.reason = "Sharp " + shape + (after_descent ? " at the bottom of a descent" : "") + ": " +
                 std::to_string(too_fast) + " of " + std::to_string(classes.size()) +
                 " classes arrive too fast (up to " + kmh(fastest_entry) + " against a safe " +
                 kmh(slowest_safe) + ")" +
                 (std::isfinite(worst_braking) ? "; braking needs up to " + fmt_fixed(worst_braking, 0) + " m " : "; on this gradient comfortable braking cannot slow every class down, ") +
                 (corner.straight_before_m > 1000.0
                      ? std::string("on a long straight approach")
                      : "with " + fmt_fixed(corner.straight_before_m, 0) + " m of straight before it") +
                 (h.hidden ? "; hidden until late" : "") + ".";
    } else if (h.hidden) {
      h.kind = HazardKind::hidden_corner;
      h.severity = (after_descent || corner.hairpin) ? Severity::serious : Severity::caution;
      h.reason = "A crest or the hillside hides this " + shape + " until riders are closer than "
                 "their stopping distance (" + std::to_string(hidden_count) + " of " +
                 std::to_string(classes.size()) + " classes).";
    } else if (after_descent) {
      h.kind = HazardKind::turn_after_descent;
      h.severity = Severity::caution;
      h.reason = "Sharp " + shape + " at the bottom of a descent (" +
                 fmt_fixed(descent_grade * 100.0, 1) + " % over the last " +
                 fmt_fixed(opt.descent_lookback_m, 0) + " m): a classic crash site even at "
                 "predicted speeds.";
    } else {
      continue;
    }
    if (after_descent && h.kind == HazardKind::corner_too_fast) h.severity = std::max(h.severity, Severity::caution);
    h.marshals = marshals_for(h.severity, h.hidden, opt.severity);
    if (h.kind == HazardKind::turn_after_descent) h.marshals = std::max(h.marshals, 1);
    h.sign = warning_sign_siting(approach);
    const Station& s = (*in.stations)[std::min(corner.apex_station, in.stations->size() - 1)];
    h.lon_deg = s.lon_deg;
    h.lat_deg = s.lat_deg;
    out.push_back(std::move(h));
  }
  return out;
}

struct Range {
  std::size_t from, to;  // station indices, inclusive
};

// Runs of stations where `flag` holds, at least `min_length_m` long.
std::vector<Range> runs(const std::vector<double>& d, const std::vector<char>& flag, double min_length_m) {
  std::vector<Range> out;
  std::size_t i = 0;
  while (i < flag.size()) {
    if (!flag[i]) {
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j + 1 < flag.size() && flag[j + 1]) ++j;
    if (d[j] - d[i] >= min_length_m) out.push_back({i, j});
    i = j + 1;
  }
  return out;
}

std::vector<Hazard> fast_sections(const HazardInputs& in, const HazardOptions& opt) {
  const auto& d = in.profile->distance_m;
  const auto& speeds = *in.speeds;
  std::vector<char> fast(d.size(), 0);
  for (const auto& sp : speeds)
    for (std::size_t i = 0; i < d.size(); ++i)
      if (sp.planned_speed_mps[i] > opt.fast_speed_mps) fast[i] = 1;
  std::vector<Hazard> out;
  for (const Range& r : runs(d, fast, opt.fast_min_length_m)) {
    Hazard h;
    h.kind = HazardKind::fast_section;
    h.at_m = d[r.from];
    h.end_m = d[r.to];
    for (std::size_t c = 0; c < speeds.size(); ++c) {
      double peak = 0.0;
      for (std::size_t i = r.from; i <= r.to; ++i) peak = std::max(peak, speeds[c].planned_speed_mps[i]);
      if (peak > opt.fast_speed_mps) h.section_classes.push_back((*in.classes)[c].name);
      h.peak_speed_mps = std::max(h.peak_speed_mps, peak);
    }
    h.severity = h.peak_speed_mps >= opt.fast_speed_mps + opt.fast_serious_margin_mps ? Severity::serious
                                                                                       : Severity::caution;
    h.marshals = marshals_for(h.severity, false, opt.severity);
    h.sign = warning_sign_siting(speeds.empty() ? 0.0 : h.peak_speed_mps);
    h.reason = std::to_string(h.section_classes.size()) + " of " + std::to_string(speeds.size()) +
               " classes ride faster than " + kmh(opt.fast_speed_mps) + " for " +
               fmt_fixed(h.end_m - h.at_m, 0) + " m (up to " + kmh(h.peak_speed_mps) +
               "): a fall here is at high speed.";
    const Station& s = (*in.stations)[r.from];
    h.lon_deg = s.lon_deg;
    h.lat_deg = s.lat_deg;
    out.push_back(std::move(h));
  }
  return out;
}

std::vector<Hazard> steep_descents(const HazardInputs& in, const HazardOptions& opt) {
  const Profile& p = *in.profile;
  const auto& d = p.distance_m;
  const std::size_t n = d.size();
  std::vector<char> steep(n, 0);
  std::vector<double> window_pct(n, 0.0);
  std::size_t j = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double target = d[i] + opt.steep_window_m;
    if (target > d.back()) break;
    while (j + 1 < n && d[j] < target) ++j;
    const double g = (p.elevation_m[j] - p.elevation_m[i]) / (d[j] - d[i]) * 100.0;
    window_pct[i] = g;
    if (g <= opt.steep_descent_pct) std::fill(steep.begin() + static_cast<long>(i), steep.begin() + static_cast<long>(j) + 1, 1);
  }
  std::vector<Hazard> out;
  for (Range r : runs(d, steep, opt.steep_window_m - 1e-6)) {
    // A steep window may reach onto level road at either end: trim the stretch to where the road
    // itself falls at least half as steeply as the threshold (station to station).
    auto step_pct = [&](std::size_t i) { return (p.elevation_m[i + 1] - p.elevation_m[i]) / (d[i + 1] - d[i]) * 100.0; };
    while (r.from < r.to && step_pct(r.from) > 0.5 * opt.steep_descent_pct) ++r.from;
    while (r.to > r.from && step_pct(r.to - 1) > 0.5 * opt.steep_descent_pct) --r.to;
    Hazard h;
    h.kind = HazardKind::steep_descent;
    h.at_m = d[r.from];
    h.end_m = d[r.to];
    for (std::size_t i = r.from; i <= r.to; ++i) h.steepest_pct = std::min(h.steepest_pct, window_pct[i]);
    h.severity = h.steepest_pct <= opt.steep_serious_pct ? Severity::serious : Severity::caution;
    for (const auto& sp : *in.speeds)
      for (std::size_t i = r.from; i <= r.to; ++i) h.peak_speed_mps = std::max(h.peak_speed_mps, sp.planned_speed_mps[i]);
    h.marshals = marshals_for(h.severity, false, opt.severity);
    h.sign = warning_sign_siting(h.peak_speed_mps);
    h.reason = "Descent of " + fmt_fixed((h.end_m - h.at_m) / 1000.0, 1) + " km, steepest " +
               fmt_fixed(h.steepest_pct, 1) + " % over " + fmt_fixed(opt.steep_window_m, 0) +
               " m: brakes heat and speeds build; warn riders before the top.";
    const Station& s = (*in.stations)[r.from];
    h.lon_deg = s.lon_deg;
    h.lat_deg = s.lat_deg;
    out.push_back(std::move(h));
  }
  return out;
}

}  // namespace

const char* hazard_kind_key(HazardKind kind) {
  switch (kind) {
    case HazardKind::corner_too_fast: return "corner-too-fast";
    case HazardKind::hidden_corner: return "hidden-corner";
    case HazardKind::turn_after_descent: return "turn-after-descent";
    case HazardKind::fast_section: return "fast-section";
    case HazardKind::steep_descent: return "steep-descent";
  }
  return "unknown";
}

const char* hazard_kind_label(HazardKind kind) {
  switch (kind) {
    case HazardKind::corner_too_fast: return "Corner reached too fast";
    case HazardKind::hidden_corner: return "Corner hidden from view";
    case HazardKind::turn_after_descent: return "Sharp turn after a descent";
    case HazardKind::fast_section: return "Fast section";
    case HazardKind::steep_descent: return "Steep descent";
  }
  return "Unknown";
}

bool is_junction_type_turn(const Corner& corner, const HazardOptions& options) {
  return corner.deflection_rad >= options.sharp_turn_rad && corner.turn_radius_m <= options.sharp_turn_max_radius_m;
}

double grip_friction(const HazardOptions& options, bool wet) {
  return wet ? options.grip_friction_wet : options.grip_friction_dry;
}

double class_safe_speed_mps(const RiderClass& rider, double path_radius_m, bool wet,
                            const HazardOptions& options) {
  return safe_corner_speed_mps(path_radius_m, lean_comfort_rad(rider, wet),
                               grip_friction(options, wet), options.superelevation);
}

bool corner_hidden_for(const std::vector<double>& d, const std::vector<double>& needed_m,
                       double entry_m, double visible_m) {
  // Rider positions p before the entry from which the entry is out of view: p < entry - visible.
  // Such a position matters when the entry lies within its stopping sight distance.
  const std::size_t e = index_at(d, entry_m);
  for (std::size_t i = e; i-- > 0;) {
    const double gap_m = entry_m - d[i];
    if (gap_m <= visible_m) continue;
    if (gap_m <= needed_m[i]) return true;
    if (gap_m > visible_m + 1000.0) break;  // far beyond any stopping distance
  }
  return false;
}

std::vector<double> needed_sight_m(const SpeedProfile& speed, const Profile& profile, bool wet,
                                   const HazardOptions& options) {
  std::vector<double> out(profile.distance_m.size());
  const double f = wet ? options.sight_friction_wet : options.sight_friction_dry;
  for (std::size_t i = 0; i < out.size(); ++i) {
    // A rider who has not seen the corner has not slowed for it: the unbraked speed.
    out[i] = stopping_sight_distance_m(speed.unbraked_speed_mps[i], profile.grade[i], f,
                                       options.sight_reaction_time_s);
    if (!std::isfinite(out[i])) out[i] = options.max_look_m;
  }
  return out;
}

std::vector<Hazard> find_hazards(const HazardInputs& in, const HazardOptions& options) {
  if (!in.stations || !in.profile || !in.corners || !in.path_radius_m || !in.classes || !in.speeds) {
    fail("", "hazards", "internal: missing inputs");
  }
  if (in.path_radius_m->size() != in.corners->size() || in.speeds->size() != in.classes->size() ||
      (in.corner_visible_m && in.corner_visible_m->size() != in.corners->size())) {
    fail("", "hazards", "internal: inputs of different lengths");
  }
  std::vector<Hazard> all = corner_hazards(in, options);
  for (auto& h : fast_sections(in, options)) all.push_back(std::move(h));
  for (auto& h : steep_descents(in, options)) all.push_back(std::move(h));
  std::stable_sort(all.begin(), all.end(), [](const Hazard& a, const Hazard& b) { return a.at_m < b.at_m; });
  int number = 1;
  const auto& d = in.profile->distance_m;
  for (auto& h : all) {
    h.number = number++;
    h.sign_at_m = std::max(0.0, h.at_m - h.sign.distance_m);
    const Station& s = (*in.stations)[index_at(d, h.sign_at_m)];
    h.sign_lon_deg = s.lon_deg;
    h.sign_lat_deg = s.lat_deg;
  }
  return all;
}

}  // namespace coursewarden
