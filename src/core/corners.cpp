// Corners from the resampled course (turn field over a noise-adapted window, tightest fitted
// radius, sparse-vertex rule, hairpins, S-bends, compound bends), the path radius allowed by the
// road state, and the safe speed through a corner. Method and sources: docs/corners.md.
#include "coursewarden/corners.hpp"
#include "coursewarden/physics.hpp"

#include <boost/geometry.hpp>

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <string>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

namespace bg = boost::geometry;
using PlanePoint = bg::model::d2::point_xy<double>;

constexpr double kPi = std::numbers::pi;
constexpr double kInfinity = std::numeric_limits<double>::infinity();
// 1 / Phi^-1(3/4): turns a median absolute deviation into a normal standard deviation.
constexpr double kMadToSigma = 1.482602218505602;
// Share of the deflection before the entry (and after the exit) of a corner.
constexpr double kEdgeShare = 0.01;
// Fillet fit: used up to this deflection (the legs become parallel near 180 deg), and only when
// the legs' own deflection agrees with the bend's within this share or angle.
constexpr double kMaxFilletDeflection_rad = 160.0 * std::numbers::pi / 180.0;
constexpr double kFilletAgreement = 0.15;
constexpr double kFilletAgreement_rad = 5.0 * std::numbers::pi / 180.0;
// On a clean line, stations within this distance of the two legs lie on them (a single vertex).
constexpr double kOnLine_m = 0.01;
// A bend on a clean line longer than this many windows is left to the windows (no fillet).
constexpr double kLongCleanBendWindows = 6.0;
// Fewest samples for a second, strided noise estimate.
constexpr std::size_t kMinNoiseSamples = 60;
// Windows in a row over which a fitted radius must hold.
constexpr std::size_t kSustained = 3;
// Compound bends are judged on the middle of the corner, between these shares of the turn.
constexpr double kCoreShareLow = 0.1;
constexpr double kCoreShareHigh = 0.9;

std::string station_place(std::size_t index, double distance_m) {
  return "corners: station " + std::to_string(index) + " (km " +
         fmt_fixed(distance_m / 1000.0, 3) + ")";
}

// Direction of travel from a to b, clockwise from grid north (the convention of Station).
double heading_rad(const PlanePoint& a, const PlanePoint& b) {
  return std::atan2(b.x() - a.x(), b.y() - a.y());
}

// Heading change from `from` to `to`, wrapped into (-pi, pi]; positive is clockwise (a right
// turn). An exact reversal has no side: it is taken as a left turn (the U-turn of right-hand
// traffic), see docs/corners.md.
double turn_rad(double from_rad, double to_rad) {
  const double d = std::remainder(to_rad - from_rad, 2.0 * kPi);
  if (std::abs(d) > kPi - 1e-9) return -kPi;
  return d;
}

// Distinct stations in the plane, with their distance along the course and input index.
struct Track {
  std::vector<PlanePoint> points;
  std::vector<double> distance_m;
  std::vector<std::size_t> station;
  double spacing_m = 0.0;  // median planar step
};

Track plane_track(const std::vector<Station>& stations) {
  Track track;
  track.points.reserve(stations.size());
  track.distance_m.reserve(stations.size());
  track.station.reserve(stations.size());
  for (std::size_t i = 0; i < stations.size(); ++i) {
    const Station& s = stations[i];
    if (!(std::isfinite(s.x_m) && std::isfinite(s.y_m) && std::isfinite(s.distance_m))) {
      fail("", station_place(i, s.distance_m),
           "the station has no finite plane position or distance; resample the course first");
    }
    const PlanePoint p(s.x_m, s.y_m);
    // Coincident stations (a repeated point) carry no direction: keep the first.
    if (!track.points.empty() && bg::comparable_distance(p, track.points.back()) <= 1e-12) {
      continue;
    }
    if (!track.distance_m.empty() && !(s.distance_m > track.distance_m.back())) {
      fail("", station_place(i, s.distance_m),
           "distance along the course does not increase; stations must be in course order");
    }
    track.points.push_back(p);
    track.distance_m.push_back(s.distance_m);
    track.station.push_back(i);
  }
  if (track.points.size() >= 2) {
    std::vector<double> steps;
    steps.reserve(track.points.size() - 1);
    for (std::size_t i = 0; i + 1 < track.points.size(); ++i) {
      steps.push_back(bg::distance(track.points[i], track.points[i + 1]));
    }
    auto mid = steps.begin() + static_cast<long>(steps.size() / 2);
    std::nth_element(steps.begin(), mid, steps.end());
    track.spacing_m = *mid;
  }
  return track;
}

// Robust noise level across the track, from stations taken `stride` apart. The signed offset
// of station i from the chord joining the stations r before and r after removes the course's
// own curvature up to a constant; the step of that offset from one station to the next removes
// the constant too. For independent noise of standard deviation sigma across the line (and
// r >= 2, so the six stations involved are distinct) the step has variance
// (1 + 1 + 4/4) sigma^2 = 3 sigma^2 (derived). The median makes corners, where the offsets do
// change, irrelevant as long as they are a minority of the course.
double strided_noise_m(const Track& track, std::size_t stride) {
  const std::size_t n = (track.points.size() + stride - 1) / stride;
  const double spacing_m = track.spacing_m * static_cast<double>(stride);
  if (n < 3 || !(spacing_m > 0)) return 0.0;
  const auto r = static_cast<std::size_t>(std::max(2.0, std::round(10.0 / spacing_m)));
  if (n < 2 * r + 8) return 0.0;
  auto at = [&](std::size_t i) -> const PlanePoint& { return track.points[i * stride]; };
  std::vector<double> offset_m(n, 0.0);
  for (std::size_t i = r; i + r < n; ++i) {
    const PlanePoint& a = at(i - r);
    const PlanePoint& b = at(i + r);
    const PlanePoint& c = at(i);
    const double chord_m = bg::distance(a, b);
    if (chord_m <= 1e-9) continue;  // an out-and-back reversal: no usable chord
    const double cross = (b.x() - a.x()) * (c.y() - a.y()) - (b.y() - a.y()) * (c.x() - a.x());
    offset_m[i] = cross / chord_m;
  }
  std::vector<double> steps;
  steps.reserve(n);
  for (std::size_t i = r; i + 1 + r < n; ++i) {
    steps.push_back(std::abs(offset_m[i + 1] - offset_m[i]));
  }
  auto mid = steps.begin() + static_cast<long>(steps.size() / 2);
  std::nth_element(steps.begin(), mid, steps.end());
  return kMadToSigma * *mid / std::sqrt(3.0);
}

