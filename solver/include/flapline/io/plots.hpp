#pragma once
/// \file
/// Figures rendered by gnuplot (Debian's gnuplot-nox): a plot is described as data, written with a
/// generated script to a private temporary folder, rendered to PNG and SVG, and returned as file
/// contents so that OutputFolder can write them with the other results (all or nothing).

#include <map>
#include <string>
#include <vector>

namespace flapline::io {

/// True when a `gnuplot` that can write PNG (cairo) and SVG is on the PATH (checked once).
bool gnuplot_available();

/// One curve or set of points.
struct Series {
  std::string title;
  std::vector<double> x, y;
  /// gnuplot style: "lines", "linespoints", "points", or "vectors" (then x, y hold the start
  /// points and dx, dy the arrows).
  std::string style = "lines";
  std::vector<double> dx, dy;
  int line_type = 0;  ///< 0: next colour; k > 0: gnuplot line type k
  bool dashed = false;
  bool second_axis = false;  ///< plot against the right-hand y axis
};

/// Values over a rectangular grid, drawn as a colour map (pm3d): z[i][j] at (x[i], y[j]).
struct ColourMap {
  std::vector<double> x, y;
  std::vector<std::vector<double>> z;
  std::string zlabel;  ///< with unit
  /// Optional tick labels at x[i] / y[j].
  std::vector<std::string> xtics, ytics;
  /// Draw each value as a cell centred on its point (a matrix on integer x, y), not as a
  /// surface through the points.
  bool cells = false;
};

/// One figure.
struct Plot {
  std::string title;
  std::string xlabel, ylabel, y2label;  ///< with units
  std::string note;                     ///< a line printed under the title (e.g. conventions)
  std::vector<Series> series;
  bool log_x = false;
  bool equal_axes = false;  ///< same scale on x and y (planform, stroke diagrams)
  std::string key = "top right";
};

/// Render to "<stem>.png" and "<stem>.svg"; returns {file name: content}. Throws
/// std::runtime_error with gnuplot's message when it fails.
std::map<std::string, std::string> render(const Plot& plot, const std::string& stem);

/// The same for a colour map (the plot's series are drawn as points on top of it).
std::map<std::string, std::string> render(const Plot& plot, const ColourMap& map,
                                          const std::string& stem);

}  // namespace flapline::io
