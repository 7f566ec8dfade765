// ridgecal internal: helpers shared by the diagnostic checks (diag_*.cpp).
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include "ridgecal/diagnostics.hpp"

namespace ridgecal::detail {

inline constexpr double kDiagNaN = std::numeric_limits<double>::quiet_NaN();

/// "3, 5, 9 and 4 more": the first max_shown line numbers.
std::string line_list(const std::vector<std::size_t>& lines, std::size_t max_shown = 8);

Warning make_warning(DiagnosticCode c, std::string msg, std::vector<std::size_t> lines = {},
                     double value = kDiagNaN);

}  // namespace ridgecal::detail
