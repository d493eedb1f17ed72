#include "solver/flow/hydrodynamics.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "physics/solubility.hpp"
#include "solver/flow/viscous_flow.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

// Gas flow reaching each impeller at its own pressure. The first impeller above the sparger takes
// all of it; upper impellers take model.upper_gas_share of the local flow, since much of the gas
// rising from below passes outside their blades (a documented modelling choice).
std::vector<double> impeller_gas_flows(const Case& c, double molar_flow) {
  std::vector<double> q(c.impellers.size(), 0.0);
  if (molar_flow <= 0.0) return q;
  const double t = c.vessel.temperature_k;
  const double pw = physics::water_vapour_pressure(t);
  bool first = true;
  for (size_t m = 0; m < c.impellers.size(); ++m) {
    const double z = c.impellers[m].elevation_m;
    if (z < c.sparger.elevation_m) continue;  // below the sparger: no gas
    const double p = c.vessel.head_pressure_pa + c.broth.density_kg_m3 * kG * (c.vessel.liquid_height_m - z);
    const double local = molar_flow * kR * t / (p - pw);  // wet gas volume at (p, T)
    q[m] = first ? local : c.model.upper_gas_share * local;
    first = false;
  }
  return q;
}

ImpellerState impeller_state(const Case& c, const Impeller& imp, double gas_m3_s) {
  ImpellerState s;
  const double n = c.operation.speed_rps;
  const double d = imp.diameter_m;
  const double rho = c.broth.density_kg_m3;
  s.reynolds = metzner_otto_reynolds(c.broth.rheology, rho, n, d, impeller_data(imp.type).metzner_otto_constant);
  const double np_t = imp.power_number.value_or(impeller_data(imp.type).power_number);
  s.power_number = power_number(s.reynolds, np_t, impeller_data(imp.type).laminar_constant);
  s.flow_number = imp.flow_number.value_or(impeller_data(imp.type).flow_number);
  s.power_ungassed_w = s.power_number * rho * n * n * n * std::pow(d, 5) * c.model.multiple_impeller_factor;
  s.tip_speed_m_s = std::numbers::pi * n * d;
  s.pumping_m3_s = s.flow_number * n * d * d * d;
  const double t_over_d = c.vessel.diameter_m / d;
  // The loops carry the pumped flow; entrainment into the discharge stream is left to the
  // turbulent exchange, so it is not counted twice (circulation_factor overrides).
  s.circulation_m3_s = s.pumping_m3_s * imp.circulation_factor.value_or(1.0);
  s.gas_flow_m3_s = gas_m3_s;
  s.aeration_number = gas_m3_s / (n * d * d * d);
  s.froude = n * n * d / kG;
  const auto& type = impeller_data(imp.type);
  s.flooding_aeration = flooding_aeration_number(imp.type, s.froude, 1.0 / t_over_d);
  s.dispersion_aeration = complete_dispersion_aeration_number(imp.type, s.froude, 1.0 / t_over_d);
  // Types without a sharp flooding transition are never reported flooded.
  s.regime = gas_regime(s.aeration_number, type.floods ? s.flooding_aeration : HUGE_VAL, s.dispersion_aeration);
  if (s.aeration_number > 0.0) {
    s.gassed_ratio = imp.gassed_power_factor.value_or(
        gassed_power_ratio(imp.type, s.aeration_number, s.froude, 1.0 / t_over_d));
  }
  s.gassed_ratio = std::min(1.0, s.gassed_ratio * c.model.gassed_power_multiplier);
  s.power_gassed_w = s.gassed_ratio * s.power_ungassed_w;
  // Gas-filled cavities behind the blades cut the pumping roughly as they cut the power [mem]:
  // a flooded impeller's loops weaken and its gas rises through as a plume.
  s.circulation_m3_s *= s.gassed_ratio;
  return s;
}

