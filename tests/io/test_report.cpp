// The organiser's report (report.html) and the report folder. Golden values come from the sample
// course's DESIGN (sample_courses/ronde-orvalune/README.md, features.csv, tools/sample_plan.cpp),
// not from the program's own output.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <filesystem>
#include <limits>
#include <map>
#include <regex>
#include <set>
#include <string>

#include "coursewarden/check.hpp"
#include "coursewarden/check_outputs.hpp"
#include "coursewarden/error.hpp"
#include "coursewarden/operations.hpp"
#include "coursewarden/ops_outputs.hpp"
#include "coursewarden/outputs.hpp"
#include "coursewarden/report.hpp"
#include "coursewarden/report_files.hpp"
#include "io/report_svg.hpp"
#include "support/support.hpp"
#include "util/text.hpp"

using namespace coursewarden;

namespace {

const std::string kSample = std::string(COURSEWARDEN_SOURCE_DIR) + "/sample_courses/ronde-orvalune";

// The check of the sample course, run once for the whole file.
const CheckResult& sample() {
  static const CheckResult result = [] {
    CheckOptions options;
    options.analysis.course_path = kSample + "/course.gpx";
    options.analysis.dem_path = kSample + "/dem.tif";
    return run_check(options);
  }();
  return result;
}

ReportInfo fixed_info() {
  ReportInfo info;
  info.check_date = "2025-01-01";
  info.generator = "coursewarden (test)";
  return info;
}

const std::string& sample_html() {
  static const std::string html = report_html(sample(), fixed_info());
  return html;
}

std::size_t count(const std::string& text, const std::string& what) {
  std::size_t n = 0;
  for (std::size_t at = text.find(what); at != std::string::npos; at = text.find(what, at + what.size())) ++n;
  return n;
}

// The <svg ...> ... </svg> element whose id is `id` (charts hold no nested svg).
std::string svg_with_id(const std::string& html, const std::string& id) {
  const std::size_t start = html.find("<svg id=\"" + id + "\"");
  if (start == std::string::npos) return "";
  const std::size_t end = html.find("</svg>", start);
  return html.substr(start, end - start + 6);
}

// The number shown in a summary tile, e.g. "68.0" from ...Length</div><div class="value">68.0 km.
double tile_value(const std::string& html, const std::string& label) {
  const std::regex re(label + "</div><div class=\"value\">([0-9.]+)");
  std::smatch m;
  if (!std::regex_search(html, m, re)) return NAN;
  return parse_number(m[1].str()).value_or(NAN);
}

std::vector<std::string> hazard_codes(const CheckResult& r) {
  std::vector<std::string> out;
  for (const auto& h : r.hazards) {
    std::string code = report_detail::hazard_code(h.number, r.hazards.size());
    code[0] = 'h';
    out.push_back(code);
  }
  return out;
}

// WCAG 2.1 relative luminance of an sRGB colour "#rrggbb" (W3C, Web Content Accessibility
// Guidelines 2.1, definition of relative luminance).
double luminance(const std::string& hex) {
  auto channel = [&](int k) {
    const double c = std::stoi(hex.substr(1 + 2 * static_cast<std::size_t>(k), 2), nullptr, 16) / 255.0;
    return c <= 0.03928 ? c / 12.92 : std::pow((c + 0.055) / 1.055, 2.4);
  };
  return 0.2126 * channel(0) + 0.7152 * channel(1) + 0.0722 * channel(2);
}

const Operations& sample_ops() {
  static const Operations ops = plan_operations(sample());
  return ops;
}

// Fields of one CSV line (RFC 4180 quoting).
std::vector<std::string> csv_fields(const std::string& line) {
  std::vector<std::string> out(1);
  bool quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char ch = line[i];
    if (quoted) {
      if (ch == '"' && i + 1 < line.size() && line[i + 1] == '"') {
        out.back() += '"';
        ++i;
      } else if (ch == '"') {
        quoted = false;
      } else {
        out.back() += ch;
      }
    } else if (ch == '"') {
      quoted = true;
    } else if (ch == ',') {
      out.emplace_back();
    } else {
      out.back() += ch;
    }
  }
  return out;
}

// The rows of a CSV text as maps from the header's names.
std::vector<std::map<std::string, std::string>> csv_rows(const std::string& text) {
  std::vector<std::map<std::string, std::string>> rows;
  std::vector<std::string> head;
  std::size_t at = 0;
  while (at < text.size()) {
    std::size_t end = text.find('\n', at);
    if (end == std::string::npos) end = text.size();
    const auto fields = csv_fields(text.substr(at, end - at));
    at = end + 1;
    if (head.empty()) {
      head = fields;
      continue;
    }
    std::map<std::string, std::string> row;
    for (std::size_t k = 0; k < head.size() && k < fields.size(); ++k) row[head[k]] = fields[k];
    rows.push_back(row);
  }
  return rows;
}

