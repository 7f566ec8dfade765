#include "ridgecal/report/svg_plot.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>

#include "ridgecal/report/axis_ticks.hpp"
#include "ridgecal/report/html_escape.hpp"
#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report {
namespace {

using C = std::string;  // coordinates are written through format_coord
C f(double v) {
  return format_coord(v);
}

constexpr double kTickFont = 12.0;
constexpr double kLabelFont = 13.0;
constexpr double kLegendFont = 12.0;
constexpr double kLegendRow = 18.0;
constexpr double kZeroSlot = 44.0;  // px reserved left of a log range for the "0" tick

/// Rough text width for layout (DejaVu Sans averages ~0.6 em per character).
double text_width(const std::string& s, double font) {
  std::size_t chars = 0;
  for (unsigned char c : s)
    if ((c & 0xC0) != 0x80) ++chars;  // count code points, not bytes
  return 0.6 * font * static_cast<double>(chars);
}

std::string stroke_attrs(const std::string& color, double width, const std::string& dash);

/// One axis after layout: maps a data value to a pixel coordinate.
struct Mapped {
  Scale scale = Scale::linear;
  double lo = 0, hi = 1;       // data range
  double p0 = 0, p1 = 1;       // pixel positions of lo and hi
  double frame0 = 0;           // pixel where the axis starts (before a zero slot)
  bool has_zero_slot = false;  // log axis with a separate 0 position
  double zero_pos = 0;         // pixel position of the 0 tick
  double break_pos = 0;        // pixel position of the axis break mark
  int exp10 = 0;               // linear axis: tick labels are in units of 10^exp10
  std::vector<Tick> ticks;

