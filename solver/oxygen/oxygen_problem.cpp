#include "solver/oxygen/oxygen_problem.hpp"

#include <algorithm>
#include <array>
#include <cmath>

#include "solver/linalg/parallel_loop.hpp"

namespace oxystrat {

ZoneTransfer zone_transfer(const TransferCoefficients& coeff, int k, double c, double d, double go, double gc) {
  const double g = go + gc + coeff.inert_mol_m3[k];
  const double t_o = coeff.transfer_o2[k], t_c = coeff.transfer_co2[k];
  const double k_o = coeff.cstar_per_y_o2[k], k_c = coeff.cstar_per_y_co2[k];
  const double g0 = coeff.gas_mol_m3.empty() ? 0.0 : coeff.gas_mol_m3[k];
  ZoneTransfer z;
  if (g0 > 0.0) {
    // (T / g0) (K g_O2 - C g): linear in the gas amounts, no composition ratio.
    z.gas_ratio = g / g0;
    const double a = t_o / g0, b = t_c / g0;
    z.otr = a * (k_o * go - c * g);
    z.ctr = b * (k_c * gc - d * g);
    z.otr_c = -a * g;
    z.otr_go = a * (k_o - c);
    z.otr_gc = -a * c;
    z.ctr_d = -b * g;
    z.ctr_gc = b * (k_c - d);
    z.ctr_go = -b * d;
    return z;
  }
  // Fixed T and S: y = g_O2 / g, d y / d g_O2 = (g - g_O2) / g^2, d y / d g_CO2 = -g_O2 / g^2.
  const double y = g > 0.0 ? go / g : 0.0, yc = g > 0.0 ? gc / g : 0.0;
  z.otr = t_o * (k_o * y - c);
  z.ctr = t_c * (k_c * yc - d);
  z.otr_c = -t_o;
  z.ctr_d = -t_c;
  if (g > 0.0) {
    const double g2 = g * g;
    z.otr_go = t_o * k_o * (g - go) / g2;
    z.otr_gc = -t_o * k_o * go / g2;
    z.ctr_gc = t_c * k_c * (g - gc) / g2;
    z.ctr_go = -t_c * k_c * gc / g2;
  }
  return z;
}

OxygenProblem::OxygenProblem(const ZoneNetwork& net, const GasRouting& routing, const SparseMatrix& transport,
                             const TransferCoefficients& coeff, const Uptake& uptake, double inlet_o2_mol_s,
                             double inlet_co2_mol_s)
    : net_(net),
      transport_(transport),
      gas_transport_(routing.transport),
      coeff_(coeff),
      uptake_(uptake),
      inlet_o2_(inlet_o2_mol_s),
      inlet_co2_(inlet_co2_mol_s),
      n_(net.size()) {
  // Zero for a residual means small against the O2 fed and the largest possible uptake.
  const double max_uptake = uptake_.rate_mol_m3_s * uptake_.largest_scale() * net.total_volume();
  scale_ = std::max({inlet_o2_, max_uptake, 1e-300});
}

void OxygenProblem::residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const {
  r.setZero(4 * n_);
  // Transport of the dissolved species (L) and of the gas species (G): rows applied with stride 4.
  for (int col = 0; col < n_; ++col) {
    for (SparseMatrix::InnerIterator it(transport_, col); it; ++it) {
      r[4 * it.row()] += it.value() * x[4 * col];
      r[4 * it.row() + 1] += it.value() * x[4 * col + 1];
    }
    for (SparseMatrix::InnerIterator it(gas_transport_, col); it; ++it) {
      r[4 * it.row() + 2] += it.value() * x[4 * col + 2];
      r[4 * it.row() + 3] += it.value() * x[4 * col + 3];
    }
  }
  for (int k = 0; k < n_; ++k) {
    const double c = x[4 * k];
    const ZoneTransfer z = zone_transfer(coeff_, k, c, x[4 * k + 1], x[4 * k + 2], x[4 * k + 3]);
    const double our = uptake_.our(c) * uptake_.scale(k) * net_.volume[k];
    r[4 * k] += z.otr - our;
    r[4 * k + 1] += z.ctr + uptake_.rq * our;
    r[4 * k + 2] += inlet_o2_ * net_.sparger_share[k] - z.otr;
    r[4 * k + 3] += inlet_co2_ * net_.sparger_share[k] - z.ctr;
  }
}

void OxygenProblem::keep_in_domain(const Eigen::VectorXd& x, Eigen::VectorXd& x_try) const {
  constexpr double kLargestFall = 0.1;  // a gas amount may fall tenfold per step, no more
  for (int k = 0; k < n_; ++k) {
    for (int s = 2; s < 4; ++s) {
      const int i = 4 * k + s;
      x_try[i] = std::max(x_try[i], kLargestFall * std::max(x[i], 0.0));
    }
  }
}

double OxygenProblem::largest_imbalance(const Eigen::VectorXd& r) const {
  std::array<double, 4> sum{};
  for (int k = 0; k < n_; ++k) {
    for (int s = 0; s < 4; ++s) sum[s] += r[4 * k + s];
  }
  double largest = 0.0;
  for (const double v : sum) largest = std::max(largest, std::abs(v));
  return inlet_o2_ > 0.0 ? largest / inlet_o2_ : largest / scale_;
}

void OxygenProblem::jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const {
  jacobian_zones(x, 0, n_, t);
}

// The derivatives of a zone's transfer, uptake and gas composition terms: its 4 x 4 block
// (row-major; rows and columns liquid O2, liquid CO2, gas O2, gas CO2).
ZoneBlockSolver::LocalBlock OxygenProblem::local_block(const Eigen::VectorXd& x, int k) const {
  const ZoneTransfer z = zone_transfer(coeff_, k, x[4 * k], x[4 * k + 1], x[4 * k + 2], x[4 * k + 3]);
  const double dour = uptake_.dour(x[4 * k]) * uptake_.scale(k) * net_.volume[k];
  return {z.otr_c - dour, 0.0,    z.otr_go,  z.otr_gc,   //
          uptake_.rq * dour, z.ctr_d, z.ctr_go, z.ctr_gc,  //
          -z.otr_c, 0.0, -z.otr_go, -z.otr_gc,             //
          0.0, -z.ctr_d, -z.ctr_go, -z.ctr_gc};
}

bool OxygenProblem::jacobian_parts(const Eigen::VectorXd& x, std::vector<ZoneBlockSolver::LocalBlock>& local,
                                   ZoneTransports& transports) const {
  if (static_cast<int>(local.size()) != n_) return false;
  parallel_loop(n_, n_ >= 50000, [&](int k) { local[k] = local_block(x, k); });
  transports = {&transport_, &gas_transport_};
  return true;
}

// Zone by zone: the zone's column of both transports, then its local block. Any split into ranges
// gives the same list, and every matrix entry receives its terms in the same order (transport
// before local), so the sums are the same to the bit.
bool OxygenProblem::jacobian_zones(const Eigen::VectorXd& x, int zone_begin, int zone_end,
                                   std::vector<Eigen::Triplet<double>>& t) const {
  const int* outer = transport_.outerIndexPtr();
  const int* gas_outer = gas_transport_.outerIndexPtr();
  std::size_t count = 0;
  for (int k = zone_begin; k < zone_end; ++k) count += 2 * (outer[k + 1] - outer[k]) + 2 * (gas_outer[k + 1] - gas_outer[k]) + 13;
  // Exact for a fresh list (no doubling of a large one), geometric when appended to piece by piece.
  if (t.capacity() < t.size() + count) t.reserve(t.empty() ? count : std::max(t.size() + count, 2 * t.capacity()));
  for (int k = zone_begin; k < zone_end; ++k) {
    for (SparseMatrix::InnerIterator it(transport_, k); it; ++it) {
      t.emplace_back(4 * it.row(), 4 * k, it.value());
      t.emplace_back(4 * it.row() + 1, 4 * k + 1, it.value());
    }
    for (SparseMatrix::InnerIterator it(gas_transport_, k); it; ++it) {
      t.emplace_back(4 * it.row() + 2, 4 * k + 2, it.value());
      t.emplace_back(4 * it.row() + 3, 4 * k + 3, it.value());
    }
    // The local block's non-zero entries (row-major positions), in the order the list has always had.
    constexpr std::array<int, 13> kListed = {0, 2, 3, 5, 4, 7, 6, 8, 10, 11, 13, 15, 14};
    const auto b = local_block(x, k);
    for (const int at : kListed) t.emplace_back(4 * k + at / 4, 4 * k + at % 4, b[at]);
  }
  return true;
}

}  // namespace oxystrat