// The element <tag ...> whose opening text contains `marker`, up to its closing tag (no nesting
// of the same tag inside).
std::string element_with(const std::string& html, const std::string& tag, const std::string& marker) {
  const std::size_t hit = html.find(marker);
  if (hit == std::string::npos) return "";
  const std::size_t start = html.rfind("<" + tag, hit);
  const std::size_t end = html.find("</" + tag + ">", hit);
  if (start == std::string::npos || end == std::string::npos) return "";
  return html.substr(start, end - start + tag.size() + 3);
}

// The time cell of a schedule row: {data-hms, shown text}.
std::pair<std::string, std::string> time_cell(const std::string& row, const std::string& col) {
  const std::regex re("data-col=\"" + col + "\"><span class=\"t\" data-hms=\"([^\"]*)\">([^<]*)</span>");
  std::smatch m;
  if (!std::regex_search(row, m, re)) return {"", ""};
  return {m[1].str(), m[2].str()};
}

// HH:MM of a whole number of seconds after midnight, rounded down or up to the minute.
std::string minute_of(long long seconds, bool up) {
  const long long minutes = up ? (seconds + 59) / 60 : seconds / 60;
  auto two = [](long long v) { return (v < 10 ? "0" : "") + std::to_string(v); };
  return two(minutes / 60) + ":" + two(minutes % 60);
}

}  // namespace

TEST(Report, LoadsNothingFromOutsideThePage) {
  const std::string& html = sample_html();
  ASSERT_FALSE(html.empty());
  EXPECT_EQ(count(html, "http://"), 0u);
  EXPECT_EQ(count(html, "https://"), 0u);
  EXPECT_EQ(count(html, "@import"), 0u);
  // url() only for the page's own patterns (fill="url(#hatch-...)"), never a file or address.
  EXPECT_EQ(count(html, "url("), count(html, "url(#"));
  EXPECT_EQ(count(html, "<script"), 0u);
  EXPECT_EQ(count(html, "<img"), 0u);
  EXPECT_EQ(count(html, "<iframe"), 0u);
  EXPECT_EQ(count(html, "src="), 0u);
  // The only <link> is the empty icon that stops browsers asking for one.
  EXPECT_EQ(count(html, "<link"), 1u);
  EXPECT_NE(html.find("<link rel=\"icon\" href=\"data:,\">"), std::string::npos);
  // Every link stays inside the page.
  const std::regex href("href=\"([^\"]*)\"");
  for (auto it = std::sregex_iterator(html.begin(), html.end(), href); it != std::sregex_iterator(); ++it) {
    const std::string target = (*it)[1].str();
    EXPECT_TRUE(target.rfind("#", 0) == 0 || target.rfind("data:", 0) == 0) << target;
  }
}

TEST(Report, HasItsSectionsInOrder) {
  const std::string& html = sample_html();
  std::size_t last = 0;
  for (const char* id : {"report-header", "caution", "summary", "elevation", "speeds", "plan", "hazards", "schedule",
                         "marshals", "grading", "method"}) {
    const std::size_t at = html.find(std::string("id=\"") + id + "\"");
    ASSERT_NE(at, std::string::npos) << id;
    EXPECT_GT(at, last) << id << " is out of order";
    last = at;
  }
  EXPECT_NE(html.find("<svg id=\"elevation-chart\""), std::string::npos);
  EXPECT_NE(html.find("<svg id=\"plan-view\""), std::string::npos);
  for (const auto& rc : sample().classes) {
    EXPECT_NE(html.find("<svg id=\"speed-" + rc.name + "\""), std::string::npos) << rc.name;
  }
}

TEST(Report, CarriesTheCautionAtTheTop) {
  const std::string& html = sample_html();
  const std::size_t caution = html.find("id=\"caution\"");
  ASSERT_NE(caution, std::string::npos);
  EXPECT_LT(caution, html.find("id=\"summary\""));
  const std::size_t text = html.find(escape_markup(kDisclaimer), caution);
  EXPECT_NE(text, std::string::npos);
  EXPECT_LT(text, html.find("id=\"summary\""));
  for (const char* words : {"safety officers decide", "Inspect every place on the ground", "vegetation",
                            "buildings", "parked vehicles", "road surface"}) {
    EXPECT_NE(html.find(words, caution), std::string::npos) << words;
  }
}

TEST(Report, HasOneMarkerPerHazardInTheProfileAndThePlanLinkedToTheTable) {
  const std::string& html = sample_html();
  const auto codes = hazard_codes(sample());
  // The sample is built with hazards: eight town turns, the junction, the switchbacks (README).
  ASSERT_GE(codes.size(), 10u);
  const std::string elevation = svg_with_id(html, "elevation-chart");
  const std::string plan = svg_with_id(html, "plan-view");
  EXPECT_EQ(count(elevation, "class=\"hazard-marker "), codes.size());
  EXPECT_EQ(count(plan, "class=\"hazard-marker "), codes.size());
  EXPECT_EQ(count(html, "class=\"hazard-marker "), 2 * codes.size());  // nowhere else
  for (const auto& code : codes) {
    EXPECT_EQ(count(elevation, "id=\"elev-" + code + "\""), 1u) << code;
    EXPECT_EQ(count(plan, "id=\"plan-" + code + "\""), 1u) << code;
    EXPECT_EQ(count(html, "<tr id=\"hazard-" + code + "\""), 1u) << code;
    EXPECT_NE(html.find("href=\"#plan-" + code + "\""), std::string::npos) << code;
    EXPECT_NE(html.find("href=\"#elev-" + code + "\""), std::string::npos) << code;
    // Markers link back to the row.
    EXPECT_GE(count(plan, "<a href=\"#hazard-" + code + "\">"), 1u) << code;
    EXPECT_GE(count(elevation, "<a href=\"#hazard-" + code + "\">"), 1u) << code;
  }
}

