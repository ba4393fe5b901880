// Inline SVG charts of the organiser's report, drawn from the check's result.
//
// Conventions: every chart is a <svg> with a viewBox 960 units wide that scales to the page;
// numbers are written with fmt_fixed (never the locale); text from inputs is escaped. Markers
// link to their row of the hazard table (#hazard-hNN) and carry their own id for links back.
#include "io/report_svg.hpp"

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>
#include <limits>

#include "coursewarden/hazards.hpp"
#include "coursewarden/report.hpp"
#include "util/text.hpp"

namespace coursewarden::report_detail {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kWidth = 960.0;

std::string n1(double v) { return fmt_fixed(v, 1); }

// A linear map from data to picture coordinates.
struct Axis {
  double d0, d1, p0, p1;
  double operator()(double v) const { return d1 == d0 ? p0 : p0 + (v - d0) * (p1 - p0) / (d1 - d0); }
};

// A round step (1, 2 or 5 times a power of ten) giving at most about `max_ticks` ticks.
double nice_step(double range, double max_ticks) {
  if (!(range > 0.0)) return 1.0;
  const double raw = range / max_ticks;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    if (m * p >= raw) return m * p;
  }
  return 10.0 * p;
}

std::string km_label(double km) {
  return std::fabs(km - std::round(km)) < 1e-9 ? fmt_fixed(km, 0) : fmt_fixed(km, 1);
}

std::string marker_title(const Hazard& h, std::size_t count) {
  return escape_markup(hazard_code(h.number, count) + " " + std::string(severity_name(h.severity)) + ": " +
                       hazard_kind_label(h.kind) + ", km " + fmt_fixed(h.at_m / 1000.0, 2));
}

// A numbered hazard marker that links to its table row.
std::string hazard_marker(const Hazard& h, std::size_t count, const std::string& id_prefix, double cx,
                          double cy, double r, const std::string& marker_class = "hazard-marker") {
  const std::string code = hazard_code(h.number, count);
  std::string lower = code;
  lower[0] = 'h';
  const auto& look = severity_look(h.severity);
  const std::string label = std::to_string(h.number);
  const double font = label.size() >= 3 ? r * 0.95 : r * 1.2;
  std::string o = "<a href=\"#hazard-" + lower + "\"><g class=\"" + marker_class + " sev-" +
                  std::string(severity_name(h.severity)) + "\"" +
                  (id_prefix.empty() ? std::string() : " id=\"" + id_prefix + lower + "\"") + " data-hazard=\"" +
                  std::to_string(h.number) + "\"><title>" + marker_title(h, count) + "</title>";
  o += severity_shape(h.severity, cx, cy, r);
  o += "<text x=\"" + n1(cx) + "\" y=\"" + n1(cy + font * 0.36) + "\" font-size=\"" + n1(font) +
       "\" fill=\"" + look.ink + "\" class=\"mk\">" + label + "</text></g></a>";
  return o;
}

// Station index whose distance is nearest `d`.
std::size_t nearest_station(const std::vector<double>& dist, double d) {
  auto it = std::lower_bound(dist.begin(), dist.end(), d);
  if (it == dist.end()) return dist.size() - 1;
  const std::size_t i = static_cast<std::size_t>(it - dist.begin());
  if (i > 0 && d - dist[i - 1] < dist[i] - d) return i - 1;
  return i;
}

std::vector<double> station_distances(const CheckResult& c) {
  std::vector<double> d;
  d.reserve(c.analysis.stations.size());
  for (const auto& s : c.analysis.stations) d.push_back(s.distance_m);
  return d;
}

// Vertical grid and labels every km step; returns the SVG.
std::string km_grid(const Axis& x, double length_m, double top, double bottom, bool labels) {
  const double step_km = nice_step(length_m / 1000.0, 14.0);
  std::string o = "<g class=\"grid\">";
  for (double km = 0.0; km * 1000.0 <= length_m + 1e-6; km += step_km) {
    const double px = x(km * 1000.0);
    o += "<line x1=\"" + n1(px) + "\" y1=\"" + n1(top) + "\" x2=\"" + n1(px) + "\" y2=\"" + n1(bottom) + "\"/>";
    if (labels) {
      o += "<text class=\"tick\" x=\"" + n1(px) + "\" y=\"" + n1(bottom + 14) + "\" text-anchor=\"middle\">" +
           km_label(km) + "</text>";
    }
  }
  return o + "</g>";
}

std::string path_from(const std::vector<std::pair<double, double>>& pts) {
  std::string d;
  d.reserve(pts.size() * 14);
  for (std::size_t i = 0; i < pts.size(); ++i) {
    d += (i == 0 ? "M" : "L") + n1(pts[i].first) + " " + n1(pts[i].second);
  }
  return d;
}

// Safe corner speed of a class at corner k, km/h.
double safe_kmh(const CheckResult& c, std::size_t cls, std::size_t k) {
  return class_safe_speed_mps(c.classes[cls], c.path_radius_m[k], c.environment.wet, c.hazard_options) * 3.6;
}

// The hazard about corner k, if any.
const Hazard* hazard_for_corner(const CheckResult& c, std::size_t k) {
  for (const Hazard& h : c.hazards) {
    if (h.corner && *h.corner == k) return &h;
  }
  return nullptr;
}

bool hazard_touches_class(const Hazard& h, const std::string& name) {
  for (const auto& a : h.classes) {
    if (a.class_name == name) return true;
  }
  for (const auto& n : h.section_classes) {
    if (n == name) return true;
  }
  return false;
}

}  // namespace

// ---- small pieces

std::string hazard_code(int number, std::size_t hazard_count) {
  std::string digits = std::to_string(number);
  const std::size_t width = hazard_count >= 100 ? 3 : 2;
  while (digits.size() < width) digits = "0" + digits;
  return "H" + digits;
}

double interpolate(const std::vector<double>& x, const std::vector<double>& y, double at) {
  if (x.empty() || y.size() != x.size()) return std::numeric_limits<double>::quiet_NaN();
  if (at <= x.front()) return y.front();
  if (at >= x.back()) return y.back();
  const auto it = std::upper_bound(x.begin(), x.end(), at);
  const std::size_t i = static_cast<std::size_t>(it - x.begin());
  const double t = (at - x[i - 1]) / (x[i] - x[i - 1]);
  return y[i - 1] + t * (y[i] - y[i - 1]);
}

std::string climb_label(const Climb& climb, std::size_t number) {
  return "Climb " + std::to_string(number) +
         (climb.category.empty() ? std::string(", below category 4") : ", category " + climb.category);
}

const SeverityLook& severity_look(Severity severity) {
  // Our own scale: slate outline, ochre, terracotta, wine; lightness falls with severity.
  static const SeverityLook none{"#ffffff", "#7a8791", "#1e2830", "circle"};
  static const SeverityLook note{"#ffffff", "#3f5568", "#1e2830", "circle"};
  static const SeverityLook caution{"#e0b43c", "#6f5110", "#1e2830", "square"};
  static const SeverityLook serious{"#c0502c", "#5a200c", "#ffffff", "diamond"};
  static const SeverityLook critical{"#5e1834", "#1c0610", "#ffffff", "hexagon"};
  switch (severity) {
    case Severity::none: return none;
    case Severity::note: return note;
    case Severity::caution: return caution;
    case Severity::serious: return serious;
    case Severity::critical: return critical;
  }
  return none;
}

std::string severity_shape(Severity severity, double cx, double cy, double r) {
  const auto& look = severity_look(severity);
  const std::string style = std::string(" fill=\"") + look.fill + "\" stroke=\"" + look.stroke + "\"";
  const std::string shape = look.shape;
  if (shape == "circle") {
    return "<circle cx=\"" + n1(cx) + "\" cy=\"" + n1(cy) + "\" r=\"" + n1(r * 0.92) + "\"" + style +
           " stroke-width=\"" + n1(std::max(1.2, r * 0.2)) + "\"/>";
  }
  std::vector<std::pair<double, double>> pts;
  if (shape == "square") {
    const double h = r * 0.84;
    pts = {{cx - h, cy - h}, {cx + h, cy - h}, {cx + h, cy + h}, {cx - h, cy + h}};
  } else if (shape == "diamond") {
    const double h = r * 1.18;
    pts = {{cx, cy - h}, {cx + h, cy}, {cx, cy + h}, {cx - h, cy}};
  } else {  // hexagon, flat top
    const double h = r * 1.08;
    for (int k = 0; k < 6; ++k) {
      const double a = kPi / 3.0 * k;
      pts.emplace_back(cx + h * std::cos(a), cy + h * std::sin(a));
    }
  }
  std::string d;
  for (std::size_t i = 0; i < pts.size(); ++i) d += (i ? " " : "") + n1(pts[i].first) + "," + n1(pts[i].second);
  return "<polygon points=\"" + d + "\"" + style + " stroke-width=\"" + n1(std::max(1.0, r * 0.14)) + "\"/>";
}

std::string severity_icon(Severity severity, double size_px) {
  const double h = size_px / 2.0;
  return "<svg class=\"icon\" width=\"" + n1(size_px) + "\" height=\"" + n1(size_px) + "\" viewBox=\"0 0 " +
         n1(size_px) + " " + n1(size_px) + "\" aria-hidden=\"true\">" +
         severity_shape(severity, h, h, h * 0.8) + "</svg>";
}

