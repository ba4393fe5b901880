// Rider classes: the built-in set, validation, the TOML loader and the outputs.
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <set>
#include <sstream>
#include <string>

#include "coursewarden/error.hpp"
#include "coursewarden/riders.hpp"
#include "coursewarden/speed.hpp"
#include "io/riders_output.hpp"

namespace coursewarden {
namespace {

constexpr double kDegToRad = std::numbers::pi / 180.0;

std::string fixture(const std::string& name) {
  return std::string(COURSEWARDEN_SOURCE_DIR) + "/tests/data/riders/" + name;
}

const RiderClass& by_name(const std::vector<RiderClass>& classes, const std::string& name) {
  const int i = find_rider_class(classes, name);
  if (i < 0) throw std::runtime_error("no class " + name);
  return classes[static_cast<std::size_t>(i)];
}

// The Error message of loading `name`, or "" when it loads.
std::string load_error(const std::string& name) {
  try {
    load_rider_classes(fixture(name));
  } catch (const Error& e) {
    return e.what();
  }
  return "";
}

bool contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

TEST(RiderClasses, BuiltInSetSpansTheFieldAndIsValid) {
  const auto classes = builtin_rider_classes();
  ASSERT_GE(classes.size(), 8u);
  std::set<std::string> names;
  for (const RiderClass& r : classes) {
    EXPECT_TRUE(rider_class_problems(r).empty()) << r.name;
    EXPECT_NO_THROW(validate_rider_class(r));
    EXPECT_FALSE(r.description.empty()) << r.name;
    names.insert(r.name);
  }
  EXPECT_EQ(names.size(), classes.size());  // unique names
  for (const char* n : {"hesitant-novice", "elite", "tandem", "pedal-assisted"})
    EXPECT_EQ(names.count(n), 1u) << n;
  // Only the pedal-assisted bicycle has a motor.
  for (const RiderClass& r : classes)
    EXPECT_EQ(r.assist_power_w > 0.0, r.name == "pedal-assisted") << r.name;
}

TEST(RiderClasses, BuiltInValuesStayWithinPublishedRanges) {
  for (const RiderClass& r : builtin_rider_classes()) {
    // Drag areas: tops 0.40 ... descending tuck about 0.20 (check-values.md section 1,
    // secondary sources); a tandem or upright rider may be a little above.
    EXPECT_GE(r.cda_descending_m2, 0.20) << r.name;
    EXPECT_LE(r.cda_riding_m2, 0.45) << r.name;
    // Crr on smooth asphalt 0.003-0.0060 for good to touring tyres (Wilson & Schmidt,
    // Bicycling Science, from memory; check-values.md section 1).
    EXPECT_GE(r.crr_smooth, 0.003) << r.name;
    EXPECT_LE(r.crr_smooth, 0.006) << r.name;
    // Hardest dry braking below the pitch-over limit of about 0.6 g (Pein, High Speed
    // Bicycling; check-values.md section 5).
    EXPECT_LE(r.brake_max_dry_mps2, 0.6 * 9.80665) << r.name;
    // Leaning beyond atan(mu) slides: 45 deg dry (mu 1.0), 26.6 deg wet (mu 0.5)
    // (derived, check-values.md section 3).
    EXPECT_LE(r.lean_max_dry_rad, 45.0 * kDegToRad) << r.name;
    EXPECT_LE(r.lean_max_wet_rad, 26.6 * kDegToRad) << r.name;
  }
}

TEST(RiderClasses, PowerBlendsFromFlatToClimbWithGrade) {
  RiderClass r = builtin_rider_classes().front();
  r.power_flat_w = 100.0;
  r.power_climb_w = 140.0;
  r.climb_power_from_grade = 0.02;
  r.climb_power_full_grade = 0.06;
  EXPECT_DOUBLE_EQ(power_at_grade_w(r, -0.05), 100.0);
  EXPECT_DOUBLE_EQ(power_at_grade_w(r, 0.02), 100.0);
  EXPECT_DOUBLE_EQ(power_at_grade_w(r, 0.04), 120.0);
  EXPECT_DOUBLE_EQ(power_at_grade_w(r, 0.10), 140.0);
}

TEST(RiderClasses, ValidationNamesTheFieldAndItsUnit) {
  RiderClass r = builtin_rider_classes()[2];
  r.max_speed_mps = 200.0 / 3.6;
  auto problems = rider_class_problems(r);
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].key, "max_speed_kmh");
  EXPECT_TRUE(contains(problems[0].message, "km/h")) << problems[0].message;
  EXPECT_THROW(validate_rider_class(r), Error);

