#include "cli/progress.hpp"

#include <unistd.h>

#include <iostream>

#include "util/text.hpp"

namespace coursewarden::cli {

Progress::Progress(std::ostream& err, bool enabled, Clock clock) : err_(err), enabled_(enabled), clock_(std::move(clock)) {
  if (!clock_) {
    clock_ = [] {
      using namespace std::chrono;
      return duration<double>(steady_clock::now().time_since_epoch()).count();
    };
  }
  start_s_ = clock_();
}

Progress::~Progress() {
  if (enabled_ && shown_) err_ << "\r" << std::string(last_width_, ' ') << "\r" << std::flush;
}

void Progress::step(const std::string& what) {
  if (!enabled_) return;
  std::lock_guard<std::mutex> lock(mutex_);
  const double elapsed = clock_() - start_s_;
  if (elapsed < 1.0) return;
  std::string line = "coursewarden: " + what + " (" + fmt_fixed(elapsed, 0) + " s)";
  if (line.size() > 99) line = line.substr(0, 96) + "...";
  const std::size_t width = line.size();
  if (width < last_width_) line += std::string(last_width_ - width, ' ');
  err_ << "\r" << line << std::flush;
  last_width_ = std::max(width, last_width_);
  shown_ = true;
}

bool Progress::for_terminal(const std::ostream& err) { return &err == &std::cerr && isatty(STDERR_FILENO) == 1; }

}  // namespace coursewarden::cli
