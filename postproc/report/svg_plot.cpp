#include "postproc/report/svg_plot.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>

#include "postproc/report/number_format.hpp"

namespace oxystrat::svg {
namespace {

constexpr int kLeft = 62, kRight = 16, kTop = 34, kBottom = 48;
// Average advance of one character of the 11 px sans-serif text, a little generous so that the
// estimated boxes are never smaller than the drawn ones [px].
constexpr double kCharWidth = 6.6;
constexpr double kLine = 14.0;  // legend line pitch [px]

double text_width(const std::string& s, double font_px = 11.0) {
  size_t n = 0;
  for (unsigned char ch : s) n += (ch & 0xC0) != 0x80 ? 1 : 0;  // UTF-8 code points
  return static_cast<double>(n) * kCharWidth * font_px / 11.0;
}

struct Box {
  double x0, y0, x1, y1;
  bool overlaps(const Box& o) const { return x0 < o.x1 && o.x0 < x1 && y0 < o.y1 && o.y0 < y1; }
  bool inside(const Box& o) const { return x0 >= o.x0 && x1 <= o.x1 && y0 >= o.y0 && y1 <= o.y1; }
};

// 1-2-5 tick step giving about `target` ticks.
double nice_step(double span, int target) {
  const double raw = span / target;
  const double mag = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    if (m * mag >= raw * (1.0 - 1e-9)) return m * mag;
  }
  return 10.0 * mag;
}

// The 1-2-5 step after `step`.
double next_step(double step) {
  const double mag = std::pow(10.0, std::floor(std::log10(step) + 1e-9));
  const double m = step / mag;
  return (m < 1.5 ? 2.0 : m < 3.5 ? 5.0 : 10.0) * mag;
}

struct Range {
  double lo = std::numeric_limits<double>::infinity();
  double hi = -std::numeric_limits<double>::infinity();
  double step = 0.0;  // tick step chosen by snap()
  void add(double v) {
    if (std::isfinite(v)) lo = std::min(lo, v), hi = std::max(hi, v);
  }
  void finish() {
    if (!std::isfinite(lo)) lo = 0.0, hi = 1.0;
    if (hi - lo < 1e-12 * std::max(1.0, std::abs(hi))) {
      // A constant: a band of 5 % around it (of 1 around zero), never a span of round-off.
      const double pad = hi != 0.0 ? 0.05 * std::abs(hi) : 1.0;
      lo -= pad, hi += pad;
    }
  }
  // Widens to whole tick steps, so that the axis ends on labelled ticks covering every value.
  void snap(int target) {
    step = nice_step(hi - lo, target);
    lo = std::floor(lo / step + 1e-9) * step;
    hi = std::ceil(hi / step - 1e-9) * step;
  }
  // Whole decades, for a log axis (values > 0 only).
  void snap_log() {
    lo = std::pow(10.0, std::floor(std::log10(lo) + 1e-9));
    hi = std::pow(10.0, std::ceil(std::log10(hi) - 1e-9));
    if (hi <= lo) hi = 10.0 * lo;
  }
};

std::string tick_label(double v, double step) {
  if (std::abs(v) < 1e-9 * step) return "0";
  const int decimals = std::max(0, static_cast<int>(-std::floor(std::log10(step) + 1e-9)));
  return fmt::format("{:.{}f}", v, decimals);
}

std::string log_tick_label(double v) {
  if (v >= 1e6 || v < 1e-4) return fmt::format("{:.0e}", v);
  return fmt::format("{:.{}f}", v, std::max(0, static_cast<int>(-std::floor(std::log10(v) + 1e-9))));
}

struct Frame {
  int width, height;  // of the plotted figure; a legend strip may be added below `height`
  Range x, y;
  bool log_x = false;
  double plot_w() const { return width - kLeft - kRight; }
  double tx(double v) const { return log_x ? std::log10(v) : v; }
  double px(double v) const { return kLeft + (tx(v) - tx(x.lo)) / (tx(x.hi) - tx(x.lo)) * plot_w(); }
  double py(double v) const { return height - kBottom - (v - y.lo) / (y.hi - y.lo) * (height - kTop - kBottom); }
  Box plot() const { return {double(kLeft), double(kTop), double(width - kRight), double(height - kBottom)}; }
};

std::string open_svg(int w, int h, const std::string& title) {
  return fmt::format(
      "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{0}\" height=\"{1}\" viewBox=\"0 0 {0} {1}\" "
      "font-family=\"sans-serif\" font-size=\"11\">\n<rect width=\"{0}\" height=\"{1}\" fill=\"white\"/>\n"
      "<text x=\"{2}\" y=\"18\" text-anchor=\"middle\" font-size=\"13\" font-weight=\"bold\">{3}</text>\n",
      w, h, w / 2, escape(title));
}

// Linear ticks of `r` at `step`, by index so that no round-off accumulates.
std::vector<double> linear_ticks(const Range& r, double step) {
  std::vector<double> t;
  const double first = std::ceil(r.lo / step - 1e-9);
  for (int i = 0;; ++i) {
    const double v = (first + i) * step;
    if (v > r.hi + 1e-9 * step || i > 1000) break;
    t.push_back(v);
  }
  return t;
}

// x ticks and their labels, thinned (larger step, or every k-th decade) until labels do not touch.
std::vector<std::pair<double, std::string>> x_ticks(const Frame& f) {
  std::vector<std::pair<double, std::string>> out;
  if (f.log_x) {
    std::vector<double> decades;
    for (double e = std::round(std::log10(f.x.lo)); e <= std::log10(f.x.hi) + 1e-9; e += 1.0) decades.push_back(std::pow(10.0, e));
    if (decades.size() < 3) {  // a decade or two only: add 2 and 5 between
      std::vector<double> more;
      for (double d : decades) {
        for (double m : {1.0, 2.0, 5.0}) {
          if (m * d <= f.x.hi * (1 + 1e-9)) more.push_back(m * d);
        }
      }
      decades = more;
    }
    for (size_t every = 1;; ++every) {
      out.clear();
      double last_right = -1e9;
      bool fits = true;
      for (size_t i = 0; i < decades.size(); i += every) {
        const auto label = log_tick_label(decades[i]);
        const double x = f.px(decades[i]), w = text_width(label);
        fits = fits && x - w / 2 > last_right + 6;
        last_right = x + w / 2;
        out.emplace_back(decades[i], label);
      }
      if (fits || every >= decades.size()) break;
    }
    return out;
  }
  double step = f.x.step > 0.0 ? f.x.step : nice_step(f.x.hi - f.x.lo, 5);
  for (;;) {
    out.clear();
    double widest = 0.0;
    for (double v : linear_ticks(f.x, step)) {
      out.emplace_back(v, tick_label(v, step));
      widest = std::max(widest, text_width(out.back().second));
    }
    const double pitch = step / (f.x.hi - f.x.lo) * f.plot_w();
    if (pitch >= widest + 8.0 || out.size() <= 1) break;
    step = next_step(step);
  }
  return out;
}

std::vector<std::pair<double, std::string>> y_ticks(const Frame& f) {
  std::vector<std::pair<double, std::string>> out;
  double step = f.y.step > 0.0 ? f.y.step : nice_step(f.y.hi - f.y.lo, 6);
  for (;;) {
    out.clear();
    for (double v : linear_ticks(f.y, step)) out.emplace_back(v, tick_label(v, step));
    const double pitch = step / (f.y.hi - f.y.lo) * (f.height - kTop - kBottom);
    if (pitch >= 14.0 || out.size() <= 1) break;
    step = next_step(step);
  }
  return out;
}

std::string axes(const Frame& f, const std::string& x_label, const std::string& y_label, bool with_x_ticks = true) {
  std::string s;
  const double x0 = kLeft, x1 = f.width - kRight, y0 = f.height - kBottom, y1 = kTop;
  s += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"#444\"/>\n", x0, y1,
                   x1 - x0, y0 - y1);
  if (with_x_ticks) {
    for (const auto& [v, label] : x_ticks(f)) {
      const double x = f.px(v), w = text_width(label);
      // An end label that would leave the figure is anchored at its edge instead.
      const char* anchor = x + w / 2 > f.width - 2 ? "end" : x - w / 2 < 2 ? "start" : "middle";
      s += fmt::format("<line x1=\"{0:.1f}\" y1=\"{1}\" x2=\"{0:.1f}\" y2=\"{2}\" stroke=\"#ddd\"/>"
                       "<text x=\"{3:.1f}\" y=\"{4}\" text-anchor=\"{5}\">{6}</text>\n",
                       x, y0, y1, std::clamp(x, 2.0, f.width - 2.0), y0 + 14, anchor, label);
    }
  }
  for (const auto& [v, label] : y_ticks(f)) {
    s += fmt::format("<line x1=\"{0}\" y1=\"{1:.1f}\" x2=\"{2}\" y2=\"{1:.1f}\" stroke=\"#ddd\"/>"
                     "<text x=\"{3}\" y=\"{4:.1f}\" text-anchor=\"end\">{5}</text>\n",
                     x0, f.py(v), x1, x0 - 4, f.py(v) + 4, label);
  }
  if (!x_label.empty()) {
    s += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>\n", (x0 + x1) / 2, f.height - 12,
                     escape(x_label));
  }
  s += fmt::format("<text transform=\"translate(14,{}) rotate(-90)\" text-anchor=\"middle\">{}</text>\n", (y0 + y1) / 2,
                   escape(y_label));
  return s;
}

