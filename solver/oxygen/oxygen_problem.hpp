// The steady O2 / CO2 balances of every zone, liquid and gas, as one SteadyProblem.
// State per zone k (4 unknowns, interleaved): C_O2, C_CO2 [mol/m3] in the liquid; g_O2, g_CO2
// [mol/m3] of gas held per zone volume. The inert gas of each zone is fixed by the gas transport
// (it does not dissolve).
//   liquid O2:  sum_j L_kj C_j + T_k (K_k y_k - C_k) - OUR(C_k) V_k = 0
//   liquid CO2: sum_j L_kj D_j + S_k (Q_k x_k - D_k) + RQ OUR(C_k) V_k = 0
//   gas O2:     sum_j G_kj g_O2,j + F_O2 s_k - T_k (K_k y_k - C_k) = 0
//   gas CO2:    sum_j G_kj g_CO2,j + F_CO2 s_k - S_k (Q_k x_k - D_k) = 0
// with L the liquid transport, G the gas transport (solver/flow/gas_routing.hpp), F the sparged
// flows and s_k the sparger's share, T = kLa V, K = C* per unit O2 mole fraction (Henry x
// salting-out x (p - p_water)), y = g_O2 / (g_O2 + g_CO2 + g_inert), and likewise for CO2.
// T and S are computed by the outer loop at the gas each zone held then (g0); within a Newton
// solve they follow the zone's gas g = g_O2 + g_CO2 + g_inert as T g / g0, so that the transfer
// ends with the gas: T (g / g0) (K y - C) = (T / g0) (K g_O2 - C g). At the solution of the outer
// loop g = g0 and this is the plain T (K y - C). Without it a zone of pure O2 whose gas all
// dissolves has no steady state at a fixed T (y stays near 1 as the gas vanishes).
#pragma once

#include <algorithm>
#include <vector>

#include "solver/flow/gas_routing.hpp"
#include "solver/linalg/steady_problem.hpp"
#include "solver/flow/transport.hpp"
#include "mesh/zone_network.hpp"

namespace oxystrat {

//! Everything the balances need per zone, fixed during one Newton solve.
struct TransferCoefficients {
  std::vector<double> transfer_o2;       //!< kLa_O2 V [m3/s]
  std::vector<double> transfer_co2;      //!< kLa_CO2 V [m3/s]
  std::vector<double> cstar_per_y_o2;    //!< C*_O2 per unit dry-gas O2 fraction [mol/m3]
  std::vector<double> cstar_per_y_co2;   //!< C*_CO2 per unit dry-gas CO2 fraction [mol/m3]
  std::vector<double> inert_mol_m3;      //!< inert gas held per zone volume [mol/m3]
  //! Dry gas per zone volume that T and S were computed at, g0 [mol/m3]; empty: T and S stay
  //! fixed whatever the gas (as in a zone with g0 = 0).
  std::vector<double> gas_mol_m3;
};

//! O2 and CO2 transfer of one zone into the liquid [mol/s] and their derivatives by the zone's
//! C_O2, C_CO2, g_O2, g_CO2 (the balances' single definition of the transfer; see above).
struct ZoneTransfer {
  double gas_ratio = 1.0;  //!< g / g0: the factor on T and S (1 where they stay fixed)
  double otr = 0.0, ctr = 0.0;
  double otr_c = 0.0, otr_go = 0.0, otr_gc = 0.0;
  double ctr_d = 0.0, ctr_go = 0.0, ctr_gc = 0.0;
};
ZoneTransfer zone_transfer(const TransferCoefficients& coeff, int zone, double c, double d, double g_o2, double g_co2);

struct Uptake {
  double rate_mol_m3_s = 0.0;  //!< q_O2,max X [mol/(m3 s)]
  double k_o2_mol_m3 = 0.0;
  double rq = 1.0;
  //! Per-zone multiplier of the rate (a transient culture with local substrate limitation and
  //! biomass); empty means 1 everywhere.
  std::vector<double> zone_scale;
  double scale(int zone) const { return zone_scale.empty() ? 1.0 : zone_scale[zone]; }
  double largest_scale() const {
    return zone_scale.empty() ? 1.0 : *std::max_element(zone_scale.begin(), zone_scale.end());
  }
  //! OUR at dissolved O2 c [mol/(m3 s)]: Monod for c >= 0, continued linearly below 0 so Newton
  //! sees a smooth function (the steady solution itself is positive). A Monod constant below
  //! 1e-9 mol/m3 (zero order) is treated as 1e-9 mol/m3.
  double our(double c) const {
    const double k = std::max(k_o2_mol_m3, 1e-9);
    return c >= 0.0 ? rate_mol_m3_s * c / (k + c) : rate_mol_m3_s * c / k;
  }
  double dour(double c) const {
    const double k = std::max(k_o2_mol_m3, 1e-9);
    return c >= 0.0 ? rate_mol_m3_s * k / ((k + c) * (k + c)) : rate_mol_m3_s / k;
  }
};

class OxygenProblem : public SteadyProblem {
 public:
  OxygenProblem(const ZoneNetwork& net, const GasRouting& routing, const SparseMatrix& transport,
                const TransferCoefficients& coeff, const Uptake& uptake, double inlet_o2_mol_s,
                double inlet_co2_mol_s);
  int size() const override { return 4 * n_; }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override;
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override;
  bool jacobian_zones(const Eigen::VectorXd& x, int zone_begin, int zone_end,
                      std::vector<Eigen::Triplet<double>>& t) const override;
  bool jacobian_parts(const Eigen::VectorXd& x, std::vector<ZoneBlockSolver::LocalBlock>& local,
                      ZoneTransports& transports) const override;
  double residual_scale() const override { return scale_; }
  //! The vessel's balances, each phase and species over all zones: the liquid's transport moves
  //! and the gas's carries out through the surface only, so the sum of the gas O2 rows is O2 fed
  //! minus off-gas minus transferred, that of the liquid O2 rows transferred minus taken up. As a
  //! fraction of the O2 fed (the CO2 balances too: they are of the same order).
  double largest_imbalance(const Eigen::VectorXd& r) const override;
  //! Liquid O2, CO2 then gas O2, CO2 per zone.
  ZoneLayout zone_layout() const override { return {n_}; }
  //! Gas O2 and CO2 stay positive: a step may take each to no less than a tenth of its value.
  //! With a negative amount the gas composition y = g / (g_O2 + g_CO2 + inert) changes the sign of
  //! its derivatives, and the preconditioner of a zone with a trace of gas loses its structure.
  //! The liquid needs no bound: the uptake is continued linearly below zero.
  void keep_in_domain(const Eigen::VectorXd& x, Eigen::VectorXd& x_try) const override;

 private:
  ZoneBlockSolver::LocalBlock local_block(const Eigen::VectorXd& x, int k) const;
  const ZoneNetwork& net_;
  const SparseMatrix& transport_;
  const SparseMatrix& gas_transport_;
  const TransferCoefficients& coeff_;
  Uptake uptake_;
  double inlet_o2_, inlet_co2_;
  int n_;
  double scale_;
};

}  // namespace oxystrat