// Stations interpolated between sparser noisy fixes share their noise with their neighbours,
// which hides part of it from the estimate at stride 1; stride 2 sees through fixes up to two
// spacings apart. The larger estimate is taken; stride 2 only on a course long enough that
// bends remain a minority of its samples.
double track_noise_m(const Track& track) {
  double noise_m = strided_noise_m(track, 1);
  if (track.points.size() >= 2 * kMinNoiseSamples) {
    noise_m = std::max(noise_m, strided_noise_m(track, 2));
  }
  return noise_m;
}

// Median straight-line length of chords spanning `chord` stations (sampled along the course).
double median_chord_m(const Track& track, std::size_t chord) {
  const std::size_t n = track.points.size();
  if (chord >= n) return 0.0;
  const std::size_t stride = std::max<std::size_t>(1, (n - chord) / 2000);
  std::vector<double> lengths;
  for (std::size_t j = 0; j + chord < n; j += stride) {
    lengths.push_back(bg::distance(track.points[j], track.points[j + chord]));
  }
  auto mid = lengths.begin() + static_cast<long>(lengths.size() / 2);
  std::nth_element(lengths.begin(), mid, lengths.end());
  return *mid;
}

void check_options(const CornerOptions& o) {
  auto require = [](bool ok, const char* what) {
    if (!ok) fail("", "corner options", what);
  };
  require(std::isfinite(o.min_deflection_rad) && o.min_deflection_rad > 0 &&
              o.min_deflection_rad < kPi,
          "minimum deflection must be between 0 and 180 degrees");
  require(std::isfinite(o.max_radius_m) && o.max_radius_m > 0,
          "maximum corner radius must be a positive number of metres");
  require(std::isfinite(o.hairpin_deflection_rad) && o.hairpin_deflection_rad > 0,
          "hairpin deflection must be a positive angle");
  require(std::isfinite(o.min_window_m) && o.min_window_m > 0,
          "radius window must be a positive number of metres");
  require(std::isfinite(o.noise_margin) && o.noise_margin > 0,
          "noise margin must be a positive number");
  require(std::isfinite(o.kink_leg_m) && o.kink_leg_m > 0,
          "kink leg must be a positive number of metres");
  require(std::isfinite(o.merge_gap_m) && o.merge_gap_m >= 0,
          "merge gap must be zero or a positive number of metres");
  require(std::isfinite(o.s_bend_gap_m) && o.s_bend_gap_m >= 0,
          "S-bend gap must be zero or a positive number of metres");
  require(std::isfinite(o.compound_radius_ratio) && o.compound_radius_ratio > 1,
          "compound radius ratio must be greater than 1");
}

// The turn field: headings of chords spanning `chord` stations, and the cumulative heading
// change between them (unwrapped by summing wrapped steps, so turns beyond 180 deg are whole).
struct TurnField {
  std::size_t chord = 1;   // stations spanned by one chord
  std::size_t window = 2;  // chords spanned by one radius window
  double spacing_m = 0.0;
  std::vector<double> at_m;        // chord j sits at the middle of its span
  std::vector<double> turned_rad;  // cumulative heading change up to chord j
  // Heading change between chord j and chord j+1, and where it happens.
  double step_rad(std::size_t j) const { return turned_rad[j + 1] - turned_rad[j]; }
  double step_at_m(std::size_t j) const { return 0.5 * (at_m[j] + at_m[j + 1]); }
  std::size_t steps() const { return turned_rad.size() - 1; }
  // Window j: from chord j to chord j + window.
  std::size_t windows() const { return turned_rad.size() - window; }
  double window_turn_rad(std::size_t j) const { return turned_rad[j + window] - turned_rad[j]; }
  double window_length_m(std::size_t j) const { return at_m[j + window] - at_m[j]; }
};

// Direction of the stations j..j+chord: the chord itself for two stations, otherwise the
// principal axis of the points (a least-squares line, steadier under GPS noise than the chord
// through the two end stations), pointed the way of travel.
double local_heading_rad(const Track& track, std::size_t j, std::size_t chord) {
  const PlanePoint& a = track.points[j];
  const PlanePoint& b = track.points[j + chord];
  if (chord == 1) return heading_rad(a, b);
  double mx = 0.0, my = 0.0;
  for (std::size_t i = j; i <= j + chord; ++i) {
    mx += track.points[i].x();
    my += track.points[i].y();
  }
  const double count = static_cast<double>(chord + 1);
  mx /= count;
  my /= count;
  double sxx = 0.0, syy = 0.0, sxy = 0.0;
  for (std::size_t i = j; i <= j + chord; ++i) {
    const double dx = track.points[i].x() - mx, dy = track.points[i].y() - my;
    sxx += dx * dx;
    syy += dy * dy;
    sxy += dx * dy;
  }
  // Unit vector along the axis at angle 0.5 atan2(2 sxy, sxx - syy) from the x axis, by the
  // half-angle formulas.
  const double spread = std::hypot(sxx - syy, 2.0 * sxy);
  if (!(spread > 0)) return heading_rad(a, b);
  const double cos2 = (sxx - syy) / spread;
  double ux = std::sqrt(std::max(0.0, 0.5 * (1.0 + cos2)));
  double uy = std::copysign(std::sqrt(std::max(0.0, 0.5 * (1.0 - cos2))), sxy);
  if (ux * (b.x() - a.x()) + uy * (b.y() - a.y()) < 0) {
    ux = -ux;
    uy = -uy;
  }
  return std::atan2(ux, uy);
}

TurnField turn_field(const Track& track, std::size_t chord, std::size_t window) {
  TurnField field;
  field.chord = chord;
  field.window = window;
  field.spacing_m = track.spacing_m;
  const std::size_t count = track.points.size() - chord;
  field.at_m.resize(count);
  field.turned_rad.resize(count);
  double previous = 0.0;
  for (std::size_t j = 0; j < count; ++j) {
    const double h = local_heading_rad(track, j, chord);
    field.at_m[j] = 0.5 * (track.distance_m[j] + track.distance_m[j + chord]);
    field.turned_rad[j] = j == 0 ? 0.0 : field.turned_rad[j - 1] + turn_rad(previous, h);
    previous = h;
  }
  return field;
}

// A stretch of the turn field turning one way: steps lo..hi (inclusive).
struct Bend {
  int sign = 0;  // +1 right (clockwise), -1 left
  std::size_t lo = 0;
  std::size_t hi = 0;
  double entry_m = 0.0;
  double exit_m = 0.0;
};

double bend_turn_rad(const TurnField& f, const Bend& b) {
  return f.turned_rad[b.hi + 1] - f.turned_rad[b.lo];
}

