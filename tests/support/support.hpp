// Test support: temporary folders, synthetic rasters and course files made inside the tests.
#pragma once

#include <filesystem>
#include <functional>
#include <string>
#include <utility>
#include <vector>

namespace cwtest {

/// A fresh temporary folder removed when the object goes out of scope.
class TempDir {
public:
  TempDir();
  ~TempDir();
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;
  const std::filesystem::path& path() const { return path_; }
  std::string file(const std::string& name) const { return (path_ / name).string(); }

private:
  std::filesystem::path path_;
};

struct RasterSpec {
  std::string crs = "EPSG:32631";  ///< "" = write no CRS
  double origin_x = 500000.0;      ///< outer corner of the top-left pixel
  double origin_y = 5100000.0;
  double pixel_m = 30.0;
  int width = 200;
  int height = 200;
  std::string unit;           ///< band unit type ("" = none, "ft" = feet)
  bool has_nodata = false;
  double nodata = -9999.0;
  std::string format = "GTiff";
};

/// Writes a Float32 raster whose pixel (i, j) holds height(x_centre, y_centre).
void write_raster(const std::string& path, const RasterSpec& spec,
                  const std::function<double(double x, double y)>& height);

/// Projects lon/lat to the CRS (and back) with PROJ, for building inputs in the tests.
std::pair<double, double> to_crs(const std::string& crs, double lon, double lat);
std::pair<double, double> from_crs(const std::string& crs, double x, double y);

struct LonLat {
  double lon, lat;
  double ele = 0.0;
  bool has_ele = false;
};

/// Writes a GPX file with one <trk> per inner vector of segments.
void write_gpx(const std::string& path,
               const std::vector<std::pair<std::string, std::vector<std::vector<LonLat>>>>& tracks);

/// Writes a text file as given.
void write_text(const std::string& path, const std::string& text);
std::string read_text(const std::string& path);

/// Points along a straight line in a projected CRS, returned as lon/lat.
std::vector<LonLat> straight_line(const std::string& crs, double x0, double y0, double x1,
                                  double y1, int points);

}  // namespace cwtest
