// ridgecal (internal): the one fit behind fit_calibration (calibration.hpp)
// and fit_extended (extended_fit.hpp).
//
// Every fit is the same pipeline: check the values, group and split
// (grouped_split.hpp, the boundary rule), scale the inputs, form the candidate
// term lists, score the (candidate, lambda) grid by grouped CV (fit_grid.hpp),
// choose the cell (choose_cell), fit it on all training points and assemble
// the results. The one-input polynomial is the case "reading-only Chebyshev
// terms, identity transforms, no aux". Every result is written to the one
// Calibration::model.
#pragma once

#include <Eigen/Dense>
#include <string>
#include <vector>

#include "ridgecal/calibration.hpp"
#include "ridgecal/extended_fit.hpp"
#include "ridgecal/model.hpp"

namespace ridgecal {

/// How the candidate term lists are formed (see extended_fit.hpp).
enum class TermRule {
  ReadingOnly,     ///< i <= d, j = 0
  TotalDegree,     ///< i + j <= d
  SeparateLimits,  ///< i <= d, j <= a
  Powers,          ///< i in the allowed powers, j <= a (power basis)
};
TermRule term_rule(const ExtendedOptions& comp);

/// True when the candidates of the rule, in increasing degree, are nested:
/// each term list (with the (0,0) term left out) is the leading part of the
/// next one's. Those share one factorisation (the nested fast path).
bool nested(TermRule rule);

/// One candidate model: its degree (the largest reading power for Powers),
/// aux degree limit (-1: none or total degree) and terms, (0,0) first when present.
struct Candidate {
  int degree = 0;
  int aux_degree = -1;
  std::vector<Term> terms;
};

/// The candidates of the rule for the sorted, unique degrees / aux degrees /
/// powers, in grid order (degree-major, then aux degree).
std::vector<Candidate> candidate_models(TermRule rule, const std::vector<int>& degrees,
                                        const std::vector<int>& aux_degrees,
                                        const std::vector<int>& powers);

/// The columns of a candidate's design: its terms without (0,0).
std::vector<Term> design_terms(const std::vector<Term>& terms);

/// The design of the columns `cols` (design_terms) at the scaled inputs
/// (ts[r], ss[r]) of every row, in the basis: column q holds
/// B_{i_q}(t) * B_{j_q}(s). Through the origin (origin_row not null) each
/// column minus origin_row[q], its value at reading 0.
Eigen::MatrixXd make_design(const std::vector<Term>& cols, ModelBasis basis,
                            const std::vector<double>& ts, const std::vector<double>& ss,
                            const double* origin_row);

/// "degree 3" or "degree 3 / aux degree 1", for notes.
std::string candidate_name(const Candidate& c);

/// The one fit. Preconditions: fit.validate() and comp.validate(fit) are
/// empty. Throws InputError as fit_extended; fails (status) as documented
/// for fit_calibration.
FitOutcome fit_model(const Dataset& data, const FitOptions& fit, const ExtendedOptions& comp);

}  // namespace ridgecal
