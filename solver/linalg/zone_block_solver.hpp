// The structured linear solve for the Newton steps of the coupled liquid / gas zone balances.
//
// Layout (the contract a problem states through SteadyProblem::zone_layout()): four unknowns per
// zone, interleaved: liquid O2, liquid CO2, gas O2, gas CO2. Each unknown couples to the same
// unknown of any zone (transport: the liquid's flows, or the gas's drift flux), and to the other
// unknowns of its own zone only (transfer, uptake, gas composition). A Jacobian that breaks this
// contract is refused (accept() returns false) and the caller falls back to a general sparse LU.
// The Jacobian comes either by parts (the problem's two transport matrices, held by pointer, and
// a 4 x 4 block per zone: no copy, the way the oxygen balances give it) or as an entry list.
//
// The whole system is solved by flexible GMRES (solver/linalg/fgmres.hpp), right-preconditioned
// by a block factorisation per species pair (liquid O2 with gas O2, liquid CO2 with gas CO2,
// block Jacobi between the pairs, so that they are built and applied side by side on two
// threads; Gauss-Seidel between them saved no Krylov iterations on the bundled cases): with A
// the liquid block, G the gas block and B, C the zone-local couplings of J = [A B; C G], the
// preconditioner is P = [A 0; C S] with S = G - C diag(A)^-1 B, the gas block's zone-local Schur
// complement: x_l = A^-1 b_l, x_g = S^-1 (b_g - C x_l). (The full block LU, with a second A^-1
// solve, took more time and no fewer Krylov iterations on the bundled cases.) A and S are scalar
// transport-like blocks: one exact sparse LU each (ScalarLu) on small and mid-sized networks,
// aggregation multigrid (ScalarMultigrid) on large ones. The factorisations are kept from one
// Newton step to the next and refreshed when the Krylov count shows they have drifted.
#pragma once

#include <Eigen/Core>
#include <Eigen/Sparse>
#include <array>
#include <cstdint>
#include <functional>
#include <vector>

#include "solver/linalg/fgmres.hpp"
#include "solver/linalg/scalar_lu.hpp"
#include "solver/linalg/scalar_multigrid.hpp"
#include "solver/linalg/solver_options.hpp"

namespace oxystrat {

struct ZoneLayout {
  int zones = 0;  //!< four unknowns per zone; 0: the problem has no zone layout
};

//! The couplings between zones of a Jacobian given by parts: the problem's own transport
//! matrices (zones x zones, a diagonal entry stored in every column), the liquid's for species 0
//! and 1 and the gas's for 2 and 3. They are held by pointer while the solve uses them.
struct ZoneTransports {
  const Eigen::SparseMatrix<double>* liquid = nullptr;
  const Eigen::SparseMatrix<double>* gas = nullptr;
};

class ZoneBlockSolver {
 public:
  static constexpr int kSpecies = 4;
  using Triplets = std::vector<Eigen::Triplet<double>>;
  //! Everything of a zone's rows that is not transport: a 4 x 4 block, row-major, diagonal included.
  using LocalBlock = std::array<double, kSpecies * kSpecies>;
  //! The Jacobian by parts, without an entry list: fill every entry of the blocks begin_parts()
  //! returns (one per zone), then accept_parts() with the transports they add to. False when a
  //! transport lacks the layout's shape; the caller then lists the Jacobian instead.
  std::vector<LocalBlock>& begin_parts(const ZoneLayout& layout);
  bool accept_parts(const ZoneTransports& transports);
  //! Takes the Jacobian (triplets, duplicates summed) of a problem with this layout. False when
  //! the Jacobian does not have the structure above.
  bool accept(const ZoneLayout& layout, const Triplets& t);
  //! The same from a Jacobian listed in pieces: pieces(take) calls take(piece) for each piece in
  //! list order and returns false when the listing or a take fails. It is called twice (the whole
  //! list is never held) and must give the same list both times.
  using PieceTaker = std::function<bool(const Triplets&)>;
  using PieceList = std::function<bool(const PieceTaker&)>;
  bool accept(const ZoneLayout& layout, const PieceList& pieces);
  //! The same in pieces, for a Jacobian with the pattern of the last full accept(): begin, add
  //! the pieces in the order of that accept's list, finish. False (at any stage) when there is
  //! no remembered pattern or the pieces do not follow it; the caller then takes it in full.
  bool begin_same_pattern(const ZoneLayout& layout);
  bool add_same_pattern(const Triplets& piece);
  bool finish_same_pattern();
  //! Rebuilds the preconditioner's factorisations from the last accepted Jacobian.
  bool refresh_preconditioner();
  bool has_preconditioner() const { return factored_; }
  //! The preconditioner is the multigrid one (a large network), not the exact LU.
  bool multigrid() const { return multigrid_; }
  //! Solves J dx = b to |J dx - b|_2 <= rel_tol |b|_2. False when GMRES does not get there
  //! within max_iterations Krylov iterations.
  bool solve(const Eigen::VectorXd& b, Eigen::VectorXd& dx, double rel_tol, int max_iterations = 300);
  int last_iterations() const { return krylov_.last_iterations(); }
  int factorisations() const { return factorisations_; }
  //! Size thresholds (multigrid, threads, supernodal LU); taken at the next refresh.
  void set_options(const SolverOptions& options) {
    if (options == options_) return;
    options_ = options;
    factored_ = false;  // a preconditioner of the other kind may be cached
  }
  const SolverOptions& options() const { return options_; }
  //! Frees the Krylov vectors (the next solve allocates them again): between solves they are
  //! idle, and on a large network they are the largest part of the solver's memory.
  void release_krylov_vectors() { krylov_ = Fgmres{}; }

