#include "solver/oxygen/coarse_correction.hpp"

#include <limits>
#include <utility>

#include "solver/oxygen/oxygen_problem.hpp"

namespace oxystrat {
namespace {

constexpr int kUnknownsPerZone = 4;  // unknowns per zone: liquid O2, CO2, gas O2, CO2

// A problem whose residual is another's minus a fixed vector (same Jacobian).
class ShiftedProblem : public SteadyProblem {
 public:
  ShiftedProblem(const SteadyProblem& p, const Eigen::VectorXd& shift) : p_(p), shift_(shift) {}
  int size() const override { return p_.size(); }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override {
    p_.residual(x, r);
    r -= shift_;
  }
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override { p_.jacobian(x, t); }
  bool jacobian_zones(const Eigen::VectorXd& x, int zone_begin, int zone_end,
                      std::vector<Eigen::Triplet<double>>& t) const override {
    return p_.jacobian_zones(x, zone_begin, zone_end, t);
  }
  bool jacobian_parts(const Eigen::VectorXd& x, std::vector<ZoneBlockSolver::LocalBlock>& local,
                      ZoneTransports& transports) const override {
    return p_.jacobian_parts(x, local, transports);
  }
  double residual_scale() const override { return p_.residual_scale(); }
  ZoneLayout zone_layout() const override { return p_.zone_layout(); }
  void keep_in_domain(const Eigen::VectorXd& x, Eigen::VectorXd& x_try) const override { p_.keep_in_domain(x, x_try); }

