// ridgecal: grouping repeated readings by setpoint, holding out a test set,
// and forming cross-validation folds, always by whole setpoints.
//
// Range rule: a calibration is valid only inside its range, so the setpoints
// with the smallest and largest mean reading always stay in training (and in
// every fold's training part). Test and validation setpoints are drawn from
// inside the range, spread over it by stratified sampling.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "ridgecal/calibration_csv.hpp"

namespace ridgecal {

/// Rows that share a setpoint. Never split between training and test, nor
/// between the folds of cross-validation.
struct SetpointGroup {
  std::string id;                 ///< setpoint label (or the reference value as text)
  std::vector<std::size_t> rows;  ///< indices into Dataset::rows, in file order
  double mean_reading = 0.0;
  double mean_reference = 0.0;
  UserRole user_role = UserRole::Unspecified;  ///< from the role column, if any
};

/// Groups rows by setpoint, in order of increasing mean reading (ties by id).
/// Throws InputError when one setpoint mixes `fit` and `check` roles.
std::vector<SetpointGroup> group_by_setpoint(const Dataset& ds);

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

/// Holds out the test setpoints and assigns the folds.
/// If any group has a user role, `check` groups form the test set and
/// `test_fraction` is ignored. Otherwise round(test_fraction * n) interior
/// groups (at most n - min_train_groups) are drawn, one per stratum of the
/// interior range. Folds are drawn the same way among interior training groups.
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
/// block of K candidates, so every fold spans the whole range. The one fold
/// rule of make_split and of the extended fits (multi_input_fit.hpp).
void assign_folds(const std::vector<std::size_t>& candidates, const SplitOptions& options,
                  SplitRng& rng, Split& sp);

}  // namespace ridgecal
