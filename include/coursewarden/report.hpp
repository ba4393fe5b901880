// coursewarden: the organiser's report, one self-contained HTML page (report.html).
//
// The page carries its own styles and inline SVG charts drawn here; it loads nothing from
// anywhere (no scripts, fonts, images or tiles), so it opens offline and prints on A4.
// Layout, colours and marker shapes: docs/report.md.
#pragma once

#include <span>
#include <string>
#include <string_view>

#include "coursewarden/check.hpp"
#include "coursewarden/operations.hpp"

namespace coursewarden {

/// What the report says about the check itself (everything else comes from the result).
struct ReportInfo {
  std::string check_date;                  ///< shown in the header, e.g. "2025-06-14"; "" = left out
  std::string generator = "coursewarden";  ///< program (and version) named in the header
};

/// Today's date in UTC as YYYY-MM-DD (for ReportInfo::check_date).
std::string utc_date_today();

/// The whole report as one HTML document. Pure: the same result and info give the same bytes.
/// Plans the event's operations (schedule, marshal plan, grading) with plan_operations(), which
/// throws Error for an inconsistent event.
std::string report_html(const CheckResult& result, const ReportInfo& info);

/// The same with the operations already planned; `ops` must be plan_operations(result).
std::string report_html(const CheckResult& result, const Operations& ops, const ReportInfo& info);

/// Text made safe for HTML and XML content and attribute values (& < > " ' escaped; control
/// characters other than tab, newline and carriage return dropped).
std::string escape_markup(std::string_view text);

/// One band of the gradient scale used to fill the elevation profile and to label the course
/// sections of course.geojson. Bands cover the whole line: [from_pct, to_pct).
struct GradientBand {
  double from_pct;
  double to_pct;
  const char* key;     ///< short key for files, e.g. "up-6-9"
  const char* label;   ///< plain words, e.g. "climbing 6-9 %"
  const char* colour;  ///< fill colour, "#rrggbb"
};

/// The bands, steepest descent first.
std::span<const GradientBand> gradient_bands();

/// Index into gradient_bands() of a gradient in per cent (NaN counts as level).
std::size_t gradient_band_index(double grade_pct);

}  // namespace coursewarden
