// Validation and cleaning of the course line as read from the file.
#include <GeographicLib/Geodesic.hpp>

#include <algorithm>
#include <cmath>
#include <string>

#include "coursewarden/course.hpp"
#include "coursewarden/error.hpp"
#include "util/text.hpp"

namespace coursewarden {
namespace {

double geodesic_step_m(const CourseVertex& a, const CourseVertex& b) {
  double s12 = 0.0;
  GeographicLib::Geodesic::WGS84().Inverse(a.lat_deg, a.lon_deg, b.lat_deg, b.lon_deg, s12);
  return s12;
}

std::string vertex_place(std::size_t index) { return "point " + std::to_string(index + 1); }

void validate(const RawCourse& course) {
  const auto& v = course.vertices;
  for (std::size_t i = 0; i < v.size(); ++i) {
    if (!std::isfinite(v[i].lon_deg) || !std::isfinite(v[i].lat_deg)) {
      fail(course.source_path, vertex_place(i),
           "coordinate is not a number; fix or remove this point");
    }
    if (std::abs(v[i].lat_deg) > 90.0 || std::abs(v[i].lon_deg) > 180.0) {
      fail(course.source_path, vertex_place(i),
           "coordinate out of range (lat " + fmt_fixed(v[i].lat_deg, 6) + ", lon " +
               fmt_fixed(v[i].lon_deg, 6) +
               "); the file must hold WGS84 longitude/latitude in degrees");
    }
    if (i > 0 && std::abs(v[i].lon_deg - v[i - 1].lon_deg) > 180.0) {
      fail(course.source_path, vertex_place(i),
           "the course crosses the antimeridian (180 deg longitude), which is not supported; "
           "split the course there");
    }
  }
}

}  // namespace

double geodesic_length_m(const std::vector<CourseVertex>& vertices) {
  double total = 0.0;
  for (std::size_t i = 1; i < vertices.size(); ++i) total += geodesic_step_m(vertices[i - 1], vertices[i]);
  return total;
}

CleanReport clean_course(RawCourse& course, const CleanOptions& options) {
  CleanReport report;
  if (course.vertices.size() < 2) {
    fail(course.source_path, course.name.empty() ? "" : "track '" + course.name + "'",
         "the course has " + std::to_string(course.vertices.size()) +
             " point(s); a course needs at least two");
  }
  validate(course);

  // 1. Drop duplicate and zero-length steps (keep the first of a run of equal points).
  std::vector<CourseVertex> kept;
  std::vector<std::size_t> kept_index;
  kept.reserve(course.vertices.size());
  for (std::size_t i = 0; i < course.vertices.size(); ++i) {
    const auto& p = course.vertices[i];
    if (!kept.empty() && geodesic_step_m(kept.back(), p) < options.min_step_m) {
      ++report.duplicates_dropped;
      continue;
    }
    kept.push_back(p);
    kept_index.push_back(i);
  }
  if (kept.size() < 2) {
    fail(course.source_path, "", "all points of the course are at the same place; it has no length");
  }

  // 2. GPS spikes: a vertex far off the line through its neighbours whose two legs are much
  //    longer than the direct step between the neighbours (it goes out and comes back), and much
  //    longer than the track's typical spacing (so a sparse route's hairpin apex is kept).
  std::vector<double> steps;
  for (std::size_t i = 1; i < kept.size(); ++i) steps.push_back(geodesic_step_m(kept[i - 1], kept[i]));
  std::vector<double> sorted = steps;
  std::nth_element(sorted.begin(), sorted.begin() + sorted.size() / 2, sorted.end());
  const double typical_step_m = sorted[sorted.size() / 2];

  std::vector<CourseVertex> out;
  out.reserve(kept.size());
  out.push_back(kept.front());
  for (std::size_t i = 1; i + 1 < kept.size(); ++i) {
    const CourseVertex& a = out.back();
    const CourseVertex& b = kept[i];
    const CourseVertex& c = kept[i + 1];
    const double ab = geodesic_step_m(a, b);
    const double bc = geodesic_step_m(b, c);
    const double ac = geodesic_step_m(a, c);
    const double shorter_leg = std::min(ab, bc);
    // Offset of b from the line a-c: height of triangle by Heron's formula (metres, planar is
    // adequate at these distances).
    const double s = 0.5 * (ab + bc + ac);
    const double area = std::sqrt(std::max(0.0, s * (s - ab) * (s - bc) * (s - ac)));
    const double offset_m = ac > 1e-6 ? 2.0 * area / ac : shorter_leg;
    const bool returns = shorter_leg > options.spike_return_ratio * std::max(ac, 1e-6);
    const bool far = offset_m > options.spike_min_offset_m;
    const bool unusual = shorter_leg > options.spike_spacing_ratio * typical_step_m;
    if (returns && far && unusual) {
      if (std::max(ab, bc) <= options.spike_max_leg_m) {
        report.spikes.push_back({kept_index[i], b.lon_deg, b.lat_deg, offset_m});
        continue;
      }
      report.suspect_spikes.push_back({kept_index[i], b.lon_deg, b.lat_deg, offset_m});
    }
    out.push_back(b);
  }
  out.push_back(kept.back());

  if (report.duplicates_dropped > 0) {
    course.notes.push_back("dropped " + std::to_string(report.duplicates_dropped) +
                           " duplicate or zero-length step(s)");
  }
  for (const auto& sp : report.spikes) {
    course.notes.push_back("removed a GPS spike at " + vertex_place(sp.input_index) + " (" +
                           fmt_fixed(sp.offset_m, 0) + " m off the line and back)");
  }
  for (const auto& sp : report.suspect_spikes) {
    course.notes.push_back("kept " + vertex_place(sp.input_index) + ", which goes " + fmt_fixed(sp.offset_m, 0) +
                           " m off the line and back on its own: a drawn out-and-back or a GPS jump; check it");
  }
  course.vertices = std::move(out);
  return report;
}

}  // namespace coursewarden
