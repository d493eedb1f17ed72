// One Newton step's linear solve of the steady O2/CO2 problem (the Jacobian at the converged
// field of the tall demo), with the sparse solvers Eigen offers: the information behind the
// choice of the steady solver's linear algebra (RESULTS.md, "Profile").
#include <benchmark/benchmark.h>

#include <Eigen/IterativeLinearSolvers>
#ifdef OXYSTRAT_BENCH_KLU
#include <Eigen/KLUSupport>
#include <Eigen/UmfPackSupport>
#endif
#include <Eigen/OrderingMethods>
#include <Eigen/SparseLU>
#include <map>
#include <memory>

#include "bench_cases.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "peer_problem.hpp"
#include "solver/flow/transport.hpp"
#include "solver/linalg/zone_block_solver.hpp"

namespace oxystrat::bench {
namespace {

struct Step {
  Eigen::SparseMatrix<double> jac;
  std::vector<Eigen::Triplet<double>> triplets;
  Eigen::VectorXd rhs;
  int zones = 0;
};

// The Jacobian at the converged field, and the residual at the cold start as right-hand side.
std::shared_ptr<const Step> step_for(int zones_wanted) {
  static std::map<int, std::shared_ptr<const Step>> cache;
  if (auto it = cache.find(zones_wanted); it != cache.end()) return it->second;
  const auto loaded = load_case("tall-3rushton.toml", grid_for_zones(zones_wanted));
  const Case& c = loaded.data;
  const auto net = build_zone_geometry(c);
  const auto hydro = compute_hydrodynamics(c, net);
  const auto routing = route_gas(c, net, hydro);
  const auto field = solve_oxygen_field({c, net, hydro, routing});
  const auto in = peer_inputs(c, net, hydro, routing, field.pressure_pa, field.kla_1_s);
  const auto transport = transport_matrix(net, hydro.face_flow, hydro.face_exchange);
  const OxygenProblem p(net, routing, transport, in.coeff, in.uptake, in.inlet_o2_mol_s, in.inlet_co2_mol_s);
  auto s = std::make_shared<Step>();
  std::vector<Eigen::Triplet<double>> t;
  p.jacobian(field.state, t);
  s->jac.resize(p.size(), p.size());
  s->jac.setFromTriplets(t.begin(), t.end());
  s->jac.makeCompressed();
  s->triplets = t;
  p.residual(cold_start(c, net, routing, in), s->rhs);
  s->zones = net.size();
  cache[zones_wanted] = s;
  return s;
}

// What oxystrat uses: flexible GMRES on the whole system, preconditioned by a block factorisation
// per species pair with scalar LU blocks (solver/linalg/zone_block_solver.hpp), to 1e-10 of
// |rhs| (at 1e5 zones 1e-12 is below what GMRES reaches in double precision on this system; a
// Newton step never asks for less than a tenth of the Newton tolerance in absolute terms). range(1) = 1: preconditioner built inside the timed loop (a
// step with a fresh factorisation); 0: built once, only the Jacobian taken in and the solve
// (a step reusing it, as most steps do). range(2) = 0: exact scalar LU blocks; 1: aggregation
// multigrid blocks (solver/scalar_multigrid.hpp), whatever the size.
void BM_ZoneBlock(benchmark::State& state) {
  const auto s = step_for(static_cast<int>(state.range(0)));
  const bool fresh = state.range(1) == 1;
  SolverOptions linear;
  linear.multigrid_from_zones = state.range(2) == 1 ? 1 : 1 << 30;
  const ZoneLayout layout{s->zones};
  ZoneBlockSolver z;
  z.set_options(linear);
  if (!z.accept(layout, s->triplets) || !z.refresh_preconditioner()) {
    state.SkipWithError("the Jacobian was refused");
    return;
  }
  Eigen::VectorXd dx;
  bool ok = true;
  for (auto _ : state) {
    ok = z.accept(layout, s->triplets) && (!fresh || z.refresh_preconditioner()) && z.solve(s->rhs, dx, 1e-10) && ok;
    benchmark::DoNotOptimize(dx.data());
  }
  if (!ok) state.SkipWithError("GMRES did not reach 1e-10");
  state.counters["zones"] = s->zones;
  state.counters["nnz_A"] = static_cast<double>(s->jac.nonZeros());
  state.counters["krylov_iterations"] = z.last_iterations();
}
BENCHMARK(BM_ZoneBlock)->ArgsProduct({{2000, 10000, 100000}, {1, 0}, {0, 1}})->Unit(benchmark::kMillisecond);

template <typename Ordering>
void BM_SparseLU(benchmark::State& state) {
  const auto s = step_for(static_cast<int>(state.range(0)));
  Eigen::SparseLU<Eigen::SparseMatrix<double>, Ordering> lu;
  for (auto _ : state) {
    lu.analyzePattern(s->jac);
    lu.factorize(s->jac);
    Eigen::VectorXd dx = lu.solve(s->rhs);
    benchmark::DoNotOptimize(dx.data());
  }
  state.counters["zones"] = s->zones;
  state.counters["nnz_A"] = static_cast<double>(s->jac.nonZeros());
  state.counters["nnz_LU"] = static_cast<double>(lu.nnzL() + lu.nnzU());
}
BENCHMARK(BM_SparseLU<Eigen::COLAMDOrdering<int>>)->Arg(2000)->Arg(10000)->Arg(100000)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_SparseLU<Eigen::AMDOrdering<int>>)->Arg(2000)->Arg(10000)->Unit(benchmark::kMillisecond);

// Threshold pivoting: prefer the diagonal unless it is below `thresh` times the column maximum.
void BM_SparseLU_Threshold(benchmark::State& state) {
  const auto s = step_for(static_cast<int>(state.range(0)));
  Eigen::SparseLU<Eigen::SparseMatrix<double>, Eigen::COLAMDOrdering<int>> lu;
  lu.setPivotThreshold(static_cast<double>(state.range(1)) * 1e-3);
  for (auto _ : state) {
    lu.analyzePattern(s->jac);
    lu.factorize(s->jac);
    Eigen::VectorXd dx = lu.solve(s->rhs);
    benchmark::DoNotOptimize(dx.data());
  }
  state.counters["zones"] = s->zones;
  state.counters["nnz_LU"] = static_cast<double>(lu.nnzL() + lu.nnzU());
  state.counters["resid"] = (s->jac * lu.solve(s->rhs) - s->rhs).norm() / s->rhs.norm();
}
BENCHMARK(BM_SparseLU_Threshold)->Args({2000, 100})->Args({2000, 1})->Args({10000, 1})->Unit(benchmark::kMillisecond);

#ifdef OXYSTRAT_BENCH_KLU
void BM_KLU(benchmark::State& state) {
  const auto s = step_for(static_cast<int>(state.range(0)));
  Eigen::KLU<Eigen::SparseMatrix<double>> lu;
  for (auto _ : state) {
    lu.compute(s->jac);
    Eigen::VectorXd dx = lu.solve(s->rhs);
    benchmark::DoNotOptimize(dx.data());
  }
  state.counters["zones"] = s->zones;
  state.counters["resid"] = (s->jac * lu.solve(s->rhs) - s->rhs).norm() / s->rhs.norm();
}
BENCHMARK(BM_KLU)->Arg(2000)->Arg(10000)->Unit(benchmark::kMillisecond);
void BM_KLU_refactor(benchmark::State& state) {
  const auto s = step_for(static_cast<int>(state.range(0)));
  Eigen::KLU<Eigen::SparseMatrix<double>> lu;
  lu.analyzePattern(s->jac);
  for (auto _ : state) {
    lu.factorize(s->jac);
    Eigen::VectorXd dx = lu.solve(s->rhs);
    benchmark::DoNotOptimize(dx.data());
  }
  state.counters["zones"] = s->zones;
}
BENCHMARK(BM_KLU_refactor)->Arg(2000)->Arg(10000)->Unit(benchmark::kMillisecond);
void BM_UMFPACK(benchmark::State& state) {
  const auto s = step_for(static_cast<int>(state.range(0)));
  Eigen::UmfPackLU<Eigen::SparseMatrix<double>> lu;
  for (auto _ : state) {
    lu.compute(s->jac);
    Eigen::VectorXd dx = lu.solve(s->rhs);
    benchmark::DoNotOptimize(dx.data());
  }
  state.counters["zones"] = s->zones;
  state.counters["resid"] = (s->jac * lu.solve(s->rhs) - s->rhs).norm() / s->rhs.norm();
}
BENCHMARK(BM_UMFPACK)->Arg(2000)->Arg(10000)->Unit(benchmark::kMillisecond);
#endif

// Iterative: BiCGSTAB preconditioned by an incomplete LU with threshold, to 1e-12 relative.
void BM_BiCGSTAB_ILUT(benchmark::State& state) {
  const auto s = step_for(static_cast<int>(state.range(0)));
  Eigen::BiCGSTAB<Eigen::SparseMatrix<double>, Eigen::IncompleteLUT<double>> solver;
  solver.setTolerance(1e-12);
  for (auto _ : state) {
    solver.compute(s->jac);
    Eigen::VectorXd dx = solver.solve(s->rhs);
    benchmark::DoNotOptimize(dx.data());
  }
  state.counters["zones"] = s->zones;
  state.counters["krylov_iterations"] = static_cast<double>(solver.iterations());
  state.counters["rel_error"] = solver.error();
}
BENCHMARK(BM_BiCGSTAB_ILUT)->Arg(2000)->Arg(10000)->Arg(100000)->Unit(benchmark::kMillisecond);

}  // namespace
}  // namespace oxystrat::bench

BENCHMARK_MAIN();
