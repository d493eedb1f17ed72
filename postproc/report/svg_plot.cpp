#include "postproc/report/svg_plot.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>

namespace oxystrat::svg {
namespace {

constexpr int kLeft = 62, kRight = 16, kTop = 34, kBottom = 48;

struct Range {
  double lo = std::numeric_limits<double>::infinity();
  double hi = -std::numeric_limits<double>::infinity();
  void add(double v) {
    if (std::isfinite(v)) lo = std::min(lo, v), hi = std::max(hi, v);
  }
  void finish() {
    if (!std::isfinite(lo)) lo = 0.0, hi = 1.0;
    if (hi - lo < 1e-12 * std::max(1.0, std::abs(hi))) {
      const double pad = std::max(1e-9, 0.05 * std::abs(hi));
      lo -= pad, hi += pad;
    }
  }
};

// 1-2-5 tick step giving about `target` ticks.
double nice_step(double span, int target) {
  const double raw = span / target;
  const double mag = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    if (m * mag >= raw) return m * mag;
  }
  return 10.0 * mag;
}

std::string tick_label(double v, double step) {
  if (std::abs(v) < 1e-12 * step) v = 0.0;
  const int decimals = std::max(0, static_cast<int>(-std::floor(std::log10(step) + 1e-9)));
  return fmt::format("{:.{}f}", v, decimals);
}

struct Frame {
  int width, height;
  Range x, y;
  double px(double v) const { return kLeft + (v - x.lo) / (x.hi - x.lo) * (width - kLeft - kRight); }
  double py(double v) const { return height - kBottom - (v - y.lo) / (y.hi - y.lo) * (height - kTop - kBottom); }
};

std::string open_svg(int w, int h, const std::string& title) {
  return fmt::format(
      "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{0}\" height=\"{1}\" viewBox=\"0 0 {0} {1}\" "
      "font-family=\"sans-serif\" font-size=\"11\">\n<rect width=\"{0}\" height=\"{1}\" fill=\"white\"/>\n"
      "<text x=\"{2}\" y=\"18\" text-anchor=\"middle\" font-size=\"13\" font-weight=\"bold\">{3}</text>\n",
      w, h, w / 2, escape(title));
}

std::string axes(const Frame& f, const std::string& x_label, const std::string& y_label, bool x_ticks = true) {
  std::string s;
  const double x0 = kLeft, x1 = f.width - kRight, y0 = f.height - kBottom, y1 = kTop;
  s += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"#444\"/>\n", x0, y1,
                   x1 - x0, y0 - y1);
  if (x_ticks) {
    const double step = nice_step(f.x.hi - f.x.lo, 5);
    for (double v = std::ceil(f.x.lo / step) * step; v <= f.x.hi + 1e-9 * step; v += step) {
      s += fmt::format("<line x1=\"{0:.1f}\" y1=\"{1}\" x2=\"{0:.1f}\" y2=\"{2}\" stroke=\"#ddd\"/>"
                       "<text x=\"{0:.1f}\" y=\"{3}\" text-anchor=\"middle\">{4}</text>\n",
                       f.px(v), y0, y1, y0 + 14, tick_label(v, step));
    }
  }
  const double step = nice_step(f.y.hi - f.y.lo, 6);
  for (double v = std::ceil(f.y.lo / step) * step; v <= f.y.hi + 1e-9 * step; v += step) {
    s += fmt::format("<line x1=\"{0}\" y1=\"{1:.1f}\" x2=\"{2}\" y2=\"{1:.1f}\" stroke=\"#ddd\"/>"
                     "<text x=\"{3}\" y=\"{4:.1f}\" text-anchor=\"end\">{5}</text>\n",
                     x0, f.py(v), x1, x0 - 4, f.py(v) + 4, tick_label(v, step));
  }
  s += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>\n", (x0 + x1) / 2, f.height - 12,
                   escape(x_label));
  s += fmt::format("<text transform=\"translate(14,{}) rotate(-90)\" text-anchor=\"middle\">{}</text>\n", (y0 + y1) / 2,
                   escape(y_label));
  return s;
}

std::string legend(int x, int y, const std::vector<std::pair<std::string, std::string>>& items) {
  std::string s;
  for (size_t i = 0; i < items.size(); ++i) {
    s += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"12\" height=\"8\" fill=\"{}\"/><text x=\"{}\" y=\"{}\">{}</text>\n", x,
                     y + 14 * i, items[i].second, x + 16, y + 14 * i + 8, escape(items[i].first));
  }
  return s;
}

// Perceptually ordered blue-to-yellow ramp (our own 5-stop approximation).
std::string ramp(double t) {
  static const double stops[5][3] = {{68, 1, 84}, {59, 82, 139}, {33, 145, 140}, {94, 201, 98}, {253, 231, 37}};
  t = std::clamp(t, 0.0, 1.0) * 4.0;
  const int i = std::min(3, static_cast<int>(t));
  const double f = t - i;
  int c[3];
  for (int k = 0; k < 3; ++k) c[k] = static_cast<int>(std::lround(stops[i][k] + f * (stops[i + 1][k] - stops[i][k])));
  return fmt::format("#{:02x}{:02x}{:02x}", c[0], c[1], c[2]);
}

}  // namespace

