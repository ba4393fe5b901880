// The command-line front end as a function tests can call in-process.
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

namespace coursewarden::cli {

/// Runs one command line (args[0] is the program name). Returns the exit code:
/// 0 success, 1 bad input or failure (one line on `err`), 2 usage error.
int run(const std::vector<std::string>& args, std::ostream& out, std::ostream& err);

}  // namespace coursewarden::cli