struct LegendItem {
  std::string name, color;
  enum class Kind { line, box, dot } kind = Kind::box;
  std::string dash{};  // stroke-dasharray of a line swatch
  double stroke = 1.8;
};

double legend_width(const std::vector<LegendItem>& items) {
  double w = 0.0;
  for (const auto& i : items) w = std::max(w, text_width(i.name));
  return w + 30.0;
}

std::string legend(double x, double y, const std::vector<LegendItem>& items, bool framed) {
  std::string s;
  if (items.empty()) return s;
  if (framed) {
    s += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\" fill=\"white\" fill-opacity=\"0.9\" "
                     "stroke=\"#ccc\"/>\n",
                     x, y, legend_width(items), kLine * items.size() + 6);
  }
  for (size_t i = 0; i < items.size(); ++i) {
    const auto& it = items[i];
    const double sx = x + 5, cy = y + 3 + kLine * i + 7;
    switch (it.kind) {
      case LegendItem::Kind::line:
        s += fmt::format("<line x1=\"{:.1f}\" y1=\"{:.1f}\" x2=\"{:.1f}\" y2=\"{:.1f}\" stroke=\"{}\" stroke-width=\"{}\"{}/>", sx,
                         cy, sx + 18, cy, it.color, it.stroke, it.dash.empty() ? "" : " stroke-dasharray=\"" + it.dash + "\"");
        break;
      case LegendItem::Kind::dot:
        s += fmt::format("<circle cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"4\" fill=\"{}\" stroke=\"#333\" stroke-width=\"0.5\"/>", sx + 9,
                         cy, it.color);
        break;
      case LegendItem::Kind::box:
        s += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"18\" height=\"9\" fill=\"{}\"/>", sx, cy - 4.5, it.color);
        break;
    }
    s += fmt::format("<text x=\"{:.1f}\" y=\"{:.1f}\">{}</text>\n", sx + 23, cy + 4, escape(it.name));
  }
  return s;
}

