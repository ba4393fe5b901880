// The organiser's report (report.html) and the report folder. Golden values come from the sample
// course's DESIGN (sample_courses/ronde-orvalune/README.md, features.csv, tools/sample_plan.cpp),
// not from the program's own output.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <filesystem>
#include <regex>
#include <set>
#include <string>

#include "coursewarden/check.hpp"
#include "coursewarden/check_outputs.hpp"
#include "coursewarden/error.hpp"
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
  for (const char* id : {"report-header", "caution", "summary", "elevation", "speeds", "plan", "hazards", "method"}) {
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
