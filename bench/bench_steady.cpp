// Network build (geometry + hydrodynamics + gas routing) and the steady O2/CO2 solve of the tall
// demo at about 2000 zones, and the growth of the steady solve's cost from 1e4 to 1e5 zones (1e6
// on request: bench/run --huge). Sizes are set with grid.radial / grid.axial overrides.
#include <benchmark/benchmark.h>

#include <string>
#include <vector>

#include "bench_cases.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/linalg/memory_policy.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "mesh/zone_network.hpp"
#include "solver/linalg/zone_block_solver.hpp"

namespace oxystrat::bench {
namespace {

const char* const kDemo = "tall-3rushton.toml";

struct Network {
  ZoneNetwork net;
  Hydrodynamics hydro;
  GasRouting routing;
};

Network build(const Case& c) {
  Network n;
  n.net = build_zone_geometry(c);
  n.hydro = compute_hydrodynamics(c, n.net);
  n.routing = route_gas(c, n.net, n.hydro);
  return n;
}

// Geometry, hydrodynamics and gas routing: everything before the oxygen solve.
void BM_NetworkBuild(benchmark::State& state) {
  const auto loaded = load_case(kDemo, grid_for_zones(static_cast<double>(state.range(0))));
  int zones = 0;
  for (auto _ : state) {
    auto n = build(loaded.data);
    zones = n.net.size();
    benchmark::DoNotOptimize(n.routing.unit_inventory.data());
  }
  state.counters["zones"] = zones;
}
BENCHMARK(BM_NetworkBuild)->Arg(2000)->Unit(benchmark::kMillisecond)->UseRealTime();

// The coupled steady solve (outer holdup/kLa loop around damped Newton), cold start each time;
// `structured` false forces the general sparse LU of the whole Jacobian (the previous solver).
void steady_solve(benchmark::State& state, bool structured, const SolverOptions& linear = {}) {
  const auto loaded = load_case(kDemo, grid_for_zones(static_cast<double>(state.range(0))));
  const auto n = build(loaded.data);
  const OxygenContext ctx{loaded.data, n.net, n.hydro, n.routing};
  NewtonOptions newton;
  newton.structured = structured;
  newton.linear = linear;
  OxygenField f;
  for (auto _ : state) {
    f = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, newton);
    benchmark::DoNotOptimize(f.do_min);
  }
  state.counters["zones"] = n.net.size();
  state.counters["newton"] = f.newton_iterations;
  state.counters["outer"] = f.outer_iterations;
  state.counters["linear"] = f.linear_iterations;
  // Nested cold start: the solves on the coarser grids behind the fine one, all levels.
  state.counters["coarse_levels"] = f.coarse_levels;
  state.counters["coarse_newton"] = f.coarse_newton_iterations;
  state.counters["coarse_linear"] = f.coarse_linear_iterations;
  state.counters["do_min_mol_m3"] = f.do_min;
}
void BM_SteadySolve(benchmark::State& state) { steady_solve(state, true); }
void BM_SteadySolveGeneralLu(benchmark::State& state) { steady_solve(state, false); }
BENCHMARK(BM_SteadySolve)->Arg(500)->Arg(2000)->Unit(benchmark::kMillisecond)->UseRealTime();
BENCHMARK(BM_SteadySolveGeneralLu)->Arg(2000)->Unit(benchmark::kMillisecond)->UseRealTime();
// The choice of the liquid blocks' preconditioner by size: range(1) = 0 exact scalar LU at any
// size, 1 aggregation multigrid at any size (SolverOptions::multigrid_from_zones is the crossover).
void BM_SteadySolveByPreconditioner(benchmark::State& state) {
  SolverOptions linear;
  linear.multigrid_from_zones = state.range(1) == 1 ? 1 : 1 << 30;
  steady_solve(state, true, linear);
}
BENCHMARK(BM_SteadySolveByPreconditioner)
    ->ArgsProduct({{500, 1000, 2000, 5000, 10000, 20000}, {0, 1}})
    ->Unit(benchmark::kMillisecond)->UseRealTime()->MinTime(1.0);
BENCHMARK(BM_SteadySolve)
    ->Name("BM_SteadySolveScaling")
    ->Arg(10000)->Arg(20000)->Arg(50000)->Arg(100000)->Arg(200000)
    ->Unit(benchmark::kMillisecond)->UseRealTime()->MinTime(2.0);

}  // namespace
}  // namespace oxystrat::bench

// `--huge` adds one solve of a million zones (minutes and gigabytes: asked for explicitly).
int main(int argc, char** argv) {
  oxystrat::retain_freed_memory();  // as the command does
  std::vector<char*> args;
  bool huge = false;
  for (int i = 0; i < argc; ++i) {
    if (std::string(argv[i]) == "--huge") {
      huge = true;
    } else {
      args.push_back(argv[i]);
    }
  }
  if (huge) {
    benchmark::RegisterBenchmark("BM_SteadySolveHuge", oxystrat::bench::BM_SteadySolve)
        ->Arg(1000000)->Unit(benchmark::kSecond)->UseRealTime()->Iterations(1);
  }
  int n = static_cast<int>(args.size());
  benchmark::Initialize(&n, args.data());
  if (benchmark::ReportUnrecognizedArguments(n, args.data())) return 1;
  benchmark::RunSpecifiedBenchmarks();
  benchmark::Shutdown();
  return 0;
}