// Where the legend goes: the first corner of the plot whose box touches no data mark, else a
// strip below the figure. Returns the top-left corner and the height the strip adds (0 inside).
struct LegendPlace {
  double x, y, extra;
};

LegendPlace place_legend(const Frame& f, const std::vector<LegendItem>& items, const std::vector<Box>& marks) {
  const double w = legend_width(items), h = kLine * items.size() + 6, m = 4.0;
  const Box p = f.plot();
  const std::pair<double, double> corners[] = {
      {p.x1 - m - w, p.y0 + m}, {p.x0 + m, p.y0 + m}, {p.x1 - m - w, p.y1 - m - h}, {p.x0 + m, p.y1 - m - h}};
  for (const auto& [x, y] : corners) {
    const Box b{x - 2, y - 2, x + w + 2, y + h + 2};
    if (!b.inside(p)) continue;
    if (std::none_of(marks.begin(), marks.end(), [&](const Box& k) { return k.overlaps(b); })) return {x, y, 0.0};
  }
  return {double(kLeft), double(f.height) - 2.0, h + 4.0};
}

// Boxes along a polyline, every few pixels: what a legend must not cover.
void add_polyline_marks(std::vector<Box>& marks, const std::vector<std::pair<double, double>>& pts) {
  for (size_t i = 0; i < pts.size(); ++i) {
    const auto [x, y] = pts[i];
    marks.push_back({x - 2, y - 2, x + 2, y + 2});
    if (i == 0) continue;
    const auto [xa, ya] = pts[i - 1];
    const int n = static_cast<int>(std::hypot(x - xa, y - ya) / 3.0);
    for (int k = 1; k < n; ++k) {
      const double t = static_cast<double>(k) / n;
      marks.push_back({xa + t * (x - xa) - 2, ya + t * (y - ya) - 2, xa + t * (x - xa) + 2, ya + t * (y - ya) + 2});
    }
  }
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

// A category label that fits `width`: one line, else two split at a space, else cut with "...".
std::vector<std::string> fit_label(const std::string& s, double width) {
  if (text_width(s) <= width) return {s};
  size_t best = std::string::npos;
  for (size_t i = s.find(' '); i != std::string::npos; i = s.find(' ', i + 1)) {
    if (best == std::string::npos || std::abs(double(i) - s.size() / 2.0) < std::abs(double(best) - s.size() / 2.0)) best = i;
  }
  const auto cut = [&](std::string t) {
    if (text_width(t) <= width) return t;
    while (t.size() > 1 && text_width(t + "...") > width) t.pop_back();
    return t + "...";
  };
  if (best == std::string::npos) return {cut(s)};
  return {cut(s.substr(0, best)), cut(s.substr(best + 1))};
}

std::string finish_svg(int width, const Frame& f, const std::string& title, const std::string& body,
                       const std::vector<LegendItem>& items, const std::vector<Box>& marks) {
  const auto place = place_legend(f, items, marks);
  return open_svg(width, static_cast<int>(f.height + place.extra), title) + body +
         legend(place.x, place.y, items, place.extra == 0.0) + "</svg>\n";
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
                       const std::vector<Series>& series, const std::vector<Marker>& markers, int width, int height,
                       double y_include_lo, double y_include_hi) {
  Frame f{width, height, {}, {}};
  for (const auto& s : series) {
    for (double v : s.x) f.x.add(v);
    for (double v : s.y) f.y.add(v);
  }
  for (const auto& m : markers) (m.vertical ? f.x : f.y).add(m.value);
  f.y.add(y_include_lo);
  f.y.add(y_include_hi);
  f.x.finish();
  f.y.finish();
  f.x.snap(5);
  f.y.snap(6);
  std::string body = axes(f, x_label, y_label);
  std::vector<Box> marks;
  std::vector<LegendItem> items;
  body += "<g class=\"data\">\n";
  for (const auto& s : series) {
    std::string pts;
    std::vector<std::pair<double, double>> px;
    for (size_t i = 0; i < s.x.size() && i < s.y.size(); ++i) {
      if (!std::isfinite(s.x[i]) || !std::isfinite(s.y[i])) continue;
      px.emplace_back(f.px(s.x[i]), f.py(s.y[i]));
      pts += fmt::format("{:.1f},{:.1f} ", px.back().first, px.back().second);
    }
    const std::string dash = !s.dash_pattern.empty() ? s.dash_pattern : s.dashed ? "5,3" : "";
    body += fmt::format("<polyline fill=\"none\" stroke=\"{}\" stroke-width=\"{}\"{} points=\"{}\"/>\n", s.color, s.stroke_width,
                        dash.empty() ? "" : " stroke-dasharray=\"" + dash + "\"", pts);
    if (s.markers) {
      for (const auto& [x, y] : px) body += fmt::format("<circle cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"2.5\" fill=\"{}\"/>\n", x, y, s.color);
    }
    add_polyline_marks(marks, px);
    items.push_back({s.name, s.color, LegendItem::Kind::line, dash, s.stroke_width});
  }
  body += "</g>\n";
  // Marker labels: the first place along the line that is clear of the labels already placed.
  std::vector<Box> labels;
  const Box p = f.plot();
  for (const auto& m : markers) {
    const double w = text_width(m.label);
    std::vector<std::pair<Box, std::string>> tries;
    if (m.vertical) {
      const double x = f.px(m.value);
      body += fmt::format("<line x1=\"{0:.1f}\" y1=\"{1}\" x2=\"{0:.1f}\" y2=\"{2}\" stroke=\"#d62728\" stroke-dasharray=\"3,3\"/>\n", x,
                          p.y1, p.y0);
      marks.push_back({x - 2, p.y0, x + 2, p.y1});
      for (double y : {p.y0 + 4, p.y1 - 18, (p.y0 + p.y1) / 2}) {
        tries.push_back({{x + 3, y, x + 3 + w, y + 12}, "start"});
        tries.push_back({{x - 3 - w, y, x - 3, y + 12}, "end"});
      }
    } else {
      const double y = f.py(m.value);
      body += fmt::format("<line x1=\"{0}\" y1=\"{1:.1f}\" x2=\"{2}\" y2=\"{1:.1f}\" stroke=\"#d62728\" stroke-dasharray=\"3,3\"/>\n",
                          p.x0, y, p.x1);
      marks.push_back({p.x0, y - 2, p.x1, y + 2});
      for (double x : {p.x0 + 4, p.x1 - 4 - w, (p.x0 + p.x1 - w) / 2}) {
        tries.push_back({{x, y - 15, x + w, y - 3}, "start"});
        tries.push_back({{x, y + 3, x + w, y + 15}, "start"});
      }
    }
    auto pick = tries.front();
    for (const auto& t : tries) {
      if (!t.first.inside(p)) continue;
      if (std::none_of(labels.begin(), labels.end(), [&](const Box& b) { return b.overlaps(t.first); })) {
        pick = t;
        break;
      }
    }
    const Box& b = pick.first;
    body += fmt::format("<text x=\"{:.1f}\" y=\"{:.1f}\" fill=\"#d62728\" text-anchor=\"{}\">{}</text>\n",
                        pick.second == "end" ? b.x1 : b.x0, b.y1 - 2, pick.second, escape(m.label));
    labels.push_back(b);
    marks.push_back(b);
  }
  return finish_svg(width, f, title, body, items, marks);
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
  for (const auto& s : low) {
    for (double v : s) f.y.add(v);
  }
  f.y.finish();
  f.y.snap(6);
  std::string body = axes(f, "", y_label, false);
  std::vector<Box> marks;
  body += "<g class=\"data\">\n";
  const double plot_w = width - kLeft - kRight;
  const double group_w = plot_w / std::max<size_t>(1, categories.size());
  const double bar_w = 0.8 * group_w / std::max<size_t>(1, values.size());
  bool whiskers = false;
  for (size_t c = 0; c < categories.size(); ++c) {
    const double gx = kLeft + c * group_w;
    for (size_t s = 0; s < values.size(); ++s) {
      const double v = values[s][c];
      if (!std::isfinite(v)) continue;
      const double y = f.py(v), y0 = f.py(0.0), x = gx + 0.1 * group_w + s * bar_w;
      body += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\" fill=\"{}\"><title>{}: {}</title></rect>\n",
                          x, std::min(y, y0), bar_w, std::abs(y0 - y), colors[s % 6], escape(series_names[s]),
                          report::format_number(v));
      marks.push_back({x, std::min(y, y0) - 1, x + bar_w, std::max(y, y0)});
      if (s < low.size() && s < high.size() && std::isfinite(low[s][c]) && std::isfinite(high[s][c])) {
        whiskers = true;
        const double xc = x + 0.5 * bar_w;
        body += fmt::format("<path d=\"M{0:.1f},{1:.1f}V{2:.1f}M{3:.1f},{1:.1f}H{4:.1f}M{3:.1f},{2:.1f}H{4:.1f}\" "
                            "stroke=\"#222\" fill=\"none\"><title>P10 {5}, P90 {6}</title></path>\n",
                            xc, f.py(low[s][c]), f.py(high[s][c]), xc - 4, xc + 4, report::format_number(low[s][c]),
                            report::format_number(high[s][c]));
        marks.push_back({xc - 5, f.py(high[s][c]) - 1, xc + 5, f.py(low[s][c]) + 1});
      }
    }
    const auto lines = fit_label(categories[c], group_w - 4);
    for (size_t l = 0; l < lines.size(); ++l) {
      body += fmt::format("<text x=\"{:.1f}\" y=\"{}\" text-anchor=\"middle\">{}</text>\n", gx + group_w / 2,
                          height - kBottom + 14 + 13 * l, escape(lines[l]));
    }
  }
  std::vector<LegendItem> items;
  for (size_t s = 0; s < series_names.size(); ++s) items.push_back({series_names[s], colors[s % 6]});
  if (whiskers) items.push_back({"P10 to P90", "#222", LegendItem::Kind::line, "", 1.0});
  body += "</g>\n";
  return finish_svg(width, f, title, body, items, marks);
}