TEST(Report, ShowsTheDesignedLengthAscentAndClimbCategoriesOfTheSample) {
  const std::string& html = sample_html();
  // Designed: a 68.0 km loop, finish at 68.016 km ground distance (features.csv). Shown to 0.1 km.
  EXPECT_NEAR(tile_value(html, "Length"), 68.02, 0.1);
  // Designed: start and finish on the same level street of the town at 300 m (README, the town
  // knots of tools/sample_plan.cpp), so a closed loop climbs what it descends.
  const double ascent = tile_value(html, "Ascent");
  std::smatch m;
  ASSERT_TRUE(std::regex_search(html, m, std::regex("descent ([0-9]+) m</div>")));
  EXPECT_NEAR(ascent, parse_number(m[1].str()).value(), 3.0);
  // Designed climbs alone gain 369 + 209 m plus the 32 m ramp to the crest (678 -> 710 m knots):
  // at least 610 m; the valley roads add gentle undulation on top (derived: sum of the design).
  EXPECT_GE(ascent, 610.0 - 10.0);
  EXPECT_LE(ascent, 610.0 + 250.0);
  // Designed highest point: the pass at the top of climb 2, foot 530 m + 209 m = 739 m
  // (tools/sample_plan.cpp knot and features.csv gain).
  EXPECT_NEAR(tile_value(html, "Highest point"), 739.0, 3.0);
  // Designed lowest point: the end of the long descent, 240 m (tools/sample_plan.cpp).
  EXPECT_NEAR(tile_value(html, "Lowest point"), 240.0, 3.0);
  // Climbs with a category, in course order: climb 1 score 222 -> category 2, climb 2 score 111
  // -> category 3 (features.csv scores; bounds 35/80/180/300/600, docs/method.md section 7).
  const std::regex row("<tr data-category=\"([^\"]*)\"><td>[0-9]+</td><td class=\"n\">([0-9.]+)</td><td class=\"n\">([0-9.]+)</td>");
  std::vector<std::array<std::string, 3>> categorised;
  for (auto it = std::sregex_iterator(html.begin(), html.end(), row); it != std::sregex_iterator(); ++it) {
    if (!(*it)[1].str().empty()) categorised.push_back({(*it)[1].str(), (*it)[2].str(), (*it)[3].str()});
  }
  ASSERT_EQ(categorised.size(), 2u);
  EXPECT_EQ(categorised[0][0], "2");
  EXPECT_NEAR(parse_number(categorised[0][1]).value(), 11.40, 0.2);  // features.csv: 11.402
  EXPECT_NEAR(parse_number(categorised[0][2]).value(), 17.54, 0.2);  // features.csv: 17.537
  EXPECT_EQ(categorised[1][0], "3");
  EXPECT_NEAR(parse_number(categorised[1][1]).value(), 35.78, 0.2);  // features.csv: 35.775
  EXPECT_NEAR(parse_number(categorised[1][2]).value(), 39.72, 0.2);  // features.csv: 39.722
  EXPECT_NE(html.find("climb 1 \xc2\xb7 cat. 2"), std::string::npos);  // bracket on the profile
}

TEST(Report, ListsTheDesignedHairpinsAndJunctionInTheHazardTable) {
  const std::string& html = sample_html();
  std::vector<double> table_km;
  const std::regex row("<tr id=\"hazard-h[0-9]+\"[^>]*><td>.*?</td><td class=\"n\">([0-9.]+)</td>");
  for (auto it = std::sregex_iterator(html.begin(), html.end(), row); it != std::sregex_iterator(); ++it) {
    table_km.push_back(parse_number((*it)[1].str()).value());
  }
  ASSERT_EQ(table_km.size(), sample().hazards.size());
  EXPECT_TRUE(std::is_sorted(table_km.begin(), table_km.end()));  // course order
  // features.csv: the junction turn at the foot of the descent and the six hairpins (start km).
  for (double design_km : {23.482, 42.137, 42.377, 42.617, 42.857, 43.097, 43.336}) {
    const bool listed = std::any_of(table_km.begin(), table_km.end(),
                                    [&](double km) { return std::fabs(km - design_km) <= 0.06; });
    EXPECT_TRUE(listed) << "no hazard listed near km " << design_km;
  }
}

