// Lifelines on the 60 m3 demo (cases/tall-3rushton.toml at its own grid): cells followed for one
// hour of flow through the steady field, with the DO field and the impeller regimes recorded as
// `oxystrat lifelines` does. Target (issue 7): 1e5 lifelines over one hour < 5 s on 2 cores.
// The network, flow and DO field are computed once, outside the timing.
#include <benchmark/benchmark.h>

#include <optional>

#include "bench_cases.hpp"
#include "solver/oxygen/case_run.hpp"
#include "solver/studies/lifelines.hpp"

namespace oxystrat::bench {
namespace {

struct Demo {
  CaseRun run;
  std::vector<LifelineField> fields;
  LifelineRegimes regimes;
  Demo() : run(run_case(load_case("tall-3rushton.toml").data, {false, false})) {
    const Case c = load_case("tall-3rushton.toml").data;
    if (run.field) fields.push_back(do_lifeline_field(run.field->do_mol_m3, c.culture.critical_do_mol_m3));
    regimes = impeller_regimes(run.net);
  }
};

const Demo& demo() {
  static const Demo d;
  return d;
}

// Arguments: cells, threads.
void BM_LifelinesDemoHour(benchmark::State& state) {
  const Demo& d = demo();
  LifelineOptions o;
  o.cells = static_cast<int>(state.range(0));
  o.threads = static_cast<int>(state.range(1));
  o.duration_s = 3600.0;
  o.min_excursion_s = 1.0;  // the long-excursion lists on as well: the costlier path
  long moves = 0;
  for (auto _ : state) {
    const auto r = simulate_lifelines(d.run.net, d.run.hydro, d.fields, d.regimes, o);
    moves = r.jumps;
    benchmark::DoNotOptimize(r.occupancy.data());
  }
  state.counters["zones"] = d.run.net.size();
  state.counters["moves"] = static_cast<double>(moves);
  state.counters["ns_per_move"] = benchmark::Counter(static_cast<double>(moves) * state.iterations() * 1e-9,
                                                     benchmark::Counter::kIsRate | benchmark::Counter::kInvert);
}
BENCHMARK(BM_LifelinesDemoHour)
    ->Args({10000, 1})
    ->Args({10000, 2})
    ->Args({100000, 2})
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();

}  // namespace
}  // namespace oxystrat::bench

BENCHMARK_MAIN();
