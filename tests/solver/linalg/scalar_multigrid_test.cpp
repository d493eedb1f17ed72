// Aggregation multigrid for the scalar liquid blocks: as a stationary iteration it converges to
// the exact LU answer at a rate that holds under grid refinement, and as the zone block solver's
// preconditioner it gives accurate Newton steps and the field of the exact-LU preconditioner.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <omp.h>

#include "case_fixtures.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "solver/linalg/scalar_multigrid.hpp"
#include "solver/flow/transport.hpp"
#include "solver/linalg/zone_block_solver.hpp"

namespace oxystrat {
namespace {

using fixtures::Chain;

// L - diag(T) of the reference vessel's ungassed flow at this grid: a liquid block of the
// balances, with a transfer diagonal small enough (1e-2 1/s x volume at most 2e-2) that transport
// dominates. (Ungassed, so that the matrices do not follow the gas model.)
SparseMatrix liquid_block(int radial, int axial) {
  Case c = fixtures::gassed_vessel(radial, axial);
  c.operation.gas_flow_normal_m3_s = 0.0;
  const Chain ch(c);
  SparseMatrix a = transport_matrix(ch.net, ch.hydro.face_flow, ch.hydro.face_exchange);
  for (int k = 0; k < a.rows(); ++k) a.coeffRef(k, k) -= 1e-2 * ch.net.volume[k] * (1.0 + std::sin(k));
  a.makeCompressed();
  return a;
}

// Stationary iteration x <- x + M^-1 (b - A x) to |b - A x| <= tol |b|; the count, 1000 if not.
int stationary(const SparseMatrix& a, const ScalarMultigrid& mg, const Eigen::VectorXd& b, Eigen::VectorXd& x, double tol) {
  x.setZero(b.size());
  for (int it = 1; it <= 200; ++it) {
    Eigen::VectorXd r = b - a * x;
    mg.solve(r);
    x += r;
    if ((b - a * x).norm() <= tol * b.norm()) return it;
  }
  return 1000;
}

// The large-network path (multigrid, coarsened to a few dozen rows) on a small network.
NewtonOptions multigrid_newton() {
  NewtonOptions n;
  n.linear.multigrid_from_zones = 1;
  n.linear.multigrid_coarsest_size = 30;
  return n;
}

SolverOptions coarsest(int size) {
  SolverOptions o;
  o.multigrid_coarsest_size = size;
  return o;
}

TEST(ScalarMultigrid, ConvergesToTheLuAnswerAtARateThatHoldsUnderRefinement) {
  std::vector<int> iterations;
  for (int f : {1, 2, 4, 8}) {  // 90 to 5638 zones
    const SparseMatrix a = liquid_block(6 * f, 15 * f);
    Eigen::VectorXd b(a.rows());
    for (int i = 0; i < b.size(); ++i) b[i] = std::cos(1.3 * i);
    ScalarMultigrid mg;
    ASSERT_TRUE(mg.setup(a, {}, coarsest(20)));  // 3 to 6 levels on these grids
    EXPECT_GE(mg.levels(), f == 1 ? 2 : 4);
    // O(N) memory: operators and ILU factors of all levels about 2.8x A (Galerkin levels add
    // about 40 %, the factors double it; measured 2.6-2.8x), far below a 2-D LU's growing fill.
    EXPECT_LT(mg.nonzeros(), 3.5 * a.nonZeros());
    ScalarLu lu;
    ASSERT_TRUE(lu.factorize(a));
    Eigen::VectorXd exact = b, x;
    lu.solve(exact);
    iterations.push_back(stationary(a, mg, b, x, 1e-10));
    // A residual of 1e-10 |b| bounds the error by 1e-10 x cond(A); measured 3e-10 to 1e-9 of
    // |x|, so 1e-7 leaves two orders for other compilers while still pinning the LU answer.
    EXPECT_LE((x - exact).norm(), 1e-7 * exact.norm()) << a.rows();
  }
  // Measured 13, 19, 33, 34 iterations on 3 to 6 levels (0.5 to 0.51 per cycle at depth): the
  // count settles instead of growing with the depth, as it did for a W-cycle with Gauss-Seidel
  // (19 -> 79). At most 50, and at most 1.25x between the two finest grids, leave room for other
  // compilers and still fail a method whose rate degrades level by level.
  for (int its : iterations) EXPECT_LE(its, 50);
  EXPECT_LE(iterations[3], 1.25 * iterations[2]);
}

TEST(ScalarMultigrid, EightfoldCoarseningKeepsTheLuAnswerWithFewerLevels) {
  const SparseMatrix a = liquid_block(48, 120);  // 5638 zones
  Eigen::VectorXd b(a.rows());
  for (int i = 0; i < b.size(); ++i) b[i] = std::cos(1.3 * i);
  ScalarLu lu;
  ASSERT_TRUE(lu.factorize(a));
  Eigen::VectorXd exact = b;
  lu.solve(exact);
  SolverOptions fourfold = coarsest(20), eightfold = coarsest(20);
  eightfold.multigrid_eightfold_from_rows = 1;  // every level
  ScalarMultigrid mg4, mg8;
  ASSERT_TRUE(mg4.setup(a, {}, fourfold));
  ASSERT_TRUE(mg8.setup(a, {}, eightfold));
  EXPECT_LT(mg8.levels(), mg4.levels());
  EXPECT_LT(mg8.nonzeros(), mg4.nonzeros());  // coarse levels of an eighth, not a quarter
  Eigen::VectorXd x4, x8;
  const int its4 = stationary(a, mg4, b, x4, 1e-10), its8 = stationary(a, mg8, b, x8, 1e-10);
  EXPECT_LE((x8 - exact).norm(), 1e-7 * exact.norm());  // as in the refinement test above
  // Larger aggregates approximate the smooth errors less well: more cycles, but boundedly so
  // (measured 35 and 61 here with every level eightfold; at a million zones, where only the
  // finest level is, about a tenth more Krylov iterations, bench/notes.md). 2x is the limit
  // beyond which the cheaper cycle would no longer pay.
  RecordProperty("cycles_fourfold", its4);
  RecordProperty("cycles_eightfold", its8);
  EXPECT_LE(its8, 2 * its4);
}

TEST(ScalarMultigrid, RefusesABlockThatIsNotOfMMatrixSign) {
  SparseMatrix a = liquid_block(6, 15);
  a.coeffRef(10, 10) = 1.0;  // a positive diagonal in L - T: -A then has a negative one
  ScalarMultigrid mg;
  EXPECT_FALSE(mg.setup(a, {}, coarsest(20)));  // not the LU alone
}

TEST(ScalarMultigrid, AsPreconditionerGivesTheFieldOfTheExactScalarLu) {
  // The tall demo (476 zones) with the multigrid forced on and coarsened to a few dozen rows,
  // so that every level is exercised; against the exact-LU preconditioner of the default.
  const Case c = read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml").data;
  const Chain ch(c);
  const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
  const auto exact = solve_oxygen_field(ctx);
  const OxygenField mg = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, multigrid_newton());
  EXPECT_GT(mg.linear_iterations, exact.linear_iterations);  // the approximate inverse costs iterations
  // Both stop at a scaled residual below 1e-12 of the O2 fed; as in the zone block solver tests
  // (measured ~1e-11 between solvers), 1e-8 of the largest value.
  double scale_o = 0.0, scale_c = 0.0;
  for (int k = 0; k < ch.net.size(); ++k) {
    scale_o = std::max(scale_o, std::abs(exact.do_mol_m3[k]));
    scale_c = std::max(scale_c, std::abs(exact.co2_mol_m3[k]));
  }
  for (int k = 0; k < ch.net.size(); ++k) {
    EXPECT_NEAR(mg.do_mol_m3[k], exact.do_mol_m3[k], 1e-8 * scale_o) << k;
    EXPECT_NEAR(mg.co2_mol_m3[k], exact.co2_mol_m3[k], 1e-8 * scale_c) << k;
  }
}

TEST(ScalarMultigrid, OneAndTwoThreadsGiveBitIdenticalFields) {
  // The two species' cycles run on two threads; each is sequential, so the field must not
  // depend on the thread count in any bit.
  const Case c = read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml").data;
  const Chain ch(c);
  const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
  const int saved = omp_get_max_threads();
  omp_set_num_threads(1);
  const auto one = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, multigrid_newton());
  omp_set_num_threads(2);
  const auto two = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, multigrid_newton());
  omp_set_num_threads(saved);
  EXPECT_EQ(one.linear_iterations, two.linear_iterations);
  EXPECT_EQ(one.do_mol_m3, two.do_mol_m3);
  EXPECT_EQ(one.co2_mol_m3, two.co2_mol_m3);
}

}  // namespace
}  // namespace oxystrat
