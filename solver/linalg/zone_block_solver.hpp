// A structured linear solve for the Newton steps of the coupled liquid/gas zone balances.
//
// Layout (the contract a problem states through SteadyProblem::zone_layout()): four unknowns per
// zone, interleaved; the first two are transported liquid species, the last two gas flows. Liquid
// rows may couple to any liquid unknown of the same species (transport) and to the other liquid
// species and to the gas of their own zone only; gas rows couple to the liquid of their own zone,
// to their own gas and to the gas of zones earlier in `gas_order` (gas only flows along a DAG).
// A Jacobian that breaks this contract is refused (accept() returns false) and the caller falls
// back to a general sparse LU.
//
// With J = [J_ll J_lg; J_gl J_gg] (liquid, gas), J_gg is block lower-triangular in gas order, so
// the gas is eliminated exactly by forward sweeps and the Newton step reduces to the liquid Schur
// complement S = J_ll - J_lg J_gg^-1 J_gl (applied, never formed). S is solved by restarted
// flexible GMRES (Saad & Schultz 1986; Saad 1993), right-preconditioned by the zone-local
// approximation of S (J_gg replaced by its diagonal blocks), one scalar sparse LU per liquid
// species, block Gauss-Seidel between the species (on large networks: aggregation multigrid per
// species, block Jacobi between them, the two on two threads). The factorisations are kept from one Newton step (and solve) to the next and
// refreshed only when the Krylov iteration count shows they have drifted.
#pragma once

#include <Eigen/Core>
#include <Eigen/Sparse>
#include <array>
#include <cstdint>
#include <functional>
#include <vector>

#include "solver/linalg/scalar_lu.hpp"
#include "solver/linalg/scalar_multigrid.hpp"
#include "solver/linalg/solver_options.hpp"

namespace oxystrat {

struct ZoneLayout {
  int zones = 0;
  const std::vector<int>* gas_order = nullptr;  //!< every zone after all zones that send it gas
};

class ZoneBlockSolver {
 public:
  using Triplets = std::vector<Eigen::Triplet<double>>;
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
  //! Solves J dx = b to |J dx - b|_2 <= rel_tol |b|_2. False when GMRES does not get there.
  bool solve(const Eigen::VectorXd& b, Eigen::VectorXd& dx, double rel_tol);
  int last_iterations() const { return last_iterations_; }
  int factorisations() const { return factorisations_; }
  //! Size thresholds (multigrid, threads, supernodal LU); taken at the next accept().
  void set_options(const SolverOptions& options) {
    if (options == options_) return;
    options_ = options;
    factored_ = false;  // a preconditioner of the other kind may be cached
  }
  const SolverOptions& options() const { return options_; }

 private:
  using Block = std::array<double, 4>;  // row-major 2 x 2
  void gas_sweep(Eigen::VectorXd& g) const;                      // g <- J_gg^-1 g (length 2n)
  template <typename V>
  void apply_schur(const V& v, Eigen::VectorXd& out);                 // out = S v (length 2n)
  void precondition(const Eigen::VectorXf& v, Eigen::VectorXf& out);  // out ~ S^-1 v, rounded
  // w <- w minus its projections on basis_[0, count), which go to h[0, count); returns |w|.
  double orthogonalise(Eigen::VectorXd& w, int count, Eigen::Ref<Eigen::VectorXd> h);

  SolverOptions options_;
  int n_ = 0;
  std::vector<int> order_;
  // The Jacobian, by part.
  Eigen::SparseMatrix<double> j_oo_, j_cc_;      // liquid species 0 and 1, zone x zone
  std::vector<double> x01_, x10_;                // local liquid cross-species entries
  std::vector<Block> lg_, gl_, gg_;              // local liquid-gas, gas-liquid, gas-gas blocks (gg_ inverted once taken)
  std::vector<int> up_start_, up_col_;           // upstream gas entries, grouped by receiving zone
  std::vector<unsigned char> up_row_;            // receiving gas species (0, 1)
  std::vector<double> up_val_;
  // Where each entry of the last full accept() was added: part << kPartShift | position.
  enum Part : std::uint32_t { kOo, kCc, kX01, kX10, kLg, kGl, kGg, kUp };
  static constexpr std::uint32_t kPartShift = 29, kSlotMask = (1u << kPartShift) - 1;
  std::vector<std::uint32_t> slot_;
  std::size_t taken_ = 0;  // entries of the Jacobian taken in pieces so far
  // The preconditioner (frozen between refreshes).
  Eigen::SparseMatrix<double> p_oo_, p_cc_;
  ScalarLu lu_o_, lu_c_;
  ScalarMultigrid mg_o_, mg_c_;
  bool multigrid_ = false;
  std::vector<double> p_co_;
  bool factored_ = false, have_jacobian_ = false;
  int factorisations_ = 0, last_iterations_ = 0;
  // Scratch.
  Eigen::VectorXd t_gas_, s_o_, s_c_, jo_, jc_;
  Eigen::VectorXd rhs_, y_, r_, w_;               // GMRES vectors, kept to spare a large network reallocations
  std::vector<Eigen::VectorXf> basis_, z_basis_;  // Krylov basis and its preconditioned images, rounded
  std::vector<double> partial_;                   // per-chunk sums of the orthogonalisation
};

}  // namespace oxystrat