std::vector<double> spread_positions(const std::vector<double>& x, double gap, double lo, double hi) {
  const std::size_t n = x.size();
  std::vector<std::size_t> order(n);
  for (std::size_t i = 0; i < n; ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return x[a] < x[b]; });
  // Clusters of touching labels, each centred on the mean of its members' wishes.
  struct Cluster {
    std::size_t first, count;
    double sum;  // sum of (x_i - offset within cluster)
    double start() const { return sum / static_cast<double>(count); }
  };
  std::vector<Cluster> clusters;
  for (std::size_t k = 0; k < n; ++k) {
    clusters.push_back({k, 1, x[order[k]]});
    while (clusters.size() > 1) {
      Cluster& b = clusters.back();
      Cluster& a = clusters[clusters.size() - 2];
      if (a.start() + static_cast<double>(a.count) * gap <= b.start()) break;
      // Merge b into a: b's members sit after a's.
      a.sum = a.sum + b.sum - static_cast<double>(b.count) * static_cast<double>(a.count) * gap;
      a.count += b.count;
      // Renormalise: sum over members of (x - offset) with offsets continuing from a.
      clusters.pop_back();
    }
  }
  std::vector<double> pos(n);
  for (const Cluster& c : clusters) {
    for (std::size_t j = 0; j < c.count; ++j) pos[c.first + j] = c.start() + static_cast<double>(j) * gap;
  }
  // Keep within the bounds, pushing neighbours along.
  for (std::size_t k = 0; k < n; ++k) {
    pos[k] = std::max(pos[k], lo);
    if (k > 0) pos[k] = std::max(pos[k], pos[k - 1] + gap);
  }
  for (std::size_t k = n; k-- > 0;) {
    pos[k] = std::min(pos[k], hi);
    if (k + 1 < n) pos[k] = std::min(pos[k], pos[k + 1] - gap);
  }
  std::vector<double> out(n);
  for (std::size_t k = 0; k < n; ++k) out[order[k]] = pos[k];
  return out;
}

std::vector<std::size_t> envelope_indices(const std::vector<double>& x_px, const std::vector<double>& y) {
  std::vector<std::size_t> out;
  const std::size_t n = std::min(x_px.size(), y.size());
  std::size_t i = 0;
  while (i < n) {
    const double col = std::floor(x_px[i]);
    std::size_t first = i, lo = i, hi = i, last = i;
    while (i < n && std::floor(x_px[i]) == col) {
      if (y[i] < y[lo]) lo = i;
      if (y[i] > y[hi]) hi = i;
      last = i;
      ++i;
    }
    std::array<std::size_t, 4> keep{first, lo, hi, last};
    std::sort(keep.begin(), keep.end());
    for (std::size_t k : keep) {
      if (out.empty() || out.back() != k) out.push_back(k);
    }
  }
  return out;
}

// ---- elevation profile

std::string elevation_chart_svg(const CheckResult& c) {
  const auto& st = c.analysis.stations;
  const auto& p = c.analysis.profile;
  const std::vector<double> dist = station_distances(c);
  const double length = dist.empty() ? 0.0 : dist.back();
  const std::size_t nh = c.hazards.size();
  const double left = 58.0, right = 16.0, plot_w = kWidth - left - right;
  // Marker lanes above the plot: as many rows as the markers need to sit side by side.
  const double r = 8.5, gap = 2.0 * r + 3.0;
  const std::size_t rows =
      std::max<std::size_t>(1, static_cast<std::size_t>(std::ceil(static_cast<double>(nh) * gap / (plot_w * 0.92))));
  const double lane_h = 2.0 * r + 6.0;
  const double top = 10.0 + static_cast<double>(rows) * lane_h + 8.0;
  const double plot_h = 230.0, bottom = 36.0;
  const double height = top + plot_h + bottom;
  double emin = p.totals.min_elevation_m, emax = p.totals.max_elevation_m;
  if (!(emax > emin)) {
    emin -= 10.0;
    emax += 10.0;
  }
  const double estep = nice_step(emax - emin, 5.0);
  const double lo = std::floor((emin - 0.05 * (emax - emin)) / estep) * estep;
  const double hi = emax + 0.22 * (emax - emin);  // room above for the climb brackets
  const Axis x{0.0, std::max(length, 1.0), left, left + plot_w};
  const Axis y{lo, hi, top + plot_h, top};
  const double base = top + plot_h;

  std::string o = "<svg id=\"elevation-chart\" class=\"chart\" viewBox=\"0 0 960 " + n1(height) +
                  "\" role=\"img\" aria-labelledby=\"elevation-title\"><title id=\"elevation-title\">"
                  "Elevation against distance, filled by gradient band, with climbs and numbered hazards"
                  "</title>";
  o += "<rect class=\"plot-bg\" x=\"" + n1(left) + "\" y=\"" + n1(top) + "\" width=\"" + n1(plot_w) +
       "\" height=\"" + n1(plot_h) + "\"/>";
  // Horizontal grid with heights.
  o += "<g class=\"grid\">";
  for (double e = std::ceil(lo / estep) * estep; e <= hi + 1e-9; e += estep) {
    o += "<line x1=\"" + n1(left) + "\" y1=\"" + n1(y(e)) + "\" x2=\"" + n1(left + plot_w) + "\" y2=\"" + n1(y(e)) + "\"/>";
    o += "<text class=\"tick\" x=\"" + n1(left - 6) + "\" y=\"" + n1(y(e) + 4) + "\" text-anchor=\"end\">" +
         fmt_fixed(e, 0) + " m</text>";
  }
  o += "</g>";
  if (st.size() >= 2 && p.elevation_m.size() == st.size()) {
    // Gradient bands over blocks of about 1.5 px, merged into runs of one band.
    const double spacing = std::max(c.analysis.spacing_m, 1e-9);
    const std::size_t step = std::max<std::size_t>(1, static_cast<std::size_t>(std::lround(std::max(100.0, length / 600.0) / spacing)));
    std::vector<std::size_t> edges;
    for (std::size_t i = 0; i < st.size() - 1; i += step) edges.push_back(i);
    edges.push_back(st.size() - 1);
    auto band_of = [&](std::size_t a, std::size_t b) {
      const double len = dist[b] - dist[a];
      return gradient_band_index(len > 0 ? 100.0 * (p.elevation_m[b] - p.elevation_m[a]) / len : 0.0);
    };
    const auto bands = gradient_bands();
    // Descents are hatched as well as coloured, so that they stay apart from climbs in greys.
    o += "<defs>";
    for (const auto& b : bands) {
      if (!(b.to_pct <= -4.0 + 1e-9)) continue;
      o += "<pattern id=\"hatch-" + std::string(b.key) + "\" width=\"7\" height=\"7\" patternUnits=\"userSpaceOnUse\" "
           "patternTransform=\"rotate(45)\"><rect width=\"7\" height=\"7\" fill=\"" + std::string(b.colour) +
           "\"/><line x1=\"0\" y1=\"0\" x2=\"0\" y2=\"7\" stroke=\"#fcfbf6\" stroke-width=\"2\" stroke-opacity=\"0.6\"/></pattern>";
    }
    o += "</defs><g class=\"bands\">";
    std::size_t k = 0;
    while (k + 1 < edges.size()) {
      const std::size_t band = band_of(edges[k], edges[k + 1]);
      std::size_t m = k + 1;
      while (m + 1 < edges.size() && band_of(edges[m], edges[m + 1]) == band) ++m;
      std::vector<std::pair<double, double>> pts;
      for (std::size_t q = k; q <= m; ++q) pts.emplace_back(x(dist[edges[q]]), y(p.elevation_m[edges[q]]));
      pts.emplace_back(x(dist[edges[m]]), base);
      pts.emplace_back(x(dist[edges[k]]), base);
      const bool hatched = bands[band].to_pct <= -4.0 + 1e-9;
      o += "<path d=\"" + path_from(pts) + "Z\" fill=\"" +
           (hatched ? "url(#hatch-" + std::string(bands[band].key) + ")" : std::string(bands[band].colour)) +
           "\" stroke=\"" + bands[band].colour + "\" stroke-width=\"0.6\"/>";
      k = m;
    }
    o += "</g>";
    // The profile line at pixel resolution.
    std::vector<double> xpx(st.size());
    for (std::size_t i = 0; i < st.size(); ++i) xpx[i] = x(dist[i]);
    std::vector<std::pair<double, double>> line;
    for (std::size_t i : envelope_indices(xpx, p.elevation_m)) line.emplace_back(xpx[i], y(p.elevation_m[i]));
    o += "<path class=\"profile-line\" d=\"" + path_from(line) + "\"/>";
  }
  o += km_grid(x, length, top, base, true);
  o += "<text class=\"axis-label\" x=\"" + n1(left + plot_w) + "\" y=\"" + n1(height - 4) +
       "\" text-anchor=\"end\">distance from the start, km</text>";
  // Climbs: a bracket just above each climb's top, labelled with its number and category.
  if (!c.analysis.climbs.empty()) {
    std::vector<double> centres, widths;
    for (const Climb& cl : c.analysis.climbs) centres.push_back(x(0.5 * (cl.start_m + cl.end_m)));
    std::vector<std::string> labels;
    for (std::size_t k = 0; k < c.analysis.climbs.size(); ++k) {
      const Climb& cl = c.analysis.climbs[k];
      labels.push_back(cl.category.empty() ? "climb " + std::to_string(k + 1) + " \xc2\xb7 no cat."
                                           : "climb " + std::to_string(k + 1) + " \xc2\xb7 cat. " + cl.category);
    }
    std::size_t widest = 0;
    for (const auto& l : labels) widest = std::max(widest, l.size());
    const auto lx = spread_positions(centres, 6.4 * static_cast<double>(widest) + 8.0, left + 50.0, left + plot_w - 50.0);
    o += "<g class=\"climbs\">";
    for (std::size_t k = 0; k < c.analysis.climbs.size(); ++k) {
      const Climb& cl = c.analysis.climbs[k];
      double peak = -std::numeric_limits<double>::infinity();
      for (std::size_t i = 0; i < dist.size(); ++i) {
        if (dist[i] >= cl.start_m && dist[i] <= cl.end_m) peak = std::max(peak, p.elevation_m[i]);
      }
      if (!std::isfinite(peak)) peak = interpolate(dist, p.elevation_m, cl.end_m);
      const double by = y(peak) - 12.0;
      const double x0 = x(cl.start_m), x1 = x(cl.end_m);
      o += "<path class=\"climb-bracket\" d=\"M" + n1(x0) + " " + n1(by + 6) + "V" + n1(by) + "H" + n1(x1) + "V" +
           n1(by + 6) + "\"/>";
      if (std::fabs(lx[k] - 0.5 * (x0 + x1)) > 2.0) {
        o += "<line class=\"leader\" x1=\"" + n1(0.5 * (x0 + x1)) + "\" y1=\"" + n1(by) + "\" x2=\"" + n1(lx[k]) +
             "\" y2=\"" + n1(by - 8) + "\"/>";
      }
      o += "<text class=\"climb-label\" x=\"" + n1(lx[k]) + "\" y=\"" + n1(by - 5) + "\" text-anchor=\"middle\">" +
           escape_markup(labels[k]) + "</text>";
    }
    o += "</g>";
  }
  // Hazards that cover a stretch (fast sections, steep descents): a band along the top of the plot.
  {
    std::string spans = "<g class=\"hazard-spans\">";
    for (const Hazard& h : c.hazards) {
      if (h.corner || !(h.end_m - h.at_m > 20.0)) continue;
      spans += "<rect x=\"" + n1(x(h.at_m)) + "\" y=\"" + n1(top + 1) + "\" width=\"" + n1(x(h.end_m) - x(h.at_m)) +
               "\" height=\"5\" fill=\"" + severity_look(h.severity).fill + "\" stroke=\"" +
               severity_look(h.severity).stroke + "\" stroke-width=\"0.8\"><title>" + marker_title(h, nh) + " to km " +
               fmt_fixed(h.end_m / 1000.0, 2) + "</title></rect>";
    }
    o += spans + "</g>";
  }
  // Hazards: markers in lanes above the plot, leader lines down to the profile.
  if (nh > 0) {
    std::vector<std::vector<std::size_t>> lane(rows);
    for (std::size_t k = 0; k < nh; ++k) lane[k % rows].push_back(k);
    std::string leaders = "<g class=\"leaders\">", markers = "<g class=\"markers\">";
    for (std::size_t row = 0; row < rows; ++row) {
      std::vector<double> want;
      for (std::size_t k : lane[row]) want.push_back(x(c.hazards[k].at_m));
      const auto at = spread_positions(want, gap, left + r, left + plot_w - r);
      const double ly = 10.0 + r + static_cast<double>(row) * lane_h;
      for (std::size_t q = 0; q < lane[row].size(); ++q) {
        const Hazard& h = c.hazards[lane[row][q]];
        const double px = x(h.at_m), py = y(interpolate(dist, p.elevation_m, h.at_m));
        leaders += "<path d=\"M" + n1(at[q]) + " " + n1(ly + r) + "L" + n1(at[q]) + " " + n1(top - 2) + "L" + n1(px) +
                   " " + n1(py) + "\"/><circle cx=\"" + n1(px) + "\" cy=\"" + n1(py) + "\" r=\"2.2\"/>";
        markers += hazard_marker(h, nh, "elev-", at[q], ly, r);
      }
    }
    o += leaders + "</g>" + markers + "</g>";
  }
  o += "</svg>";
  return o;
}

