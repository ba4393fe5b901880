// Sight distance along the course: the crest limit from the road profile and the terrain limit
// from straight 3-D sight lines. Method and limits: docs/hazard-rules.md.
#include "coursewarden/sight.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// Stations closer than this to the look-ahead limit count as within it (rounding of spacings).
constexpr double kLookSlack_m = 1e-9;

std::string km(double m) { return fmt_fixed(m / 1000.0, 3); }

void require_positive(const char* function, const char* name, double value) {
  if (!(std::isfinite(value) && value > 0.0)) {
    fail("", function, std::string(name) + " must be finite and > 0, got " + fmt_fixed(value, 3));
  }
}

void require_distances(const char* function, const std::vector<double>& distance_m) {
  if (distance_m.size() < 2) fail("", function, "needs at least 2 stations");
  for (std::size_t i = 0; i < distance_m.size(); ++i) {
    if (!std::isfinite(distance_m[i]) || (i > 0 && !(distance_m[i] > distance_m[i - 1]))) {
      fail("", std::string(function) + ", station " + std::to_string(i) + " (km " +
                   km(distance_m[i]) + ")",
           "distances along the course must be finite and strictly increasing");
    }
  }
}

void require_finite(const char* function, const char* name, const std::vector<double>& values,
                    const std::vector<double>& distance_m) {
  for (std::size_t i = 0; i < values.size(); ++i) {
    if (!std::isfinite(values[i])) {
      fail("", std::string(function) + ", km " + km(distance_m[i]),
           std::string(name) + " is missing or not finite; repair the profile first");
    }
  }
}

void require_size(const char* function, const char* name, std::size_t size, std::size_t expected) {
  if (size != expected) {
    fail("", function, std::string(name) + " has " + std::to_string(size) + " values for " +
                           std::to_string(expected) + " stations");
  }
}

void require_tuning(const char* function, const TerrainSightTuning& tuning) {
  if (!(std::isfinite(tuning.end_skip_m) && tuning.end_skip_m >= 0.0 &&
        std::isfinite(tuning.terrain_tolerance_m) && tuning.terrain_tolerance_m >= 0.0 &&
        std::isfinite(tuning.verify_step_m) && tuning.verify_step_m >= 0.0)) {
    fail("", function, "end skip, terrain tolerance and verify step must be finite and >= 0 m");
  }
}

// The checks shared by the two terrain scans (distances are checked by the caller first).
void require_scan_inputs(const char* fn, const std::vector<double>& x_m, const std::vector<double>& y_m,
                         const std::vector<double>& elevation_m, const std::vector<double>& d, double eye_height_m,
                         double object_height_m, double max_look_m, double sample_step_m,
                         const TerrainSightTuning& tuning) {
  const std::size_t n = d.size();
  require_size(fn, "x", x_m.size(), n);
  require_size(fn, "y", y_m.size(), n);
  require_size(fn, "elevation", elevation_m.size(), n);
  require_finite(fn, "x", x_m, d);
  require_finite(fn, "y", y_m, d);
  require_finite(fn, "road height", elevation_m, d);
  require_positive(fn, "eye height", eye_height_m);
  require_positive(fn, "look-ahead", max_look_m);
  require_positive(fn, "sample step", sample_step_m);
  if (!(std::isfinite(object_height_m) && object_height_m >= 0.0)) {
    fail("", fn, "object height must be finite and >= 0 m");
  }
  require_tuning(fn, tuning);
}

// Sight value when stations up to `last_visible` are seen: capped by the look-ahead when the
// scan stopped there, by the course end when it ran out of road.
double reach_m(const std::vector<double>& d, std::size_t i, std::size_t last_visible,
               bool whole_look_visible, double max_look_m) {
  if (whole_look_visible) {
    return last_visible + 1 < d.size() ? max_look_m : d.back() - d[i];
  }
  return d[last_visible] - d[i];
}

// Where the ground last rose above a sight line. That ground tends to block the next line too
// (the same hillside), so the sample of the next line nearest to it is tested first; the answer
// does not depend on the order of the samples, only the work does.
struct BlockHint {
  bool valid = false;
  double x_m = 0.0, y_m = 0.0;
};

