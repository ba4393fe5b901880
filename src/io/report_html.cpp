// The organiser's report: one self-contained HTML page with inline CSS and inline SVG.
//
// The page loads nothing: no scripts, fonts, images, style sheets or tiles. Its look (palette,
// marker shapes, layout) is our own and is described in docs/report.md.
#include "coursewarden/report.hpp"

#include <algorithm>
#include <array>
#include <chrono>
#include <cmath>
#include <ctime>

#include "coursewarden/hazards.hpp"
#include "coursewarden/outputs.hpp"
#include "io/report_svg.hpp"
#include "util/text.hpp"

namespace coursewarden {

// ---- public helpers

std::string escape_markup(std::string_view text) {
  std::string out;
  out.reserve(text.size() + 16);
  for (char ch : text) {
    const auto u = static_cast<unsigned char>(ch);
    switch (ch) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&#39;"; break;
      default:
        if (u < 0x20 && ch != '\t' && ch != '\n' && ch != '\r') break;  // not allowed in XML 1.0
        if (u == 0x7f) break;
        out += ch;
    }
  }
  return out;
}

std::string utc_date_today() {
  const std::time_t now = std::chrono::system_clock::to_time_t(std::chrono::system_clock::now());
  std::tm tm{};
  gmtime_r(&now, &tm);
  char buffer[16];
  std::strftime(buffer, sizeof buffer, "%Y-%m-%d", &tm);
  return buffer;
}

std::span<const GradientBand> gradient_bands() {
  // Cool slate for descents, pale sand for level road, a teal ramp for climbs that darkens with
  // the gradient (so the order survives printing in greys).
  static constexpr double kInf = std::numeric_limits<double>::infinity();
  static const std::array<GradientBand, 7> bands{{
      {-kInf, -8.0, "down-over-8", "descending, steeper than 8 %", "#6d7c95"},
      {-8.0, -4.0, "down-4-8", "descending 4-8 %", "#a3adbf"},
      {-4.0, 2.0, "level", "level or gentle (-4 to +2 %)", "#e6e3d3"},
      {2.0, 5.0, "up-2-5", "climbing 2-5 %", "#b7d5c7"},
      {5.0, 8.0, "up-5-8", "climbing 5-8 %", "#6ea999"},
      {8.0, 11.0, "up-8-11", "climbing 8-11 %", "#2f7468"},
      {11.0, kInf, "up-over-11", "climbing 11 % and steeper", "#163e3f"},
  }};
  return {bands.data(), bands.size()};
}

std::size_t gradient_band_index(double grade_pct) {
  const auto bands = gradient_bands();
  if (std::isnan(grade_pct)) grade_pct = 0.0;
  for (std::size_t k = 0; k < bands.size(); ++k) {
    if (grade_pct < bands[k].to_pct) return k;
  }
  return bands.size() - 1;
}

