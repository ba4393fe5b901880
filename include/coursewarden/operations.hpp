// coursewarden: the event operations of a check in one call (schedule, marshal plan, grading).
#pragma once

#include "coursewarden/check.hpp"
#include "coursewarden/grading.hpp"
#include "coursewarden/marshal_plan.hpp"
#include "coursewarden/schedule.hpp"

namespace coursewarden {

struct Operations {
  Schedule schedule;
  MarshalPlan marshal_plan;
  Grading grading;
};

/// Schedule, marshal plan and grading from a check and its event operations (result.ops).
/// Throws Error naming the event file for inconsistent waves or checkpoints.
Operations plan_operations(const CheckResult& result);

}  // namespace coursewarden
