// make_sample_course: the terrain field. See docs/sample-course.md for the method.
#include "sample_terrain.hpp"

#include <algorithm>
#include <cmath>
#include <iterator>
#include <thread>
#include <utility>

#include <boost/geometry.hpp>
#include <boost/geometry/index/rtree.hpp>

namespace coursewarden::sample {
namespace {

namespace bg = boost::geometry;
namespace bgi = boost::geometry::index;
using BPoint = bg::model::point<double, 2, bg::cs::cartesian>;
using BBox = bg::model::box<BPoint>;
using BSegment = bg::model::segment<BPoint>;
using Entry = std::pair<BSegment, std::size_t>;
using Tree = bgi::rtree<Entry, bgi::rstar<16>>;

/// The course cut into short straight pieces, each with designed heights at its ends.
struct RoadPieces {
  std::vector<Vec2> a, b;
  std::vector<double> ha_m, hb_m, length_m;
  Tree tree;
};

RoadPieces make_pieces(const SamplePlan& plan, double step_m) {
  const auto pts = sample_path(plan.path, step_m, 0.05);
  RoadPieces r;
  std::vector<Entry> entries;
  for (std::size_t i = 0; i + 1 < pts.size(); ++i) {
    const Vec2 a = pts[i].at, b = pts[i + 1].at;
    const double len = std::hypot(b.x_m - a.x_m, b.y_m - a.y_m);
    if (!(len > 1e-9)) continue;
    const std::size_t k = r.a.size();
    r.a.push_back(a);
    r.b.push_back(b);
    r.ha_m.push_back(plan.profile.at(pts[i].s_m));
    r.hb_m.push_back(plan.profile.at(pts[i + 1].s_m));
    r.length_m.push_back(len);
    entries.push_back({BSegment(BPoint(a.x_m, a.y_m), BPoint(b.x_m, b.y_m)), k});
  }
  r.tree = Tree(entries.begin(), entries.end());  // packing construction: deterministic layout
  return r;
}

struct Nearest {
  double d_m;  ///< distance to the nearest piece
  double h_m;  ///< designed height at the nearest point
};

Nearest closest_on(const RoadPieces& r, std::size_t k, double x, double y) {
  const double ux = r.b[k].x_m - r.a[k].x_m, uy = r.b[k].y_m - r.a[k].y_m;
  const double t = std::clamp(((x - r.a[k].x_m) * ux + (y - r.a[k].y_m) * uy) /
                                  (r.length_m[k] * r.length_m[k]),
                              0.0, 1.0);
  const double cx = r.a[k].x_m + t * ux, cy = r.a[k].y_m + t * uy;
  return {std::hypot(x - cx, y - cy), r.ha_m[k] + t * (r.hb_m[k] - r.ha_m[k])};
}

double nearest_distance(const RoadPieces& r, double x, double y, std::vector<Entry>& scratch) {
  scratch.clear();
  r.tree.query(bgi::nearest(BPoint(x, y), 1), std::back_inserter(scratch));
  return closest_on(r, scratch.front().second, x, y).d_m;
}

// Weighted mean of the designed heights of the road near (x, y). The weight of a piece is its
// length times 1 / (d^2 + eps^2)^power, so summed along a road it behaves like a line integral
// that is largest on the nearest road; it tapers to zero `reach_m` beyond the nearest distance,
// which keeps the field continuous as pieces enter and leave the neighbourhood.
double road_height(const RoadPieces& r, double x, double y, double d_min_m,
                   const TerrainOptions& o, std::vector<Entry>& scratch) {
  const double reach = d_min_m + o.reach_m;  // pieces farther than this have zero weight
  scratch.clear();
  r.tree.query(bgi::intersects(BBox(BPoint(x - reach, y - reach), BPoint(x + reach, y + reach))),
               std::back_inserter(scratch));
  // Sum in piece order so the result does not depend on the tree's traversal order.
  std::sort(scratch.begin(), scratch.end(),
            [](const Entry& p, const Entry& q) { return p.second < q.second; });
  double sum_w = 0.0, sum_wh = 0.0;
  const double eps2 = o.eps_m * o.eps_m;
  for (const Entry& e : scratch) {
    const Nearest n = closest_on(r, e.second, x, y);
    const double x_rel = (n.d_m - d_min_m) / o.reach_m;
    if (x_rel >= 1.0) continue;
    const double w = r.length_m[e.second] * (1.0 - smoothstep(x_rel)) /
                     std::pow(n.d_m * n.d_m + eps2, o.power);
    sum_w += w;
    sum_wh += w * n.h_m;
  }
  return sum_wh / sum_w;
}

std::uint64_t mix(std::uint64_t z) {
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

double lattice(long long ix, long long iy, std::uint64_t seed) {
  const std::uint64_t h = mix(seed ^ mix(static_cast<std::uint64_t>(ix) * 0x9E3779B97F4A7C15ULL) ^
                              mix(static_cast<std::uint64_t>(iy) * 0xC2B2AE3D27D4EB4FULL + 1));
  return static_cast<double>(h >> 11) * 0x1.0p-52 - 1.0;  // [-1, 1)
}

double fade(double t) { return t * t * t * (t * (t * 6.0 - 15.0) + 10.0); }

}  // namespace

double value_noise(double x, double y, std::uint64_t seed) {
  const double fx = std::floor(x), fy = std::floor(y);
  const auto ix = static_cast<long long>(fx), iy = static_cast<long long>(fy);
  const double tx = fade(x - fx), ty = fade(y - fy);
  const double v00 = lattice(ix, iy, seed), v10 = lattice(ix + 1, iy, seed);
  const double v01 = lattice(ix, iy + 1, seed), v11 = lattice(ix + 1, iy + 1, seed);
  const double top = v00 + tx * (v10 - v00);
  const double bottom = v01 + tx * (v11 - v01);
  return top + ty * (bottom - top);
}

namespace {

// Textures: value noise octaves, each on a lattice turned by its own angle so the octaves' grid
// lines do not line up.
double texture(double x, double y, std::uint64_t seed) {
  struct Octave {
    double wavelength_m, amplitude_m, angle_deg;
  };
  static constexpr Octave octaves[] = {
      {2600.0, 55.0, 17.0}, {1100.0, 22.0, 61.0}, {420.0, 7.0, 113.0}, {170.0, 2.0, 151.0}};
  double sum = 0.0;
  std::uint64_t k = 0;
  for (const Octave& o : octaves) {
    const double a = o.angle_deg * M_PI / 180.0;
    const double u = (x * std::cos(a) + y * std::sin(a)) / o.wavelength_m;
    const double v = (-x * std::sin(a) + y * std::cos(a)) / o.wavelength_m;
    sum += o.amplitude_m * value_noise(u, v, mix(seed + ++k));
  }
  return sum;
}

struct Level {
  std::size_t cols = 0, rows = 0;
  std::vector<double> z;
  std::vector<double> fixed_sum;
  std::vector<unsigned> fixed_count;
};

// Successive over-relaxation of Laplace's equation on the free cells; a cell on the raster's
// edge averages only the neighbours it has (zero normal gradient). Sequential sweeps in a fixed
// order: the result is deterministic.
void relax(Level& l, int iterations, double omega) {
  for (int it = 0; it < iterations; ++it) {
    for (std::size_t r = 0; r < l.rows; ++r) {
      for (std::size_t c = 0; c < l.cols; ++c) {
        const std::size_t i = r * l.cols + c;
        if (l.fixed_count[i] > 0) continue;
        double sum = 0.0;
        int n = 0;
        if (c > 0) sum += l.z[i - 1], ++n;
        if (c + 1 < l.cols) sum += l.z[i + 1], ++n;
        if (r > 0) sum += l.z[i - l.cols], ++n;
        if (r + 1 < l.rows) sum += l.z[i + l.cols], ++n;
        l.z[i] += omega * (sum / n - l.z[i]);
      }
    }
  }
}

// Laplace interpolation through the fixed cells, coarse to fine: each level starts from the
// bilinearly enlarged solution of the level below it.
void membrane(Level& fine, const TerrainOptions& o) {
  std::vector<Level> levels;
  levels.push_back(std::move(fine));
  while (levels.back().cols > 40 && levels.back().rows > 40) {
    const Level& f = levels.back();
    Level c;
    c.cols = (f.cols + 1) / 2;
    c.rows = (f.rows + 1) / 2;
    c.z.assign(c.cols * c.rows, 0.0);
    c.fixed_sum.assign(c.cols * c.rows, 0.0);
    c.fixed_count.assign(c.cols * c.rows, 0);
    for (std::size_t r = 0; r < f.rows; ++r) {
      for (std::size_t col = 0; col < f.cols; ++col) {
        const std::size_t i = r * f.cols + col, j = (r / 2) * c.cols + col / 2;
        c.fixed_sum[j] += f.fixed_sum[i];
        c.fixed_count[j] += f.fixed_count[i];
      }
    }
    levels.push_back(std::move(c));
  }
  for (Level& l : levels) {
    double all = 0.0;
    unsigned count = 0;
    for (std::size_t i = 0; i < l.z.size(); ++i) {
      all += l.fixed_sum[i];
      count += l.fixed_count[i];
      if (l.fixed_count[i] > 0) l.z[i] = l.fixed_sum[i] / l.fixed_count[i];
    }
    if (&l == &levels.back()) {
      for (std::size_t i = 0; i < l.z.size(); ++i) {
        if (l.fixed_count[i] == 0) l.z[i] = all / std::max(count, 1u);
      }
    }
  }
  relax(levels.back(), o.coarse_iterations, o.over_relaxation);
  for (std::size_t k = levels.size() - 1; k > 0; --k) {
    const Level& c = levels[k];
    Level& f = levels[k - 1];
    for (std::size_t r = 0; r < f.rows; ++r) {
      // Fine cell centre in coarse cell units (centres at half-integers).
      const double cy = std::clamp((static_cast<double>(r) + 0.5) / 2.0 - 0.5, 0.0,
                                   static_cast<double>(c.rows - 1));
      const auto r0 = std::min(static_cast<std::size_t>(cy), c.rows - 1);
      const std::size_t r1 = std::min(r0 + 1, c.rows - 1);
      const double ty = cy - static_cast<double>(r0);
      for (std::size_t col = 0; col < f.cols; ++col) {
        const std::size_t i = r * f.cols + col;
        if (f.fixed_count[i] > 0) continue;
        const double cx = std::clamp((static_cast<double>(col) + 0.5) / 2.0 - 0.5, 0.0,
                                     static_cast<double>(c.cols - 1));
        const auto c0 = std::min(static_cast<std::size_t>(cx), c.cols - 1);
        const std::size_t c1 = std::min(c0 + 1, c.cols - 1);
        const double tx = cx - static_cast<double>(c0);
        const double top = c.z[r0 * c.cols + c0] + tx * (c.z[r0 * c.cols + c1] - c.z[r0 * c.cols + c0]);
        const double bottom = c.z[r1 * c.cols + c0] + tx * (c.z[r1 * c.cols + c1] - c.z[r1 * c.cols + c0]);
        f.z[i] = top + ty * (bottom - top);
      }
    }
    relax(f, o.level_iterations, o.over_relaxation);
  }
  fine = std::move(levels.front());
}

// Runs body(row) for every row on `threads` threads; thread t takes rows t, t + n, ... Each row
// is computed independently, so the result does not depend on the number of threads.
template <class Body>
void for_rows(std::size_t rows, unsigned threads, Body body) {
  const unsigned n = std::max(1u, threads);
  std::vector<std::thread> pool;
  for (unsigned t = 0; t < n; ++t) {
    pool.emplace_back([&, t] {
      for (std::size_t row = t; row < rows; row += n) body(row);
    });
  }
  for (auto& th : pool) th.join();
}

}  // namespace

std::vector<double> make_terrain(const SamplePlan& plan, const Grid& grid,
                                 const TerrainOptions& o, std::uint64_t seed, unsigned threads) {
  const RoadPieces road = make_pieces(plan, o.piece_m);
  const std::size_t cells = grid.cols * grid.rows;
  std::vector<double> dist(cells);
  Level base;
  base.cols = grid.cols;
  base.rows = grid.rows;
  base.z.assign(cells, 0.0);
  base.fixed_sum.assign(cells, 0.0);
  base.fixed_count.assign(cells, 0);

  // 1. Distance to the course everywhere; designed road heights on the pixels near it.
  for_rows(grid.rows, threads, [&](std::size_t row) {
    std::vector<Entry> scratch;
    for (std::size_t col = 0; col < grid.cols; ++col) {
      const double x = grid.centre_x(col), y = grid.centre_y(row);
      const std::size_t i = row * grid.cols + col;
      dist[i] = nearest_distance(road, x, y, scratch);
      if (dist[i] <= o.fixed_m) {
        base.fixed_sum[i] = road_height(road, x, y, dist[i], o, scratch);
        base.fixed_count[i] = 1;
      }
    }
  });

  // 2. The smoothest surface between the roads.
  membrane(base, o);

  // 3. Hills away from the roads and texture, none in town.
  std::vector<double> z(cells);
  const std::uint64_t texture_seed = mix(seed + 7);
  for_rows(grid.rows, threads, [&](std::size_t row) {
    for (std::size_t col = 0; col < grid.cols; ++col) {
      const double x = grid.centre_x(col), y = grid.centre_y(row);
      const std::size_t i = row * grid.cols + col;
      const double d = dist[i];
      // Level ground in town: a lobed disc, so the plain is not a perfect circle.
      const double dx = x - plan.town_centre.x_m, dy = y - plan.town_centre.y_m;
      const double theta = std::atan2(dy, dx);
      const double flat_r = plan.town_flat_radius_m *
                            (1.0 + 0.12 * std::sin(2.0 * theta + 1.0) + 0.06 * std::sin(3.0 * theta + 2.0));
      const double town = smoothstep((std::hypot(dx, dy) - flat_r) / plan.town_edge_m);
      const double ramp = smoothstep((d - o.shoulder_m) / o.fade_m);
      const double hills = o.hill_height_m * (1.0 - std::exp(-d / o.hill_scale_m));
      z[i] = base.z[i] + town * ramp * (hills + o.texture_m * texture(x, y, texture_seed));
    }
  });
  return z;
}

}  // namespace coursewarden::sample