  r = builtin_rider_classes()[2];
  r.mass_kg = std::nan("");
  EXPECT_EQ(rider_class_problems(r).at(0).key, "mass_kg");
  r = builtin_rider_classes()[2];
  r.power_flat_w = -150.0;
  EXPECT_EQ(rider_class_problems(r).at(0).key, "power_flat_w");
  r = builtin_rider_classes()[2];
  r.lean_comfort_wet_rad = r.lean_comfort_dry_rad + 0.05;  // wet above dry
  EXPECT_EQ(rider_class_problems(r).at(0).key, "lean_comfort_wet_deg");
  r = builtin_rider_classes()[2];
  r.crr_gravel = r.crr_smooth * 0.5;  // gravel easier than asphalt: swapped values
  EXPECT_EQ(rider_class_problems(r).at(0).key, "crr_rough");
  r = builtin_rider_classes()[2];
  r.name = "club riders";  // a space does not make a TOML bare key
  EXPECT_EQ(rider_class_problems(r).at(0).key, "name");
}

TEST(RiderToml, OverrideChangesOnlyTheGivenKeys) {
  const auto base = builtin_rider_classes();
  const auto loaded = load_rider_classes(fixture("override_club.toml"));
  ASSERT_EQ(loaded.size(), base.size());
  const RiderClass& before = by_name(base, "club");
  const RiderClass& after = by_name(loaded, "club");
  EXPECT_DOUBLE_EQ(after.power_flat_w, 200.0);
  EXPECT_NEAR(after.max_speed_mps, 55.5 / 3.6, 1e-12);  // km/h at the edge, m/s inside
  EXPECT_DOUBLE_EQ(after.power_climb_w, before.power_climb_w);
  EXPECT_DOUBLE_EQ(after.mass_kg, before.mass_kg);
  EXPECT_EQ(after.description, before.description);
  EXPECT_EQ(find_rider_class(loaded, "club"), find_rider_class(base, "club"));  // same place
}

TEST(RiderToml, NewClassesStartFromABaseOrGiveEveryField) {
  const auto loaded = load_rider_classes(fixture("new_classes.toml"));
  ASSERT_EQ(loaded.size(), builtin_rider_classes().size() + 2);
  // Appended in file order.
  EXPECT_EQ(loaded[loaded.size() - 2].name, "evening-group");
  EXPECT_EQ(loaded.back().name, "juniors");

  const RiderClass& evening = by_name(loaded, "evening-group");
  const RiderClass& leisure = by_name(loaded, "leisure");
  EXPECT_NEAR(evening.max_speed_mps, 35.0 / 3.6, 1e-12);
  EXPECT_NEAR(evening.lean_comfort_dry_rad, 14.0 * kDegToRad, 1e-12);
  EXPECT_DOUBLE_EQ(evening.power_flat_w, leisure.power_flat_w);
  EXPECT_EQ(evening.description, "relaxed evening group on upright bicycles");

  const RiderClass& juniors = by_name(loaded, "juniors");
  EXPECT_DOUBLE_EQ(juniors.mass_kg, 62.0);  // an integer in the file is fine
  EXPECT_NEAR(juniors.climb_power_full_grade, 0.06, 1e-12);
  EXPECT_NEAR(juniors.coast_above_mps, 38.0 / 3.6, 1e-12);
  EXPECT_DOUBLE_EQ(juniors.assist_power_w, 0.0);
  EXPECT_TRUE(rider_class_problems(juniors).empty());
}

TEST(RiderToml, ValueOutsideItsRangeNamesFileLineAndKey) {
  const std::string e = load_error("bad_range.toml");
  EXPECT_TRUE(contains(e, "bad_range.toml")) << e;
  EXPECT_TRUE(contains(e, "line 4")) << e;
  EXPECT_TRUE(contains(e, "classes.racer.max_speed_kmh")) << e;
  EXPECT_TRUE(contains(e, "140")) << e;  // the upper bound
}

TEST(RiderToml, UnknownKeyIsAnErrorWithItsLine) {
  const std::string e = load_error("unknown_key.toml");
  EXPECT_TRUE(contains(e, "line 4")) << e;
  EXPECT_TRUE(contains(e, "max_speed_kph")) << e;
  EXPECT_TRUE(contains(e, "did you mean max_speed_kmh?")) << e;
}