namespace {

using report_detail::hazard_code;
using report_detail::severity_icon;

constexpr double kRadToDeg = 180.0 / 3.14159265358979323846;

std::string esc(std::string_view s) { return escape_markup(s); }
std::string km(double m, int decimals = 1) { return fmt_fixed(m / 1000.0, decimals); }
std::string kmh(double mps, int decimals = 0) { return fmt_fixed(mps * 3.6, decimals); }

std::string duration(double seconds) {
  if (!std::isfinite(seconds)) return "-";
  const long total = std::lround(seconds / 60.0);
  return std::to_string(total / 60) + " h " + (total % 60 < 10 ? "0" : "") + std::to_string(total % 60) + " min";
}

std::string clock_time(double seconds) {
  if (!std::isfinite(seconds)) return "-";
  long total = std::lround(seconds / 60.0) % (24 * 60);
  if (total < 0) total += 24 * 60;
  const long h = total / 60, m = total % 60;
  return (h < 10 ? "0" : "") + std::to_string(h) + ":" + (m < 10 ? "0" : "") + std::to_string(m);
}

std::string compass(double deg) {
  static const std::array<const char*, 8> names{"north", "north-east", "east", "south-east",
                                                "south", "south-west", "west", "north-west"};
  double d = std::fmod(deg, 360.0);
  if (d < 0) d += 360.0;
  return names[static_cast<std::size_t>(std::lround(d / 45.0)) % 8];
}

std::string anchor(const Hazard& h, std::size_t count) {
  std::string code = hazard_code(h.number, count);
  code[0] = 'h';
  return code;
}

std::string severity_cell(Severity s) {
  return severity_icon(s) + " <span class=\"sev-name\">" + std::string(severity_name(s)) + "</span>";
}

constexpr std::array<Severity, 4> kLevels{Severity::critical, Severity::serious, Severity::caution, Severity::note};

const char* severity_meaning(Severity s) {
  switch (s) {
    case Severity::note: return "mention in the briefing and the route book";
    case Severity::caution: return "put up a warning sign";
    case Severity::serious: return "sign it and post a marshal";
    case Severity::critical: return "sign it, post marshals, consider changing the course";
    case Severity::none: break;
  }
  return "";
}

// ---- style

const char* kStyle = R"CSS(
:root{--paper:#f4f2ea;--panel:#fffdf7;--ink:#1e2830;--soft:#5a646c;--rule:#d5cfbf;--teal:#1f5f5b;
--slate:#3f5568;--sand:#e6e3d3}
*{box-sizing:border-box}
html{background:var(--paper)}
body{margin:0;color:var(--ink);font:15px/1.5 "DejaVu Sans","Liberation Sans","Noto Sans",Arial,sans-serif;
font-variant-numeric:tabular-nums}
main{max-width:1060px;margin:0 auto;padding:22px 26px 48px}
h1,h2,h3{font-family:"DejaVu Serif","Liberation Serif","Noto Serif",Georgia,serif;font-weight:700;line-height:1.2}
h1{font-size:30px;margin:2px 0 6px}
h2{font-size:21px;margin:0 0 12px;padding-bottom:6px;border-bottom:2px solid var(--ink)}
h2 .num{display:inline-block;min-width:1.6em;color:var(--teal)}
h3{font-size:16px;margin:18px 0 6px}
p{margin:6px 0}
a{color:var(--teal)}
.kicker{text-transform:uppercase;letter-spacing:.12em;font-size:12px;color:var(--soft);margin:0}
.dated{color:var(--soft);margin:0 0 14px}
header#report-header{border-top:8px solid var(--ink);padding-top:14px}
.facts{display:grid;grid-template-columns:repeat(auto-fit,minmax(300px,1fr));gap:6px 28px}
dl{margin:0}
dl.kv{display:grid;grid-template-columns:max-content 1fr;gap:3px 14px;font-size:14px}
dl.kv dt{color:var(--soft)}
dl.kv dd{margin:0}
.classes-list{font-size:14px;margin:8px 0 0;padding-left:18px;columns:2;column-gap:28px}
.classes-list li{break-inside:avoid}
code,.mono{font-family:"DejaVu Sans Mono","Liberation Mono",monospace;font-size:13px}
nav.contents{font-size:13px;margin:14px 0 0;display:flex;flex-wrap:wrap;gap:4px 16px}
nav.contents a{text-decoration:none;border-bottom:1px solid var(--rule)}
.caution{margin:18px 0;padding:14px 18px 12px 18px;background:#e7edf1;border-left:8px solid var(--slate)}
.caution h2{border:0;padding:0;margin:0 0 6px;font-size:18px}
.caution ul{margin:6px 0 0;padding-left:20px}
.caution .lead{font-weight:700}
section{background:var(--panel);border:1px solid var(--rule);padding:18px 22px 16px;margin:20px 0}
.tiles{display:grid;grid-template-columns:repeat(auto-fit,minmax(150px,1fr));gap:10px;margin:4px 0 12px}
.tile{border:1px solid var(--rule);padding:8px 12px;background:#fbf9f2}
.tile .label{font-size:12px;color:var(--soft);text-transform:uppercase;letter-spacing:.06em}
.tile .value{font-size:24px;font-weight:700;font-family:"DejaVu Serif","Liberation Serif",Georgia,serif}
.tile .sub{font-size:13px;color:var(--soft)}
.tile.sev .value{display:flex;align-items:center;gap:8px}
table{border-collapse:collapse;width:100%;font-size:13.5px;margin:6px 0 10px}
th,td{text-align:left;padding:4px 8px;border-bottom:1px solid var(--rule);vertical-align:top}
th{font-weight:700;border-bottom:2px solid var(--ink);background:#f0ede2}
td.n,th.n{text-align:right;white-space:nowrap}
tbody tr:nth-child(even){background:#f8f6ef}
.chart{width:100%;height:auto;display:block;font-family:"DejaVu Sans","Liberation Sans",Arial,sans-serif}
.chart .plot-bg{fill:#fcfbf6;stroke:#b9b2a0;stroke-width:1}
.chart .grid line{stroke:#d9d3c4;stroke-width:.7}
.chart .tick{font-size:11px;fill:#4a545c}
.chart .axis-label{font-size:11px;fill:#4a545c;font-style:italic}
.chart .profile-line{fill:none;stroke:#1e2830;stroke-width:1.3}
.chart .climb-bracket{fill:none;stroke:#1e2830;stroke-width:1.2}
.chart .climb-label{font-size:11.5px;font-weight:700;fill:#1e2830;paint-order:stroke;stroke:#fcfbf6;stroke-width:3px}
.chart .leader{stroke:#5a646c;stroke-width:.8}
.chart .leaders path,.chart .leaders line{fill:none;stroke:#5a646c;stroke-width:.8}
.chart .leaders circle{fill:#1e2830}
.chart text.mk{text-anchor:middle;font-weight:700;font-family:"DejaVu Sans Condensed","DejaVu Sans",Arial,sans-serif}
.chart .hazard-marker,.chart .hazard-tag{cursor:pointer}
.chart a:focus .hazard-marker polygon,.chart a:focus .hazard-marker circle{stroke-width:3}
.chart .slowing path{fill:#dcd3bd;stroke:none}
.chart .unbraked-line{fill:none;stroke:#7b6a4a;stroke-width:1.2;stroke-dasharray:5 3}
.chart .planned-line{fill:none;stroke:#1f5f5b;stroke-width:1.7}
.chart .safe-bar{stroke:#1e2830;stroke-width:2.6}
.chart .excess{stroke-width:2.6}
.chart .threshold{stroke:#5a646c;stroke-width:1;stroke-dasharray:1.5 3}
.chart .threshold-label{font-size:10.5px;fill:#4a545c}
.chart .plan-bg{fill:#fcfbf6;stroke:#b9b2a0}
.chart .plan-strip{fill:#fffdf7;stroke:#b9b2a0}
.chart .course-halo{fill:none;stroke:#fcfbf6;stroke-width:6;stroke-linejoin:round}
.chart .course-line{fill:none;stroke:#2a3640;stroke-width:2.3;stroke-linejoin:round}
.chart .km-ticks circle{fill:#fcfbf6;stroke:#1e2830;stroke-width:1.3}
.chart .km-ticks text{font-size:10.5px;fill:#1e2830;paint-order:stroke;stroke:#fcfbf6;stroke-width:3px}
.chart .direction path{fill:none;stroke:#1f5f5b;stroke-width:1.8}
.chart .ends .start{fill:#1e2830}
.chart .ends .finish{fill:#fcfbf6;stroke:#1e2830;stroke-width:2.2}
.chart .ends .finish-dot{fill:#1e2830}
.chart .end-label{font-size:12px;font-weight:700;fill:#1e2830;paint-order:stroke;stroke:#fcfbf6;stroke-width:3px}
.chart .scale-bar text,.chart .north text{font-size:11px;fill:#1e2830}
.chart .north .north-n{font-size:14px;font-weight:700}
.chart .dark{fill:#1e2830}
.chart .light{fill:#fcfbf6;stroke:#1e2830;stroke-width:1}
.icon{vertical-align:-2px}
.legend{display:flex;flex-wrap:wrap;gap:4px 18px;font-size:13px;margin:8px 0 4px;padding:0;list-style:none}
.legend li{display:flex;align-items:center;gap:6px}
.swatch{display:inline-block;width:22px;height:12px;border:1px solid #8b8470}
.caption{font-size:13px;color:var(--soft)}
.closeups{display:grid;grid-template-columns:1fr 1fr;gap:10px 14px;margin:6px 0 12px}
.closeups figure{margin:0}
.closeup-title{margin-top:22px}
.chart .chart-title{font-size:12px;font-weight:700;fill:#1e2830;paint-order:stroke;stroke:#fcfbf6;stroke-width:3px}
figure{margin:0 0 14px;break-inside:avoid}
figure figcaption{font-size:14px;margin:0 0 2px}
figure figcaption b{font-size:15px}
td.classes{font-size:12.5px;line-height:1.35}
td.classes span{white-space:nowrap}
td.reason{min-width:260px}
tr:target{outline:3px solid #c0502c;outline-offset:-3px;background:#fbefe3}
.jump{font-size:12px;white-space:nowrap}
.formula{font-family:"DejaVu Sans Mono","Liberation Mono",monospace;font-size:13px;background:#f0ede2;
padding:6px 10px;margin:4px 0 8px;white-space:pre-wrap}
table.params{font-size:12px}
table.params td,table.params th{padding:3px 6px}
.sources li{margin:2px 0}
footer{font-size:12px;color:var(--soft);margin-top:20px}
@page{size:A4;margin:13mm 12mm}
@media print{
html,body{background:#fff}
body{font-size:10.5pt}
main{max-width:none;padding:0}
nav.contents{display:none}
section{border:0;padding:0;margin:0;break-before:page;background:#fff}
.caution{break-inside:avoid;-webkit-print-color-adjust:exact;print-color-adjust:exact}
.chart,.swatch,.icon{-webkit-print-color-adjust:exact;print-color-adjust:exact}
tr,figure,.tile,.chart{break-inside:avoid}
.closeup-title{break-before:page}
thead{display:table-header-group}
a{color:inherit;text-decoration:none}
tr:target{outline:0}
table{font-size:9pt}
}
)CSS";

// ---- sections

std::string header_html(const CheckResult& c, const ReportInfo& info) {
  const auto& a = c.analysis;
  std::string o = "<header id=\"report-header\">";
  o += "<p class=\"kicker\">" + (c.event_name.empty() ? std::string() : esc(c.event_name) + " \xc2\xb7 ") +
       "Course safety check \xc2\xb7 advice for the organiser</p>";
  o += "<h1>" + esc(a.course.name.empty() ? std::string("Unnamed course") : a.course.name) + "</h1>";
  o += "<p class=\"dated\">";
  if (!c.event_date.empty()) o += "Event on <time datetime=\"" + esc(c.event_date) + "\">" + esc(c.event_date) + "</time>. ";
  if (!info.check_date.empty()) o += "Checked on <time datetime=\"" + esc(info.check_date) + "\">" + esc(info.check_date) + "</time> ";
  o += "with " + esc(info.generator) + ".</p>";
  o += "<div class=\"facts\"><div><h3>Inputs</h3><dl class=\"kv\">";
  if (!c.event_path.empty()) o += "<dt>Event file</dt><dd><code>" + esc(c.event_path) + "</code></dd>";
  o += "<dt>Course file</dt><dd><code>" + esc(a.course.source_path) + "</code>";
  if (a.course.track_names.size() > 1) {
    o += " (track " + std::to_string(a.course.chosen_index + 1) + " of " + std::to_string(a.course.track_names.size()) + ")";
  }
  o += "</dd>";
  if (a.used_dem) {
    o += "<dt>Terrain model</dt><dd><code>" + esc(a.dem.path) + "</code><br>" + esc(a.dem.crs_name) + ", " +
         fmt_fixed(a.dem.pixel_size_m, 1) + " m pixels (" + std::to_string(a.dem.width_px) + " \xc3\x97 " +
         std::to_string(a.dem.height_px) + ")</dd>";
    o += "<dt>Coverage</dt><dd>" + fmt_fixed(a.profile.coverage_pct, 1) + " % of the course on valid terrain cells</dd>";
  } else {
    o += "<dt>Heights</dt><dd>from the course file (no terrain model)</dd>";
  }
  o += "<dt>Repairs</dt><dd>";
  if (a.profile.repairs.empty()) {
    o += "none needed";
  } else {
    for (std::size_t k = 0; k < a.profile.repairs.size(); ++k) {
      const Repair& rp = a.profile.repairs[k];
      o += (k ? "<br>" : "") + std::string("km ") + km(rp.start_m, 2) + "\xe2\x80\x93" + km(rp.end_m, 2) + ": " + esc(rp.reason);
    }
  }
  o += "</dd>";
  o += "<dt>Profile</dt><dd>stations every " + fmt_fixed(a.spacing_m, 1) + " m, smoothing \xcf\x83 " +
       fmt_fixed(a.profile.smoothing_sigma_m, 0) + " m</dd>";
  o += "<dt>Plane geometry</dt><dd>" + esc(a.projection) + "</dd>";
  if (!a.course.notes.empty()) {
    o += "<dt>Notes on reading</dt><dd>";
    for (std::size_t k = 0; k < a.course.notes.size(); ++k) o += (k ? "<br>" : "") + esc(a.course.notes[k]);
    o += "</dd>";
  }
  o += "</dl></div><div><h3>Conditions assumed</h3><dl class=\"kv\">";
  const auto& e = c.environment;
  if (!c.scenario_name.empty()) o += "<dt>Weather scenario</dt><dd>" + esc(c.scenario_name) + "</dd>";
  o += "<dt>Road surface</dt><dd>" + std::string(e.wet ? "wet" : "dry") + "</dd>";
  if (c.road.closed) {
    o += "<dt>Traffic</dt><dd>road closed to traffic; riders use " + fmt_fixed(c.road.road_width_m, 1) + " m of road</dd>";
  } else {
    o += "<dt>Traffic</dt><dd>road open to traffic; riders keep to the " +
         std::string(c.road.right_hand_traffic ? "right" : "left") + "-hand lane (" + fmt_fixed(c.road.lane_width_m, 1) +
         " m)</dd>";
  }
  o += "<dt>Air temperature</dt><dd>" + fmt_fixed(e.temperature_c, 0) + " \xc2\xb0" "C</dd>";
  o += "<dt>Wind</dt><dd>";
  if (e.wind_speed_mps * 3.6 < 0.5) {
    o += "calm";
  } else {
    const double from = e.wind_from_rad * kRadToDeg;
    o += kmh(e.wind_speed_mps) + " km/h from " + fmt_fixed(from, 0) + "\xc2\xb0 (" + compass(from) + ")";
  }
  o += "</dd>";
  o += "<dt>First start</dt><dd>" + clock_time(e.start_time_s) + "</dd>";
  o += "<dt>Motor assistance</dt><dd>ends at " + kmh(e.assist_cutoff_mps) + " km/h</dd>";
  o += "</dl></div></div>";
  o += "<h3>Rider classes in the field (" + std::to_string(c.classes.size()) + ")</h3><ul class=\"classes-list\">";
  for (const auto& rc : c.classes) {
    o += "<li><b>" + esc(rc.name) + "</b>" + (rc.description.empty() ? "" : " \xe2\x80\x94 " + esc(rc.description)) + "</li>";
  }
  o += "</ul>";
  o += "<nav class=\"contents\" aria-label=\"Contents\"><a href=\"#summary\">1 Summary</a><a href=\"#elevation\">2 "
       "Elevation</a><a href=\"#speeds\">3 Speeds</a><a href=\"#plan\">4 Plan</a><a href=\"#hazards\">5 "
       "Hazards</a><a href=\"#method\">6 Method</a></nav>";
  o += "</header>";
  return o;
}

std::string caution_html() {
  std::string o = "<aside id=\"caution\" class=\"caution\" role=\"note\"><h2>Read this first</h2>";
  o += "<p class=\"lead\">" + esc(kDisclaimer) + "</p><ul>";
  o += "<li>This report is advice from a model. Local regulations, the road authority and the event's safety "
       "officers decide what is done.</li>";
  o += "<li>Inspect every place on the ground before the event, whether it is flagged here or not.</li>";
  o += "<li>Not in the terrain model: vegetation, hedges, buildings, walls, parked vehicles, road furniture, road "
       "surface and its condition, road works and traffic. Any of them can hide a corner or a junction that the "
       "model calls visible.</li>";
  o += "<li>Heights, gradients and predicted speeds carry errors; real riders vary more than the classes do.</li>";
  o += "</ul></aside>";
  return o;
}

std::string summary_html(const CheckResult& c) {
  const auto& a = c.analysis;
  const auto& t = a.profile.totals;
  std::string o = "<section id=\"summary\"><h2><span class=\"num\">1</span>Summary</h2><div class=\"tiles\">";
  auto tile = [&](const std::string& label, const std::string& value, const std::string& sub) {
    o += "<div class=\"tile\"><div class=\"label\">" + label + "</div><div class=\"value\">" + value +
         "</div><div class=\"sub\">" + sub + "</div></div>";
  };
  tile("Length", km(t.length_m, 1) + " km", "along the ground");
  tile("Ascent", fmt_fixed(t.ascent_m, 0) + " m", "descent " + fmt_fixed(t.descent_m, 0) + " m");
  tile("Highest point", fmt_fixed(t.max_elevation_m, 0) + " m", "at km " + km(t.max_elevation_at_m, 1));
  tile("Lowest point", fmt_fixed(t.min_elevation_m, 0) + " m", "");
  o += "</div>";
  // Hazards by severity.
  o += "<h3>Hazards by severity</h3><div class=\"tiles\" id=\"hazard-counts\">";
  for (Severity s : kLevels) {
    const auto n = std::count_if(c.hazards.begin(), c.hazards.end(), [s](const Hazard& h) { return h.severity == s; });
    o += "<div class=\"tile sev\" data-severity=\"" + std::string(severity_name(s)) + "\"><div class=\"label\">" +
         std::string(severity_name(s)) + "</div><div class=\"value\">" + severity_icon(s, 20) + std::to_string(n) +
         "</div><div class=\"sub\">" + severity_meaning(s) + "</div></div>";
  }
  o += "</div>";
  // Steepest sustained gradients.
  o += "<h3>Steepest sustained gradients</h3><table id=\"steepest\"><thead><tr><th>over</th><th class=\"n\">uphill</th>"
       "<th class=\"n\">starting at</th><th class=\"n\">downhill</th><th class=\"n\">starting at</th></tr></thead><tbody>";
  for (const auto& s : t.sustained) {
    o += "<tr><td>" + (s.window_m >= 1000.0 ? km(s.window_m, 0) + " km" : fmt_fixed(s.window_m, 0) + " m") +
         "</td><td class=\"n\">" + fmt_fixed(s.climb_pct, 1) + " %</td><td class=\"n\">km " + km(s.climb_at_m, 1) +
         "</td><td class=\"n\">" + fmt_fixed(s.descent_pct, 1) + " %</td><td class=\"n\">km " + km(s.descent_at_m, 1) +
         "</td></tr>";
  }
  o += "</tbody></table>";
  // Climbs.
  o += "<h3>Climbs</h3>";
  if (a.climbs.empty()) {
    o += "<p>No climb meets the thresholds.</p>";
  } else {
    o += "<table id=\"climbs\"><thead><tr><th>climb</th><th class=\"n\">from km</th><th class=\"n\">to km</th>"
         "<th class=\"n\">length</th><th class=\"n\">gain</th><th class=\"n\">mean</th><th class=\"n\">steepest "
         "100 m</th><th class=\"n\">score</th><th>category</th></tr></thead><tbody>";
    for (std::size_t k = 0; k < a.climbs.size(); ++k) {
      const Climb& cl = a.climbs[k];
      o += "<tr data-category=\"" + esc(cl.category) + "\"><td>" + std::to_string(k + 1) + "</td><td class=\"n\">" +
           km(cl.start_m, 1) + "</td><td class=\"n\">" + km(cl.end_m, 1) + "</td><td class=\"n\">" + km(cl.length_m(), 1) +
           " km</td><td class=\"n\">" + fmt_fixed(cl.gain_m, 0) + " m</td><td class=\"n\">" +
           fmt_fixed(cl.mean_grade_pct, 1) + " %</td><td class=\"n\">" + fmt_fixed(cl.max_grade_100m_pct, 1) +
           " %</td><td class=\"n\">" + fmt_fixed(cl.score, 0) + "</td><td>" +
           (cl.category.empty() ? std::string("below category 4") : "category " + esc(cl.category)) + "</td></tr>";
    }
    o += "</tbody></table>";
  }
  // Classes.
  o += "<h3>Predicted rides</h3><table id=\"class-times\"><thead><tr><th>rider class</th><th class=\"n\">time</th>"
       "<th class=\"n\">average speed</th><th class=\"n\">top speed</th><th class=\"n\">finish at</th><th>likely walking"
       "</th></tr></thead><tbody>";
  for (std::size_t k = 0; k < c.classes.size() && k < c.speeds.size(); ++k) {
    const SpeedProfile& sp = c.speeds[k];
    std::string walking = "-";
    if (!sp.walking_sections.empty()) {
      walking = std::to_string(sp.walking_sections.size()) + (sp.walking_sections.size() == 1 ? " stretch" : " stretches") +
                ", longest " + fmt_fixed(sp.longest_walking_m, 0) + " m";
    }
    o += "<tr><td><b>" + esc(c.classes[k].name) + "</b></td><td class=\"n\">" + duration(sp.total_time_s) +
         "</td><td class=\"n\">" + kmh(sp.moving_avg_speed_mps, 1) + " km/h</td><td class=\"n\">" +
         kmh(sp.max_speed_mps, 0) + " km/h</td><td class=\"n\">" + clock_time(c.environment.start_time_s + sp.total_time_s) +
         "</td><td>" + walking + "</td></tr>";
  }
  o += "</tbody></table><p class=\"caption\">Times are for a rider riding alone without stops; the model's own "
       "spread on real climbs is several per cent.</p></section>";
  return o;
}

// ", hazards H12 to H19" for the hazards whose place lies in the window.
std::string hazards_between(const CheckResult& c, const report_detail::Window& w) {
  std::vector<int> numbers;
  for (const Hazard& h : c.hazards) {
    if (h.at_m >= w.start_m && h.at_m <= w.end_m) numbers.push_back(h.number);
  }
  if (numbers.empty()) return "";
  if (numbers.size() == 1) return ", hazard " + hazard_code(numbers[0], c.hazards.size());
  return ", hazards " + hazard_code(numbers.front(), c.hazards.size()) + " to " +
         hazard_code(numbers.back(), c.hazards.size());
}

std::string severity_legend() {
  std::string o = "<ul class=\"legend severity-legend\">";
  for (Severity s : {Severity::note, Severity::caution, Severity::serious, Severity::critical}) {
    o += "<li>" + severity_icon(s, 16) + std::string(severity_name(s)) + " (" +
         report_detail::severity_look(s).shape + ")</li>";
  }
  return o + "</ul>";
}

std::string elevation_html(const CheckResult& c) {
  std::string o = "<section id=\"elevation\"><h2><span class=\"num\">2</span>Elevation profile</h2>";
  o += "<p class=\"caption\">Height against distance from the start. The fill shows the gradient; brackets mark "
       "the climbs with their category; numbered markers are the hazards of section 5 (select one to jump to its "
       "row).</p>";
  o += report_detail::elevation_chart_svg(c);
  o += "<ul class=\"legend gradient-legend\">";
  for (const auto& b : gradient_bands()) {
    const bool hatched = b.to_pct <= -4.0 + 1e-9;  // as in the chart
    const std::string fill = hatched ? "repeating-linear-gradient(45deg," + std::string(b.colour) + " 0 3px,#d5d9df 3px 5px)"
                                     : std::string(b.colour);
    o += "<li><span class=\"swatch\" style=\"background:" + fill + "\"></span>" + esc(b.label) + "</li>";
  }
  o += "</ul>" + severity_legend() + "</section>";
  return o;
}

std::string speeds_html(const CheckResult& c) {
  std::string o = "<section id=\"speeds\"><h2><span class=\"num\">3</span>Speed profiles</h2>";
  o += "<p class=\"caption\">One chart per rider class, on the same scales. The <b>planned</b> ride slows in time for "
       "every corner; the <b>unbraked</b> line is the same rider not slowing for corners. Each corner's safe speed "
       "for the class is a short black bar; where the class would arrive faster, a coloured bar rises from it to the "
       "unbraked speed, in the colour of that class's severity there. Numbers along the top are the hazards that "
       "concern the class.</p>";
  o += "<ul class=\"legend\"><li><svg class=\"icon\" width=\"30\" height=\"10\" aria-hidden=\"true\"><line x1=\"0\" "
       "y1=\"5\" x2=\"30\" y2=\"5\" stroke=\"#1f5f5b\" stroke-width=\"2\"/></svg>planned speed</li><li><svg "
       "class=\"icon\" width=\"30\" height=\"10\" aria-hidden=\"true\"><line x1=\"0\" y1=\"5\" x2=\"30\" y2=\"5\" "
       "stroke=\"#7b6a4a\" stroke-width=\"1.4\" stroke-dasharray=\"5 3\"/></svg>unbraked speed</li><li><span "
       "class=\"swatch\" style=\"background:#dcd3bd\"></span>slowing for corners</li><li><svg class=\"icon\" "
       "width=\"14\" height=\"14\" aria-hidden=\"true\"><line x1=\"2\" y1=\"10\" x2=\"12\" y2=\"10\" stroke=\"#1e2830\" "
       "stroke-width=\"2.6\"/><line x1=\"7\" y1=\"10\" x2=\"7\" y2=\"1\" stroke=\"#c0502c\" stroke-width=\"2.6\"/>"
       "</svg>safe corner speed, and the excess where the class arrives too fast</li></ul>";
  const double vmax = report_detail::speed_axis_top_kmh(c);
  for (std::size_t k = 0; k < c.classes.size() && k < c.speeds.size(); ++k) {
    const SpeedProfile& sp = c.speeds[k];
    o += "<figure class=\"class-speed\"><figcaption><b>" + esc(c.classes[k].name) + "</b> \xc2\xb7 " +
         duration(sp.total_time_s) + ", average " + kmh(sp.moving_avg_speed_mps, 1) + " km/h, top planned " +
         kmh(sp.max_speed_mps, 0) + " km/h, top unbraked " + kmh(sp.max_unbraked_speed_mps, 0) + " km/h</figcaption>";
    o += report_detail::speed_chart_svg(c, k, vmax) + "</figure>";
  }
  const auto clusters = report_detail::hazard_clusters(c);
  for (std::size_t q = 0; q < clusters.size(); ++q) {
    const auto& w = clusters[q];
    o += "<h3 class=\"closeup-title\">Close-up " + std::to_string(q + 1) + ": km " + km(w.start_m, 1) + " to " +
         km(w.end_m, 1) + hazards_between(c, w) + "</h3><div class=\"closeups\">";
    for (std::size_t k = 0; k < c.classes.size() && k < c.speeds.size(); ++k) {
      o += report_detail::speed_chart_svg(c, k, vmax, w, 470.0, "-closeup-" + std::to_string(q + 1));
    }
    o += "</div>";
  }
  o += "</section>";
  return o;
}

std::string plan_html(const CheckResult& c) {
  std::string o = "<section id=\"plan\"><h2><span class=\"num\">4</span>Plan view</h2>";
  o += report_detail::plan_view_svg(c);
  o += "<ul class=\"legend\"><li><svg class=\"icon\" width=\"12\" height=\"12\" aria-hidden=\"true\"><rect x=\"1\" "
       "y=\"1\" width=\"10\" height=\"10\" fill=\"#1e2830\"/></svg>start</li><li><svg class=\"icon\" width=\"14\" "
       "height=\"14\" aria-hidden=\"true\"><circle cx=\"7\" cy=\"7\" r=\"5.5\" fill=\"#fcfbf6\" stroke=\"#1e2830\" "
       "stroke-width=\"2\"/><circle cx=\"7\" cy=\"7\" r=\"2\" fill=\"#1e2830\"/></svg>finish</li><li><svg "
       "class=\"icon\" width=\"12\" height=\"12\" aria-hidden=\"true\"><circle cx=\"6\" cy=\"6\" r=\"3\" "
       "fill=\"#fcfbf6\" stroke=\"#1e2830\" stroke-width=\"1.3\"/></svg>km from the start</li><li><svg class=\"icon\" "
       "width=\"14\" height=\"12\" aria-hidden=\"true\"><path d=\"M3 2L10 6L3 10\" fill=\"none\" stroke=\"#1f5f5b\" "
       "stroke-width=\"1.8\"/></svg>direction of travel</li></ul>";
  o += severity_legend();
  const auto clusters = report_detail::hazard_clusters(c);
  if (!clusters.empty()) {
    o += "<h3>Close-ups where hazards crowd together</h3><div class=\"closeups\">";
    for (std::size_t q = 0; q < clusters.size(); ++q) {
      const auto& w = clusters[q];
      o += "<figure><figcaption>Close-up " + std::to_string(q + 1) + ": km " + km(w.start_m, 1) + " to " +
           km(w.end_m, 1) + hazards_between(c, w) + "</figcaption>" + report_detail::plan_closeup_svg(c, w, q + 1) +
           "</figure>";
    }
    o += "</div>";
  }
  o += "<p class=\"caption\">Drawn in the local projection used for all distances (" + esc(c.analysis.projection) +
       "). Up is grid north of that projection, which may differ slightly from true north away from its centre. "
       "<b>No basemap is included</b>: roads, junctions, buildings and land use are not shown, so read this plan "
       "beside a map of your own. Markers moved aside to stay readable are tied to their place by a thin line.</p>";
  o += "</section>";
  return o;
}

std::string classes_cell(const Hazard& h) {
  std::string o;
  if (!h.classes.empty()) {
    for (const auto& a : h.classes) {
      // One decimal where whole numbers would show the same speed twice ("31 -> 31").
      const int d = kmh(a.entry_speed_mps) == kmh(a.safe_speed_mps) ? 1 : 0;
      o += "<span>" + esc(a.class_name) + " " + kmh(a.entry_speed_mps, d) + " \xe2\x86\x92 " + kmh(a.safe_speed_mps, d) +
           (a.hidden ? " (hidden)" : "") + "</span><br>";
    }
  } else if (!h.section_classes.empty()) {
    for (std::size_t k = 0; k < h.section_classes.size(); ++k) {
      o += (k ? ", " : "") + esc(h.section_classes[k]);
    }
    o += "<br><span>up to " + kmh(h.peak_speed_mps) + " km/h</span>";
  } else {
    o += "all classes";
  }
  if (h.kind == HazardKind::steep_descent) o += "<br><span>steepest " + fmt_fixed(h.steepest_pct, 1) + " %</span>";
  return o;
}

std::string hazards_html(const CheckResult& c) {
  const std::size_t n = c.hazards.size();
  std::string o = "<section id=\"hazards\"><h2><span class=\"num\">5</span>Hazards in course order</h2>";
  if (n == 0) {
    o += "<p>No hazards were flagged under the assumed conditions. That does not make the course safe: inspect it "
         "on the ground.</p></section>";
    return o;
  }
  o += "<p class=\"caption\">Classes affected: speed arriving without slowing \xe2\x86\x92 safe speed for the corner, km/h. "
       "Sign: distance of the warning sign before the hazard. Position: latitude, longitude (WGS84). The same list is "
       "in hazards.csv, hazards.geojson and hazards.gpx.</p>";
  o += "<table id=\"hazard-table\"><thead><tr><th>no.</th><th class=\"n\">km</th><th>what</th><th>severity</th>"
       "<th>classes affected</th><th class=\"n\">sign</th><th class=\"n\">marshals</th><th>why</th><th>position</th>"
       "</tr></thead><tbody>";
  for (const Hazard& h : c.hazards) {
    const std::string id = anchor(h, n);
    o += "<tr id=\"hazard-" + id + "\" class=\"sev-" + std::string(severity_name(h.severity)) + "\" data-hazard=\"" +
         std::to_string(h.number) + "\"><td><b>" + hazard_code(h.number, n) + "</b><br><span class=\"jump\"><a href=\"#plan-" +
         id + "\">plan</a> \xc2\xb7 <a href=\"#elev-" + id + "\">profile</a></span></td>";
    o += "<td class=\"n\">" + km(h.at_m, 2) + "</td><td>" + esc(hazard_kind_label(h.kind)) + "</td><td>" +
         severity_cell(h.severity) + "</td><td class=\"classes\">" + classes_cell(h) + "</td>";
    o += "<td class=\"n\">" + fmt_fixed(h.sign.distance_m, 0) + " m</td><td class=\"n\">" + std::to_string(h.marshals) +
         "</td><td class=\"reason\">" + esc(h.reason) + "</td><td class=\"mono\">" + fmt_fixed(h.lat_deg, 5) + ",<br>" +
         fmt_fixed(h.lon_deg, 5) + "</td></tr>";
  }
  o += "</tbody></table></section>";
  return o;
}

std::string method_html(const CheckResult& c) {
  const auto& ho = c.hazard_options;
  std::string o = "<section id=\"method\"><h2><span class=\"num\">6</span>Method and assumptions</h2>";
  o += "<h3>Profile</h3><p>The course is resampled every " + fmt_fixed(c.analysis.spacing_m, 1) +
       " m along its geodesic length and draped on the terrain model by bilinear interpolation. Raw steps steeper than "
       "a plausible road are repaired as terrain artefacts (bridges, tunnels), then the heights are smoothed with a "
       "Gaussian filter (\xcf\x83 " + fmt_fixed(c.analysis.profile.smoothing_sigma_m, 0) +
       " m). Climbs are found with a dip tolerance; their score is (mean gradient in %)\xc2\xb2 \xc3\x97 length in km, "
       "and the category follows from configurable lower bounds (by default 4 from 35, 3 from 80, 2 from 180, 1 from "
       "300, HC from 600). Categories are a consistent yardstick, not an official classification.</p>";
  o += "<h3>Speeds</h3><p>Each class rides a power model integrated along the road:</p>"
       "<div class=\"formula\">P_pedal = (P_air + P_roll + P_bearing + P_gravity + P_kinetic) / E_c\n"
       "P_air = \xc2\xbd \xcf\x81 (CdA + F_w) V_a|V_a| V_g     P_roll = V_g cos(atan G) Crr m g\n"
       "P_gravity = V_g m g sin(atan G)     P_bearing = V_g (91 + 8.7 V_g) 10\xe2\x81\xbb\xc2\xb3</div>"
       "<p>Air density from the standard atmosphere pressure at each height and the air temperature; wind as a "
       "component along the direction of travel. The <b>planned</b> ride brakes at the class's comfortable "
       "deceleration, allowing for the gradient, so that it reaches each corner at its safe speed; the "
       "<b>unbraked</b> ride is the same rider not slowing for corners (still held to its willing maximum).</p>";
  o += "<h3>Corners and safe speed</h3><p>Corners are found from the course geometry; the widest path through each "
       "follows from the road state (closed road: its width; open road: the rider's lane). The safe speed of a class "
       "is the lower of its comfortable lean limit and the grip limit:</p><div class=\"formula\">"
       "V_lean = \xe2\x88\x9a(g R tan \xce\xb8_comfort)     V_grip = \xe2\x88\x9a(g R (e + f))     g = 9.80665 m/s\xc2\xb2</div>"
       "<p>with grip f = " + fmt_fixed(ho.grip_friction_dry, 2) + " on a dry and " + fmt_fixed(ho.grip_friction_wet, 2) +
       " on a wet road and crossfall e = " + fmt_fixed(ho.superelevation, 2) + " (a flat turn: the terrain model cannot "
       "tell).</p>";
  o += "<h3>Hazards, signs and marshals</h3><ul>"
       "<li><b>Corner reached too fast</b>: a class's unbraked entry speed is above its safe speed. Severity starts at "
       "note, rises to caution from " + fmt_fixed(ho.severity.caution_excess_ratio * 100.0, 0) + " % over the safe speed "
       "and to serious from " + fmt_fixed(ho.severity.serious_excess_ratio * 100.0, 0) + " %, one level more when braking "
       "does not fit in the straight before the corner, and one more when the entry speed is " +
       kmh(ho.severity.fast_entry_mps) + " km/h or more (capped at critical).</li>"
       "<li>Braking distance: d = v t + (v\xc2\xb2 \xe2\x88\x92 v_safe\xc2\xb2) / (2 a), a = a_brake \xe2\x88\x92 g sin(atan(\xe2\x88\x92G)).</li>"
       "<li><b>Corner hidden from view</b>: the corner lies beyond what a rider sees at the stopping sight distance "
       "S = v t + v\xc2\xb2 / (2 g (f + G)), f = " + fmt_fixed(c.environment.wet ? ho.sight_friction_wet : ho.sight_friction_dry, 2) +
       ", t = " + fmt_fixed(ho.sight_reaction_time_s, 1) + " s, eye " + fmt_fixed(ho.eye_height_m, 1) +
       " m above the road, over the road's crests and the terrain.</li>"
       "<li><b>Fast section</b>: a class rides above " + kmh(ho.fast_speed_mps) + " km/h for at least " +
       fmt_fixed(ho.fast_min_length_m, 0) + " m. <b>Steep descent</b>: a mean gradient of " +
       fmt_fixed(ho.steep_descent_pct, 0) + " % or steeper over " + fmt_fixed(ho.steep_window_m, 0) + " m.</li>"
       "<li>Warning sign distance by approach speed (the fastest class) from the table of the UK Traffic Signs "
       "Manual, Chapter 4.</li>"
       "<li>Marshals: " + std::to_string(ho.severity.marshals_serious) + " at a serious and " +
       std::to_string(ho.severity.marshals_critical) + " at a critical hazard, plus " +
       std::to_string(ho.severity.extra_marshals_if_hidden) + " upstream with a flag where the riders cannot see it "
       "in time. The severity scale and the marshal counts are our own assumptions; change them to local rules.</li>"
       "</ul>";
  // Parameters of every class.
  o += "<h3>Rider class parameters</h3><table class=\"params\" id=\"class-parameters\"><thead><tr><th>parameter</th>";
  for (const auto& rc : c.classes) o += "<th class=\"n\">" + esc(rc.name) + "</th>";
  o += "</tr></thead><tbody>";
  for (const RiderField& f : rider_fields()) {
    std::string unit = f.unit;
    if (const auto hat = unit.find("^2"); hat != std::string::npos) unit.replace(hat, 2, "\xc2\xb2");
    o += "<tr><td>" + esc(f.label) + (unit == "-" ? std::string() : ", " + esc(unit)) + "</td>";
    for (const auto& rc : c.classes) o += "<td class=\"n\">" + fmt_fixed(rc.*f.member * f.si_to_unit, f.decimals) + "</td>";
    o += "</tr>";
  }
  o += "</tbody></table>";
  o += "<h3>Sources</h3><ul class=\"sources\">"
       "<li>Martin, Milliken, Cobb, McFadden &amp; Coggan (1998), <i>Validation of a mathematical model for road "
       "cycling power</i>, Journal of Applied Biomechanics 14(3): the power model and its constants.</li>"
       "<li>ISO 2533:1975, <i>Standard Atmosphere</i>: air pressure with height.</li>"
       "<li>AASHTO, <i>Guide for the Development of Bicycle Facilities</i> (1999; wet friction from the 2012 "
       "edition): stopping sight distance, eye height, reaction time, the grip form of the corner radius.</li>"
       "<li>Pein, <i>High Speed Bicycling</i>: braking deceleration and the effect of the gradient.</li>"
       "<li>UK Department for Transport, <i>Traffic Signs Manual, Chapter 4: Warning Signs</i> (2013), Appendix A: "
       "warning sign distances.</li>"
       "<li>The project's own documents <i>Method: from a course line to a cleaned profile</i>, <i>Rider classes and "
       "the speed model</i>, <i>Corners, road state and safe corner speed</i>, <i>Hazard rules and sight lines</i> and <i>What the model does not know</i> give every "
       "formula, default and assumption in full.</li></ul>";
  o += "</section>";
  return o;
}

}  // namespace

std::string report_html(const CheckResult& c, const ReportInfo& info) {
  const std::string title = "Course safety check: " + (c.analysis.course.name.empty() ? std::string("unnamed course") : c.analysis.course.name);
  std::string o;
  o.reserve(1 << 20);
  o += "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
  o += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
  o += "<meta name=\"generator\" content=\"" + esc(info.generator) + "\">\n";
  // An empty icon, so that no browser asks for one.
  o += "<link rel=\"icon\" href=\"data:,\">\n";
  o += "<title>" + esc(title) + "</title>\n<style>" + std::string(kStyle) + "</style>\n</head>\n<body>\n<main>\n";
  o += header_html(c, info) + "\n";
  o += caution_html() + "\n";
  o += summary_html(c) + "\n";
  o += elevation_html(c) + "\n";
  o += speeds_html(c) + "\n";
  o += plan_html(c) + "\n";
  o += hazards_html(c) + "\n";
  o += method_html(c) + "\n";
  o += "<footer><p>" + esc(kDisclaimer) + "</p><p>Files beside this report: summary.json, profile.csv, hazards.csv, "
       "hazards.geojson, hazards.gpx, course.geojson, climbs.geojson.</p></footer>\n";
  o += "</main>\n</body>\n</html>\n";
  return o;
}

}  // namespace coursewarden