TEST(Report, ShowsTheDateInputsAndConditionsItWasGiven) {
  const std::string& html = sample_html();
  EXPECT_NE(html.find("Checked on <time datetime=\"2025-01-01\">2025-01-01</time>"), std::string::npos);
  EXPECT_NE(html.find("coursewarden (test)"), std::string::npos);
  EXPECT_NE(html.find("<h1>Ronde d&#39;Orvalune"), std::string::npos);  // name from the GPX, escaped
  EXPECT_NE(html.find(escape_markup(sample().analysis.course.source_path)), std::string::npos);
  EXPECT_NE(html.find("30.0 m pixels"), std::string::npos);  // README: 30 m pixels
  EXPECT_NE(html.find("100.0 % of the course on valid terrain cells"), std::string::npos);  // README: no nodata
  EXPECT_NE(html.find("<dt>Road surface</dt><dd>dry</dd>"), std::string::npos);
  EXPECT_NE(html.find("road open to traffic"), std::string::npos);
  // Same inputs and date, same bytes.
  EXPECT_EQ(report_html(sample(), fixed_info()), html);
}

TEST(Report, EscapesTextFromTheInputs) {
  CheckResult r = sample();
  r.analysis.course.name = "<script>alert(\"x\")</script> & 'co'";
  r.analysis.course.source_path = "/tmp/a<b>&c.gpx";
  r.classes[0].description = "rides <fast> & \"far\"";
  const std::string html = report_html(r, fixed_info());
  EXPECT_EQ(html.find("<script>"), std::string::npos);
  EXPECT_NE(html.find("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;co&#39;"), std::string::npos);
  EXPECT_NE(html.find("/tmp/a&lt;b&gt;&amp;c.gpx"), std::string::npos);
  EXPECT_NE(html.find("rides &lt;fast&gt; &amp; &quot;far&quot;"), std::string::npos);
  EXPECT_EQ(escape_markup(std::string("a\x01" "b\tc")), "ab\tc");  // control characters are not XML
}

TEST(Report, SaysSoWhenNothingIsFlagged) {
  CheckResult r = sample();
  r.hazards.clear();
  const std::string html = report_html(r, fixed_info());
  EXPECT_NE(html.find("No hazards were flagged"), std::string::npos);
  EXPECT_EQ(count(html, "class=\"hazard-marker "), 0u);
  EXPECT_NE(html.find("<svg id=\"plan-view\""), std::string::npos);
}

TEST(Report, SeveritiesDifferInShapeAndDarkenWithSeverity) {
  // Readable without colour: four shapes, and fills whose luminance falls with severity so the
  // levels stay apart when printed in greys.
  std::set<std::string> shapes;
  double previous = 2.0;
  for (Severity s : {Severity::note, Severity::caution, Severity::serious, Severity::critical}) {
    const auto& look = report_detail::severity_look(s);
    shapes.insert(look.shape);
    const double y = luminance(look.fill);
    EXPECT_LT(y, previous) << severity_name(s);
    previous = y;
  }
  EXPECT_EQ(shapes.size(), 4u);
  // The darkest level is printed with light numbers and still reads: WCAG contrast ratio of
  // white on the critical fill at least 4.5 (WCAG 2.1 success criterion 1.4.3).
  const double dark = luminance(report_detail::severity_look(Severity::critical).fill);
  EXPECT_GE((1.0 + 0.05) / (dark + 0.05), 4.5);
}

TEST(ReportPieces, SpreadLabelsKeepOrderGapAndBounds) {
  const auto at = report_detail::spread_positions({50, 10, 11, 12, 300}, 10.0, 0.0, 305.0);
  // Sorted by wish: 10, 11, 12, 50, 300; the three close ones centre on their mean (11) with
  // gaps of 10 -> 1, 11, 21 (derived by hand).
  EXPECT_NEAR(at[1], 1.0, 1e-9);
  EXPECT_NEAR(at[2], 11.0, 1e-9);
  EXPECT_NEAR(at[3], 21.0, 1e-9);
  EXPECT_NEAR(at[0], 50.0, 1e-9);
  EXPECT_NEAR(at[4], 300.0, 1e-9);
  // Squeezed against the lower bound.
  const auto low = report_detail::spread_positions({0, 0, 0}, 10.0, 5.0, 100.0);
  EXPECT_NEAR(low[0], 5.0, 1e-9);
  EXPECT_NEAR(low[1], 15.0, 1e-9);
  EXPECT_NEAR(low[2], 25.0, 1e-9);
}

TEST(ReportPieces, EnvelopeKeepsDipsAndPeaksPerPixel) {
  // 1000 points on 10 pixel columns, a single deep dip at index 537: the dip survives, the size
  // is at most 4 points per column.
  std::vector<double> x(1000), y(1000, 5.0);
  for (std::size_t i = 0; i < x.size(); ++i) x[i] = static_cast<double>(i) / 100.0;
  y[537] = -3.0;
  y[12] = 9.0;
  const auto keep = report_detail::envelope_indices(x, y);
  EXPECT_LE(keep.size(), 40u);
  EXPECT_TRUE(std::is_sorted(keep.begin(), keep.end()));
  EXPECT_NE(std::find(keep.begin(), keep.end(), 537u), keep.end());
  EXPECT_NE(std::find(keep.begin(), keep.end(), 12u), keep.end());
  EXPECT_EQ(keep.front(), 0u);
  EXPECT_EQ(keep.back(), 999u);
}