TEST(RiderToml, SyntaxErrorCarriesTheLineNumber) {
  const std::string e = load_error("syntax_error.toml");
  EXPECT_TRUE(contains(e, "syntax_error.toml")) << e;
  EXPECT_TRUE(contains(e, "line 3")) << e;
}

TEST(RiderToml, IncompleteNewClassListsWhatIsMissing) {
  const std::string e = load_error("missing_fields.toml");
  EXPECT_TRUE(contains(e, "line 1")) << e;
  EXPECT_TRUE(contains(e, "newcomers")) << e;
  EXPECT_TRUE(contains(e, "cda_riding_m2")) << e;
  EXPECT_TRUE(contains(e, "based_on")) << e;
  EXPECT_FALSE(contains(e, "power_flat_w,")) << e;  // given, so not listed as missing
}

TEST(RiderToml, WrongTypeComparisonAndUnknownBaseAreErrorsWithLines) {
  std::string e = load_error("wrong_type.toml");
  EXPECT_TRUE(contains(e, "line 2")) << e;
  EXPECT_TRUE(contains(e, "classes.elite.power_flat_w")) << e;
  EXPECT_TRUE(contains(e, "number")) << e;

  e = load_error("comfort_above_max.toml");
  EXPECT_TRUE(contains(e, "line 2")) << e;
  EXPECT_TRUE(contains(e, "brake_comfort_dry_mps2")) << e;
  EXPECT_TRUE(contains(e, "brake_max_dry_mps2")) << e;

  e = load_error("unknown_base.toml");
  EXPECT_TRUE(contains(e, "line 2")) << e;
  EXPECT_TRUE(contains(e, "couriers")) << e;

  e = load_error("top_level_key.toml");
  EXPECT_TRUE(contains(e, "line 1")) << e;
  EXPECT_TRUE(contains(e, "units")) << e;
}

TEST(RiderToml, MissingFileIsAnErrorNamingIt) {
  const std::string e = load_error("no_such_file.toml");
  EXPECT_TRUE(contains(e, "no_such_file.toml")) << e;
}

TEST(RiderOutput, TableListsEveryClassAndKeyWithinOneHundredColumns) {
  const auto classes = load_rider_classes(fixture("new_classes.toml"));
  const std::string text = riders_table_text(classes);
  std::istringstream lines(text);
  std::string line;
  while (std::getline(lines, line)) EXPECT_LE(line.size(), 100u) << line;
  for (const RiderClass& r : classes) EXPECT_TRUE(contains(text, r.description)) << r.name;
  for (const RiderField& f : rider_fields()) EXPECT_TRUE(contains(text, f.key)) << f.key;
  EXPECT_TRUE(contains(text, "juniors"));
  EXPECT_TRUE(contains(text, "novice"));  // split over two header lines
}

TEST(RiderOutput, ResultJsonCarriesTheSummaryFields) {
  CourseSlice s;
  for (int i = 0; i <= 400; ++i) {
    const double d = 5.0 * i;
    s.distance_m.push_back(d);
    s.elevation_m.push_back(d < 1000.0 ? 0.0 : 0.22 * (d - 1000.0));  // a wall at the end
    s.heading_rad.push_back(0.0);
  }
  s.climbs = {{1000.0, 2000.0}};
  const auto classes = builtin_rider_classes();
  const RiderClass& novice = by_name(classes, "hesitant-novice");
  const SpeedProfile p = simulate_class(novice, s, Environment{});
  const nlohmann::json j = rider_result_json(novice, p);
  EXPECT_EQ(j.at("name"), "hesitant-novice");
  EXPECT_DOUBLE_EQ(j.at("mass_kg").get<double>(), novice.mass_kg);
  EXPECT_NEAR(j.at("time_s").get<double>(), p.total_time_s, 0.05);
  EXPECT_NEAR(j.at("avg_speed_kmh").get<double>(), p.moving_avg_speed_mps * 3.6, 0.005);
  EXPECT_NEAR(j.at("max_speed_kmh").get<double>(), p.max_speed_mps * 3.6, 0.005);
  ASSERT_EQ(j.at("walking_sections").size(), p.walking_sections.size());
  ASSERT_FALSE(p.walking_sections.empty());
  EXPECT_TRUE(j.at("walking_sections")[0].contains("start_m"));
  EXPECT_TRUE(j.at("walking_sections")[0].contains("end_m"));
  ASSERT_EQ(j.at("climb_times_s").size(), 1u);
  EXPECT_NEAR(j.at("climb_times_s")[0].get<double>(), p.climb_times_s[0], 0.05);
}

}  // namespace
}  // namespace coursewarden