// Spreads each impeller's gassed power over zones: model.discharge_power_share in its swept
// volume (uniform), the rest over its domain, weighted by 1/(1 + (d/D)^2) with d the distance
// from the swept volume, so dissipation falls off away from the blades. Broth outside every cavern
// of a yield-stress broth does not move, so it takes none of the power.
std::vector<double> dissipation(const Case& c, const ZoneNetwork& net, const std::vector<ImpellerState>& states,
                                const Caverns& caverns) {
  const int nz = net.size();
  std::vector<double> power(nz, 0.0);
  for (size_t m = 0; m < c.impellers.size(); ++m) {
    const auto& imp = c.impellers[m];
    const double ri = 0.5 * imp.diameter_m;
    std::vector<double> w_dis(nz, 0.0), w_bulk(nz, 0.0);
    double sum_dis = 0.0, sum_bulk = 0.0;
    for (int k = 0; k < nz; ++k) {
      if (net.region[k].discharge == static_cast<int>(m)) {
        w_dis[k] = net.volume[k];
        sum_dis += w_dis[k];
      } else if (net.region[k].domain == static_cast<int>(m) && caverns.contains(net.r[k], net.z[k])) {
        const double dr = std::max(0.0, net.r[k] - ri);
        const double dz = std::max(0.0, std::abs(net.z[k] - imp.elevation_m) - 0.5 * imp.blade_height_m);
        const double dist2 = (dr * dr + dz * dz) / (imp.diameter_m * imp.diameter_m);
        w_bulk[k] = net.volume[k] / (1.0 + dist2);
        sum_bulk += w_bulk[k];
      }
    }
    double share_dis = c.model.discharge_power_share;
    if (sum_bulk <= 0.0) share_dis = 1.0;
    if (sum_dis <= 0.0) share_dis = 0.0;
    const double pg = states[m].power_gassed_w;
    if (sum_dis <= 0.0 && sum_bulk <= 0.0) {  // coarse grid: the zone holding the blades takes it all
      const int k = net.zone_containing(0.5 * ri, imp.elevation_m);
      power[k >= 0 ? k : 0] += pg;
      continue;
    }
    for (int k = 0; k < nz; ++k) {
      if (w_dis[k] > 0.0) power[k] += pg * share_dis * w_dis[k] / sum_dis;
      if (w_bulk[k] > 0.0) power[k] += pg * (1.0 - share_dis) * w_bulk[k] / sum_bulk;
    }
  }
  std::vector<double> eps(nz);
  for (int k = 0; k < nz; ++k) eps[k] = power[k] / (c.broth.density_kg_m3 * net.volume[k]);
  return eps;
}

}  // namespace

