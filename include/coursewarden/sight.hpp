// coursewarden: how far a rider can see the road ahead (pure computation).
//
// Two limits are computed separately and combined by the caller (take the smaller):
//  - the crest limit, from the road's own elevation profile (a vertical convex curve hides what
//    lies beyond it);
//  - the terrain limit, from straight 3-D sight lines through a terrain height function (the
//    hillside on the inside of a bend, a knoll beside the road).
// Only the ground is modelled: vegetation, buildings, walls, parked vehicles and crowds are not in
// any terrain model used here, so real sight lines can be shorter. Method and limits:
// docs/hazard-rules.md. All functions are pure and thread-safe provided the terrain callback is.
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <span>
#include <vector>

namespace coursewarden {

/// Rider eye height above the road surface, m (AASHTO bicycle guide, 1999).
inline constexpr double kRiderEyeHeight_m = 1.4;
/// Default look-ahead limit of the sight scans, m; choose it above the largest stopping sight
/// distance of interest.
inline constexpr double kDefaultMaxLook_m = 500.0;

/// Crest sight distance at every station of a profile, m. For station i the eye is
/// `eye_height_m` above the road at i; a station j ahead is visible when the straight line from
/// the eye to the point `object_height_m` above the road at j passes above every road point in
/// between. The result is the distance to the last station of the continuously visible stretch
/// (so it is at most one station spacing short of the true value), `max_look_m` when everything
/// within `max_look_m` is visible, and the remaining course length near the end when the view
/// reaches the finish. Distances are horizontal distances along the course (profile distance).
/// Cost O(n k) with k the stations within `max_look_m`, less where crests cut the view short.
/// Throws Error on size mismatch, fewer than 2 stations, non-increasing distances, NaN heights or
/// non-positive eye height / look-ahead.
std::vector<double> crest_sight_distance_m(const std::vector<double>& distance_m,
                                           const std::vector<double>& elevation_m,
                                           double eye_height_m = kRiderEyeHeight_m,
                                           double object_height_m = 0.0,
                                           double max_look_m = kDefaultMaxLook_m);

/// Ground height in metres at a point of the local projected plane (same x/y as the stations);
/// NaN where unknown. Must be safe to call concurrently if the caller runs sight scans in threads.
using TerrainHeight = std::function<double(double x_m, double y_m)>;

struct SightPoint {
  double x_m = 0.0;
  double y_m = 0.0;
  double z_m = 0.0;  ///< height of the point itself (eye or object), not of the ground below it
};

/// How terrain sight lines are sampled.
struct TerrainSightTuning {
  /// Ground within this horizontal distance of the eye and of the target is not tested: there the
  /// line runs just above the road surface the rider and the object stand on, and the terrain
  /// there is the road itself (whose own shape is the crest limit's business); testing it would
  /// only measure the difference between the terrain source and the road heights.
  double end_skip_m = 2.0;
  /// The ground blocks a line only where it rises more than this above it, m. It absorbs the
  /// difference between the road heights given (often a smoothed profile) and the terrain
  /// source near the road, where a line towards an object on the road surface grazes the road.
  double terrain_tolerance_m = 0.5;
  /// terrain_sight_distance_m only: spacing of the checks that the stretch carried over from the
  /// previous station is still visible, m (0 = no checks). Hidden gaps in the view shorter than
  /// this may be missed; smaller is more exact and slower.
  double verify_step_m = 50.0;
};

/// True when the straight segment from `eye` to `target` stays above the terrain: the terrain is
/// sampled every `sample_step_m` (or closer, evenly) of horizontal length, skipping
/// tuning.end_skip_m at both ends; a sample blocks when terrain > line + tuning.terrain_tolerance_m.
/// Unknown (NaN) terrain does not block. Throws Error on a non-positive step.
bool line_of_sight_clear(const SightPoint& eye, const SightPoint& target,
                         const TerrainHeight& terrain, double sample_step_m,
                         const TerrainSightTuning& tuning = {});

/// Terrain sight distance at the stations of a course, m: the distance along the course to the
/// last station of the continuously visible stretch ahead, where station j is visible from i when
/// line_of_sight_clear(eye at i, object at j) holds (eye and object heights above the road
/// heights `elevation_m`). Capped at `max_look_m` and at the remaining course length like
/// crest_sight_distance_m. Stations with a zero in `evaluate` (when it is not empty) get NaN,
/// so the caller may restrict the work to the approaches of corners.
///
/// The scan carries the end of the visible stretch from one evaluated station to the next and
/// moves it forward or back, so each station costs a few sight lines instead of one per station
/// ahead; the carried stretch is re-checked every tuning.verify_step_m. A hidden gap shorter than
/// that (the road dips out of view and reappears) may be missed, which overstates the sight: use
/// visible_approach_m, which is exact, to decide whether a given corner is seen in time.
/// Throws Error on size mismatch, non-increasing distances, NaN coordinates or heights, or
/// non-positive eye height, look-ahead or step.
std::vector<double> terrain_sight_distance_m(const std::vector<double>& x_m,
                                             const std::vector<double>& y_m,
                                             const std::vector<double>& elevation_m,
                                             const std::vector<double>& distance_m,
                                             const TerrainHeight& terrain, double eye_height_m,
                                             double object_height_m, double max_look_m,
                                             double sample_step_m,
                                             const TerrainSightTuning& tuning = {},
                                             std::span<const std::uint8_t> evaluate = {});

/// For each station index in `targets` (a corner apex, a junction), how far back along the
/// course that road point stays continuously in view, m: the largest d_t - d_i such that from the
/// eye at every station from i up to t the object at t is visible both over the road profile (no
/// road point in between above the line, as in crest_sight_distance_m) and, when `terrain` is not
/// empty, over the terrain (line_of_sight_clear with `sample_step_m` and `tuning`). Capped at
/// `max_look_m` and at the distance from the start of the course. Exact for each target (no
/// carried state): compare it with the stopping sight distance of each class on the approach to
/// flag a corner that cannot be seen in time. Cost per target O(k) profile checks plus up to k
/// sight lines, k = stations within `max_look_m`, ending at the first station without a view.
/// Throws Error like terrain_sight_distance_m, and on a target index out of range.
std::vector<double> visible_approach_m(const std::vector<double>& x_m,
                                       const std::vector<double>& y_m,
                                       const std::vector<double>& elevation_m,
                                       const std::vector<double>& distance_m,
                                       const std::vector<std::size_t>& targets,
                                       const TerrainHeight& terrain, double eye_height_m,
                                       double object_height_m, double max_look_m,
                                       double sample_step_m, const TerrainSightTuning& tuning = {});

/// A run of consecutive stations from which the road cannot be seen as far as needed.
struct HiddenStretch {
  double from_m = 0.0;         ///< first rider position with too short a view
  double to_m = 0.0;           ///< last such position
  double hidden_from_m = 0.0;  ///< the road not seen in time starts here (nearest end of view)
  double hidden_to_m = 0.0;    ///< ... and ends here (furthest point that needed to be seen)
  double worst_shortfall_m = 0.0;  ///< largest (needed - visible) over the run
  double worst_at_m = 0.0;         ///< rider position of the largest shortfall
};

/// Where the sight distance `sight_m` falls short of the distance `needed_m` (typically the
/// stopping sight distance at the predicted speed), per station. The need is capped at the
/// remaining course length and at `max_look_m` (the sight scans look no further, so pass the
/// look-ahead they used); NaN sight (station not evaluated) is never short. Throws Error on size
/// mismatch, non-increasing distances or a NaN need.
std::vector<HiddenStretch> hidden_stretches(const std::vector<double>& distance_m,
                                            const std::vector<double>& sight_m,
                                            const std::vector<double>& needed_m,
                                            double max_look_m = kDefaultMaxLook_m);

/// True when the road point `at_m` lies in the part some rider position before it needed to see
/// but could not: a station i with d_i < at_m <= d_i + needed_i and d_i + sight_i < at_m (with
/// the same capping rules as hidden_stretches). Use it to flag a corner or junction turn that is
/// hidden at the stopping sight distance. Cost O(log n + stations within `max_look_m`).
bool hidden_in_time(const std::vector<double>& distance_m, const std::vector<double>& sight_m,
                    const std::vector<double>& needed_m, double at_m,
                    double max_look_m = kDefaultMaxLook_m);

}  // namespace coursewarden