bool clear_between(const SightPoint& eye, const SightPoint& target, const TerrainHeight& terrain,
                   double sample_step_m, const TerrainSightTuning& tuning, BlockHint& hint) {
  const double dx = target.x_m - eye.x_m;
  const double dy = target.y_m - eye.y_m;
  const double dz = target.z_m - eye.z_m;
  const double length_m = std::hypot(dx, dy);
  const double skip_m = tuning.end_skip_m;
  if (!(length_m > 2.0 * skip_m)) return true;  // nothing left to test between the ends
  // Even spacing no wider than the step; samples closer than skip_m to either end are left out.
  const auto intervals = static_cast<std::size_t>(std::ceil(length_m / sample_step_m));
  const double du = 1.0 / static_cast<double>(intervals);
  const double u_min = skip_m / length_m;
  const double u_max = 1.0 - u_min;
  auto blocked_at = [&](std::size_t k) {
    const double u = static_cast<double>(k) * du;
    if (u < u_min || u > u_max) return false;
    const double ground_m = terrain(eye.x_m + u * dx, eye.y_m + u * dy);
    if (!(ground_m > eye.z_m + u * dz + tuning.terrain_tolerance_m)) return false;  // NaN: false
    hint = {true, eye.x_m + u * dx, eye.y_m + u * dy};
    return true;
  };
  std::size_t first = 0;  // sample tested first (0 = none)
  if (hint.valid && intervals > 1) {
    const double u = ((hint.x_m - eye.x_m) * dx + (hint.y_m - eye.y_m) * dy) / (length_m * length_m);
    if (u > 0.0 && u < 1.0) {
      first = std::clamp<std::size_t>(
          static_cast<std::size_t>(std::llround(u * static_cast<double>(intervals))), 1,
          intervals - 1);
      if (blocked_at(first)) return false;
    }
  }
  for (std::size_t k = 1; k < intervals; ++k) {
    if (k != first && blocked_at(k)) return false;
  }
  return true;
}

}  // namespace

std::vector<double> crest_sight_distance_m(const std::vector<double>& d,
                                           const std::vector<double>& z, double eye_height_m,
                                           double object_height_m, double max_look_m) {
  const char* fn = "crest sight distance";
  require_distances(fn, d);
  require_size(fn, "elevation", z.size(), d.size());
  require_finite(fn, "road height", z, d);
  require_positive(fn, "eye height", eye_height_m);
  require_positive(fn, "look-ahead", max_look_m);
  if (!(std::isfinite(object_height_m) && object_height_m >= 0.0)) {
    fail("", fn, "object height must be finite and >= 0 m");
  }
  const std::size_t n = d.size();
  std::vector<double> out(n);
  for (std::size_t i = 0; i < n; ++i) {
    const double eye_z = z[i] + eye_height_m;
    // Steepest sight line so far from the eye to a road point, kept as rise/run (run > 0) so the
    // inner loop compares by multiplication instead of dividing.
    double best_rise = 0.0, best_run = 1.0;
    std::size_t last_visible = i;
    bool whole_look_visible = true;
    for (std::size_t j = i + 1; j < n; ++j) {
      const double run = d[j] - d[i];
      if (run > max_look_m + kLookSlack_m) break;
      const double target_rise = z[j] + object_height_m - eye_z;
      if (j > i + 1 && target_rise * best_run < best_rise * run) {
        whole_look_visible = false;  // a road point in between rises above the line
        break;
      }
      last_visible = j;
      const double road_rise = z[j] - eye_z;
      if (j == i + 1 || road_rise * best_run > best_rise * run) {
        best_rise = road_rise;
        best_run = run;
      }
    }
    out[i] = i + 1 == n ? 0.0 : reach_m(d, i, last_visible, whole_look_visible, max_look_m);
  }
  return out;
}

bool line_of_sight_clear(const SightPoint& eye, const SightPoint& target,
                         const TerrainHeight& terrain, double sample_step_m,
                         const TerrainSightTuning& tuning) {
  require_positive("line of sight", "sample step", sample_step_m);
  require_tuning("line of sight", tuning);
  if (!terrain) fail("", "line of sight", "no terrain height function given");
  BlockHint hint;
  return clear_between(eye, target, terrain, sample_step_m, tuning, hint);
}

