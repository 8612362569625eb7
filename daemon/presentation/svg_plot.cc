#include "daemon/presentation/svg_plot.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "daemon/presentation/number_format.h"

namespace plateau {
namespace {

// Margins: the title and, under it, the legend sit above the frame, so that no label covers data.
constexpr double kLeft = 64, kRight = 16, kTop = 44, kBottom = 44;
constexpr double kLegendY = 34, kCharWidth = 6.2;

std::string Number(double v) { return PrintfNumber("%.1f", v); }

std::string Tick(double v) { return PrintfNumber("%g", v); }

// Ticks over [low, high]: steps of 1, 2 or 5 times a power of ten, or decades on a log axis.
std::vector<double> Ticks(double low, double high, bool log) {
  std::vector<double> ticks;
  if (log) {
    const int first = static_cast<int>(std::floor(std::log10(low)));
    const int last = static_cast<int>(std::ceil(std::log10(high)));
    for (int d = first; d <= last; ++d) {
      for (double m : {1.0, 2.0, 5.0}) {
        const double v = m * std::pow(10.0, d);
        if (v >= low * 0.999 && v <= high * 1.001) ticks.push_back(v);
      }
    }
    // Keep decades only when they are enough.
    std::vector<double> decades;
    for (double t : ticks) {
      if (std::fabs(std::log10(t) - std::round(std::log10(t))) < 1e-9) decades.push_back(t);
    }
    return decades.size() >= 3 ? decades : ticks;
  }
  const double raw = (high - low) / 5.0;
  const double power = std::pow(10.0, std::floor(std::log10(raw)));
  double step = power;
  for (double m : {1.0, 2.0, 5.0, 10.0}) {
    if (m * power >= raw) {
      step = m * power;
      break;
    }
  }
  // Counted in steps, not accumulated, so that rounding cannot add or lose a tick.
  const double first = std::ceil(low / step);
  for (int i = 0; (first + i) * step <= high + 1e-9 * step; ++i) {
    const double v = (first + i) * step;
    ticks.push_back(std::fabs(v) < 1e-12 * step ? 0.0 : v);
  }
  return ticks;
}

}  // namespace

SvgPlot::SvgPlot(std::string title, std::string x_label, std::string y_label, bool log_x,
                 bool log_y)
    : title_(std::move(title)),
      x_label_(std::move(x_label)),
      y_label_(std::move(y_label)),
      log_x_(log_x),
      log_y_(log_y) {}

std::string SvgPlot::Escape(const std::string& text) {
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

bool SvgPlot::Usable(double x, double y) const {
  return std::isfinite(x) && std::isfinite(y) && (!log_x_ || x > 0) && (!log_y_ || y > 0);
}

void SvgPlot::Line(std::vector<double> x, std::vector<double> y, std::string style,
                   std::string label) {
  series_.push_back({Series::Kind::kLine, std::move(x), std::move(y), {}, {}, std::move(style),
                     std::move(label)});
}

void SvgPlot::Band(std::vector<double> x, std::vector<double> lower, std::vector<double> upper,
                   std::string style) {
  series_.push_back({Series::Kind::kBand, std::move(x), {}, std::move(lower), std::move(upper),
                     std::move(style), ""});
}

void SvgPlot::Points(std::vector<double> x, std::vector<double> y, std::vector<double> error,
                     std::string style, std::string label) {
  std::vector<double> low, high;
  for (std::size_t i = 0; i < y.size(); ++i) {
    const double e = i < error.size() && std::isfinite(error[i]) ? error[i] : 0.0;
    low.push_back(y[i] - e);
    high.push_back(y[i] + e);
  }
  series_.push_back({Series::Kind::kPoints, std::move(x), std::move(y), std::move(low),
                     std::move(high), std::move(style), std::move(label)});
}

void SvgPlot::VerticalLine(double x, std::string style, std::string label) {
  markers_.push_back({true, x, std::move(style), std::move(label)});
}

void SvgPlot::HorizontalLine(double y, std::string style, std::string label) {
  markers_.push_back({false, y, std::move(style), std::move(label)});
}

std::string SvgPlot::Render(int width, int height) const {
  const double infinity = std::numeric_limits<double>::infinity();
  double x0 = infinity, x1 = -infinity, y0 = infinity, y1 = -infinity;
  const auto take = [&](double x, double y) {
    if (!Usable(x, y)) return;
    x0 = std::min(x0, x);
    x1 = std::max(x1, x);
    y0 = std::min(y0, y);
    y1 = std::max(y1, y);
  };
  for (const Series& s : series_) {
    for (std::size_t i = 0; i < s.x.size(); ++i) {
      if (i < s.y.size()) take(s.x[i], s.y[i]);
      if (i < s.low.size()) take(s.x[i], s.low[i]);
      if (i < s.high.size()) take(s.x[i], s.high[i]);
    }
  }
  for (const Marker& m : markers_) {
    if (!m.vertical && std::isfinite(m.at) && (!log_y_ || m.at > 0)) {
      y0 = std::min(y0, m.at);
      y1 = std::max(y1, m.at);
    }
  }
  std::string svg = "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" + std::to_string(width) +
                    "\" height=\"" + std::to_string(height) + "\" viewBox=\"0 0 " +
                    std::to_string(width) + " " + std::to_string(height) + "\">";
  svg += "<text class=\"title\" x=\"" + Number(width / 2.0) + "\" y=\"18\" text-anchor=\"middle\">" +
         Escape(title_) + "</text>";
  if (!(x1 > x0)) {
    svg += "<text class=\"note\" x=\"" + Number(width / 2.0) + "\" y=\"" + Number(height / 2.0) +
           "\" text-anchor=\"middle\">not enough data to plot yet</text></svg>";
    return svg;
  }
  if (!(y1 > y0)) {
    const double pad = y0 == 0.0 ? 1.0 : std::fabs(y0) * 0.1;
    y0 = log_y_ ? y0 / 2 : y0 - pad;
    y1 = log_y_ ? y1 * 2 : y1 + pad;
  } else if (!log_y_) {
    const double pad = 0.05 * (y1 - y0);
    y0 -= pad, y1 += pad;
  }
  const double w = width - kLeft - kRight, h = height - kTop - kBottom;
  const auto tx = [&](double v) { return log_x_ ? std::log10(v) : v; };
  const auto ty = [&](double v) { return log_y_ ? std::log10(v) : v; };
  const auto px = [&](double v) { return kLeft + (tx(v) - tx(x0)) / (tx(x1) - tx(x0)) * w; };
  const auto py = [&](double v) { return kTop + h - (ty(v) - ty(y0)) / (ty(y1) - ty(y0)) * h; };
  svg += "<rect class=\"frame\" x=\"" + Number(kLeft) + "\" y=\"" + Number(kTop) + "\" width=\"" +
         Number(w) + "\" height=\"" + Number(h) + "\"/>";
  for (double t : Ticks(x0, x1, log_x_)) {
    svg += "<line class=\"grid\" x1=\"" + Number(px(t)) + "\" y1=\"" + Number(kTop) + "\" x2=\"" +
           Number(px(t)) + "\" y2=\"" + Number(kTop + h) + "\"/><text class=\"tick\" x=\"" +
           Number(px(t)) + "\" y=\"" + Number(kTop + h + 14) + "\" text-anchor=\"middle\">" +
           Tick(t) + "</text>";
  }
  for (double t : Ticks(y0, y1, log_y_)) {
    svg += "<line class=\"grid\" x1=\"" + Number(kLeft) + "\" y1=\"" + Number(py(t)) + "\" x2=\"" +
           Number(kLeft + w) + "\" y2=\"" + Number(py(t)) + "\"/><text class=\"tick\" x=\"" +
           Number(kLeft - 4) + "\" y=\"" + Number(py(t) + 4) + "\" text-anchor=\"end\">" +
           Tick(t) + "</text>";
  }
  svg += "<text class=\"axis\" x=\"" + Number(kLeft + w / 2) + "\" y=\"" + Number(height - 8.0) +
         "\" text-anchor=\"middle\">" + Escape(x_label_) + "</text>";
  svg += "<text class=\"axis\" transform=\"translate(14," + Number(kTop + h / 2) +
         ") rotate(-90)\" text-anchor=\"middle\">" + Escape(y_label_) + "</text>";
  double legend_right = kLeft + w;
  for (const Series& s : series_) {
    std::string points;
    if (s.kind == Series::Kind::kBand) {
      std::string back;
      for (std::size_t i = 0; i < s.x.size(); ++i) {
        if (!Usable(s.x[i], s.low[i]) || !Usable(s.x[i], s.high[i])) continue;
        points += Number(px(s.x[i])) + "," + Number(py(s.low[i])) + " ";
        back = Number(px(s.x[i])) + "," + Number(py(s.high[i])) + " " + back;
      }
      if (!points.empty()) {
        svg += "<polygon class=\"" + s.style + "\" points=\"" + points + back + "\"/>";
      }
      continue;
    }
    for (std::size_t i = 0; i < s.x.size() && i < s.y.size(); ++i) {
      if (!Usable(s.x[i], s.y[i])) continue;
      if (s.kind == Series::Kind::kLine) {
        points += Number(px(s.x[i])) + "," + Number(py(s.y[i])) + " ";
      } else {
        if (Usable(s.x[i], s.low[i]) && Usable(s.x[i], s.high[i])) {
          svg += "<line class=\"" + s.style + "\" x1=\"" + Number(px(s.x[i])) + "\" y1=\"" +
                 Number(py(s.low[i])) + "\" x2=\"" + Number(px(s.x[i])) + "\" y2=\"" +
                 Number(py(s.high[i])) + "\"/>";
        }
        svg += "<circle class=\"" + s.style + "\" cx=\"" + Number(px(s.x[i])) + "\" cy=\"" +
               Number(py(s.y[i])) + "\" r=\"2.5\"/>";
      }
    }
    if (s.kind == Series::Kind::kLine && !points.empty()) {
      svg += "<polyline class=\"" + s.style + "\" points=\"" + points + "\"/>";
    }
    if (!s.label.empty()) {
      svg += "<text class=\"legend " + s.style + "\" x=\"" + Number(legend_right) + "\" y=\"" +
             Number(kLegendY) + "\" text-anchor=\"end\">" + Escape(s.label) + "</text>";
      legend_right -= kCharWidth * static_cast<double>(s.label.size()) + 14;
    }
  }
  for (const Marker& m : markers_) {
    if (m.vertical ? !(m.at >= x0 && m.at <= x1) : !std::isfinite(m.at)) continue;
    if (m.vertical) {
      svg += "<line class=\"" + m.style + "\" x1=\"" + Number(px(m.at)) + "\" y1=\"" +
             Number(kTop) + "\" x2=\"" + Number(px(m.at)) + "\" y2=\"" + Number(kTop + h) +
             "\"/><text class=\"marker\" x=\"" + Number(px(m.at) + 3) + "\" y=\"" +
             Number(kTop + h - 6) + "\">" + Escape(m.label) + "</text>";
    } else {
      svg += "<line class=\"" + m.style + "\" x1=\"" + Number(kLeft) + "\" y1=\"" +
             Number(py(m.at)) + "\" x2=\"" + Number(kLeft + w) + "\" y2=\"" + Number(py(m.at)) +
             "\"/><text class=\"marker\" x=\"" + Number(kLeft + 4) + "\" y=\"" +
             Number(py(m.at) - 4) + "\">" + Escape(m.label) + "</text>";
    }
  }
  return svg + "</svg>";
}

}  // namespace plateau
