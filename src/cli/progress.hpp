// A progress line on stderr for long runs: shown only on a terminal, and only once a run has
// taken more than about a second (large DEM mosaics, many courses).
#pragma once

#include <chrono>
#include <functional>
#include <mutex>
#include <ostream>
#include <string>

namespace coursewarden::cli {

class Progress {
public:
  using Clock = std::function<double()>;  ///< seconds since some fixed moment

  /// `enabled` false makes every call a no-op (not a terminal). `clock` is for tests.
  Progress(std::ostream& err, bool enabled, Clock clock = {});
  ~Progress();
  Progress(const Progress&) = delete;
  Progress& operator=(const Progress&) = delete;

  /// Reports the step now under way; thread-safe.
  void step(const std::string& what);

  /// True when stderr is a terminal and `err` is std::cerr.
  static bool for_terminal(const std::ostream& err);

private:
  std::ostream& err_;
  bool enabled_;
  Clock clock_;
  double start_s_ = 0.0;
  bool shown_ = false;
  std::size_t last_width_ = 0;
  std::mutex mutex_;
};

}  // namespace coursewarden::cli
