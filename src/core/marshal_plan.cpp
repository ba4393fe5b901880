// The marshal plan: candidates at hazards and junction-type turns, merged into numbered posts
// with shift times, totals and briefing sectors (docs/operations.md).
#include "coursewarden/marshal_plan.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <string>
#include <utility>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr double kRadToDeg = 180.0 / std::numbers::pi;
// Longest warning line before further parts are only counted ("+2 more").
constexpr std::size_t kWarnMaxChars = 90;

std::string deg(double rad) { return fmt_fixed(rad * kRadToDeg, 0) + " deg"; }

std::string corner_shape(const Corner& c) {
  return std::string(turn_direction_name(c.direction)) + (c.hairpin ? " hairpin " : " ") + deg(c.deflection_rad);
}

std::string hazard_warn(const Hazard& h, const CheckResult& r) {
  std::string what = hazard_kind_label(h.kind);
  if (h.corner && *h.corner < r.corners.size()) {
    what += ": " + corner_shape(r.corners[*h.corner]);
  } else if (h.kind == HazardKind::fast_section) {
    what += ": up to " + fmt_fixed(h.peak_speed_mps * 3.6, 0) + " km/h over " + fmt_fixed(h.end_m - h.at_m, 0) + " m";
  } else if (h.kind == HazardKind::steep_descent) {
    what += ": " + fmt_fixed(h.steepest_pct, 1) + " %, " + fmt_fixed((h.end_m - h.at_m) / 1000.0, 1) + " km long";
  }
  return what + " (" + std::string(severity_name(h.severity)) + ")";
}

std::string post_code(std::size_t number, std::size_t count) {
  std::string digits = std::to_string(number);
  const std::size_t width = std::max<std::size_t>(2, std::to_string(count).size());
  if (digits.size() < width) digits.insert(0, width - digits.size(), '0');
  return "M" + digits;
}

// The members' warnings: hazards most severe first (each text once), then the turns as one part.
std::string merged_warn(const std::vector<const PostCandidate*>& members) {
  std::vector<const PostCandidate*> hazards;
  std::vector<std::ptrdiff_t> hazard_corners;
  for (const PostCandidate* m : members) {
    if (m->turn) continue;
    hazards.push_back(m);
    if (m->corner >= 0) hazard_corners.push_back(m->corner);
  }
  std::stable_sort(hazards.begin(), hazards.end(), [](const PostCandidate* a, const PostCandidate* b) {
    return a->severity > b->severity;
  });
  std::vector<std::string> parts;
  for (const PostCandidate* m : hazards)
    if (std::find(parts.begin(), parts.end(), m->warn) == parts.end()) parts.push_back(m->warn);
  std::vector<const PostCandidate*> turns;
  bool direct = false;
  for (const PostCandidate* m : members) {
    if (!m->turn) continue;
    direct = true;
    if (std::find(hazard_corners.begin(), hazard_corners.end(), m->corner) == hazard_corners.end()) turns.push_back(m);
  }
  if (!turns.empty()) {
    std::string t = "turn " + turns.front()->turn_shape;
    for (std::size_t k = 1; k < turns.size(); ++k) t += ", then " + turns[k]->turn_shape;
    parts.push_back(t + ": direct riders");
  } else if (direct) {
    parts.push_back("direct riders");
  }
  std::string out;
  std::size_t used = 0;
  for (; used < parts.size(); ++used) {
    const std::string next = out.empty() ? parts[used] : out + "; " + parts[used];
    if (!out.empty() && next.size() > kWarnMaxChars) break;
    out = next;
  }
  if (used < parts.size()) out += "; +" + std::to_string(parts.size() - used) + " more";
  if (!out.empty() && out[0] >= 'a' && out[0] <= 'z') out[0] = static_cast<char>(out[0] - 'a' + 'A');
  return out;
}

