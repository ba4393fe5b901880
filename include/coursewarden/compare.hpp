// coursewarden: comparing two checked courses (two variants, or a course and its reverse).
#pragma once

#include <array>
#include <string>

#include "coursewarden/check.hpp"

namespace coursewarden {

/// Hazards per severity: note, caution, serious, critical.
using SeverityCounts = std::array<int, 4>;

SeverityCounts count_by_severity(const std::vector<Hazard>& hazards);

/// One number for ranking courses by danger: 1 per note, 3 per caution, 10 per serious, 30 per
/// critical hazard (our own weights: each level should outweigh a handful of the level below).
double hazard_score(const SeverityCounts& counts);

struct Comparison {
  int safer = 0;  ///< 0: A, 1: B, -1: no clear difference
  double score_a = 0.0, score_b = 0.0;
  std::string why;  ///< one plain-English line
};

/// Which of two checked courses is safer by hazard score, and why. A difference of less than
/// 10 % of the larger score (and less than one serious hazard) is no clear difference.
Comparison compare_courses(const CheckResult& a, const CheckResult& b);

/// True when the reverse direction has markedly fewer severe (serious + critical) hazards: at
/// least two fewer and at most half as many.
bool reverse_markedly_safer(const SeverityCounts& forward, const SeverityCounts& reverse);

}  // namespace coursewarden
