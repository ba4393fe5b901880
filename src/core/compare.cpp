// Comparing checked courses by their hazards.
#include "coursewarden/compare.hpp"

#include <algorithm>
#include <cmath>

namespace coursewarden {

SeverityCounts count_by_severity(const std::vector<Hazard>& hazards) {
  SeverityCounts c{0, 0, 0, 0};
  for (const auto& h : hazards) {
    switch (h.severity) {
      case Severity::note: ++c[0]; break;
      case Severity::caution: ++c[1]; break;
      case Severity::serious: ++c[2]; break;
      case Severity::critical: ++c[3]; break;
      case Severity::none: break;
    }
  }
  return c;
}

double hazard_score(const SeverityCounts& c) { return c[0] * 1.0 + c[1] * 3.0 + c[2] * 10.0 + c[3] * 30.0; }

bool reverse_markedly_safer(const SeverityCounts& forward, const SeverityCounts& reverse) {
  const int f = forward[2] + forward[3], r = reverse[2] + reverse[3];
  return f - r >= 2 && 2 * r <= f;
}

Comparison compare_courses(const CheckResult& a, const CheckResult& b) {
  const SeverityCounts ca = count_by_severity(a.hazards), cb = count_by_severity(b.hazards);
  Comparison out;
  out.score_a = hazard_score(ca);
  out.score_b = hazard_score(cb);
  const double gap = std::abs(out.score_a - out.score_b);
  if (gap < std::max(0.1 * std::max(out.score_a, out.score_b), 10.0)) {
    out.safer = -1;
    out.why = "No clear difference: hazard scores " + std::to_string(static_cast<int>(out.score_a)) + " and " +
              std::to_string(static_cast<int>(out.score_b)) + ".";
    return out;
  }
  out.safer = out.score_a < out.score_b ? 0 : 1;
  const SeverityCounts& s = out.safer == 0 ? ca : cb;
  const SeverityCounts& o = out.safer == 0 ? cb : ca;
  std::string why;
  const char* names[4] = {"note", "caution", "serious", "critical"};
  for (int k = 3; k >= 0; --k) {
    if (o[k] == s[k]) continue;
    const int d = o[k] - s[k];
    why += std::string(why.empty() ? "" : ", ") + std::to_string(std::abs(d)) + (d > 0 ? " fewer " : " more ") +
           names[k] + " hazard" + (std::abs(d) == 1 ? "" : "s");
  }
  out.why = why + " (hazard score " + std::to_string(static_cast<int>(std::min(out.score_a, out.score_b))) +
            " against " + std::to_string(static_cast<int>(std::max(out.score_a, out.score_b))) + ").";
  return out;
}

}  // namespace coursewarden