std::string escape(const std::string& text) {
  std::string out;
  for (char c : text) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      default: out += c;
    }
  }
  return out;
}

std::string line_chart(const std::string& title, const std::string& x_label, const std::string& y_label,
                       const std::vector<Series>& series, const std::vector<Marker>& markers, int width, int height) {
  Frame f{width, height, {}, {}};
  for (const auto& s : series) {
    for (double v : s.x) f.x.add(v);
    for (double v : s.y) f.y.add(v);
  }
  for (const auto& m : markers) (m.vertical ? f.x : f.y).add(m.value);
  f.x.finish();
  f.y.finish();
  std::string out = open_svg(width, height, title) + axes(f, x_label, y_label);
  for (const auto& s : series) {
    std::string pts;
    for (size_t i = 0; i < s.x.size(); ++i) {
      if (std::isfinite(s.x[i]) && std::isfinite(s.y[i])) pts += fmt::format("{:.1f},{:.1f} ", f.px(s.x[i]), f.py(s.y[i]));
    }
    out += fmt::format("<polyline fill=\"none\" stroke=\"{}\" stroke-width=\"1.8\"{} points=\"{}\"/>\n", s.color,
                       s.dashed ? " stroke-dasharray=\"5,3\"" : "", pts);
    if (s.markers) {
      for (size_t i = 0; i < s.x.size(); ++i) {
        out += fmt::format("<circle cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"2.5\" fill=\"{}\"/>\n", f.px(s.x[i]), f.py(s.y[i]), s.color);
      }
    }
  }
  for (const auto& m : markers) {
    if (m.vertical) {
      out += fmt::format("<line x1=\"{0:.1f}\" y1=\"{1}\" x2=\"{0:.1f}\" y2=\"{2}\" stroke=\"#d62728\" stroke-dasharray=\"3,3\"/>"
                         "<text x=\"{3:.1f}\" y=\"{4}\" fill=\"#d62728\">{5}</text>\n",
                         f.px(m.value), height - kBottom, kTop, f.px(m.value) + 3, kTop + 12, escape(m.label));
    } else {
      out += fmt::format("<line x1=\"{0}\" y1=\"{1:.1f}\" x2=\"{2}\" y2=\"{1:.1f}\" stroke=\"#d62728\" stroke-dasharray=\"3,3\"/>"
                         "<text x=\"{3}\" y=\"{4:.1f}\" fill=\"#d62728\">{5}</text>\n",
                         kLeft, f.py(m.value), width - kRight, kLeft + 4, f.py(m.value) - 3, escape(m.label));
    }
  }
  std::vector<std::pair<std::string, std::string>> items;
  for (const auto& s : series) items.emplace_back(s.name, s.color);
  out += legend(width - kRight - 120, kTop + 6, items);
  return out + "</svg>\n";
}

std::string bar_chart(const std::string& title, const std::string& y_label, const std::vector<std::string>& categories,
                      const std::vector<std::string>& series_names, const std::vector<std::vector<double>>& values,
                      int width, int height, const std::vector<std::vector<double>>& low,
                      const std::vector<std::vector<double>>& high) {
  static const char* colors[] = {"#1f77b4", "#ff7f0e", "#2ca02c", "#9467bd", "#8c564b", "#e377c2"};
  Frame f{width, height, {0.0, 1.0}, {}};
  f.y.add(0.0);
  for (const auto& s : values) {
    for (double v : s) f.y.add(v);
  }
  for (const auto& s : high) {
    for (double v : s) f.y.add(v);
  }
  f.y.finish();
  std::string out = open_svg(width, height, title) + axes(f, "", y_label, false);
  const double plot_w = width - kLeft - kRight;
  const double group_w = plot_w / std::max<size_t>(1, categories.size());
  const double bar_w = 0.8 * group_w / std::max<size_t>(1, values.size());
  for (size_t c = 0; c < categories.size(); ++c) {
    const double gx = kLeft + c * group_w;
    for (size_t s = 0; s < values.size(); ++s) {
      const double v = values[s][c];
      if (!std::isfinite(v)) continue;
      const double y = f.py(v), y0 = f.py(0.0);
      out += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\" fill=\"{}\"><title>{}: {:.4g}</title></rect>\n",
                         gx + 0.1 * group_w + s * bar_w, std::min(y, y0), bar_w, std::abs(y0 - y), colors[s % 6],
                         escape(series_names[s]), v);
      if (s < low.size() && s < high.size() && std::isfinite(low[s][c]) && std::isfinite(high[s][c])) {
        const double x = gx + 0.1 * group_w + (s + 0.5) * bar_w;
        out += fmt::format("<path d=\"M{0:.1f},{1:.1f}V{2:.1f}M{3:.1f},{1:.1f}H{4:.1f}M{3:.1f},{2:.1f}H{4:.1f}\" "
                           "stroke=\"#222\" fill=\"none\"><title>P10 {5:.4g}, P90 {6:.4g}</title></path>\n",
                           x, f.py(low[s][c]), f.py(high[s][c]), x - 4, x + 4, low[s][c], high[s][c]);
      }
    }
    out += fmt::format("<text x=\"{:.1f}\" y=\"{}\" text-anchor=\"middle\">{}</text>\n", gx + group_w / 2,
                       height - kBottom + 14, escape(categories[c]));
  }
  std::vector<std::pair<std::string, std::string>> items;
  for (size_t s = 0; s < series_names.size(); ++s) items.emplace_back(series_names[s], colors[s % 6]);
  out += legend(width - kRight - 150, kTop + 6, items);
  return out + "</svg>\n";
}

