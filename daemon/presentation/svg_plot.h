// One x-y plot as inline SVG for the report: linear or logarithmic axes with readable ticks,
// lines, a shaded band, points with error bars, and marker lines. Non-finite points (and, on a log
// axis, non-positive ones) are left out. Build, then Render; not thread-safe.
#ifndef PLATEAU_DAEMON_PRESENTATION_SVG_PLOT_H_
#define PLATEAU_DAEMON_PRESENTATION_SVG_PLOT_H_

#include <string>
#include <vector>

namespace plateau {

class SvgPlot {
 public:
  SvgPlot(std::string title, std::string x_label, std::string y_label, bool log_x = false,
          bool log_y = false);

  // `style` is a CSS class of the report's stylesheet (e.g. "value", "band", "target").
  void Line(std::vector<double> x, std::vector<double> y, std::string style, std::string label);
  void Band(std::vector<double> x, std::vector<double> lower, std::vector<double> upper,
            std::string style);
  void Points(std::vector<double> x, std::vector<double> y, std::vector<double> error,
              std::string style, std::string label);
  void VerticalLine(double x, std::string style, std::string label);
  void HorizontalLine(double y, std::string style, std::string label);

  // The <svg> element; a note instead of axes when nothing is plottable.
  std::string Render(int width = 400, int height = 270) const;

  // XML text escaping for element content and attribute values.
  static std::string Escape(const std::string& text);

 private:
  struct Series {
    enum class Kind { kLine, kBand, kPoints };
    Kind kind;
    std::vector<double> x, y, low, high;
    std::string style, label;
  };
  struct Marker {
    bool vertical;
    double at;
    std::string style, label;
  };
  bool Usable(double x, double y) const;

  std::string title_, x_label_, y_label_;
  bool log_x_, log_y_;
  std::vector<Series> series_;
  std::vector<Marker> markers_;
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_PRESENTATION_SVG_PLOT_H_