// Where the bend has turned `share` of its deflection. Each step's turn is spread evenly over
// one station spacing around the place where it happens.
double position_at_share(const TurnField& f, const Bend& b, double share) {
  const double total = b.sign * bend_turn_rad(f, b);
  const double target = share * total;
  const double half = 0.5 * f.spacing_m;
  double done = 0.0;
  for (std::size_t j = b.lo; j <= b.hi; ++j) {
    const double v = b.sign * f.step_rad(j);
    if (v > 0 && done + v >= target) {
      return f.step_at_m(j) - half + f.spacing_m * std::clamp((target - done) / v, 0.0, 1.0);
    }
    done += v;
  }
  return f.step_at_m(b.hi) + half;
}

// A bend already turning at the first (last) step of the course is cut by the start (finish):
// it is entered (left) there.
void place_bend(const TurnField& f, Bend& b, double start_m, double end_m) {
  b.entry_m = b.lo == 0 ? start_m
                        : std::clamp(position_at_share(f, b, kEdgeShare), start_m, end_m);
  b.exit_m = b.hi + 1 >= f.steps()
                 ? end_m
                 : std::clamp(position_at_share(f, b, 1.0 - kEdgeShare), start_m, end_m);
}

// Windows turning faster than 1 / max_radius, grouped into runs of one sign, as step ranges.
std::vector<Bend> turning_runs(const TurnField& f, double max_radius_m) {
  std::vector<Bend> runs;
  const std::size_t windows = f.windows();
  std::size_t j = 0;
  while (j < windows) {
    const double length = f.window_length_m(j);
    const double turn = f.window_turn_rad(j);
    if (!(length > 0) || std::abs(turn) * max_radius_m < length) {
      ++j;
      continue;
    }
    const int sign = turn > 0 ? 1 : -1;
    std::size_t last = j;
    while (last + 1 < windows) {
      const double t = f.window_turn_rad(last + 1);
      if (sign * t <= 0 || std::abs(t) * max_radius_m < f.window_length_m(last + 1)) break;
      ++last;
    }
    Bend b;
    b.sign = sign;
    b.lo = j;
    b.hi = last + f.window - 1;  // window `last` covers steps last .. last + window - 1
    runs.push_back(b);
    j = last + 1;
  }
  // Runs overlap by up to window - 1 steps. Opposite turns are split where the first one has
  // turned furthest (the inflection); same-direction runs in the middle of the overlap.
  for (std::size_t k = 0; k + 1 < runs.size(); ++k) {
    Bend& a = runs[k];
    Bend& b = runs[k + 1];
    if (b.lo > a.hi) continue;
    std::size_t split = (b.lo + a.hi + 1) / 2;  // first step of b
    if (a.sign != b.sign) {
      double best = -kInfinity;
      for (std::size_t s = b.lo; s <= a.hi + 1; ++s) {
        const double v = a.sign * f.turned_rad[s];
        if (v > best) {
          best = v;
          split = s;
        }
      }
    }
    split = std::max(split, a.lo + 1);
    split = std::min(split, b.hi);
    a.hi = split - 1;
    b.lo = split;
  }
  return runs;
}

// Sparse-vertex rule: circle through the vertex and the points `leg_m` along each leg.
double kink_radius_m(double deflection_rad, double leg_m) {
  const double half = std::min(0.5 * deflection_rad, 0.5 * kPi);
  return leg_m / (2.0 * std::sin(half));
}

// ---- fillet fit: the circular arc, tangent to the straight legs either side of a bend, that
// best fits the stations through it (least squares on the distance to the line-arc-line path).

struct Leg {
  PlanePoint at;       // a point of the leg's line
  double ux = 0.0;     // unit direction of travel
  double uy = 0.0;
};

Leg leg_through(const PlanePoint& a, const PlanePoint& b) {
  const double len = bg::distance(a, b);
  return {a, (b.x() - a.x()) / len, (b.y() - a.y()) / len};
}

// Least-squares line through track points first..last, pointed the way of travel.
Leg fitted_leg(const Track& track, std::size_t first, std::size_t last) {
  const double h = local_heading_rad(track, first, last - first);
  double mx = 0.0, my = 0.0;
  for (std::size_t i = first; i <= last; ++i) {
    mx += track.points[i].x();
    my += track.points[i].y();
  }
  const double count = static_cast<double>(last - first + 1);
  return {PlanePoint(mx / count, my / count), std::sin(h), std::cos(h)};
}

struct FilletPath {
  double sign = 1.0;  // +1 right, -1 left
  double deflection_rad = 0.0;
  Leg in, out;
  double n1x = 0, n1y = 0, n2x = 0, n2y = 0;  // unit normals towards the inside of the bend
  // Centre = c0 + R w: the point at distance R inside both legs.
  double c0x = 0, c0y = 0, wx = 0, wy = 0;

  bool set(const Leg& a, const Leg& b, int turn_sign) {
    sign = turn_sign;
    in = a;
    out = b;
    deflection_rad = sign * turn_rad(std::atan2(a.ux, a.uy), std::atan2(b.ux, b.uy));
    // right-hand normal of direction (ux, uy) is (uy, -ux)
    n1x = sign * a.uy;
    n1y = -sign * a.ux;
    n2x = sign * b.uy;
    n2y = -sign * b.ux;
    const double det = n1x * n2y - n1y * n2x;
    if (std::abs(det) < 1e-6) return false;
    const double r1 = n1x * a.at.x() + n1y * a.at.y();
    const double r2 = n2x * b.at.x() + n2y * b.at.y();
    c0x = (r1 * n2y - n1y * r2) / det;
    c0y = (n1x * r2 - r1 * n2x) / det;
    wx = (n2y - n1y) / det;
    wy = (n1x - n2x) / det;
    return true;
  }

  // Distance from p to the path entry leg - arc of radius r - exit leg.
  double distance_m(const PlanePoint& p, double r) const {
    const double ox = c0x + r * wx, oy = c0y + r * wy;
    const double t1x = ox - r * n1x, t1y = oy - r * n1y;  // tangent points
    const double t2x = ox - r * n2x, t2y = oy - r * n2y;
    double best = kInfinity;
    {
      const double vx = p.x() - t1x, vy = p.y() - t1y;
      const double along = vx * in.ux + vy * in.uy;
      best = std::min(best, along <= 0 ? std::abs(in.ux * vy - in.uy * vx)
                                       : std::sqrt(vx * vx + vy * vy));
    }
    {
      const double vx = p.x() - t2x, vy = p.y() - t2y;
      const double along = vx * out.ux + vy * out.uy;
      best = std::min(best, along >= 0 ? std::abs(out.ux * vy - out.uy * vx)
                                       : std::sqrt(vx * vx + vy * vy));
    }
    // On the arc if the point lies in the sector swept from t1 to t2 in the turning direction
    // (less than half a turn, so two cross products decide it; clockwise for a right turn).
    const double ax = t1x - ox, ay = t1y - oy, bx = t2x - ox, by = t2y - oy;
    const double px = p.x() - ox, py = p.y() - oy;
    if (-sign * (ax * py - ay * px) >= 0 && -sign * (px * by - py * bx) >= 0) {
      best = std::min(best, std::abs(std::sqrt(px * px + py * py) - r));
    }
    return best;
  }

