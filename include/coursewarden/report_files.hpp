// coursewarden: the folder of outputs a check writes (`check --out DIR`).
#pragma once

#include <string>
#include <vector>

#include "coursewarden/check.hpp"
#include "coursewarden/report.hpp"

namespace coursewarden {

/// Names of every file write_check_folder may write, in writing order. An existing folder is
/// never wiped: only these files are replaced.
const std::vector<std::string>& check_folder_files();

/// Builds every output in memory first, then writes each into `dir` (created if needed) through
/// a temporary file and a rename. Returns the names written, in order. Throws Error naming the
/// folder when it cannot be created or written. The report is dated `info.check_date`.
std::vector<std::string> write_check_folder(const CheckResult& result, const std::string& dir,
                                            const ReportInfo& info);

/// Same, dated today (UTC, from the system clock).
std::vector<std::string> write_check_folder(const CheckResult& result, const std::string& dir);

}  // namespace coursewarden
