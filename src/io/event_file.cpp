// Reading the event file (TOML, toml++).
#include "coursewarden/event_file.hpp"

#include <toml++/toml.h>

#include <cmath>
#include <filesystem>
#include <map>
#include <set>

#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

constexpr double kPi = 3.14159265358979323846;

class Reader {
public:
  explicit Reader(std::string path) : path_(std::move(path)) {}

  [[noreturn]] void error(const toml::node* node, const std::string& key, const std::string& what) const {
    std::string where = node ? "line " + std::to_string(node->source().begin.line) : "";
    fail(path_, where.empty() ? key : where + ": " + key, what);
  }

  // Every key of `table` must be one of `allowed`.
  void only(const toml::table& table, const std::string& prefix, std::initializer_list<const char*> allowed) const {
    std::set<std::string> ok(allowed.begin(), allowed.end());
    for (const auto& [k, v] : table) {
      if (!ok.count(std::string(k.str()))) {
        std::string list;
        for (const auto& a : allowed) list += (list.empty() ? "" : ", ") + std::string(a);
        error(&v, prefix + std::string(k.str()), "unknown key; allowed here: " + list);
      }
    }
  }

  std::optional<std::string> text(const toml::table& t, const std::string& prefix, const char* key) const {
    const toml::node* n = t.get(key);
    if (!n) return std::nullopt;
    if (!n->is_string()) error(n, prefix + key, "must be text in quotes");
    return n->value<std::string>();
  }

  std::optional<double> number(const toml::table& t, const std::string& prefix, const char* key, double lo,
                               double hi, const std::string& unit) const {
    const toml::node* n = t.get(key);
    if (!n) return std::nullopt;
    if (!n->is_number()) error(n, prefix + key, "must be a number (" + unit + ")");
    const double v = n->value<double>().value();
    if (!std::isfinite(v) || v < lo || v > hi) {
      error(n, prefix + key, "must be between " + fmt_fixed(lo, 1) + " and " + fmt_fixed(hi, 1) + " " + unit +
                                 ", got " + fmt_fixed(v, 2));
    }
    return v;
  }

  std::optional<double> clock(const toml::table& t, const std::string& prefix, const char* key) const {
    auto s = text(t, prefix, key);
    if (!s) return std::nullopt;
    auto v = parse_clock(*s);
    if (!v) error(t.get(key), prefix + key, "give a clock time as \"HH:MM\", e.g. \"08:30\"");
    return v;
  }

  std::optional<bool> boolean(const toml::table& t, const std::string& prefix, const char* key) const {
    const toml::node* n = t.get(key);
    if (!n) return std::nullopt;
    if (!n->is_boolean()) error(n, prefix + key, "must be true or false");
    return n->value<bool>();
  }

  std::vector<std::string> names(const toml::table& t, const std::string& prefix, const char* key) const {
    std::vector<std::string> out;
    const toml::node* n = t.get(key);
    if (!n) return out;
    const toml::array* a = n->as_array();
    if (!a) error(n, prefix + key, "must be a list of names in quotes, e.g. [\"club\", \"racer\"]");
    for (const auto& e : *a) {
      if (!e.is_string()) error(&e, prefix + key, "must be a list of names in quotes");
      out.push_back(*e.value<std::string>());
    }
    return out;
  }

  const toml::table* table(const toml::table& t, const std::string& prefix, const char* key) const {
    const toml::node* n = t.get(key);
    if (!n) return nullptr;
    if (!n->is_table()) error(n, prefix + key, "must be a table, written [" + prefix + key + "]");
    return n->as_table();
  }

  std::vector<const toml::table*> tables(const toml::table& t, const std::string& prefix, const char* key) const {
    std::vector<const toml::table*> out;
    const toml::node* n = t.get(key);
    if (!n) return out;
    const toml::array* a = n->as_array();
    if (!a || !a->is_array_of_tables()) error(n, prefix + key, "must be repeated tables, written [[" + prefix + key + "]]");
    for (const auto& e : *a) out.push_back(e.as_table());
    return out;
  }

  std::string resolve(const std::string& relative) const {
    namespace fs = std::filesystem;
    const fs::path p(relative);
    if (p.is_absolute()) return relative;
    return (fs::path(path_).parent_path() / p).lexically_normal().string();
  }

