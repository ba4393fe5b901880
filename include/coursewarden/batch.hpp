// coursewarden: running many checks (courses, event files, weather scenarios) on several cores.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "coursewarden/check.hpp"

namespace coursewarden {

/// One check to run in a batch.
struct BatchItem {
  std::string label;  ///< for tables: "ronde.toml (wet)"
  std::string slug;   ///< for folder names: "ronde-wet"
  CheckOptions options;
};

/// What became of one item: a result, or the one-line error that stopped it.
struct BatchOutcome {
  std::string label;
  std::string slug;
  std::optional<CheckResult> result;
  std::string error;
};

/// Runs every item, `jobs` at a time (0 = one per core), each on its own thread with its own
/// files and library handles: a check keeps no shared mutable state. An item's error is kept in
/// its outcome and does not stop the others. Outcomes are in the items' order.
std::vector<BatchOutcome> run_batch(const std::vector<BatchItem>& items, unsigned jobs);

/// Difficulty of a checked course for ranking: the sum of its climbs' scores
/// ((mean gradient %)^2 x length km) plus ascent per km.
double difficulty_score(const CheckResult& result);

/// The batch table as CSV: one row per item, ranked by hazard score, then difficulty (most
/// demanding first); failed items last with their error.
std::string batch_csv(const std::vector<BatchOutcome>& outcomes);

/// The same table for the terminal (<= 100 columns).
std::string batch_text(const std::vector<BatchOutcome>& outcomes);

/// A file-name-safe slug of a label: lower case letters, digits and '-'.
std::string slugify(const std::string& label);

}  // namespace coursewarden
