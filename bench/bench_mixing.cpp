// theta95 of the 60 m3 demo (cases/tall-3rushton.toml at its own grid): network, hydrodynamics
// and the implicit tracer integration until every zone stays within +-5 %.
#include <benchmark/benchmark.h>

#include "bench_cases.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/flow/mixing_time.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat::bench {
namespace {

void BM_Theta95Demo(benchmark::State& state) {
  const auto loaded = load_case("tall-3rushton.toml");
  MixingResult m;
  int zones = 0;
  for (auto _ : state) {
    const auto net = build_zone_geometry(loaded.data);
    const auto hydro = compute_hydrodynamics(loaded.data, net);
    m = tracer_mixing_time(net, hydro, {});
    zones = net.size();
  }
  if (!m.reached) state.SkipWithError("theta95 not reached");
  state.counters["zones"] = zones;
  state.counters["theta95_s"] = m.theta_s;
  state.counters["steps"] = m.stats.steps;
  state.counters["factorisations"] = m.stats.factorisations;
}
BENCHMARK(BM_Theta95Demo)->Unit(benchmark::kMillisecond)->UseRealTime();

}  // namespace
}  // namespace oxystrat::bench

BENCHMARK_MAIN();