// ---- speed profiles

double speed_axis_top_kmh(const CheckResult& c) {
  double vmax = 0.0;
  for (const auto& sp : c.speeds) {
    for (double v : sp.unbraked_speed_mps) vmax = std::max(vmax, v);
    for (double v : sp.planned_speed_mps) vmax = std::max(vmax, v);
  }
  return std::max(10.0, std::ceil(vmax * 3.6 / 10.0 + 0.05) * 10.0);
}

std::vector<Window> hazard_clusters(const CheckResult& c, std::size_t min_hazards, double max_gap_m) {
  std::vector<Window> out;
  const double length = c.analysis.stations.empty() ? 0.0 : c.analysis.stations.back().distance_m;
  std::vector<const Hazard*> corners;
  for (const Hazard& h : c.hazards) {
    if (h.corner) corners.push_back(&h);
  }
  std::size_t k = 0;
  while (k < corners.size()) {
    std::size_t m = k;
    while (m + 1 < corners.size() && corners[m + 1]->at_m - corners[m]->end_m <= max_gap_m) ++m;
    if (m - k + 1 >= min_hazards) {
      out.push_back({std::max(0.0, corners[k]->at_m - 700.0), std::min(length, corners[m]->end_m + 300.0)});
    }
    k = m + 1;
  }
  return out;
}

std::string speed_chart_svg(const CheckResult& c, std::size_t cls, double vmax_kmh) {
  const double length = c.analysis.stations.empty() ? 0.0 : c.analysis.stations.back().distance_m;
  return speed_chart_svg(c, cls, vmax_kmh, Window{0.0, length}, kWidth, "");
}