 private:
  const SteadyProblem& p_;
  const Eigen::VectorXd& shift_;
};

// Gas mole fraction of `species` (2: O2, 3: CO2) in zone k of state x; 0 without gas.
double mole_fraction(const Eigen::VectorXd& x, const std::vector<double>& inert, int k, int species) {
  const double total = x[kUnknownsPerZone * k + 2] + x[kUnknownsPerZone * k + 3] + inert[k];
  return inert[k] > 0.0 && total > 0.0 ? x[kUnknownsPerZone * k + species] / total : 0.0;
}

}  // namespace

NewtonOptions coarse_newton_options(const NewtonOptions& fine) {
  NewtonOptions o = fine;
  o.reduction = 1e-2;  // cut a hundredfold only; tenfold left the fine passes twice the iterations (bench/notes.md)
  o.balance_tolerance = std::numeric_limits<double>::infinity();  // the fine solve closes the balances
  // A hundredfold takes 1-3 steps when the correction works; a halved grid of 2.4e4 zones whose
  // line search had stalled took all 60 and then minutes in the general LU.
  o.max_iterations = 12;
  o.linear.general_lu_up_to_unknowns = 0;
  return o;
}

CoarseCorrection::CoarseCorrection(HalvedGridField level, const ZoneNetwork& fine, double biomass_kg_m3)
    : level_(std::move(level)),
      fine_(fine),
      context_{level_.c, level_.net, level_.hydro, level_.routing},
      setup_(context_, biomass_kg_m3),
      owner_(coarse_owners(level_.net, fine)) {
  Eigen::VectorXd state = std::move(level_.field.state);
  level_.field = OxygenField{};
  level_.field.state = std::move(state);
}

Eigen::VectorXd CoarseCorrection::restricted_state(const Eigen::VectorXd& x, const std::vector<double>& fine_inert) const {
  const int nc = level_.net.size();
  std::vector<double> volume(nc, 0.0), gassed(nc, 0.0);
  Eigen::VectorXd sum = Eigen::VectorXd::Zero(kUnknownsPerZone * nc);  // volume times C_O2, C_CO2, y_O2, y_CO2
  for (int k = 0; k < fine_.size(); ++k) {
    const int kc = owner_[k];
    const double v = fine_.volume[k];
    volume[kc] += v;
    sum[kUnknownsPerZone * kc] += v * x[kUnknownsPerZone * k];
    sum[kUnknownsPerZone * kc + 1] += v * x[kUnknownsPerZone * k + 1];
    if (!(fine_inert[k] > 0.0)) continue;
    gassed[kc] += v;
    sum[kUnknownsPerZone * kc + 2] += v * mole_fraction(x, fine_inert, k, 2);
    sum[kUnknownsPerZone * kc + 3] += v * mole_fraction(x, fine_inert, k, 3);
  }
  // A coarse zone that holds no fine centroid keeps the halved grid's own solution.
  Eigen::VectorXd xc = level_.field.state;
  const auto& inert = setup_.coeff.inert_mol_m3;
  for (int kc = 0; kc < nc; ++kc) {
    if (volume[kc] > 0.0) {
      xc[kUnknownsPerZone * kc] = sum[kUnknownsPerZone * kc] / volume[kc];
      xc[kUnknownsPerZone * kc + 1] = sum[kUnknownsPerZone * kc + 1] / volume[kc];
    }
    if (!(gassed[kc] > 0.0) || !(inert[kc] > 0.0)) continue;
    const double y_o2 = sum[kUnknownsPerZone * kc + 2] / gassed[kc], y_co2 = sum[kUnknownsPerZone * kc + 3] / gassed[kc];
    if (!(y_o2 + y_co2 < 1.0)) continue;
    const double total = inert[kc] / (1.0 - y_o2 - y_co2);
    xc[kUnknownsPerZone * kc + 2] = y_o2 * total;
    xc[kUnknownsPerZone * kc + 3] = y_co2 * total;
  }
  return xc;
}

void CoarseCorrection::add_prolonged(const Eigen::VectorXd& xc, const Eigen::VectorXd& xc0,
                                     const std::vector<double>& fine_inert, Eigen::VectorXd& x) const {
  const int nc = level_.net.size();
  const auto& inert = setup_.coeff.inert_mol_m3;
  Eigen::VectorXd d = xc - xc0;  // the gas rows then hold the change of the mole fractions
  for (int kc = 0; kc < nc; ++kc) {
    for (int species = 2; species < kUnknownsPerZone; ++species) {
      d[kUnknownsPerZone * kc + species] = mole_fraction(xc, inert, kc, species) - mole_fraction(xc0, inert, kc, species);
    }
  }
  // Made again for each correction: kept, they would add to the fine passes' peak memory.
  const auto stencils = interpolation_stencils(level_.net, fine_);
  for (int k = 0; k < fine_.size(); ++k) {
    const auto& s = stencils[k];
    // Mole fractions from the coarse zones that carry gas only (as nested_state() does).
    double e[kUnknownsPerZone] = {0.0, 0.0, 0.0, 0.0}, gas_weight = 0.0;
    for (int i = 0; i < 4; ++i) {
      const int kc = s.zone[i];
      const double w = s.weight[i];
      e[0] += w * d[kUnknownsPerZone * kc];
      e[1] += w * d[kUnknownsPerZone * kc + 1];
      if (w == 0.0 || !(inert[kc] > 0.0)) continue;
      gas_weight += w;
      e[2] += w * d[kUnknownsPerZone * kc + 2];
      e[3] += w * d[kUnknownsPerZone * kc + 3];
    }
    x[kUnknownsPerZone * k] += e[0];
    x[kUnknownsPerZone * k + 1] += e[1];
    if (!(gas_weight > 0.0) || !(fine_inert[k] > 0.0)) continue;
    const double y_o2 = mole_fraction(x, fine_inert, k, 2) + e[2] / gas_weight;
    const double y_co2 = mole_fraction(x, fine_inert, k, 3) + e[3] / gas_weight;
    if (!(y_o2 >= 0.0 && y_co2 >= 0.0 && y_o2 + y_co2 < 1.0)) continue;
    const double total = fine_inert[k] / (1.0 - y_o2 - y_co2);
    x[kUnknownsPerZone * k + 2] = y_o2 * total;
    x[kUnknownsPerZone * k + 3] = y_co2 * total;
  }
}

bool CoarseCorrection::apply(const Eigen::VectorXd& fine_residual, const std::vector<double>& fine_inert, Eigen::VectorXd& x,
                             const NewtonOptions& newton) {
  const Eigen::VectorXd xc0 = restricted_state(x, fine_inert);
  setup_.update(xc0);
  const OxygenProblem problem(level_.net, level_.routing, setup_.transport, setup_.coeff, setup_.uptake,
                              setup_.inlet_o2_mol_s, setup_.inlet_co2_mol_s);
  // F_c(x_c) = F_c(R x) - R r: the residuals (mol/s) summed over each coarse zone's fine zones.
  Eigen::VectorXd shift(problem.size());
  problem.residual(xc0, shift);
  for (int k = 0; k < fine_.size(); ++k) {
    for (int s = 0; s < kUnknownsPerZone; ++s) shift[kUnknownsPerZone * owner_[k] + s] -= fine_residual[kUnknownsPerZone * k + s];
  }
  const ShiftedProblem coarse(problem, shift);
  const NewtonOptions o = coarse_newton_options(newton);
  Eigen::VectorXd xc = xc0;
  // A workspace of its own each time: kept, the coarse preconditioner (a set-up saved) would add
  // to the fine passes' peak memory.
  NewtonWorkspace workspace;
  const NewtonReport rep = solve_newton(coarse, xc, o, &workspace);
  linear_iterations_ += rep.linear_iterations;
  if (!rep.converged || !xc.allFinite()) return false;
  add_prolonged(xc, xc0, fine_inert, x);
  return true;
}

}  // namespace oxystrat