  // Largest radius whose tangent points stay between `first` and `last` along the legs.
  double max_radius_m(const PlanePoint& first, const PlanePoint& last) const {
    // t1(R) = c0 + R (w - n1); (t1 - first) . u_in >= 0 ; (last - t2) . u_out >= 0
    double limit = kInfinity;
    const double a0 = (c0x - first.x()) * in.ux + (c0y - first.y()) * in.uy;
    const double a1 = (wx - n1x) * in.ux + (wy - n1y) * in.uy;
    if (a1 < 0) limit = std::min(limit, a0 / -a1);
    const double b0 = (last.x() - c0x) * out.ux + (last.y() - c0y) * out.uy;
    const double b1 = -((wx - n2x) * out.ux + (wy - n2y) * out.uy);
    if (b1 < 0) limit = std::min(limit, b0 / -b1);
    return limit;
  }

  // Distance along the entry leg from `ref` to the entry tangent point, and along the exit leg
  // from `ref` to the exit tangent point (positive in the direction of travel).
  double entry_offset_m(const PlanePoint& ref, double r) const {
    return (c0x + r * (wx - n1x) - ref.x()) * in.ux + (c0y + r * (wy - n1y) - ref.y()) * in.uy;
  }
  double exit_offset_m(const PlanePoint& ref, double r) const {
    return (c0x + r * (wx - n2x) - ref.x()) * out.ux + (c0y + r * (wy - n2y) - ref.y()) * out.uy;
  }
};

double sum_of_squares(const FilletPath& path, const Track& track, std::size_t first,
                      std::size_t last, double r) {
  double sum = 0.0;
  for (std::size_t i = first; i <= last; ++i) {
    const double d = path.distance_m(track.points[i], r);
    sum += d * d;
  }
  return sum;
}

// Radius in [lo, hi] minimising the sum of squares: a scan on an even grid (even in radius is
// even in the position of the tangent points, which move R tan(D/2) along the legs; the sum is
// flat wherever the arc misses the stations, so a coarse grid can miss a narrow valley), then
// golden section between the neighbours of the best grid point.
double best_fillet_radius_m(const FilletPath& path, const Track& track, std::size_t first,
                            std::size_t last, double lo, double hi) {
  constexpr int kGrid = 32;
  const double step = (hi - lo) / kGrid;
  int best = 0;
  double best_value = kInfinity;
  for (int k = 0; k <= kGrid; ++k) {
    const double value = sum_of_squares(path, track, first, last, lo + step * k);
    if (value < best_value) {
      best_value = value;
      best = k;
    }
  }
  double a = lo + step * std::max(0, best - 1);
  double b = lo + step * std::min(kGrid, best + 1);
  const double g = 0.5 * (std::sqrt(5.0) - 1.0);
  double x1 = b - g * (b - a), x2 = a + g * (b - a);
  double f1 = sum_of_squares(path, track, first, last, x1);
  double f2 = sum_of_squares(path, track, first, last, x2);
  for (int it = 0; it < 40 && b - a > 1e-3 * b; ++it) {
    if (f1 <= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = sum_of_squares(path, track, first, last, x1);
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = sum_of_squares(path, track, first, last, x2);
    }
  }
  return 0.5 * (a + b);
}

// Algebraic (Kasa) least-squares circle through track points first..last, coordinates taken
// about their mean for conditioning. Returns +inf when the points are (nearly) collinear.
double circle_fit_radius_m(const Track& track, std::size_t first, std::size_t last) {
  double mx = 0.0, my = 0.0;
  for (std::size_t i = first; i <= last; ++i) {
    mx += track.points[i].x();
    my += track.points[i].y();
  }
  const double count = static_cast<double>(last - first + 1);
  mx /= count;
  my /= count;
  // Normal equations of min sum (x^2 + y^2 + D x + E y + F)^2.
  double sxx = 0, sxy = 0, syy = 0, sx = 0, sy = 0, sxz = 0, syz = 0, sz = 0;
  for (std::size_t i = first; i <= last; ++i) {
    const double x = track.points[i].x() - mx, y = track.points[i].y() - my, z = x * x + y * y;
    sxx += x * x;
    sxy += x * y;
    syy += y * y;
    sx += x;
    sy += y;
    sxz += x * z;
    syz += y * z;
    sz += z;
  }
  // [sxx sxy sx; sxy syy sy; sx sy n] [D E F]' = -[sxz syz sz]'
  const double a[3][3] = {{sxx, sxy, sx}, {sxy, syy, sy}, {sx, sy, count}};
  const double rhs[3] = {-sxz, -syz, -sz};
  const double det = a[0][0] * (a[1][1] * a[2][2] - a[1][2] * a[2][1]) -
                     a[0][1] * (a[1][0] * a[2][2] - a[1][2] * a[2][0]) +
                     a[0][2] * (a[1][0] * a[2][1] - a[1][1] * a[2][0]);
  const double scale = sxx * syy * count;
  if (!(std::abs(det) > 1e-12 * std::max(scale, 1e-300))) return kInfinity;
  auto solve = [&](int col) {
    double m[3][3];
    for (int r = 0; r < 3; ++r) {
      for (int c = 0; c < 3; ++c) m[r][c] = c == col ? rhs[r] : a[r][c];
    }
    return (m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) -
            m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) +
            m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0])) /
           det;
  };
  const double d = solve(0), e = solve(1), f = solve(2);
  const double r2 = 0.25 * (d * d + e * e) - f;
  return r2 > 0 ? std::sqrt(r2) : kInfinity;
}

// ---- sparse polygon: a clean line whose turns fall on vertices at least two station spacings
// apart. The vertices are recovered exactly as the meeting points of the straight pieces of
// line between them, and the radius is that of the circle through neighbouring vertices.

// Where the line through a (direction a->a2) meets the line through b (direction b->b2).
PlanePoint line_meet(const PlanePoint& a, const PlanePoint& a2, const PlanePoint& b,
                     const PlanePoint& b2) {
  const double ux = a2.x() - a.x(), uy = a2.y() - a.y();
  const double vx = b2.x() - b.x(), vy = b2.y() - b.y();
  const double den = ux * vy - uy * vx;
  if (std::abs(den) < 1e-15) return a2;
  const double t = ((b.x() - a.x()) * vy - (b.y() - a.y()) * vx) / den;
  return PlanePoint(a.x() + t * ux, a.y() + t * uy);
}

