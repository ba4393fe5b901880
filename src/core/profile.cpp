// The cleaned elevation profile: gap bridging, artefact repair, smoothing, gradients, totals.
#include <algorithm>
#include <cmath>
#include <numeric>
#include <string>

#include "coursewarden/error.hpp"
#include "coursewarden/profile.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

std::string km(double m) { return fmt_fixed(m / 1000.0, 2); }

// Replaces samples strictly between indices a and b by a straight line between them.
void interpolate_between(const std::vector<double>& d, std::vector<double>& e, std::size_t a,
                         std::size_t b) {
  for (std::size_t k = a + 1; k < b; ++k) {
    const double t = (d[k] - d[a]) / (d[b] - d[a]);
    e[k] = e[a] + t * (e[b] - e[a]);
  }
}

void bridge_gaps(const std::vector<double>& d, std::vector<double>& e,
                 const ProfileOptions& options, const std::string& source,
                 std::vector<Repair>& repairs) {
  const std::size_t n = e.size();
  std::size_t i = 0;
  while (i < n) {
    if (!std::isnan(e[i])) {
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j < n && std::isnan(e[j])) ++j;  // [i, j) is a run without data
    const double from_m = i == 0 ? d[0] : d[i - 1];
    const double to_m = j == n ? d[n - 1] : d[j];
    if (to_m - from_m > options.max_gap_m) {
      fail(source, "km " + km(from_m) + " to " + km(to_m),
           "no DEM heights over " + fmt_fixed(to_m - from_m, 0) + " m, longer than the " +
               fmt_fixed(options.max_gap_m, 0) +
               " m that may be bridged; use a DEM that covers the course or raise --max-gap");
    }
    if (i == 0) {
      for (std::size_t k = 0; k < j; ++k) e[k] = e[j];  // level start until the first height
    } else if (j == n) {
      for (std::size_t k = i; k < n; ++k) e[k] = e[i - 1];
    } else {
      interpolate_between(d, e, i - 1, j);
    }
    repairs.push_back({from_m, to_m, "no DEM data (bridged by interpolation)", 0.0});
    i = j;
  }
}

void repair_artefacts(const std::vector<double>& d, std::vector<double>& e, double pad_m,
                      const ProfileOptions& options, std::vector<Repair>& repairs) {
  const std::size_t n = e.size();
  const double limit = options.max_plausible_grade_pct / 100.0;
  for (int pass = 0; pass < 4; ++pass) {
    bool changed = false;
    std::size_t i = 0;
    while (i + 1 < n) {
      auto step_grade = [&](std::size_t k) { return (e[k + 1] - e[k]) / (d[k + 1] - d[k]); };
      if (std::abs(step_grade(i)) <= limit) {
        ++i;
        continue;
      }
      // A cluster of implausible steps: join those closer than repair_join_m.
      std::size_t last = i;
      double worst = std::abs(step_grade(i));
      for (std::size_t k = i + 1; k + 1 < n && d[k] - d[last + 1] <= options.repair_join_m; ++k) {
        if (std::abs(step_grade(k)) > limit) {
          last = k;
          worst = std::max(worst, std::abs(step_grade(k)));
        }
      }
      // Anchor the straight line a little outside the cluster, on ground the artefact has not
      // pulled down or up (one DEM pixel or one station, whichever is longer).
      std::size_t a = i, b = last + 1;
      while (a > 0 && d[i] - d[a] < pad_m) --a;
      while (b + 1 < n && d[b] - d[last + 1] < pad_m) ++b;
      interpolate_between(d, e, a, b);
      repairs.push_back({d[a], d[b], "implausible gradient (bridge, tunnel or DEM artefact)",
                         worst * 100.0});
      changed = true;
      i = b;
    }
    if (!changed) break;
  }
}

}  // namespace

std::vector<double> smooth_gaussian(const std::vector<double>& values, double spacing_m,
                                    double sigma_m) {
  const std::size_t n = values.size();
  if (!(sigma_m > 0) || n < 3) return values;
  const double sigma_steps = sigma_m / spacing_m;
  const auto half = static_cast<long>(std::ceil(3.0 * sigma_steps));
  std::vector<double> kernel(static_cast<std::size_t>(2 * half + 1));
  for (long k = -half; k <= half; ++k) {
    kernel[static_cast<std::size_t>(k + half)] =
        std::exp(-0.5 * (static_cast<double>(k) / sigma_steps) * (static_cast<double>(k) / sigma_steps));
  }
  const double total = std::accumulate(kernel.begin(), kernel.end(), 0.0);
  for (double& w : kernel) w /= total;
  const long last = static_cast<long>(n) - 1;
  // Odd (point) reflection about the end samples: f(-k) = 2 f(0) - f(k). It keeps straight lines
  // straight, so a uniform slope has the same gradient at the ends as in the middle.
  auto at = [&](long k) {
    if (k < 0) {
      const long m = std::min(-k, last);
      return 2.0 * values[0] - values[static_cast<std::size_t>(m)];
    }
    if (k > last) {
      const long m = std::max(2 * last - k, 0L);
      return 2.0 * values[static_cast<std::size_t>(last)] - values[static_cast<std::size_t>(m)];
    }
    return values[static_cast<std::size_t>(k)];
  };
  std::vector<double> out(n);
  for (long i = 0; i <= last; ++i) {
    double acc = 0.0;
    for (long k = -half; k <= half; ++k) acc += kernel[static_cast<std::size_t>(k + half)] * at(i + k);
    out[static_cast<std::size_t>(i)] = acc;
  }
  return out;
}

