// coursewarden: how an event is run on the day — start waves, checkpoints and the operational
// rules for the schedule, the marshal plan and the grading (plain data, filled by the event-file
// loader or by code).
//
// SI inside: distances in m, speeds in m/s, angles in rad, durations in s. Clock times are
// seconds after local midnight of the event day (08:30 = 30600); values past 24 h are the next
// day. Every default is documented in docs/operations.md; defaults not taken from a source are
// our own assumptions and an organiser may change every one.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

namespace coursewarden {

/// A group of riders released together.
struct StartWave {
  std::string name;          ///< shown in tables ("A", "family ride")
  double start_time_s = 0.0; ///< clock time of the release, s after local midnight
  /// Rider classes (RiderClass::name) starting in this wave; empty = every class of the field.
  /// A class may start in several waves; every class of the field must start in at least one.
  std::vector<std::string> classes;
};

/// A point of the course the organisation staffs or times.
struct Checkpoint {
  std::string name;            ///< "Col feed", "CP2"
  std::string kind = "other";  ///< "feed", "cut-off" or "other"
  double at_m = 0.0;           ///< distance from the start along the course
  /// Clock time after which riders are stopped here, s after local midnight; NaN = none.
  /// The same clock time applies to every wave.
  double cutoff_time_s = std::numeric_limits<double>::quiet_NaN();
};

/// Operational rules. Sources and reasoning per field: docs/operations.md.
struct OperationsRules {
  // ---- marshals (French sport code, Code du sport arts. A331-37 to A331-40: marshals are in
  // place at least 15 and at most 30 minutes before the scheduled passing time of the race and
  // leave 15 minutes after the closing vehicle)
  double marshal_lead_s = 15.0 * 60.0;      ///< on post this long before the earliest pass
  double marshal_lead_max_s = 30.0 * 60.0;  ///< ... and never asked to be there earlier than this
  double marshal_release_after_closing_s = 15.0 * 60.0;  ///< off post this long after the closing vehicle
  int marshals_per_turn = 1;          ///< at a junction-type turn that is not a hazard (our assumption)
  double merge_posts_within_m = 150.0;  ///< candidates closer than this along the course share a post (our assumption)
  /// A merged post whose members lie further apart than this along the course gets one more
  /// marshal than its largest member asks for, so both ends are watched (our assumption).
  double merged_post_extra_from_m = 50.0;
  double sector_length_m = 10000.0;  ///< the marshal briefing is cut into sectors this long (our assumption)
  std::size_t max_posts_per_sector = 12;  ///< a sector with more posts is split (one printed page; our assumption)

  // ---- schedule
  /// Pace of the closing vehicle, which follows the last wave from its start: the event's
  /// minimum average speed (15 km/h, our assumption; set it from the event's regulations).
  double closing_speed_mps = 15.0 / 3.6;
  /// Riders count as behind the closing vehicle only when they pass more than this after it:
  /// smaller gaps come from the start from rest and from the vehicle's constant-pace model
  /// (our assumption).
  double closing_grace_s = 2.0 * 60.0;
  double closure_margin_before_s = 30.0 * 60.0;  ///< road closed this long before the earliest pass (our assumption)
  double closure_margin_after_s = 10.0 * 60.0;   ///< ... and reopened this long after the closing vehicle (our assumption)
  double schedule_step_m = 1000.0;  ///< the schedule has a row every this many metres (each kilometre)

  // ---- grading of the classes
  /// Overall time limit from a rider's own wave start to the finish, s; NaN = none.
  double time_limit_s = std::numeric_limits<double>::quiet_NaN();
  /// A class whose predicted time uses more than this share of the time limit is "demanding"
  /// (our assumption).
  double demanding_time_share = 0.9;
  /// A class reaching a cut-off less than this before it closes is "demanding" (our assumption).
  double cutoff_margin_s = 15.0 * 60.0;
  /// A walking section (the class cannot hold walking pace on the bicycle) longer than this
  /// makes the class "unsuitable"; any shorter one "demanding" (our assumption).
  double max_walking_m = 300.0;
  /// This many critical hazards or more at which the class, arriving unbraked, could not reach
  /// its safe speed even with its hardest braking, make it "unsuitable" (our assumption).
  int critical_hazards_unsuitable = 2;
};

/// The operations of one event.
struct EventOps {
  /// Start waves. Empty = one mass start of every class at the check's start time
  /// (Environment::start_time_s).
  std::vector<StartWave> waves;
  std::vector<Checkpoint> checkpoints;
  OperationsRules rules;
  std::string source;  ///< file the operations came from, named in error messages ("" = none)
};

}  // namespace coursewarden
