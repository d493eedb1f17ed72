#include "solver/linalg/steady_problem.hpp"

#include <algorithm>
#include <cmath>

namespace oxystrat {
namespace {

// Scaled max norm (the convergence test) and scaled 2-norm squared (the line-search merit).
double max_norm(const SteadyProblem& p, const Eigen::VectorXd& r) { return r.cwiseAbs().maxCoeff() / p.residual_scale(); }

// Converged: every equation and every conserved total within tolerance (both kept in the report).
bool converged(const SteadyProblem& p, const Eigen::VectorXd& r, const NewtonOptions& opts, NewtonReport& rep) {
  rep.residual = max_norm(p, r);
  rep.imbalance = p.largest_imbalance(r);
  return rep.residual < opts.tolerance && rep.imbalance <= opts.balance_tolerance;
}

double merit(const SteadyProblem& p, const Eigen::VectorXd& x, Eigen::VectorXd& r) {
  p.residual(x, r);
  if (!r.allFinite()) return std::numeric_limits<double>::infinity();
  return (r / p.residual_scale()).squaredNorm();
}

// The Jacobian into the block solver by parts when the problem gives them (no list, no copy of
// its transports); else in pieces of zones when the problem lists its Jacobian by zones, so that
// a large network never holds the whole list (26 entries of 16 bytes per zone): by one scatter
// while the pattern is the remembered one, else by the solver's two-pass intake. A problem that
// cannot list by zones is taken whole.
bool take_jacobian(const SteadyProblem& p, const ZoneLayout& layout, const Eigen::VectorXd& x, ZoneBlockSolver& blocks,
                   std::vector<Eigen::Triplet<double>>& piece) {
  ZoneTransports transports;
  if (p.jacobian_parts(x, blocks.begin_parts(layout), transports) && blocks.accept_parts(transports)) return true;
  constexpr int kZonesPerPiece = 1 << 14;
  piece.clear();
  // The first piece before anything is reset: a problem that cannot list by zones goes straight on.
  if (p.jacobian_zones(x, 0, std::min(layout.zones, kZonesPerPiece), piece)) {
    if (blocks.begin_same_pattern(layout)) {
      bool ok = blocks.add_same_pattern(piece);
      for (int b = kZonesPerPiece; ok && b < layout.zones; b += kZonesPerPiece) {
        piece.clear();
        ok = p.jacobian_zones(x, b, std::min(layout.zones, b + kZonesPerPiece), piece) && blocks.add_same_pattern(piece);
      }
      if (ok && blocks.finish_same_pattern()) return true;
    }
    return blocks.accept(layout, [&](const ZoneBlockSolver::PieceTaker& take) {
      for (int b = 0; b < layout.zones; b += kZonesPerPiece) {
        piece.clear();
        if (!p.jacobian_zones(x, b, std::min(layout.zones, b + kZonesPerPiece), piece) || !take(piece)) return false;
      }
      return true;
    });
  }
  std::vector<Eigen::Triplet<double>> all;
  p.jacobian(x, all);
  return blocks.accept(layout, all);
}

// Inexact Newton with the structured linear solve. Returns false when it cannot go on (the
// Jacobian lacks the structure, GMRES fails even with a fresh preconditioner, or the line search
// finds no decrease); x then holds the last accepted iterate and the caller continues from it.
// r and m: the residual and merit at x on entry (r is overwritten).
bool structured_newton(const SteadyProblem& p, const ZoneLayout& layout, Eigen::VectorXd& x, const NewtonOptions& opts,
                       NewtonWorkspace& ws, NewtonReport& rep, Eigen::VectorXd& r, double m) {
  const int n = p.size();
  Eigen::VectorXd r_try(n), dx(n), x_try(n);
  std::vector<Eigen::Triplet<double>> piece;
  double r2_previous = 0.0;
  auto& blocks = ws.blocks;
  for (rep.iterations = 0; rep.iterations < opts.max_iterations; ++rep.iterations) {
    if (converged(p, r, opts, rep)) {
      rep.converged = rep.structured = true;
      return true;
    }
    if (!take_jacobian(p, layout, x, blocks, piece)) return false;
    bool fresh = false;
    if (ws.refresh_blocks || !blocks.has_preconditioner()) {
      if (!blocks.refresh_preconditioner()) return false;
      ws.refresh_blocks = false;
      fresh = true;
    }
    // Forcing term (Eisenstat & Walker 1996, choice 2 with gamma = 0.9, alpha = 2): loose while
    // the residual falls slowly, tight in the quadratic phase; never below what puts the
    // linearised residual at a tenth of the tolerance (2-norm >= max norm), never above 0.1.
    const double r2 = r.norm();
    double eta = r2_previous > 0.0 ? 0.9 * (r2 / r2_previous) * (r2 / r2_previous) : 1e-2;
    eta = std::min(0.1, std::max(eta, 0.1 * opts.tolerance * p.residual_scale() / r2));
    // On a large network the 2-norm is many times the max norm, and that floor lets the last
    // step oversolve by up to two decades: there the floor is half the way to the tolerance on
    // the convergence test's own norm (Kelley 1995, eq. 6.20 [mem]).
    if (layout.zones >= opts.linear.max_norm_forcing_from_zones) {
      eta = std::min(0.1, std::max(eta, 0.5 * opts.tolerance / max_norm(p, r)));
    }
    r2_previous = r2;
    // The right-hand side -r in r's own storage (no temporary of the system's size): r is not
    // needed again, the line search replaces it.
    r = -r;
    // A frozen preconditioner gets 25 Krylov iterations: one that needs more has drifted (warm
    // starts after a change of biomass, say) and is refactored at this Jacobian for a second
    // try, which used to follow a full solve with it; a fresh one gets the solver's full count.
    constexpr int kStaleIterations = 25;
    bool solved = fresh ? blocks.solve(r, dx, eta) : blocks.solve(r, dx, eta, kStaleIterations + 1);
    rep.linear_iterations += blocks.last_iterations();
    if ((!solved || blocks.last_iterations() > kStaleIterations) && !fresh) {
      // A frozen preconditioner that has drifted: refactor at this Jacobian and try again.
      if (!blocks.refresh_preconditioner()) return false;
      fresh = true;
      solved = blocks.solve(r, dx, eta);
      rep.linear_iterations += blocks.last_iterations();
    }
    if (!solved) return false;
    // Many iterations with a fresh preconditioner are no reason to refactor; with an old one they
    // are. A numeric-only refactorisation costs about ten Krylov iterations, so refactor early
    // (measured at 494/1972 zones: more than 6 iterations -> 51/53 Krylov iterations per field
    // and 2.7/13.7 ms; more than 12 -> 79/95 and 3.1/16.9 ms; every step -> 49/50 and 3.0/15.4 ms).
    // A multigrid hierarchy is approximate anyway: at 1e6 zones a fresh one left the count at 14
    // and cost ~0.5 s, so it is rebuilt only after more than 25.
    if (!fresh && blocks.last_iterations() > (blocks.multigrid() ? kStaleIterations : 6)) ws.refresh_blocks = true;
    double lambda = 1.0, m_try = m;
    for (int k = 0; k < 40; ++k, lambda *= 0.5) {
      x_try = x + lambda * dx;
      p.keep_in_domain(x, x_try);
      m_try = merit(p, x_try, r_try);
      if (m_try < (1.0 - 1e-4 * lambda) * m) break;  // Armijo on 1/2 |r|^2
    }
    if (!(m_try < m)) return false;
    x.swap(x_try);
    r.swap(r_try);
    m = m_try;
  }
  rep.converged = rep.structured = converged(p, r, opts, rep);
  return true;
}

}  // namespace

NewtonReport solve_newton(const SteadyProblem& p, Eigen::VectorXd& x, const NewtonOptions& options, NewtonWorkspace* workspace) {
  NewtonReport rep;
  const int n = p.size();
  NewtonWorkspace local;
  NewtonWorkspace& ws = workspace != nullptr ? *workspace : local;
  const ZoneLayout layout = p.zone_layout();
  ws.blocks.set_options(options.linear);
  Eigen::VectorXd r(n);
  double m = merit(p, x, r);
  NewtonOptions opts = options;
  if (opts.reduction > 0.0) opts.tolerance = std::max(opts.tolerance, opts.reduction * max_norm(p, r));
  int structured_iterations = 0, linear_iterations = 0;
  if (opts.structured && layout.zones > 0 && 4 * layout.zones == n) {
    if (structured_newton(p, layout, x, opts, ws, rep, r, m)) return rep;
    m = merit(p, x, r);  // at the last accepted iterate
    structured_iterations = rep.iterations;  // carried on by the general path from x
    linear_iterations = rep.linear_iterations;
    ws.refresh_blocks = true;
    if (n > opts.linear.general_lu_up_to_unknowns) {
      // The general LU's fill would take more memory than such a machine has: stop, and say why.
      rep.converged = false;
      rep.general_lu_refused = true;
      return rep;
    }
    rep = NewtonReport{};
  }
  const auto finish = [&](NewtonReport out) {
    out.iterations += structured_iterations;
    out.linear_iterations = linear_iterations;
    return out;
  };
  if (ws.analysed && ws.jacobian.rows() != n) ws.analysed = ws.factored = false;  // another problem size
  Eigen::VectorXd r_try(n);
  std::vector<Eigen::Triplet<double>> triplets;
  bool fresh = false;
  const auto refactor = [&] {
    triplets.clear();
    p.jacobian(x, triplets);
    ws.jacobian.resize(n, n);
    ws.jacobian.setFromTriplets(triplets.begin(), triplets.end());
    ws.jacobian.makeCompressed();
    if (!ws.analysed) {
      ws.lu.analyzePattern(ws.jacobian);
      ws.analysed = true;
    }
    ws.lu.factorize(ws.jacobian);
    ws.factored = ws.lu.info() == Eigen::Success;
    ++ws.factorisations;
    fresh = true;
    return ws.factored;
  };
  for (rep.iterations = 0; rep.iterations < opts.max_iterations; ++rep.iterations) {
    if (converged(p, r, opts, rep)) {
      rep.converged = true;
      return finish(rep);
    }
    if (!ws.factored && !refactor()) return finish(rep);
    const Eigen::VectorXd dx = ws.lu.solve(-r);
    if (!dx.allFinite()) {
      if (fresh || !refactor()) return finish(rep);
      continue;
    }
    if (!fresh) {
      // Chord step with an old factorisation: keep it only if it cuts |r| at least threefold.
      Eigen::VectorXd x_try = x + dx;
      p.keep_in_domain(x, x_try);
      const double m_try = merit(p, x_try, r_try);
      if (m_try < m / 9.0) {
        x = x_try;
        r = r_try;
        m = m_try;
      } else if (!refactor()) {
        return finish(rep);
      }
      continue;
    }
    double lambda = 1.0;
    Eigen::VectorXd x_try;
    double m_try = m;
    for (int k = 0; k < 40; ++k, lambda *= 0.5) {
      x_try = x + lambda * dx;
      p.keep_in_domain(x, x_try);
      m_try = merit(p, x_try, r_try);
      if (m_try < (1.0 - 1e-4 * lambda) * m) break;  // Armijo on 1/2 |r|^2
    }
    if (!(m_try < m)) return finish(rep);  // no decrease along the Newton direction: stop with what we have
    // Near the solution (a full step that cut |r| tenfold) the factorisation is worth keeping.
    const bool keep = lambda == 1.0 && m_try < m / 100.0;
    if (!keep) ws.factored = false;
    fresh = false;
    x = x_try;
    r = r_try;
    m = m_try;
  }
  rep.converged = converged(p, r, opts, rep);
  return finish(rep);
}

Eigen::MatrixXd finite_difference_jacobian(const SteadyProblem& p, const Eigen::VectorXd& x, double rel_step) {
  const int n = p.size();
  Eigen::MatrixXd j(n, n);
  Eigen::VectorXd rp(n), rm(n);
  for (int i = 0; i < n; ++i) {
    const double h = rel_step * std::max(std::abs(x[i]), 1e-6);
    Eigen::VectorXd xp = x, xm = x;
    xp[i] += h;
    xm[i] -= h;
    p.residual(xp, rp);
    p.residual(xm, rm);
    j.col(i) = (rp - rm) / (2.0 * h);
  }
  return j;
}

}  // namespace oxystrat
