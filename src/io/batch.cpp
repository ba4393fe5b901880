// Batches of checks on several threads, and the batch table.
#include "coursewarden/batch.hpp"

#include <algorithm>
#include <atomic>
#include <cctype>
#include <exception>
#include <numeric>
#include <sstream>
#include <thread>

#include "coursewarden/compare.hpp"
#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {

std::vector<BatchOutcome> run_batch(const std::vector<BatchItem>& items, unsigned jobs) {
  std::vector<BatchOutcome> outcomes(items.size());
  if (jobs == 0) jobs = std::max(1u, std::thread::hardware_concurrency());
  jobs = std::min<unsigned>(jobs, static_cast<unsigned>(std::max<std::size_t>(items.size(), 1)));
  std::atomic<std::size_t> next{0};
  auto worker = [&] {
    for (std::size_t i = next++; i < items.size(); i = next++) {
      BatchOutcome& o = outcomes[i];  // each thread writes only its own outcomes
      o.label = items[i].label;
      o.slug = items[i].slug;
      try {
        o.result = run_check(items[i].options);
      } catch (const Error& e) {
        o.error = e.what();
      } catch (const std::exception& e) {
        o.error = std::string("unexpected failure: ") + e.what();
      }
    }
  };
  std::vector<std::thread> threads;
  for (unsigned t = 1; t < jobs; ++t) threads.emplace_back(worker);
  worker();
  for (auto& t : threads) t.join();
  return outcomes;
}

double difficulty_score(const CheckResult& r) {
  double score = 0.0;
  for (const auto& c : r.analysis.climbs) score += c.score;
  const double km = r.analysis.profile.totals.length_m / 1000.0;
  return score + (km > 0 ? r.analysis.profile.totals.ascent_m / km : 0.0);
}

namespace {

struct Ranked {
  const BatchOutcome* outcome;
  double hazard = 0.0;
  double difficulty = 0.0;
};

std::vector<Ranked> ranked(const std::vector<BatchOutcome>& outcomes) {
  std::vector<Ranked> out;
  for (const auto& o : outcomes) {
    Ranked r{&o};
    if (o.result) {
      r.hazard = hazard_score(count_by_severity(o.result->hazards));
      r.difficulty = difficulty_score(*o.result);
    }
    out.push_back(r);
  }
  std::stable_sort(out.begin(), out.end(), [](const Ranked& a, const Ranked& b) {
    if (a.outcome->result.has_value() != b.outcome->result.has_value()) return a.outcome->result.has_value();
    if (a.hazard != b.hazard) return a.hazard > b.hazard;
    return a.difficulty > b.difficulty;
  });
  return out;
}


double slowest_time_s(const CheckResult& r) {
  double t = 0.0;
  for (const auto& s : r.speeds) t = std::max(t, s.total_time_s);
  return t;
}

}  // namespace

std::string batch_csv(const std::vector<BatchOutcome>& outcomes) {
  std::string out =
      "rank,course,length_km,ascent_m,categorised_climbs,critical,serious,caution,note,hazard_score,"
      "difficulty_score,slowest_class_h,error\n";
  int rank = 1;
  for (const Ranked& r : ranked(outcomes)) {
    const BatchOutcome& o = *r.outcome;
    if (!o.result) {
      out += "," + csv_field(o.label) + ",,,,,,,,,,," + csv_field(o.error) + "\n";
      continue;
    }
    const CheckResult& c = *o.result;
    const auto n = count_by_severity(c.hazards);
    const auto cats = std::count_if(c.analysis.climbs.begin(), c.analysis.climbs.end(),
                                    [](const Climb& k) { return !k.category.empty(); });
    out += std::to_string(rank++) + "," + csv_field(o.label) + "," +
           fmt_fixed(c.analysis.profile.totals.length_m / 1000.0, 2) + "," +
           fmt_fixed(c.analysis.profile.totals.ascent_m, 0) + "," + std::to_string(cats) + "," +
           std::to_string(n[3]) + "," + std::to_string(n[2]) + "," + std::to_string(n[1]) + "," +
           std::to_string(n[0]) + "," + fmt_fixed(r.hazard, 0) + "," + fmt_fixed(r.difficulty, 0) + "," +
           fmt_fixed(slowest_time_s(c) / 3600.0, 2) + ",\n";
  }
  return out;
}

std::string batch_text(const std::vector<BatchOutcome>& outcomes) {
  std::ostringstream o;
  auto pad = [](std::string s, std::size_t w, bool right) {
    if (s.size() > w) s = s.substr(0, w - 1) + "~";
    return right ? std::string(w - s.size(), ' ') + s : s + std::string(w - s.size(), ' ');
  };
  o << "Batch: " << outcomes.size() << " checks, ranked by hazards then difficulty (most demanding first)\n";
  o << "rank  course                            km  ascent m  crit  ser  caut  note  hazard  difficulty\n";
  int rank = 1;
  for (const Ranked& r : ranked(outcomes)) {
    const BatchOutcome& b = *r.outcome;
    if (!b.result) {
      o << "   -  " << pad(b.label, 30, false) << "  failed: see above\n";
      continue;
    }
    const CheckResult& c = *b.result;
    const auto n = count_by_severity(c.hazards);
    o << pad(std::to_string(rank++), 4, true) << "  " << pad(b.label, 30, false)
      << pad(fmt_fixed(c.analysis.profile.totals.length_m / 1000.0, 1), 6, true)
      << pad(fmt_fixed(c.analysis.profile.totals.ascent_m, 0), 10, true) << pad(std::to_string(n[3]), 6, true)
      << pad(std::to_string(n[2]), 5, true) << pad(std::to_string(n[1]), 6, true) << pad(std::to_string(n[0]), 6, true)
      << pad(fmt_fixed(r.hazard, 0), 8, true) << pad(fmt_fixed(r.difficulty, 0), 12, true) << "\n";
  }
  return o.str();
}

std::string slugify(const std::string& label) {
  std::string s;
  for (unsigned char ch : label) {
    if (std::isalnum(ch)) {
      s += static_cast<char>(std::tolower(ch));
    } else if (!s.empty() && s.back() != '-') {
      s += '-';
    }
  }
  while (!s.empty() && s.back() == '-') s.pop_back();
  return s.empty() ? "course" : s;
}

}  // namespace coursewarden
