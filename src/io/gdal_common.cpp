#include "io/gdal_common.hpp"

#include <cpl_error.h>
#include <gdal.h>

#include <mutex>

namespace coursewarden {

void gdal_init() {
  static std::once_flag once;
  std::call_once(once, [] { GDALAllRegister(); });
}

namespace {
thread_local std::string g_last_message;
void CPL_STDCALL capture(CPLErr, CPLErrorNum, const char* message) {
  g_last_message = message ? message : "";
}
}  // namespace

GdalQuiet::GdalQuiet() {
  g_last_message.clear();
  CPLPushErrorHandler(capture);
}
GdalQuiet::~GdalQuiet() { CPLPopErrorHandler(); }
std::string GdalQuiet::last_message() const {
  return g_last_message.empty() ? "no detail from GDAL" : g_last_message;
}

}  // namespace coursewarden