std::string speed_chart_svg(const CheckResult& c, std::size_t cls, double vmax_kmh, const Window& win,
                            double width, const std::string& id_suffix) {
  const SpeedProfile& sp = c.speeds.at(cls);
  const RiderClass& rider = c.classes.at(cls);
  const std::vector<double> dist = station_distances(c);
  const double span = std::max(win.end_m - win.start_m, 1.0);
  const bool closeup = width < kWidth;
  const double left = closeup ? 40.0 : 58.0, right = 12.0, plot_w = width - left - right;
  const double top = 24.0, plot_h = closeup ? 120.0 : 132.0, bottom = 22.0, height = top + plot_h + bottom;
  const Axis x{win.start_m, win.start_m + span, left, left + plot_w};
  const Axis y{0.0, vmax_kmh, top + plot_h, top};
  auto inside = [&](double d) { return d >= win.start_m - 1e-6 && d <= win.end_m + 1e-6; };
  const std::string id = "speed-" + escape_markup(rider.name) + id_suffix;
  std::string o = "<svg id=\"" + id + "\" class=\"chart speed-chart" + (closeup ? " closeup" : "") +
                  "\" viewBox=\"0 0 " + n1(width) + " " + n1(height) + "\" role=\"img\" aria-label=\"" +
                  escape_markup("Planned and unbraked speed of " + rider.name + " from km " +
                                fmt_fixed(win.start_m / 1000.0, 1) + " to km " + fmt_fixed(win.end_m / 1000.0, 1)) +
                  "\">";
  o += "<rect class=\"plot-bg\" x=\"" + n1(left) + "\" y=\"" + n1(top) + "\" width=\"" + n1(plot_w) +
       "\" height=\"" + n1(plot_h) + "\"/>";
  const double vstep = vmax_kmh > 60.0 ? 20.0 : 10.0;
  o += "<g class=\"grid\">";
  for (double v = 0.0; v <= vmax_kmh + 1e-9; v += vstep) {
    o += "<line x1=\"" + n1(left) + "\" y1=\"" + n1(y(v)) + "\" x2=\"" + n1(left + plot_w) + "\" y2=\"" + n1(y(v)) + "\"/>";
    o += "<text class=\"tick\" x=\"" + n1(left - 6) + "\" y=\"" + n1(y(v) + 4) + "\" text-anchor=\"end\">" +
         fmt_fixed(v, 0) + "</text>";
  }
  o += "</g>";
  {
    // Km grid of the window.
    const double step_km = nice_step(span / 1000.0, closeup ? 6.0 : 14.0);
    o += "<g class=\"grid\">";
    for (double km = std::ceil(win.start_m / 1000.0 / step_km - 1e-9) * step_km; km * 1000.0 <= win.end_m + 1e-6;
         km += step_km) {
      const double px = x(km * 1000.0);
      o += "<line x1=\"" + n1(px) + "\" y1=\"" + n1(top) + "\" x2=\"" + n1(px) + "\" y2=\"" + n1(top + plot_h) +
           "\"/><text class=\"tick\" x=\"" + n1(px) + "\" y=\"" + n1(top + plot_h + 14) + "\" text-anchor=\"middle\">" +
           km_label(km) + "</text>";
    }
    o += "</g>";
  }
  o += "<text class=\"axis-label\" x=\"" + n1(left - 6) + "\" y=\"" + n1(top - 8) + "\" text-anchor=\"end\">km/h</text>";
  if (closeup) {
    o += "<text class=\"chart-title\" x=\"" + n1(left + 4) + "\" y=\"" + n1(top + 14) + "\">" + escape_markup(rider.name) +
         "</text>";
  }
  // Fast-section threshold.
  const double fast = c.hazard_options.fast_speed_mps * 3.6;
  if (fast < vmax_kmh) {
    o += "<line class=\"threshold\" x1=\"" + n1(left) + "\" y1=\"" + n1(y(fast)) + "\" x2=\"" + n1(left + plot_w) +
         "\" y2=\"" + n1(y(fast)) + "\"/>";
    if (!closeup) {
      o += "<text class=\"threshold-label\" x=\"" + n1(left + plot_w - 4) + "\" y=\"" + n1(y(fast) - 4) +
           "\" text-anchor=\"end\">fast above " + fmt_fixed(fast, 0) + " km/h</text>";
    }
  }
  const std::size_t n = std::min({dist.size(), sp.planned_speed_mps.size(), sp.unbraked_speed_mps.size()});
  // Stations of the window (one more each side so the lines reach the frame).
  std::size_t i0 = 0, i1 = n;
  while (i0 + 1 < n && dist[i0 + 1] < win.start_m) ++i0;
  while (i1 > 0 && i1 - 1 > i0 && dist[i1 - 2] > win.end_m) --i1;
  if (i1 - i0 >= 2) {
    std::vector<double> xpx, planned, unbraked;
    for (std::size_t i = i0; i < i1; ++i) {
      xpx.push_back(std::clamp(x(dist[i]), left, left + plot_w));
      planned.push_back(sp.planned_speed_mps[i] * 3.6);
      unbraked.push_back(sp.unbraked_speed_mps[i] * 3.6);
    }
    const std::size_t m = xpx.size();
    // Where the planned ride is slower than the unbraked one (slowing for corners): per pixel
    // column, from the lowest planned to the highest unbraked speed.
    std::string zones;
    std::vector<std::pair<double, double>> upper, lower;
    auto flush = [&]() {
      if (upper.size() >= 2) {
        std::vector<std::pair<double, double>> pts = upper;
        pts.insert(pts.end(), lower.rbegin(), lower.rend());
        zones += "<path d=\"" + path_from(pts) + "Z\"/>";
      }
      upper.clear();
      lower.clear();
    };
    std::size_t i = 0;
    while (i < m) {
      const double col = std::floor(xpx[i]);
      double pmin = planned[i], umax = unbraked[i];
      double xs = 0.0;
      std::size_t count = 0;
      while (i < m && std::floor(xpx[i]) == col) {
        pmin = std::min(pmin, planned[i]);
        umax = std::max(umax, unbraked[i]);
        xs += xpx[i];
        ++count;
        ++i;
      }
      if (umax - pmin > 0.5) {
        const double cx = closeup ? xs / static_cast<double>(count) : col + 0.5;
        upper.emplace_back(cx, y(umax));
        lower.emplace_back(cx, y(pmin));
      } else {
        flush();
      }
    }
    flush();
    o += "<g class=\"slowing\">" + zones + "</g>";
    std::vector<std::pair<double, double>> u, pl;
    for (std::size_t j : envelope_indices(xpx, unbraked)) u.emplace_back(xpx[j], y(unbraked[j]));
    for (std::size_t j : envelope_indices(xpx, planned)) pl.emplace_back(xpx[j], y(planned[j]));
    o += "<path class=\"unbraked-line\" d=\"" + path_from(u) + "\"/>";
    o += "<path class=\"planned-line\" d=\"" + path_from(pl) + "\"/>";
    // Corners: this class's safe speed as a bar; where it arrives faster, a bar up to its
    // unbraked entry speed in the colour of the class's severity there.
    std::vector<double> all_unbraked(n);
    for (std::size_t q = 0; q < n; ++q) all_unbraked[q] = sp.unbraked_speed_mps[q] * 3.6;
    std::vector<double> dn(dist.begin(), dist.begin() + static_cast<std::ptrdiff_t>(n));
    const double half = closeup ? 6.0 : 4.0;
    std::string bars = "<g class=\"corner-marks\">";
    for (std::size_t k = 0; k < c.corners.size() && k < c.path_radius_m.size(); ++k) {
      const Corner& corner = c.corners[k];
      if (!inside(corner.entry_m)) continue;
      const double safe = safe_kmh(c, cls, k);
      if (!(safe < vmax_kmh)) continue;  // a corner that never limits this class
      const double entry = interpolate(dn, all_unbraked, corner.entry_m);
      const double cx = x(corner.entry_m);
      Severity sev = Severity::none;
      if (const Hazard* h = hazard_for_corner(c, k)) {
        for (const auto& a : h->classes) {
          if (a.class_name == rider.name) sev = a.severity;
        }
      }
      if (entry > safe + 0.05) {
        const char* colour = sev == Severity::none || sev == Severity::note ? "#3f5568" : severity_look(sev).fill;
        bars += "<line class=\"excess\" x1=\"" + n1(cx) + "\" y1=\"" + n1(y(safe)) + "\" x2=\"" + n1(cx) + "\" y2=\"" +
                n1(y(std::min(entry, vmax_kmh))) + "\" stroke=\"" + colour + "\"/>";
      }
      bars += "<line class=\"safe-bar\" x1=\"" + n1(cx - half) + "\" y1=\"" + n1(y(safe)) + "\" x2=\"" + n1(cx + half) +
              "\" y2=\"" + n1(y(safe)) + "\"><title>" +
              escape_markup("corner at km " + fmt_fixed(corner.entry_m / 1000.0, 2) + ": safe " + fmt_fixed(safe, 0) +
                            " km/h, arrives unbraked at " + fmt_fixed(entry, 0) + " km/h") +
              "</title></line>";
    }
    o += bars + "</g>";
  }
  // Numbers of the hazards that concern this class, along the top.
  std::vector<const Hazard*> mine;
  for (const Hazard& h : c.hazards) {
    if (hazard_touches_class(h, rider.name) && inside(h.at_m)) mine.push_back(&h);
  }
  if (!mine.empty()) {
    std::vector<double> want;
    for (const Hazard* h : mine) want.push_back(x(h->at_m));
    const double tag = closeup ? 8.0 : 6.0;
    const auto at = spread_positions(want, 2.0 * tag + 1.0, left + tag, left + plot_w - tag);
    o += "<g class=\"hazard-tags\">";
    for (std::size_t q = 0; q < mine.size(); ++q) {
      const Hazard& h = *mine[q];
      std::string lower = hazard_code(h.number, c.hazards.size());
      lower[0] = 'h';
      if (std::fabs(at[q] - want[q]) > 1.0) {
        o += "<line class=\"leader\" x1=\"" + n1(at[q]) + "\" y1=\"" + n1(11.0 + tag) + "\" x2=\"" + n1(want[q]) +
             "\" y2=\"" + n1(top) + "\"/>";
      }
      o += "<a href=\"#hazard-" + lower + "\"><g class=\"hazard-tag\"><title>" + marker_title(h, c.hazards.size()) +
           "</title>" + severity_shape(h.severity, at[q], 11.0, tag) + "<text x=\"" + n1(at[q]) + "\" y=\"" +
           n1(11.0 + tag * 0.43) + "\" font-size=\"" + n1(tag * 1.15) + "\" fill=\"" + severity_look(h.severity).ink +
           "\" class=\"mk\">" + std::to_string(h.number) + "</text></g></a>";
    }
    o += "</g>";
  }
  o += "</svg>";
  return o;
}

// ---- plan view

