// Internal: building blocks of the organiser's report (report.html) and of the files beside it:
// severity looks, hazard codes, and the inline SVG charts (elevation profile, speed profiles,
// plan view). Not installed. Everything here is pure and deterministic.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/marshal_plan.hpp"
#include "coursewarden/schedule.hpp"

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

/// "m07" from "M07": the lower-case code used in element ids of a marshal post ("post-m07" for
/// its table row, "map-m07" for its marker on the sector plan).
std::string post_anchor(const std::string& code);

/// What part of the local plane a sector plan shows (metres, local projection).
struct PlanBounds {
  double xmin = 0.0, xmax = 1.0, ymin = 0.0, ymax = 1.0;
};

/// Frame of the plan of briefing sector `sector`: the stretch from its first post to its last,
/// with 250 m of course either side, at least 600 m across, widened to the plan's proportions
/// (`aspect` = width / height) with room around for the labels.
PlanBounds sector_bounds(const CheckResult& result, const MarshalPlan& plan, std::size_t sector,
                         double aspect);

/// Plan of one briefing sector in the local projection (stations' x_m / y_m, up = grid north):
/// the sector's stretch in bold, the rest of the course that passes through the frame in grey,
/// km ticks and direction arrows, start and finish where in view, and one labelled marker per
/// post of the sector (class "post-marker", id "map-mNN", linking to the post's table row
/// "#post-mNN"); a post spread along the course is drawn as a band over its stretch. Scale bar
/// and grid-north arrow in a strip below. svg id "sector-plan-N" (N from 1).
std::string sector_plan_svg(const CheckResult& result, const MarshalPlan& plan, std::size_t sector);

/// A small key map of the whole course with the sector's stretch in bold and the frame of its
/// plan dashed, so that a printed sector page shows where it lies. svg id "sector-key-N".
std::string sector_key_svg(const CheckResult& result, const MarshalPlan& plan, std::size_t sector);

/// Clock time against distance: the first riders, the last riders (drawn thicker and in
/// terracotta where they pass more than the grace after the closing vehicle), the band of riders
/// on the road between them, the closing vehicle (dashed), checkpoints and cut-offs (those more
/// than 45 min after the last riders and the closing vehicle are left out, as the axis would
/// squash the lines; the report names them in the caption). svg id "schedule-chart".
/// `off_chart`, when given, receives the rows whose cut-off is left out.
std::string time_distance_svg(const CheckResult& result, const Schedule& schedule,
                              std::vector<const ScheduleRow*>* off_chart = nullptr);

}  // namespace coursewarden::report_detail
