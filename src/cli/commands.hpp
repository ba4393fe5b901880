// The subcommands of the command line.
#pragma once

#include <iosfwd>
#include <string>
#include <vector>

#include "cli/options.hpp"

namespace coursewarden::cli {

int run_profile(ProfileArgs& a, std::ostream& out);

class Progress;

/// `check`: one course or event file, or a batch of them. `subcommand_args` are the arguments
/// after "check", re-parsed for each event file so that command-line options override it.
/// `progress` (may be null) is told each step.
int run_check_command(CheckArgs& parsed, const std::vector<std::string>& subcommand_args, std::ostream& out,
                      std::ostream& err, Progress* progress);

int run_compare_command(CheckArgs& a, const std::string& first, const std::string& other, std::ostream& out);

int run_init_command(const std::string& course, const std::string& dem, const std::string& output,
                     const std::string& name, bool force, std::ostream& out);

}  // namespace coursewarden::cli