namespace {

// What part of the plane a plan shows and how.
struct PlanFrame {
  double xmin, xmax, ymin, ymax;  // metres, local projection
  double width;                   // viewBox width
  double max_height;
  std::string id;
  std::string marker_class;  // "hazard-marker" (overview) or "closeup-marker"
  std::string id_prefix;     // marker ids, "" = none
  bool closeup;
};

// The strip below a plan `height` units tall: scale bar on the left, grid-north arrow on the
// right. `scale` is picture units per metre.
std::string plan_strip(double width, double height, double scale) {
  double bar_m = 10.0;
  for (double m : {10.0, 20.0, 50.0, 100.0, 200.0, 500.0, 1000.0, 2000.0, 5000.0, 10000.0, 20000.0, 50000.0, 100000.0}) {
    if (m * scale <= 0.25 * width) bar_m = m;
  }
  const double w = bar_m * scale, bx = 16.0, by = height + 12.0;
  std::string o = "<rect class=\"plan-strip\" x=\"0\" y=\"" + n1(height) + "\" width=\"" + n1(width) + "\" height=\"36\"/>";
  o += "<g class=\"scale-bar\"><rect x=\"" + n1(bx) + "\" y=\"" + n1(by) + "\" width=\"" + n1(w / 2) +
       "\" height=\"6\" class=\"dark\"/><rect x=\"" + n1(bx + w / 2) + "\" y=\"" + n1(by) + "\" width=\"" + n1(w / 2) +
       "\" height=\"6\" class=\"light\"/><text x=\"" + n1(bx) + "\" y=\"" + n1(by + 20) + "\">0</text><text x=\"" +
       n1(bx + w) + "\" y=\"" + n1(by + 20) + "\" text-anchor=\"middle\">" +
       (bar_m >= 1000.0 ? fmt_fixed(bar_m / 1000.0, 0) + " km" : fmt_fixed(bar_m, 0) + " m") + "</text></g>";
  const double nx = width - 74.0, ny = height + 6.0;
  o += "<g class=\"north\"><path class=\"dark\" d=\"M" + n1(nx) + " " + n1(ny) + "L" + n1(nx + 6) + " " + n1(ny + 20) +
       "L" + n1(nx) + " " + n1(ny + 16) + "Z\"/><path class=\"light\" d=\"M" + n1(nx) + " " + n1(ny) + "L" + n1(nx - 6) +
       " " + n1(ny + 20) + "L" + n1(nx) + " " + n1(ny + 16) + "Z\"/><text x=\"" + n1(nx + 11) + "\" y=\"" + n1(ny + 15) +
       "\"><tspan class=\"north-n\">N</tspan> grid</text></g>";
  return o;
}

std::string draw_plan(const CheckResult& c, const PlanFrame& f) {
  const auto& st = c.analysis.stations;
  const std::vector<double> dist = station_distances(c);
  const double length = dist.empty() ? 0.0 : dist.back();
  const double pad = f.closeup ? 30.0 : 56.0, avail_w = f.width - 2 * pad;
  const double dx = std::max(f.xmax - f.xmin, 1.0), dy = std::max(f.ymax - f.ymin, 1.0);
  const double scale = std::min(avail_w / dx, (f.max_height - 2 * pad) / dy);
  const double height = std::max(f.closeup ? 240.0 : 380.0, dy * scale + 2 * pad);
  const double ox = pad + (avail_w - dx * scale) / 2.0;
  const double oy = (height - dy * scale) / 2.0;
  auto px = [&](double xm) { return ox + (xm - f.xmin) * scale; };
  auto py = [&](double ym) { return oy + (f.ymax - ym) * scale; };
  auto in_view = [&](double X, double Y, double margin) {
    return X >= -margin && X <= f.width + margin && Y >= -margin && Y <= height + margin;
  };

  std::string o = "<svg id=\"" + f.id + "\" class=\"chart plan" + (f.closeup ? " closeup" : "") + "\" viewBox=\"0 0 " +
                  n1(f.width) + " " + n1(height + 36.0) + "\" role=\"img\" aria-label=\"" +
                  (f.closeup ? std::string("Close-up plan") : std::string("Plan view of the course")) +
                  " in the local projection, up is grid north, with numbered hazards\">";
  o += "<rect class=\"plan-bg\" x=\"0.5\" y=\"0.5\" width=\"" + n1(f.width - 1) + "\" height=\"" + n1(height - 1) + "\"/>";
  // Course line, thinned to steps of at least 0.8 px, broken where it leaves the frame.
  std::string d;
  {
    double lx = 0, ly = 0;
    bool pen = false;
    for (std::size_t i = 0; i < st.size(); ++i) {
      const double X = px(st[i].x_m), Y = py(st[i].y_m);
      if (!in_view(X, Y, 60.0)) {
        if (pen) d += "L" + n1(X) + " " + n1(Y);
        pen = false;
        continue;
      }
      if (pen && i + 1 < st.size() && std::hypot(X - lx, Y - ly) < 0.8) continue;
      d += (pen ? "L" : "M") + n1(X) + " " + n1(Y);
      pen = true;
      lx = X;
      ly = Y;
    }
  }
  o += "<path class=\"course-halo\" d=\"" + d + "\"/><path class=\"course-line\" d=\"" + d + "\"/>";
  std::vector<std::array<double, 3>> obstacles;  // x, y, radius: places markers keep clear of
  // Km ticks with labels on the left of the direction of travel, and arrows between them.
  if (st.size() >= 2 && length > 0.0) {
    const double view_km = f.closeup ? (std::max(dx, dy) * 3.0) / 1000.0 : length / 1000.0;
    const double step_km = f.closeup ? nice_step(view_km, 6.0) : std::max(1.0, nice_step(view_km, 14.0));
    std::string ticks = "<g class=\"km-ticks\">", arrows = "<g class=\"direction\">";
    for (double km = step_km; km * 1000.0 < length - 1.0; km += step_km) {
      const std::size_t i = nearest_station(dist, km * 1000.0);
      const double X = px(st[i].x_m), Y = py(st[i].y_m), h = st[i].heading_rad;
      if (!in_view(X, Y, 0.0)) continue;
      const double lx = -std::cos(h), ly = -std::sin(h);  // left of travel, in SVG coordinates
      ticks += "<circle cx=\"" + n1(X) + "\" cy=\"" + n1(Y) + "\" r=\"2.8\"/><text x=\"" + n1(X + 12 * lx) + "\" y=\"" +
               n1(Y + 12 * ly + 3.5) + "\" text-anchor=\"middle\">" + km_label(km) + "</text>";
      obstacles.push_back({X + 12 * lx, Y + 12 * ly, 9.0});
    }
    for (double km = step_km / 2.0; km * 1000.0 < length - 1.0; km += step_km) {
      const std::size_t i = nearest_station(dist, km * 1000.0);
      const double X = px(st[i].x_m), Y = py(st[i].y_m), h = st[i].heading_rad;
      if (!in_view(X, Y, 0.0)) continue;
      const double fx = std::sin(h), fy = -std::cos(h), lx = -fy, ly = fx;
      arrows += "<path d=\"M" + n1(X - 5 * fx + 4 * lx) + " " + n1(Y - 5 * fy + 4 * ly) + "L" + n1(X + 3 * fx) + " " +
                n1(Y + 3 * fy) + "L" + n1(X - 5 * fx - 4 * lx) + " " + n1(Y - 5 * fy - 4 * ly) + "\"/>";
    }
    o += arrows + "</g>" + ticks + "</g>";
  }
  // Start and finish, labelled on the side away from the course's first kilometre.
  if (!st.empty()) {
    const double sx = px(st.front().x_m), sy = py(st.front().y_m);
    const double fx = px(st.back().x_m), fy = py(st.back().y_m);
    const bool close = std::hypot(sx - fx, sy - fy) < 40.0;
    std::string ends = "<g class=\"ends\">";
    if (in_view(sx, sy, 0.0)) {
      ends += "<rect class=\"start\" x=\"" + n1(sx - 5) + "\" y=\"" + n1(sy - 5) + "\" width=\"10\" height=\"10\"/>";
    }
    if (in_view(fx, fy, 0.0)) {
      ends += "<circle class=\"finish\" cx=\"" + n1(fx) + "\" cy=\"" + n1(fy) + "\" r=\"6.5\"/><circle class=\"finish-dot\" cx=\"" +
              n1(fx) + "\" cy=\"" + n1(fy) + "\" r=\"2.4\"/>";
    }
    auto label = [&](double X, double Y, const std::string& text) {
      if (!in_view(X, Y, 0.0)) return;
      // Put the label opposite the direction the course leaves or arrives from.
      const double w = 7.0 * static_cast<double>(text.size());
      const bool to_left = X > f.width - w - 20.0 || (X > w + 20.0 && st.size() > 1 && px(st[std::min<std::size_t>(st.size() - 1, 40)].x_m) > X);
      const double tx = to_left ? X - 10.0 - w : X + 10.0, ty = Y + 4.5;
      ends += "<text class=\"end-label\" x=\"" + n1(tx) + "\" y=\"" + n1(ty) + "\">" + text + "</text>";
      for (double q = 0.0; q <= w; q += 10.0) obstacles.push_back({tx + q, ty - 4.0, 9.0});
    };
    if (close) {
      label(0.5 * (sx + fx), 0.5 * (sy + fy), "start \xc2\xb7 finish");
    } else {
      label(sx, sy, "start");
      label(fx, fy, "finish");
    }
    o += ends + "</g>";
  }
  // Hazard markers: greedy placement, most severe first, each as near its place as the others
  // allow, with a leader line when moved.
  std::vector<std::size_t> shown;
  std::vector<std::pair<double, double>> spot;
  for (std::size_t k = 0; k < c.hazards.size(); ++k) {
    const std::size_t i = nearest_station(dist, c.hazards[k].at_m);
    const double X = px(st[i].x_m), Y = py(st[i].y_m);
    if (f.closeup && !in_view(X, Y, -8.0)) continue;
    shown.push_back(k);
    spot.emplace_back(X, Y);
  }
  const std::size_t nh = shown.size();
  if (nh > 0) {
    const double r = f.closeup ? 10.0 : 9.0;
    std::vector<std::pair<double, double>> placed(nh);
    std::vector<bool> done(nh, false);
    std::vector<std::size_t> order(nh);
    for (std::size_t k = 0; k < nh; ++k) order[k] = k;
    std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
      return static_cast<int>(c.hazards[shown[a]].severity) > static_cast<int>(c.hazards[shown[b]].severity);
    });
    const std::array<double, 11> rings{0, 22, 32, 44, 58, 74, 92, 112, 136, 164, 200};
    for (std::size_t k : order) {
      bool found = false;
      for (std::size_t ring = 0; ring < rings.size() && !found; ++ring) {
        const int steps = ring == 0 ? 1 : 16;
        for (int s = 0; s < steps && !found; ++s) {
          const double a = (static_cast<double>(s) + 0.5 * static_cast<double>(ring % 2)) * 2.0 * kPi / steps - kPi / 2.0;
          const double cx = spot[k].first + rings[ring] * std::cos(a), cy = spot[k].second + rings[ring] * std::sin(a);
          if (cx < r + 3 || cx > f.width - r - 3 || cy < r + 3 || cy > height - r - 3) continue;
          bool clear = true;
          for (std::size_t j = 0; j < nh && clear; ++j) {
            if (done[j] && std::hypot(cx - placed[j].first, cy - placed[j].second) < 2 * r + 2) clear = false;
            if (j != k && std::hypot(cx - spot[j].first, cy - spot[j].second) < r + 4) clear = false;
          }
          for (const auto& ob : obstacles) {
            if (clear && std::hypot(cx - ob[0], cy - ob[1]) < r + ob[2]) clear = false;
          }
          if (clear) {
            placed[k] = {cx, cy};
            found = true;
          }
        }
      }
      if (!found) placed[k] = spot[k];
      done[k] = true;
    }
    std::string leaders = "<g class=\"leaders\">", markers = "<g class=\"markers\">";
    for (std::size_t k = 0; k < nh; ++k) {
      if (std::hypot(placed[k].first - spot[k].first, placed[k].second - spot[k].second) > 1.0) {
        leaders += "<line x1=\"" + n1(spot[k].first) + "\" y1=\"" + n1(spot[k].second) + "\" x2=\"" + n1(placed[k].first) +
                   "\" y2=\"" + n1(placed[k].second) + "\"/>";
      }
      leaders += "<circle cx=\"" + n1(spot[k].first) + "\" cy=\"" + n1(spot[k].second) + "\" r=\"2.4\"/>";
      markers += hazard_marker(c.hazards[shown[k]], c.hazards.size(), f.id_prefix, placed[k].first, placed[k].second, r,
                               f.marker_class);
    }
    o += leaders + "</g>" + markers + "</g>";
  }
  // A strip below the plan for the scale bar (left) and the grid-north arrow (right), so that
  // neither ever covers the course.
  o += plan_strip(f.width, height, scale);
  o += "</svg>";
  return o;
}

}  // namespace

std::string plan_view_svg(const CheckResult& c) {
  const auto& st = c.analysis.stations;
  PlanFrame f{0, 1, 0, 1, kWidth, 700.0, "plan-view", "hazard-marker", "plan-", false};
  if (!st.empty()) {
    f.xmin = f.xmax = st[0].x_m;
    f.ymin = f.ymax = st[0].y_m;
    for (const auto& s : st) {
      f.xmin = std::min(f.xmin, s.x_m);
      f.xmax = std::max(f.xmax, s.x_m);
      f.ymin = std::min(f.ymin, s.y_m);
      f.ymax = std::max(f.ymax, s.y_m);
    }
  }
  return draw_plan(c, f);
}

