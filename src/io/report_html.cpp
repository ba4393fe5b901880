// The organiser's report: one self-contained HTML page with inline CSS and inline SVG.
//
// The page loads nothing: no scripts, fonts, images, style sheets or tiles. Its look (palette,
// marker shapes, layout) is our own and is described in docs/report.md.
#include "coursewarden/report.hpp"

#include <algorithm>
#include <array>
#include <cctype>
#include <chrono>
#include <cmath>
#include <ctime>
#include <limits>

#include "coursewarden/hazards.hpp"
#include "coursewarden/ops_outputs.hpp"
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
.verdict{display:inline-block;padding:0 8px;border:1.5px solid var(--ink);border-radius:9px;font-size:12px;
font-weight:700;line-height:17px;white-space:nowrap}
.v-suitable{background:#fff;color:var(--ink)}
.v-demanding{background:#e6e3d3;color:var(--ink);border-style:dashed}
.v-unsuitable{background:var(--ink);color:#fff}
.grade-callout{display:flex;gap:16px;align-items:center;border:1px solid var(--rule);border-left:8px solid var(--teal);
background:#edf3f0;padding:10px 16px;margin:12px 0}
.grade-level{font-family:"DejaVu Serif","Liberation Serif",Georgia,serif;font-size:34px;font-weight:700;color:var(--teal);
line-height:1;text-align:center;min-width:52px}
.grade-level span{display:block;font:11px "DejaVu Sans",Arial,sans-serif;color:var(--soft);margin-top:3px}
#reverse-direction{margin:10px 0 0}
.who{font-size:11.5px;color:var(--soft);white-space:nowrap}
table.schedule td{padding:3px 7px}
table.schedule td.where{min-width:180px}
table.schedule th.n{white-space:normal}
table.schedule .who{white-space:normal}
#waves td:first-child{white-space:nowrap}
table.schedule tr.row-finish td{border-top:2px solid var(--ink);font-weight:700}
table.schedule tr.row-checkpoint td:nth-child(2){background:#edf3f0}
table.schedule tr.behind td{background:#f6e3d8}
table.schedule tr.behind td:first-child{box-shadow:inset 5px 0 0 #c0502c}
.flag{display:inline-block;font-size:11px;font-weight:700;color:#5a200c;border:1px solid #5a200c;background:#fff;
padding:0 4px;margin-top:2px;white-space:nowrap}
#grade-scale tr.this-course td{font-weight:700;background:#edf3f0;border-top:2px solid var(--ink);border-bottom:2px solid var(--ink)}
#grade-scale td.here{white-space:nowrap;color:var(--teal)}
ul.reasons{margin:0;padding-left:16px}
ul.reasons li{margin:1px 0}
.lvl{font-weight:700}
.sector-page{border-top:3px double var(--ink);margin-top:28px;padding-top:8px}
.sector-page .kicker{margin-bottom:2px}
.sector-title{font-size:19px;margin:2px 0 2px}
.sector-facts{margin:0 0 8px;font-size:14px}
.sector-maps{display:grid;grid-template-columns:minmax(0,3fr) minmax(0,1fr);gap:12px;align-items:start}
.sector-maps figure{margin:0}
.sector-maps figure.key figcaption{font-size:12px;color:var(--soft);margin-top:4px}
table.posts td.warn{min-width:200px}
table.posts td.covers{white-space:nowrap;font-size:12.5px}
.chart .course-other{fill:none;stroke:#aab1b6;stroke-width:1.6;stroke-linejoin:round}
.chart .post-spans path{fill:none;stroke:#1f5f5b;stroke-opacity:.35;stroke-width:10;stroke-linecap:round}
.chart .post-dot{fill:#1f5f5b;stroke:#fcfbf6;stroke-width:1.5}
.chart .post-box{fill:#1f5f5b;stroke:#0d2b29;stroke-width:1}
.chart .post-code{fill:#fff;font-size:15px;font-weight:700;text-anchor:middle}
.sector-plan .km-ticks text{font-size:12px}
.sector-plan .end-label{font-size:13px}
.chart .post-marker{cursor:pointer}
.sector-plan .leaders line{stroke:#1f5f5b;stroke-width:1.3}
.chart .key-frame{fill:none;stroke:#1f5f5b;stroke-width:1.6;stroke-dasharray:4 3}
.chart .key-start{fill:#1e2830}
.sector-key .course-line{stroke-width:2.6}
.chart .td-band{fill:#d7e7e1;stroke:none}
.chart .td-first{fill:none;stroke:#1f5f5b;stroke-width:1.8}
.chart .td-last{fill:none;stroke:#1e2830;stroke-width:1.8}
.chart .td-closing{fill:none;stroke:#3f5568;stroke-width:1.7;stroke-dasharray:6 4}
.chart .td-behind path{fill:none;stroke:#c0502c;stroke-width:5;stroke-linecap:round}
.chart .td-checkpoint{stroke:#5a646c;stroke-width:1;stroke-dasharray:2 3}
.chart .td-end{font-size:11.5px;fill:#1e2830}
.chart .td-label{font-size:11px;fill:#1e2830;paint-order:stroke;stroke:#fcfbf6;stroke-width:3px}
.chart .td-cutoff line,.chart .td-cutoff path{stroke:#5e1834;stroke-width:2.5;fill:none}
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
.sector-page{break-before:page;border-top:0;margin-top:0;padding-top:0}
table.posts a.jump{display:none}
.grade-callout{break-inside:avoid;-webkit-print-color-adjust:exact;print-color-adjust:exact}
.verdict,.flag,table.schedule tr.behind td{-webkit-print-color-adjust:exact;print-color-adjust:exact}
table.posts{font-size:8.5pt}
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
       "Hazards</a><a href=\"#schedule\">6 Schedule</a><a href=\"#marshals\">7 Marshal briefing</a><a "
       "href=\"#grading\">8 Grading</a><a href=\"#method\">9 Method</a></nav>";
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

// ---- pieces of the operations sections

// Clock times: rounded to the minute on the side that keeps people safe. Earlier for what must
// be in place in time (first riders, on post, road closed from), later for what must last long
// enough (last riders, closing vehicle, off post, road closed until). Hours go on past 24 as in
// schedule.csv.
enum class Round { down, nearest, up };

std::string hm(double clock_s, Round mode) {
  if (!std::isfinite(clock_s)) return "-";
  const double whole = static_cast<double>(std::llround(clock_s));  // whole seconds, as in the files
  double minutes = whole / 60.0;
  minutes = mode == Round::down ? std::floor(minutes) : mode == Round::up ? std::ceil(minutes) : std::round(minutes);
  const long long total = static_cast<long long>(minutes);
  const long long a = total < 0 ? -total : total;
  auto two = [](long long v) { return (v < 10 ? "0" : "") + std::to_string(v); };
  return (total < 0 ? "-" : "") + two(a / 60) + ":" + two(a % 60);
}

// A time cell: the minute shown, the exact time of the files in data-hms.
std::string tcell(double clock_s, Round mode) {
  if (!std::isfinite(clock_s)) return "-";
  return "<span class=\"t\" data-hms=\"" + clock_hms(clock_s) + "\">" + hm(clock_s, mode) + "</span>";
}

std::string verdict_pill(Suitability v) {
  const std::string name = suitability_name(v);
  return "<span class=\"verdict v-" + name + "\">" + name + "</span>";
}

// Text with hazard codes ("H07") turned into links to their rows.
std::string link_hazard_codes(const std::string& text, const CheckResult& c) {
  const std::string safe = esc(text);
  std::string o;
  std::size_t i = 0;
  while (i < safe.size()) {
    const bool start = safe[i] == 'H' && (i == 0 || !std::isalnum(static_cast<unsigned char>(safe[i - 1])));
    std::size_t j = i + 1;
    while (start && j < safe.size() && std::isdigit(static_cast<unsigned char>(safe[j]))) ++j;
    const bool word_end = j >= safe.size() || !std::isalnum(static_cast<unsigned char>(safe[j]));
    if (start && j > i + 1 && word_end) {
      const int number = std::stoi(safe.substr(i + 1, j - i - 1));
      const auto it = std::find_if(c.hazards.begin(), c.hazards.end(), [&](const Hazard& h) { return h.number == number; });
      if (it != c.hazards.end() && hazard_code(number, c.hazards.size()) == safe.substr(i, j - i)) {
        o += "<a href=\"#hazard-" + anchor(*it, c.hazards.size()) + "\">" + safe.substr(i, j - i) + "</a>";
        i = j;
        continue;
      }
    }
    o += safe[i];
    ++i;
  }
  return o;
}

// " · post M09": the marshal post that covers a hazard, linked to its row.
std::string post_link(const MarshalPlan& plan, int hazard_number) {
  for (const MarshalPost& post : plan.posts) {
    if (std::find(post.hazards.begin(), post.hazards.end(), hazard_number) != post.hazards.end()) {
      return " \xc2\xb7 <a href=\"#post-" + report_detail::post_anchor(post.code) + "\">post " + esc(post.code) + "</a>";
    }
  }
  return "";
}

// The course grade for mixed-ability groups, as a boxed line.
std::string grade_callout(const Grading& g, const std::string& id, bool pointer) {
  const CourseGrade& cg = g.course;
  const std::size_t levels = course_grade_scale().size();
  std::string o = "<div class=\"grade-callout\" id=\"" + id + "\" data-level=\"" + std::to_string(cg.level) +
                  "\"><div class=\"grade-level\">" + std::to_string(cg.level) + "<span>of " + std::to_string(levels) +
                  "</span></div><div><b>Course grade for mixed-ability groups: level " + std::to_string(cg.level) +
                  ", \xe2\x80\x9c" + esc(cg.name) + "\xe2\x80\x9d.</b> " + esc(cg.meaning) +
                  "<br><span class=\"caption\">" + std::to_string(cg.suitable) + " suitable, " +
                  std::to_string(cg.demanding) + " demanding, " + std::to_string(cg.unsuitable) + " unsuitable of " +
                  std::to_string(cg.suitable + cg.demanding + cg.unsuitable) +
                  " classes in the field; the grade depends on the field" +
                  (pointer ? std::string(" (scale and reasons in section 8).") : std::string(".")) + "</span></div></div>";
  return o;
}

// When a class finishes: from its wave's start (a range when it starts in several waves),
// rounded up to the minute like the last riders of the schedule.
std::string finish_at(const Schedule& sc, std::size_t class_index, double fallback_s) {
  double first = std::numeric_limits<double>::infinity(), last = -first;
  for (const ScheduledGroup& g : sc.groups) {
    if (g.class_index != class_index) continue;
    first = std::min(first, g.finish_s);
    last = std::max(last, g.finish_s);
  }
  if (!std::isfinite(first)) return hm(fallback_s, Round::up);
  // Rounded up, like the last riders of the schedule.
  const std::string a = hm(first, Round::up), b = hm(last, Round::up);
  return a == b ? a : a + "\xe2\x80\x93" + b;
}

std::string summary_html(const CheckResult& c, const Operations& ops) {
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
       "<th>grading</th><th class=\"n\">average speed</th><th class=\"n\">top speed</th><th class=\"n\">finish at</th><th>likely walking"
       "</th></tr></thead><tbody>";
  for (std::size_t k = 0; k < c.classes.size() && k < c.speeds.size(); ++k) {
    const SpeedProfile& sp = c.speeds[k];
    std::string walking = "-";
    if (!sp.walking_sections.empty()) {
      walking = std::to_string(sp.walking_sections.size()) + (sp.walking_sections.size() == 1 ? " stretch" : " stretches") +
                ", longest " + fmt_fixed(sp.longest_walking_m, 0) + " m";
    }
    const Suitability verdict = k < ops.grading.classes.size() ? ops.grading.classes[k].verdict : Suitability::suitable;
    o += "<tr data-class=\"" + esc(c.classes[k].name) + "\" data-verdict=\"" + suitability_name(verdict) + "\"><td><b>" +
         esc(c.classes[k].name) + "</b></td><td class=\"n\">" + duration(sp.total_time_s) + "</td><td>" +
         verdict_pill(verdict) + "</td><td class=\"n\">" + kmh(sp.moving_avg_speed_mps, 1) + " km/h</td><td class=\"n\">" +
         kmh(sp.max_speed_mps, 0) + " km/h</td><td class=\"n\">" + finish_at(ops.schedule, k, c.environment.start_time_s + sp.total_time_s) +
         "</td><td>" + walking + "</td></tr>";
  }
  o += "</tbody></table><p class=\"caption\">Times are for a rider riding alone without stops; the model's own "
       "spread on real climbs is several per cent. Grading: whether the class can ride the course (section 8).</p>";
  o += grade_callout(ops.grading, "summary-grade", true);
  if (c.reverse.checked) {
    const auto& r = c.reverse.counts;
    const int forward_severe = static_cast<int>(std::count_if(c.hazards.begin(), c.hazards.end(), [](const Hazard& h) {
      return h.severity == Severity::serious || h.severity == Severity::critical;
    }));
    o += "<p id=\"reverse-direction\" data-markedly-safer=\"" + std::string(c.reverse.markedly_safer ? "true" : "false") +
         "\"><b>The other way round:</b> ridden in reverse the course would have " + std::to_string(r[3]) +
         " critical, " + std::to_string(r[2]) + " serious, " + std::to_string(r[1]) + " caution and " +
         std::to_string(r[0]) + " note hazards (" + std::to_string(r[2] + r[3]) + " serious or critical against " +
         std::to_string(forward_severe) + " this way), " +
         (c.reverse.markedly_safer ? "markedly fewer severe hazards: consider running it the other way."
                                   : "not markedly safer than this direction.") +
         "</p>";
  }
  o += "</section>";
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

std::string hazards_html(const CheckResult& c, const Operations& ops) {
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
         id + "\">plan</a> \xc2\xb7 <a href=\"#elev-" + id + "\">profile</a>" + post_link(ops.marshal_plan, h.number) +
         "</span></td>";
    o += "<td class=\"n\">" + km(h.at_m, 2) + "</td><td>" + esc(hazard_kind_label(h.kind)) + "</td><td>" +
         severity_cell(h.severity) + "</td><td class=\"classes\">" + classes_cell(h) + "</td>";
    o += "<td class=\"n\">" + fmt_fixed(h.sign.distance_m, 0) + " m</td><td class=\"n\">" + std::to_string(h.marshals) +
         "</td><td class=\"reason\">" + esc(h.reason) + "</td><td class=\"mono\">" + fmt_fixed(h.lat_deg, 5) + ",<br>" +
         fmt_fixed(h.lon_deg, 5) + "</td></tr>";
  }
  o += "</tbody></table></section>";
  return o;
}

// The classes of a schedule row's group, with the wave when there are several.
std::string who(const std::string& cls, const std::string& wave, bool waves) {
  return "<br><span class=\"who\">" + esc(cls) + (waves ? ", " + esc(wave) : std::string()) + "</span>";
}

// Rows of the schedule shown in the report: the start and every 5th km, checkpoints, hazards
// and the finish (the full timetable is in schedule.csv).
bool shown_in_report(const ScheduleRow& row) {
  if (row.kind != ScheduleKind::km) return true;
  const double fifth = row.at_m / 5000.0;
  return std::fabs(fifth - std::round(fifth)) * 5000.0 < 0.5;
}

std::string schedule_html(const CheckResult& c, const Operations& ops) {
  const Schedule& sc = ops.schedule;
  const bool waves = sc.waves.size() > 1;
  std::string o = "<section id=\"schedule\"><h2><span class=\"num\">6</span>Schedule</h2>";
  o += "<p class=\"caption\">When the first and the last riders and the closing vehicle pass each place, from each "
       "class's predicted ride. These are <b>moving times</b>: the model does not stop, so real riders, who stop at "
       "feeds and junctions, arrive later than the last riders shown. Keep the margins wide enough for that.</p>";
  // Waves and the closing vehicle.
  o += "<h3>Start and closing vehicle</h3><table id=\"waves\"><thead><tr><th>wave</th><th class=\"n\">start</th>"
       "<th>classes</th><th class=\"n\">first at the finish</th><th class=\"n\">last at the finish</th></tr></thead><tbody>";
  for (std::size_t w = 0; w < sc.waves.size(); ++w) {
    const ScheduledWave& wave = sc.waves[w];
    double first = std::numeric_limits<double>::infinity(), last = -first;
    std::string first_cls, last_cls;
    for (const ScheduledGroup& g : sc.groups) {
      if (g.wave != w) continue;
      if (g.finish_s < first) {
        first = g.finish_s;
        first_cls = g.class_name;
      }
      if (g.finish_s > last) {
        last = g.finish_s;
        last_cls = g.class_name;
      }
    }
    std::string classes;
    for (std::size_t k = 0; k < wave.classes.size(); ++k) {
      const std::size_t ci = wave.classes[k];
      classes += (k ? ", " : "") + (ci < c.classes.size() ? esc(c.classes[ci].name) : std::string("?"));
    }
    o += "<tr><td><b>" + esc(wave.name) + "</b></td><td class=\"n\">" + tcell(wave.start_time_s, Round::nearest) +
         "</td><td>" + classes + "</td><td class=\"n\">" + tcell(first, Round::down) + who(first_cls, "", false) +
         "</td><td class=\"n\">" + tcell(last, Round::up) + who(last_cls, "", false) + "</td></tr>";
  }
  o += "</tbody></table>";
  const ScheduleRow* finish = nullptr;
  for (const ScheduleRow& row : sc.rows) {
    if (row.kind == ScheduleKind::finish) finish = &row;
  }
  o += "<p id=\"closing-vehicle\">The <b>closing vehicle</b> leaves with the last wave at " +
       tcell(sc.last_start_s, Round::nearest) + " and keeps the event's minimum speed, " +
       fmt_fixed(sc.closing_speed_mps * 3.6, 1) + " km/h" +
       (finish ? ", reaching the finish at " + tcell(finish->closing_s, Round::up) : std::string()) +
       ". On the road it follows the last riders; riders more than " + fmt_fixed(sc.closing_grace_s / 60.0, 0) +
       " min behind it are slower than that minimum and ride outside the road closure.";
  if (std::isfinite(sc.time_limit_s)) {
    o += " Time limit: " + duration(sc.time_limit_s) + " from each rider's own wave start.";
  }
  o += "</p>";
  // Time against distance.
  std::vector<const ScheduleRow*> off_chart;
  const std::string chart = report_detail::time_distance_svg(c, sc, &off_chart);
  std::string later;
  for (const ScheduleRow* row : off_chart) {
    later += (later.empty() ? "" : ", ") + (row->kind == ScheduleKind::finish ? std::string("finish") : esc(row->label)) +
             " " + hm(row->cutoff_s, Round::nearest);
  }
  o += "<figure class=\"schedule-figure\"><figcaption><b>Who is where, when</b> \xc2\xb7 clock time against "
       "distance" + (later.empty() ? std::string() : " \xc2\xb7 cut-offs later than the chart shows: " + later) +
       "</figcaption>" + chart + "</figure>";
  o += "<ul class=\"legend\"><li><svg class=\"icon\" width=\"30\" height=\"10\" aria-hidden=\"true\"><line x1=\"0\" "
       "y1=\"5\" x2=\"30\" y2=\"5\" stroke=\"#1f5f5b\" stroke-width=\"2\"/></svg>first riders</li><li><svg "
       "class=\"icon\" width=\"30\" height=\"10\" aria-hidden=\"true\"><line x1=\"0\" y1=\"5\" x2=\"30\" y2=\"5\" "
       "stroke=\"#1e2830\" stroke-width=\"2\"/></svg>last riders</li><li><span class=\"swatch\" "
       "style=\"background:#d7e7e1\"></span>riders on the road</li><li><svg class=\"icon\" width=\"30\" height=\"10\" "
       "aria-hidden=\"true\"><line x1=\"0\" y1=\"5\" x2=\"30\" y2=\"5\" stroke=\"#3f5568\" stroke-width=\"1.8\" "
       "stroke-dasharray=\"6 4\"/></svg>closing vehicle</li><li><svg class=\"icon\" width=\"30\" height=\"10\" "
       "aria-hidden=\"true\"><line x1=\"2\" y1=\"5\" x2=\"28\" y2=\"5\" stroke=\"#c0502c\" stroke-width=\"5\" "
       "stroke-linecap=\"round\"/></svg>last riders behind the closing vehicle</li>";
  if (std::any_of(sc.rows.begin(), sc.rows.end(), [](const ScheduleRow& r) { return std::isfinite(r.cutoff_s); })) {
    o += "<li><svg class=\"icon\" width=\"20\" height=\"10\" aria-hidden=\"true\"><line x1=\"1\" y1=\"5\" x2=\"19\" "
         "y2=\"5\" stroke=\"#5e1834\" stroke-width=\"2.5\"/></svg>cut-off</li>";
  }
  o += "</ul>";
  // The table.
  std::size_t behind_shown = 0, behind_all = 0;
  for (const ScheduleRow& row : sc.rows) {
    if (!row.latest_behind_closing) continue;
    ++behind_all;
    if (shown_in_report(row)) ++behind_shown;
  }
  o += "<h3>Timetable</h3><p class=\"caption\">The start, every 5th km, each checkpoint and hazard, and the finish. "
       "<b>The timetable at every km is in schedule.csv</b>, with the times to the second. Times here are rounded to the "
       "minute on the safe side: down for the first riders and the road closing, up for the last riders, the closing "
       "vehicle and the road reopening.";
  if (behind_all > 0) {
    o += " <b>Rows marked \xe2\x80\x9c\xe2\x96\xb2 behind closing vehicle\xe2\x80\x9d</b> (" + std::to_string(behind_shown) +
         " here, " + std::to_string(behind_all) + " in schedule.csv): the last riders pass more than " +
         fmt_fixed(sc.closing_grace_s / 60.0, 0) + " min after the closing vehicle.";
  }
  o += "</p>";
  const bool any_cutoff = std::any_of(sc.rows.begin(), sc.rows.end(), [](const ScheduleRow& r) { return std::isfinite(r.cutoff_s); });
  if (!any_cutoff) o += "<p class=\"caption\">No cut-off times and no time limit are set for this event.</p>";
  o += "<table id=\"schedule-table\" class=\"schedule\"><thead><tr><th class=\"n\">km</th><th>where</th>"
       "<th class=\"n\">first riders</th><th class=\"n\">last riders</th><th class=\"n\">closing vehicle</th>"
       "<th class=\"n\">road closed from</th><th class=\"n\">road closed until</th>" +
       std::string(any_cutoff ? "<th class=\"n\">cut-off</th><th>classes missing the cut-off</th>" : "") +
       "</tr></thead><tbody>";
  for (const ScheduleRow& row : sc.rows) {
    if (!shown_in_report(row)) continue;
    std::string where;
    switch (row.kind) {
      case ScheduleKind::km: where = "km " + fmt_fixed(row.at_m / 1000.0, 0); break;
      case ScheduleKind::finish: where = "<b>finish</b>"; break;
      case ScheduleKind::checkpoint:
        where = "<b>" + esc(row.label) + "</b>" + (row.checkpoint_kind.empty() ? "" : " <span class=\"who\">(" + esc(row.checkpoint_kind) + ")</span>");
        break;
      case ScheduleKind::hazard: {
        const auto it = std::find_if(c.hazards.begin(), c.hazards.end(),
                                     [&](const Hazard& h) { return h.number == row.hazard_number; });
        if (it == c.hazards.end()) {
          where = esc(row.label);
        } else {
          where = severity_icon(it->severity, 12) + " <a href=\"#hazard-" + anchor(*it, c.hazards.size()) + "\">" +
                  hazard_code(it->number, c.hazards.size()) + "</a> " + esc(hazard_kind_label(it->kind));
        }
        break;
      }
    }
    std::string missing;
    if (std::isfinite(row.cutoff_s)) {
      if (row.classes_missing_cutoff.empty()) {
        missing = "none";
      } else {
        for (std::size_t k = 0; k < row.classes_missing_cutoff.size(); ++k) {
          missing += (k ? ", " : "") + esc(row.classes_missing_cutoff[k]);
        }
        missing = "<b>" + missing + "</b>";
      }
    }
    o += "<tr class=\"row-" + std::string(schedule_kind_key(row.kind)) + (row.latest_behind_closing ? " behind" : "") +
         "\" data-kind=\"" + schedule_kind_key(row.kind) + "\" data-at-m=\"" + fmt_fixed(row.at_m, 1) + "\"" +
         (row.latest_behind_closing ? " data-behind=\"true\"" : "") + "><td class=\"n\">" + km(row.at_m, 2) +
         "</td><td class=\"where\">" +
         where + "</td><td class=\"n\" data-col=\"first\">" + tcell(row.earliest_s, Round::down) +
         who(row.earliest_class, row.earliest_wave, waves) + "</td><td class=\"n\" data-col=\"last\">" +
         tcell(row.latest_s, Round::up) + who(row.latest_class, row.latest_wave, waves) +
         (row.latest_behind_closing ? "<br><span class=\"flag\">\xe2\x96\xb2 behind closing vehicle</span>" : "") +
         "</td><td class=\"n\" data-col=\"closing\">" + tcell(row.closing_s, Round::up) +
         "</td><td class=\"n\" data-col=\"closed-from\">" + tcell(row.closure_open_s, Round::down) +
         "</td><td class=\"n\" data-col=\"closed-until\">" + tcell(row.closure_close_s, Round::up) +
         "</td>" +
         (any_cutoff ? "<td class=\"n\" data-col=\"cutoff\">" + tcell(row.cutoff_s, Round::nearest) +
                           "</td><td data-col=\"missing\">" + missing + "</td>"
                     : std::string()) +
         "</tr>";
  }
  o += "</tbody></table></section>";
  return o;
}

std::string marshals_html(const CheckResult& c, const Operations& ops, const ReportInfo& info) {
  const MarshalPlan& mp = ops.marshal_plan;
  const OperationsRules& rules = c.ops.rules;
  std::string o = "<section id=\"marshals\"><h2><span class=\"num\">7</span>Marshal briefing</h2>";
  if (mp.posts.empty()) {
    o += "<p>No marshal posts: no hazard asks for marshals and no junction-type turn was found. That does not mean "
         "none are needed: junctions with side roads, crossings and car parks are not in the course line.</p></section>";
    return o;
  }
  o += "<div class=\"tiles\" id=\"marshal-totals\">";
  auto tile = [&](const std::string& label, const std::string& value, const std::string& sub) {
    o += "<div class=\"tile\"><div class=\"label\">" + label + "</div><div class=\"value\">" + value +
         "</div><div class=\"sub\">" + sub + "</div></div>";
  };
  tile("Posts", std::to_string(mp.posts.size()), "in " + std::to_string(mp.sectors.size()) +
       (mp.sectors.size() == 1 ? " sector" : " sectors"));
  tile("Marshals needed", std::to_string(mp.marshals_needed), "each post staffed for its whole shift");
  tile("Posts at once", std::to_string(mp.peak_posts), "at most, at the same moment");
  tile("Marshals at once", std::to_string(mp.peak_marshals), "at most, first reached at " + hm(mp.peak_at_s, Round::down));
  o += "</div>";
  o += "<p class=\"caption\">Posts stand at every hazard that asks for marshals and at every junction-type turn "
       "(turning through " + fmt_fixed(c.hazard_options.sharp_turn_rad * kRadToDeg, 0) + "\xc2\xb0 or more), where "
       "riders must be directed. Places less than " + fmt_fixed(rules.merge_posts_within_m, 0) +
       " m apart share a post. <b>On post</b> " + fmt_fixed(rules.marshal_lead_s / 60.0, 0) +
       " min before the first riders (never asked earlier than " + fmt_fixed(rules.marshal_lead_max_s / 60.0, 0) +
       " min before them), <b>off post</b> " + fmt_fixed(rules.marshal_release_after_closing_s / 60.0, 0) +
       " min after the closing vehicle. The peak is what you could staff if marshals move between posts; the total, "
       "if they do not. Not in the plan: junctions with side roads, crossings, car parks, gravel, anything the course "
       "line does not show.</p>";
  o += "<table id=\"sector-table\"><thead><tr><th>sector</th><th class=\"n\">from km</th><th class=\"n\">to km</th>"
       "<th>posts</th><th class=\"n\">marshals</th><th class=\"n\">first on post</th><th class=\"n\">last off post</th>"
       "</tr></thead><tbody>";
  for (std::size_t s = 0; s < mp.sectors.size(); ++s) {
    const Sector& sec = mp.sectors[s];
    const std::string first = sec.posts.empty() ? "" : mp.posts[sec.posts.front()].code;
    const std::string last = sec.posts.empty() ? "" : mp.posts[sec.posts.back()].code;
    o += "<tr><td><a href=\"#sector-" + std::to_string(s + 1) + "\">" + esc(sec.name) + "</a></td><td class=\"n\">" +
         km(sec.from_m, 1) + "</td><td class=\"n\">" + km(sec.to_m, 1) + "</td><td>" + std::to_string(sec.posts.size()) +
         (sec.posts.empty() ? std::string() : ": " + esc(first) + (first == last ? "" : "\xe2\x80\x93" + esc(last))) +
         "</td><td class=\"n\">" + std::to_string(sec.marshals) + "</td><td class=\"n\">" +
         tcell(sec.first_on_post_s, Round::down) + "</td><td class=\"n\">" + tcell(sec.last_off_post_s, Round::up) +
         "</td></tr>";
  }
  o += "</tbody></table><p class=\"caption\">Each sector follows on a page of its own, to print and hand out. The "
       "posts are also in marshal-plan.csv and, as waypoints for a handheld GPS, marshal-plan.gpx.</p>";
  const std::string course = c.analysis.course.name.empty() ? std::string("Unnamed course") : c.analysis.course.name;
  for (std::size_t s = 0; s < mp.sectors.size(); ++s) {
    const Sector& sec = mp.sectors[s];
    const std::string n = std::to_string(s + 1);
    o += "<div class=\"sector-page\" id=\"sector-" + n + "\" data-sector=\"" + n + "\">";
    o += "<p class=\"kicker\">" + (c.event_name.empty() ? std::string() : esc(c.event_name) + " \xc2\xb7 ") + esc(course) +
         (c.event_date.empty() ? std::string() : " \xc2\xb7 " + esc(c.event_date)) + " \xc2\xb7 marshal briefing, page " + n +
         " of " + std::to_string(mp.sectors.size()) + "</p>";
    o += "<h3 class=\"sector-title\">" + esc(sec.name) + " \xc2\xb7 km " + km(sec.from_m, 1) + " to " + km(sec.to_m, 1) +
         "</h3>";
    o += "<p class=\"sector-facts\"><b>" + std::to_string(sec.posts.size()) + (sec.posts.size() == 1 ? " post" : " posts") +
         ", " + std::to_string(sec.marshals) + (sec.marshals == 1 ? " marshal" : " marshals") +
         "</b> \xc2\xb7 first on post " + tcell(sec.first_on_post_s, Round::down) + " \xc2\xb7 last off post " +
         tcell(sec.last_off_post_s, Round::up) + "</p>";
    o += "<div class=\"sector-maps\"><figure>" + report_detail::sector_plan_svg(c, mp, s) +
         "</figure><figure class=\"key\">" + report_detail::sector_key_svg(c, mp, s) +
         "<figcaption>Where it lies: the whole course, this sector in bold, the plan's frame dashed, start "
         "\xe2\x96\xa0.</figcaption></figure></div>";
    o += "<table class=\"posts\" id=\"posts-" + n + "\"><thead><tr><th>post</th><th class=\"n\">km</th>"
         "<th class=\"n\">marshals</th><th class=\"n\">on post</th><th class=\"n\">off post</th><th>warn riders of</th>"
         "<th>covers</th><th>position</th></tr></thead><tbody>";
    for (std::size_t p : sec.posts) {
      const MarshalPost& post = mp.posts[p];
      const std::string a = report_detail::post_anchor(post.code);
      std::string covers;
      for (int number : post.hazards) {
        const auto it = std::find_if(c.hazards.begin(), c.hazards.end(), [&](const Hazard& h) { return h.number == number; });
        if (it == c.hazards.end()) continue;
        covers += (covers.empty() ? "" : "<br>") + severity_icon(it->severity, 11) + " <a class=\"covers\" href=\"#hazard-" +
                  anchor(*it, c.hazards.size()) + "\">" + hazard_code(number, c.hazards.size()) + "</a>";
      }
      for (std::size_t k : post.turns) {
        if (k >= c.corners.size()) continue;
        covers += (covers.empty() ? "" : "<br>") + std::string("turn, km ") + km(c.corners[k].apex_m, 2);
      }
      const std::string span = post.spread_m > 1.0 ? "<br><span class=\"who\">" + km(post.first_m, 2) + "\xe2\x80\x93" +
                                                         km(post.last_m, 2) + "</span>"
                                                   : std::string();
      o += "<tr id=\"post-" + a + "\" data-post=\"" + esc(post.code) + "\"><td><b>" + esc(post.code) +
           "</b><br><a class=\"jump\" href=\"#map-" + a + "\">plan</a></td><td class=\"n\">" + km(post.at_m, 2) + span +
           "</td><td class=\"n\">" + std::to_string(post.count) + "</td><td class=\"n\">" +
           tcell(post.on_post_s, Round::down) + "<br><span class=\"who\">not before " + hm(post.not_before_s, Round::down) +
           "</span></td><td class=\"n\">" + tcell(post.off_post_s, Round::up) + "</td><td class=\"warn\">" +
           esc(post.warn) + "</td><td class=\"covers\">" + covers + "</td><td class=\"mono\">" +
           fmt_fixed(post.lat_deg, 5) + ",<br>" + fmt_fixed(post.lon_deg, 5) + "</td></tr>";
    }
    o += "</tbody></table>";
    o += "<p class=\"caption sector-note\">On post: " + fmt_fixed(rules.marshal_lead_s / 60.0, 0) +
         " min before the first riders; off post: " + fmt_fixed(rules.marshal_release_after_closing_s / 60.0, 0) +
         " min after the closing vehicle. Position: latitude, longitude (WGS84). Moving times from a model: confirm "
         "them with the event's timetable" +
         (info.check_date.empty() ? std::string() : "; checked on " + esc(info.check_date)) + ".</p>";
    o += "</div>";
  }
  o += "</section>";
  return o;
}

// "3/4", "1/2": a share as a small fraction where one fits, else a decimal.
std::string share_text(double share) {
  for (int d : {2, 3, 4, 5, 6, 8, 10}) {
    const double n = share * d;
    if (std::fabs(n - std::round(n)) < 1e-9) {
      const long k = std::lround(n);
      return k == 0 ? "0" : k == d ? "1" : std::to_string(k) + "/" + std::to_string(d);
    }
  }
  return fmt_fixed(share, 2);
}

std::string grading_html(const CheckResult& c, const Operations& ops) {
  const Grading& g = ops.grading;
  std::string o = "<section id=\"grading\"><h2><span class=\"num\">8</span>Grading for clubs</h2>";
  o += grade_callout(g, "course-grade", false);
  o += "<h3>The scale</h3><p class=\"caption\">Our own scale for a club riding together: the <b>fit share</b> is "
       "(suitable classes + half the demanding ones) / classes; here (" + std::to_string(g.course.suitable) + " + " +
       std::to_string(g.course.demanding) + "/2) / " +
       std::to_string(g.course.suitable + g.course.demanding + g.course.unsuitable) + " = " +
       fmt_fixed(g.course.fit_share, 2) + ".</p>";
  o += "<table id=\"grade-scale\"><thead><tr><th class=\"n\">level</th><th>name</th><th>fit share</th><th>meaning</th>"
       "<th></th></tr></thead><tbody>";
  const auto scale = course_grade_scale();
  for (std::size_t k = 0; k < scale.size(); ++k) {
    const GradeLevel& level = scale[k];
    std::string share;
    if (level.min_fit_share >= 1.0) {
      share = "1 (every class suitable)";
    } else if (level.min_fit_share <= 0.0) {
      share = k > 0 ? "below " + share_text(scale[k - 1].min_fit_share) : std::string("any");
    } else {
      share = "at least " + share_text(level.min_fit_share);
    }
    const bool here = level.level == g.course.level;
    o += "<tr" + std::string(here ? " class=\"this-course\" aria-current=\"true\"" : "") + " data-level=\"" +
         std::to_string(level.level) + "\"><td class=\"n\">" + std::to_string(level.level) + "</td><td>" + esc(level.name) +
         "</td><td>" + share + "</td><td>" + esc(level.meaning) + "</td><td class=\"here\">" +
         (here ? "\xe2\x97\x80 this course" : "") + "</td></tr>";
  }
  o += "</tbody></table>";
  o += "<h3>Each class</h3><table id=\"grading-table\"><thead><tr><th>rider class</th><th>verdict</th>"
       "<th class=\"n\">time</th><th>why</th></tr></thead><tbody>";
  for (std::size_t k = 0; k < g.classes.size(); ++k) {
    const ClassGrade& cg = g.classes[k];
    std::string reasons;
    if (cg.reasons.empty()) {
      reasons = "nothing found that the class cannot comfortably handle";
    } else {
      reasons = "<ul class=\"reasons\">";
      for (const GradeReason& why : cg.reasons) {
        reasons += "<li><span class=\"lvl\">" + std::string(suitability_name(why.level)) + ":</span> " +
                   link_hazard_codes(why.text, c) + "</li>";
      }
      reasons += "</ul>";
    }
    o += "<tr data-class=\"" + esc(cg.class_name) + "\" data-verdict=\"" + suitability_name(cg.verdict) + "\"><td><b>" +
         esc(cg.class_name) + "</b></td><td>" + verdict_pill(cg.verdict) + "</td><td class=\"n\">" +
         duration(cg.ride_time_s) + "</td><td>" + reasons + "</td></tr>";
  }
  o += "</tbody></table><p class=\"caption\"><b>Suitable</b>: nothing found that the class cannot comfortably handle. "
       "<b>Demanding</b>: it can ride the course with effort or care. <b>Unsuitable</b>: it should not ride it. Each "
       "finding is graded on its own and the verdict is the worst of them; the thresholds are our own assumptions "
       "(section 9).</p>";
  o += "</section>";
  return o;
}

std::string operations_method_html(const CheckResult& c) {
  const OperationsRules& r = c.ops.rules;
  auto minutes = [](double s) { return fmt_fixed(s / 60.0, 0) + " min"; };
  std::string o = "<h3>Event operations</h3><ul id=\"operations-rules\">";
  o += "<li><b>Timing</b>: a group (a class in a start wave) passes a place at its wave's start plus the class's planned "
       "ride time to it, interpolated between stations. First riders: the earliest group; last riders: the latest.</li>";
  o += "<li><b>Closing vehicle</b>: leaves with the last wave and keeps " + fmt_fixed(r.closing_speed_mps * 3.6, 1) +
       " km/h, the event's minimum speed (our assumption unless the event file sets it). Last riders count as behind "
       "it when they pass more than " + minutes(r.closing_grace_s) + " after it.</li>";
  o += "<li><b>Road closure</b>: closed " + minutes(r.closure_margin_before_s) + " before the first riders, reopened " +
       minutes(r.closure_margin_after_s) + " after the closing vehicle (our assumptions).</li>";
  o += "<li><b>Marshal shifts</b>: on post " + minutes(r.marshal_lead_s) + " before the first riders and never asked "
       "to be there more than " + minutes(r.marshal_lead_max_s) + " before them; released " +
       minutes(r.marshal_release_after_closing_s) + " after the closing vehicle. By default this is what the French "
       "sport code (<i>Code du sport</i>, arts. A331-37 to A331-40) requires of race marshals on the public road: in "
       "place at least 15 and at most 30 minutes before the race passes, leaving 15 minutes after the closing "
       "vehicle. Elsewhere the organiser sets the rule.</li>";
  o += "<li><b>Posts</b>: every hazard that asks for marshals and every junction-type turn (" +
       std::to_string(r.marshals_per_turn) + (r.marshals_per_turn == 1 ? " marshal" : " marshals") +
       "); places less than " + fmt_fixed(r.merge_posts_within_m, 0) + " m after a post's first place join it; a "
       "post spread over more than " + fmt_fixed(r.merged_post_extra_from_m, 0) + " m gets one marshal more; sectors "
       "of " + km(r.sector_length_m, 0) + " km, at most " + std::to_string(r.max_posts_per_sector) +
       " posts a page (our assumptions).</li>";
  o += "<li><b>Grading</b>: demanding above " + fmt_fixed(r.demanding_time_share * 100.0, 0) + " % of the time limit" +
       (std::isfinite(r.time_limit_s) ? " (" + duration(r.time_limit_s) + ")" : std::string(" (none set)")) +
       ", or less than " + minutes(r.cutoff_margin_s) + " before a cut-off; unsuitable over the limit, after a "
       "cut-off, behind the closing vehicle at the finish, walking more than " + fmt_fixed(r.max_walking_m, 0) +
       " m, or with " + std::to_string(r.critical_hazards_unsuitable) + " or more critical hazards its hardest braking "
       "cannot rescue (our assumptions).</li>";
  o += "</ul>";
  return o;
}

std::string method_html(const CheckResult& c) {
  const auto& ho = c.hazard_options;
  const CategoryScale& cs = c.analysis.category_scale;
  const CategoryScale defaults;
  const bool default_scale = cs.cat4_min == defaults.cat4_min && cs.cat3_min == defaults.cat3_min &&
                             cs.cat2_min == defaults.cat2_min && cs.cat1_min == defaults.cat1_min &&
                             cs.hc_min == defaults.hc_min;
  std::string o = "<section id=\"method\"><h2><span class=\"num\">9</span>Method and assumptions</h2>";
  o += "<h3>Profile</h3><p>The course is resampled every " + fmt_fixed(c.analysis.spacing_m, 1) +
       " m along its geodesic length and draped on the terrain model by bilinear interpolation. Raw steps steeper than "
       "a plausible road are repaired as terrain artefacts (bridges, tunnels), then the heights are smoothed with a "
       "Gaussian filter (\xcf\x83 " + fmt_fixed(c.analysis.profile.smoothing_sigma_m, 0) +
       " m). Climbs are found with a dip tolerance; their score is (mean gradient in %)\xc2\xb2 \xc3\x97 length in km, "
       "and the category follows from lower bounds of the score. <span id=\"category-scale\">This check used: category 4 "
       "from " + fmt_fixed(cs.cat4_min, 0) + ", 3 from " + fmt_fixed(cs.cat3_min, 0) + ", 2 from " +
       fmt_fixed(cs.cat2_min, 0) + ", 1 from " + fmt_fixed(cs.cat1_min, 0) + ", HC from " + fmt_fixed(cs.hc_min, 0) +
       "</span>" + (default_scale ? " (the defaults)" : " (set for this check; the defaults are 35, 80, 180, 300 and 600)") +
       ". Categories are a consistent yardstick, not an official classification.</p>";
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
  o += operations_method_html(c);
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
       "<li><i>Code du sport</i> (France), articles A331-37 to A331-40: when race marshals are in place and when "
       "they leave (the default shift rule of the marshal plan).</li>"
       "<li>The project's own documents <i>Method: from a course line to a cleaned profile</i>, <i>Rider classes and "
       "the speed model</i>, <i>Corners, road state and safe corner speed</i>, <i>Hazard rules and sight lines</i>, <i>Event operations: schedule, marshal plan and grading for clubs</i> "
       "and <i>What the model does not know</i> give every "
       "formula, default and assumption in full.</li></ul>";
  o += "</section>";
  return o;
}

}  // namespace

std::string report_html(const CheckResult& c, const ReportInfo& info) {
  return report_html(c, plan_operations(c), info);
}

std::string report_html(const CheckResult& c, const Operations& ops, const ReportInfo& info) {
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
  o += summary_html(c, ops) + "\n";
  o += elevation_html(c) + "\n";
  o += speeds_html(c) + "\n";
  o += plan_html(c) + "\n";
  o += hazards_html(c, ops) + "\n";
  o += schedule_html(c, ops) + "\n";
  o += marshals_html(c, ops, info) + "\n";
  o += grading_html(c, ops) + "\n";
  o += method_html(c) + "\n";
  o += "<footer><p>" + esc(kDisclaimer) + "</p><p>Files beside this report: summary.json, profile.csv, hazards.csv, "
       "hazards.geojson, hazards.gpx, course.geojson, climbs.geojson, schedule.csv, marshal-plan.csv, "
       "marshal-plan.gpx.</p></footer>\n";
  o += "</main>\n</body>\n</html>\n";
  return o;
}

}  // namespace coursewarden