// Radius of the circle through three points (abc / 4 area); +inf when collinear.
double circumradius_m(const PlanePoint& a, const PlanePoint& b, const PlanePoint& c) {
  const double twice_area = std::abs((b.x() - a.x()) * (c.y() - a.y()) -
                                     (b.y() - a.y()) * (c.x() - a.x()));
  if (twice_area <= 1e-12) return kInfinity;
  return bg::distance(a, b) * bg::distance(b, c) * bg::distance(c, a) / (2.0 * twice_area);
}

// Radius of the circle tangent to direction (ux, uy) at a and passing through b.
double tangent_chord_radius_m(const PlanePoint& a, double ux, double uy, const PlanePoint& b) {
  const double wx = b.x() - a.x(), wy = b.y() - a.y();
  const double chord = std::hypot(wx, wy);
  const double sine = std::abs(ux * wy - uy * wx) / std::max(chord, 1e-300);
  return sine > 1e-12 ? chord / (2.0 * sine) : kInfinity;
}

// ---- measuring one bend

// What the stages below share.
struct Scene {
  const Track& track;
  const TurnField& field;
  const CornerOptions& options;
  std::size_t n = 0;  // stations
  double spacing_m = 0.0;
  double start_m = 0.0;
  double end_m = 0.0;
  double noise_m = 0.0;  // estimated track noise
  bool clean() const { return field.chord == 1; }
  std::size_t index_at(double distance_m) const {
    return static_cast<std::size_t>(
        std::lower_bound(track.distance_m.begin(), track.distance_m.end(), distance_m) -
        track.distance_m.begin());
  }
};

// Geometry found around one bend: its legs (straight lines before and after), a single vertex,
// or the vertices of a sparsely drawn arc.
struct BendShape {
  double kink_vertex_m = kNoValue;  // along-course position of a single vertex
  bool have_legs = false;
  Leg leg_in, leg_out;
  std::size_t first = 0, last = 0;  // stations to fit (legs included)
  std::vector<PlanePoint> vertices;
  std::vector<std::size_t> vertex_station;  // station before each vertex
};

// Tightest radius over the windows inside the bend: arc length per radian turned. A radius
// counts only if it holds over kSustained windows in a row, so a lumpy window of a sparsely
// drawn arc (vertices not in step with the stations) does not set it alone. Also judges a
// compound bend from the spread of the radii in the middle of the bend (clean lines only).
void fit_windows(const Scene& sc, const Bend& b, double deflection, Corner& c) {
  const TurnField& f = sc.field;
  const double s = sc.spacing_m;
  std::vector<double> radii;
  std::vector<double> core_radii;
  double window_m = 0.0;
  const double core_lo = position_at_share(f, b, kCoreShareLow);
  const double core_hi = position_at_share(f, b, kCoreShareHigh);
  for (std::size_t j = b.lo; j + f.window <= b.hi + 1 && j < f.windows(); ++j) {
    const double turn = b.sign * f.window_turn_rad(j);
    const double length = f.window_length_m(j);
    const double r = turn > 0 ? length / turn : kInfinity;
    radii.push_back(r);
    window_m = std::max(window_m, length);
    if (f.step_at_m(j) - 0.5 * s >= core_lo - 1e-9 &&
        f.step_at_m(j + f.window - 1) + 0.5 * s <= core_hi + 1e-9) {
      core_radii.push_back(r);
    }
  }
  double tightest = kInfinity;
  std::size_t tightest_at = 0;  // first window of the tightest stretch
  if (radii.size() < kSustained) {
    for (std::size_t i = 0; i < radii.size(); ++i) {
      if (radii[i] < tightest) {
        tightest = radii[i];
        tightest_at = i;
      }
    }
  }
  for (std::size_t j = 0; j + kSustained <= radii.size(); ++j) {
    double sustained = 0.0;
    for (std::size_t i = j; i < j + kSustained; ++i) sustained = std::max(sustained, radii[i]);
    if (sustained < tightest) {
      tightest = sustained;
      tightest_at = j;
    }
  }
  if (sc.clean() && std::isfinite(tightest)) {
    // On a clean line a circle through the stations of that stretch sharpens the estimate of a
    // short tight part (the windows need kSustained of them in a row); kept if tighter.
    const std::size_t i0 = b.lo + tightest_at;
    const std::size_t i1 =
        std::min(sc.n - 1, i0 + f.window + std::min(kSustained, radii.size()));
    if (i1 >= i0 + 3) tightest = std::min(tightest, circle_fit_radius_m(sc.track, i0, i1));
  }
  if (!std::isfinite(tightest)) {
    // The bend is shorter than one window: its whole turn over one window length.
    window_m = static_cast<double>(f.window) * s;
    tightest = window_m / deflection;
  }
  c.turn_radius_m = tightest;
  c.fit_window_m = window_m;
  if (sc.clean() && core_radii.size() >= 2) {
    const auto [lo, hi] = std::minmax_element(core_radii.begin(), core_radii.end());
    c.compound = !(*hi < sc.options.compound_radius_ratio * *lo);
  }
}