TEST(ReportPieces, GradientBandsCoverTheLineInOrder) {
  const auto bands = gradient_bands();
  ASSERT_GE(bands.size(), 3u);
  EXPECT_TRUE(std::isinf(bands.front().from_pct));
  EXPECT_TRUE(std::isinf(bands.back().to_pct));
  for (std::size_t k = 1; k < bands.size(); ++k) EXPECT_EQ(bands[k].from_pct, bands[k - 1].to_pct);
  EXPECT_EQ(gradient_band_index(-20.0), 0u);
  EXPECT_EQ(gradient_band_index(40.0), bands.size() - 1);
  EXPECT_EQ(std::string(bands[gradient_band_index(0.0)].key), "level");
  EXPECT_EQ(std::string(bands[gradient_band_index(NAN)].key), "level");
  EXPECT_EQ(std::string(bands[gradient_band_index(6.0)].key), "up-5-8");
  EXPECT_EQ(std::string(bands[gradient_band_index(8.0)].key), "up-8-11");  // lower bound inclusive
}

TEST(ReportFolder, WritesEveryFileAndLeavesOtherFilesAlone) {
  cwtest::TempDir dir;
  const std::string out = dir.file("out");
  std::filesystem::create_directories(out);
  cwtest::write_text(out + "/notes.txt", "the organiser's own notes");
  cwtest::write_text(out + "/report.html", "an old report");
  const auto written = write_check_folder(sample(), out, fixed_info());
  EXPECT_EQ(written, check_folder_files());
  for (const char* name : {"summary.json", "profile.csv", "report.html", "hazards.csv", "hazards.geojson",
                           "hazards.gpx", "course.geojson", "climbs.geojson"}) {
    EXPECT_NE(std::find(written.begin(), written.end(), name), written.end()) << name;
    EXPECT_TRUE(std::filesystem::is_regular_file(out + "/" + name)) << name;
  }
  EXPECT_EQ(cwtest::read_text(out + "/notes.txt"), "the organiser's own notes");
  EXPECT_EQ(cwtest::read_text(out + "/report.html"), sample_html());
  // Nothing else is left behind (no temporary files).
  std::size_t entries = 0;
  for ([[maybe_unused]] const auto& e : std::filesystem::directory_iterator(out)) ++entries;
  EXPECT_EQ(entries, check_folder_files().size() + 1);
  // The summary in the folder is the one the CLI prints.
  EXPECT_EQ(cwtest::read_text(out + "/summary.json"), check_summary_json(sample()));
}

TEST(ReportFolder, RefusesAFileInPlaceOfTheFolder) {
  cwtest::TempDir dir;
  cwtest::write_text(dir.file("taken"), "x");
  EXPECT_THROW(write_check_folder(sample(), dir.file("taken"), fixed_info()), Error);
}

TEST(ReportFolder, TodayIsAnIsoDate) {
  EXPECT_TRUE(std::regex_match(utc_date_today(), std::regex("[0-9]{4}-[01][0-9]-[0-3][0-9]")));
}

// ---- the event operations sections

TEST(ReportOperations, MarshalBriefingHasOneMarkerPerPostLinkedToItsRowOnItsSectorPage) {
  const std::string& html = sample_html();
  const MarshalPlan& plan = sample_ops().marshal_plan;
  ASSERT_FALSE(plan.posts.empty());
  ASSERT_FALSE(plan.sectors.empty());
  EXPECT_EQ(count(html, "class=\"post-marker\""), plan.posts.size());  // nowhere else
  EXPECT_EQ(count(html, "<div class=\"sector-page\""), plan.sectors.size());
  for (std::size_t s = 0; s < plan.sectors.size(); ++s) {
    const std::string n = std::to_string(s + 1);
    const std::string svg = svg_with_id(html, "sector-plan-" + n);
    ASSERT_FALSE(svg.empty()) << "sector " << n;
    EXPECT_EQ(count(svg, "class=\"post-marker\""), plan.sectors[s].posts.size()) << "sector " << n;
    // The sector's page runs from its opening to the next page (or the end of the section).
    const std::size_t page = html.find("<div class=\"sector-page\" id=\"sector-" + n + "\"");
    ASSERT_NE(page, std::string::npos);
    std::size_t page_end = html.find("<div class=\"sector-page\"", page + 1);
    if (page_end == std::string::npos) page_end = html.find("</section>", page);
    for (std::size_t p : plan.sectors[s].posts) {
      const MarshalPost& post = plan.posts[p];
      const std::string a = report_detail::post_anchor(post.code);
      EXPECT_EQ(count(svg, "id=\"map-" + a + "\""), 1u) << post.code;
      EXPECT_EQ(count(svg, "<a href=\"#post-" + a + "\">"), 1u) << post.code;
      EXPECT_EQ(count(html, "<tr id=\"post-" + a + "\""), 1u) << post.code;
      const std::size_t row_at = html.find("<tr id=\"post-" + a + "\"");
      EXPECT_GT(row_at, page) << post.code << " is not on its sector's page";
      EXPECT_LT(row_at, page_end) << post.code << " is not on its sector's page";
      const std::string row = element_with(html, "tr", "<tr id=\"post-" + a + "\"");
      EXPECT_NE(row.find("href=\"#map-" + a + "\""), std::string::npos) << post.code;
      for (int number : post.hazards) {
        std::string code = report_detail::hazard_code(number, sample().hazards.size());
        code[0] = 'h';
        EXPECT_NE(row.find("href=\"#hazard-" + code + "\""), std::string::npos) << post.code << " covers " << code;
      }
    }
  }
  // Printed one page per sector (docs/report.md, Printing).
  EXPECT_NE(html.find(".sector-page{break-before:page"), std::string::npos);
}