SustainedGrade steepest_over(const std::vector<double>& d, const std::vector<double>& e,
                             double window_m) {
  SustainedGrade s;
  s.window_m = window_m;
  const std::size_t n = d.size();
  if (n < 2) return s;
  const double length = d.back() - d.front();
  const double w = std::min(window_m, length);
  if (!(w > 0)) return s;
  // Two pointers: for each start i, the height at i + w interpolated between stations.
  std::size_t j = 0;
  for (std::size_t i = 0; i < n && d[i] + w <= d.back() + 1e-9; ++i) {
    const double target = d[i] + w;
    while (j + 1 < n && d[j + 1] < target) ++j;
    const std::size_t k = std::min(j + 1, n - 1);
    const double t = d[k] > d[j] ? std::clamp((target - d[j]) / (d[k] - d[j]), 0.0, 1.0) : 0.0;
    const double end_e = e[j] + t * (e[k] - e[j]);
    const double g = (end_e - e[i]) / w * 100.0;
    if (g > s.climb_pct) {
      s.climb_pct = g;
      s.climb_at_m = d[i];
    }
    if (g < s.descent_pct) {
      s.descent_pct = g;
      s.descent_at_m = d[i];
    }
  }
  return s;
}

Profile build_profile(const std::vector<Station>& stations, const std::vector<double>& raw_m,
                      double resolution_m, const ProfileOptions& options,
                      const std::string& source) {
  if (stations.size() != raw_m.size() || stations.size() < 2) {
    fail(source, "", "internal: profile needs one height per station and at least two stations");
  }
  Profile p;
  p.distance_m.reserve(stations.size());
  for (const auto& s : stations) p.distance_m.push_back(s.distance_m);
  p.raw_elevation_m = raw_m;
  const auto valid = std::count_if(raw_m.begin(), raw_m.end(), [](double v) { return !std::isnan(v); });
  p.coverage_pct = 100.0 * static_cast<double>(valid) / static_cast<double>(raw_m.size());
  if (valid == 0) fail(source, "", "no height at any point of the course");

  const auto& d = p.distance_m;
  std::vector<double> e = raw_m;
  bridge_gaps(d, e, options, source, p.repairs);
  const double spacing_m = (d.back() - d.front()) / static_cast<double>(d.size() - 1);
  repair_artefacts(d, e, std::max(spacing_m, resolution_m), options, p.repairs);
  std::sort(p.repairs.begin(), p.repairs.end(),
            [](const Repair& a, const Repair& b) { return a.start_m < b.start_m; });

  p.smoothing_sigma_m = std::isnan(options.smoothing_sigma_m)
                            ? std::max(2.0 * spacing_m, resolution_m)
                            : options.smoothing_sigma_m;
  // Stations are uniform except the last step, which may be shorter: smooth on the uniform grid.
  p.elevation_m = smooth_gaussian(e, spacing_m, p.smoothing_sigma_m);

  const std::size_t n = d.size();
  p.grade.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t lo = i == 0 ? 0 : i - 1;
    const std::size_t hi = std::min(i + 1, n - 1);
    p.grade[i] = (p.elevation_m[hi] - p.elevation_m[lo]) / (d[hi] - d[lo]);
  }

  ProfileTotals& t = p.totals;
  t.length_m = d.back() - d.front();
  for (std::size_t i = 1; i < n; ++i) {
    const double dh = p.elevation_m[i] - p.elevation_m[i - 1];
    (dh > 0 ? t.ascent_m : t.descent_m) += std::abs(dh);
  }
  const auto [lo, hi] = std::minmax_element(p.elevation_m.begin(), p.elevation_m.end());
  t.min_elevation_m = *lo;
  t.max_elevation_m = *hi;
  t.max_elevation_at_m = d[static_cast<std::size_t>(hi - p.elevation_m.begin())];
  for (double w : {100.0, 500.0, 1000.0}) t.sustained.push_back(steepest_over(d, p.elevation_m, w));
  return p;
}

}  // namespace coursewarden