// Clean line: a single vertex, or legs (and the vertices of a sparse arc) around bend k.
BendShape clean_shape(const Scene& sc, const std::vector<Bend>& bends, std::size_t k) {
  constexpr double kStraight_rad = 1e-6;  // a step turning less is straight on a clean line
  const TurnField& f = sc.field;
  const Track& t = sc.track;
  const Bend& b = bends[k];
  BendShape shape;
  auto turns = [&](std::size_t j) { return std::abs(f.step_rad(j)) > kStraight_rad; };
  std::size_t f0 = b.lo, l0 = b.hi;
  while (f0 < b.hi && !turns(f0)) ++f0;
  while (l0 > f0 && !turns(l0)) --l0;
  // The first and last steps of an arc turn less than a window counts as turning: follow the
  // turn outwards to the straight (not into the neighbouring bends).
  const std::size_t lower = k > 0 ? bends[k - 1].hi + 1 : 0;
  const std::size_t upper = k + 1 < bends.size() ? bends[k + 1].lo : f.steps();
  while (f0 > lower && turns(f0 - 1)) --f0;
  while (l0 + 1 < upper && turns(l0 + 1)) ++l0;
  if (l0 + 2 >= sc.n) return shape;

  // Single vertex: every station between the segment before the turn and the segment after it
  // lies on the line of one or the other.
  const Leg before = leg_through(t.points[f0], t.points[f0 + 1]);
  const Leg after = leg_through(t.points[l0 + 1], t.points[l0 + 2]);
  auto off_line = [](const Leg& leg, const PlanePoint& p) {
    return std::abs(leg.ux * (p.y() - leg.at.y()) - leg.uy * (p.x() - leg.at.x()));
  };
  bool on_legs = true;
  for (std::size_t i = f0 + 1; i <= l0 + 1 && on_legs; ++i) {
    on_legs = std::min(off_line(before, t.points[i]), off_line(after, t.points[i])) <= kOnLine_m;
  }
  if (on_legs) {
    PlanePoint vertex = t.points[f0 + 1];
    if (std::abs(before.ux * after.uy - before.uy * after.ux) > 1e-9) {
      vertex = line_meet(t.points[f0], t.points[f0 + 1], t.points[l0 + 1], t.points[l0 + 2]);
    } else {
      // A reversal on one line: the vertex is the furthest point reached.
      for (std::size_t i = f0 + 1; i <= l0 + 1; ++i) {
        const PlanePoint& p = t.points[i];
        if ((p.x() - vertex.x()) * before.ux + (p.y() - vertex.y()) * before.uy > 0) vertex = p;
      }
    }
    shape.kink_vertex_m = t.distance_m[f0 + 1] + (vertex.x() - t.points[f0 + 1].x()) * before.ux +
                          (vertex.y() - t.points[f0 + 1].y()) * before.uy;
    return shape;
  }

  // Legs: the segments before and after the turn, provided the line runs straight one more
  // segment out, or the turn meets the neighbouring bend there (an S-bend: the segment at the
  // inflection is then the common tangent, a softer leg). None at the course's ends.
  auto leg_ok = [&](std::size_t outside_step, bool towards_start) {
    if (!turns(outside_step)) return true;
    return towards_start ? (k > 0 && outside_step < lower)
                         : (k + 1 < bends.size() && outside_step >= upper);
  };
  if (!(f0 >= 1 && l0 + 1 < f.steps() && leg_ok(f0 - 1, true) && leg_ok(l0 + 1, false))) {
    return shape;
  }
  shape.have_legs = true;
  shape.leg_in = before;
  shape.leg_out = after;
  shape.first = f0 - 1;
  shape.last = std::min(sc.n - 1, l0 + 3);

  // Sparse arc: every turn falls on at most two neighbouring stations (one vertex inside a
  // segment, or one on a station) with straight line between; each vertex is then where the
  // straight pieces either side of it meet.
  for (std::size_t j = f0; j <= l0;) {
    if (!turns(j)) {
      ++j;
      continue;
    }
    std::size_t v = j;
    while (v + 1 <= l0 && turns(v + 1)) ++v;
    if (v > j + 1 || v + 2 >= sc.n) {
      shape.vertices.clear();
      shape.vertex_station.clear();
      break;
    }
    shape.vertices.push_back(line_meet(t.points[j], t.points[j + 1], t.points[v + 1],
                                       t.points[v + 2]));
    shape.vertex_station.push_back(j);
    j = v + 1;
  }
  return shape;
}

// Noisy line: least-squares lines over the straights before entry and after exit (the window
// blurs entry and exit outwards, so these stretches lie on the straights).
BendShape noisy_shape(const Scene& sc, const std::vector<Bend>& bends, std::size_t k) {
  const Bend& b = bends[k];
  BendShape shape;
  const double leg_m =
      std::max(4.0 * sc.spacing_m, static_cast<double>(sc.field.chord) * sc.spacing_m);
  const double prev_limit = k > 0 ? bends[k - 1].exit_m : sc.start_m;
  const double next_limit = k + 1 < bends.size() ? bends[k + 1].entry_m : sc.end_m;
  const std::size_t a0 = sc.index_at(std::max(prev_limit, b.entry_m - leg_m));
  const std::size_t a1 = sc.index_at(b.entry_m);
  const std::size_t z0 = sc.index_at(b.exit_m);
  const std::size_t z1 = std::min(sc.index_at(std::min(next_limit, b.exit_m + leg_m)), sc.n - 1);
  if (a1 < sc.n && a1 >= a0 + 3 && z1 >= z0 + 3 && z0 > a1) {
    shape.have_legs = true;
    shape.leg_in = fitted_leg(sc.track, a0, a1);
    shape.leg_out = fitted_leg(sc.track, z0, z1);
    shape.first = a0;
    shape.last = z1;
  }
  return shape;
}

// Radius from the legs: the circle through the vertices of a sparse arc, else the fillet fit.
void fit_between_legs(const Scene& sc, const Bend& b, double deflection, const BendShape& shape,
                      Corner& c) {
  const Track& t = sc.track;
  FilletPath path;
  if (!(shape.have_legs && path.set(shape.leg_in, shape.leg_out, b.sign) &&
        path.deflection_rad > 0 && path.deflection_rad <= kMaxFilletDeflection_rad &&
        std::abs(path.deflection_rad - deflection) <=
            std::max(kFilletAgreement * deflection, kFilletAgreement_rad))) {
    return;
  }
  const auto& v = shape.vertices;
  if (v.size() >= 2) {
    // Radius of the circle through neighbouring vertices; with only two, the circle tangent to
    // a leg at its vertex and through the other vertex. The tightest is kept.
    std::vector<double> local;
    if (v.size() == 2) {
      local.push_back(tangent_chord_radius_m(v[0], shape.leg_in.ux, shape.leg_in.uy, v[1]));
      local.push_back(tangent_chord_radius_m(v[1], -shape.leg_out.ux, -shape.leg_out.uy, v[0]));
    }
    for (std::size_t i = 1; i + 1 < v.size(); ++i) {
      local.push_back(circumradius_m(v[i - 1], v[i], v[i + 1]));
    }
    const auto [lo, hi] = std::minmax_element(local.begin(), local.end());
    c.turn_radius_m = *lo;
    c.compound = local.size() >= 2 && !(*hi < sc.options.compound_radius_ratio * *lo);
    auto along = [&](std::size_t i) {
      const std::size_t j = shape.vertex_station[i];
      return t.distance_m[j] + bg::distance(t.points[j], v[i]);
    };
    c.entry_m = std::clamp(along(0), sc.start_m, sc.end_m);
    c.exit_m = std::clamp(along(v.size() - 1), sc.start_m, sc.end_m);
    c.fit_window_m = c.exit_m - c.entry_m;
    return;
  }
  // A compound bend on a clean line keeps the window's tightest radius: one fillet would
  // average its parts. A long bend on a clean line is measured well by the windows already.
  if (sc.clean() && c.compound) return;
  if (sc.clean() && c.exit_m - c.entry_m > kLongCleanBendWindows * c.fit_window_m) return;
  const double hi = path.max_radius_m(t.points[shape.first], t.points[shape.last]);
  if (!std::isfinite(hi)) return;
  // Smallest radius tried: on a noisy track the noise itself (a fit cannot tell a circle
  // tighter than a few sigma from a sharp corner); otherwise a hundredth of the spacing.
  const double lo =
      sc.clean() ? 0.01 * sc.spacing_m : std::max(0.5 * sc.spacing_m, 2.0 * sc.noise_m);
  if (!(hi > lo)) return;
  const double r = best_fillet_radius_m(path, t, shape.first, shape.last, lo, hi);
  // On a clean line both estimates are sound and the tighter is kept: the fillet is exact for a
  // densely drawn arc, the window nearer for an arc drawn with few vertices (the chords between
  // them lie inside the arc and look like a wider fillet).
  if (!sc.clean() || r < c.turn_radius_m) {
    c.turn_radius_m = r;
    c.fit_window_m = t.distance_m[shape.last] - t.distance_m[shape.first];
  }
  // Entry and exit at the tangent points.
  const double entry =
      t.distance_m[shape.first] + path.entry_offset_m(t.points[shape.first], r);
  const double exit = t.distance_m[shape.last] + path.exit_offset_m(t.points[shape.last], r);
  if (entry < exit) {
    c.entry_m = std::clamp(entry, sc.start_m, sc.end_m);
    c.exit_m = std::clamp(exit, sc.start_m, sc.end_m);
    if (!sc.clean()) c.apex_m = 0.5 * (c.entry_m + c.exit_m);
  }
}

