// A culture that grows on one substrate: dual Monod growth (substrate and dissolved O2), Pirt
// maintenance, yields on substrate and O2 (Monod 1949; Pirt 1965). Used by transient runs.
//   mu   = mu_max f_S f_O                      f_S = S/(K_S + S), f_O = C/(K_O2 + C)
//   q_S  = (mu_max f_O / Y_X/S + m_S) f_S      [kg substrate/(kg biomass s)]
//   q_O2 = (mu_max f_S / Y_X/O + m_O) f_O      [mol O2/(kg biomass s)]
// Maintenance on substrate stops with the substrate (f_S), endogenous respiration does not (only
// with the O2). Below zero both factors continue linearly, so Newton sees smooth functions.
#pragma once

#include <vector>

#include "input/case.hpp"
#include "solver/linalg/steady_problem.hpp"
#include "solver/flow/transport.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

struct GrowthKinetics {
  explicit GrowthKinetics(const Culture& c);
  double mu_max_s, k_s_kg_m3, k_o2_mol_m3, yield_substrate;
  double yield_o2_kg_mol;  //!< biomass per O2 [kg/mol]
  double maintenance_substrate_s, maintenance_o2_mol_kg_s;

  static double monod(double v, double k) { return v >= 0.0 ? v / (k + v) : v / k; }
  static double d_monod(double v, double k) { return v >= 0.0 ? k / ((k + v) * (k + v)) : 1.0 / k; }
  double growth_rate(double s, double c) const {
    return mu_max_s * monod(s, k_s_kg_m3) * monod(c, k_o2_mol_m3);
  }
  double substrate_uptake(double s, double c) const {
    return (mu_max_s * monod(c, k_o2_mol_m3) / yield_substrate + maintenance_substrate_s) * monod(s, k_s_kg_m3);
  }
  double d_substrate_uptake(double s, double c) const {
    return (mu_max_s * monod(c, k_o2_mol_m3) / yield_substrate + maintenance_substrate_s) * d_monod(s, k_s_kg_m3);
  }
  //! q_O2 / f_O: the O2 uptake at saturating O2 [mol/(kg s)].
  double o2_uptake_capacity(double s) const {
    return mu_max_s * monod(s, k_s_kg_m3) / yield_o2_kg_mol + maintenance_o2_mol_kg_s;
  }
};

//! One implicit Euler step of substrate S and biomass X together, both carried by the liquid
//! (unknowns interleaved S_k, X_k; the DO C_k of the same step is given):
//!   V_k (S_k - S_old,k) / h = sum_j L_kj S_j + feed_k - V_k X_k q_S(S_k, C_k)
//!   V_k (X_k - X_old,k) / h = sum_j L_kj X_j + V_k mu(S_k, C_k) X_k
//! Solved together, so the substrate consumed and the biomass grown obey the yield exactly.
class CultureStep : public SteadyProblem {
 public:
  CultureStep(const ZoneNetwork& net, const SparseMatrix& transport, const GrowthKinetics& g,
              const std::vector<double>& do_mol_m3, const Eigen::VectorXd& old, const std::vector<double>& feed_kg_s,
              double h);
  int size() const override { return static_cast<int>(old_.size()); }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override;
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override;
  double residual_scale() const override { return scale_; }

 private:
  const ZoneNetwork& net_;
  const SparseMatrix& transport_;
  const GrowthKinetics& g_;
  const std::vector<double>& do_;
  const Eigen::VectorXd& old_;
  const std::vector<double>& feed_;
  double h_, scale_;
};

//! The substrate field a constant feed holds against a frozen culture and DO field:
//!   sum_j L_kj S_j + feed_k - V_k X_k q_S(S_k, C_k) = 0   [kg/s]
//! (the quasi-steady substrate a cell sees during a fed-batch; lifelines use it). Throws
//! std::runtime_error when the feed exceeds what the culture can take up (no steady state).
std::vector<double> steady_substrate_field(const ZoneNetwork& net, const SparseMatrix& transport,
                                           const GrowthKinetics& g, const std::vector<double>& do_mol_m3,
                                           const std::vector<double>& biomass_kg_m3, const std::vector<double>& feed_kg_s);

}  // namespace oxystrat