  const std::string& path() const { return path_; }

private:
  std::string path_;
};

SurfaceClass surface_from(const Reader& r, const toml::table& t, const std::string& prefix, const char* key,
                          SurfaceClass fallback) {
  auto s = r.text(t, prefix, key);
  if (!s) return fallback;
  if (*s == "smooth") return SurfaceClass::smooth_asphalt;
  if (*s == "rough") return SurfaceClass::rough_asphalt;
  if (*s == "gravel") return SurfaceClass::gravel;
  r.error(t.get(key), prefix + key, "must be \"smooth\", \"rough\" or \"gravel\"");
}

bool closed_from(const Reader& r, const toml::table& t, const std::string& prefix, const char* key, bool fallback) {
  auto s = r.text(t, prefix, key);
  if (!s) return fallback;
  if (*s == "closed") return true;
  if (*s == "open") return false;
  r.error(t.get(key), prefix + key, "must be \"closed\" or \"open\"");
}

}  // namespace

std::optional<double> parse_clock(const std::string& text) {
  const auto c1 = text.find(':');
  if (c1 == std::string::npos) return std::nullopt;
  const auto c2 = text.find(':', c1 + 1);
  const auto h = parse_number(text.substr(0, c1));
  const auto m = parse_number(text.substr(c1 + 1, c2 == std::string::npos ? std::string::npos : c2 - c1 - 1));
  const auto s = c2 == std::string::npos ? std::optional<double>(0.0) : parse_number(text.substr(c2 + 1));
  if (!h || !m || !s) return std::nullopt;
  if (*h < 0 || *h > 47 || *m < 0 || *m >= 60 || *s < 0 || *s >= 60) return std::nullopt;
  if (std::floor(*h) != *h || std::floor(*m) != *m) return std::nullopt;
  return *h * 3600.0 + *m * 60.0 + *s;
}

