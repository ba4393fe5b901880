// Internal: building blocks of the organiser's report (report.html) and of the files beside it:
// severity looks, hazard codes, and the inline SVG charts (elevation profile, speed profiles,
// plan view). Not installed. Everything here is pure and deterministic.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"

namespace coursewarden::report_detail {

/// "H07": the hazard's number with at least two digits (three when there are 100 or more).
std::string hazard_code(int number, std::size_t hazard_count);

/// Linear interpolation of y(x) at `at` over increasing x; clamped at the ends; NaN when empty.
double interpolate(const std::vector<double>& x, const std::vector<double>& y, double at);

/// "Climb 1, category 2" or "Climb 2, below category 4".
std::string climb_label(const Climb& climb, std::size_t number);

/// How a severity is drawn: fill, outline and number colours, and the shape's name. Colours
/// darken with severity so that the levels stay apart in greys; the shape differs as well.
struct SeverityLook {
  const char* fill;
  const char* stroke;
  const char* ink;    ///< colour of the number drawn inside
  const char* shape;  ///< "circle", "square", "diamond", "hexagon"
};
const SeverityLook& severity_look(Severity severity);

/// The severity's shape centred on (cx, cy) with radius about `r` (SVG elements, no text).
std::string severity_shape(Severity severity, double cx, double cy, double r);

/// A small standalone inline SVG of the severity's shape, for tables and legends.
std::string severity_icon(Severity severity, double size_px = 14.0);

/// Places labels of width `gap` along a line: as close to `x` as possible, in the same order,
/// at least `gap` apart and within [lo, hi] (when they fit). Returns positions parallel to x.
std::vector<double> spread_positions(const std::vector<double>& x, double gap, double lo, double hi);

/// Indices of a series to draw at pixel resolution: per pixel column the first, lowest,
/// highest and last point, in order (the shape, dips and peaks survive; the size does not grow
/// with the course length).
std::vector<std::size_t> envelope_indices(const std::vector<double>& x_px, const std::vector<double>& y);

/// Elevation against distance, filled by gradient band, climbs bracketed with their category,
/// numbered hazard markers (class "hazard-marker", ids "elev-hNN", each linking to its table row)
/// and a km grid.
std::string elevation_chart_svg(const CheckResult& result);

/// A stretch of the course drawn on its own (a close-up).
struct Window {
  double start_m = 0.0;
  double end_m = 0.0;
};

/// Stretches where corner hazards crowd together (at least `min_hazards` corner hazards, each
/// within `max_gap_m` of the previous one), widened to show the approach: the close-ups.
std::vector<Window> hazard_clusters(const CheckResult& result, std::size_t min_hazards = 3,
                                    double max_gap_m = 800.0);

/// One class's planned and unbraked speed against distance, with each corner's safe speed for
/// the class, the gap where it arrives too fast, and the fast-section threshold. `vmax_kmh` is
/// the top of the speed axis (shared by all classes so the charts compare). With a window, only
/// that stretch is drawn, `width` units wide (a close-up); the svg's id gets `id_suffix`.
std::string speed_chart_svg(const CheckResult& result, std::size_t class_index, double vmax_kmh);
std::string speed_chart_svg(const CheckResult& result, std::size_t class_index, double vmax_kmh,
                            const Window& window, double width, const std::string& id_suffix);

/// Top of a speed axis that fits every class's unbraked speed (a multiple of 10 km/h).
double speed_axis_top_kmh(const CheckResult& result);

/// Plan view in the local projection (station x_m / y_m, up = grid north): course line with km
/// ticks and direction arrows, start and finish, numbered hazard markers (class "hazard-marker",
/// ids "plan-hNN"), scale bar and north arrow.
std::string plan_view_svg(const CheckResult& result);

/// A close-up plan of the stretch `window` (with whatever else of the course passes through its
/// frame), with its own markers (class "closeup-marker", linking to the table rows). `number`
/// makes the svg's id, "plan-closeup-N".
std::string plan_closeup_svg(const CheckResult& result, const Window& window, std::size_t number);

}  // namespace coursewarden::report_detail