// Hairpins: the legs are too near parallel for a fillet. A circle is fitted to the stations of
// the arc around the apex instead, the arc's length R D taken from the previous estimate (a few
// rounds, started by the window estimate). On a noisy track the stretch is at least as long as
// the chord, or the fit follows the noise into ever smaller circles.
void fit_hairpin(const Scene& sc, double deflection, Corner& c) {
  const Track& t = sc.track;
  const double floor_m =
      std::max(1.5 * sc.spacing_m, 0.5 * static_cast<double>(sc.field.chord) * sc.spacing_m);
  double r = c.turn_radius_m;
  for (int round = 0; round < 4; ++round) {
    const double half_m = std::max(floor_m, 0.45 * r * deflection);
    const std::size_t i0 = sc.index_at(c.apex_m - half_m);
    const auto i1 = static_cast<std::size_t>(
        std::upper_bound(t.distance_m.begin(), t.distance_m.end(), c.apex_m + half_m) -
        t.distance_m.begin());
    if (i1 < i0 + 4) break;
    const double fitted = circle_fit_radius_m(t, i0, i1 - 1);
    if (!std::isfinite(fitted)) break;
    r = fitted;
    c.fit_window_m = t.distance_m[i1 - 1] - t.distance_m[i0];
  }
  c.turn_radius_m = r;
}

// Sparse-vertex rule for corner k whose turn is a single vertex at `vertex_m`: the circle
// through the vertex and the points `leg` along each leg, the leg being kink_leg_m or the
// distance to the neighbouring corner's apex (or vertex), whichever is shorter.
void apply_kink_rule(const Scene& sc, const std::vector<double>& kink_vertex_m,
                     std::vector<Corner>& corners, std::size_t k) {
  Corner& c = corners[k];
  const double v = kink_vertex_m[k];
  auto apex_of = [&](std::size_t i) {
    return std::isnan(kink_vertex_m[i]) ? corners[i].apex_m : kink_vertex_m[i];
  };
  double leg = sc.options.kink_leg_m;
  if (k > 0) leg = std::min(leg, v - apex_of(k - 1));
  if (k + 1 < corners.size()) leg = std::min(leg, apex_of(k + 1) - v);
  leg = std::max(leg, 0.5 * sc.spacing_m);
  c.from_kink = true;
  c.compound = false;
  c.turn_radius_m = kink_radius_m(c.deflection_rad, leg);
  c.fit_window_m = 2.0 * leg;
  c.apex_m = std::clamp(v, sc.start_m, sc.end_m);
  c.entry_m = std::max(sc.start_m, v - leg);
  c.exit_m = std::min(sc.end_m, v + leg);
}

}  // namespace

const char* turn_direction_name(TurnDirection direction) {
  return direction == TurnDirection::left ? "left" : "right";
}

double estimate_track_noise_m(const std::vector<Station>& stations) {
  return track_noise_m(plane_track(stations));
}

