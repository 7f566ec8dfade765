// Grouping by setpoint, the test hold-out and the folds.
#define BOOST_TEST_MODULE grouped_split
#include <boost/test/unit_test.hpp>
#include <set>

#include "ridgecal/errors.hpp"
#include "ridgecal/grouped_split.hpp"
#include "test_support.hpp"

using namespace ridgecal;

BOOST_AUTO_TEST_CASE(groups_sorted_by_reading) {
  const Dataset ds = test::synthetic_run([](double x) { return -x; }, 0.0, 10.0, 6, 3, 0.0, 1);
  const auto g = group_by_setpoint(ds);
  BOOST_TEST(g.size() == 6u);
  for (std::size_t i = 1; i < g.size(); ++i) BOOST_TEST(g[i].mean_reading > g[i - 1].mean_reading);
  for (const auto& grp : g) BOOST_TEST(grp.rows.size() == 3u);
}

BOOST_AUTO_TEST_CASE(test_setpoints_are_interior_spread_and_reproducible) {
  const Dataset ds = test::synthetic_run([](double x) { return x; }, 0.0, 100.0, 20, 4, 0.0, 3);
  const auto g = group_by_setpoint(ds);
  SplitOptions opt;
  opt.seed = 11;
  const Split a = make_split(g, opt, 2), b = make_split(g, opt, 2);
  BOOST_TEST((a.role == b.role));
  BOOST_TEST((a.fold == b.fold));
  std::vector<std::size_t> test_idx;
  for (std::size_t i = 0; i < g.size(); ++i)
    if (a.role[i] == SetRole::Test) test_idx.push_back(i);
  BOOST_TEST(test_idx.size() == 4u);  // 20 % of 20
  BOOST_TEST((a.role.front() == SetRole::Train));
  BOOST_TEST((a.role.back() == SetRole::Train));
  // One per stratum of the 18 interior setpoints: not bunched at one end.
  BOOST_TEST(test_idx.front() <= 5u);
  BOOST_TEST(test_idx.back() >= 14u);
  opt.seed = 12;
  const Split c = make_split(g, opt, 2);
  BOOST_TEST((c.role != a.role || c.fold != a.fold));
}

BOOST_AUTO_TEST_CASE(folds_cover_interior_training_setpoints_once) {
  const Dataset ds = test::synthetic_run([](double x) { return x; }, 0.0, 100.0, 30, 2, 0.0, 3);
  const auto g = group_by_setpoint(ds);
  const Split s = make_split(g, SplitOptions{}, 2);
  BOOST_TEST(to_string(s.scheme) == "k-fold");
  BOOST_TEST(s.n_folds == 5);
  std::vector<int> per_fold(5, 0);
  int ends = 0;
  for (std::size_t i = 0; i < g.size(); ++i) {
    if (s.role[i] == SetRole::Test)
      BOOST_TEST(s.fold[i] == -1);
    else if (s.fold[i] < 0)
      ++ends;
    else
      ++per_fold[static_cast<std::size_t>(s.fold[i])];
  }
  BOOST_TEST(ends == 2);
  for (int c : per_fold) BOOST_TEST((c >= 4 && c <= 5));
}

BOOST_AUTO_TEST_CASE(few_setpoints_use_leave_one_setpoint_out) {
  const Dataset ds = test::synthetic_run([](double x) { return x; }, 0.0, 100.0, 8, 3, 0.0, 3);
  const auto g = group_by_setpoint(ds);
  const Split s = make_split(g, SplitOptions{}, 2);
  BOOST_TEST(to_string(s.scheme) == "leave-one-setpoint-out");
  std::set<int> folds;
  for (std::size_t i = 0; i < g.size(); ++i)
    if (s.fold[i] >= 0) BOOST_TEST(folds.insert(s.fold[i]).second);
  BOOST_TEST(static_cast<int>(folds.size()) == s.n_folds);
}

BOOST_AUTO_TEST_CASE(role_column_names_the_test_set) {
  Dataset ds = test::synthetic_run([](double x) { return x; }, 0.0, 100.0, 6, 2, 0.0, 3);
  for (auto& ob : ds.rows) ob.role = (ob.setpoint == "S03") ? UserRole::Check : UserRole::Fit;
  const auto g = group_by_setpoint(ds);
  const Split s = make_split(g, SplitOptions{}, 2);
  BOOST_TEST(s.user_named_test);
  for (std::size_t i = 0; i < g.size(); ++i)
    BOOST_TEST((s.role[i] == SetRole::Test) == (g[i].id == "S03"));
}

BOOST_AUTO_TEST_CASE(mixed_roles_in_one_setpoint_are_rejected) {
  Dataset ds = test::synthetic_run([](double x) { return x; }, 0.0, 100.0, 4, 2, 0.0, 3);
  for (auto& ob : ds.rows) ob.role = UserRole::Fit;
  ds.rows[1].role = UserRole::Check;
  BOOST_CHECK_THROW(group_by_setpoint(ds), InputError);
}

BOOST_AUTO_TEST_CASE(enum_spellings_round_trip) {
  for (SetRole r : {SetRole::Train, SetRole::Test})
    BOOST_TEST((set_role_from_string(to_string(r)) == r));
  for (FoldScheme f : {FoldScheme::KFold, FoldScheme::LeaveOneSetpointOut})
    BOOST_TEST((fold_scheme_from_string(to_string(f)) == f));
  BOOST_CHECK_THROW(set_role_from_string("Train"), std::invalid_argument);
}
