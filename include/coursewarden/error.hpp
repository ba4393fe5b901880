// coursewarden: one error type for fatal input and setup problems.
//
// The message is a single line meant for the organiser: it names the file, the place in it
// (line, feature, km) and what to do. The CLI catches Error once and returns a non-zero code.
// Per-point problems that do not stop the analysis are Notes that go into the report instead.
#pragma once

#include <stdexcept>
#include <string>

namespace coursewarden {

class Error : public std::runtime_error {
public:
  explicit Error(const std::string& message) : std::runtime_error(message) {}
};

/// Builds "FILE: WHERE: WHAT" with empty parts left out.
std::string error_text(const std::string& file, const std::string& where, const std::string& what);

/// Throws Error(error_text(file, where, what)).
[[noreturn]] void fail(const std::string& file, const std::string& where, const std::string& what);

}  // namespace coursewarden
