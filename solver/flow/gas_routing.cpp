#include "solver/flow/gas_routing.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "physics/bubbles.hpp"
#include "physics/solubility.hpp"
#include "input/errors.hpp"
#include "solver/linalg/fgmres.hpp"
#include "solver/linalg/scalar_lu.hpp"
#include "solver/linalg/scalar_multigrid.hpp"
#include "physics/constants.hpp"

namespace oxystrat {
namespace {

// Bubble size in zone k from the sparger's size and the zone's dissipation: Hinze's inertial
// limit, or in a broth so viscous that it falls below the Kolmogorov length, the viscous one.
// A coalescing viscous broth carries its gas in large bubbles: small ones, trapped and slow, hold
// little of the flow (a single size per zone cannot hold both classes; we keep the one that
// carries the gas, the largest stable bubble, [mem] for the observation).
double zone_bubble_size(const Case& c, double formed_m, double epsilon, double sigma, double mu, double shear) {
  if (c.model.bubble_diameter_m > 0.0) return c.model.bubble_diameter_m;
  const double rho = c.broth.density_kg_m3;
  double limit = physics::hinze_max_diameter(sigma, rho, epsilon);
  const bool viscous = limit < physics::kolmogorov_length(mu / rho, epsilon);
  if (viscous) limit = std::max(limit, physics::viscous_max_diameter(sigma, mu * shear));
  const double broken = physics::sauter_to_max_ratio * limit;
  if (c.broth.coalescence == Coalescence::coalescing) {
    return viscous ? physics::largest_stable_bubble(sigma, rho) : std::min(broken, coalesced_bubble_cap_m);
  }
  const double formed = formed_m > 0.0 ? formed_m : coalesced_bubble_cap_m;
  return std::min(formed, broken);
}

// Solves G g = -s: the gas each zone holds when a unit flow enters by the shares s and none
// dissolves. G is an M-matrix (transport with outflow at the surface): an exact sparse LU on small
// and mid-sized networks, GMRES with aggregation multigrid on large ones (to the options' relative
// tolerance: the off-gas then equals the sparged gas to that tolerance times at most sqrt(N)),
// from `guess` when given (GMRES then solves for the correction to it).
std::vector<double> carried_gas(const SparseMatrix& g, const std::vector<double>& share, const SolverOptions& o,
                                const std::vector<double>* guess) {
  const int n = static_cast<int>(share.size());
  Eigen::VectorXd b(n);
  for (int k = 0; k < n; ++k) b[k] = -share[k];
  Eigen::VectorXd x;
  bool ok = false;
  if (n < o.multigrid_from_zones) {
    ScalarLu lu;
    ok = lu.factorize(g, o.supernodal_lu_from);
    if (ok) {
      x = b;
      lu.solve(x);
    }
  } else {
    Eigen::VectorXd x0 = Eigen::VectorXd::Zero(n);
    if (guess != nullptr && static_cast<int>(guess->size()) == n) x0 = Eigen::Map<const Eigen::VectorXd>(guess->data(), n);
    const Eigen::VectorXd r0 = b - g * x0;
    const double target = o.gas_routing_tolerance * b.norm();  // as from a zero start
    ScalarMultigrid mg;
    Fgmres krylov;
    FgmresOptions fo;
    fo.parallel_from_unknowns = o.parallel_from_unknowns;
    if (r0.norm() <= target) {
      x = x0;
      ok = true;
    } else if (mg.setup(g, {}, o)) {
      ok = krylov.solve([&g](const Eigen::VectorXd& in, Eigen::VectorXd& out) { out.noalias() = g * in; },
                        [&mg](const Eigen::VectorXf& in, Eigen::VectorXf& out) { mg.precondition(in, out); }, r0, x,
                        target / r0.norm(), fo);
      x += x0;
    }
  }
  if (!ok || !x.allFinite()) throw SolveError("the gas transport could not be solved (a zone the gas cannot leave?)");
  // -G^-1 of an M-matrix has no negative entry, so neither has the exact answer. The iterative
  // one may, inside its tolerance, where the gas hardly reaches (-1e-8 mol/m3 beside a cavern):
  // a negative inert inventory there would turn the zone's gas composition and its Jacobian
  // inside out (the preconditioner's blocks stop being M-matrices and its set-up fails).
  x = x.cwiseMax(0.0);
  return {x.data(), x.data() + n};
}

}  // namespace

double sparger_bubble_diameter(const Case& c, double gas_molar_flow_mol_s) {
  const auto& s = c.sparger;
  const double orifice = s.type == SpargerType::porous ? s.pore_diameter_m : s.hole_diameter_m;
  if (!c.has_sparger || orifice <= 0.0) return 0.0;
  const double t = c.vessel.temperature_k;
  const double sigma = physics::water_surface_tension(t);
  // Gas per orifice at the sparger's pressure; a porous element's pores each pass a negligible
  // flow, so they form bubbles at the static (Tate) limit.
  double per_orifice = 0.0;
  if (s.type != SpargerType::porous) {
    const double p = c.vessel.head_pressure_pa +
                     c.broth.density_kg_m3 * kG * (c.vessel.liquid_height_m - s.elevation_m);
    const double q = gas_molar_flow_mol_s * kR * t / (p - physics::water_vapour_pressure(t));
    per_orifice = q / std::max(1, s.holes);
  }
  // The broth at the sparger is barely sheared: its viscosity at 10 1/s (our choice).
  const double mu = apparent_viscosity(c.broth.rheology, 10.0);
  return std::min(physics::orifice_bubble_diameter(orifice, per_orifice, sigma, c.broth.density_kg_m3, mu),
                  physics::largest_stable_bubble(sigma, c.broth.density_kg_m3));
}

GasRouting route_gas(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h, const SolverOptions& options,
                     const std::vector<double>* guess) {
  const int nz = net.size();
  GasRouting g;
  const double pi = std::numbers::pi;
  const double sigma = physics::water_surface_tension(c.vessel.temperature_k);
  g.sparger_bubble_m = sparger_bubble_diameter(c, h.gas_molar_flow_mol_s);
  g.area.resize(nz);
  g.sauter_m.resize(nz);
  g.slip_m_s.resize(nz);
  for (int k = 0; k < nz; ++k) {
    g.area[k] = pi * (net.r1[k] * net.r1[k] - net.r0[k] * net.r0[k]);
    const double mu = h.apparent_viscosity[k];
    g.sauter_m[k] = zone_bubble_size(c, g.sparger_bubble_m, h.epsilon[k], sigma, mu, h.shear_rate[k]);
    const double rise = c.model.slip_velocity_m_s > 0.0
                            ? c.model.slip_velocity_m_s
                            : physics::bubble_rise_velocity(g.sauter_m[k], sigma, c.broth.density_kg_m3, mu);
    g.slip_m_s[k] = rise * c.model.slip_multiplier;
  }
  // The liquid's flows plus the slip through horizontal faces (zone_a below zone_b), upwinded;
  // the liquid's exchange as the bubbles' turbulent dispersion.
  std::vector<double> flow(net.faces.size());
  for (size_t f = 0; f < net.faces.size(); ++f) {
    const auto& face = net.faces[f];
    const double slip = 0.5 * (g.slip_m_s[face.zone_a] + g.slip_m_s[face.zone_b]);
    flow[f] = h.face_flow[f] + (face.orientation == FaceOrientation::axial ? slip * face.area : 0.0);
  }
  Triplets t;
  t.reserve(4 * net.faces.size() + nz);
  add_transport_triplets(net, flow, h.face_exchange, t);
  // Out through the surface: the zones of the top row.
  g.surface_outflow.assign(nz, 0.0);
  for (int col = 0; col < net.columns(); ++col) {
    const int k = net.zone_at(col, net.rows() - 1);
    if (k < 0) continue;
    g.surface_outflow[k] = g.slip_m_s[k] * g.area[k];
    t.emplace_back(k, k, -g.surface_outflow[k]);
  }
  g.transport.resize(nz, nz);
  g.transport.setFromTriplets(t.begin(), t.end());
  g.unit_inventory = carried_gas(g.transport, net.sparger_share, options, guess);
  return g;
}

double surface_flow(const GasRouting& routing, const std::vector<double>& g) {
  double out = 0.0;
  for (size_t k = 0; k < g.size(); ++k) out += routing.surface_outflow[k] * g[k];
  return out;
}

}  // namespace oxystrat