std::string histogram_chart(const std::string& title, const std::string& x_label, const std::vector<double>& edges,
                            const std::vector<double>& counts, bool log_x, double underflow, int width, int height) {
  Frame f{width, height, {}, {}};
  f.log_x = log_x;
  if (edges.size() < 2 || counts.size() + 1 != edges.size()) {
    f.x.add(log_x ? 1.0 : 0.0), f.x.add(log_x ? 10.0 : 1.0);
  } else {
    for (double e : edges) f.x.add(e);
  }
  // The lumped bar below the first edge is one bin wide (a factor of the first bin on a log axis).
  double under_lo = 0.0, under_hi = 0.0;
  const bool has_under = underflow > 0.0 && edges.size() >= 2;
  if (has_under) {
    under_hi = edges.front();
    under_lo = log_x ? edges.front() * edges.front() / edges[1] : 2 * edges.front() - edges[1];
    f.x.add(under_lo);
  }
  f.y.add(0.0);
  f.y.add(underflow);
  for (double c : counts) f.y.add(c);
  f.y.finish();
  f.y.snap(5);
  if (log_x) {
    f.x.snap_log();
  } else {
    f.x.finish();
    f.x.snap(5);
  }
  std::string body = axes(f, x_label, "number");
  std::vector<Box> marks;
  body += "<g class=\"data\">\n";
  const auto bar = [&](double a, double b, double n, const char* color, const std::string& tip) {
    const double x0 = f.px(a), x1 = f.px(b), y = f.py(n), y0 = f.py(0.0);
    body += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\" fill=\"{}\" stroke=\"white\" "
                        "stroke-width=\"0.5\"><title>{}</title></rect>\n",
                        x0, y, std::max(0.5, x1 - x0), y0 - y, color, escape(tip));
    marks.push_back({x0, y - 1, x1, y0});
  };
  for (size_t i = 0; i < counts.size() && i + 1 < edges.size(); ++i) {
    if (counts[i] > 0.0) {
      bar(edges[i], edges[i + 1], counts[i], "#1f77b4",
          fmt::format("{} to {}: {}", report::format_number(edges[i], 3, 8), report::format_number(edges[i + 1], 3, 8),
                      report::format_number(counts[i])));
    }
  }
  std::vector<LegendItem> items{{"count per bin", "#1f77b4"}};
  if (has_under) {
    const std::string label = "below " + report::format_number(under_hi, 2, 8) + " (together)";
    bar(under_lo, under_hi, underflow, "#aaaaaa", label + ": " + report::format_number(underflow));
    items.push_back({label, "#aaaaaa"});
  }
  body += "</g>\n";
  return finish_svg(width, f, title, body, items, marks);
}

