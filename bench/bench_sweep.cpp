// Sweep throughput: the library's run_sweep over the operating speed of the tall demo at its own
// grid (10 x 48, 476 zones), supportable-biomass search off, no mixing; 1 and 2 OpenMP threads.
// Each point is a whole case: reading with overrides, network, hydrodynamics, gas routing, the
// steady field, the single-zone answer beside it, summary values and constraint checks.
#include <benchmark/benchmark.h>

#include <atomic>
#include <stdexcept>

#include "bench_cases.hpp"
#include "solver/linalg/memory_policy.hpp"
#include "solver/studies/sweep.hpp"

namespace oxystrat::bench {
namespace {

void BM_Sweep(benchmark::State& state) {
  const auto base = load_case("tall-3rushton.toml");
  const int points = 40;
  const auto plan = full_factorial({SweepAxis{"operation.speed", 60.0, 140.0, points, "rpm", ""}});
  SweepOptions opts;
  opts.supportable_biomass = false;
  opts.threads = static_cast<int>(state.range(0));
  const std::vector<bool> done(plan.points.size(), false);
  int failed = 0;
  for (auto _ : state) {
    failed = 0;
    run_sweep(base, {}, plan, opts, done, [&](size_t, const PointResult& r) { failed += r.ok ? 0 : 1; });
  }
  if (failed > 0) state.SkipWithError("some sweep points failed");
  state.SetItemsProcessed(state.iterations() * points);  // items/s = cases/s
  state.counters["zones"] = 476;
  state.counters["threads"] = static_cast<double>(opts.threads);
}
BENCHMARK(BM_Sweep)->Arg(1)->Arg(2)->Unit(benchmark::kMillisecond)->UseRealTime()->MinTime(3.0);

}  // namespace
}  // namespace oxystrat::bench

// The command's memory policy (freed blocks kept for reuse), so that the figure is the command's.
int main(int argc, char** argv) {
  oxystrat::retain_freed_memory();
  benchmark::Initialize(&argc, argv);
  if (benchmark::ReportUnrecognizedArguments(argc, argv)) return 1;
  benchmark::RunSpecifiedBenchmarks();
  benchmark::Shutdown();
  return 0;
}
