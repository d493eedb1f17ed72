// Coarse-grid correction of a fine steady state on the halved grid, by the full approximation
// scheme (FAS: Brandt 1977, Math. Comp. 31, section on nonlinear problems [mem]) with the halved
// grid's own balances as the coarse operator. The fine Krylov solve removes the rough part of an
// error in a few iterations and its smooth, coupled part (O2 and CO2, liquid and gas over the
// whole tank) slowly; the halved grid resolves that smooth part at a quarter of the cost per
// iteration. The coarse problem is the halved grid's balances F_c moved by the fine residual,
//   F_c(x_c) = F_c(R x) - R r(x),
// so that x_c - R x is the smooth part of the fine error; x += P (x_c - R x). R takes volume
// means of the concentrations and gas mole fractions and sums the residuals (mol/s) over the fine
// zones whose centroids a coarse zone holds; P interpolates bilinearly (nested_start.hpp). The
// fine solve's own tests decide convergence: a correction only changes how fast it gets there.
#pragma once

#include <Eigen/Core>
#include <vector>

#include "solver/linalg/steady_problem.hpp"
#include "solver/oxygen/nested_start.hpp"
#include "solver/oxygen/oxygen_field.hpp"

namespace oxystrat {

//! The coarse solve's Newton options, from the fine solve's: a hundredfold cut of the residual,
//! the balances left to the fine solve, and at most a few structured steps, never the general LU
//! (a correction only speeds the fine solve up; one that stalls is dropped, not pursued for minutes).
NewtonOptions coarse_newton_options(const NewtonOptions& fine);

class CoarseCorrection {
 public:
  //! Takes over the halved grid's level (its case, network, hydrodynamics and routing).
  CoarseCorrection(HalvedGridField level, const ZoneNetwork& fine, double biomass_kg_m3);
  CoarseCorrection(const CoarseCorrection&) = delete;
  CoarseCorrection& operator=(const CoarseCorrection&) = delete;

  //! x += P (x_c - R x) for the fine state x with residual `fine_residual` (fine_inert_mol_m3:
  //! the fine zones' inert gas, which the gas mole fractions are converted with). The coarse
  //! problem is solved with coarse_newton_options(newton). False, with x unchanged, when that
  //! solve fails.
  bool apply(const Eigen::VectorXd& fine_residual, const std::vector<double>& fine_inert_mol_m3, Eigen::VectorXd& x,
             const NewtonOptions& newton);
  //! Krylov iterations of the coarse solves so far.
  int linear_iterations() const { return linear_iterations_; }

 private:
  // R x: the coarse state of the fine state x.
  Eigen::VectorXd restricted_state(const Eigen::VectorXd& x, const std::vector<double>& fine_inert_mol_m3) const;
  // x += P (x_c - x_c0), the gas through its mole fractions.
  void add_prolonged(const Eigen::VectorXd& xc, const Eigen::VectorXd& xc0, const std::vector<double>& fine_inert_mol_m3,
                     Eigen::VectorXd& x) const;

  HalvedGridField level_;  // its field reduced to the state (the rest is not needed)
  const ZoneNetwork& fine_;
  OxygenContext context_;
  OxygenSetup setup_;
  std::vector<int> owner_;  // per fine zone: the coarse zone that holds its centroid
  int linear_iterations_ = 0;
};

}  // namespace oxystrat