MarshalPost make_post(const std::vector<const PostCandidate*>& members, const OperationsRules& rules) {
  MarshalPost p;
  const PostCandidate* main = members.front();
  for (const PostCandidate* m : members) {
    if (m->count > main->count) main = m;
    if (m->hazard_number > 0) p.hazards.push_back(m->hazard_number);
    if (m->turn && m->corner >= 0) p.turns.push_back(static_cast<std::size_t>(m->corner));
  }
  p.at_m = main->at_m;
  p.lon_deg = main->lon_deg;
  p.lat_deg = main->lat_deg;
  p.first_m = members.front()->at_m;
  p.last_m = members.back()->at_m;
  p.spread_m = p.last_m - p.first_m;
  p.count = main->count + (p.spread_m > rules.merged_post_extra_from_m ? 1 : 0);
  p.warn = merged_warn(members);
  return p;
}

}  // namespace

std::vector<PostCandidate> post_candidates(const CheckResult& r, const EventOps& ops) {
  std::vector<PostCandidate> out;
  for (const Hazard& h : r.hazards) {
    if (h.marshals <= 0) continue;
    PostCandidate c;
    c.at_m = h.at_m;
    c.count = h.marshals;
    c.hazard_number = h.number;
    c.corner = h.corner ? static_cast<std::ptrdiff_t>(*h.corner) : -1;
    c.severity = h.severity;
    c.warn = hazard_warn(h, r);
    c.lon_deg = h.lon_deg;
    c.lat_deg = h.lat_deg;
    out.push_back(std::move(c));
  }
  if (ops.rules.marshals_per_turn > 0) {
    const auto& stations = r.analysis.stations;
    for (std::size_t k = 0; k < r.corners.size(); ++k) {
      const Corner& corner = r.corners[k];
      if (!is_junction_type_turn(corner, r.hazard_options)) continue;
      PostCandidate c;
      c.at_m = corner.entry_m;
      c.count = ops.rules.marshals_per_turn;
      c.corner = static_cast<std::ptrdiff_t>(k);
      c.turn = true;
      c.turn_shape = corner_shape(corner);
      c.warn = "Turn " + c.turn_shape + ": direct riders";
      if (!stations.empty()) {
        const Station& s = stations[std::min(corner.apex_station, stations.size() - 1)];
        c.lon_deg = s.lon_deg;
        c.lat_deg = s.lat_deg;
      }
      out.push_back(std::move(c));
    }
  }
  std::stable_sort(out.begin(), out.end(),
                   [](const PostCandidate& a, const PostCandidate& b) { return a.at_m < b.at_m; });
  return out;
}

std::vector<MarshalPost> merge_candidates(const std::vector<PostCandidate>& candidates,
                                          const OperationsRules& rules) {
  std::vector<MarshalPost> posts;
  std::vector<const PostCandidate*> group;
  for (std::size_t k = 0; k < candidates.size(); ++k) {
    const PostCandidate& c = candidates[k];
    if (k > 0 && c.at_m < candidates[k - 1].at_m) {
      throw Error("marshal plan: post candidates must be in course order");
    }
    if (!group.empty() && c.at_m - group.front()->at_m >= rules.merge_posts_within_m) {
      posts.push_back(make_post(group, rules));
      group.clear();
    }
    group.push_back(&c);
  }
  if (!group.empty()) posts.push_back(make_post(group, rules));
  return posts;
}