EventFile load_event_file(const std::string& path) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (!fs::exists(path, ec)) fail(path, "", "event file not found; check the path (coursewarden init writes one)");
  toml::table root;
  try {
    root = toml::parse_file(path);
  } catch (const toml::parse_error& e) {
    fail(path, "line " + std::to_string(e.source().begin.line), std::string(e.description()) + "; fix the TOML syntax");
  }
  Reader r(path);
  EventFile ev;
  ev.path = path;
  ev.rules = OperationsRules{};
  r.only(root, "", {"event", "field", "start", "road", "weather", "checkpoint", "rules"});

  const toml::table* event = r.table(root, "", "event");
  if (!event) fail(path, "", "no [event] table; it must give at least course = \"...\"");
  r.only(*event, "event.", {"name", "date", "course", "dem", "dem_crs", "track", "spacing_m"});
  ev.name = r.text(*event, "event.", "name").value_or("");
  ev.date = r.text(*event, "event.", "date").value_or("");
  if (!ev.date.empty()) {
    const auto& d = ev.date;
    const bool shape = d.size() == 10 && d[4] == '-' && d[7] == '-';
    const auto y = parse_number(d.substr(0, 4)), mo = parse_number(d.substr(5, 2)), da = parse_number(d.substr(8, 2));
    if (!shape || !y || !mo || !da || *mo < 1 || *mo > 12 || *da < 1 || *da > 31) {
      r.error(event->get("date"), "event.date", "give the date as \"YYYY-MM-DD\"");
    }
  }
  const auto course = r.text(*event, "event.", "course");
  if (!course) r.error(event, "event.course", "missing: name the course file, e.g. course = \"course.gpx\"");
  ev.course_path = r.resolve(*course);
  if (auto dem = r.text(*event, "event.", "dem")) ev.dem_path = r.resolve(*dem);
  ev.dem_crs = r.text(*event, "event.", "dem_crs").value_or("");
  ev.track = r.text(*event, "event.", "track").value_or("");
  ev.spacing_m = r.number(*event, "event.", "spacing_m", 0.5, 1000, "m");

  if (const toml::table* field = r.table(root, "", "field")) {
    r.only(*field, "field.", {"classes", "riders"});
    ev.classes = r.names(*field, "field.", "classes");
    if (auto riders = r.text(*field, "field.", "riders")) ev.riders_path = r.resolve(*riders);
  }

  for (const toml::table* w : r.tables(root, "", "start")) {
    r.only(*w, "start.", {"name", "time", "classes"});
    StartWave wave;
    wave.name = r.text(*w, "start.", "name").value_or("wave " + std::to_string(ev.waves.size() + 1));
    const auto t = r.clock(*w, "start.", "time");
    if (!t) r.error(w, "start.time", "missing: every start needs time = \"HH:MM\"");
    wave.start_time_s = *t;
    wave.classes = r.names(*w, "start.", "classes");
    ev.waves.push_back(wave);
  }

  if (const toml::table* road = r.table(root, "", "road")) {
    r.only(*road, "road.", {"state", "road_width_m", "lane_width_m", "traffic_side", "surface", "section"});
    ev.road.closed = closed_from(r, *road, "road.", "state", false);
    ev.road.road_width_m = r.number(*road, "road.", "road_width_m", 2, 30, "m").value_or(ev.road.road_width_m);
    ev.road.lane_width_m = r.number(*road, "road.", "lane_width_m", 1, 10, "m").value_or(ev.road.lane_width_m);
    if (auto side = r.text(*road, "road.", "traffic_side")) {
      if (*side != "right" && *side != "left") r.error(road->get("traffic_side"), "road.traffic_side", "must be \"right\" or \"left\"");
      ev.road.right_hand_traffic = *side == "right";
    }
    ev.surface = surface_from(r, *road, "road.", "surface", SurfaceClass::smooth_asphalt);
    for (const toml::table* s : r.tables(*road, "road.", "section")) {
      r.only(*s, "road.section.", {"from_km", "to_km", "state", "road_width_m", "lane_width_m", "surface"});
      RoadSection sec;
      const auto from = r.number(*s, "road.section.", "from_km", 0, 5000, "km");
      const auto to = r.number(*s, "road.section.", "to_km", 0, 5000, "km");
      if (!from || !to) r.error(s, "road.section", "every section needs from_km and to_km");
      if (*to <= *from) r.error(s->get("to_km"), "road.section.to_km", "must be after from_km");
      sec.from_m = *from * 1000.0;
      sec.to_m = *to * 1000.0;
      if (s->get("state")) sec.closed = closed_from(r, *s, "road.section.", "state", false);
      sec.road_width_m = r.number(*s, "road.section.", "road_width_m", 2, 30, "m");
      sec.lane_width_m = r.number(*s, "road.section.", "lane_width_m", 1, 10, "m");
      if (s->get("surface")) sec.surface = surface_from(r, *s, "road.section.", "surface", ev.surface);
      ev.sections.push_back(sec);
    }
  }

  for (const toml::table* w : r.tables(root, "", "weather")) {
    r.only(*w, "weather.", {"name", "condition", "temperature_c", "wind_kmh", "wind_from_deg"});
    WeatherScenario s;
    if (auto c = r.text(*w, "weather.", "condition")) {
      if (*c != "dry" && *c != "wet") r.error(w->get("condition"), "weather.condition", "must be \"dry\" or \"wet\"");
      s.wet = *c == "wet";
    }
    s.name = r.text(*w, "weather.", "name").value_or(s.wet ? "wet" : "dry");
    s.temperature_c = r.number(*w, "weather.", "temperature_c", -30, 50, "deg C").value_or(15.0);
    s.wind_speed_mps = r.number(*w, "weather.", "wind_kmh", 0, 150, "km/h").value_or(0.0) / 3.6;
    s.wind_from_rad = r.number(*w, "weather.", "wind_from_deg", 0, 360, "deg").value_or(0.0) * kPi / 180.0;
    ev.weather.push_back(s);
  }

  for (const toml::table* c : r.tables(root, "", "checkpoint")) {
    r.only(*c, "checkpoint.", {"name", "kind", "at_km", "lat", "lon", "cutoff"});
    CheckpointSpec spec;
    spec.checkpoint.name = r.text(*c, "checkpoint.", "name").value_or("checkpoint " + std::to_string(ev.checkpoints.size() + 1));
    if (auto k = r.text(*c, "checkpoint.", "kind")) {
      if (*k != "feed" && *k != "cut-off" && *k != "other") {
        r.error(c->get("kind"), "checkpoint.kind", "must be \"feed\", \"cut-off\" or \"other\"");
      }
      spec.checkpoint.kind = *k;
    }
    const auto at = r.number(*c, "checkpoint.", "at_km", 0, 5000, "km");
    spec.lat_deg = r.number(*c, "checkpoint.", "lat", -90, 90, "deg");
    spec.lon_deg = r.number(*c, "checkpoint.", "lon", -180, 180, "deg");
    if (at) spec.checkpoint.at_m = *at * 1000.0;
    if (!at && !(spec.lat_deg && spec.lon_deg)) r.error(c, "checkpoint", "give at_km, or lat and lon");
    if (auto cut = r.clock(*c, "checkpoint.", "cutoff")) spec.checkpoint.cutoff_time_s = *cut;
    ev.checkpoints.push_back(spec);
  }

  if (const toml::table* rules = r.table(root, "", "rules")) {
    r.only(*rules, "rules.", {"marshal_lead_min", "marshal_lead_max_min", "marshal_release_min", "marshals_per_turn",
                              "merge_posts_within_m", "sector_km", "closing_speed_kmh", "closure_before_min",
                              "closure_after_min", "time_limit_h", "max_walking_m", "critical_hazards_unsuitable",
                              "fast_speed_kmh", "assist_cutoff_kmh", "closing_grace_min", "merged_post_extra_from_m",
                              "max_posts_per_sector", "schedule_step_km", "demanding_time_share_pct",
                              "cutoff_margin_min"});
    OperationsRules& o = ev.rules;
    const std::string p = "rules.";
    if (auto v = r.number(*rules, p, "marshal_lead_min", 0, 240, "min")) o.marshal_lead_s = *v * 60.0;
    if (auto v = r.number(*rules, p, "marshal_lead_max_min", 0, 240, "min")) o.marshal_lead_max_s = *v * 60.0;
    if (o.marshal_lead_max_s < o.marshal_lead_s) {
      r.error(rules, "rules.marshal_lead_max_min", "must not be below marshal_lead_min");
    }
    if (auto v = r.number(*rules, p, "marshal_release_min", 0, 240, "min")) o.marshal_release_after_closing_s = *v * 60.0;
    if (auto v = r.number(*rules, p, "marshals_per_turn", 0, 10, "marshals")) o.marshals_per_turn = static_cast<int>(*v);
    if (auto v = r.number(*rules, p, "merge_posts_within_m", 0, 2000, "m")) o.merge_posts_within_m = *v;
    if (auto v = r.number(*rules, p, "sector_km", 1, 200, "km")) o.sector_length_m = *v * 1000.0;
    if (auto v = r.number(*rules, p, "closing_speed_kmh", 3, 60, "km/h")) o.closing_speed_mps = *v / 3.6;
    if (auto v = r.number(*rules, p, "closure_before_min", 0, 600, "min")) o.closure_margin_before_s = *v * 60.0;
    if (auto v = r.number(*rules, p, "closure_after_min", 0, 600, "min")) o.closure_margin_after_s = *v * 60.0;
    if (auto v = r.number(*rules, p, "time_limit_h", 0.5, 48, "h")) o.time_limit_s = *v * 3600.0;
    if (auto v = r.number(*rules, p, "max_walking_m", 0, 100000, "m")) o.max_walking_m = *v;
    if (auto v = r.number(*rules, p, "critical_hazards_unsuitable", 1, 1000, "hazards")) {
      o.critical_hazards_unsuitable = static_cast<int>(*v);
    }
    if (auto v = r.number(*rules, p, "closing_grace_min", 0, 120, "min")) o.closing_grace_s = *v * 60.0;
    if (auto v = r.number(*rules, p, "merged_post_extra_from_m", 0, 2000, "m")) o.merged_post_extra_from_m = *v;
    if (auto v = r.number(*rules, p, "max_posts_per_sector", 1, 100, "posts")) {
      o.max_posts_per_sector = static_cast<std::size_t>(*v);
    }
    if (auto v = r.number(*rules, p, "schedule_step_km", 0.1, 100, "km")) o.schedule_step_m = *v * 1000.0;
    if (auto v = r.number(*rules, p, "demanding_time_share_pct", 10, 100, "%")) o.demanding_time_share = *v / 100.0;
    if (auto v = r.number(*rules, p, "cutoff_margin_min", 0, 240, "min")) o.cutoff_margin_s = *v * 60.0;
    if (auto v = r.number(*rules, p, "fast_speed_kmh", 20, 150, "km/h")) ev.fast_speed_mps = *v / 3.6;
    if (auto v = r.number(*rules, p, "assist_cutoff_kmh", 5, 60, "km/h")) ev.assist_cutoff_mps = *v / 3.6;
  }
  return ev;
}

