#include "solver/oxygen/oxygen_problem.hpp"

#include <algorithm>
#include <numeric>

namespace oxystrat {

OxygenProblem::OxygenProblem(const ZoneNetwork& net, const GasRouting& routing, const SparseMatrix& transport,
                             const TransferCoefficients& coeff, const Uptake& uptake, double inlet_o2_mol_s,
                             double inlet_co2_mol_s)
    : net_(net),
      transport_(transport),
      order_(&routing.order),
      coeff_(coeff),
      uptake_(uptake),
      inlet_o2_(inlet_o2_mol_s),
      inlet_co2_(inlet_co2_mol_s),
      n_(net.size()) {
  // Gas links grouped by receiving zone (counting sort: sending zones in increasing order).
  inflow_start_.assign(n_ + 1, 0);
  for (int k = 0; k < n_; ++k) {
    for (const auto& l : routing.out[k]) {
      if (l.to >= 0) ++inflow_start_[l.to + 1];
    }
  }
  for (int k = 0; k < n_; ++k) inflow_start_[k + 1] += inflow_start_[k];
  inflows_.resize(inflow_start_[n_]);
  std::vector<int> at(inflow_start_.begin(), inflow_start_.end() - 1);
  for (int k = 0; k < n_; ++k) {
    for (const auto& l : routing.out[k]) {
      if (l.to >= 0) inflows_[at[l.to]++] = {k, l.share};
    }
  }
  // Zero for a residual means small against the O2 fed and the largest possible uptake.
  const double max_uptake = uptake_.rate_mol_m3_s * uptake_.largest_scale() * net.total_volume();
  scale_ = std::max({inlet_o2_, max_uptake, 1e-300});
}

void OxygenProblem::residual(const Eigen::VectorXd& x, Eigen::VectorXd& r) const {
  r.setZero(4 * n_);
  // Transport of both dissolved species: rows of L applied with stride 4.
  for (int col = 0; col < transport_.outerSize(); ++col) {
    for (SparseMatrix::InnerIterator it(transport_, col); it; ++it) {
      const auto row = it.row();
      r[4 * row] += it.value() * x[4 * col];
      r[4 * row + 1] += it.value() * x[4 * col + 1];
    }
  }
  for (int k = 0; k < n_; ++k) {
    const double c = x[4 * k], d = x[4 * k + 1], no = x[4 * k + 2], nc = x[4 * k + 3];
    const double total = no + nc + coeff_.inert_flow[k];
    const double y = total > 0.0 ? no / total : 0.0;
    const double yc = total > 0.0 ? nc / total : 0.0;
    const double otr = coeff_.transfer_o2[k] * (coeff_.cstar_per_y_o2[k] * y - c);
    const double ctr = coeff_.transfer_co2[k] * (coeff_.cstar_per_y_co2[k] * yc - d);
    const double our = uptake_.our(c) * uptake_.scale(k) * net_.volume[k];
    double in_o = inlet_o2_ * net_.sparger_share[k], in_c = inlet_co2_ * net_.sparger_share[k];
    for (int e = inflow_start_[k]; e < inflow_start_[k + 1]; ++e) {
      const Inflow& f = inflows_[e];
      in_o += f.share * x[4 * f.from + 2];
      in_c += f.share * x[4 * f.from + 3];
    }
    r[4 * k] += otr - our;
    r[4 * k + 1] += ctr + uptake_.rq * our;
    r[4 * k + 2] = in_o - no - otr;
    r[4 * k + 3] = in_c - nc - ctr;
  }
}

void OxygenProblem::jacobian(const Eigen::VectorXd& x, std::vector<Eigen::Triplet<double>>& t) const {
  jacobian_zones(x, 0, n_, t);
}

// Zone by zone: the zone's column of the transport (both species), then its local block and gas
// inflows. Any split into ranges gives the same list, and every matrix entry receives its terms in
// the same order (transport before local), so the sums are the same to the bit.
bool OxygenProblem::jacobian_zones(const Eigen::VectorXd& x, int zone_begin, int zone_end,
                                   std::vector<Eigen::Triplet<double>>& t) const {
  const int* outer = transport_.outerIndexPtr();
  std::size_t count = 0;
  for (int k = zone_begin; k < zone_end; ++k) count += 2 * (outer[k + 1] - outer[k]) + 13 + 2 * (inflow_start_[k + 1] - inflow_start_[k]);
  // Exact for a fresh list (no doubling of a large one), geometric when appended to piece by piece.
  if (t.capacity() < t.size() + count) t.reserve(t.empty() ? count : std::max(t.size() + count, 2 * t.capacity()));
  for (int k = zone_begin; k < zone_end; ++k) {
    for (SparseMatrix::InnerIterator it(transport_, k); it; ++it) {
      t.emplace_back(4 * it.row(), 4 * k, it.value());
      t.emplace_back(4 * it.row() + 1, 4 * k + 1, it.value());
    }
    const int c = 4 * k, d = c + 1, o = c + 2, q = c + 3;
    const double no = x[o], nc = x[q];
    const double total = no + nc + coeff_.inert_flow[k];
    const double t_o = coeff_.transfer_o2[k], t_c = coeff_.transfer_co2[k];
    const double k_o = coeff_.cstar_per_y_o2[k], k_c = coeff_.cstar_per_y_co2[k];
    // d y / d n_O2 = (total - n_O2) / total^2, d y / d n_CO2 = -n_O2 / total^2; likewise for CO2.
    double dy_dno = 0.0, dy_dnc = 0.0, dyc_dnc = 0.0, dyc_dno = 0.0;
    if (total > 0.0) {
      const double t2 = total * total;
      dy_dno = (total - no) / t2;
      dy_dnc = -no / t2;
      dyc_dnc = (total - nc) / t2;
      dyc_dno = -nc / t2;
    }
    const double dour = uptake_.dour(x[c]) * uptake_.scale(k) * net_.volume[k];
    // d OTR / d(C, n_O2, n_CO2) and d CTR / d(D, n_O2, n_CO2)
    const double otr_c = -t_o, otr_no = t_o * k_o * dy_dno, otr_nc = t_o * k_o * dy_dnc;
    const double ctr_d = -t_c, ctr_nc = t_c * k_c * dyc_dnc, ctr_no = t_c * k_c * dyc_dno;
    t.emplace_back(c, c, otr_c - dour);
    t.emplace_back(c, o, otr_no);
    t.emplace_back(c, q, otr_nc);
    t.emplace_back(d, d, ctr_d);
    t.emplace_back(d, c, uptake_.rq * dour);
    t.emplace_back(d, q, ctr_nc);
    t.emplace_back(d, o, ctr_no);
    t.emplace_back(o, c, -otr_c);
    t.emplace_back(o, o, -1.0 - otr_no);
    t.emplace_back(o, q, -otr_nc);
    t.emplace_back(q, d, -ctr_d);
    t.emplace_back(q, q, -1.0 - ctr_nc);
    t.emplace_back(q, o, -ctr_no);
    for (int e = inflow_start_[k]; e < inflow_start_[k + 1]; ++e) {
      const Inflow& f = inflows_[e];
      t.emplace_back(o, 4 * f.from + 2, f.share);
      t.emplace_back(q, 4 * f.from + 3, f.share);
    }
  }
  return true;
}

}  // namespace oxystrat