std::string scatter_chart(const std::string& title, const std::string& x_label, const std::string& y_label,
                          const std::vector<ScatterPoint>& points, const std::vector<std::string>& group_names,
                          const std::vector<std::string>& group_colors, int width, int height, bool emphasise_last) {
  Frame f{width, height, {}, {}};
  for (const auto& p : points) f.x.add(p.x), f.y.add(p.y);
  f.x.finish();
  f.y.finish();
  // A little room around the points, so that none sits half outside on the frame.
  for (Range* r : {&f.x, &f.y}) {
    const double pad = 0.04 * (r->hi - r->lo);
    r->lo -= pad, r->hi += pad;
  }
  f.x.snap(5);
  f.y.snap(6);
  std::string body = axes(f, x_label, y_label);
  std::vector<Box> marks;
  body += "<g class=\"data\">\n";
  for (const auto& p : points) {
    if (!std::isfinite(p.x) || !std::isfinite(p.y)) continue;
    const bool large = emphasise_last && p.group == static_cast<int>(group_names.size()) - 1;
    const double r = large ? 6 : 4, x = f.px(p.x), y = f.py(p.y);
    body += fmt::format("<circle cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"{}\" fill=\"{}\" stroke=\"#333\" stroke-width=\"0.5\"/>\n", x, y, r,
                        group_colors[p.group]);
    marks.push_back({x - r, y - r, x + r, y + r});
  }
  body += "</g>\n";
  std::vector<LegendItem> items;
  for (size_t g = 0; g < group_names.size(); ++g) items.push_back({group_names[g], group_colors[g], LegendItem::Kind::dot});
  return finish_svg(width, f, title, body, items, marks);
}

