// coursewarden: grading for clubs — whether each rider class of the field can ride the course
// (suitable / demanding / unsuitable, with the reasons) and an overall grade of the course for
// mixed-ability groups on a scale of our own (pure computation).
//
// Every threshold is in OperationsRules and is our own assumption; docs/operations.md lists
// them and the scale.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/event.hpp"
#include "coursewarden/schedule.hpp"

namespace coursewarden {

enum class Suitability {
  suitable,    ///< nothing found that the class cannot comfortably handle
  demanding,   ///< the class can ride it, with effort or care (close to a limit, short walks, serious hazards)
  unsuitable,  ///< the class should not ride it (over a limit, long walks, several critical hazards)
};

/// "suitable", "demanding", "unsuitable".
const char* suitability_name(Suitability s);

struct GradeReason {
  Suitability level = Suitability::demanding;  ///< what this finding alone makes of the class
  std::string text;                            ///< one line of plain English
};

struct ClassGrade {
  std::string class_name;
  Suitability verdict = Suitability::suitable;  ///< the worst level among the reasons
  std::vector<GradeReason> reasons;  ///< time, cut-offs, closing vehicle, walking, hazards
  double ride_time_s = 0.0;          ///< predicted time from the start to the finish
  double longest_walking_m = 0.0;
  int serious_hazards = 0;   ///< hazards at which this class's severity is serious
  int critical_hazards = 0;  ///< ... critical
  std::vector<std::string> missed_cutoffs;  ///< checkpoint labels (and "finish" for the time limit)
};

/// One level of the course grade for mixed-ability groups (our own scale).
struct GradeLevel {
  int level = 0;            ///< 1 (every class suitable) to 5
  const char* name = "";    ///< short plain-English name
  const char* meaning = ""; ///< one sentence for the report
  /// Lowest fit share of the level; the fit share is (suitable + demanding / 2) / classes.
  double min_fit_share = 0.0;
};

/// The five levels, level 1 first: fit share 1 (every class suitable), >= 3/4, >= 1/2, >= 1/4,
/// and below 1/4.
std::span<const GradeLevel> course_grade_scale();

struct CourseGrade {
  int level = 0;
  std::string name;
  std::string meaning;
  double fit_share = 0.0;
  int suitable = 0, demanding = 0, unsuitable = 0;
};

/// The grade for these counts of classes. Throws Error when there are no classes or a count
/// is negative.
CourseGrade course_grade_for(int suitable, int demanding, int unsuitable);

/// The severity a hazard has for one class: its own severity where it arrives too fast; the
/// hazard's severity where a hidden corner hides the bend from it or a fast section lists it;
/// caution where it only cannot see a corner that other classes take too fast; none when the
/// hazard does not list the class (steep descents and turns after descents list no class).
Severity severity_for_class(const Hazard& hazard, const std::string& class_name);

struct Grading {
  std::vector<ClassGrade> classes;  ///< parallel to CheckResult::classes
  CourseGrade course;
};

/// Grades every class of the check against the event's rules and the schedule's cut-offs, and
/// the course as a whole. `schedule` must come from make_schedule(result, ops).
Grading grade_course(const CheckResult& result, const EventOps& ops, const Schedule& schedule);

}  // namespace coursewarden