std::string plan_closeup_svg(const CheckResult& c, const Window& w, std::size_t number) {
  const auto& st = c.analysis.stations;
  PlanFrame f{0, 1, 0, 1, 470.0, 400.0, "plan-closeup-" + std::to_string(number), "closeup-marker", "", true};
  // Frame the hazards of the stretch (from the first one's place to the last one's end), not
  // the whole approach: that is what the overview cannot show.
  double from = w.end_m, to = w.start_m;
  for (const Hazard& h : c.hazards) {
    if (h.at_m < w.start_m || h.at_m > w.end_m) continue;
    from = std::min(from, h.at_m);
    to = std::max(to, h.corner ? h.end_m : h.at_m);
  }
  if (!(to >= from)) {
    from = w.start_m;
    to = w.end_m;
  }
  bool first = true;
  for (const auto& s : st) {
    if (s.distance_m < from - 30.0 || s.distance_m > to + 30.0) continue;
    if (first) {
      f.xmin = f.xmax = s.x_m;
      f.ymin = f.ymax = s.y_m;
      first = false;
    }
    f.xmin = std::min(f.xmin, s.x_m);
    f.xmax = std::max(f.xmax, s.x_m);
    f.ymin = std::min(f.ymin, s.y_m);
    f.ymax = std::max(f.ymax, s.y_m);
  }
  // Room around the stretch for the markers, and at least 300 m across.
  const double cx = 0.5 * (f.xmin + f.xmax), cy = 0.5 * (f.ymin + f.ymax);
  const double half = 0.5 * std::max({f.xmax - f.xmin, f.ymax - f.ymin, 250.0}) * 1.3;
  f.xmin = std::min(f.xmin, cx - half);
  f.xmax = std::max(f.xmax, cx + half);
  f.ymin = std::min(f.ymin, cy - half * 0.7);
  f.ymax = std::max(f.ymax, cy + half * 0.7);
  const double mx = 0.12 * (f.xmax - f.xmin), my = 0.12 * (f.ymax - f.ymin);
  f.xmin -= mx;
  f.xmax += mx;
  f.ymin -= my;
  f.ymax += my;
  return draw_plan(c, f);
}

// ---- marshal briefing: sector plans and key maps

namespace {

// Narrower than the other charts: the plan takes three quarters of the page's width, and its
// labels must stay legible when printed.
constexpr double kSectorWidth = 720.0;
constexpr double kSectorHeight = 380.0;

// A course line through the stations [i0, i1) in picture coordinates, thinned to steps of at
// least 0.8 units and broken where it leaves the view (with `margin` to spare).
template <class Px, class Py, class InView>
std::string course_path(const std::vector<Station>& st, std::size_t i0, std::size_t i1, Px px, Py py, InView in_view) {
  std::string d;
  double lx = 0, ly = 0;
  bool pen = false;
  for (std::size_t i = i0; i < i1 && i < st.size(); ++i) {
    const double X = px(st[i].x_m), Y = py(st[i].y_m);
    if (!in_view(X, Y)) {
      if (pen) d += "L" + n1(X) + " " + n1(Y);
      pen = false;
      continue;
    }
    if (pen && i + 1 < i1 && std::hypot(X - lx, Y - ly) < 0.8) continue;
    d += (pen ? "L" : "M") + n1(X) + " " + n1(Y);
    pen = true;
    lx = X;
    ly = Y;
  }
  return d;
}

// First station at or after `from_m` and one past the last station at or before `to_m`.
std::pair<std::size_t, std::size_t> station_range(const std::vector<double>& dist, double from_m, double to_m) {
  const auto a = std::lower_bound(dist.begin(), dist.end(), from_m);
  const auto b = std::upper_bound(dist.begin(), dist.end(), to_m);
  return {static_cast<std::size_t>(a - dist.begin()), static_cast<std::size_t>(b - dist.begin())};
}

struct LabelBox {
  double cx, cy, w, h;
};

bool boxes_overlap(const LabelBox& a, const LabelBox& b, double gap) {
  return std::fabs(a.cx - b.cx) < 0.5 * (a.w + b.w) + gap && std::fabs(a.cy - b.cy) < 0.5 * (a.h + b.h) + gap;
}

bool box_covers(const LabelBox& a, double x, double y, double gap) {
  return std::fabs(a.cx - x) < 0.5 * a.w + gap && std::fabs(a.cy - y) < 0.5 * a.h + gap;
}

// Places label boxes near their spots, in the given order: never over another label or another
// spot, inside the frame, and as little over the course line (`line` points) as the room allows,
// preferring the nearest place. Returns the boxes, parallel to `spots`.
std::vector<LabelBox> place_labels(const std::vector<std::pair<double, double>>& spots, const std::vector<double>& widths,
                                   double h, const std::vector<std::pair<double, double>>& line, double frame_w,
                                   double frame_h) {
  std::vector<LabelBox> placed;
  static const std::array<double, 12> rings{18, 24, 32, 42, 54, 68, 84, 104, 128, 156, 190, 230};
  for (std::size_t k = 0; k < spots.size(); ++k) {
    const auto [sx, sy] = spots[k];
    const double w = widths[k];
    LabelBox best{sx, sy - 24.0, w, h};
    double best_score = std::numeric_limits<double>::infinity();
    for (double radius : rings) {
      for (int q = 0; q < 16; ++q) {
        const double a = kPi / 8.0 * q - kPi / 2.0;
        // Stretch the ring sideways: labels are wider than tall.
        const LabelBox box{sx + std::cos(a) * (radius + 0.35 * w), sy + std::sin(a) * radius, w, h};
        if (box.cx - w / 2 < 3 || box.cx + w / 2 > frame_w - 3 || box.cy - h / 2 < 3 || box.cy + h / 2 > frame_h - 3) {
          continue;
        }
        bool hard = false;
        for (const auto& other : placed) hard = hard || boxes_overlap(box, other, 3.0);
        for (const auto& [ox, oy] : spots) hard = hard || box_covers(box, ox, oy, 5.0);
        if (hard) continue;
        int crossings = 0;
        for (const auto& [lx, ly] : line) crossings += box_covers(box, lx, ly, 2.0) ? 1 : 0;
        const double score = 25.0 * crossings + radius;
        if (score < best_score) {
          best_score = score;
          best = box;
        }
      }
    }
    placed.push_back(best);
  }
  return placed;
}

std::string hhmm(double clock_s) {
  if (!std::isfinite(clock_s)) return "-";
  const long long total = std::llround(clock_s / 60.0);
  const long long a = total < 0 ? -total : total;
  auto two = [](long long v) { return (v < 10 ? "0" : "") + std::to_string(v); };
  return (total < 0 ? "-" : "") + two(a / 60) + ":" + two(a % 60);
}

}  // namespace

std::string post_anchor(const std::string& code) {
  std::string out = code;
  for (char& ch : out) ch = static_cast<char>(std::tolower(static_cast<unsigned char>(ch)));
  return out;
}

PlanBounds sector_bounds(const CheckResult& c, const MarshalPlan& plan, std::size_t s, double aspect) {
  const Sector& sec = plan.sectors.at(s);
  const auto& st = c.analysis.stations;
  double from = std::numeric_limits<double>::infinity(), to = -from;
  for (std::size_t p : sec.posts) {
    from = std::min(from, plan.posts.at(p).first_m);
    to = std::max(to, plan.posts.at(p).last_m);
  }
  if (!(to >= from)) {
    from = sec.from_m;
    to = sec.to_m;
  }
  PlanBounds b;
  bool first = true;
  for (const auto& station : st) {
    if (station.distance_m < from - 250.0 || station.distance_m > to + 250.0) continue;
    if (first) {
      b = {station.x_m, station.x_m, station.y_m, station.y_m};
      first = false;
    }
    b.xmin = std::min(b.xmin, station.x_m);
    b.xmax = std::max(b.xmax, station.x_m);
    b.ymin = std::min(b.ymin, station.y_m);
    b.ymax = std::max(b.ymax, station.y_m);
  }
  if (first && !st.empty()) b = {st.front().x_m, st.front().x_m, st.front().y_m, st.front().y_m};
  const double cx = 0.5 * (b.xmin + b.xmax), cy = 0.5 * (b.ymin + b.ymax);
  // Room for the labels around the stretch: a quarter more each way and 80 m at least.
  double w = std::max(b.xmax - b.xmin, 600.0) * 1.25 + 160.0;
  double h = std::max(b.ymax - b.ymin, 250.0) * 1.25 + 160.0;
  if (w / h < aspect) {
    w = h * aspect;
  } else {
    h = w / aspect;
  }
  return {cx - w / 2, cx + w / 2, cy - h / 2, cy + h / 2};
}

