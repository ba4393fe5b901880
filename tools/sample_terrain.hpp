// make_sample_course: synthetic terrain z(x, y) that carries the planned course at its designed
// heights. Pure computation (Boost.Geometry for the spatial index), no GDAL or PROJ.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "sample_plan.hpp"

namespace coursewarden::sample {

/// A north-up raster in local metres: (west_m, north_m) is the outer corner of the first pixel.
struct Grid {
  double west_m = 0.0;
  double north_m = 0.0;
  double pixel_m = 30.0;
  std::size_t cols = 0;
  std::size_t rows = 0;
  double centre_x(std::size_t col) const { return west_m + (static_cast<double>(col) + 0.5) * pixel_m; }
  double centre_y(std::size_t row) const { return north_m - (static_cast<double>(row) + 0.5) * pixel_m; }
};

struct TerrainOptions {
  // Near the course every pixel centre gets a weighted mean of the designed heights of the road
  // near it: each road piece weighs length / (d^2 + eps^2)^power, tapering to nothing `reach_m`
  // beyond the nearest piece. Pixels within `fixed_m` of the course keep that value.
  double eps_m = 4.0;
  double power = 2.0;
  double reach_m = 250.0;
  double piece_m = 5.0;  ///< length of the straight pieces the course is cut into
  double fixed_m = 60.0;
  // Between the roads: the smoothest surface through those fixed pixels (Laplace's equation,
  // level at the raster's edges), solved coarse to fine.
  int coarse_iterations = 3000;  ///< on the coarsest level
  int level_iterations = 250;    ///< on every finer level
  double over_relaxation = 1.8;
  // Off-road term: hills rising away from the roads plus a smooth random texture, both faded in
  // from `shoulder_m` to `shoulder_m + fade_m` off the road, and faded out in town.
  double shoulder_m = 25.0;
  double fade_m = 900.0;
  double hill_height_m = 140.0;
  double hill_scale_m = 1200.0;
  double texture_m = 1.0;  ///< scales the texture octaves (amplitudes 55, 22, 7, 2 m)
};

/// Heights (metres) of every pixel centre, row-major from the north-west corner.
std::vector<double> make_terrain(const SamplePlan& plan, const Grid& grid,
                                 const TerrainOptions& options, std::uint64_t seed,
                                 unsigned threads);

/// Smooth value noise in [-1, 1] with unit lattice spacing (quintic fade between lattice values).
double value_noise(double x, double y, std::uint64_t seed);

}  // namespace coursewarden::sample