 private:
  void multiply(const Eigen::VectorXd& x, Eigen::VectorXd& out) const;  // out = J x
  void precondition(const Eigen::VectorXf& v, Eigen::VectorXf& out);   // out ~ J^-1 v
  void precondition_pair(int pair, const Eigen::VectorXf& v);
  void precondition_fused(const Eigen::VectorXf& v);
  // x <- block^-1 x for species s (0..3): the liquid blocks, or the gas Schur blocks.
  void block_solve(int s, Eigen::VectorXd& x) const;

  SolverOptions options_;
  int n_ = 0;
  // Same-species couplings of each species: the transports given by parts, or m_ (a listed Jacobian).
  std::array<const Eigen::SparseMatrix<double>*, kSpecies> block_{};
  std::array<Eigen::SparseMatrix<double>, kSpecies> m_;  // listed: same-species couplings, diagonal included
  std::vector<LocalBlock> local_;  // per zone; a listed Jacobian keeps its diagonal in m_, not here
  // Where each entry of the last full accept() was added: part << kPartShift | position.
  static constexpr std::uint32_t kLocalPart = kSpecies, kPartShift = 29, kSlotMask = (1u << kPartShift) - 1;
  std::vector<std::uint32_t> slot_;
  std::size_t taken_ = 0;
  // The preconditioner (frozen between refreshes): liquid blocks A_0, A_1 and gas Schur blocks.
  std::array<Eigen::SparseMatrix<double>, kSpecies> p_;
  std::array<ScalarLu, kSpecies> lu_;
  std::array<ScalarMultigrid, kSpecies> mg_;
  std::array<std::vector<double>, 2> gas_from_liquid_;  // C of each pair at the refresh, per zone
  bool multigrid_ = false;
  bool factored_ = false, have_jacobian_ = false;
  bool fused_ = false;  // the O2 and CO2 exact LUs share their symbolic part: solved together
  int factorisations_ = 0;
  Fgmres krylov_;
  std::array<Eigen::VectorXd, kSpecies> s_;  // scratch per species
  // From this size on the two pairs are built and applied on two threads (below it the thread
  // start costs more than a pair's triangular solves).
  static constexpr int kParallelPairsFrom = 20000;
};

}  // namespace oxystrat
