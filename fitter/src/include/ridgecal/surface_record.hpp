// ridgecal: the record members of extended fits (see record.hpp, multi_input_fit.hpp).
//
// A record of an extended fit is a format-1 record in which
//   model{kind: "surface", degree (total), reading_degree, aux_degree, lambda,
//         intercept, basis, penalty, condition_number}
// replaces the polynomial's scaling and coefficient members (a reader that
// only knows kind "polynomial" fails on the missing model.scaling instead of
// evaluating a wrong curve), and these members are added:
//   compensation{transforms{divider{fixed_resistance, position, full_scale}|null,
//                           reading, reference, kelvin_offset, description},
//                inputs[{name, column, scaling{min, max, center, half_width}}],
//                aux_grouping, basis, term_rule, boundary_rule, evaluation,
//                terms[{i, j, coefficient}],
//                monomial_coefficients[k][l]   (v = sum m[k][l] t^k s^l, scaled),
//                power_coefficients[k][l]}     (v = sum a[k][l] u^k aux^l, documentation only)
//   input.columns.aux, input.columns.aux_setpoint (when given),
//   selection.aux_degrees[], selection.powers[], selection.grid[].aux_degree
//   (null: total degree) and .terms, split.setpoints[].aux, points[].aux.
// Records of plain 1-D fits contain none of these and are unchanged.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

#include "ridgecal/record.hpp"

namespace ridgecal {

/// Adds/replaces the members above in j (before the integrity digest).
/// Does nothing for a plain 1-D record.
void add_surface_members(nlohmann::json& j, const CalibrationRecord& rec);

/// True when j's model is an extended ("surface") model.
bool is_surface_record(const nlohmann::json& j);

/// Reads the members above into rec (model, selection and per-point extras).
/// Throws InputError naming the member on anything missing or invalid.
void read_surface_members(const nlohmann::json& j, CalibrationRecord& rec, const std::string& file);

/// After the common members are read: the per-cell, per-setpoint and per-point
/// extras (aux_degree, terms, aux) and the chosen cell.
void read_surface_extras(const nlohmann::json& j, Calibration& cal);

/// The descriptive members of `compensation`, from the model (the writer and
/// the report use these, so the text has one source): the term rule
/// (`powers`, `reading-only`, `total-degree`, `separate-limits`), how aux
/// levels are grouped, and which groups always stay in training.
std::string surface_term_rule(const Calibration& cal);
std::string surface_aux_grouping(const CalibrationRecord& rec);
std::string surface_boundary_rule(const Calibration& cal);

}  // namespace ridgecal
