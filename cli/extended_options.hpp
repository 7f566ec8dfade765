// ridgecal CLI: the second-input and transform options shared by `fit` and
// `batch` (documented in docs/compensation-and-transforms.md).
#pragma once

#include <boost/program_options.hpp>

#include "ridgecal/calibration_csv.hpp"
#include "ridgecal/extended_fit.hpp"

namespace ridgecal::cli {

/// --aux, --aux-setpoint, --aux-step, --aux-degree, --reading-transform,
/// --reference-transform, --powers, --divider-resistor, --divider-position,
/// --divider-full-scale, as one group.
void add_extended_options(boost::program_options::options_description& d);

/// Reads the options added above into the CSV columns (aux, aux setpoint) and
/// the compensation settings. Throws UsageError naming the option, the value
/// and the rule (options that go together, an unknown transform, ...).
void parse_extended_options(const boost::program_options::variables_map& vm, CsvOptions& csv,
                            ExtendedOptions& comp);

}  // namespace ridgecal::cli
