// ridgecal kernel benchmarks (Google Benchmark).
//
// Workload of issue 6: synthetic 48-row units (12 setpoints x 4 repeats),
// degrees 1..8, lambda 0 plus 30 log-spaced values, grouped 5-fold CV.
// Data come from batch_synthetic.hpp (deterministic). The units are prepared
// before timing; a timed iteration is one complete fit_calibration of one unit
// (selection, final fit, metrics), cycling over 256 distinct units.
#include <benchmark/benchmark.h>

#include <vector>

#include "ridgecal/batch_synthetic.hpp"
#include "ridgecal/calibration.hpp"
#include "ridgecal/ridge_path.hpp"

using namespace ridgecal;

namespace {

FitOptions workload_options() {
  FitOptions o;
  o.degrees = {1, 2, 3, 4, 5, 6, 7, 8};
  o.lambdas = default_lambda_grid();
  o.split.folds = 5;
  o.split.loso_below = 0;  // grouped 5-fold CV even with 8 interior training setpoints
  return o;
}

const std::vector<Dataset>& units48() {
  static const std::vector<Dataset> units = [] {
    std::vector<Dataset> v;
    SyntheticUnitOptions so;
    for (std::uint64_t i = 0; i < 256; ++i) v.push_back(synthetic_unit(i, so));
    return v;
  }();
  return units;
}

const Dataset& unit2000() {
  static const Dataset ds = [] {
    SyntheticUnitOptions so;
    so.setpoints = 100;
    so.repeats = 20;
    return synthetic_unit(7, so);
  }();
  return ds;
}

// One unit per iteration; with ->Threads(2) each thread fits its own units
// (the per-thread rate is the per-core figure, the sum the 2-job figure).
void BM_FitUnit48(benchmark::State& state) {
  const auto& units = units48();
  const FitOptions opt = workload_options();
  std::size_t i = static_cast<std::size_t>(state.thread_index()) * 97;
  for (auto _ : state) {
    FitOutcome out = fit_calibration(units[i % units.size()], opt);
    benchmark::DoNotOptimize(out.calibration.lambda);
    ++i;
  }
  state.SetItemsProcessed(state.iterations());
}
BENCHMARK(BM_FitUnit48)->Unit(benchmark::kMicrosecond)->UseRealTime();
BENCHMARK(BM_FitUnit48)->Unit(benchmark::kMicrosecond)->Threads(2)->UseRealTime();

// One 2,000-row fit (100 setpoints x 20 repeats) with the same options.
void BM_Fit2000(benchmark::State& state) {
  const Dataset& ds = unit2000();
  const FitOptions opt = workload_options();
  for (auto _ : state) {
    FitOutcome out = fit_calibration(ds, opt);
    benchmark::DoNotOptimize(out.calibration.lambda);
  }
  state.SetItemsProcessed(state.iterations());
}
BENCHMARK(BM_Fit2000)->Unit(benchmark::kMillisecond)->UseRealTime();

// The reference kernel: one RidgePath (thin SVD) of a 38 x 8 design and 31 predictions.
void BM_RidgePathSvd38x8(benchmark::State& state) {
  Eigen::MatrixXd X(38, 8);
  Eigen::VectorXd y(38);
  for (int i = 0; i < 38; ++i) {
    const double t = -1.0 + 2.0 * i / 37.0;
    double tkm1 = 1.0, tk = t;
    for (int k = 0; k < 8; ++k) {
      X(i, k) = tk;
      const double next = 2.0 * t * tk - tkm1;
      tkm1 = tk;
      tk = next;
    }
    y(i) = t * t * t + 0.1 * t;
  }
  const auto grid = default_lambda_grid();
  Eigen::VectorXd pred;
  for (auto _ : state) {
    RidgePath path(X, y);
    const Eigen::MatrixXd W = path.project(X.topRows(8));
    for (double l : grid) path.predict(W, l, pred);
    benchmark::DoNotOptimize(pred.data());
  }
}
BENCHMARK(BM_RidgePathSvd38x8)->Unit(benchmark::kMicrosecond);

}  // namespace

BENCHMARK_MAIN();
