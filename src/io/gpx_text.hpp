// Internal: a GPX 1.1 file of waypoints (hazards.gpx, marshal-plan.gpx).
#pragma once

#include <cmath>
#include <string>
#include <vector>

#include "coursewarden/outputs.hpp"
#include "coursewarden/report.hpp"
#include "util/text.hpp"

namespace coursewarden {

struct GpxWaypoint {
  double lat_deg = 0.0, lon_deg = 0.0;
  double elevation_m = kNoValue;  ///< left out when not finite
  std::string name, cmt, desc, type;
};

/// The whole file: metadata with `title` and the caution, then one <wpt> per waypoint; all text
/// escaped, numbers locale-independent.
inline std::string gpx_waypoints(const std::string& title, const std::vector<GpxWaypoint>& points) {
  std::string o;
  o += "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  o += "<gpx version=\"1.1\" creator=\"coursewarden\" xmlns=\"http://www.topografix.com/GPX/1/1\">\n";
  o += "  <metadata>\n";
  o += "    <name>" + escape_markup(title) + "</name>\n";
  o += "    <desc>" + escape_markup(kDisclaimer) + "</desc>\n";
  o += "  </metadata>\n";
  for (const GpxWaypoint& w : points) {
    o += "  <wpt lat=\"" + fmt_fixed(w.lat_deg, 7) + "\" lon=\"" + fmt_fixed(w.lon_deg, 7) + "\">\n";
    if (std::isfinite(w.elevation_m)) o += "    <ele>" + fmt_fixed(w.elevation_m, 1) + "</ele>\n";
    o += "    <name>" + escape_markup(w.name) + "</name>\n";
    o += "    <cmt>" + escape_markup(w.cmt) + "</cmt>\n";
    o += "    <desc>" + escape_markup(w.desc) + "</desc>\n";
    o += "    <type>" + escape_markup(w.type) + "</type>\n";
    o += "  </wpt>\n";
  }
  o += "</gpx>\n";
  return o;
}

}  // namespace coursewarden
