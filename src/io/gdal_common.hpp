// Shared GDAL set-up for the I/O adapters (internal, not installed).
#pragma once

#include <string>

namespace coursewarden {

/// Registers GDAL drivers once (thread-safe).
void gdal_init();

/// While alive, GDAL's error messages are captured instead of printed to stderr.
class GdalQuiet {
public:
  GdalQuiet();
  ~GdalQuiet();
  GdalQuiet(const GdalQuiet&) = delete;
  GdalQuiet& operator=(const GdalQuiet&) = delete;
  /// The last message GDAL reported on this thread, or "no detail from GDAL".
  std::string last_message() const;
};

}  // namespace coursewarden
