// coursewarden: the event's timetable — when the first and the last riders and the closing
// vehicle pass each hazard, checkpoint and kilometre, the road-closure windows and the cut-offs
// (pure computation over a check's speed profiles and the event's start waves; thread-safe).
//
// A group (a rider class in a start wave) passes distance d at wave start + elapsed_s(d), its
// planned ride time interpolated linearly between stations. The closing vehicle leaves with the
// last wave and keeps the event's minimum speed: last start + d / closing_speed_mps. Rules and
// their reasoning: docs/operations.md.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/event.hpp"
#include "coursewarden/speed.hpp"

namespace coursewarden {

enum class ScheduleKind {
  km,          ///< a whole kilometre (every OperationsRules::schedule_step_m), from the start
  checkpoint,  ///< a feed station, cut-off point or other checkpoint
  hazard,      ///< a hazard of the check
  finish,      ///< the end of the course
};

/// Key used in files: "km", "checkpoint", "hazard", "finish".
const char* schedule_kind_key(ScheduleKind kind);

/// A start wave as scheduled: its classes as indices into CheckResult::classes.
struct ScheduledWave {
  std::string name;
  double start_time_s = 0.0;
  std::vector<std::size_t> classes;
};

/// One group of riders: a class starting in a wave.
struct ScheduledGroup {
  std::size_t wave = 0;         ///< index into Schedule::waves
  std::size_t class_index = 0;  ///< index into CheckResult::classes
  std::string wave_name;
  std::string class_name;
  double start_s = 0.0;    ///< clock time
  double elapsed_s = 0.0;  ///< predicted ride time to the finish
  double finish_s = 0.0;   ///< clock time at the finish
};

/// Who passes a place first and last, and when the closing vehicle does.
struct PassTimes {
  double earliest_s = 0.0;  ///< clock time of the first group (fastest class, earliest wave)
  std::string earliest_class, earliest_wave;
  double latest_s = 0.0;    ///< clock time of the last group (slowest class, latest wave)
  std::string latest_class, latest_wave;
  double closing_s = 0.0;   ///< clock time of the closing vehicle
};

struct ScheduleRow {
  ScheduleKind kind = ScheduleKind::km;
  std::string label;  ///< "km 12", "Col feed", "H03 Corner reached too fast (serious)", "finish"
  double at_m = 0.0;
  double earliest_s = 0.0;
  std::string earliest_class, earliest_wave;
  double latest_s = 0.0;
  std::string latest_class, latest_wave;
  double closing_s = 0.0;
  double closure_open_s = 0.0;   ///< road closed from: earliest pass - closure margin before
  double closure_close_s = 0.0;  ///< ... to: closing vehicle + closure margin after
  /// The last group passes more than OperationsRules::closing_grace_s after the closing vehicle
  /// (it is slower than the event's minimum speed): those riders are outside the closure window.
  bool latest_behind_closing = false;
  /// Cut-off clock time: the checkpoint's own; at the finish the time limit after the last
  /// wave's start (each group is held to its own wave's start + limit). NaN = none.
  double cutoff_s = std::numeric_limits<double>::quiet_NaN();
  /// Classes of which at least one group arrives after its cut-off, in the field's order.
  std::vector<std::string> classes_missing_cutoff;
  bool slowest_makes_cutoff = true;  ///< no group misses the cut-off (true when there is none)
  int hazard_number = 0;       ///< hazard rows: Hazard::number
  std::string checkpoint_kind;  ///< checkpoint rows: "feed", "cut-off" or "other"
};

struct Schedule {
  std::vector<ScheduledWave> waves;    ///< as given, or one mass start when none were given
  std::vector<ScheduledGroup> groups;  ///< every (wave, class) pair, wave by wave
  std::vector<ScheduleRow> rows;       ///< in course order
  double course_length_m = 0.0;
  double closing_speed_mps = 0.0;  ///< OperationsRules::closing_speed_mps
  double closing_grace_s = 0.0;    ///< OperationsRules::closing_grace_s
  double first_start_s = 0.0;      ///< clock time of the earliest wave
  double last_start_s = 0.0;       ///< clock time of the latest wave; the closing vehicle leaves then
  double time_limit_s = std::numeric_limits<double>::quiet_NaN();  ///< OperationsRules::time_limit_s
};

/// Planned ride time of a class from the start to `at_m`, s: its elapsed_s interpolated
/// linearly in distance between the stations `distance_m` (clamped to the ends).
double elapsed_at_s(const std::vector<double>& distance_m, const SpeedProfile& speed, double at_m);

/// Resolves the waves (throws Error naming the event file and the wave for a class not in the
/// field, a field class in no wave, a non-finite start time) and checks the rules and the
/// checkpoints (positions on the course, kinds, a cut-off point without a time).
/// Returns the waves as scheduled.
std::vector<ScheduledWave> schedule_waves(const CheckResult& result, const EventOps& ops);

/// First and last groups and the closing vehicle at `at_m`, for the waves of `schedule`.
PassTimes pass_times(const CheckResult& result, const Schedule& schedule, double at_m);

/// The schedule: a row for each kilometre, checkpoint and hazard and the finish, in course order
/// (ties: km, checkpoint, hazard, finish). Throws Error for unusable events (schedule_waves).
Schedule make_schedule(const CheckResult& result, const EventOps& ops);

}  // namespace coursewarden