TEST(ReportOperations, MarshalPostsStandAtTheDesignedTurnsOfTheSample) {
  // features.csv: every turn of 60 deg or more (the junction-type threshold, docs/operations.md):
  // the eight town turns, the bend after the crest, the junction, the bends into and out of the
  // switchbacks and the six hairpins (start km). Town turns 4 and 5 lie 147 m apart, closer than
  // the 150 m merging distance (docs/operations.md), so one post covers both.
  const std::string& html = sample_html();
  std::vector<std::pair<double, double>> posts;  // km from, to of each post row
  const std::regex row("<tr id=\"post-m[0-9]+\"[^>]*><td>.*?</td><td class=\"n\">([0-9.]+)(<br><span class=\"who\">([0-9.]+)"
                       "\xe2\x80\x93([0-9.]+)</span>)?</td>");
  for (auto it = std::sregex_iterator(html.begin(), html.end(), row); it != std::sregex_iterator(); ++it) {
    const double at = parse_number((*it)[1].str()).value();
    const double from = (*it)[3].matched ? parse_number((*it)[3].str()).value() : at;
    const double to = (*it)[4].matched ? parse_number((*it)[4].str()).value() : at;
    posts.emplace_back(from, to);
  }
  ASSERT_EQ(posts.size(), sample_ops().marshal_plan.posts.size());
  auto covered = [&](double design_km) {
    return std::count_if(posts.begin(), posts.end(), [&](const auto& p) {
      return design_km >= p.first - 0.06 && design_km <= p.second + 0.06;
    });
  };
  for (double design_km : {0.212, 0.409, 0.585, 0.802, 0.949, 1.145, 1.342, 1.519, 20.003, 23.482, 41.859, 42.137, 42.377,
                           42.617, 42.857, 43.097, 43.336, 43.611}) {
    EXPECT_GE(covered(design_km), 1) << "no marshal post near km " << design_km;
  }
  const auto shared = std::count_if(posts.begin(), posts.end(), [](const auto& p) {
    return p.first <= 0.802 + 0.06 && p.second >= 0.949 - 0.06;
  });
  EXPECT_EQ(shared, 1) << "town turns 4 and 5 should share one post";
}

TEST(ReportOperations, ScheduleFinishRowShowsTheTimesOfScheduleCsv) {
  const std::string& html = sample_html();
  const auto rows = csv_rows(schedule_csv(sample_ops().schedule));
  const auto finish = std::find_if(rows.begin(), rows.end(), [](const auto& r) { return r.at("kind") == "finish"; });
  ASSERT_NE(finish, rows.end());
  const std::string row = element_with(html, "tr", "data-kind=\"finish\"");
  ASSERT_FALSE(row.empty());
  // Exact times as in the file; shown to the minute, rounded on the safe side (docs/report.md):
  // down for the first riders and the road closing, up for the last riders, the closing
  // vehicle and the road reopening (derived: floor or ceiling of the file's seconds / 60).
  const std::array<std::tuple<const char*, const char*, bool>, 5> cols{{{"first", "earliest", false},
                                                                        {"last", "latest", true},
                                                                        {"closing", "closing", true},
                                                                        {"closed-from", "closure_open", false},
                                                                        {"closed-until", "closure_close", true}}};
  for (const auto& [col, field, up] : cols) {
    const auto [hms, shown] = time_cell(row, col);
    EXPECT_EQ(hms, finish->at(field)) << col;
    const long long seconds = std::stoll(finish->at(std::string(field) + "_s"));
    EXPECT_EQ(shown, minute_of(seconds, up)) << col;
  }
  EXPECT_NE(row.find(finish->at("earliest_class")), std::string::npos);
  EXPECT_NE(row.find(finish->at("latest_class")), std::string::npos);
  // The full timetable stays in the file, and the page says so.
  EXPECT_NE(html.find("The timetable at every km is in schedule.csv"), std::string::npos);
}

