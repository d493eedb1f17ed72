// The structured Newton solve (flexible GMRES on the whole system, block factorisation per
// species pair as preconditioner): same field as the general sparse LU path, linear solves checked against the
// assembled Jacobian, refusal of a Jacobian without the structure (and the LU fallback), and the
// implicit-Euler form of the balances.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <omp.h>

#include "case_fixtures.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "solver/oxygen/oxygen_problem.hpp"
#include "solver/flow/transport.hpp"
#include "solver/linalg/zone_block_solver.hpp"

namespace oxystrat {
namespace {

using fixtures::Chain;

double max_abs(const std::vector<double>& v) {
  double m = 0.0;
  for (double x : v) m = std::max(m, std::abs(x));
  return m;
}

// The balances of a solved field, made a little non-trivial (state moved off the solution).
struct Balances {
  Chain ch;
  OxygenField f;
  SparseMatrix l;
  TransferCoefficients coeff;
  Uptake u;
  explicit Balances(const Case& c) : ch(c), f(solve_oxygen_field({c, ch.net, ch.hydro, ch.routing})) {
    l = transport_matrix(ch.net, ch.hydro.face_flow, ch.hydro.face_exchange);
    for (int k = 0; k < ch.net.size(); ++k) {
      coeff.transfer_o2.push_back(f.kla_1_s[k] * ch.net.volume[k]);
      coeff.transfer_co2.push_back(0.9 * f.kla_1_s[k] * ch.net.volume[k]);
      coeff.cstar_per_y_o2.push_back(f.cstar_mol_m3[k] / std::max(f.y_o2[k], 1e-3));
      coeff.cstar_per_y_co2.push_back(30.0);
      coeff.inert_mol_m3.push_back(4.0 * f.state[4 * k + 2]);
    }
    u.rate_mol_m3_s = c.culture.q_o2_max_mol_kg_s * c.culture.biomass_kg_m3;
    u.k_o2_mol_m3 = c.culture.k_o2_mol_m3;
    u.rq = 1.05;
  }
  OxygenProblem problem() const { return {ch.net, ch.routing, l, coeff, u, f.o2_in_mol_s, 0.01 * f.o2_in_mol_s}; }
};

// The balances with the implicit Euler terms -V (x - x_old) / h on the liquid rows, as a
// transient step adds them; states its zone layout so the structured solve takes it.
class EulerForm : public SteadyProblem {
 public:
  EulerForm(const OxygenProblem& p, const ZoneNetwork& net, Eigen::VectorXd old, double h)
      : p_(p), net_(net), old_(std::move(old)), h_(h) {}
  int size() const override { return p_.size(); }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override {
    p_.residual(x, r);
    for (int k = 0; k < net_.size(); ++k) {
      for (int s = 0; s < 2; ++s) r[4 * k + s] -= net_.volume[k] * (x[4 * k + s] - old_[4 * k + s]) / h_;
    }
  }
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override {
    p_.jacobian(x, t);
    for (int k = 0; k < net_.size(); ++k) {
      for (int s = 0; s < 2; ++s) t.emplace_back(4 * k + s, 4 * k + s, -net_.volume[k] / h_);
    }
  }
  double residual_scale() const override { return p_.residual_scale(); }
  ZoneLayout zone_layout() const override { return p_.zone_layout(); }

 private:
  const OxygenProblem& p_;
  const ZoneNetwork& net_;
  Eigen::VectorXd old_;
  double h_;
};

// The balances with a liquid O2 row that also depends on the next zone's gas O2: a species
// coupled to another species across zones, which the layout does not allow.
class CrossCoupled : public SteadyProblem {
 public:
  explicit CrossCoupled(const OxygenProblem& p) : p_(p) {}
  int size() const override { return p_.size(); }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override {
    p_.residual(x, r);
    for (int k = 0; k + 1 < size() / 4; ++k) r[4 * k] += kCoupling * x[4 * (k + 1) + 2];
  }
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override {
    p_.jacobian(x, t);
    for (int k = 0; k + 1 < size() / 4; ++k) t.emplace_back(4 * k, 4 * (k + 1) + 2, kCoupling);
  }
  double residual_scale() const override { return p_.residual_scale(); }
  ZoneLayout zone_layout() const override { return p_.zone_layout(); }

