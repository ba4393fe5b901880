// Climb detection with hysteresis and categorisation by a configurable score scale.
#include <algorithm>
#include <cmath>

#include "coursewarden/profile.hpp"

namespace coursewarden {
namespace {

struct Extreme {
  std::size_t index;
  bool is_max;
};

// Alternating minima and maxima such that every swing between neighbours is at least
// `hysteresis_m` high: a dip shallower than that stays inside the climb around it.
std::vector<Extreme> turning_points(const std::vector<double>& e, double hysteresis_m) {
  std::vector<Extreme> out;
  if (e.empty()) return out;
  std::size_t lo = 0, hi = 0;
  int trend = 0;  // +1 rising, -1 falling, 0 not yet known
  for (std::size_t i = 1; i < e.size(); ++i) {
    if (trend >= 0) {
      if (e[i] > e[hi]) hi = i;
    }
    if (trend <= 0) {
      if (e[i] < e[lo]) lo = i;
    }
    if (trend == 0) {
      if (e[i] - e[lo] >= hysteresis_m) {
        out.push_back({lo, false});
        trend = +1;
        hi = i;
      } else if (e[hi] - e[i] >= hysteresis_m) {
        out.push_back({hi, true});
        trend = -1;
        lo = i;
      }
    } else if (trend > 0 && e[hi] - e[i] >= hysteresis_m) {
      out.push_back({hi, true});
      trend = -1;
      lo = i;
    } else if (trend < 0 && e[i] - e[lo] >= hysteresis_m) {
      out.push_back({lo, false});
      trend = +1;
      hi = i;
    }
  }
  if (trend > 0) out.push_back({hi, true});
  if (trend < 0) out.push_back({lo, false});
  return out;
}

}  // namespace

std::string climb_category(double score, const CategoryScale& s) {
  if (score >= s.hc_min) return "HC";
  if (score >= s.cat1_min) return "1";
  if (score >= s.cat2_min) return "2";
  if (score >= s.cat3_min) return "3";
  if (score >= s.cat4_min) return "4";
  return "";
}

std::vector<Climb> find_climbs(const std::vector<double>& d, const std::vector<double>& e,
                               const ClimbOptions& options) {
  std::vector<Climb> climbs;
  const auto tp = turning_points(e, options.hysteresis_m);
  for (std::size_t k = 0; k + 1 < tp.size(); ++k) {
    if (tp[k].is_max || !tp[k + 1].is_max) continue;
    std::size_t a = tp[k].index, b = tp[k + 1].index;
    // Trim flat approaches and flat tops: the ends move inwards while the road there rises less
    // than a quarter of the whole swing's mean gradient (and at least less than 1 %), so a climb
    // starts where the road starts to climb in earnest.
    const double swing_grade = (e[b] - e[a]) / std::max(d[b] - d[a], 1e-9);
    const double flat = std::max(0.01, 0.25 * swing_grade);
    auto step_grade = [&](std::size_t i) { return (e[i + 1] - e[i]) / std::max(d[i + 1] - d[i], 1e-9); };
    while (a < b && step_grade(a) < flat) ++a;
    while (b > a && step_grade(b - 1) < flat) --b;
    if (b <= a) continue;
    Climb c;
    c.start_m = d[a];
    c.end_m = d[b];
    c.gain_m = e[b] - e[a];
    const double length_m = c.end_m - c.start_m;
    if (length_m < options.min_length_m || c.gain_m < options.min_gain_m) continue;
    c.mean_grade_pct = c.gain_m / length_m * 100.0;
    if (c.mean_grade_pct < options.min_mean_grade_pct) continue;
    const std::vector<double> sub_d(d.begin() + static_cast<long>(a), d.begin() + static_cast<long>(b) + 1);
    const std::vector<double> sub_e(e.begin() + static_cast<long>(a), e.begin() + static_cast<long>(b) + 1);
    c.max_grade_100m_pct = steepest_over(sub_d, sub_e, 100.0).climb_pct;
    c.score = c.mean_grade_pct * c.mean_grade_pct * (length_m / 1000.0);
    c.category = climb_category(c.score, options.scale);
    climbs.push_back(c);
  }
  return climbs;
}

}  // namespace coursewarden