std::string sector_plan_svg(const CheckResult& c, const MarshalPlan& plan, std::size_t s) {
  const Sector& sec = plan.sectors.at(s);
  const auto& st = c.analysis.stations;
  const std::vector<double> dist = station_distances(c);
  const double length = dist.empty() ? 0.0 : dist.back();
  const double W = kSectorWidth, H = kSectorHeight;
  const PlanBounds b = sector_bounds(c, plan, s, W / H);
  const double scale = W / (b.xmax - b.xmin);
  auto px = [&](double xm) { return (xm - b.xmin) * scale; };
  auto py = [&](double ym) { return (b.ymax - ym) * scale; };
  auto in_view = [&](double X, double Y) { return X >= -60 && X <= W + 60 && Y >= -60 && Y <= H + 60; };
  auto inside = [&](double X, double Y) { return X >= 0 && X <= W && Y >= 0 && Y <= H; };
  const std::string number = std::to_string(s + 1);
  std::string o = "<svg id=\"sector-plan-" + number + "\" class=\"chart plan sector-plan\" viewBox=\"0 0 " + n1(W) + " " +
                  n1(H + 36.0) + "\" role=\"img\" aria-label=\"" +
                  escape_markup("Plan of " + sec.name + " in the local projection, up is grid north, with its " +
                                std::to_string(sec.posts.size()) + " marshal posts") +
                  "\">";
  o += "<defs><clipPath id=\"sector-clip-" + number + "\"><rect x=\"0\" y=\"0\" width=\"" + n1(W) + "\" height=\"" + n1(H) +
       "\"/></clipPath></defs>";
  o += "<rect class=\"plan-bg\" x=\"0.5\" y=\"0.5\" width=\"" + n1(W - 1) + "\" height=\"" + n1(H - 1) + "\"/>";
  o += "<g clip-path=\"url(#sector-clip-" + number + ")\">";
  // The whole course in grey, the sector's own stretch in bold over it.
  o += "<path class=\"course-other\" d=\"" + course_path(st, 0, st.size(), px, py, in_view) + "\"/>";
  const auto [a0, a1] = station_range(dist, sec.from_m, sec.to_m);
  const std::string bold = course_path(st, a0 > 0 ? a0 - 1 : 0, std::min(st.size(), a1 + 1), px, py, in_view);
  o += "<path class=\"course-halo\" d=\"" + bold + "\"/><path class=\"course-line\" d=\"" + bold + "\"/>";
  // Posts spread along the course: a band over their stretch.
  std::string spans = "<g class=\"post-spans\">";
  for (std::size_t p : sec.posts) {
    const MarshalPost& post = plan.posts.at(p);
    if (!(post.spread_m > 1.0)) continue;
    const auto [i0, i1] = station_range(dist, post.first_m, post.last_m);
    spans += "<path d=\"" + course_path(st, i0, i1, px, py, in_view) + "\"/>";
  }
  o += spans + "</g></g>";
  // Spots to keep clear and course points the labels should not hide.
  std::vector<std::pair<double, double>> line;
  {
    double lx = -1e9, ly = -1e9;
    for (const auto& station : st) {
      const double X = px(station.x_m), Y = py(station.y_m);
      if (!inside(X, Y) || std::hypot(X - lx, Y - ly) < 4.0) continue;
      line.emplace_back(X, Y);
      lx = X;
      ly = Y;
    }
  }
  // Km ticks and direction arrows along the sector's stretch.
  if (st.size() >= 2 && length > 0.0) {
    const double step_km = std::max(0.1, nice_step((b.xmax - b.xmin) / 1000.0 * 1.5, 7.0));
    std::string ticks = "<g class=\"km-ticks\">", arrows = "<g class=\"direction\">";
    for (double km = std::ceil(sec.from_m / 1000.0 / step_km - 1e-9) * step_km; km * 1000.0 <= sec.to_m + 1e-6;
         km += step_km) {
      if (km * 1000.0 < 1.0 || km * 1000.0 > length - 1.0) continue;
      const std::size_t i = nearest_station(dist, km * 1000.0);
      const double X = px(st[i].x_m), Y = py(st[i].y_m), hd = st[i].heading_rad;
      if (!inside(X, Y)) continue;
      const double lx = -std::cos(hd), ly = -std::sin(hd);  // left of travel, in SVG coordinates
      if (!inside(X + 14 * lx, Y + 14 * ly) || X + 14 * lx < 14 || X + 14 * lx > W - 14 || Y + 14 * ly < 12 ||
          Y + 14 * ly > H - 8) {
        continue;
      }
      ticks += "<circle cx=\"" + n1(X) + "\" cy=\"" + n1(Y) + "\" r=\"2.8\"/><text x=\"" + n1(X + 14 * lx) + "\" y=\"" +
               n1(Y + 14 * ly + 3.5) + "\" text-anchor=\"middle\">" + km_label(km) + "</text>";
      for (double q = -8.0; q <= 8.0; q += 8.0) line.emplace_back(X + 14 * lx + q, Y + 14 * ly);
    }
    for (double km = (std::ceil(sec.from_m / 1000.0 / step_km - 1e-9) + 0.5) * step_km; km * 1000.0 <= sec.to_m;
         km += step_km) {
      if (km * 1000.0 > length - 1.0) continue;
      const std::size_t i = nearest_station(dist, km * 1000.0);
      const double X = px(st[i].x_m), Y = py(st[i].y_m), hd = st[i].heading_rad;
      if (!inside(X, Y)) continue;
      const double fx = std::sin(hd), fy = -std::cos(hd), lx = -fy, ly = fx;
      arrows += "<path d=\"M" + n1(X - 6 * fx + 5 * lx) + " " + n1(Y - 6 * fy + 5 * ly) + "L" + n1(X + 4 * fx) + " " +
                n1(Y + 4 * fy) + "L" + n1(X - 6 * fx - 5 * lx) + " " + n1(Y - 6 * fy - 5 * ly) + "\"/>";
    }
    o += arrows + "</g>" + ticks + "</g>";
  }
  // Start and finish where they are in view.
  if (!st.empty()) {
    std::string ends = "<g class=\"ends\">";
    const double sx = px(st.front().x_m), sy = py(st.front().y_m), fx = px(st.back().x_m), fy = py(st.back().y_m);
    // Labels below the mark (above it near the bottom edge), kept clear by the post labels.
    auto label = [&](double X, double Y, const std::string& text) {
      const double w = 7.2 * static_cast<double>(text.size());
      const double tx = std::clamp(X, w / 2 + 4, W - w / 2 - 4), ty = Y > H - 30 ? Y - 12 : Y + 21;
      ends += "<text class=\"end-label\" x=\"" + n1(tx) + "\" y=\"" + n1(ty) + "\" text-anchor=\"middle\">" + text + "</text>";
      for (double q = -w / 2; q <= w / 2; q += 4.0) line.emplace_back(tx + q, ty - 4.0);
    };
    const bool together = std::hypot(sx - fx, sy - fy) < 30.0;
    if (inside(sx, sy)) {
      ends += "<rect class=\"start\" x=\"" + n1(sx - 5) + "\" y=\"" + n1(sy - 5) + "\" width=\"10\" height=\"10\"><title>start</title></rect>";
      line.emplace_back(sx, sy);
    }
    if (inside(fx, fy)) {
      ends += "<circle class=\"finish\" cx=\"" + n1(fx) + "\" cy=\"" + n1(fy) + "\" r=\"6.5\"><title>finish</title></circle>"
              "<circle class=\"finish-dot\" cx=\"" + n1(fx) + "\" cy=\"" + n1(fy) + "\" r=\"2.4\"/>";
      line.emplace_back(fx, fy);
    }
    if (together && inside(sx, sy) && inside(fx, fy)) {
      label(0.5 * (sx + fx), 0.5 * (sy + fy) + 3.0, "start \xc2\xb7 finish");
    } else {
      if (inside(sx, sy)) label(sx, sy, "start");
      if (inside(fx, fy)) label(fx, fy, "finish");
    }
    o += ends + "</g>";
  }
  // The posts: a dot at each place and a labelled box linking to the post's row.
  std::vector<std::pair<double, double>> spots;
  std::vector<double> widths;
  for (std::size_t p : sec.posts) {
    const MarshalPost& post = plan.posts.at(p);
    const std::size_t i = nearest_station(dist, post.at_m);
    spots.emplace_back(px(st[i].x_m), py(st[i].y_m));
    widths.push_back(10.5 * static_cast<double>(post.code.size()) + 14.0);
  }
  const auto boxes = place_labels(spots, widths, 23.0, line, W, H);
  std::string leaders = "<g class=\"leaders\">", markers = "<g class=\"post-markers\">";
  for (std::size_t k = 0; k < sec.posts.size(); ++k) {
    const MarshalPost& post = plan.posts.at(sec.posts[k]);
    const std::string anchor = post_anchor(post.code);
    const auto [sx, sy] = spots[k];
    const LabelBox& box = boxes[k];
    leaders += "<line x1=\"" + n1(sx) + "\" y1=\"" + n1(sy) + "\" x2=\"" + n1(box.cx) + "\" y2=\"" + n1(box.cy) + "\"/>";
    std::string title = post.code + ": " + std::to_string(post.count) + (post.count == 1 ? " marshal" : " marshals") +
                        " at km " + fmt_fixed(post.at_m / 1000.0, 2) + ", on post " + hhmm(post.on_post_s) +
                        " to " + hhmm(post.off_post_s) + ". " + post.warn;
    markers += "<a href=\"#post-" + anchor + "\"><g class=\"post-marker\" id=\"map-" + anchor + "\" data-post=\"" +
               escape_markup(post.code) + "\"><title>" + escape_markup(title) + "</title><circle class=\"post-dot\" cx=\"" +
               n1(sx) + "\" cy=\"" + n1(sy) + "\" r=\"4.2\"/><rect class=\"post-box\" x=\"" + n1(box.cx - box.w / 2) +
               "\" y=\"" + n1(box.cy - box.h / 2) + "\" width=\"" + n1(box.w) + "\" height=\"" + n1(box.h) +
               "\" rx=\"4\"/><text class=\"post-code\" x=\"" + n1(box.cx) + "\" y=\"" + n1(box.cy + 5.3) + "\">" +
               escape_markup(post.code) + "</text></g></a>";
  }
  o += leaders + "</g>" + markers + "</g>";
  o += plan_strip(W, H, scale);
  o += "</svg>";
  return o;
}

