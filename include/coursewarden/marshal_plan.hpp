// coursewarden: the marshal plan — posts at hazards that call for marshals and at every
// junction-type turn, merged when close together, numbered in course order, with shift times
// from the schedule, totals and sectors for a one-page-per-sector briefing (pure computation).
//
// Shift rule by default from the French sport code (Code du sport, arts. A331-37 to A331-40):
// in place 15 minutes before the first rider and released 15 minutes after the closing vehicle.
// Rules and reasoning: docs/operations.md.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/event.hpp"
#include "coursewarden/schedule.hpp"

namespace coursewarden {

/// One place that needs marshals before merging: a hazard or a junction-type turn.
struct PostCandidate {
  double at_m = 0.0;
  int count = 0;  ///< marshals asked for
  int hazard_number = 0;  ///< > 0 for a hazard
  std::ptrdiff_t corner = -1;  ///< index into CheckResult::corners for a turn or a corner hazard
  bool turn = false;           ///< a junction-type turn where riders must be directed
  Severity severity = Severity::none;  ///< hazards: their severity (orders the warnings); turns: none
  std::string warn;  ///< one short line
  std::string turn_shape;  ///< turns: "left 90 deg", used when turns are merged into one line
  double lon_deg = 0.0, lat_deg = 0.0;
};

struct MarshalPost {
  std::string code;  ///< "M01", in course order
  double at_m = 0.0;       ///< the post's place: its member asking for the most marshals
  double first_m = 0.0;    ///< the first member's place along the course
  double last_m = 0.0;     ///< the last member's place
  double spread_m = 0.0;   ///< last_m - first_m
  int count = 0;           ///< marshals on this post
  double lon_deg = 0.0, lat_deg = 0.0;
  double earliest_pass_s = 0.0;  ///< first group at the post's first member
  double closing_s = 0.0;        ///< closing vehicle at the post's last member
  double on_post_s = 0.0;        ///< earliest pass - marshal lead
  double not_before_s = 0.0;     ///< earliest pass - maximum marshal lead
  double off_post_s = 0.0;       ///< closing vehicle + release
  std::string warn;  ///< what to warn riders of, one short line
  std::vector<int> hazards;  ///< numbers of the hazards merged here
  std::vector<std::size_t> turns;  ///< corner indices of the junction-type turns merged here
  std::size_t sector = 0;  ///< index into MarshalPlan::sectors
};

/// A stretch of the course briefed on one page.
struct Sector {
  std::string name;  ///< "Sector 1"
  double from_m = 0.0;
  double to_m = 0.0;
  std::vector<std::size_t> posts;  ///< indices into MarshalPlan::posts
  int marshals = 0;
  double first_on_post_s = 0.0;
  double last_off_post_s = 0.0;
};

struct MarshalPlan {
  std::vector<MarshalPost> posts;
  std::vector<Sector> sectors;  ///< only sectors with posts, in course order
  int marshals_needed = 0;      ///< sum of the posts' counts
  int peak_posts = 0;           ///< most posts staffed at the same time
  int peak_marshals = 0;        ///< most marshals on post at the same time
  double peak_at_s = 0.0;       ///< when peak_marshals is first reached (clock time)
};

/// The candidates in course order: hazards with marshals > 0 and every corner turning through
/// at least the check's junction-type threshold (HazardOptions::sharp_turn_rad).
std::vector<PostCandidate> post_candidates(const CheckResult& result, const EventOps& ops);

/// Merges candidates sorted by at_m into posts: a candidate joins the current post when it
/// lies less than `merge_posts_within_m` after the post's first member, else it opens a new
/// post. A post's count is the largest member count, plus one when its members spread over more
/// than `merged_post_extra_from_m`. Its warning lists the hazards' warnings, most severe first,
/// then the turns in course order ("turn left 90 deg, then right 75 deg: direct riders"; a turn
/// at a corner that is also one of the post's hazards adds only "direct riders"), cut after
/// about 90 characters with "+N more". Times and codes are left for make_marshal_plan.
std::vector<MarshalPost> merge_candidates(const std::vector<PostCandidate>& candidates,
                                          const OperationsRules& rules);

/// Most shifts open at once and the first time that many are open.
struct Peak {
  int value = 0;
  double at_s = 0.0;  ///< NaN when there are no shifts
};

/// Peak number of shifts [on, off) open at once, each weighted by `weights` (1 each when
/// empty), with the first time it is reached. A shift ending when another begins does not
/// overlap it. Throws Error for unequal sizes, non-finite times or a shift ending before it
/// starts.
Peak peak_overlap(const std::vector<double>& on_s, const std::vector<double>& off_s,
                  const std::vector<int>& weights = {});

/// The plan: posts with shift times from the schedule, totals, and sectors of
/// `sector_length_m` from the start (a sector with more than `max_posts_per_sector` posts is
/// split into consecutive pages).
MarshalPlan make_marshal_plan(const CheckResult& result, const EventOps& ops,
                              const Schedule& schedule);

}  // namespace coursewarden
