// coursewarden: the files and terminal text of the event operations: schedule.csv,
// marshal-plan.csv, marshal-plan.gpx (GPX 1.1 waypoints) and a block for the terminal. Every
// function is pure and returns the text; numbers are written locale-independently. Columns:
// docs/operations.md.
#pragma once

#include <string>

#include "coursewarden/check.hpp"
#include "coursewarden/grading.hpp"
#include "coursewarden/marshal_plan.hpp"
#include "coursewarden/schedule.hpp"

namespace coursewarden {

/// A clock time as HH:MM:SS, rounded to the second. Hours go on past 24 ("25:10:00" is 01:10
/// the next day); negative times (before midnight) get a leading '-'; NaN gives "".
std::string clock_hms(double clock_s);

/// schedule.csv: one row per ScheduleRow, times both as HH:MM:SS and as seconds after midnight;
/// classes missing a cut-off joined with ';'. Header:
/// kind,label,at_m,km,earliest,earliest_s,earliest_class,earliest_wave,latest,latest_s,
/// latest_class,latest_wave,closing,closing_s,closure_open,closure_open_s,closure_close,
/// closure_close_s,latest_behind_closing,cutoff,cutoff_s,slowest_makes_cutoff,
/// classes_missing_cutoff
std::string schedule_csv(const Schedule& schedule);

/// marshal-plan.csv: one row per post. Header:
/// post,sector,km,at_m,first_m,last_m,marshals,lon,lat,not_before,on_post,on_post_s,
/// earliest_pass,earliest_pass_s,closing,closing_s,off_post,off_post_s,hazards,corner_indices,warn
/// (hazards: hazard numbers joined with ';'; corner_indices: indices into the summary's corners,
/// from 0, of the junction-type turns merged into the post).
std::string marshal_plan_csv(const MarshalPlan& plan);

/// marshal-plan.gpx: one GPX 1.1 waypoint per post, named "M03 (2)" (code and marshals), the
/// warning and the shift times as the description.
std::string marshal_plan_gpx(const CheckResult& result, const MarshalPlan& plan);

/// The terminal block (at most 100 columns): waves and closing vehicle, checkpoints and the
/// finish, the marshal plan with its totals, and the grading of every class and the course.
std::string operations_text(const Schedule& schedule, const MarshalPlan& plan,
                            const Grading& grading);

}  // namespace coursewarden