TEST(ReportOperations, ScheduleShowsTheStartEveryFifthKmCheckpointsHazardsAndTheFinish) {
  const std::string& html = sample_html();
  const std::string table = element_with(html, "table", "id=\"schedule-table\"");
  std::vector<double> km_rows;
  const std::regex km_row("data-kind=\"km\" data-at-m=\"([0-9.]+)\"");
  for (auto it = std::sregex_iterator(table.begin(), table.end(), km_row); it != std::sregex_iterator(); ++it) {
    km_rows.push_back(parse_number((*it)[1].str()).value());
  }
  // The sample is 68.0 km long (features.csv): km 0, 5, ..., 65.
  ASSERT_EQ(km_rows.size(), 14u);
  for (std::size_t k = 0; k < km_rows.size(); ++k) EXPECT_NEAR(km_rows[k], 5000.0 * static_cast<double>(k), 0.5);
  EXPECT_EQ(count(table, "data-kind=\"hazard\""), sample().hazards.size());
  EXPECT_EQ(count(table, "data-kind=\"finish\""), 1u);
  // Rows where the last riders pass after the closing vehicle carry a mark in words as well as
  // the tint: one per such row shown.
  std::size_t behind = 0;
  for (const ScheduleRow& r : sample_ops().schedule.rows) {
    const bool fifth = std::fabs(r.at_m / 5000.0 - std::round(r.at_m / 5000.0)) * 5000.0 < 0.5;
    if (r.latest_behind_closing && (r.kind != ScheduleKind::km || fifth)) ++behind;
  }
  EXPECT_EQ(count(table, "data-behind=\"true\""), behind);
  EXPECT_EQ(count(table, "behind closing vehicle</span>"), behind);
  EXPECT_NE(html.find("<svg id=\"schedule-chart\""), std::string::npos);
}

TEST(ReportOperations, ScheduleShowsWavesCutOffsAndTheClassesThatMissThem) {
  CheckResult r = sample();
  StartWave fast{"fast wave", 8.0 * 3600.0, {"racer", "elite"}};
  StartWave rest{"main wave", 8.0 * 3600.0 + 20.0 * 60.0, {}};
  for (const auto& rc : r.classes) {
    if (rc.name != "racer" && rc.name != "elite") rest.classes.push_back(rc.name);
  }
  r.ops.waves = {fast, rest};
  const double cutoff_s = 10.0 * 3600.0 + 30.0 * 60.0;
  r.ops.checkpoints = {{"Col feed", "cut-off", 40000.0, cutoff_s}};
  const Operations ops = plan_operations(r);
  const std::string html = report_html(r, ops, fixed_info());
  const std::string waves = element_with(html, "table", "id=\"waves\"");
  EXPECT_EQ(count(waves, "<tr><td><b>"), 2u);
  EXPECT_NE(waves.find("fast wave"), std::string::npos);
  EXPECT_NE(waves.find("main wave"), std::string::npos);
  const std::string row = element_with(html, "tr", "data-kind=\"checkpoint\"");
  ASSERT_FALSE(row.empty());
  EXPECT_NE(row.find("Col feed"), std::string::npos);
  EXPECT_EQ(time_cell(row, "cutoff").first, "10:30:00");
  // Which classes miss it, worked out here from each class's own speed profile: its wave's start
  // plus its planned time to km 40 (elapsed_s interpolated between stations) after 10:30.
  std::vector<double> dist;
  for (const auto& st : r.analysis.stations) dist.push_back(st.distance_m);
  std::vector<std::string> late;
  for (std::size_t k = 0; k < r.classes.size(); ++k) {
    const bool fast_class = r.classes[k].name == "racer" || r.classes[k].name == "elite";
    const double start = fast_class ? fast.start_time_s : rest.start_time_s;
    if (start + report_detail::interpolate(dist, r.speeds[k].elapsed_s, 40000.0) > cutoff_s) late.push_back(r.classes[k].name);
  }
  ASSERT_FALSE(late.empty()) << "the slowest class should miss a 10:30 cut-off at km 40";
  ASSERT_LT(late.size(), r.classes.size());
  const std::size_t missing_at = row.find("data-col=\"missing\"");
  ASSERT_NE(missing_at, std::string::npos);
  const std::string missing = row.substr(missing_at);
  for (const auto& rc : r.classes) {
    const bool listed = missing.find(">" + rc.name) != std::string::npos || missing.find(", " + rc.name) != std::string::npos;
    const bool expected = std::find(late.begin(), late.end(), rc.name) != late.end();
    EXPECT_EQ(listed, expected) << rc.name;
  }
  // Waves are named beside the classes when there are several.
  EXPECT_NE(html.find("main wave</span>"), std::string::npos);
}