std::vector<Corner> find_corners(const std::vector<Station>& stations,
                                 const CornerOptions& options) {
  check_options(options);
  const Track track = plane_track(stations);
  const std::size_t n = track.points.size();
  std::vector<Corner> corners;
  if (n < 3 || !(track.spacing_m > 0)) return corners;
  const double s = track.spacing_m;
  const double start_m = track.distance_m.front();
  const double end_m = track.distance_m.back();

  // Scale. The heading of a chord of length L whose ends carry noise sigma across the line has
  // a standard deviation of about sqrt(2) sigma / L; a deflection is a difference of two such
  // headings, 2 sigma / L (derived). Chords are lengthened until that is at most
  // min_deflection / noise_margin; the least-squares direction used for long chords does better.
  const double noise_m = track_noise_m(track);
  const double allowed_rad = options.min_deflection_rad / options.noise_margin;
  const std::size_t max_chord = std::max<std::size_t>(1, (n - 1) / 4);
  std::size_t chord = 1;
  while (chord < max_chord && 2.0 * noise_m > allowed_rad * median_chord_m(track, chord)) ++chord;
  const auto min_window = static_cast<std::size_t>(
      std::max(2.0, std::round(options.min_window_m / s)));
  std::size_t window = std::max(min_window, chord);
  // A short course shrinks the scale so that at least one window fits.
  if (n - chord < 2) return corners;
  window = std::min(window, n - chord - 1);
  if (window < 1) return corners;

  const TurnField f = turn_field(track, chord, window);
  // On a noisy track the turn of one bend can dip below the threshold for a window or two.
  const double merge_gap_m = std::max(
      options.merge_gap_m, chord > 1 ? 2.0 * static_cast<double>(window) * s : 0.0);

  // Runs turning less than half the minimum deflection are wiggles (or noise): they neither
  // count as corners nor keep the bends either side of them apart.
  std::vector<Bend> bends;
  for (Bend& b : turning_runs(f, options.max_radius_m)) {
    if (b.sign * bend_turn_rad(f, b) < 0.5 * options.min_deflection_rad) continue;
    place_bend(f, b, start_m, end_m);
    bends.push_back(b);
  }

  // Same-direction bends with little straight between them are one (compound) corner.
  std::vector<Bend> merged;
  for (const Bend& b : bends) {
    if (!merged.empty() && merged.back().sign == b.sign &&
        b.entry_m - merged.back().exit_m <= merge_gap_m) {
      merged.back().hi = b.hi;
      place_bend(f, merged.back(), start_m, end_m);
    } else {
      merged.push_back(b);
    }
  }
  bends.clear();
  for (const Bend& b : merged) {
    if (b.sign * bend_turn_rad(f, b) >= options.min_deflection_rad) bends.push_back(b);
  }

  const Scene sc{track, f, options, n, s, start_m, end_m, noise_m};
  std::vector<double> kink_vertex_m(bends.size(), kNoValue);
  for (std::size_t k = 0; k < bends.size(); ++k) {
    const Bend& b = bends[k];
    const double deflection = b.sign * bend_turn_rad(f, b);
    Corner c;
    c.direction = b.sign > 0 ? TurnDirection::right : TurnDirection::left;
    c.deflection_rad = deflection;
    c.entry_m = b.entry_m;
    c.exit_m = b.exit_m;
    c.apex_m = std::clamp(position_at_share(f, b, 0.5), start_m, end_m);
    c.hairpin = deflection >= options.hairpin_deflection_rad;
    fit_windows(sc, b, deflection, c);
    const BendShape shape = sc.clean() ? clean_shape(sc, bends, k) : noisy_shape(sc, bends, k);
    kink_vertex_m[k] = shape.kink_vertex_m;
    if (std::isnan(shape.kink_vertex_m)) {
      fit_between_legs(sc, b, deflection, shape, c);
      if (deflection > kMaxFilletDeflection_rad && !(sc.clean() && c.compound)) {
        fit_hairpin(sc, deflection, c);
      }
    }
    corners.push_back(c);
  }
  for (std::size_t k = 0; k < corners.size(); ++k) {
    if (!std::isnan(kink_vertex_m[k])) apply_kink_rule(sc, kink_vertex_m, corners, k);
  }

  for (std::size_t k = 0; k < corners.size(); ++k) {
    Corner& c = corners[k];
    const double before_end = k == 0 ? start_m : corners[k - 1].exit_m;
    const double after_start = k + 1 < corners.size() ? corners[k + 1].entry_m : end_m;
    c.straight_before_m = std::max(0.0, c.entry_m - before_end);
    c.straight_after_m = std::max(0.0, after_start - c.exit_m);
    if (k + 1 < corners.size() && corners[k + 1].direction != c.direction &&
        corners[k + 1].entry_m - c.exit_m <= options.s_bend_gap_m) {
      c.s_bend = true;
      corners[k + 1].s_bend = true;
    }
    // Nearest input station to the apex.
    const auto it = std::lower_bound(track.distance_m.begin(), track.distance_m.end(), c.apex_m);
    std::size_t i = static_cast<std::size_t>(it - track.distance_m.begin());
    if (i >= n) i = n - 1;
    if (i > 0 && c.apex_m - track.distance_m[i - 1] < track.distance_m[i] - c.apex_m) --i;
    c.apex_station = track.station[i];
  }
  return corners;
}

// ---- road state

double path_radius_m(const Corner& corner, const RoadState& road) {
  const double r = corner.turn_radius_m;
  if (!(std::isfinite(r) && r > 0)) {
    fail("", "path radius", "the corner's radius must be a positive number of metres");
  }
  const double width = road.closed ? road.road_width_m : road.lane_width_m;
  if (!(std::isfinite(width) && width > 0)) {
    fail("", "road state",
         road.closed ? "closed-road width must be a positive number of metres"
                     : "lane width must be a positive number of metres");
  }
  // Radii of the inner and outer edge of the usable band around the bend's centre.
  double inner = 0.0, outer = 0.0;
  if (road.closed) {
    inner = r - 0.5 * width;
    outer = r + 0.5 * width;
  } else {
    // The traffic side is on the inside of the bend when the bend turns towards it.
    const bool towards_traffic_side =
        (corner.direction == TurnDirection::right) == road.right_hand_traffic;
    inner = towards_traffic_side ? r - width : r;
    outer = towards_traffic_side ? r : r + width;
  }
  inner = std::max(inner, 0.0);
  const double band = outer - inner;
  const double half_turn = 0.5 * corner.deflection_rad;
  if (!(half_turn < 0.5 * kPi) || band <= 0) return outer;
  // Path circle centred a distance t behind the bend's centre on its bisector, touching the
  // outer edge of both straights: rho = outer + t cos(D/2). It starts turning t sin(D/2) before
  // the bend, and must not cross the inner edge at the apex: rho - t >= inner.
  const double cos_half = std::cos(half_turn);
  const double sin_half = std::sin(half_turn);
  const double approach_m =
      0.5 * std::max(0.0, std::min(corner.straight_before_m, corner.straight_after_m));
  double t = band / (1.0 - cos_half);
  if (sin_half > 0) t = std::min(t, approach_m / sin_half);
  return outer + t * cos_half;
}

// ---- safe speed

double lean_limited_speed_mps(double radius_m, double lean_rad) {
  if (!(radius_m > 0) || std::isnan(radius_m)) {
    fail("", "corner speed", "radius must be a positive number of metres");
  }
  if (!(std::isfinite(lean_rad) && lean_rad > 0 && lean_rad < 0.5 * kPi)) {
    fail("", "corner speed", "lean angle must be between 0 and 90 degrees");
  }
  if (std::isinf(radius_m)) return kInfinity;
  return std::sqrt(kGravity_mps2 * radius_m * std::tan(lean_rad));
}

double grip_limited_speed_mps(double radius_m, double friction, double superelevation) {
  if (!(radius_m > 0) || std::isnan(radius_m)) {
    fail("", "corner speed", "radius must be a positive number of metres");
  }
  if (!(std::isfinite(friction) && friction > 0)) {
    fail("", "corner speed", "side friction must be a positive number");
  }
  if (!(std::isfinite(superelevation) && friction + superelevation > 0)) {
    fail("", "corner speed",
         "superelevation (a fraction, 0.02 for 2 %) plus friction must be positive");
  }
  if (std::isinf(radius_m)) return kInfinity;
  return std::sqrt(kGravity_mps2 * radius_m * (superelevation + friction));
}

double safe_corner_speed_mps(double radius_m, double lean_rad, double friction,
                             double superelevation) {
  return std::min(lean_limited_speed_mps(radius_m, lean_rad),
                  grip_limited_speed_mps(radius_m, friction, superelevation));
}

}  // namespace coursewarden
