// Restarted flexible GMRES (Saad 1993), right-preconditioned: the preconditioned vectors are
// kept, so the preconditioner may change from one iteration to the next (a multigrid K-cycle
// does) and the update needs no further solve. Right preconditioning keeps the minimised residual
// the true one. Basis and images are stored in single precision with all arithmetic in double (a
// compressed basis, as Aliaga et al. 2023 [mem] show for GMRES): a rounded image is only another
// varying preconditioner, used as rounded, so the Arnoldi relation holds for it exactly; the
// rounded basis is orthonormal to ~1e-7, which bounds what one cycle gains (7 decades), and every
// restart measures the true residual in double. Orthogonalisation: classical Gram-Schmidt in
// cached chunks whose partial sums are added in chunk order, so the result is the same to the bit
// for any thread count; a second pass ("twice is enough": Giraud, Langou & Rozloznik 2005 [mem])
// only when the first cancels more than 90 % of the vector's norm. The basis is stored in single
// precision, orthonormal to ~6e-8 whatever the passes, and one pass keeps that within the ratio
// of the norms (the usual test, 1/sqrt(2), fired in 93 % of the iterations and bought nothing:
// the same Krylov counts from 494 to a million zones with one pass as with two).
#pragma once

#include <Eigen/Core>
#include <functional>
#include <vector>

namespace oxystrat {

struct FgmresOptions {
  int restart = 30;                     //!< Krylov vectors per cycle (fewer on very large systems)
  int max_iterations = 300;
  int parallel_from_unknowns = 200000;  //!< split the sweeps over the threads from this size on
};

class Fgmres {
 public:
  //! out = A in.
  using Operator = std::function<void(const Eigen::VectorXd& in, Eigen::VectorXd& out)>;
  //! out ~ A^-1 in (may vary between calls).
  using Preconditioner = std::function<void(const Eigen::VectorXf& in, Eigen::VectorXf& out)>;
  //! Solves A x = b from x = 0 to |b - A x|_2 <= rel_tol |b|_2. False when not reached within
  //! the options' iterations or when the iteration breaks down.
  bool solve(const Operator& a, const Preconditioner& m, const Eigen::VectorXd& b, Eigen::VectorXd& x,
             double rel_tol, const FgmresOptions& options = {});
  int last_iterations() const { return iterations_; }

 private:
  // w <- w minus its projections on basis_[0, count), which go to h[0, count); returns |w|.
  double orthogonalise(Eigen::VectorXd& w, int count, Eigen::Ref<Eigen::VectorXd> h, int parallel_from);
  void add_combination(const Eigen::VectorXd& c, int count, Eigen::VectorXd& x, int parallel_from) const;
  int iterations_ = 0;
  std::vector<Eigen::VectorXf> basis_, z_basis_;
  std::vector<double> partial_;
  Eigen::VectorXd r_, w_, zd_;
};

}  // namespace oxystrat