std::vector<double> terrain_sight_distance_m(const std::vector<double>& x_m,
                                             const std::vector<double>& y_m,
                                             const std::vector<double>& elevation_m,
                                             const std::vector<double>& d,
                                             const TerrainHeight& terrain, double eye_height_m,
                                             double object_height_m, double max_look_m,
                                             double sample_step_m,
                                             const TerrainSightTuning& tuning,
                                             std::span<const std::uint8_t> evaluate) {
  const char* fn = "terrain sight distance";
  require_distances(fn, d);
  const std::size_t n = d.size();
  if (!evaluate.empty()) require_size(fn, "evaluate mask", evaluate.size(), n);
  require_scan_inputs(fn, x_m, y_m, elevation_m, d, eye_height_m, object_height_m, max_look_m, sample_step_m,
                      tuning);
  if (!terrain) fail("", fn, "no terrain height function given");

  std::vector<double> out(n, kNaN);
  std::size_t limit = 0;  // last station within the look-ahead of the current one
  std::size_t end = 0;    // last visible station, carried from one evaluated station to the next
  BlockHint hint;         // where the last blocked line was blocked (see clear_between)
  for (std::size_t i = 0; i < n; ++i) {
    if (!evaluate.empty() && evaluate[i] == 0) continue;
    if (i + 1 == n) {
      out[i] = 0.0;
      continue;
    }
    limit = std::max(limit, i + 1);
    while (limit + 1 < n && d[limit + 1] - d[i] <= max_look_m + kLookSlack_m) ++limit;
    if (d[limit] - d[i] > max_look_m + kLookSlack_m) {  // next station already beyond the look
      out[i] = max_look_m;
      end = i + 1;
      continue;
    }
    const SightPoint eye{x_m[i], y_m[i], elevation_m[i] + eye_height_m};
    auto visible = [&](std::size_t j) {
      const SightPoint target{x_m[j], y_m[j], elevation_m[j] + object_height_m};
      return clear_between(eye, target, terrain, sample_step_m, tuning, hint);
    };
    // The end of the view usually moves on by about one station per station. Try one station
    // further first: if it is visible, so (by the one-stretch assumption) is everything before.
    std::size_t j = std::clamp(end, i + 1, limit);
    if (j < limit && visible(j + 1)) {
      ++j;
      while (j < limit && visible(j + 1)) ++j;
    } else if (visible(j)) {
      // the view ends where it ended for the previous station
    } else {
      std::size_t k = j;
      j = i;  // nothing visible unless a nearer station is
      while (k > i + 1) {
        --k;
        if (visible(k)) {
          j = k;
          break;
        }
      }
    }
    // Check the stretch credited to this station every verify_step_m; at the first hidden
    // check, find the end of the view target by target from the last check that passed.
    if (tuning.verify_step_m > 0.0 && j > i + 1) {
      std::size_t last_ok = i;
      double next_check_m = d[i] + tuning.verify_step_m;
      for (std::size_t t = i + 1; t < j; ++t) {
        if (d[t] < next_check_m) continue;
        next_check_m = d[t] + tuning.verify_step_m;
        if (visible(t)) {
          last_ok = t;
          continue;
        }
        std::size_t k = last_ok + 1;
        while (k < t && visible(k)) ++k;
        j = k - 1;
        break;
      }
    }
    end = j;
    out[i] = j == i ? 0.0 : reach_m(d, i, j, j == limit, max_look_m);
  }
  return out;
}

