// ridgecal report: a small SVG plotter (axes, 1-2-5 ticks, log axis with a
// separate zero slot, legend, lines, shaped markers, shaded or hatched bands).
//
// Output is a single <svg> element without scripts or external references,
// meant to be inlined into the HTML report. It is well-formed XML. Every
// string that goes into it (legend names, axis labels) is escaped.
#pragma once

#include <optional>
#include <string>
#include <vector>

namespace ridgecal::report {

enum class Scale { linear, log };

/// Marker shapes differ in outline, not only colour, so a grey print still
/// tells the series apart.
enum class Marker { none, circle, square, triangle, triangle_down, diamond, cross, plus };

struct AxisSpec {
  std::string label;  ///< plain text, escaped on output
  Scale scale = Scale::linear;
  /// Log axis only: data values equal to 0 are drawn at a separate "0" tick
  /// to the left of (below) the log range, with an axis break between them.
  bool zero_slot = false;
  bool include_zero = false;       ///< linear axis: keep 0 inside the range
  std::optional<double> min, max;  ///< force the range; otherwise from the data
  int target_ticks = 6;            ///< linear axis: about this many intervals
};

struct SeriesStyle {
  std::string color = "#1f3b73";
  double line_width = 1.8;
  std::string dash;  ///< SVG stroke-dasharray, empty for solid
  Marker marker = Marker::none;
  bool marker_filled = true;
  double marker_size = 8.0;  ///< outer size in px
};

struct Series {
  std::string name;  ///< legend text; empty means no legend entry
  std::vector<double> x, y;
  std::vector<double> y_err;  ///< optional symmetric error bars (same size as y)
  bool draw_line = true;
  SeriesStyle style;
};

/// A filled region between lo(x) and hi(x).
struct Band {
  std::string name;  ///< legend text; empty means no legend entry
  std::vector<double> x, lo, hi;
  std::string fill = "#d9d9d9";
  double opacity = 1.0;
  bool hatched = false;    ///< diagonal hatching instead of a flat fill
  std::string edge_color;  ///< outline of lo and hi edges; empty = none
  std::string edge_dash;   ///< dasharray of the edges
};

/// A horizontal line across the whole plot at y (e.g. zero residual).
struct HLine {
  double y = 0.0;
  std::string color = "#555555";
  double width = 1.0;
  std::string dash;
};

/// Text placed next to a data point, with an optional ring around the point.
struct Annotation {
  double x = 0.0, y = 0.0;
  std::string text;  ///< escaped on output
  bool ring = true;
};

class SvgPlot {
 public:
  SvgPlot(std::string id, double width, double height);

  AxisSpec x_axis, y_axis;
  std::vector<Band> bands;
  std::vector<HLine> hlines;
  std::vector<Series> series;
  std::vector<Annotation> annotations;
  std::string description;  ///< <title> of the SVG (accessible name); escaped
  int legend_columns = 0;   ///< 0 = as many as fit on a row
  bool show_legend = true;  ///< false: no legend inside (see render_legend)

  /// The <svg> element. Deterministic for the same input.
  std::string render() const;
  /// The legend alone, as an <svg> strip of the given width (for a legend
  /// shared by several panels drawn with show_legend = false).
  std::string render_legend(double width) const;

  const std::string& id() const { return id_; }
  double width() const { return width_; }
  double height() const { return height_; }

 private:
  std::string id_;
  double width_, height_;
};

/// SVG markup of one marker shape centred at (cx, cy); exposed for tests and
/// for legends drawn outside a plot.
std::string svg_marker(Marker m, double cx, double cy, double size, const std::string& color,
                       bool filled);

}  // namespace ridgecal::report
