// coursewarden: the cleaned elevation profile, its totals and its climbs (pure computation).
#pragma once

#include <string>
#include <vector>

#include "coursewarden/geometry.hpp"

namespace coursewarden {

/// A stretch of the course where raw heights were replaced by interpolation.
struct Repair {
  double start_m = 0.0;
  double end_m = 0.0;
  std::string reason;  ///< "nodata gap", "implausible gradient (bridge or tunnel?)"
  double worst_grade_pct = 0.0;  ///< steepest raw step inside, for artefacts
};

struct ProfileOptions {
  double max_plausible_grade_pct = 40.0;  ///< raw steps steeper than this are DEM artefacts
  double repair_join_m = 400.0;  ///< artefact steps closer than this are repaired as one stretch
  double max_gap_m = 1000.0;     ///< longest nodata stretch bridged by interpolation
  double min_coverage_pct = 50.0;  ///< below this share on valid cells, the DEM is refused
  /// Gaussian smoothing sigma. NaN: automatic, max(2 x spacing, DEM pixel size).
  double smoothing_sigma_m = kNoValue;
};

struct SustainedGrade {
  double window_m = 0.0;
  double climb_pct = 0.0;     ///< steepest mean gradient uphill over the window
  double climb_at_m = 0.0;    ///< where that window starts
  double descent_pct = 0.0;   ///< steepest mean gradient downhill (negative)
  double descent_at_m = 0.0;
};

struct ProfileTotals {
  double length_m = 0.0;
  double ascent_m = 0.0;
  double descent_m = 0.0;
  double min_elevation_m = 0.0;
  double max_elevation_m = 0.0;
  double max_elevation_at_m = 0.0;
  std::vector<SustainedGrade> sustained;  ///< windows 100 m, 500 m, 1000 m
};

struct Profile {
  std::vector<double> distance_m;
  std::vector<double> raw_elevation_m;  ///< as sampled (NaN where no data)
  std::vector<double> elevation_m;      ///< repaired and smoothed
  std::vector<double> grade;            ///< dElevation/dDistance (fraction; x100 for %)
  std::vector<Repair> repairs;
  double coverage_pct = 100.0;
  double smoothing_sigma_m = 0.0;
  ProfileTotals totals;
};

/// Builds the profile from raw heights at the stations. `resolution_m` is the source's ground
/// resolution (DEM pixel size) and sets the automatic smoothing width. `source` names the DEM in
/// errors. Throws Error when coverage is below the minimum or a gap is too long to bridge.
Profile build_profile(const std::vector<Station>& stations, const std::vector<double>& raw_m,
                      double resolution_m, const ProfileOptions& options,
                      const std::string& source);

/// Gaussian smoothing of a uniformly spaced series with odd (point) reflection at the ends, so a
/// straight line is reproduced exactly. sigma_m <= 0 returns the input.
std::vector<double> smooth_gaussian(const std::vector<double>& values, double spacing_m,
                                    double sigma_m);

/// Steepest mean gradient over `window_m` up and down.
SustainedGrade steepest_over(const std::vector<double>& distance_m,
                             const std::vector<double>& elevation_m, double window_m);

// ---- climbs

struct CategoryScale {
  // Score = (mean gradient %)^2 x length (km). Lower bounds of each category, easiest first.
  double cat4_min = 35.0;
  double cat3_min = 80.0;
  double cat2_min = 180.0;
  double cat1_min = 300.0;
  double hc_min = 600.0;
};

struct ClimbOptions {
  double hysteresis_m = 10.0;  ///< a dip shallower than this does not end a climb
  double min_gain_m = 20.0;
  double min_length_m = 300.0;
  double min_mean_grade_pct = 2.0;
  CategoryScale scale;
};

struct Climb {
  double start_m = 0.0;
  double end_m = 0.0;
  double gain_m = 0.0;  ///< height at top minus height at foot
  double mean_grade_pct = 0.0;
  double max_grade_100m_pct = 0.0;
  double score = 0.0;
  std::string category;  ///< "4", "3", "2", "1", "HC", or "" when below category 4
  double length_m() const { return end_m - start_m; }
};

std::string climb_category(double score, const CategoryScale& scale);
std::vector<Climb> find_climbs(const std::vector<double>& distance_m,
                               const std::vector<double>& elevation_m, const ClimbOptions& options);

}  // namespace coursewarden