 private:
  static constexpr double kCoupling = 1e-15;  // [m3/s]: present in the pattern, too small to move the field
  const OxygenProblem& p_;
};

TEST(ScalarLu, SolvesATransportMatrixWithTransferDiagonalInBothModes) {
  // L - diag(T): the liquid block of the balances (column diagonally dominant).
  const Chain ch(fixtures::gassed_vessel(7, 18));
  SparseMatrix a = transport_matrix(ch.net, ch.hydro.face_flow, ch.hydro.face_exchange);
  for (int k = 0; k < a.rows(); ++k) a.coeffRef(k, k) -= 1e-3 * ch.net.volume[k] * (1.0 + std::sin(k));
  a.makeCompressed();
  Eigen::VectorXd b(a.rows());
  for (int i = 0; i < b.size(); ++i) b[i] = std::cos(1.3 * i);
  for (int from : {1 << 30, 1}) {  // plain columns, then Eigen's supernodal LU
    ScalarLu lu;
    ASSERT_TRUE(lu.factorize(a, from));
    for (int again = 0; again < 2; ++again) {  // a refactorisation keeps the ordering
      Eigen::VectorXd x = b;
      lu.solve(x);
      // A direct solve: residual at round-off, ~1e-16 x |A| |x| x fill; 1e-10 of |b| is generous.
      EXPECT_LE((a * x - b).norm(), 1e-10 * b.norm()) << from;
      ASSERT_TRUE(lu.factorize(a, from));
    }
    EXPECT_GT(lu.nonzeros(), a.nonZeros() / 2);
    // New values on the same pattern (a numeric-only refactorisation in the plain mode).
    SparseMatrix changed = a;
    for (int k = 0; k < changed.rows(); ++k) changed.coeffRef(k, k) *= 1.5 + 0.5 * std::cos(k);
    ASSERT_TRUE(lu.factorize(changed, from));
    Eigen::VectorXd x = b;
    lu.solve(x);
    EXPECT_LE((changed * x - b).norm(), 1e-10 * b.norm()) << from;  // as above
  }
  // A zero pivot (a structurally empty column) is refused, not divided by.
  SparseMatrix singular = a;
  for (SparseMatrix::InnerIterator it(singular, 3); it; ++it) it.valueRef() = 0.0;
  ScalarLu lu;
  EXPECT_FALSE(lu.factorize(singular));
}

TEST(ScalarLu, PairedRefactorisationAndSolveAreBitIdenticalToSingleOnes) {
  // Two blocks on one pattern (as the O2 and CO2 blocks are): refactor_both and solve_both
  // interleave the two eliminations, which must not change a single bit of either.
  const Chain ch(fixtures::gassed_vessel(7, 18));
  SparseMatrix a = transport_matrix(ch.net, ch.hydro.face_flow, ch.hydro.face_exchange);
  for (int k = 0; k < a.rows(); ++k) a.coeffRef(k, k) -= 1e-3 * ch.net.volume[k] * (1.0 + std::sin(k));
  a.makeCompressed();
  SparseMatrix b = a;
  for (int k = 0; k < b.rows(); ++k) b.coeffRef(k, k) *= 1.7 + 0.3 * std::cos(k);
  ScalarLu single_a, single_b, pair_a, pair_b;
  ASSERT_TRUE(single_a.factorize(a));
  ASSERT_TRUE(single_b.factorize(b));
  ASSERT_TRUE(pair_a.factorize(a));
  pair_b.adopt_symbolic(pair_a);
  ASSERT_TRUE(pair_b.factorize(b));
  ASSERT_TRUE(pair_a.same_symbolic(pair_b));
  // New values on the pattern: both refactorised together.
  for (SparseMatrix* m : {&a, &b}) {
    for (int k = 0; k < m->rows(); ++k) m->coeffRef(k, k) *= 1.1;
  }
  ASSERT_TRUE(single_a.factorize(a));
  ASSERT_TRUE(single_b.factorize(b));
  ASSERT_TRUE(ScalarLu::refactor_both(pair_a, a, pair_b, b));
  Eigen::VectorXd rhs_a(a.rows()), rhs_b(a.rows());
  for (int i = 0; i < rhs_a.size(); ++i) rhs_a[i] = std::cos(1.3 * i), rhs_b[i] = std::sin(0.7 * i);
  Eigen::VectorXd xa = rhs_a, xb = rhs_b, ya = rhs_a, yb = rhs_b;
  single_a.solve(xa);
  single_b.solve(xb);
  ScalarLu::solve_both(pair_a, pair_b, ya, yb);
  for (int i = 0; i < xa.size(); ++i) {
    EXPECT_EQ(xa[i], ya[i]) << i;  // exact: the same operations in the same order
    EXPECT_EQ(xb[i], yb[i]) << i;
  }
  // A block of another pattern is not refactorised as a pair.
  SparseMatrix other = a;
  other.coeffRef(0, a.rows() - 1) = 1e-9;
  other.makeCompressed();
  EXPECT_FALSE(ScalarLu::refactor_both(pair_a, a, pair_b, other));
}

TEST(ZoneBlockSolver, StructuredNewtonGivesTheFieldOfTheGeneralLu) {
  // A tall case with strong gas depletion and a starved region, and a small gassed vessel.
  for (const Case& c : {fixtures::gassed_vessel(6, 16), read_case_file(fixtures::source_dir() + "/cases/tall-3rushton.toml").data}) {
    const Chain ch(c);
    const OxygenContext ctx{c, ch.net, ch.hydro, ch.routing};
    NewtonOptions lu;
    lu.structured = false;
    const auto a = solve_oxygen_field(ctx);
    const auto b = solve_oxygen_field(ctx, -1.0, nullptr, nullptr, lu);
    EXPECT_GT(a.linear_iterations, 0);  // the structured path did the work
    EXPECT_EQ(b.linear_iterations, 0);
    // Both stop at a scaled residual below 1e-12 of the O2 fed, from different sides; measured
    // differences are ~1e-11 of the largest DO, 1e-8 leaves room for other grids and compilers
    // while staying far below any physical significance.
    const double scale = max_abs(b.do_mol_m3);
    for (int k = 0; k < ch.net.size(); ++k) {
      EXPECT_NEAR(a.do_mol_m3[k], b.do_mol_m3[k], 1e-8 * scale) << k;
      EXPECT_NEAR(a.co2_mol_m3[k], b.co2_mol_m3[k], 1e-8 * max_abs(b.co2_mol_m3)) << k;
    }
    EXPECT_NEAR(a.o2_balance_error, 0.0, 1e-12);  // the balance holds to round-off at any converged state
  }
}

// A state moved off the solution, so that the Jacobian is not the solution's.
Eigen::VectorXd moved_off(Eigen::VectorXd x) {
  for (int i = 0; i < x.size(); ++i) x[i] *= 1.0 + 0.2 * std::sin(3.0 * i);
  return x;
}

// The problem's Jacobian at x as its entry list t and assembled.
Eigen::SparseMatrix<double> assembled_jacobian(const SteadyProblem& p, const Eigen::VectorXd& x,
                                               std::vector<Eigen::Triplet<double>>& t) {
  p.jacobian(x, t);
  Eigen::SparseMatrix<double> j(p.size(), p.size());
  j.setFromTriplets(t.begin(), t.end());
  return j;
}

// A right-hand side over both phases: liquid rows of order one, gas rows a thousandth of it.
Eigen::VectorXd both_phases_rhs(int size) {
  Eigen::VectorXd b(size);
  for (int i = 0; i < size; ++i) b[i] = std::cos(0.7 * i) * (i % 4 < 2 ? 1.0 : 1e-3);
  return b;
}

TEST(ZoneBlockSolver, LinearSolveMeetsItsResidualOnTheAssembledJacobian) {
  const Balances bal(fixtures::gassed_vessel(5, 12));
  const auto p = bal.problem();
  const Eigen::VectorXd x = moved_off(bal.f.state);
  std::vector<Eigen::Triplet<double>> t;
  const auto j = assembled_jacobian(p, x, t);
  ZoneBlockSolver s;
  ASSERT_TRUE(s.accept(p.zone_layout(), t));
  ASSERT_TRUE(s.refresh_preconditioner());
  const Eigen::VectorXd b = both_phases_rhs(p.size());
  for (double tol : {1e-2, 1e-6, 1e-11}) {
    Eigen::VectorXd dx;
    ASSERT_TRUE(s.solve(b, dx, tol));
    // GMRES stops on its recurrence for the residual; the true residual, recomputed here from
    // the assembled matrix, agrees with it to round-off (1e-13 of |b| at this size).
    EXPECT_LE((j * dx - b).norm(), tol * b.norm() + 1e-13 * b.norm()) << tol;
    EXPECT_GT(s.last_iterations(), 0);
  }
  // The preconditioner kept from an earlier Jacobian still gives an accurate solve (more
  // iterations): the answer is set by the current Jacobian alone.
  Eigen::VectorXd x2 = x * 1.3;
  std::vector<Eigen::Triplet<double>> t2;
  const auto j2 = assembled_jacobian(p, x2, t2);
  ASSERT_TRUE(s.accept(p.zone_layout(), t2));
  Eigen::VectorXd dx;
  ASSERT_TRUE(s.solve(b, dx, 1e-10));
  EXPECT_LE((j2 * dx - b).norm(), 1e-10 * b.norm() + 1e-13 * b.norm());
}

TEST(ZoneBlockSolver, JacobianByPartsIsTheListedJacobian) {
  const Balances bal(fixtures::gassed_vessel(5, 12));
  const auto p = bal.problem();
  const Eigen::VectorXd x = moved_off(bal.f.state);
  std::vector<Eigen::Triplet<double>> t;
  const auto j = assembled_jacobian(p, x, t);
  const Eigen::VectorXd b = both_phases_rhs(p.size());
  for (int multigrid_from : {1 << 30, 1}) {  // exact LU blocks, then multigrid
    SolverOptions o;
    o.multigrid_from_zones = multigrid_from;
    o.multigrid_coarsest_size = 20;  // a real hierarchy on this small network
    ZoneBlockSolver listed, parts;
    listed.set_options(o);
    parts.set_options(o);
    ASSERT_TRUE(listed.accept(p.zone_layout(), t) && listed.refresh_preconditioner());
    ZoneTransports transports;
    ASSERT_TRUE(p.jacobian_parts(x, parts.begin_parts(p.zone_layout()), transports));
    ASSERT_TRUE(parts.accept_parts(transports) && parts.refresh_preconditioner());
    Eigen::VectorXd dx_listed, dx_parts;
    ASSERT_TRUE(listed.solve(b, dx_listed, 1e-11));
    ASSERT_TRUE(parts.solve(b, dx_parts, 1e-11));
    // The parts are the assembled matrix: its true residual meets the tolerance (GMRES's
    // recurrence agrees with it to round-off, 1e-13 of |b| as above), and both solves agree to
    // round-off (the same entries summed in another order; 4e-15 relative measured).
    EXPECT_LE((j * dx_parts - b).norm(), 1e-11 * b.norm() + 1e-13 * b.norm()) << multigrid_from;
    EXPECT_LE((dx_parts - dx_listed).norm(), 1e-12 * dx_listed.norm()) << multigrid_from;
  }
}

TEST(ZoneBlockSolver, PartsWithoutAStoredDiagonalAreRefused) {
  const Balances bal(fixtures::gassed_vessel(4, 10));
  const auto p = bal.problem();
  ZoneTransports transports;
  ZoneBlockSolver s;
  ASSERT_TRUE(p.jacobian_parts(bal.f.state, s.begin_parts(p.zone_layout()), transports));
  // The liquid transport without zone 3's diagonal entry: the preconditioner could not add the
  // zone-local diagonal to it, so the parts are refused and Newton lists the Jacobian instead.
  Eigen::SparseMatrix<double> holed = *transports.liquid;
  holed.prune([](int row, int col, double) { return row != 3 || col != 3; });
  holed.makeCompressed();
  ZoneTransports bad = transports;
  bad.liquid = &holed;
  EXPECT_FALSE(s.accept_parts(bad));
  EXPECT_TRUE(s.accept_parts(transports));
}

TEST(ZoneBlockSolver, JacobianByZonesIsTheWholeJacobianInPieces) {
  const Balances bal(fixtures::gassed_vessel(5, 12));
  const auto p = bal.problem();
  const int n = bal.ch.net.size();
  std::vector<Eigen::Triplet<double>> whole;
  p.jacobian(bal.f.state, whole);
  for (int piece : {1, 7, n / 3, n}) {
    std::vector<Eigen::Triplet<double>> joined;
    for (int b = 0; b < n; b += piece) ASSERT_TRUE(p.jacobian_zones(bal.f.state, b, std::min(n, b + piece), joined));
    ASSERT_EQ(joined.size(), whole.size()) << piece;
    for (size_t i = 0; i < whole.size(); ++i) {  // the same list, entry for entry, to the bit
      ASSERT_EQ(joined[i].row(), whole[i].row()) << i;
      ASSERT_EQ(joined[i].col(), whole[i].col()) << i;
      ASSERT_EQ(joined[i].value(), whole[i].value()) << i;
    }
  }
}

TEST(ZoneBlockSolver, JacobianTakenInPiecesSolvesAsTakenWholeAndAChangedPatternIsRefused) {
  const Balances bal(fixtures::gassed_vessel(5, 12));
  const auto p = bal.problem();
  const int n = bal.ch.net.size();
  const ZoneLayout layout = p.zone_layout();
  Eigen::VectorXd x1 = bal.f.state, x2 = bal.f.state;
  for (int i = 0; i < x2.size(); ++i) x2[i] *= 1.0 + 0.1 * std::sin(1.7 * i);
  std::vector<Eigen::Triplet<double>> t1, t2;
  p.jacobian(x1, t1);
  p.jacobian(x2, t2);
  Eigen::VectorXd b(p.size());
  for (int i = 0; i < b.size(); ++i) b[i] = std::cos(0.3 * i);
  ZoneBlockSolver whole, pieces;
  ASSERT_TRUE(whole.accept(layout, t1));
  ASSERT_TRUE(pieces.accept(layout, t1));
  ASSERT_TRUE(whole.accept(layout, t2));
  ASSERT_TRUE(pieces.begin_same_pattern(layout));
  for (int z = 0; z < n; z += 9) {
    std::vector<Eigen::Triplet<double>> piece;
    p.jacobian_zones(x2, z, std::min(n, z + 9), piece);
    ASSERT_TRUE(pieces.add_same_pattern(piece)) << z;
  }
  ASSERT_TRUE(pieces.finish_same_pattern());
  Eigen::VectorXd d_whole, d_pieces;
  ASSERT_TRUE(whole.refresh_preconditioner() && whole.solve(b, d_whole, 1e-10));
  ASSERT_TRUE(pieces.refresh_preconditioner() && pieces.solve(b, d_pieces, 1e-10));
  EXPECT_EQ((d_whole - d_pieces).cwiseAbs().maxCoeff(), 0.0);  // the same parts, so the same numbers

  // One entry moved to another column, or a list cut short: refused, and a full accept recovers.
  auto moved = t2;
  for (auto& e : moved) {
    if (e.row() % 4 == 0 && e.col() % 4 == 0 && e.row() != e.col()) {
      e = Eigen::Triplet<double>(e.row(), (e.row() + 4 * 3) % (4 * n), e.value());
      break;
    }
  }
  ASSERT_TRUE(pieces.begin_same_pattern(layout));
  EXPECT_FALSE(pieces.add_same_pattern(moved));
  ASSERT_TRUE(pieces.begin_same_pattern(layout));
  ASSERT_TRUE(pieces.add_same_pattern({t2.begin(), t2.end() - 1}));
  EXPECT_FALSE(pieces.finish_same_pattern());
  EXPECT_FALSE(pieces.solve(b, d_pieces, 1e-10));  // no Jacobian taken: no answer
  ASSERT_TRUE(pieces.accept(layout, t2));
  ASSERT_TRUE(pieces.refresh_preconditioner() && pieces.solve(b, d_pieces, 1e-10));
  EXPECT_EQ((d_whole - d_pieces).cwiseAbs().maxCoeff(), 0.0);
}

TEST(ZoneBlockSolver, FirstIntakeFromPiecesEqualsTheWholeListAndRemembersItsSlots) {
  const Balances bal(fixtures::gassed_vessel(5, 12));
  const auto p = bal.problem();
  const int n = bal.ch.net.size();
  const ZoneLayout layout = p.zone_layout();
  Eigen::VectorXd x2 = bal.f.state;
  for (int i = 0; i < x2.size(); ++i) x2[i] *= 1.0 + 0.1 * std::sin(1.7 * i);
  std::vector<Eigen::Triplet<double>> whole_list, t2;
  p.jacobian(bal.f.state, whole_list);
  p.jacobian(x2, t2);
  Eigen::VectorXd b(p.size());
  for (int i = 0; i < b.size(); ++i) b[i] = std::cos(0.3 * i);
  int calls = 0;
  const auto in_pieces = [&](const Eigen::VectorXd& x, int size) {
    return [&, size](const ZoneBlockSolver::PieceTaker& take) {
      ++calls;
      for (int z = 0; z < n; z += size) {
        std::vector<Eigen::Triplet<double>> piece;
        if (!p.jacobian_zones(x, z, std::min(n, z + size), piece) || !take(piece)) return false;
      }
      return true;
    };
  };
  ZoneBlockSolver whole, pieces;
  ASSERT_TRUE(whole.accept(layout, whole_list));
  ASSERT_TRUE(pieces.accept(layout, in_pieces(bal.f.state, 7)));
  EXPECT_EQ(calls, 2);  // counted, then placed: the list is never held whole
  Eigen::VectorXd d_whole, d_pieces;
  ASSERT_TRUE(whole.refresh_preconditioner() && whole.solve(b, d_whole, 1e-10));
  ASSERT_TRUE(pieces.refresh_preconditioner() && pieces.solve(b, d_pieces, 1e-10));
  EXPECT_EQ((d_whole - d_pieces).cwiseAbs().maxCoeff(), 0.0);  // the same parts, so the same numbers
  // The slots remembered on the way take the next Jacobian of the pattern by scatter, as after a
  // whole-list intake.
  ASSERT_TRUE(whole.accept(layout, t2));
  ASSERT_TRUE(pieces.begin_same_pattern(layout));
  ASSERT_TRUE(pieces.add_same_pattern(t2));
  ASSERT_TRUE(pieces.finish_same_pattern());
  ASSERT_TRUE(whole.refresh_preconditioner() && whole.solve(b, d_whole, 1e-10));
  ASSERT_TRUE(pieces.refresh_preconditioner() && pieces.solve(b, d_pieces, 1e-10));
  EXPECT_EQ((d_whole - d_pieces).cwiseAbs().maxCoeff(), 0.0);
  // A listing that changes between its two calls (here: one entry fewer the second time) is refused.
  int call = 0;
  const ZoneBlockSolver::PieceList unstable = [&](const ZoneBlockSolver::PieceTaker& take) {
    return ++call == 1 ? take(whole_list) : take({whole_list.begin(), whole_list.end() - 1});
  };
  ZoneBlockSolver refused;
  EXPECT_FALSE(refused.accept(layout, unstable));
  EXPECT_FALSE(refused.solve(b, d_pieces, 1e-10));
}

TEST(ZoneBlockSolver, ThreadedKrylovSweepsGiveTheSameBitsForAnyThreadCount) {
  // 3000 zones: 6000 liquid unknowns, two chunks of the orthogonalisation's sweeps.
  const Balances bal(fixtures::gassed_vessel(30, 100));
  const auto p = bal.problem();
  std::vector<Eigen::Triplet<double>> t;
  p.jacobian(bal.f.state, t);
  Eigen::VectorXd b(p.size());
  for (int i = 0; i < b.size(); ++i) b[i] = std::cos(0.3 * i);
  const int saved_threads = omp_get_max_threads();
  auto solve_with = [&](int parallel_from, int threads) {
    SolverOptions o;
    o.multigrid_from_zones = 1;  // the large-network path (sections and sweeps) on a small one
    o.parallel_from_unknowns = parallel_from;
    omp_set_num_threads(threads);
    ZoneBlockSolver s;
    s.set_options(o);
    Eigen::VectorXd dx;
    EXPECT_TRUE(s.accept(p.zone_layout(), t) && s.refresh_preconditioner() && s.solve(b, dx, 1e-10));
    return dx;
  };
  const Eigen::VectorXd serial = solve_with(1 << 30, 1), one = solve_with(1, 1), two = solve_with(1, 2);
  omp_set_num_threads(saved_threads);
  ASSERT_EQ(serial.size(), p.size());
  EXPECT_EQ((serial - one).cwiseAbs().maxCoeff(), 0.0);
  EXPECT_EQ((serial - two).cwiseAbs().maxCoeff(), 0.0);
}

TEST(ZoneBlockSolver, RefusesSpeciesCoupledAcrossZonesAndNewtonFallsBackToTheLu) {
  const Balances bal(fixtures::gassed_vessel(4, 10));
  const auto p = bal.problem();
  const CrossCoupled wrong(p);
  std::vector<Eigen::Triplet<double>> t, t_wrong;
  p.jacobian(bal.f.state, t);
  wrong.jacobian(bal.f.state, t_wrong);
  ZoneBlockSolver s;
  EXPECT_FALSE(s.accept(wrong.zone_layout(), t_wrong));
  EXPECT_TRUE(s.accept(p.zone_layout(), t));
  Eigen::VectorXd start = bal.f.state, x1 = start, x2 = start;
  for (int i = 0; i < start.size(); i += 4) x1[i] = x2[i] = 0.5 * start[i];
  const auto r1 = solve_newton(wrong, x1);
  const auto r2 = solve_newton(p, x2);
  ASSERT_TRUE(r1.converged);
  ASSERT_TRUE(r2.converged);
  EXPECT_FALSE(r1.structured);
  EXPECT_TRUE(r2.structured);
  // Two converged solutions of one problem (scaled residual < 1e-12): they agree far below the
  // DO scale; 1e-8 relative as in the test above.
  const double scale = x2.cwiseAbs().maxCoeff();
  EXPECT_LE((x1 - x2).cwiseAbs().maxCoeff(), 1e-8 * scale);
}

TEST(SteadyNewton, ImbalanceCoversTheVesselsO2Balances) {
  // Verification: the sums of the residual rows are the vessel's balances, computed here from
  // their terms (fed, off-gas, transferred, taken up) at a state off the solution.
  const Balances bal(fixtures::gassed_vessel(6, 16));
  const auto p = bal.problem();
  const Eigen::VectorXd x = moved_off(bal.f.state);
  Eigen::VectorXd r(p.size());
  p.residual(x, r);
  const int n = bal.ch.net.size();
  std::vector<double> gas_o2(n);
  double transferred = 0.0, taken_up = 0.0;
  for (int k = 0; k < n; ++k) {
    gas_o2[k] = x[4 * k + 2];
    const double total = x[4 * k + 2] + x[4 * k + 3] + bal.coeff.inert_mol_m3[k];
    transferred += bal.coeff.transfer_o2[k] * (bal.coeff.cstar_per_y_o2[k] * x[4 * k + 2] / total - x[4 * k]);
    taken_up += bal.u.our(x[4 * k]) * bal.ch.net.volume[k];
  }
  const double fed = bal.f.o2_in_mol_s;
  const double gas_side = (fed - surface_flow(bal.ch.routing, gas_o2) - transferred) / fed;
  const double liquid_side = (transferred - taken_up) / fed;
  ASSERT_GT(std::max(std::abs(gas_side), std::abs(liquid_side)), 1e-3);  // far from closed: a real check
  // Round-off of the sums over the zones' terms (each of order one against the scale).
  EXPECT_GE(p.largest_imbalance(r), std::max(std::abs(gas_side), std::abs(liquid_side)) - 1e-12);
  double gas_rows = 0.0, liquid_rows = 0.0;
  for (int k = 0; k < n; ++k) gas_rows += r[4 * k + 2], liquid_rows += r[4 * k];
  EXPECT_NEAR(gas_rows / fed, gas_side, 1e-12);
  EXPECT_NEAR(liquid_rows / fed, liquid_side, 1e-12);
}

TEST(SteadyNewton, StopsOnlyWhenTheBalancesCloseToo) {
  // A loose max-norm test alone stops with the vessel's balances open (every zone's residual
  // within it, their sum not); with the balance test Newton goes on until they close.
  const Balances bal(fixtures::gassed_vessel(6, 16));
  const auto p = bal.problem();
  NewtonOptions loose;
  loose.tolerance = 1e-4;
  loose.balance_tolerance = std::numeric_limits<double>::infinity();
  Eigen::VectorXd a = moved_off(bal.f.state);
  const auto open = solve_newton(p, a, loose);
  ASSERT_TRUE(open.converged);
  EXPECT_GT(open.imbalance, 1e-9);
  NewtonOptions closing = loose;
  closing.balance_tolerance = 1e-12;
  Eigen::VectorXd b = moved_off(bal.f.state);
  const auto closed = solve_newton(p, b, closing);
  ASSERT_TRUE(closed.converged);
  Eigen::VectorXd r(p.size());
  p.residual(b, r);
  EXPECT_LE(p.largest_imbalance(r), 1e-12);
  EXPECT_EQ(closed.imbalance, p.largest_imbalance(r));
  EXPECT_GT(closed.iterations, open.iterations);
}

TEST(ZoneBlockSolver, NoGeneralLuFallbackAboveItsSize) {
  const Balances bal(fixtures::gassed_vessel(4, 10));
  const auto p = bal.problem();
  const CrossCoupled wrong(p);
  Eigen::VectorXd x = bal.f.state;
  for (int i = 0; i < x.size(); i += 4) x[i] *= 0.5;
  NewtonOptions small;
  small.linear.general_lu_up_to_unknowns = wrong.size() - 1;  // this problem counts as too large
  const auto r = solve_newton(wrong, x, small);
  EXPECT_FALSE(r.converged);
  EXPECT_TRUE(r.general_lu_refused);
  EXPECT_FALSE(r.structured);
}

TEST(ZoneBlockSolver, ImplicitEulerFormSolvesLikeTheGeneralLu) {
  const Balances bal(fixtures::gassed_vessel(5, 12));
  const auto p = bal.problem();
  Eigen::VectorXd old = bal.f.state;
  for (int i = 0; i < old.size(); i += 4) old[i] *= 0.3;  // a DO drop to recover from
  for (double h : {1.0, 100.0}) {
    const EulerForm step(p, bal.ch.net, old, h);
    Eigen::VectorXd xs = old, xl = old;
    NewtonOptions lu;
    lu.structured = false;
    const auto rs = solve_newton(step, xs);
    const auto rl = solve_newton(step, xl, lu);
    ASSERT_TRUE(rs.converged) << h;
    ASSERT_TRUE(rl.converged) << h;
    EXPECT_TRUE(rs.structured);
    // Both at a scaled residual below 1e-12; 1e-8 of the largest value as above.
    for (int s = 0; s < 4; ++s) {
      double scale = 0.0, diff = 0.0;
      for (int k = s; k < xs.size(); k += 4) {
        scale = std::max(scale, std::abs(xl[k]));
        diff = std::max(diff, std::abs(xs[k] - xl[k]));
      }
      EXPECT_LE(diff, 1e-8 * scale) << "h " << h << " unknown " << s;
    }
  }
}

}  // namespace
}  // namespace oxystrat
