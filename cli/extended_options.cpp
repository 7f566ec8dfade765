#include "extended_options.hpp"

#include <string>
#include <vector>

#include "cli_common.hpp"

namespace po = boost::program_options;

namespace ridgecal::cli {

void add_extended_options(po::options_description& d) {
  // clang-format off
  po::options_description x("second input and linearising transforms (docs/compensation-and-transforms.md)");
  x.add_options()
    ("aux", po::value<std::string>(), "column of a second input (e.g. the sensor's temperature): fit a polynomial in (reading, aux)")
    ("aux-setpoint", po::value<std::string>(), "column naming the aux setpoint of each row (default: the aux value rounded to --aux-step)")
    ("aux-step", po::value<double>()->default_value(1.0), "without --aux-setpoint: rows whose aux values round to the same multiple of this step share an aux level")
    ("aux-degree", po::value<std::string>(), "candidate aux degree limits, e.g. 0..3 (terms i<=degree, j<=aux degree); default: total degree i+j<=degree")
    ("reading-transform", po::value<std::string>()->default_value("none"), "none, or ln (fit in ln of the reading or of the divider resistance, e.g. NTC)")
    ("reference-transform", po::value<std::string>()->default_value("none"), "none, or reciprocal-kelvin (fit 1/(reference+273.15), reference in degC; Steinhart-Hart)")
    ("powers", po::value<std::string>(), "allowed powers of the (transformed) reading, e.g. 0,1,3: plain-power basis, no degree selection")
    ("divider-resistor", po::value<double>(), "reading is ADC counts of a divider with this fixed resistor (ohms): convert to the sensor's resistance")
    ("divider-position", po::value<std::string>()->default_value("sensor-low"), "sensor-low (sensor to ground, resistor to the supply) or sensor-high")
    ("divider-full-scale", po::value<double>(), "ADC counts that correspond to the divider supply (e.g. 4095)");
  d.add(x);
  // clang-format on
}

namespace {
std::vector<int> parse_int_list(const std::string& option, const std::string& text) {
  try {
    return parse_degree_list(text);
  } catch (const UsageError& e) {
    std::string m = e.what();
    if (m.rfind("--degrees", 0) == 0) m = option + m.substr(9);
    throw UsageError(m);
  }
}

template <class F>
auto parse_choice(const std::string& option, const std::string& text, F parse) {
  try {
    return parse(text);
  } catch (const std::invalid_argument& e) {
    throw UsageError(option + ": " + e.what());
  }
}

}  // namespace

void parse_extended_options(const po::variables_map& vm, CsvOptions& csv, ExtendedOptions& c) {
  if (vm.count("aux")) {
    c.aux = true;
    csv.aux_column = vm["aux"].as<std::string>();
  }
  if (vm.count("aux-setpoint")) csv.aux_setpoint_column = vm["aux-setpoint"].as<std::string>();
  c.aux_step = vm["aux-step"].as<double>();
  if (vm.count("aux-degree"))
    c.aux_degrees = parse_int_list("--aux-degree", vm["aux-degree"].as<std::string>());
  c.transforms.reading =
      parse_choice("--reading-transform", vm["reading-transform"].as<std::string>(),
                   reading_transform_from_string);
  c.transforms.reference =
      parse_choice("--reference-transform", vm["reference-transform"].as<std::string>(),
                   reference_transform_from_string);
  if (vm.count("powers")) c.powers = parse_int_list("--powers", vm["powers"].as<std::string>());
  if (vm.count("divider-resistor") != vm.count("divider-full-scale"))
    throw UsageError(
        "--divider-resistor and --divider-full-scale go together: give both to convert counts to "
        "resistance");
  if (vm.count("divider-resistor")) {
    c.transforms.divider.enabled = true;
    c.transforms.divider.fixed_resistance = vm["divider-resistor"].as<double>();
    c.transforms.divider.full_scale = vm["divider-full-scale"].as<double>();
    c.transforms.divider.position =
        parse_choice("--divider-position", vm["divider-position"].as<std::string>(),
                     divider_position_from_string);
  } else if (!vm["divider-position"].defaulted()) {
    throw UsageError("--divider-position needs --divider-resistor and --divider-full-scale");
  }
  if (!c.aux && (vm.count("aux-setpoint") || !vm["aux-step"].defaulted()))
    throw UsageError("--aux-setpoint and --aux-step need --aux COL");
}

}  // namespace ridgecal::cli
