#include "ridgecal/report/axis_ticks.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "ridgecal/report/number_format.hpp"

namespace ridgecal::report {

double nice_step(double raw_step) {
  if (!(raw_step > 0.0) || !std::isfinite(raw_step)) return 1.0;
  const double exp10 = std::floor(std::log10(raw_step));
  const double base = std::pow(10.0, exp10);
  const double f = raw_step / base;
  // Tolerance so that e.g. 0.2000000001 still counts as 2.
  double m = 10.0;
  if (f <= 1.0 + 1e-9)
    m = 1.0;
  else if (f <= 2.0 + 1e-9)
    m = 2.0;
  else if (f <= 5.0 + 1e-9)
    m = 5.0;
  return m * base;
}

std::string linear_tick_label(double v, double step) {
  if (!std::isfinite(v)) return kNotAvailable;
  if (std::fabs(v) < step * 1e-6) v = 0.0;
  const double a = std::fabs(v);
  if (a != 0.0 && (a >= 1e6 || a < 1e-4)) return format_sig(v, 3);
  int decimals = 0;
  if (step > 0.0 && std::isfinite(step)) {
    decimals = std::max(0, -static_cast<int>(std::floor(std::log10(step) + 1e-9)));
    // A step of 2.5 never occurs (1-2-5 only), but 0.5, 0.25... need no more than this.
  }
  return format_fixed(v, decimals);
}

LinearAxis linear_axis(double data_min, double data_max, int target) {
  if (!std::isfinite(data_min) || !std::isfinite(data_max)) data_min = 0.0, data_max = 1.0;
  if (data_min > data_max) std::swap(data_min, data_max);
  if (data_max - data_min <= std::fabs(data_max) * 1e-12) {
    const double pad = data_max == 0.0 ? 1.0 : std::fabs(data_max) * 0.1;
    data_min -= pad;
    data_max += pad;
  }
  if (target < 2) target = 2;
  LinearAxis ax;
  ax.step = nice_step((data_max - data_min) / target);
  ax.lo = std::floor(data_min / ax.step + 1e-9) * ax.step;
  ax.hi = std::ceil(data_max / ax.step - 1e-9) * ax.step;
  const long n = std::lround((ax.hi - ax.lo) / ax.step);
  for (long i = 0; i <= n; ++i) {
    const double v = ax.lo + static_cast<double>(i) * ax.step;
    ax.ticks.push_back({v, linear_tick_label(v, ax.step), true});
  }
  return ax;
}

std::string power_of_ten_label(int exponent) {
  static const char* const kSup[] = {"\u2070", "\u00B9", "\u00B2", "\u00B3", "\u2074",
                                     "\u2075", "\u2076", "\u2077", "\u2078", "\u2079"};
  std::string s = "10";
  if (exponent < 0) s += "\u207B";  // superscript minus
  const std::string digits = std::to_string(exponent < 0 ? -exponent : exponent);
  for (char c : digits) s += kSup[c - '0'];
  return s;
}

LogAxis log_axis(double data_min, double data_max, double pad) {
  if (!(data_min > 0.0) || !std::isfinite(data_min)) data_min = 1e-6;
  if (!(data_max > 0.0) || !std::isfinite(data_max)) data_max = data_min * 10.0;
  if (data_min > data_max) std::swap(data_min, data_max);
  double llo = std::log10(data_min), lhi = std::log10(data_max);
  const double margin = std::max(std::log10(1.15), pad * (lhi - llo));
  llo -= margin;
  lhi += margin;
  LogAxis ax;
  ax.lo = std::pow(10.0, llo);
  ax.hi = std::pow(10.0, lhi);
  const double span = lhi - llo;
  const int label_every = span <= 7.5 ? 1 : (span <= 15 ? 2 : 3);
  const int e0 = static_cast<int>(std::floor(llo)), e1 = static_cast<int>(std::ceil(lhi));
  for (int e = e0; e <= e1; ++e) {
    const double d = std::pow(10.0, e);
    for (int m = 1; m <= 9; ++m) {
      const double v = m * d;
      if (v < ax.lo * (1 - 1e-12) || v > ax.hi * (1 + 1e-12)) continue;
      if (m == 1) {
        const bool labelled = ((e % label_every) + label_every) % label_every == 0;
        ax.ticks.push_back({v, labelled ? power_of_ten_label(e) : std::string(), true});
      } else if (span <= 2.0 && (m == 2 || m == 5)) {
        ax.ticks.push_back({v, format_sig(v, 2), true});
      } else if (span <= 0.6) {
        ax.ticks.push_back({v, format_sig(v, 2), true});
      } else if (span <= 7.5) {
        ax.ticks.push_back({v, std::string(), false});
      }
    }
  }
  return ax;
}

}  // namespace ridgecal::report