Peak peak_overlap(const std::vector<double>& on_s, const std::vector<double>& off_s,
                  const std::vector<int>& weights) {
  if (on_s.size() != off_s.size() || (!weights.empty() && weights.size() != on_s.size())) {
    throw Error("peak_overlap: shift starts, ends and weights differ in number");
  }
  // (time, change); at equal times ends (negative changes) come first: [on, off) shifts.
  std::vector<std::pair<double, int>> events;
  for (std::size_t k = 0; k < on_s.size(); ++k) {
    if (!std::isfinite(on_s[k]) || !std::isfinite(off_s[k]) || off_s[k] < on_s[k]) {
      throw Error("peak_overlap: shift " + std::to_string(k + 1) + " ends before it starts or has no time");
    }
    const int w = weights.empty() ? 1 : weights[k];
    events.emplace_back(on_s[k], w);
    events.emplace_back(off_s[k], -w);
  }
  std::sort(events.begin(), events.end());
  Peak peak;
  peak.at_s = std::numeric_limits<double>::quiet_NaN();
  int open = 0;
  for (const auto& [t, change] : events) {
    open += change;
    if (open > peak.value) {
      peak.value = open;
      peak.at_s = t;
    }
  }
  return peak;
}

MarshalPlan make_marshal_plan(const CheckResult& r, const EventOps& ops, const Schedule& schedule) {
  const OperationsRules& rules = ops.rules;
  MarshalPlan plan;
  plan.posts = merge_candidates(post_candidates(r, ops), rules);
  std::vector<double> on, off;
  std::vector<int> counts;
  for (std::size_t k = 0; k < plan.posts.size(); ++k) {
    MarshalPost& p = plan.posts[k];
    p.code = post_code(k + 1, plan.posts.size());
    // The first rider reaches the post's first member first and the closing vehicle leaves its
    // last member last: both pass times are non-decreasing along the course.
    p.earliest_pass_s = pass_times(r, schedule, p.first_m).earliest_s;
    p.closing_s = pass_times(r, schedule, p.last_m).closing_s;
    p.on_post_s = p.earliest_pass_s - rules.marshal_lead_s;
    p.not_before_s = p.earliest_pass_s - rules.marshal_lead_max_s;
    p.off_post_s = p.closing_s + rules.marshal_release_after_closing_s;
    plan.marshals_needed += p.count;
    on.push_back(p.on_post_s);
    off.push_back(p.off_post_s);
    counts.push_back(p.count);
  }
  plan.peak_posts = peak_overlap(on, off).value;
  const Peak marshals = peak_overlap(on, off, counts);
  plan.peak_marshals = marshals.value;
  plan.peak_at_s = marshals.at_s;

  // Sectors: blocks of sector_length_m from the start; a block with more posts than fit one
  // page is cut between posts, at the midpoint of the gap.
  const double length = schedule.course_length_m;
  std::size_t k = 0;
  while (k < plan.posts.size()) {
    const double block = std::floor(plan.posts[k].at_m / rules.sector_length_m);
    std::size_t end = k;
    while (end < plan.posts.size() && std::floor(plan.posts[end].at_m / rules.sector_length_m) == block) ++end;
    const double block_from = block * rules.sector_length_m;
    const double block_to = std::min(block_from + rules.sector_length_m, std::max(length, block_from));
    for (std::size_t first = k; first < end; first += rules.max_posts_per_sector) {
      const std::size_t last = std::min(first + rules.max_posts_per_sector, end);  // one past
      Sector s;
      s.from_m = first == k ? block_from : plan.sectors.back().to_m;
      s.to_m = last == end ? block_to : 0.5 * (plan.posts[last - 1].at_m + plan.posts[last].at_m);
      s.first_on_post_s = plan.posts[first].on_post_s;
      s.last_off_post_s = plan.posts[first].off_post_s;
      for (std::size_t i = first; i < last; ++i) {
        s.posts.push_back(i);
        s.marshals += plan.posts[i].count;
        s.first_on_post_s = std::min(s.first_on_post_s, plan.posts[i].on_post_s);
        s.last_off_post_s = std::max(s.last_off_post_s, plan.posts[i].off_post_s);
        plan.posts[i].sector = plan.sectors.size();
      }
      s.name = "Sector " + std::to_string(plan.sectors.size() + 1);
      plan.sectors.push_back(std::move(s));
    }
    k = end;
  }
  return plan;
}

}  // namespace coursewarden