std::string sector_key_svg(const CheckResult& c, const MarshalPlan& plan, std::size_t s) {
  const Sector& sec = plan.sectors.at(s);
  const auto& st = c.analysis.stations;
  const std::vector<double> dist = station_distances(c);
  const double W = 240.0, H = 200.0, pad = 12.0;
  PlanBounds all;
  if (!st.empty()) all = {st[0].x_m, st[0].x_m, st[0].y_m, st[0].y_m};
  for (const auto& station : st) {
    all.xmin = std::min(all.xmin, station.x_m);
    all.xmax = std::max(all.xmax, station.x_m);
    all.ymin = std::min(all.ymin, station.y_m);
    all.ymax = std::max(all.ymax, station.y_m);
  }
  const PlanBounds frame = sector_bounds(c, plan, s, kSectorWidth / kSectorHeight);
  const double xmin = std::min(all.xmin, frame.xmin), xmax = std::max(all.xmax, frame.xmax);
  const double ymin = std::min(all.ymin, frame.ymin), ymax = std::max(all.ymax, frame.ymax);
  const double scale = std::min((W - 2 * pad) / std::max(xmax - xmin, 1.0), (H - 2 * pad) / std::max(ymax - ymin, 1.0));
  const double ox = (W - (xmax - xmin) * scale) / 2.0, oy = (H - (ymax - ymin) * scale) / 2.0;
  auto px = [&](double xm) { return ox + (xm - xmin) * scale; };
  auto py = [&](double ym) { return oy + (ymax - ym) * scale; };
  auto any = [](double, double) { return true; };
  const std::string number = std::to_string(s + 1);
  std::string o = "<svg id=\"sector-key-" + number + "\" class=\"chart plan sector-key\" viewBox=\"0 0 " + n1(W) + " " +
                  n1(H) + "\" role=\"img\" aria-label=\"" +
                  escape_markup("Where " + sec.name + " lies on the whole course; the frame of its plan is dashed") + "\">";
  o += "<rect class=\"plan-bg\" x=\"0.5\" y=\"0.5\" width=\"" + n1(W - 1) + "\" height=\"" + n1(H - 1) + "\"/>";
  o += "<path class=\"course-other\" d=\"" + course_path(st, 0, st.size(), px, py, any) + "\"/>";
  const auto [a0, a1] = station_range(dist, sec.from_m, sec.to_m);
  o += "<path class=\"course-line\" d=\"" + course_path(st, a0 > 0 ? a0 - 1 : 0, std::min(st.size(), a1 + 1), px, py, any) +
       "\"/>";
  o += "<rect class=\"key-frame\" x=\"" + n1(px(frame.xmin)) + "\" y=\"" + n1(py(frame.ymax)) + "\" width=\"" +
       n1((frame.xmax - frame.xmin) * scale) + "\" height=\"" + n1((frame.ymax - frame.ymin) * scale) + "\"/>";
  if (!st.empty()) {
    o += "<rect class=\"key-start\" x=\"" + n1(px(st.front().x_m) - 3.5) + "\" y=\"" + n1(py(st.front().y_m) - 3.5) +
         "\" width=\"7\" height=\"7\"><title>start</title></rect>";
  }
  o += "</svg>";
  return o;
}

// ---- schedule: time against distance

std::string time_distance_svg(const CheckResult& c, const Schedule& schedule, std::vector<const ScheduleRow*>* off_chart) {
  const double length = schedule.course_length_m;
  const double left = 64.0, right = 112.0, top = 16.0, plot_h = 300.0, bottom = 38.0;
  const double plot_w = kWidth - left - right, height = top + plot_h + bottom;
  const std::size_t n = std::clamp<std::size_t>(static_cast<std::size_t>(length / 100.0), 50, 700);
  std::vector<double> at(n + 1), first(n + 1), last(n + 1), closing(n + 1);
  double tmin = std::numeric_limits<double>::infinity(), tmax = -tmin;
  for (std::size_t k = 0; k <= n; ++k) {
    at[k] = length * static_cast<double>(k) / static_cast<double>(n);
    const PassTimes p = pass_times(c, schedule, at[k]);
    first[k] = p.earliest_s;
    last[k] = p.latest_s;
    closing[k] = p.closing_s;
    tmin = std::min({tmin, p.earliest_s, p.closing_s});
    tmax = std::max({tmax, p.latest_s, p.closing_s});
  }
  std::vector<const ScheduleRow*> cutoffs, checkpoints;
  for (const ScheduleRow& row : schedule.rows) {
    if (row.kind == ScheduleKind::checkpoint) checkpoints.push_back(&row);
    if (std::isfinite(row.cutoff_s)) cutoffs.push_back(&row);
  }
  // Cut-offs near the riders widen the axis; later ones are left to the caption.
  for (const ScheduleRow* row : cutoffs) {
    if (row->cutoff_s <= tmax + 45.0 * 60.0) tmax = std::max(tmax, row->cutoff_s);
  }
  if (!(tmax > tmin)) tmax = tmin + 3600.0;
  double step = 15.0 * 60.0;
  for (double m : {15.0, 30.0, 60.0, 120.0, 180.0, 240.0}) {
    step = m * 60.0;
    if ((tmax - tmin) / step <= 8.0) break;
  }
  const double t0 = std::floor(tmin / step) * step, t1 = std::ceil(tmax / step) * step;
  const Axis x{0.0, std::max(length, 1.0), left, left + plot_w};
  const Axis y{t0, t1, top + plot_h, top};
  std::string o = "<svg id=\"schedule-chart\" class=\"chart schedule-chart\" viewBox=\"0 0 960 " + n1(height) +
                  "\" role=\"img\" aria-label=\"Clock time against distance: first riders, last riders and the closing "
                  "vehicle\">";
  o += "<rect class=\"plot-bg\" x=\"" + n1(left) + "\" y=\"" + n1(top) + "\" width=\"" + n1(plot_w) + "\" height=\"" +
       n1(plot_h) + "\"/>";
  o += "<g class=\"grid\">";
  for (double t = t0; t <= t1 + 1.0; t += step) {
    o += "<line x1=\"" + n1(left) + "\" y1=\"" + n1(y(t)) + "\" x2=\"" + n1(left + plot_w) + "\" y2=\"" + n1(y(t)) +
         "\"/><text class=\"tick\" x=\"" + n1(left - 6) + "\" y=\"" + n1(y(t) + 4) + "\" text-anchor=\"end\">" + hhmm(t) +
         "</text>";
  }
  o += "</g>";
  o += km_grid(x, length, top, top + plot_h, true);
  o += "<text class=\"axis-label\" x=\"" + n1(left + plot_w) + "\" y=\"" + n1(height - 4) +
       "\" text-anchor=\"end\">distance from the start, km</text>";
  auto series = [&](const std::vector<double>& t) {
    std::vector<std::pair<double, double>> pts;
    for (std::size_t k = 0; k <= n; ++k) pts.emplace_back(x(at[k]), y(t[k]));
    return pts;
  };
  // Riders on the road: between the first and the last.
  {
    auto pts = series(first);
    const auto back = series(last);
    pts.insert(pts.end(), back.rbegin(), back.rend());
    o += "<path class=\"td-band\" d=\"" + path_from(pts) + "Z\"/>";
  }
  // Checkpoints: a thin line across with the name at the top.
  for (const ScheduleRow* row : checkpoints) {
    const double X = x(row->at_m);
    o += "<line class=\"td-checkpoint\" x1=\"" + n1(X) + "\" y1=\"" + n1(top) + "\" x2=\"" + n1(X) + "\" y2=\"" +
         n1(top + plot_h) + "\"/><text class=\"td-label\" x=\"" + n1(X + 4) + "\" y=\"" + n1(top + 12) + "\">" +
         escape_markup(row->label) + "</text>";
  }
  o += "<path class=\"td-first\" d=\"" + path_from(series(first)) + "\"/>";
  o += "<path class=\"td-last\" d=\"" + path_from(series(last)) + "\"/>";
  o += "<path class=\"td-closing\" d=\"" + path_from(series(closing)) + "\"/>";
  // Where the last riders fall behind the closing vehicle by more than the grace.
  {
    std::string behind;
    std::vector<std::pair<double, double>> run;
    for (std::size_t k = 0; k <= n; ++k) {
      if (last[k] - closing[k] > schedule.closing_grace_s) {
        run.emplace_back(x(at[k]), y(last[k]));
      } else {
        if (run.size() >= 2) behind += "<path d=\"" + path_from(run) + "\"/>";
        run.clear();
      }
    }
    if (run.size() >= 2) behind += "<path d=\"" + path_from(run) + "\"/>";
    if (!behind.empty()) {
      o += "<g class=\"td-behind\"><title>last riders more than " + fmt_fixed(schedule.closing_grace_s / 60.0, 0) +
           " min behind the closing vehicle</title>" + behind + "</g>";
    }
  }
  // The lines named at their ends, so that they read without the legend and in greys.
  {
    const std::vector<double> ends{y(first[n]), y(last[n]), y(closing[n])};
    const auto at_y = spread_positions(ends, 14.0, top + 6.0, top + plot_h + 10.0);
    const std::array<const char*, 3> names{"first riders", "last riders", "closing vehicle"};
    for (std::size_t k = 0; k < 3; ++k) {
      o += "<text class=\"td-end\" x=\"" + n1(left + plot_w + 6) + "\" y=\"" + n1(at_y[k] + 4) + "\">" + names[k] + "</text>";
    }
  }
  // Cut-offs: a bar at the checkpoint and the time (those above the chart are named in its
  // caption instead).
  for (const ScheduleRow* row : cutoffs) {
    if (row->cutoff_s > t1) {
      if (off_chart) off_chart->push_back(row);
      continue;
    }
    const double X = x(row->at_m), Y = y(row->cutoff_s);
    const bool near_end = X > left + plot_w - 120.0;
    o += "<g class=\"td-cutoff\"><line x1=\"" + n1(X - 9) + "\" y1=\"" + n1(Y) + "\" x2=\"" + n1(X + 9) + "\" y2=\"" +
         n1(Y) + "\"/><text class=\"td-label\" x=\"" + n1(near_end ? X - 12 : X + 12) + "\" y=\"" + n1(Y + 4) +
         "\" text-anchor=\"" + (near_end ? "end" : "start") + "\">cut-off " + hhmm(row->cutoff_s) + "</text></g>";
  }
  o += "</svg>";
  return o;
}

}  // namespace coursewarden::report_detail