  bool representable(double v) const {
    if (!std::isfinite(v)) return false;
    if (scale == Scale::log) return v > 0.0 || (v == 0.0 && has_zero_slot);
    return true;
  }
  double map(double v) const {
    if (scale == Scale::log) {
      if (v == 0.0 && has_zero_slot) return zero_pos;
      const double t = (std::log10(v) - std::log10(lo)) / (std::log10(hi) - std::log10(lo));
      return p0 + t * (p1 - p0);
    }
    return p0 + (v - lo) / (hi - lo) * (p1 - p0);
  }
};

struct Extent {
  double lo = std::numeric_limits<double>::infinity();
  double hi = -std::numeric_limits<double>::infinity();
  bool zero = false;  // a zero was seen (relevant for log axes)
  void add(double v, Scale s) {
    if (!std::isfinite(v)) return;
    if (s == Scale::log && v <= 0.0) {
      if (v == 0.0) zero = true;
      return;
    }
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
  bool empty() const { return !(lo <= hi); }
};

/// Lay out an axis along pixels [p0, p1] (p1 may be < p0 for the y axis).
Mapped layout_axis(const AxisSpec& spec, Extent ext, double p0, double p1) {
  Mapped m;
  m.frame0 = p0;
  m.scale = spec.scale;
  if (spec.min) ext.add(*spec.min, spec.scale);
  if (spec.max) ext.add(*spec.max, spec.scale);
  if (spec.scale == Scale::log) {
    if (ext.empty()) ext.lo = 1e-6, ext.hi = 1.0;
    const LogAxis ax = log_axis(ext.lo, ext.hi);
    m.lo = ax.lo;
    m.hi = ax.hi;
    m.ticks = ax.ticks;
    m.has_zero_slot = spec.zero_slot && ext.zero;
    // Thin the labels to what the length of the axis can hold (about 40 px
    // per label), whatever the number of decades.
    const double decades = std::log10(ax.hi / ax.lo);
    const double px_per_decade =
        (std::fabs(p1 - p0) - (m.has_zero_slot ? kZeroSlot : 0.0)) / decades;
    const int every = std::max(1, static_cast<int>(std::ceil(40.0 / px_per_decade - 1e-9)));
    std::vector<Tick> kept;
    for (Tick t : m.ticks) {
      const double l = std::log10(t.value);
      const bool decade = std::fabs(l - std::round(l)) < 1e-9;
      if (decade) {
        const long e = std::lround(l);
        if (((e % every) + every) % every != 0) t.label.clear();
      } else if (px_per_decade < 110.0) {
        t.label.clear();  // 2 and 5 labels only when a decade is wide
        t.major = false;
        if (px_per_decade < 30.0) continue;  // no minor ticks when decades are narrow
      }
      kept.push_back(t);
    }
    m.ticks = kept;
    if (m.has_zero_slot) {
      const double dir = p1 > p0 ? 1.0 : -1.0;
      m.zero_pos = p0 + dir * 14.0;
      m.break_pos = p0 + dir * (kZeroSlot * 0.62);
      p0 += dir * kZeroSlot;
      m.ticks.insert(m.ticks.begin(), Tick{0.0, "0", true});
    }
  } else {
    if (ext.empty()) ext.lo = 0.0, ext.hi = 1.0;
    if (spec.include_zero) ext.add(0.0, Scale::linear);
    double lo = ext.lo, hi = ext.hi;
    // Keep markers off the frame: pad by 4% unless the range was forced.
    const double pad = 0.04 * (hi - lo);
    if (!spec.min) lo -= pad;
    if (!spec.max) hi += pad;
    const LinearAxis ax = linear_axis(lo, hi, spec.target_ticks);
    // The frame ends at the padded data range (no space wasted up to the next
    // whole step); ticks are the 1-2-5 multiples inside it.
    const bool degenerate = !(hi - lo > 1e-12 * std::max(std::fabs(lo), std::fabs(hi)));
    m.lo = spec.min ? *spec.min : (degenerate ? ax.lo : lo);
    m.hi = spec.max ? *spec.max : (degenerate ? ax.hi : hi);
    // Large or tiny values: label ticks in units of 10^E (E a multiple of 3)
    // and say so in the axis label, rather than printing 6000000 or 6e+06.
    const double amax = std::max(std::fabs(m.lo), std::fabs(m.hi));
    if (amax >= 1e5 || (amax > 0 && amax < 1e-3)) {
      m.exp10 = static_cast<int>(std::floor(std::floor(std::log10(amax)) / 3.0)) * 3;
      if (m.exp10 == 0) m.exp10 = amax >= 1e5 ? 3 : -3;
    }
    const double unit = std::pow(10.0, m.exp10);
    for (Tick t : ax.ticks)
      if (t.value >= m.lo - 1e-9 * ax.step && t.value <= m.hi + 1e-9 * ax.step) {
        if (m.exp10 != 0) t.label = linear_tick_label(t.value / unit, ax.step / unit);
        m.ticks.push_back(t);
      }
  }
  m.p0 = p0;
  m.p1 = p1;
  return m;
}

/// Axis label followed by the tick multiplier, e.g. "reading [counts] (×10⁶)".
std::string with_multiplier(const std::string& label, const Mapped& m) {
  if (m.exp10 == 0) return label;
  return label + " (\u00D7" + power_of_ten_label(m.exp10) + ")";
}

std::string stroke_attrs(const std::string& color, double width, const std::string& dash) {
  std::string s = fmt::format(R"( stroke="{}" stroke-width="{}")", html_escape(color), f(width));
  if (!dash.empty()) s += fmt::format(R"( stroke-dasharray="{}")", html_escape(dash));
  return s;
}

std::string hatch_defs(const std::vector<Band>& bands, const std::string& id) {
  std::string o;
  for (std::size_t i = 0; i < bands.size(); ++i) {
    if (!bands[i].hatched) continue;
    o += fmt::format(
        R"~(<pattern id="{}-hatch{}" patternUnits="userSpaceOnUse" width="7" height="7" patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="7" stroke="{}" stroke-width="2.2"/></pattern>)~",
        html_escape(id), i, html_escape(bands[i].fill));
  }
  return o;
}

struct LegendLayout {
  struct Item {
    std::string name;
    const Series* s = nullptr;
    std::size_t band = 0;  // index into bands when s is null
    double w = 0;
  };
  std::vector<Item> items;
  std::vector<std::vector<std::size_t>> rows;
  double col_w = 0;  // 0 = items packed by their own width
  double height() const {
    return rows.empty() ? 0.0 : static_cast<double>(rows.size()) * kLegendRow + 6.0;
  }
};

LegendLayout layout_legend(const std::vector<Band>& bands, const std::vector<Series>& series,
                           double avail, int columns) {
  LegendLayout L;
  for (std::size_t i = 0; i < bands.size(); ++i)
    if (!bands[i].name.empty()) L.items.push_back({bands[i].name, nullptr, i, 0});
  for (const Series& s : series)
    if (!s.name.empty()) L.items.push_back({s.name, &s, 0, 0});
  double max_w = 0;
  for (auto& it : L.items) {
    it.w = 34 + text_width(it.name, kLegendFont) + 18;
    max_w = std::max(max_w, it.w);
  }
  if (columns > 0) {
    // Fewer columns when the widest entry would not fit.
    while (columns > 1 && columns * max_w > avail) --columns;
    L.col_w = std::max(max_w, avail / columns);
    for (std::size_t i = 0; i < L.items.size(); ++i) {
      if (i % static_cast<std::size_t>(columns) == 0) L.rows.emplace_back();
      L.rows.back().push_back(i);
    }
  } else {
    double x = 0;
    for (std::size_t i = 0; i < L.items.size(); ++i) {
      if (L.rows.empty() || x + L.items[i].w > avail) {
        L.rows.emplace_back();
        x = 0;
      }
      L.rows.back().push_back(i);
      x += L.items[i].w;
    }
  }
  return L;
}

std::string draw_legend(const LegendLayout& L, const std::vector<Band>& bands,
                        const std::string& id, double x0, double y0) {
  if (L.rows.empty()) return {};
  std::string o = "<g class=\"legend\" font-size=\"12\">";
  double y = y0 + kLegendRow / 2;
  for (const auto& row : L.rows) {
    double x = x0;
    for (std::size_t i : row) {
      const auto& it = L.items[i];
      if (!it.s) {
        const Band& b = bands[it.band];
        const std::string fill = b.hatched
                                     ? fmt::format("url(#{}-hatch{})", html_escape(id), it.band)
                                     : html_escape(b.fill);
        o += fmt::format(
            R"(<rect x="{}" y="{}" width="26" height="12" fill="{}" fill-opacity="{}" stroke="{}" stroke-width="1"/>)",
            f(x), f(y - 6), fill, f(b.opacity),
            html_escape(b.edge_color.empty() ? std::string("#888888") : b.edge_color));
      } else {
        const SeriesStyle& st = it.s->style;
        if (it.s->draw_line)
          o += fmt::format(R"(<line x1="{}" y1="{}" x2="{}" y2="{}"{}/>)", f(x), f(y), f(x + 26),
                           f(y), stroke_attrs(st.color, st.line_width, st.dash));
        o += svg_marker(st.marker, x + 13, y, st.marker_size, st.color, st.marker_filled);
      }
      o += fmt::format(R"(<text x="{}" y="{}">{}</text>)", f(x + 32), f(y + 4.2),
                       html_escape(it.name));
      x += L.col_w > 0 ? L.col_w : it.w;
    }
    y += kLegendRow;
  }
  return o + "</g>\n";
}

}  // namespace

std::string svg_marker(Marker m, double cx, double cy, double size, const std::string& color,
                       bool filled) {
  const std::string col = html_escape(color);
  const std::string fill = filled ? col : std::string("#ffffff");
  const std::string common = fmt::format(R"( fill="{}" stroke="{}" stroke-width="1.4")", fill, col);
  const double r = size / 2.0;
  switch (m) {
    case Marker::none:
      return {};
    case Marker::circle:
      return fmt::format(R"(<circle cx="{}" cy="{}" r="{}"{}/>)", f(cx), f(cy), f(r * 0.92),
                         common);
    case Marker::square: {
      const double h = r * 0.82;
      return fmt::format(R"(<rect x="{}" y="{}" width="{}" height="{}"{}/>)", f(cx - h), f(cy - h),
                         f(2 * h), f(2 * h), common);
    }
    case Marker::triangle:
      return fmt::format(R"(<path d="M{} {}L{} {}L{} {}Z"{}/>)", f(cx), f(cy - r * 1.05), f(cx + r),
                         f(cy + r * 0.75), f(cx - r), f(cy + r * 0.75), common);
    case Marker::triangle_down:
      return fmt::format(R"(<path d="M{} {}L{} {}L{} {}Z"{}/>)", f(cx), f(cy + r * 1.05), f(cx + r),
                         f(cy - r * 0.75), f(cx - r), f(cy - r * 0.75), common);
    case Marker::diamond:
      return fmt::format(R"(<path d="M{} {}L{} {}L{} {}L{} {}Z"{}/>)", f(cx), f(cy - r * 1.1),
                         f(cx + r * 0.85), f(cy), f(cx), f(cy + r * 1.1), f(cx - r * 0.85), f(cy),
                         common);
    case Marker::cross: {
      const double h = r * 0.8;
      return fmt::format(
          R"(<path d="M{} {}L{} {}M{} {}L{} {}" fill="none" stroke="{}" stroke-width="2"/>)",
          f(cx - h), f(cy - h), f(cx + h), f(cy + h), f(cx - h), f(cy + h), f(cx + h), f(cy - h),
          col);
    }
    case Marker::plus:
      return fmt::format(
          R"(<path d="M{} {}L{} {}M{} {}L{} {}" fill="none" stroke="{}" stroke-width="2"/>)",
          f(cx - r), f(cy), f(cx + r), f(cy), f(cx), f(cy - r), f(cx), f(cy + r), col);
  }
  return {};
}

SvgPlot::SvgPlot(std::string id, double width, double height)
    : id_(std::move(id)), width_(width), height_(height) {}

std::string SvgPlot::render_legend(double width) const {
  const LegendLayout L = layout_legend(bands, series, width - 4, legend_columns);
  const double height = L.height() + 4;
  const std::string id = id_ + "-legend";
  std::string o = fmt::format(
      R"(<svg class="plot legend-strip" id="{0}" width="{1}" height="{2}" viewBox="0 0 {1} {2}" role="img" aria-label="legend" font-family="DejaVu Sans, Liberation Sans, Arial, sans-serif" font-size="{3}">)",
      html_escape(id), f(width), f(height), f(kTickFont));
  o += "<defs>" + hatch_defs(bands, id) + "</defs>\n";
  o += draw_legend(L, bands, id, 2, 2);
  return o + "</svg>";
}

std::string SvgPlot::render() const {
  const double left = 70, right = 18;
  const double avail = width_ - left - right;
  const LegendLayout legend =
      show_legend ? layout_legend(bands, series, avail, legend_columns) : LegendLayout{};
  const double top = 10 + legend.height();
  const double bottom = 46;
  const double px0 = left, px1 = width_ - right;
  const double py0 = height_ - bottom, py1 = top;  // y grows downwards

  // ---- data extents ----
  Extent ex, ey;
  for (const Series& s : series) {
    const std::size_t n = std::min(s.x.size(), s.y.size());
    for (std::size_t i = 0; i < n; ++i) {
      if (!std::isfinite(s.x[i]) || !std::isfinite(s.y[i])) continue;
      ex.add(s.x[i], x_axis.scale);
      ey.add(s.y[i], y_axis.scale);
      if (i < s.y_err.size() && std::isfinite(s.y_err[i])) {
        ey.add(s.y[i] + std::fabs(s.y_err[i]), y_axis.scale);
        ey.add(s.y[i] - std::fabs(s.y_err[i]), y_axis.scale);
      }
    }
  }
  for (const Band& b : bands) {
    const std::size_t n = std::min({b.x.size(), b.lo.size(), b.hi.size()});
    for (std::size_t i = 0; i < n; ++i) {
      ex.add(b.x[i], x_axis.scale);
      ey.add(b.lo[i], y_axis.scale);
      ey.add(b.hi[i], y_axis.scale);
    }
  }
  for (const HLine& h : hlines) ey.add(h.y, y_axis.scale);
  const Mapped mx = layout_axis(x_axis, ex, px0, px1);
  const Mapped my = layout_axis(y_axis, ey, py0, py1);
  auto ok = [&](double x, double y) { return mx.representable(x) && my.representable(y); };

  std::string o;
  o += fmt::format(
      R"(<svg class="plot" id="{0}" width="{1}" height="{2}" viewBox="0 0 {1} {2}" role="img" aria-labelledby="{0}-title" font-family="DejaVu Sans, Liberation Sans, Arial, sans-serif" font-size="{3}">)",
      html_escape(id_), f(width_), f(height_), f(kTickFont));
  o += "\n";
  o +=
      fmt::format(R"(<title id="{}-title">{}</title>)", html_escape(id_), html_escape(description));
  o += "\n<defs>";
  o += fmt::format(
      R"(<clipPath id="{}-clip"><rect x="{}" y="{}" width="{}" height="{}"/></clipPath>)",
      html_escape(id_), f(px0), f(py1), f(px1 - px0), f(py0 - py1));
  o += hatch_defs(bands, id_);
  o += "</defs>\n";

  // ---- frame background and grid ----
  o += fmt::format(R"(<rect x="{}" y="{}" width="{}" height="{}" fill="#ffffff" stroke="none"/>)",
                   f(px0), f(py1), f(px1 - px0), f(py0 - py1));
  o += "\n<g class=\"grid\" stroke=\"#e3e3e3\" stroke-width=\"1\">";
  for (const Tick& t : mx.ticks)
    if (t.major && !(mx.has_zero_slot && t.value == 0.0))
      o += fmt::format(R"(<line x1="{0}" y1="{1}" x2="{0}" y2="{2}"/>)", f(mx.map(t.value)), f(py0),
                       f(py1));
  for (const Tick& t : my.ticks)
    if (t.major && !(my.has_zero_slot && t.value == 0.0))
      o += fmt::format(R"(<line x1="{1}" y1="{0}" x2="{2}" y2="{0}"/>)", f(my.map(t.value)), f(px0),
                       f(px1));
  o += "</g>\n";

  // ---- bands ----
  o += fmt::format(R"~(<g class="bands" clip-path="url(#{}-clip)">)~", html_escape(id_));
  for (std::size_t bi = 0; bi < bands.size(); ++bi) {
    const Band& b = bands[bi];
    const std::size_t n = std::min({b.x.size(), b.lo.size(), b.hi.size()});
    std::string d, lo_edge, hi_edge;
    std::vector<std::size_t> idx;
    for (std::size_t i = 0; i < n; ++i)
      if (ok(b.x[i], b.lo[i]) && ok(b.x[i], b.hi[i])) idx.push_back(i);
    if (idx.size() < 2) continue;
    for (std::size_t k = 0; k < idx.size(); ++k) {
      const std::size_t i = idx[k];
      const std::string seg =
          fmt::format("{}{} {}", k == 0 ? "M" : "L", f(mx.map(b.x[i])), f(my.map(b.hi[i])));
      d += seg;
      hi_edge += seg;
    }
    for (std::size_t k = idx.size(); k-- > 0;) {
      const std::size_t i = idx[k];
      d += fmt::format("L{} {}", f(mx.map(b.x[i])), f(my.map(b.lo[i])));
    }
    for (std::size_t k = 0; k < idx.size(); ++k) {
      const std::size_t i = idx[k];
      lo_edge += fmt::format("{}{} {}", k == 0 ? "M" : "L", f(mx.map(b.x[i])), f(my.map(b.lo[i])));
    }
    d += "Z";
    const std::string fill =
        b.hatched ? fmt::format("url(#{}-hatch{})", html_escape(id_), bi) : html_escape(b.fill);
    o += fmt::format(R"(<path d="{}" fill="{}" fill-opacity="{}" stroke="none"/>)", d, fill,
                     f(b.opacity));
    if (!b.edge_color.empty())
      o += fmt::format(R"(<path d="{}{}" fill="none"{}/>)", hi_edge, lo_edge,
                       stroke_attrs(b.edge_color, 1.2, b.edge_dash));
  }
  o += "</g>\n";

  // ---- reference lines ----
  for (const HLine& h : hlines) {
    if (!my.representable(h.y)) continue;
    o += fmt::format(R"(<line x1="{}" y1="{}" x2="{}" y2="{}"{}/>)", f(px0), f(my.map(h.y)), f(px1),
                     f(my.map(h.y)), stroke_attrs(h.color, h.width, h.dash));
  }

  // ---- series: error bars, lines, markers ----
  o += fmt::format(R"~(<g class="series" clip-path="url(#{}-clip)">)~", html_escape(id_));
  for (const Series& s : series) {
    const std::size_t n = std::min(s.x.size(), s.y.size());
    if (!s.y_err.empty()) {
      std::string d;
      for (std::size_t i = 0; i < n && i < s.y_err.size(); ++i) {
        if (!ok(s.x[i], s.y[i]) || !std::isfinite(s.y_err[i])) continue;
        const double e = std::fabs(s.y_err[i]);
        if (!my.representable(s.y[i] - e) || !my.representable(s.y[i] + e)) continue;
        const double xp = mx.map(s.x[i]);
        const double ya = my.map(s.y[i] - e), yb = my.map(s.y[i] + e);
        d += fmt::format("M{0} {1}L{0} {2}M{3} {1}L{4} {1}M{3} {2}L{4} {2}", f(xp), f(ya), f(yb),
                         f(xp - 3), f(xp + 3));
      }
      if (!d.empty())
        o +=
            fmt::format(R"(<path d="{}" fill="none"{}/>)", d, stroke_attrs(s.style.color, 1.0, ""));
    }
    if (s.draw_line) {
      std::string d;
      bool pen = false;
      for (std::size_t i = 0; i < n; ++i) {
        if (!ok(s.x[i], s.y[i])) {
          pen = false;  // a gap in the data breaks the line
          continue;
        }
        d += fmt::format("{}{} {}", pen ? "L" : "M", f(mx.map(s.x[i])), f(my.map(s.y[i])));
        pen = true;
      }
      if (!d.empty())
        o += fmt::format(R"(<path d="{}" fill="none" stroke-linejoin="round"{}/>)", d,
                         stroke_attrs(s.style.color, s.style.line_width, s.style.dash));
    }
    if (s.style.marker != Marker::none) {
      for (std::size_t i = 0; i < n; ++i)
        if (ok(s.x[i], s.y[i]))
          o += svg_marker(s.style.marker, mx.map(s.x[i]), my.map(s.y[i]), s.style.marker_size,
                          s.style.color, s.style.marker_filled);
    }
    o += "\n";
  }
  o += "</g>\n";

  // ---- annotations ----
  for (const Annotation& a : annotations) {
    if (!ok(a.x, a.y)) continue;
    const double xp = mx.map(a.x), yp = my.map(a.y);
    if (a.ring)
      o += fmt::format(
          R"(<circle cx="{}" cy="{}" r="9" fill="none" stroke="#000000" stroke-width="1.6"/>)",
          f(xp), f(yp));
    // Put the text on the side with more room.
    const double tw = text_width(a.text, kTickFont);
    const bool left_side = xp + 14 + tw > px1;
    const double ty = yp - 12 < py1 + 12 ? yp + 22 : yp - 12;
    o += fmt::format(
        R"(<text x="{}" y="{}" text-anchor="{}" font-weight="bold" stroke="#ffffff" stroke-width="3" paint-order="stroke">{}</text>)",
        f(left_side ? xp - 12 : xp + 12), f(ty), left_side ? "end" : "start", html_escape(a.text));
  }

  // ---- frame, ticks, labels ----
  o += "\n<g class=\"axes\" stroke=\"#222222\" stroke-width=\"1.2\" fill=\"none\">";
  o += fmt::format(R"(<path d="M{} {}L{} {}L{} {}"/>)", f(px0), f(py1), f(px0), f(py0), f(px1),
                   f(py0));
  if (mx.has_zero_slot) {
    // Axis break between the "0" position and the log range: a gap with two slashes.
    o += fmt::format(R"(<rect x="{}" y="{}" width="6" height="4" fill="#ffffff" stroke="none"/>)",
                     f(mx.break_pos - 3), f(py0 - 2));
    o += fmt::format(R"(<path d="M{} {}L{} {}M{} {}L{} {}"/>)", f(mx.break_pos - 6), f(py0 + 5),
                     f(mx.break_pos - 1), f(py0 - 5), f(mx.break_pos + 1), f(py0 + 5),
                     f(mx.break_pos + 6), f(py0 - 5));
  }
  for (const Tick& t : mx.ticks) {
    const double xp = mx.map(t.value);
    o += fmt::format(R"(<line x1="{0}" y1="{1}" x2="{0}" y2="{2}"/>)", f(xp), f(py0),
                     f(py0 + (t.major ? 6 : 3)));
  }
  for (const Tick& t : my.ticks) {
    const double yp = my.map(t.value);
    o += fmt::format(R"(<line x1="{0}" y1="{1}" x2="{2}" y2="{1}"/>)", f(px0 - (t.major ? 6 : 3)),
                     f(yp), f(px0));
  }
  o += "</g>\n<g class=\"tick-labels\" fill=\"#111111\">";
  for (const Tick& t : mx.ticks)
    if (t.major && !t.label.empty())
      o += fmt::format(R"(<text x="{}" y="{}" text-anchor="middle">{}</text>)", f(mx.map(t.value)),
                       f(py0 + 8 + kTickFont), html_escape(t.label));
  for (const Tick& t : my.ticks)
    if (t.major && !t.label.empty())
      o += fmt::format(R"(<text x="{}" y="{}" text-anchor="end">{}</text>)", f(px0 - 9),
                       f(my.map(t.value) + kTickFont * 0.35), html_escape(t.label));
  o += "</g>\n";
  o += fmt::format(
      R"(<text class="axis-label" x="{}" y="{}" text-anchor="middle" font-size="{}">{}</text>)",
      f((px0 + px1) / 2), f(height_ - 6), f(kLabelFont),
      html_escape(with_multiplier(x_axis.label, mx)));
  o += "\n";
  o += fmt::format(
      R"~(<text class="axis-label" transform="translate({},{}) rotate(-90)" text-anchor="middle" font-size="{}">{}</text>)~",
      f(15), f((py0 + py1) / 2), f(kLabelFont), html_escape(with_multiplier(y_axis.label, my)));
  o += "\n";

  o += draw_legend(legend, bands, id_, px0, 10);
  o += "</svg>";
  return o;
}

}  // namespace ridgecal::report
