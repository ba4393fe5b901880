// coursewarden: corners found in the course geometry, the path a rider can take through them
// given the road state, and the safe speed through a corner (pure computation).
//
// Everything here works on the uniformly resampled stations (plane x/y in metres, distance along
// the course in metres) and returns plain numbers in SI units; degrees and km/h belong to the
// report writers. No I/O, no shared state: every function may be called from any thread.
// docs/corners.md explains the method, the rules and their limits.
#pragma once

#include <cstddef>
#include <vector>

#include "coursewarden/geometry.hpp"

namespace coursewarden {

enum class TurnDirection { left, right };

/// "left" / "right" (for reports).
const char* turn_direction_name(TurnDirection direction);

struct CornerOptions {
  /// A bend turning the course through less than this is not reported. 20 deg.
  double min_deflection_rad = 0.3490658503988659;
  /// Curvature gentler than 1 / max_radius_m does not count as turning (a sweep, not a corner).
  double max_radius_m = 500.0;
  /// A corner turning through at least this much is a hairpin. 135 deg.
  double hairpin_deflection_rad = 2.356194490192345;
  /// Shortest stretch over which a radius is fitted on a clean course. The stretch actually used
  /// is at least two station spacings and grows with the track's estimated GPS noise.
  double min_window_m = 10.0;
  /// The window is made long enough that GPS noise alone gives deflections with a standard
  /// deviation of at most min_deflection_rad / noise_margin (see docs/corners.md).
  double noise_margin = 6.0;
  /// Sparse-vertex rule: a corner whose whole turn falls on one vertex is taken as the circle
  /// through that vertex and the points this far along each leg (or up to the neighbouring
  /// corner, if nearer). Smaller is more cautious.
  double kink_leg_m = 10.0;
  /// Bends in the same direction separated by less straight road than this are one corner
  /// (a compound bend).
  double merge_gap_m = 15.0;
  /// Bends in opposite directions separated by at most this much straight road form an S-bend.
  double s_bend_gap_m = 15.0;
  /// A corner whose local radius varies by at least this factor is a compound bend.
  double compound_radius_ratio = 1.5;
};

struct Corner {
  double entry_m = 0.0;  ///< distance from the start where the turn begins
  double apex_m = 0.0;   ///< where half of the deflection is done (geometric apex)
  double exit_m = 0.0;   ///< where the turn ends
  std::size_t apex_station = 0;  ///< index into the input stations nearest the apex
  TurnDirection direction = TurnDirection::left;
  double deflection_rad = 0.0;  ///< total change of heading through the corner, always > 0
  double turn_radius_m = 0.0;   ///< tightest radius of the course line (centreline) in the corner
  double fit_window_m = 0.0;    ///< length of the window over which turn_radius_m was fitted
  bool from_kink = false;  ///< turn_radius_m comes from the sparse-vertex rule, not a fit
  bool hairpin = false;    ///< deflection_rad >= hairpin_deflection_rad
  bool s_bend = false;     ///< an opposite bend follows or precedes within s_bend_gap_m
  bool compound = false;   ///< same direction throughout, radius changing along the corner
  double straight_before_m = 0.0;  ///< from the previous corner's exit (or the start) to entry
  double straight_after_m = 0.0;   ///< from exit to the next corner's entry (or the finish)
};

/// Finds the corners of a course resampled at uniform spacing, in order along the course.
/// Throws Error for stations without finite positions or with decreasing distances, and for
/// options out of range. Fewer than three distinct stations give no corners.
std::vector<Corner> find_corners(const std::vector<Station>& stations,
                                 const CornerOptions& options = {});

/// Standard deviation of the positional noise of the stations across the track, metres,
/// estimated robustly (median-based) from how the line bends between neighbouring stations;
/// about 0 for a drawn or map-matched course, 1-5 m for a raw GPS recording.
double estimate_track_noise_m(const std::vector<Station>& stations);

/// How the road can be used in a corner.
struct RoadState {
  bool closed = false;        ///< closed to traffic: riders may use road_width_m
  double road_width_m = 6.0;  ///< usable width, edge to edge (closed road)
  double lane_width_m = 3.0;  ///< band next to the centreline on the traffic side (open road)
  bool right_hand_traffic = true;  ///< open road: which side of the centreline riders keep to
};

/// Radius of the widest circular path a rider can follow through the corner within the usable
/// part of the road, taking the course line as the road centreline: on a closed road between the
/// road edges, on an open road inside the rider's lane (on the inside of the bend for turns
/// towards the traffic side, on the outside otherwise). The approach is limited to half of the
/// straight before and after the corner. Geometry and formula: docs/corners.md. Throws Error for
/// non-positive or non-finite widths or radius.
double path_radius_m(const Corner& corner, const RoadState& road);

/// Speed at which a bicycle rounds a flat turn of radius `radius_m` leaning `lean_rad` without
/// slip: V = sqrt(g R tan(lean)), g = 9.80665 m/s^2. Lean in (0, pi/2).
double lean_limited_speed_mps(double radius_m, double lean_rad);

/// Speed at which the side friction `friction` (f) plus superelevation `superelevation` (e, as a
/// fraction, 0.02 for 2 %) hold a turn of radius `radius_m`: R = V^2 / (g (e + f)), the AASHTO
/// design form. Requires e + f > 0.
double grip_limited_speed_mps(double radius_m, double friction, double superelevation);

/// The lower of the lean limit and the grip limit.
double safe_corner_speed_mps(double radius_m, double lean_rad, double friction,
                             double superelevation);

}  // namespace coursewarden
