// Small, dependency-free SVG figures for the HTML report: line charts, bar charts, scatter
// charts and the (r, z) zone map. Each function returns one complete <svg> element with axes,
// units and a legend.
#pragma once

#include <string>
#include <vector>

#include "mesh/zone_network.hpp"

namespace oxystrat::svg {

struct Series {
  std::string name;
  std::vector<double> x, y;
  std::string color = "#1f77b4";
  bool dashed = false;
  bool markers = false;
};

struct Marker {
  bool vertical = true;  //!< a line x = value (else y = value)
  double value = 0.0;
  std::string label;
};

std::string line_chart(const std::string& title, const std::string& x_label, const std::string& y_label,
                       const std::vector<Series>& series, const std::vector<Marker>& markers = {}, int width = 420,
                       int height = 420);

//! Grouped bars: values[s][c] for series s and category c; optional whiskers low[s][c]..high[s][c].
std::string bar_chart(const std::string& title, const std::string& y_label, const std::vector<std::string>& categories,
                      const std::vector<std::string>& series_names, const std::vector<std::vector<double>>& values,
                      int width = 520, int height = 300, const std::vector<std::vector<double>>& low = {},
                      const std::vector<std::vector<double>>& high = {});

struct ScatterPoint {
  double x = 0.0, y = 0.0;
  int group = 0;  //!< index into group_names / colours
};

std::string scatter_chart(const std::string& title, const std::string& x_label, const std::string& y_label,
                          const std::vector<ScatterPoint>& points, const std::vector<std::string>& group_names,
                          const std::vector<std::string>& group_colors, int width = 520, int height = 420);

//! Impeller and sparger outlines drawn over a zone map: rectangles in (r, z) [m].
struct Outline {
  double r0, r1, z0, z1;
  std::string label;
};

//! The (r, z) half-section coloured by a zone field, with a colour bar; `marker` draws a line of
//! the colour bar (e.g. critical DO).
std::string zone_map(const ZoneNetwork& net, const std::vector<double>& field, const std::string& title,
                     const std::string& unit, const std::vector<Outline>& outlines, double marker = -1.0,
                     int height = 460);

//! Escapes &, <, > and quotes for XML text.
std::string escape(const std::string& text);

}  // namespace oxystrat::svg