Hydrodynamics compute_hydrodynamics(const Case& c, const ZoneNetwork& net) {
  Hydrodynamics h;
  h.gas_molar_flow_mol_s = c.operation.gas_flow_normal_m3_s / normal_molar_volume;
  const auto gas = impeller_gas_flows(c, h.gas_molar_flow_mol_s);
  std::vector<double> circulation;
  for (size_t m = 0; m < c.impellers.size(); ++m) {
    h.impellers.push_back(impeller_state(c, c.impellers[m], gas[m]));
    h.power_ungassed_w += h.impellers.back().power_ungassed_w;
    h.power_gassed_w += h.impellers.back().power_gassed_w;
    circulation.push_back(h.impellers.back().circulation_m3_s);
  }
  h.loops = circulation_loops(c, circulation);
  std::vector<double> np;
  for (const auto& s : h.impellers) np.push_back(s.power_number);
  const Caverns caverns = impeller_caverns(c, np);
  for (size_t m = 0; m < caverns.diameter_m.size(); ++m) {
    h.impellers[m].cavern_diameter_m = caverns.diameter_m[m];
    h.impellers[m].cavern_height_m = caverns.height_m[m];
  }

  // Face flows from the stream function at the face ends (exactly 0 on the vessel wall, and
  // outside every cavern of a yield-stress broth: any field of psi gives balanced zones).
  const auto psi_at = [&](double r, double z, bool on_wall) {
    return on_wall || !caverns.contains(r, z) ? 0.0 : stream_function(h.loops, net.shape, r, z);
  };
  const double two_pi = 2.0 * std::numbers::pi;
  h.face_flow.resize(net.faces.size());
  for (size_t f = 0; f < net.faces.size(); ++f) {
    const auto& face = net.faces[f];
    const double pa = psi_at(face.ra, face.za, face.a_on_wall);
    const double pb = psi_at(face.rb, face.zb, face.b_on_wall);
    // Outward through a cylinder: 2 pi (psi_top - psi_bottom); upward through a disc: -2 pi (psi_out - psi_in).
    h.face_flow[f] = face.orientation == FaceOrientation::radial ? two_pi * (pb - pa) : -two_pi * (pb - pa);
  }

  h.epsilon = dissipation(c, net, h.impellers, caverns);
  zone_viscosity(c, h.epsilon, h.shear_rate, h.apparent_viscosity);
  const auto share = turbulence_share(c, net, np, h.apparent_viscosity, caverns);
  h.stagnant_volume_fraction = 0.0;
  h.stagnant.assign(net.size(), false);
  for (int k = 0; k < net.size(); ++k) {
    h.stagnant[k] = share[k] == 0.0;
    if (h.stagnant[k]) h.stagnant_volume_fraction += net.volume[k] / net.total_volume();
  }

  // Turbulent exchange: D_t = c_t eps^(1/3) T^(4/3) per zone, damped below the turbulent regime,
  // molecular in stagnant broth; in series across the face.
  h.exchange_constant = c.model.exchange_constant > 0.0 ? c.model.exchange_constant : default_exchange_constant;
  const double l43 = std::pow(c.vessel.diameter_m, 4.0 / 3.0);
  std::vector<double> diffusivity(net.size());
  for (int k = 0; k < net.size(); ++k) {
    diffusivity[k] = share[k] == 0.0 ? stagnant_diffusivity_m2_s
                                     : h.exchange_constant * std::cbrt(h.epsilon[k]) * l43 * share[k];
  }
  h.face_exchange.resize(net.faces.size());
  for (size_t f = 0; f < net.faces.size(); ++f) {
    const auto& face = net.faces[f];
    const bool radial = face.orientation == FaceOrientation::radial;
    const double pos = radial ? face.ra : face.za;
    const double da = std::max(1e-9, radial ? pos - net.r[face.zone_a] : pos - net.z[face.zone_a]);
    const double db = std::max(1e-9, radial ? net.r[face.zone_b] - pos : net.z[face.zone_b] - pos);
    const double resistance = da / std::max(diffusivity[face.zone_a], 1e-30) + db / std::max(diffusivity[face.zone_b], 1e-30);
    h.face_exchange[f] = face.area / resistance;
  }

  // Zone-mean velocities from the face flows, for pictures.
  const int nz = net.size();
  std::vector<double> qr(nz, 0.0), qz(nz, 0.0);
  for (size_t f = 0; f < net.faces.size(); ++f) {
    auto& acc = net.faces[f].orientation == FaceOrientation::radial ? qr : qz;
    acc[net.faces[f].zone_a] += 0.5 * h.face_flow[f];
    acc[net.faces[f].zone_b] += 0.5 * h.face_flow[f];
  }
  h.velocity_r.resize(nz);
  h.velocity_z.resize(nz);
  for (int k = 0; k < nz; ++k) {
    const double height = net.z1[k] - 0.5 * (net.z_floor_inner[k] + net.z_floor_outer[k]);
    h.velocity_r[k] = qr[k] / (two_pi * net.r[k] * std::max(height, 1e-12));
    h.velocity_z[k] = qz[k] / (std::numbers::pi * (net.r1[k] * net.r1[k] - net.r0[k] * net.r0[k]));
  }
  return h;
}

double max_zone_imbalance(const ZoneNetwork& net, const std::vector<double>& face_flow) {
  std::vector<double> net_out(net.size(), 0.0), total(net.size(), 0.0);
  for (size_t f = 0; f < net.faces.size(); ++f) {
    net_out[net.faces[f].zone_a] += face_flow[f];
    net_out[net.faces[f].zone_b] -= face_flow[f];
    total[net.faces[f].zone_a] += std::abs(face_flow[f]);
    total[net.faces[f].zone_b] += std::abs(face_flow[f]);
  }
  double worst = 0.0;
  for (int k = 0; k < net.size(); ++k) {
    if (total[k] > 0.0) worst = std::max(worst, std::abs(net_out[k]) / total[k]);
  }
  return worst;
}

}  // namespace oxystrat
