#include "coursewarden/operations.hpp"

namespace coursewarden {

Operations plan_operations(const CheckResult& result) {
  Operations o;
  o.schedule = make_schedule(result, result.ops);
  o.marshal_plan = make_marshal_plan(result, result.ops, o.schedule);
  o.grading = grade_course(result, result.ops, o.schedule);
  return o;
}

}  // namespace coursewarden
