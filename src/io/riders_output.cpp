// Rider classes as a terminal table; per-class speed results as JSON.
#include "io/riders_output.hpp"

#include <algorithm>
#include <cmath>

#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr std::size_t kMaxWidth = 100;

double rounded(double v, int decimals) {
  const double f = std::pow(10.0, decimals);
  return std::round(v * f) / f;
}

// A column header on up to two lines: long hyphenated names break after the hyphen nearest
// their middle.
std::pair<std::string, std::string> header_lines(const std::string& name) {
  if (name.size() <= 10) return {"", name};
  std::size_t best = std::string::npos;
  for (std::size_t i = 0; i + 1 < name.size(); ++i) {
    if (name[i] != '-' && name[i] != '_') continue;
    const auto score = [&](std::size_t k) {
      return std::max(k + 1, name.size() - k - 1);
    };
    if (best == std::string::npos || score(i) < score(best)) best = i;
  }
  if (best == std::string::npos) return {"", name};
  return {name.substr(0, best + 1), name.substr(best + 1)};
}

std::string pad_left(const std::string& s, std::size_t width) {
  return s.size() >= width ? s : std::string(width - s.size(), ' ') + s;
}

std::string pad_right(const std::string& s, std::size_t width) {
  return s.size() >= width ? s : s + std::string(width - s.size(), ' ');
}

void wrap_line(std::string& out, const std::string& head, const std::string& text) {
  std::string line = head;
  const std::string indent(head.size(), ' ');
  std::size_t pos = 0;
  bool first_word = true;
  while (pos < text.size()) {
    std::size_t end = text.find(' ', pos);
    if (end == std::string::npos) end = text.size();
    const std::string word = text.substr(pos, end - pos);
    pos = end + 1;
    if (word.empty()) continue;
    if (!first_word && line.size() + 1 + word.size() > kMaxWidth) {
      out += line + "\n";
      line = indent;
      first_word = true;
    }
    line += (first_word ? "" : " ") + word;
    first_word = false;
  }
  out += line + "\n";
}

}  // namespace

std::string riders_table_text(const std::vector<RiderClass>& classes) {
  const auto fields = rider_fields();
  std::size_t label_width = 0;
  for (const RiderField& f : fields) label_width = std::max(label_width, std::string(f.key).size());
  label_width += 2;

  // Every cell first, to size the columns.
  struct Column {
    std::string top, bottom;
    std::vector<std::string> cells;
    std::size_t width = 0;
  };
  std::vector<Column> columns;
  for (const RiderClass& r : classes) {
    Column c;
    std::tie(c.top, c.bottom) = header_lines(r.name);
    c.width = std::max(c.top.size(), c.bottom.size());
    for (const RiderField& f : fields) {
      c.cells.push_back(fmt_fixed(r.*(f.member) * f.si_to_unit, f.decimals));
      c.width = std::max(c.width, c.cells.back().size());
    }
    c.width += 2;
    columns.push_back(std::move(c));
  }

  std::string out;
  out += "Rider classes (" + std::to_string(classes.size()) +
         "). Rows are the keys of a rider file; units in the key names.\n";
  std::size_t first = 0;
  while (first < columns.size()) {
    std::size_t last = first, width = label_width;
    while (last < columns.size() && (last == first || width + columns[last].width <= kMaxWidth)) {
      width += columns[last].width;
      ++last;
    }
    out += "\n";
    std::string top = pad_right("", label_width), bottom = pad_right("class", label_width);
    bool any_top = false;
    for (std::size_t k = first; k < last; ++k) {
      top += pad_left(columns[k].top, columns[k].width);
      bottom += pad_left(columns[k].bottom, columns[k].width);
      any_top = any_top || !columns[k].top.empty();
    }
    if (any_top) {
      while (!top.empty() && top.back() == ' ') top.pop_back();
      out += top + "\n";
    }
    out += bottom + "\n";
    out += std::string(std::min(width, kMaxWidth), '-') + "\n";
    for (std::size_t row = 0; row < fields.size(); ++row) {
      std::string line = pad_right(fields[row].key, label_width);
      for (std::size_t k = first; k < last; ++k)
        line += pad_left(columns[k].cells[row], columns[k].width);
      out += line + "\n";
    }
    first = last;
  }
  out += "\n";
  for (const RiderClass& r : classes) wrap_line(out, "  " + r.name + ": ", r.description);
  return out;
}

nlohmann::json rider_result_json(const RiderClass& rider, const SpeedProfile& p) {
  nlohmann::json j;
  j["name"] = rider.name;
  j["mass_kg"] = rounded(rider.mass_kg, 1);
  j["time_s"] = rounded(p.total_time_s, 1);
  j["avg_speed_kmh"] = rounded(p.moving_avg_speed_mps * 3.6, 2);
  j["max_speed_kmh"] = rounded(p.max_speed_mps * 3.6, 2);
  auto walking = nlohmann::json::array();
  for (const DistanceRange& w : p.walking_sections)
    walking.push_back({{"start_m", rounded(w.start_m, 1)}, {"end_m", rounded(w.end_m, 1)}});
  j["walking_sections"] = walking;
  auto climbs = nlohmann::json::array();
  for (double t : p.climb_times_s) climbs.push_back(rounded(t, 1));
  j["climb_times_s"] = climbs;
  return j;
}

}  // namespace coursewarden