namespace {
// A TOML basic string: quotes and backslashes escaped.
std::string quoted(const std::string& s) {
  std::string q = "\"";
  for (char c : s) {
    if (c == '"' || c == '\\') q += '\\';
    q += c;
  }
  return q + "\"";
}
}  // namespace

std::string example_event_file(const std::string& course, const std::string& dem, const std::string& name) {
  std::string t;
  t += "# coursewarden event file: describes one event so that its check can be repeated and shared.\n";
  t += "# Run it with:  coursewarden check THIS_FILE.toml --out report\n";
  t += "# Paths are relative to this file. Options given on the command line override what is here.\n";
  t += "# coursewarden advises; local regulations, the road authority and the event's safety officers decide.\n\n";
  t += "[event]\n";
  t += "name = " + quoted(name) + "\n";
  t += "date = \"2027-06-13\"            # YYYY-MM-DD\n";
  t += "course = " + quoted(course) + "\n";
  t += dem.empty() ? "# dem = \"terrain.tif\"          # elevation raster; without it the course file's heights are used\n"
                   : "dem = " + quoted(dem) + "\n";
  t += "# spacing_m = 5                 # station spacing along the course\n\n";
  t += "[field]\n";
  t += "# The rider classes expected (see `coursewarden riders`); leave out for all of them.\n";
  t += "classes = [\"hesitant-novice\", \"leisure\", \"club\", \"fast-club\", \"racer\"]\n";
  t += "# riders = \"riders.toml\"        # your own or adjusted classes\n\n";
  t += "# Start waves: a time and the classes released together (no classes = everyone).\n";
  t += "[[start]]\nname = \"fast wave\"\ntime = \"08:00\"\nclasses = [\"racer\", \"fast-club\"]\n\n";
  t += "[[start]]\nname = \"main wave\"\ntime = \"08:20\"\nclasses = [\"club\", \"leisure\", \"hesitant-novice\"]\n\n";
  t += "[road]\n";
  t += "state = \"open\"                  # \"closed\": riders may use road_width_m through bends; \"open\": their lane\n";
  t += "road_width_m = 6.0\nlane_width_m = 3.0\ntraffic_side = \"right\"\nsurface = \"smooth\"               # smooth, rough or gravel\n\n";
  t += "# A stretch with a different road state or surface:\n";
  t += "# [[road.section]]\n# from_km = 40.0\n# to_km = 48.0\n# state = \"closed\"\n# surface = \"rough\"\n\n";
  t += "# Conditions to check; each one gets its own results.\n";
  t += "[[weather]]\nname = \"dry\"\ncondition = \"dry\"\ntemperature_c = 18\nwind_kmh = 10\nwind_from_deg = 250\n\n";
  t += "[[weather]]\nname = \"wet\"\ncondition = \"wet\"\ntemperature_c = 12\n\n";
  t += "# Feed stations and cut-offs, at a distance or at coordinates (lat/lon, placed on the course).\n";
  t += "[[checkpoint]]\nname = \"first feed\"\nkind = \"feed\"\nat_km = 25.0\n\n";
  t += "[[checkpoint]]\nname = \"cut-off\"\nkind = \"cut-off\"\nat_km = 45.0\ncutoff = \"12:30\"\n\n";
  t += "[rules]\n";
  t += "marshal_lead_min = 15            # on post this long before the first rider\n";
  t += "marshal_release_min = 15         # released this long after the closing vehicle\n";
  t += "closing_speed_kmh = 15           # the closing vehicle's pace: the event's minimum speed\n";
  t += "time_limit_h = 7\n";
  t += "fast_speed_kmh = 60              # sections above this speed are flagged\n";
  return t;
}

}  // namespace coursewarden