std::string zone_map(const ZoneNetwork& net, const std::vector<double>& field, const std::string& title,
                     const std::string& unit, const std::vector<Outline>& outlines, double marker, int height) {
  const double big_r = net.shape.radius(), h = net.liquid_height;
  const double plot_h = height - kTop - kBottom;
  const double scale = plot_h / h;  // one scale for r and z: the section is drawn to scale
  Frame f{static_cast<int>(std::lround(kLeft + big_r * scale + kRight)), height, {0.0, big_r}, {0.0, h}};
  Range v;
  for (double x : field) v.add(x);
  v.finish();
  // A span within 0.5 % of the largest magnitude is uniform for any reader: one colour, said so.
  const double magnitude = std::max(std::abs(v.lo), std::abs(v.hi));
  const double span = v.hi - v.lo;
  const bool uniform = !(span > 0.005 * magnitude);
  const double bx = f.width + 14, by = kTop, bh = plot_h;
  const int width = std::max({static_cast<int>(bx + 100), static_cast<int>(text_width(title, 13) + 20), 220});
  std::string out = open_svg(width, height, title) + axes(f, "r [m]", "height [m]");
  out += "<g class=\"data\">\n";  // what the browser test counts as data marks
  for (int k = 0; k < net.size(); ++k) {
    const double t = uniform ? 0.5 : (field[k] - v.lo) / span;
    // The wetted part of the cell: below its top, above the vessel's floor. The floor is followed
    // at a few radii (a chord between the corners would leave slivers of a curved head undrawn);
    // neighbours evaluate it at the same shared edge, so the cells tile the section.
    std::string points = fmt::format("{:.1f},{:.1f} {:.1f},{:.1f}", f.px(net.r1[k]), f.py(net.z1[k]), f.px(net.r0[k]),
                                     f.py(net.z1[k]));
    const bool cut = net.z_floor_inner[k] > net.z0[k] || net.z_floor_outer[k] > net.z0[k];
    const int samples = cut ? 8 : 1;
    for (int i = 0; i <= samples; ++i) {
      const double r = net.r0[k] + (net.r1[k] - net.r0[k]) * i / samples;
      const double floor = std::clamp(net.shape.bottom_height(r), net.z0[k], net.z1[k]);
      points += fmt::format(" {:.1f},{:.1f}", f.px(r), f.py(floor));
    }
    out += fmt::format("<polygon points=\"{}\" fill=\"{}\"><title>zone {}: {} {}</title></polygon>\n", points,
                       ramp(t), k, report::format_number(field[k], 4, 8), escape(unit));
  }
  out += "</g>\n";
  for (const auto& o : outlines) {
    out += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\" fill=\"none\" stroke=\"white\" "
                       "stroke-width=\"1.5\"><title>{}</title></rect>\n",
                       f.px(o.r0), f.py(o.z1), f.px(o.r1) - f.px(o.r0), std::max(1.5, f.py(o.z0) - f.py(o.z1)), escape(o.label));
  }
  // Colour bar, labelled with the actual minimum and maximum (digits enough to tell them apart).
  std::string lo_text, hi_text;
  for (int digits = 3; digits <= 8; ++digits) {
    lo_text = report::format_number(v.lo, digits, 8), hi_text = report::format_number(v.hi, digits, 8);
    if (lo_text != hi_text) break;
  }
  // The unit under the bar: above it, it would run into the title of a narrow figure.
  out += fmt::format("<text x=\"{:.1f}\" y=\"{}\">[{}]</text>\n", bx, by + bh + 14, escape(unit));
  if (uniform) {
    out += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"14\" height=\"{:.1f}\" fill=\"{}\"/>\n", bx, by, bh, ramp(0.5));
    out += fmt::format("<text x=\"{0:.1f}\" y=\"{1:.1f}\">uniform:</text><text x=\"{0:.1f}\" y=\"{2:.1f}\">{3}</text>"
                       "<text x=\"{0:.1f}\" y=\"{4:.1f}\">to {5}</text>\n",
                       bx + 18, by + bh / 2 - 10, by + bh / 2 + 4, lo_text, by + bh / 2 + 18, hi_text);
    return out + "</svg>\n";
  }
  for (int i = 0; i < 50; ++i) {
    out += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"14\" height=\"{:.2f}\" fill=\"{}\"/>\n", bx,
                       by + bh * (1.0 - (i + 1) / 50.0), bh / 50.0 + 0.5, ramp((i + 0.5) / 50.0));
  }
  const auto bar_y = [&](double x) { return by + bh * (1.0 - (x - v.lo) / span); };
  out += fmt::format("<text x=\"{:.1f}\" y=\"{:.1f}\" font-weight=\"bold\">{} max</text>\n", bx + 18, by + 8, hi_text);
  out += fmt::format("<text x=\"{:.1f}\" y=\"{:.1f}\" font-weight=\"bold\">{} min</text>\n", bx + 18, by + bh, lo_text);
  const double step = nice_step(span, 4);
  for (double x : linear_ticks(v, step)) {
    const double y = bar_y(x);
    if (y - by < 24 || by + bh - y < 24) continue;  // keep clear of the min and max labels
    out += fmt::format("<line x1=\"{:.1f}\" y1=\"{:.1f}\" x2=\"{:.1f}\" y2=\"{:.1f}\" stroke=\"#444\"/><text x=\"{:.1f}\" y=\"{:.1f}\">{}</text>\n",
                       bx + 14, y, bx + 17, y, bx + 18, y + 4, tick_label(x, step));
  }
  if (span < 0.25 * magnitude) {
    // A narrow span stretched over the whole ramp looks like a strong gradient: say how narrow.
    out += fmt::format("<text x=\"{0:.1f}\" y=\"{1:.1f}\">range {2} %</text><text x=\"{0:.1f}\" y=\"{3:.1f}\">of the max</text>\n",
                       bx, by + bh + 28, report::format_number(100.0 * span / magnitude, 2, 1), by + bh + 41);
  }
  if (marker >= v.lo && marker <= v.hi) {
    out += fmt::format("<line x1=\"{:.1f}\" y1=\"{:.1f}\" x2=\"{:.1f}\" y2=\"{:.1f}\" stroke=\"#d62728\" stroke-width=\"2\"/>\n",
                       bx - 3, bar_y(marker), bx + 17, bar_y(marker));
  }
  return out + "</svg>\n";
}

}  // namespace oxystrat::svg
