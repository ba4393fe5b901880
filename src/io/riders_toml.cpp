// Rider classes from a TOML file (toml++): add classes or override built-in ones by name.
//
// File layout (human units in the key names, see rider_fields()):
//
//   [classes.club]             # an existing class: only the keys given change
//   power_flat_w = 195
//
//   [classes.night-owls]       # a new class: every field, or a class to start from
//   based_on = "leisure"
//   description = "evening group, upright bikes"
//   max_speed_kmh = 40
#include <algorithm>
#include <cmath>
#include <fstream>
#include <map>
#include <string>
#include <string_view>
#include <vector>

#include <toml++/toml.h>

#include "coursewarden/error.hpp"
#include "coursewarden/riders.hpp"

namespace coursewarden {
namespace {

std::string line_of(const toml::source_region& region) {
  if (region.begin.line == 0) return "";
  return "line " + std::to_string(region.begin.line);
}

// One [classes.NAME] table as read: the class it yields and where each key stood.
struct ClassEntry {
  std::string name;
  const toml::table* table = nullptr;
  toml::source_region region;
  std::map<std::string, toml::source_region> key_regions;
};

const RiderField* find_field(std::string_view key) {
  for (const RiderField& f : rider_fields())
    if (key == f.key) return &f;
  return nullptr;
}

// Edit distance, for suggesting the key that was probably meant.
std::size_t edit_distance(std::string_view a, std::string_view b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t up = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diagonal = up;
    }
  }
  return row[b.size()];
}

std::string unknown_key_hint(std::string_view key) {
  std::string best;
  std::size_t best_distance = 4;  // suggest only near misses
  for (const RiderField& f : rider_fields()) {
    const std::size_t d = edit_distance(key, f.key);
    if (d < best_distance) {
      best_distance = d;
      best = f.key;
    }
  }
  for (const char* k : {"description", "based_on"}) {
    const std::size_t d = edit_distance(key, k);
    if (d < best_distance) {
      best_distance = d;
      best = k;
    }
  }
  return best.empty() ? "" : "did you mean " + best + "? ";
}

std::string known_keys() {
  std::string text = "description, based_on";
  for (const RiderField& f : rider_fields()) text += std::string(", ") + f.key;
  return text;
}

// Applies the keys of one class table to `rider`; returns the numeric keys it set.
std::vector<std::string> apply_table(const std::string& path, ClassEntry& entry, RiderClass& rider,
                                     bool is_new) {
  std::vector<std::string> set;
  for (auto&& [key, node] : *entry.table) {
    const std::string k(key.str());
    const std::string where = line_of(key.source());
    const std::string full = "classes." + entry.name + "." + k;
    entry.key_regions[k] = key.source();
    if (k == "description") {
      const auto text = node.value<std::string>();
      if (!text || !node.is_string())
        fail(path, where, full + " must be a string in quotes");
      if (text->size() > 100) fail(path, where, full + " must be at most 100 characters");
      rider.description = *text;
      continue;
    }
    if (k == "based_on") {
      if (!node.is_string()) fail(path, where, full + " must be a class name in quotes");
      if (!is_new)
        fail(path, where,
             full + ": only a new class can name a class to start from; '" + entry.name +
                 "' already exists, so its other values are kept anyway");
      continue;  // applied before the other keys, see load_rider_classes
    }
    const RiderField* field = find_field(k);
    if (!field)
      fail(path, where,
           "unknown key " + full + "; " + unknown_key_hint(k) + "known keys: " + known_keys());
    if (!node.is_number())
      fail(path, where, full + " must be a number in " + field->unit + ", without quotes");
    const double value = *node.value<double>();
    if (!std::isfinite(value)) fail(path, where, full + " must be a finite number");
    rider.*(field->member) = value / field->si_to_unit;
    set.push_back(k);
  }
  return set;
}

}  // namespace

std::vector<RiderClass> load_rider_classes(const std::string& path, std::vector<RiderClass> base) {
  {
    std::ifstream probe(path);
    if (!probe) fail(path, "", "cannot open the rider class file; check the path");
  }
  toml::table root;
  try {
    root = toml::parse_file(path);
  } catch (const toml::parse_error& e) {
    fail(path, line_of(e.source()),
         "not valid TOML: " + std::string(e.description()) + "; fix the syntax");
  }

  std::vector<ClassEntry> existing, added;
  for (auto&& [key, node] : root) {
    if (key.str() != "classes")
      fail(path, line_of(key.source()),
           "unknown key '" + std::string(key.str()) + "'; put each class under [classes.NAME]");
    const toml::table* classes = node.as_table();
    if (!classes)
      fail(path, line_of(key.source()), "'classes' must be a table of [classes.NAME] tables");
    for (auto&& [name, class_node] : *classes) {
      ClassEntry entry;
      entry.name = std::string(name.str());
      entry.region = name.source();
      entry.table = class_node.as_table();
      if (!entry.table)
        fail(path, line_of(name.source()),
             "classes." + entry.name + " must be a table of keys, e.g. [classes." + entry.name +
                 "]");
      (find_rider_class(base, entry.name) >= 0 ? existing : added).push_back(entry);
    }
  }
  // New classes are appended in file order (toml++ keeps keys sorted by name).
  std::sort(added.begin(), added.end(), [](const ClassEntry& a, const ClassEntry& b) {
    return a.region.begin.line < b.region.begin.line;
  });

  auto check = [&](const ClassEntry& entry, const RiderClass& rider) {
    const auto problems = rider_class_problems(rider);
    if (problems.empty()) return;
    const RiderProblem& p = problems.front();
    const auto it = entry.key_regions.find(p.key);
    const toml::source_region& region =
        it != entry.key_regions.end() ? it->second : entry.region;
    fail(path, line_of(region), "classes." + entry.name + "." + p.key + " " + p.message);
  };

  // Overrides first, so that a new class can start from an overridden one.
  for (ClassEntry& entry : existing) {
    RiderClass& rider = base[static_cast<std::size_t>(find_rider_class(base, entry.name))];
    apply_table(path, entry, rider, false);
    check(entry, rider);
  }
  const std::vector<RiderClass> starts = base;
  for (ClassEntry& entry : added) {
    RiderClass rider;
    bool from_base = false;
    if (const toml::node* b = entry.table->get("based_on"); b && b->is_string()) {
      const std::string start = *b->value<std::string>();
      const int idx = find_rider_class(starts, start);
      if (idx < 0)
        fail(path, line_of(b->source()),
             "classes." + entry.name + ".based_on names no known class '" + start +
                 "'; use a built-in class or one overridden in this file");
      rider = starts[static_cast<std::size_t>(idx)];
      from_base = true;
    }
    rider.name = entry.name;
    const auto set = apply_table(path, entry, rider, true);
    if (!from_base) {
      std::string missing;
      for (const RiderField& f : rider_fields()) {
        if (std::find(set.begin(), set.end(), f.key) != set.end()) continue;
        missing += (missing.empty() ? "" : ", ") + std::string(f.key);
      }
      if (!missing.empty())
        fail(path, line_of(entry.region),
             "new class classes." + entry.name + " misses " + missing +
                 "; give every field or start from a class with based_on = \"NAME\"");
    }
    check(entry, rider);
    base.push_back(std::move(rider));
  }
  return base;
}

}  // namespace coursewarden
