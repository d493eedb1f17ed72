#include "solver/oxygen/transient_step.hpp"

namespace oxystrat::transient_detail {
namespace {

// One implicit Euler step: the liquid rows gain -V (x - x_old) / h, the gas rows stay algebraic.
class EulerStep : public SteadyProblem {
 public:
  EulerStep(const OxygenProblem& p, const ZoneNetwork& net, const Eigen::VectorXd& old, double h)
      : p_(p), net_(net), old_(old), h_(h) {
    // Zero for a residual is also small against the storage term V C / h: with short steps that
    // term dwarfs the O2 fed, and its round-off alone would stay above 1e-12 of the feed.
    double storage = 0.0;
    for (int k = 0; k < net.size(); ++k) storage += net.volume[k] * (std::abs(old[4 * k]) + std::abs(old[4 * k + 1])) / h;
    scale_ = std::max(p.residual_scale(), 1e-3 * storage);
  }
  int size() const override { return p_.size(); }
  void residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const override {
    p_.residual(x, r);
    for (int k = 0; k < net_.size(); ++k) {
      r[4 * k] -= net_.volume[k] * (x[4 * k] - old_[4 * k]) / h_;
      r[4 * k + 1] -= net_.volume[k] * (x[4 * k + 1] - old_[4 * k + 1]) / h_;
    }
  }
  void jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const override {
    jacobian_zones(x, 0, net_.size(), t);
  }
  bool jacobian_zones(const Eigen::VectorXd& x, int zone_begin, int zone_end,
                      std::vector<Eigen::Triplet<double>>& t) const override {
    for (int k = zone_begin; k < zone_end; ++k) {  // zone by zone, so that any split lists the same
      p_.jacobian_zones(x, k, k + 1, t);
      t.emplace_back(4 * k, 4 * k, -net_.volume[k] / h_);
      t.emplace_back(4 * k + 1, 4 * k + 1, -net_.volume[k] / h_);
    }
    return true;
  }
  bool jacobian_parts(const Eigen::VectorXd& x, std::vector<ZoneBlockSolver::LocalBlock>& local,
                      ZoneTransports& transports) const override {
    if (!p_.jacobian_parts(x, local, transports)) return false;
    for (int k = 0; k < net_.size(); ++k) {
      local[k][0] -= net_.volume[k] / h_;
      local[k][5] -= net_.volume[k] / h_;
    }
    return true;
  }
  double residual_scale() const override { return scale_; }
  //! Same unknowns and gas routing as the steady problem: the structured solve applies.
  ZoneLayout zone_layout() const override { return p_.zone_layout(); }

 private:
  const OxygenProblem& p_;
  const ZoneNetwork& net_;
  const Eigen::VectorXd& old_;
  double h_, scale_ = 0.0;
};

// Gas of one species (2: O2, 3: CO2) leaving through the head space [mol/s].
double offgas(const Plant& p, const Eigen::VectorXd& x, int species) {
  std::vector<double> g(p.net.size());
  for (int k = 0; k < p.net.size(); ++k) g[k] = x[4 * k + species];
  return surface_flow(p.routing, g);
}

}  // namespace

Uptake culture_uptake(const Uptake& base, const GrowthKinetics& g, const BrothState& b, double biomass_ref) {
  Uptake u = base;
  if (b.biomass.empty()) return u;
  const double q_ref = std::max(g.o2_uptake_capacity(1e300), 1e-300);
  u.rate_mol_m3_s = q_ref * biomass_ref;
  u.zone_scale.resize(b.biomass.size());
  for (size_t k = 0; k < b.biomass.size(); ++k) {
    u.zone_scale[k] = b.biomass[k] * g.o2_uptake_capacity(b.substrate[k]) / (q_ref * biomass_ref);
  }
  return u;
}

StepFlows advance(Plant& p, const Case& c, BrothState& b, double h, double feed_volume_m3, int feed_zone,
                  double biomass_ref) {
  StepFlows f;
  auto& s = *p.setup;
  s.update(b.x);
  const GrowthKinetics g(c.culture);
  f.uptake = culture_uptake(s.uptake, g, b, biomass_ref);
  const OxygenProblem problem(p.net, p.routing, s.transport, s.coeff, f.uptake, s.inlet_o2_mol_s, s.inlet_co2_mol_s);
  const Eigen::VectorXd old = b.x;
  const EulerStep step(problem, p.net, old, h);
  const auto rep = solve_newton(step, b.x, {}, &p.o2_workspace);
  f.newton += rep.iterations;
  if (!rep.converged) return f;
  const int n = p.net.size();
  f.o2_in = s.inlet_o2_mol_s;
  f.co2_in = s.inlet_co2_mol_s;
  f.o2_out = offgas(p, b.x, 2);
  f.co2_out = offgas(p, b.x, 3);
  for (int k = 0; k < n; ++k) f.o2_uptake += f.uptake.our(b.x[4 * k]) * f.uptake.scale(k) * p.net.volume[k];
  if (b.biomass.empty()) {
    f.converged = true;
    return f;
  }
  // Substrate and biomass together, at the DO of the new level.
  std::vector<double> feed(n, 0.0), c_new(n);
  if (feed_zone >= 0) feed[feed_zone] = c.feed.concentration_kg_m3 * feed_volume_m3 / h;
  for (int k = 0; k < n; ++k) c_new[k] = b.x[4 * k];
  Eigen::VectorXd sx_old(2 * n);
  for (int k = 0; k < n; ++k) sx_old[2 * k] = b.substrate[k], sx_old[2 * k + 1] = b.biomass[k];
  const CultureStep culture(p.net, s.transport, g, c_new, sx_old, feed, h);
  Eigen::VectorXd sx = sx_old;
  const auto rc = solve_newton(culture, sx, {}, &p.culture_workspace);
  f.newton += rc.iterations;
  if (!rc.converged) return f;
  f.substrate_fed = feed_zone >= 0 ? c.feed.concentration_kg_m3 * feed_volume_m3 : 0.0;
  for (int k = 0; k < n; ++k) {
    const double v = p.net.volume[k], sk = sx[2 * k], xk = sx[2 * k + 1];
    b.substrate[k] = sk;
    b.biomass[k] = xk;
    f.substrate_consumed += v * xk * g.substrate_uptake(sk, c_new[k]) * h;
    f.biomass_grown += v * g.growth_rate(sk, c_new[k]) * xk * h;
  }
  f.converged = true;
  return f;
}

}  // namespace oxystrat::transient_detail
