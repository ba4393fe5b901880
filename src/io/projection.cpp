// LocalProjection: a PROJ transformation from WGS84 lon/lat to a metric plane.
#include <proj.h>

#include <cmath>
#include <string>

#include "coursewarden/error.hpp"
#include "coursewarden/geometry.hpp"
#include "util/text.hpp"

namespace coursewarden {

struct LocalProjection::Impl {
  PJ_CONTEXT* ctx = nullptr;
  PJ* pj = nullptr;
  std::string description;
  ~Impl() {
    if (pj) proj_destroy(pj);
    if (ctx) proj_context_destroy(ctx);
  }
};

namespace {

std::unique_ptr<LocalProjection::Impl> make(const std::string& target, const std::string& label) {
  auto impl = std::make_unique<LocalProjection::Impl>();
  impl->ctx = proj_context_create();
  proj_log_level(impl->ctx, PJ_LOG_NONE);
  PJ* raw = proj_create_crs_to_crs(impl->ctx, "EPSG:4326", target.c_str(), nullptr);
  if (!raw) fail("", "projection '" + label + "'", "PROJ cannot build it; name a projected CRS such as EPSG:32632");
  // Axis order lon, lat / easting, northing whatever the CRS definitions say.
  impl->pj = proj_normalize_for_visualization(impl->ctx, raw);
  proj_destroy(raw);
  if (!impl->pj) fail("", "projection '" + label + "'", "PROJ cannot normalise its axis order");
  impl->description = label;
  return impl;
}

}  // namespace

LocalProjection::LocalProjection(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
LocalProjection::LocalProjection(LocalProjection&&) noexcept = default;
LocalProjection& LocalProjection::operator=(LocalProjection&&) noexcept = default;
LocalProjection::~LocalProjection() = default;

LocalProjection LocalProjection::centred_on(double lon0_deg, double lat0_deg) {
  const std::string def = "+proj=tmerc +lat_0=" + fmt_fixed(lat0_deg, 8) + " +lon_0=" +
                          fmt_fixed(lon0_deg, 8) +
                          " +k=1 +x_0=0 +y_0=0 +ellps=WGS84 +units=m +type=crs";
  return LocalProjection(make(def, "transverse Mercator centred on " + fmt_fixed(lat0_deg, 5) +
                                       ", " + fmt_fixed(lon0_deg, 5) + " (WGS84)"));
}

LocalProjection LocalProjection::from_user_crs(const std::string& crs) {
  PJ_CONTEXT* ctx = proj_context_create();
  proj_log_level(ctx, PJ_LOG_NONE);
  PJ* obj = proj_create(ctx, crs.c_str());
  bool projected = obj && proj_get_type(obj) == PJ_TYPE_PROJECTED_CRS;
  if (obj) proj_destroy(obj);
  proj_context_destroy(ctx);
  if (!projected) {
    fail("", "--crs " + crs,
         "not a projected CRS PROJ knows; give a metric projected CRS such as EPSG:32632");
  }
  return LocalProjection(make(crs, crs));
}

void LocalProjection::forward(double lon_deg, double lat_deg, double& x_m, double& y_m) const {
  PJ_COORD c = proj_coord(lon_deg, lat_deg, 0, 0);
  c = proj_trans(impl_->pj, PJ_FWD, c);
  x_m = c.xy.x;
  y_m = c.xy.y;
}

void LocalProjection::inverse(double x_m, double y_m, double& lon_deg, double& lat_deg) const {
  PJ_COORD c = proj_coord(x_m, y_m, 0, 0);
  c = proj_trans(impl_->pj, PJ_INV, c);
  lon_deg = c.lp.lam;
  lat_deg = c.lp.phi;
}

const std::string& LocalProjection::description() const { return impl_->description; }

}  // namespace coursewarden
