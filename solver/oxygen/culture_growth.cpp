#include "solver/oxygen/culture_growth.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

#include "physics/solubility.hpp"
#include "input/errors.hpp"

namespace oxystrat {

GrowthKinetics::GrowthKinetics(const Culture& c)
    : mu_max_s(c.growth_rate_max_s),
      k_s_kg_m3(std::max(c.k_substrate_kg_m3, 1e-9)),
      k_o2_mol_m3(std::max(c.k_o2_mol_m3, 1e-9)),
      yield_substrate(c.yield_substrate),
      yield_o2_kg_mol(0.0),
      maintenance_substrate_s(c.maintenance_substrate_s),
      maintenance_o2_mol_kg_s(c.maintenance_o2_mol_kg_s) {
  // Without a given O2 yield, the largest uptake (saturating substrate) is the case's q_O2,max,
  // so a transient run and a steady run of the same case agree at the start.
  const double growth_share = c.q_o2_max_mol_kg_s - c.maintenance_o2_mol_kg_s;
  yield_o2_kg_mol = c.yield_oxygen > 0.0 ? c.yield_oxygen * physics::molar_mass_o2
                    : growth_share > 0.0 ? c.growth_rate_max_s / growth_share
                                         : 1e300;
}

CultureStep::CultureStep(const ZoneNetwork& net, const SparseMatrix& transport, const GrowthKinetics& g,
                         const std::vector<double>& do_mol_m3, const Eigen::VectorXd& old,
                         const std::vector<double>& feed_kg_s, double h)
    : net_(net), transport_(transport), g_(g), do_(do_mol_m3), old_(old), feed_(feed_kg_s), h_(h) {
  // Zero for a residual: small against the content changing in one step and the feed.
  double content = 0.0, fed = 0.0;
  for (int k = 0; k < net.size(); ++k) {
    content += net.volume[k] * (std::abs(old[2 * k]) + std::abs(old[2 * k + 1]));
    fed += std::abs(feed_kg_s[k]);
  }
  scale_ = std::max({content / h, fed, 1e-300});
}

void CultureStep::residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const {
  r.setZero(size());
  for (int col = 0; col < transport_.outerSize(); ++col) {
    for (SparseMatrix::InnerIterator it(transport_, col); it; ++it) {
      r[2 * it.row()] += it.value() * x[2 * col];
      r[2 * it.row() + 1] += it.value() * x[2 * col + 1];
    }
  }
  for (int k = 0; k < net_.size(); ++k) {
    const double v = net_.volume[k], s = x[2 * k], b = x[2 * k + 1];
    r[2 * k] += feed_[k] - v * b * g_.substrate_uptake(s, do_[k]) - v * (s - old_[2 * k]) / h_;
    r[2 * k + 1] += v * g_.growth_rate(s, do_[k]) * b - v * (b - old_[2 * k + 1]) / h_;
  }
}

void CultureStep::jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const {
  for (int col = 0; col < transport_.outerSize(); ++col) {
    for (SparseMatrix::InnerIterator it(transport_, col); it; ++it) {
      t.emplace_back(2 * it.row(), 2 * col, it.value());
      t.emplace_back(2 * it.row() + 1, 2 * col + 1, it.value());
    }
  }
  for (int k = 0; k < net_.size(); ++k) {
    const double v = net_.volume[k], s = x[2 * k], b = x[2 * k + 1], c = do_[k];
    const double d_mu_ds = g_.mu_max_s * GrowthKinetics::d_monod(s, g_.k_s_kg_m3) * GrowthKinetics::monod(c, g_.k_o2_mol_m3);
    t.emplace_back(2 * k, 2 * k, -v * b * g_.d_substrate_uptake(s, c) - v / h_);
    t.emplace_back(2 * k, 2 * k + 1, -v * g_.substrate_uptake(s, c));
    t.emplace_back(2 * k + 1, 2 * k + 1, v * g_.growth_rate(s, c) - v / h_);
    t.emplace_back(2 * k + 1, 2 * k, v * d_mu_ds * b);
  }
}

namespace {

class SteadySubstrate : public SteadyProblem {
 public:
  SteadySubstrate(const ZoneNetwork& net, const SparseMatrix& transport, const GrowthKinetics& g,
                  const std::vector<double>& c, const std::vector<double>& x, const std::vector<double>& feed)
      : net_(net), transport_(transport), g_(g), c_(c), x_(x), feed_(feed) {
    double fed = 0.0;
    for (double f : feed) fed += std::abs(f);
    scale_ = std::max(fed, 1e-300);
  }
  int size() const override { return net_.size(); }
  void residual(const Eigen::VectorXd& s, Eigen::VectorXd& r) const override {
    r.setZero(size());
    for (int col = 0; col < transport_.outerSize(); ++col) {
      for (SparseMatrix::InnerIterator it(transport_, col); it; ++it) r[it.row()] += it.value() * s[col];
    }
    for (int k = 0; k < size(); ++k) r[k] += feed_[k] - net_.volume[k] * x_[k] * g_.substrate_uptake(s[k], c_[k]);
  }
  void jacobian(const Eigen::VectorXd& s, std::vector<Eigen::Triplet<double>>& t) const override {
    for (int col = 0; col < transport_.outerSize(); ++col) {
      for (SparseMatrix::InnerIterator it(transport_, col); it; ++it) t.emplace_back(it.row(), col, it.value());
    }
    for (int k = 0; k < size(); ++k) {
      t.emplace_back(k, k, -net_.volume[k] * x_[k] * g_.d_substrate_uptake(s[k], c_[k]));
    }
  }
  double residual_scale() const override { return scale_; }

 private:
  const ZoneNetwork& net_;
  const SparseMatrix& transport_;
  const GrowthKinetics& g_;
  const std::vector<double>&c_, &x_, &feed_;
  double scale_;
};

}  // namespace

std::vector<double> steady_substrate_field(const ZoneNetwork& net, const SparseMatrix& transport,
                                           const GrowthKinetics& g, const std::vector<double>& do_mol_m3,
                                           const std::vector<double>& biomass_kg_m3, const std::vector<double>& feed_kg_s) {
  // The culture takes up at most X q_S(inf, C) per volume; a larger feed accumulates for ever.
  double capacity = 0.0, fed = 0.0;
  for (int k = 0; k < net.size(); ++k) {
    capacity += net.volume[k] * biomass_kg_m3[k] * g.substrate_uptake(1e300, do_mol_m3[k]);
    fed += feed_kg_s[k];
  }
  if (fed >= capacity) {
    throw SolveError(fmt::format("the feed ({:.4g} kg/h of substrate) exceeds what the culture can take up "
                                         "({:.4g} kg/h): the substrate has no steady field",
                                         3600 * fed, 3600 * capacity));
  }
  const SteadySubstrate p(net, transport, g, do_mol_m3, biomass_kg_m3, feed_kg_s);
  // Damped Newton from S = K_S: the uptake is monotone in S, so the residual has one root.
  Eigen::VectorXd s = Eigen::VectorXd::Constant(net.size(), g.k_s_kg_m3);
  const auto rep = solve_newton(p, s, {});
  if (!rep.converged) {
    throw SolveError(fmt::format("the steady substrate field did not converge (scaled residual {:.3g})",
                                         rep.residual));
  }
  return std::vector<double>(s.data(), s.data() + s.size());
}

}  // namespace oxystrat
