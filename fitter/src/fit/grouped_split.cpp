#include "ridgecal/grouped_split.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <map>
#include <stdexcept>

#include "ridgecal/errors.hpp"

namespace ridgecal {

std::string to_string(SetRole r) {
  return r == SetRole::Train ? "train" : "test";
}
SetRole set_role_from_string(const std::string& s) {
  if (s == "train") return SetRole::Train;
  if (s == "test") return SetRole::Test;
  throw std::invalid_argument("set role must be 'train' or 'test', got '" + s + "'");
}

std::string to_string(FoldScheme s) {
  return s == FoldScheme::KFold ? "k-fold" : "leave-one-setpoint-out";
}
FoldScheme fold_scheme_from_string(const std::string& s) {
  if (s == "k-fold") return FoldScheme::KFold;
  if (s == "leave-one-setpoint-out") return FoldScheme::LeaveOneSetpointOut;
  throw std::invalid_argument("fold scheme must be 'k-fold' or 'leave-one-setpoint-out', got '" +
                              s + "'");
}

std::string SplitOptions::validate() const {
  if (!(test_fraction >= 0.0 && test_fraction <= 0.5))
    return fmt::format("test_fraction is {}; it must be between 0 and 0.5", test_fraction);
  if (folds < 2) return fmt::format("folds is {}; it must be at least 2", folds);
  if (loso_below < 0) return fmt::format("loso_below is {}; it must not be negative", loso_below);
  return {};
}

std::uint64_t SplitRng::next() {
  std::uint64_t z = (state_ += 0x9E3779B97F4A7C15ULL);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

std::uint64_t SplitRng::below(std::uint64_t n) {
  assert(n > 0);
  // Rejection sampling removes modulo bias.
  const std::uint64_t limit = ~std::uint64_t{0} - (~std::uint64_t{0} % n);
  std::uint64_t v;
  do v = next();
  while (v >= limit);
  return v % n;
}

namespace {

// The key of a row's aux level: the aux setpoint label, or the aux value
// rounded to the nearest multiple of the step.
std::string aux_key(const Observation& ob, double step) {
  if (!ob.aux_setpoint.empty()) return ob.aux_setpoint;
  const double v = std::round(ob.aux / step) * step + 0.0;  // + 0.0: no "-0"
  return fmt::format("{}", v);
}

// Ranks the aux levels of the groups by their mean aux value (over rows).
void rank_levels(std::vector<SetpointGroup>& groups) {
  std::map<std::string, std::pair<long double, std::size_t>> level_sum;
  for (const SetpointGroup& g : groups) {
    auto& ls = level_sum[g.aux_level];
    ls.first += static_cast<long double>(g.mean_aux) * static_cast<long double>(g.rows.size());
    ls.second += g.rows.size();
  }
  std::vector<std::pair<double, std::string>> levels;
  for (const auto& [name, s] : level_sum)
    levels.emplace_back(static_cast<double>(s.first / static_cast<long double>(s.second)), name);
  std::sort(levels.begin(), levels.end());
  std::map<std::string, int> rank;
  for (std::size_t i = 0; i < levels.size(); ++i) rank[levels[i].second] = static_cast<int>(i);
  for (SetpointGroup& g : groups) g.level = rank[g.aux_level];
}

// Which of `members` (indices into groups, in group order) lie on the
// boundary of the range they span (see grouped_split.hpp).
std::vector<bool> on_boundary(const std::vector<SetpointGroup>& groups,
                              const std::vector<std::size_t>& members) {
  std::vector<bool> edge(groups.size(), false);
  if (members.empty()) return edge;
  int lo = groups[members.front()].level, hi = lo;
  for (std::size_t g : members) {
    lo = std::min(lo, groups[g].level);
    hi = std::max(hi, groups[g].level);
  }
  const bool levels = lo >= 0;  // an aux input: its lowest and highest levels are edge
  for (std::size_t m = 0; m < members.size(); ++m) {
    const int lv = groups[members[m]].level;
    const bool first = m == 0 || groups[members[m - 1]].level != lv;
    const bool last = m + 1 == members.size() || groups[members[m + 1]].level != lv;
    edge[members[m]] = first || last || (levels && (lv == lo || lv == hi));
  }
  return edge;
}

}  // namespace

std::vector<SetpointGroup> group_by_setpoint(const Dataset& ds, const AuxGrouping& aux) {
  std::map<std::string, std::size_t> index;
  std::vector<SetpointGroup> groups;
  for (std::size_t i = 0; i < ds.rows.size(); ++i) {
    const Observation& ob = ds.rows[i];
    const std::string level = aux.aux ? aux_key(ob, aux.aux_step) : std::string();
    const std::string id = aux.aux ? ob.setpoint + "|" + level : ob.setpoint;
    auto [it, inserted] = index.emplace(id, groups.size());
    if (inserted) {
      SetpointGroup g;
      g.id = id;
      g.user_role = ob.role;
      g.aux_level = level;
      groups.push_back(std::move(g));
    }
    SetpointGroup& g = groups[it->second];
    if (g.user_role != ob.role)
      throw InputError(
          ds.file, ob.line,
          fmt::format("setpoint '{}' has rows with different roles ('{}' here, '{}' on line {})",
                      g.id, to_string(ob.role), to_string(g.user_role),
                      ds.rows[g.rows.front()].line),
          "repeated readings at one setpoint must share one role");
    g.rows.push_back(i);
  }
  for (SetpointGroup& g : groups) {
    double sr = 0.0, sf = 0.0, sa = 0.0;
    for (std::size_t i : g.rows) {
      sr += ds.rows[i].reading;
      sf += ds.rows[i].reference;
      if (aux.aux) sa += ds.rows[i].aux;
    }
    const double n = static_cast<double>(g.rows.size());
    g.mean_reading = sr / n;
    g.mean_reference = sf / n;
    if (aux.aux) g.mean_aux = sa / n;
  }
  if (aux.aux) rank_levels(groups);
  std::sort(groups.begin(), groups.end(), [](const SetpointGroup& a, const SetpointGroup& b) {
    if (a.level != b.level) return a.level < b.level;
    if (a.mean_reading != b.mean_reading) return a.mean_reading < b.mean_reading;
    return a.id < b.id;
  });
  return groups;
}

std::vector<std::size_t> stratified_pick(const std::vector<std::size_t>& candidates,
                                         std::size_t count, SplitRng& rng) {
  std::vector<std::size_t> out;
  const std::size_t n = candidates.size();
  assert(count <= n);
  for (std::size_t s = 0; s < count; ++s) {
    const std::size_t lo = s * n / count, hi = (s + 1) * n / count;
    assert(hi > lo);
    out.push_back(candidates[lo + rng.below(hi - lo)]);
  }
  return out;
}

void assign_folds(const std::vector<std::size_t>& candidates, const SplitOptions& options,
                  SplitRng& rng, Split& sp) {
  if (static_cast<int>(candidates.size()) < options.loso_below ||
      static_cast<int>(candidates.size()) <= options.folds) {
    sp.scheme = FoldScheme::LeaveOneSetpointOut;
    sp.n_folds = static_cast<int>(candidates.size());
    for (std::size_t i = 0; i < candidates.size(); ++i)
      sp.fold[candidates[i]] = static_cast<int>(i);
    return;
  }
  sp.scheme = FoldScheme::KFold;
  sp.n_folds = options.folds;
  const std::size_t K = static_cast<std::size_t>(options.folds);
  for (std::size_t start = 0; start < candidates.size(); start += K) {
    std::vector<int> labels(K);
    for (std::size_t k = 0; k < K; ++k) labels[k] = static_cast<int>(k);
    for (std::size_t k = K; k > 1; --k) std::swap(labels[k - 1], labels[rng.below(k)]);
    for (std::size_t k = 0; k < K && start + k < candidates.size(); ++k)
      sp.fold[candidates[start + k]] = labels[k];
  }
}

Split make_split(const std::vector<SetpointGroup>& groups, const SplitOptions& options,
                 std::size_t min_train_groups) {
  assert(options.validate().empty());
  const std::size_t n = groups.size();
  Split sp;
  sp.role.assign(n, SetRole::Train);
  sp.fold.assign(n, -1);
  SplitRng rng(options.seed);

  std::vector<std::size_t> all(n);
  for (std::size_t g = 0; g < n; ++g) all[g] = g;
  const bool user_roles = std::any_of(groups.begin(), groups.end(), [](const SetpointGroup& g) {
    return g.user_role != UserRole::Unspecified;
  });
  if (user_roles) {
    sp.user_named_test = true;
    for (std::size_t g = 0; g < n; ++g)
      if (groups[g].user_role == UserRole::Check) sp.role[g] = SetRole::Test;
  } else {
    const std::vector<bool> edge = on_boundary(groups, all);
    std::vector<std::size_t> interior;
    for (std::size_t g = 0; g < n; ++g)
      if (!edge[g]) interior.push_back(g);
    std::size_t want =
        static_cast<std::size_t>(std::llround(options.test_fraction * static_cast<double>(n)));
    const std::size_t room = n > min_train_groups ? n - min_train_groups : 0;
    want = std::min({want, room, interior.size()});
    for (std::size_t g : stratified_pick(interior, want, rng)) sp.role[g] = SetRole::Test;
  }

  // Folds: training groups off the boundary of the training groups validate.
  std::vector<std::size_t> train;
  for (std::size_t g = 0; g < n; ++g)
    if (sp.role[g] == SetRole::Train) train.push_back(g);
  const std::vector<bool> edge = on_boundary(groups, train);
  std::vector<std::size_t> candidates;
  for (std::size_t g : train)
    if (!edge[g]) candidates.push_back(g);
  if (candidates.empty()) return sp;  // no interior training groups: no CV possible
  assign_folds(candidates, options, rng, sp);
  return sp;
}

}  // namespace ridgecal