std::string scatter_chart(const std::string& title, const std::string& x_label, const std::string& y_label,
                          const std::vector<ScatterPoint>& points, const std::vector<std::string>& group_names,
                          const std::vector<std::string>& group_colors, int width, int height) {
  Frame f{width, height, {}, {}};
  for (const auto& p : points) f.x.add(p.x), f.y.add(p.y);
  f.x.finish();
  f.y.finish();
  std::string out = open_svg(width, height, title) + axes(f, x_label, y_label);
  for (const auto& p : points) {
    if (!std::isfinite(p.x) || !std::isfinite(p.y)) continue;
    out += fmt::format("<circle cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"{}\" fill=\"{}\" stroke=\"#333\" stroke-width=\"0.5\"/>\n",
                       f.px(p.x), f.py(p.y), p.group == static_cast<int>(group_names.size()) - 1 ? 6 : 4,
                       group_colors[p.group]);
  }
  std::vector<std::pair<std::string, std::string>> items;
  for (size_t g = 0; g < group_names.size(); ++g) items.emplace_back(group_names[g], group_colors[g]);
  out += legend(width - kRight - 150, kTop + 6, items);
  return out + "</svg>\n";
}

std::string zone_map(const ZoneNetwork& net, const std::vector<double>& field, const std::string& title,
                     const std::string& unit, const std::vector<Outline>& outlines, double marker, int height) {
  const double big_r = net.shape.radius(), h = net.liquid_height;
  const double plot_h = height - kTop - kBottom;
  const double scale = plot_h / h;
  const int width = static_cast<int>(kLeft + big_r * scale + 110);
  Frame f{width, height, {0.0, big_r}, {0.0, h}};
  Range v;
  for (double x : field) v.add(x);
  v.finish();
  std::string out = open_svg(std::max(width, 220), height, title);
  f.width = static_cast<int>(kLeft + big_r * scale + kRight);
  out += axes(f, "r [m]", "height [m]");
  for (int k = 0; k < net.size(); ++k) {
    const double t = (field[k] - v.lo) / (v.hi - v.lo);
    const double x0 = f.px(net.r0[k]), x1 = f.px(net.r1[k]);
    out += fmt::format("<polygon points=\"{:.1f},{:.1f} {:.1f},{:.1f} {:.1f},{:.1f} {:.1f},{:.1f}\" fill=\"{}\"><title>zone {}: {:.4g} {}</title></polygon>\n",
                       x0, f.py(net.z_floor_inner[k]), x1, f.py(net.z_floor_outer[k]), x1, f.py(net.z1[k]), x0,
                       f.py(net.z1[k]), ramp(t), k, field[k], escape(unit));
  }
  for (const auto& o : outlines) {
    out += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\" fill=\"none\" stroke=\"white\" "
                       "stroke-width=\"1.5\"><title>{}</title></rect>\n",
                       f.px(o.r0), f.py(o.z1), f.px(o.r1) - f.px(o.r0), std::max(1.5, f.py(o.z0) - f.py(o.z1)), escape(o.label));
  }
  // Colour bar
  const double bx = f.width + 14, by = kTop, bh = plot_h;
  for (int i = 0; i < 50; ++i) {
    out += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"14\" height=\"{:.2f}\" fill=\"{}\"/>\n", bx,
                       by + bh * (1.0 - (i + 1) / 50.0), bh / 50.0 + 0.5, ramp((i + 0.5) / 50.0));
  }
  const double step = nice_step(v.hi - v.lo, 5);
  for (double x = std::ceil(v.lo / step) * step; x <= v.hi + 1e-9 * step; x += step) {
    const double y = by + bh * (1.0 - (x - v.lo) / (v.hi - v.lo));
    out += fmt::format("<text x=\"{:.1f}\" y=\"{:.1f}\">{}</text>\n", bx + 18, y + 4, tick_label(x, step));
  }
  out += fmt::format("<text x=\"{:.1f}\" y=\"{}\">{}</text>\n", bx, by - 6, escape(unit));
  if (marker >= v.lo && marker <= v.hi) {
    const double y = by + bh * (1.0 - (marker - v.lo) / (v.hi - v.lo));
    out += fmt::format("<line x1=\"{:.1f}\" y1=\"{:.1f}\" x2=\"{:.1f}\" y2=\"{:.1f}\" stroke=\"#d62728\" stroke-width=\"2\"/>\n",
                       bx - 3, y, bx + 17, y);
  }
  return out + "</svg>\n";
}

}  // namespace oxystrat::svg
