// ridgecal: grouping repeated readings by setpoint, holding out a test set,
// and forming cross-validation folds, always by whole setpoints.
//
// Boundary rule: a calibration is valid only inside its range, so the groups
// on the edge of the calibrated range always stay in training (and in every
// fold's training part); test and validation groups are drawn from inside the
// range, spread over it by stratified sampling. The edge is:
//   * one input: the groups with the smallest and the largest mean reading
//     (the end rule);
//   * with an aux input: every group of the lowest and of the highest aux
//     level (by the level's mean aux value), and in every aux level the groups
//     with the smallest and the largest mean reading of that level. On a
//     rectangular setpoint x aux-level grid these are the cells on its edge.
// The end rule is the case "no aux levels" of the boundary rule: one function
// (make_split) serves both.
#pragma once

#include <cstdint>
#include <limits>
#include <string>
#include <vector>

#include "ridgecal/calibration_csv.hpp"

namespace ridgecal {

/// Rows that share a setpoint (and, with an aux input, an aux level). Never
/// split between training and test, nor between the folds of cross-validation.
struct SetpointGroup {
  std::string id;  ///< setpoint label (or the reference value as text); with aux "setpoint|level"
  std::vector<std::size_t> rows;  ///< indices into Dataset::rows, in file order
  double mean_reading = 0.0;
  double mean_reference = 0.0;
  UserRole user_role = UserRole::Unspecified;                  ///< from the role column, if any
  double mean_aux = std::numeric_limits<double>::quiet_NaN();  ///< with aux only
  std::string
      aux_level;   ///< the aux level's key (aux setpoint label or rounded value); "" without aux
  int level = -1;  ///< rank of the aux level by its mean aux value; -1 without aux
};

/// How rows are grouped in the aux input (none by default).
struct AuxGrouping {
  bool aux = false;       ///< group by aux level as well (rows carry Observation::aux)
  double aux_step = 1.0;  ///< without an aux setpoint label: aux rounded to a multiple of this, > 0
};

/// Groups rows by setpoint (and aux level), ordered by aux level, then by
/// increasing mean reading (ties by id). Means are accumulated in long double.
/// Throws InputError when one group mixes `fit` and `check` roles.
std::vector<SetpointGroup> group_by_setpoint(const Dataset& ds, const AuxGrouping& aux = {});

enum class SetRole { Train, Test };
std::string to_string(SetRole r);
SetRole set_role_from_string(
    const std::string& s);  ///< `train`, `test`; throws std::invalid_argument

enum class FoldScheme { KFold, LeaveOneSetpointOut };
std::string to_string(FoldScheme s);
FoldScheme fold_scheme_from_string(const std::string& s);  ///< `k-fold`, `leave-one-setpoint-out`

struct SplitOptions {
  double test_fraction = 0.2;  ///< share of setpoints held out for the final test, in [0, 0.5]
  std::uint64_t seed = 1;      ///< makes the split reproducible
  int folds = 5;               ///< K for grouped K-fold CV, >= 2
  int loso_below = 10;  ///< fewer interior training setpoints than this: leave-one-setpoint-out
  std::string validate() const;
};

/// Where every setpoint went. `fold[g]` is -1 for test setpoints and for the
/// end setpoints (always trained on, never validated), else 0..n_folds-1.
struct Split {
  std::vector<SetRole> role;  ///< per group
  std::vector<int> fold;      ///< per group
  int n_folds = 0;
  FoldScheme scheme = FoldScheme::KFold;
  bool user_named_test = false;  ///< test set from the role column
};

/// Holds out the test setpoints and assigns the folds (the boundary rule above).
/// If any group has a user role, `check` groups form the test set and
/// `test_fraction` is ignored. Otherwise round(test_fraction * n) interior
/// groups (at most n - min_train_groups) are drawn, one per stratum of the
/// interior groups. Folds are drawn the same way among the training groups
/// off the boundary of the training groups.
/// Precondition: groups sorted as group_by_setpoint returns them.
Split make_split(const std::vector<SetpointGroup>& groups, const SplitOptions& options,
                 std::size_t min_train_groups);

/// splitmix64: small, well-mixed, identical on every platform (unlike the
/// standard library's distributions).
class SplitRng {
 public:
  explicit SplitRng(std::uint64_t seed) : state_(seed) {}
  std::uint64_t next();
  /// Uniform integer in [0, n). Precondition: n > 0.
  std::uint64_t below(std::uint64_t n);

 private:
  std::uint64_t state_;
};

/// Picks `count` of the candidate positions, one from each of `count` equal
/// strata of the (ordered) candidates, so the picks spread over the range.
/// Precondition: count <= candidates.size().
std::vector<std::size_t> stratified_pick(const std::vector<std::size_t>& candidates,
                                         std::size_t count, SplitRng& rng);

/// Fills sp.scheme, sp.n_folds and sp.fold[g] for the groups that may
/// validate (`candidates`, ordered along the range): leave-one-out when there
/// are fewer than options.loso_below of them or no more than options.folds;
/// else K-fold, a random permutation of the K labels in each consecutive
/// block of K candidates, so every fold spans the whole range.
void assign_folds(const std::vector<std::size_t>& candidates, const SplitOptions& options,
                  SplitRng& rng, Split& sp);

}  // namespace ridgecal
