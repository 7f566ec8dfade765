// ridgecal report (internal): everything the report needs from the fitted
// model, in one place, read from general_model(cal) (the one-input polynomial
// is its N = 1 case); `extended` (is_extended) picks what the page shows. No
// other report file touches Calibration::model.
#pragma once

#include <string>
#include <vector>

#include "ridgecal/record.hpp"

namespace ridgecal::report::detail {

/// One input of the model: its calibrated range and scaling t = (u - center) / half_width.
struct InputRange {
  double min = 0.0, max = 0.0, center = 0.0, half_width = 1.0;
};

/// One term of an extended model: coefficient of B_i(t) * B_j(s).
struct TermView {
  int i = 0, j = 0;
  double coefficient = 0.0;
};

/// The model as the report describes it.
struct ModelView {
  bool extended =
      false;  ///< transforms, an aux input or restricted powers (record model.kind "surface")
  bool has_aux = false;           ///< a second input
  bool identity = true;           ///< no transforms: the fitted output is the reference itself
  std::string chain;              ///< the transform chain in words (extended models)
  std::string basis;              ///< `chebyshev` or `power`
  int degree = 0;                 ///< polynomial degree; extended: total degree
  int reading_degree = 0;         ///< extended: largest power of the reading
  int aux_degree = 0;             ///< extended with aux: largest power of the aux input
  InputRange reading;             ///< 1-D: the reading; extended: the transformed reading u
  InputRange aux;                 ///< extended with aux
  std::vector<double> chebyshev;  ///< 1-D: Chebyshev coefficients c_k of T_k(t)
  std::vector<double> power;      ///< 1-D: power coefficients a_k of x^k (derived)
  std::vector<TermView> terms;    ///< the fitted terms (1-D: (0,0)..(d,0))
  std::string
      term_rule;  ///< extended: which terms were candidates (record's compensation.term_rule)
  std::string aux_grouping;   ///< extended: how aux levels were grouped
  std::string boundary_rule;  ///< extended: which groups always stay in training
  Model model;                ///< general_model(cal): what model_value evaluates
};

ModelView describe_model(const CalibrationRecord& rec);

/// The calibrated value at a reading (and aux value), in reference units,
/// through the whole transform chain; NaN outside the transforms' domain.
double model_value(const ModelView& m, double reading, double aux);

}  // namespace ridgecal::report::detail