TEST(ReportOperations, GradingVerdictsAreThoseOfSummaryJson) {
  const std::string& html = sample_html();
  const auto summary = nlohmann::json::parse(check_summary_json(sample()));
  const auto& classes = summary.at("grading").at("classes");
  ASSERT_EQ(classes.size(), sample().classes.size());
  const std::string grading = element_with(html, "table", "id=\"grading-table\"");
  const std::string rides = element_with(html, "table", "id=\"class-times\"");
  for (const auto& g : classes) {
    const std::string tr = "<tr data-class=\"" + g.at("name").get<std::string>() + "\" data-verdict=\"" +
                           g.at("verdict").get<std::string>() + "\">";
    EXPECT_EQ(count(grading, tr), 1u) << tr;
    EXPECT_EQ(count(rides, tr), 1u) << tr;
    // Each reason of the summary is in the class's row (hazard codes become links).
    const std::string row = element_with(grading, "tr", tr);
    for (const auto& why : g.at("reasons")) {
      std::string text = escape_markup(why.get<std::string>());
      text = std::regex_replace(text, std::regex("(H[0-9]+)"), "<a href=\"#hazard-h$1\">$1</a>");
      text = std::regex_replace(text, std::regex("#hazard-hH"), "#hazard-h");
      EXPECT_NE(row.find(text), std::string::npos) << text;
    }
  }
  const int level = summary.at("grading").at("course").at("level").get<int>();
  EXPECT_NE(html.find("id=\"course-grade\" data-level=\"" + std::to_string(level) + "\""), std::string::npos);
  // The scale: five levels (docs/operations.md), the course's own marked in words.
  const std::string scale = element_with(html, "table", "id=\"grade-scale\"");
  EXPECT_EQ(count(scale, "<tr"), 6u);  // header and five levels
  const std::string mine = element_with(scale, "tr", "class=\"this-course\"");
  EXPECT_NE(mine.find("data-level=\"" + std::to_string(level) + "\""), std::string::npos);
  EXPECT_NE(mine.find("this course"), std::string::npos);
}

TEST(ReportOperations, SummarySaysInOneSentenceWhetherTheReverseIsMarkedlySafer) {
  CheckResult r = sample();
  r.reverse.checked = true;
  r.reverse.counts = {4, 3, 1, 0};
  r.reverse.markedly_safer = true;
  std::string html = report_html(r, fixed_info());
  std::string line = element_with(html, "p", "id=\"reverse-direction\"");
  ASSERT_FALSE(line.empty());
  EXPECT_NE(line.find("0 critical, 1 serious, 3 caution and 4 note hazards"), std::string::npos) << line;
  EXPECT_NE(line.find("markedly fewer severe hazards"), std::string::npos);
  r.reverse.markedly_safer = false;
  html = report_html(r, fixed_info());
  EXPECT_NE(element_with(html, "p", "id=\"reverse-direction\"").find("not markedly safer"), std::string::npos);
  r.reverse.checked = false;
  EXPECT_EQ(report_html(r, fixed_info()).find("id=\"reverse-direction\""), std::string::npos);
}

TEST(ReportOperations, MethodQuotesTheCategoryScaleUsedAndTheOperationsRules) {
  // The sample is checked on the default scale: 35/80/180/300/600 (docs/method.md section 7).
  const std::string& html = sample_html();
  EXPECT_NE(html.find("category 4 from 35, 3 from 80, 2 from 180, 1 from 300, HC from 600</span> (the defaults)"),
            std::string::npos);
  CheckResult r = sample();
  r.analysis.category_scale = {40.0, 90.0, 200.0, 320.0, 650.0};
  const std::string other = report_html(r, fixed_info());
  EXPECT_NE(other.find("category 4 from 40, 3 from 90, 2 from 200, 1 from 320, HC from 650</span> (set for this check"),
            std::string::npos);
  // Operations rules: the defaults of docs/operations.md (marshals from the French sport code,
  // 15 and 30 min before, 15 min after the closing vehicle; closing vehicle 15 km/h; road closed
  // 30 min before and reopened 10 min after).
  const std::string rules = element_with(html, "ul", "id=\"operations-rules\"");
  ASSERT_FALSE(rules.empty());
  for (const char* words : {"Code du sport", "A331-37 to A331-40", "on post 15 min before", "more than 30 min before",
                            "released 15 min after the closing vehicle", "keeps 15.0 km/h", "closed 30 min before",
                            "reopened 10 min after"}) {
    EXPECT_NE(rules.find(words), std::string::npos) << words;
  }
}

TEST(ReportOperations, SaysSoWhenNoMarshalPostIsNeeded) {
  CheckResult r = sample();
  r.hazards.clear();
  r.hazard_options.sharp_turn_rad = 3.2;  // more than any corner can turn: no junction-type turns
  const std::string html = report_html(r, fixed_info());
  EXPECT_NE(html.find("No marshal posts"), std::string::npos);
  EXPECT_EQ(count(html, "class=\"post-marker\""), 0u);
  EXPECT_NE(html.find("id=\"grading\""), std::string::npos);
}

TEST(ReportOperations, EscapesWaveAndCheckpointNames) {
  CheckResult r = sample();
  r.ops.waves = {{"<w&>", 8.0 * 3600.0, {}}};
  r.ops.checkpoints = {{"<cp> \"x\"", "feed", 30000.0, std::numeric_limits<double>::quiet_NaN()}};
  const std::string html = report_html(r, fixed_info());
  EXPECT_EQ(html.find("<w&>"), std::string::npos);
  EXPECT_EQ(html.find("<cp>"), std::string::npos);
  EXPECT_NE(html.find("&lt;w&amp;&gt;"), std::string::npos);
  EXPECT_NE(html.find("&lt;cp&gt; &quot;x&quot;"), std::string::npos);
}
