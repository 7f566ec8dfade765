// ridgecal report: axis ranges and "nice" tick positions for the SVG plots.
#pragma once

#include <string>
#include <vector>

namespace ridgecal::report {

struct Tick {
  double value = 0.0;  ///< data value (for a log axis: the value itself, not its log)
  std::string label;   ///< text drawn at the tick (may contain Unicode superscripts)
  bool major = true;   ///< minor ticks get no label and a shorter mark
};

/// Smallest step of the form {1, 2, 5} x 10^k that is >= raw_step (> 0).
double nice_step(double raw_step);

/// A linear axis: range [lo, hi] extended outward to whole multiples of step.
struct LinearAxis {
  double lo = 0.0, hi = 1.0, step = 0.2;
  std::vector<Tick> ticks;
};

/// Ticks with a 1-2-5 step giving about `target` intervals over [data_min,
/// data_max]; the range is widened to whole steps. A degenerate or non-finite
/// range is widened to something drawable. Labels use just enough decimals to
/// tell neighbouring ticks apart.
LinearAxis linear_axis(double data_min, double data_max, int target = 6);

/// A log10 axis over [data_min, data_max] (both > 0), padded by `pad` of the
/// span on each side (in log space; at least a factor 1.15). Major ticks
/// (labelled 10^k with a superscript exponent) at decades; when the range spans
/// at most two decades also at 2 and 5 x 10^k, labelled plainly; minor ticks at
/// the other multiples when the span is at most 7 decades. Over many decades the
/// labels are thinned to every 2nd or 3rd decade.
struct LogAxis {
  double lo = 1.0, hi = 10.0;  ///< the padded range
  std::vector<Tick> ticks;
};
LogAxis log_axis(double data_min, double data_max, double pad = 0.04);

/// "10" followed by the exponent in Unicode superscript digits, e.g. 10⁻³.
std::string power_of_ten_label(int exponent);

/// Label for a linear tick at value v with the given step: as many decimals as
/// the step needs, no exponent for |v| in [1e-4, 1e6), never "-0".
std::string linear_tick_label(double v, double step);

}  // namespace ridgecal::report
