// ridgecal internal: the model part of the record (record_model.cpp), for
// record_write.cpp, record_read.cpp and the report.
//
// The model is written from general_model(cal) and read back into one
// Model. docs/record-format.md documents two layouts of it, and
// is_extended(cal) picks one:
//   polynomial  model{kind: "polynomial", degree, lambda, intercept, basis,
//               penalty, scaling{x_min, x_max, center, half_width},
//               chebyshev_coefficients[], power_coefficients[], condition_number}
//   surface     model{kind: "surface", degree (total), reading_degree, aux_degree,
//               lambda, intercept, basis, penalty, condition_number} and
//               compensation{transforms, inputs[], aux_grouping, aux_step, basis,
//               term_rule, boundary_rule, evaluation, terms[],
//               monomial_coefficients, power_coefficients}
// The extended layout also adds per-row members (input.columns.aux and
// aux_setpoint, selection.aux_degrees, powers, grid[].aux_degree and terms,
// split.setpoints[].aux, points[].aux); record_write.cpp and record_read.cpp
// write and read them with the rows, as the flags of ModelParts say.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

#include "ridgecal/record.hpp"

namespace ridgecal {

/// The model part of a record as written: `model`, and `compensation` (null
/// in the polynomial layout), with the flags the row writers follow.
struct ModelParts {
  nlohmann::json model;
  nlohmann::json compensation;
  bool extended = false;  ///< the extended layout: per-cell and selection members
  bool has_aux = false;   ///< a second input: the rows carry `aux`
};

/// The model part of rec, from general_model(rec.calibration), in the layout
/// is_extended() picks.
ModelParts model_to_json(const CalibrationRecord& rec);

/// Reads `model` (and, in the extended layout, `compensation` and
/// input.columns.aux/aux_setpoint) of record j into rec. Throws InputError
/// naming the member on anything missing or invalid (`file` for messages).
void model_from_json(const nlohmann::json& j, CalibrationRecord& rec, const std::string& file);

/// The descriptive members of `compensation`, from the general model (the
/// writer and the report use these, so the text has one source): which terms
/// were candidates (`powers`, `reading-only`, `total-degree`,
/// `separate-limits`), how aux levels were grouped, and which groups always
/// stay in training.
std::string term_rule_text(const Model& m, const SelectionInfo& selection);
std::string aux_grouping_text(const Model& m, const CalibrationRecord& rec);
std::string boundary_rule_text(const Model& m);

}  // namespace ridgecal