std::vector<double> visible_approach_m(const std::vector<double>& x_m,
                                       const std::vector<double>& y_m,
                                       const std::vector<double>& elevation_m,
                                       const std::vector<double>& d,
                                       const std::vector<std::size_t>& targets,
                                       const TerrainHeight& terrain, double eye_height_m,
                                       double object_height_m, double max_look_m,
                                       double sample_step_m, const TerrainSightTuning& tuning) {
  const char* fn = "visible approach";
  require_distances(fn, d);
  const std::size_t n = d.size();
  require_scan_inputs(fn, x_m, y_m, elevation_m, d, eye_height_m, object_height_m, max_look_m, sample_step_m,
                      tuning);
  std::vector<double> out;
  out.reserve(targets.size());
  for (const std::size_t t : targets) {
    if (t >= n) {
      fail("", fn, "target station " + std::to_string(t) + " is beyond the last station " +
                       std::to_string(n - 1));
    }
    const SightPoint target{x_m[t], y_m[t], elevation_m[t] + object_height_m};
    BlockHint hint;
    // Steepest line from the target back to a road point between it and the eye, as rise/run.
    double best_rise = 0.0, best_run = 1.0;
    bool have_best = false;
    std::size_t first_seen = t;  // furthest station back with an unbroken view of the target
    bool whole_look_visible = true;
    for (std::size_t i = t; i-- > 0;) {
      const double run = d[t] - d[i];
      if (run > max_look_m + kLookSlack_m) break;
      const double eye_rise = elevation_m[i] + eye_height_m - target.z_m;
      const bool over_road = !have_best || eye_rise * best_run >= best_rise * run;
      if (!over_road ||
          (terrain && !clear_between({x_m[i], y_m[i], elevation_m[i] + eye_height_m}, target,
                                     terrain, sample_step_m, tuning, hint))) {
        whole_look_visible = false;
        break;
      }
      first_seen = i;
      const double road_rise = elevation_m[i] - target.z_m;
      if (!have_best || road_rise * best_run > best_rise * run) {
        best_rise = road_rise;
        best_run = run;
        have_best = true;
      }
    }
    double value = d[t] - d[first_seen];
    if (whole_look_visible && first_seen > 0) value = max_look_m;  // stopped by the look-ahead
    out.push_back(value);
  }
  return out;
}

std::vector<HiddenStretch> hidden_stretches(const std::vector<double>& d,
                                            const std::vector<double>& sight_m,
                                            const std::vector<double>& needed_m,
                                            double max_look_m) {
  const char* fn = "hidden stretches";
  require_distances(fn, d);
  require_size(fn, "sight distance", sight_m.size(), d.size());
  require_size(fn, "needed distance", needed_m.size(), d.size());
  require_positive(fn, "look-ahead", max_look_m);
  std::vector<HiddenStretch> out;
  bool open = false;
  for (std::size_t i = 0; i < d.size(); ++i) {
    if (std::isnan(needed_m[i]) || needed_m[i] < 0.0) {
      fail("", std::string(fn) + ", km " + km(d[i]), "needed distance must be >= 0 m (not NaN)");
    }
    const double need = std::min({needed_m[i], d.back() - d[i], max_look_m});
    const bool short_view = !std::isnan(sight_m[i]) && sight_m[i] < need;
    if (!short_view) {
      open = false;
      continue;
    }
    const double shortfall = need - sight_m[i];
    if (!open) {
      out.push_back({d[i], d[i], d[i] + sight_m[i], d[i] + need, shortfall, d[i]});
      open = true;
      continue;
    }
    HiddenStretch& run = out.back();
    run.to_m = d[i];
    run.hidden_from_m = std::min(run.hidden_from_m, d[i] + sight_m[i]);
    run.hidden_to_m = std::max(run.hidden_to_m, d[i] + need);
    if (shortfall > run.worst_shortfall_m) {
      run.worst_shortfall_m = shortfall;
      run.worst_at_m = d[i];
    }
  }
  return out;
}

bool hidden_in_time(const std::vector<double>& d, const std::vector<double>& sight_m,
                    const std::vector<double>& needed_m, double at_m, double max_look_m) {
  const char* fn = "hidden in time";
  if (d.empty()) return false;
  require_size(fn, "sight distance", sight_m.size(), d.size());
  require_size(fn, "needed distance", needed_m.size(), d.size());
  require_positive(fn, "look-ahead", max_look_m);
  if (!std::isfinite(at_m)) fail("", fn, "the place to test must be a finite distance");
  // Stations strictly before at_m, walking back as far as the look-ahead.
  auto first_not_before = std::lower_bound(d.begin(), d.end(), at_m);
  for (auto idx = static_cast<std::size_t>(first_not_before - d.begin()); idx-- > 0;) {
    if (at_m - d[idx] > max_look_m + kLookSlack_m) break;
    if (std::isnan(sight_m[idx]) || std::isnan(needed_m[idx])) continue;
    const double need = std::min({needed_m[idx], d.back() - d[idx], max_look_m});
    if (at_m <= d[idx] + need && d[idx] + sight_m[idx] < at_m) return true;
  }
  return false;
}

}  // namespace coursewarden
