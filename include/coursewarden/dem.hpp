// coursewarden: reading a digital elevation model (any raster GDAL opens) and draping the course.
//
// GDAL and PROJ stay behind the pimpl; this header only uses our own types.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "coursewarden/geometry.hpp"

namespace coursewarden {

struct DemOptions {
  std::string assume_crs;       ///< CRS to use when the raster has none ("EPSG:nnnn"); else refused
  int band = 1;                 ///< raster band holding heights
  std::size_t tile_size = 256;  ///< edge of the cached read tiles, pixels
};

struct DemInfo {
  std::string path;
  std::string crs_name;
  bool geographic = false;        ///< CRS in degrees (pixel size converted to metres for display)
  std::size_t width_px = 0;
  std::size_t height_px = 0;
  double pixel_size_m = 0.0;      ///< approximate ground size of one pixel (larger axis), metres
  double west_deg = 0.0, south_deg = 0.0, east_deg = 0.0, north_deg = 0.0;  ///< lon/lat extent
  std::string vertical_unit;      ///< as declared in the raster ("metre" if none)
  double to_metres = 1.0;         ///< factor applied to raw values (feet DEMs: 0.3048)
  bool has_nodata = false;
  double nodata = 0.0;
};

/// An open DEM. Reads go through a cache of square tiles (never one pixel at a time).
/// Not thread-safe: use one Dem per thread.
class Dem {
public:
  static Dem open(const std::string& path, const DemOptions& options = {});
  Dem(Dem&&) noexcept;
  Dem& operator=(Dem&&) noexcept;
  ~Dem();

  const DemInfo& info() const;

  /// Height in metres at a point given in the DEM's own CRS (x = easting or longitude);
  /// NaN where all four neighbouring pixel centres are nodata or outside the raster.
  double sample_native(double x, double y);

  /// Heights in metres at WGS84 lon/lat points (NaN where no data).
  std::vector<double> sample_lonlat(const std::vector<double>& lon_deg,
                                    const std::vector<double>& lat_deg);

  /// Transforms a WGS84 lon/lat point into the DEM's own CRS (for sample_native).
  void lonlat_to_native(double lon_deg, double lat_deg, double& x, double& y) const;

  /// Number of tiles read so far (for tests and benchmarks).
  std::size_t tiles_read() const;

  struct Impl;  ///< opaque (PROJ/GDAL handles live in src/io)

private:
  explicit Dem(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

}  // namespace coursewarden
