// Small, dependency-free SVG figures for the HTML report: line charts, bar charts, scatter
// charts, histograms and the (r, z) zone map. Each function returns one complete <svg> element
// with axes, units and a legend. Axes end on round ticks that cover every data point; tick labels
// are thinned until they do not touch; the legend goes to a corner free of data, or below the
// plot when no corner is free.
#pragma once

#include <cmath>
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
  std::string dash_pattern{};  //!< SVG stroke-dasharray; overrides `dashed` when set
  double stroke_width = 1.8;
};

struct Marker {
  bool vertical = true;  //!< a line x = value (else y = value)
  double value = 0.0;
  std::string label;
};

std::string line_chart(const std::string& title, const std::string& x_label, const std::string& y_label,
                       const std::vector<Series>& series, const std::vector<Marker>& markers = {}, int width = 420,
                       int height = 420, double y_include_lo = std::nan(""), double y_include_hi = std::nan(""));

//! Counts between bin edges (edges.size() == counts.size() + 1), on a log x axis when `log_x`.
//! `underflow` values below edges.front() are drawn as one grey bar left of the first bin.
std::string histogram_chart(const std::string& title, const std::string& x_label, const std::vector<double>& edges,
                            const std::vector<double>& counts, bool log_x, double underflow = 0.0,
                            int width = 520, int height = 300);

//! Grouped bars: values[s][c] for series s and category c; optional whiskers low[s][c]..high[s][c].
std::string bar_chart(const std::string& title, const std::string& y_label, const std::vector<std::string>& categories,
                      const std::vector<std::string>& series_names, const std::vector<std::vector<double>>& values,
                      int width = 520, int height = 300, const std::vector<std::vector<double>>& low = {},
                      const std::vector<std::vector<double>>& high = {});

struct ScatterPoint {
  double x = 0.0, y = 0.0;
  int group = 0;  //!< index into group_names / colours
};

//! The last group's points are drawn larger (e.g. "fitted" over "before") unless `emphasise_last` is false.
std::string scatter_chart(const std::string& title, const std::string& x_label, const std::string& y_label,
                          const std::vector<ScatterPoint>& points, const std::vector<std::string>& group_names,
                          const std::vector<std::string>& group_colors, int width = 520, int height = 420,
                          bool emphasise_last = true);

//! Impeller and sparger outlines drawn over a zone map: rectangles in (r, z) [m].
struct Outline {
  double r0, r1, z0, z1;
  std::string label;
};

//! The (r, z) half-section coloured by a zone field, drawn to scale, with a colour bar labelled
//! with the field's actual minimum and maximum; a narrow span is said in words ("range 3 % of
//! the maximum"), and a field uniform to 0.5 % is drawn in one colour. `marker` draws a line on
//! the colour bar (e.g. critical DO).
std::string zone_map(const ZoneNetwork& net, const std::vector<double>& field, const std::string& title,
                     const std::string& unit, const std::vector<Outline>& outlines, double marker = -1.0,
                     int height = 460);

//! Escapes &, <, > and quotes for XML text.
std::string escape(const std::string& text);

}  // namespace oxystrat::svg
