// Inside the transient run (solver/oxygen/transient.hpp): the vessel at one operating point, the
// state of the broth, one implicit Euler step of it with the flows the balances need, and the
// local error estimate that sets the step. Not a public interface.
#pragma once

#include <Eigen/Core>
#include <algorithm>
#include <cmath>
#include <memory>
#include <vector>

#include "input/case.hpp"
#include "mesh/zone_network.hpp"
#include "solver/flow/gas_routing.hpp"
#include "solver/flow/hydrodynamics.hpp"
#include "solver/linalg/steady_problem.hpp"
#include "solver/oxygen/culture_growth.hpp"
#include "solver/oxygen/oxygen_field.hpp"
#include "solver/oxygen/oxygen_problem.hpp"

namespace oxystrat::transient_detail {

// The vessel at one operating point; rebuilt when speed, gas or an event changes it. The grid
// depends on geometry only, so states carry over zone by zone.
struct Plant {
  Case c;
  ZoneNetwork net;
  Hydrodynamics hydro;
  GasRouting routing;
  std::unique_ptr<OxygenContext> ctx;
  std::unique_ptr<OxygenSetup> setup;
  NewtonWorkspace o2_workspace, culture_workspace;
  explicit Plant(const Case& cs)
      : c(cs), net(build_zone_geometry(c)), hydro(compute_hydrodynamics(c, net)), routing(route_gas(c, net, hydro)) {
    ctx = std::make_unique<OxygenContext>(OxygenContext{c, net, hydro, routing});
    setup = std::make_unique<OxygenSetup>(*ctx, -1.0);
  }
};

// The whole state of the broth: O2/CO2 (solver layout) and, for a growing culture, substrate and
// biomass per zone.
struct BrothState {
  Eigen::VectorXd x;
  std::vector<double> substrate, biomass;
};

// O2 uptake of a growing culture: per-zone multipliers of a reference rate.
Uptake culture_uptake(const Uptake& base, const GrowthKinetics& g, const BrothState& b, double biomass_ref);

// What one step did, for the balances.
struct StepFlows {
  bool converged = false;
  int newton = 0;
  double o2_in = 0.0, o2_out = 0.0, o2_uptake = 0.0, co2_in = 0.0, co2_out = 0.0;  // [mol/s]
  double substrate_fed = 0.0, substrate_consumed = 0.0, biomass_grown = 0.0;       // [kg] over the step
  Uptake uptake;
};

// Advances `b` by h (operator splitting: O2/CO2 at the old culture, then substrate and biomass at the new DO).
StepFlows advance(Plant& p, const Case& c, BrothState& b, double h, double feed_volume_m3, int feed_zone,
                  double biomass_ref);

// Local error of the implicit Euler step, (h/2)|x'_new - x'_old|, against tol (|x| + reference).
struct ErrorEstimator {
  std::vector<double> reference;  // per watched value: DO of every zone, then S, then X
  std::vector<double> last_slope;
  bool have_slope = false;
  static std::vector<double> watched(const BrothState& b) {
    std::vector<double> w;
    const auto n = b.x.size() / 4;
    w.reserve(3 * n);
    for (Eigen::Index k = 0; k < static_cast<Eigen::Index>(n); ++k) w.push_back(b.x[4 * k]);
    w.insert(w.end(), b.substrate.begin(), b.substrate.end());
    w.insert(w.end(), b.biomass.begin(), b.biomass.end());
    return w;
  }
  std::vector<double> slope(const BrothState& from, const BrothState& to, double h) const {
    auto a = watched(from), s = watched(to);
    for (size_t i = 0; i < s.size(); ++i) s[i] = (s[i] - a[i]) / h;
    return s;
  }
  double error(const std::vector<double>& new_slope, const BrothState& to, double h, double tol) const {
    if (!have_slope) return 0.0;
    const auto v = watched(to);
    double worst = 0.0;
    for (size_t i = 0; i < v.size(); ++i) {
      worst = std::max(worst, 0.5 * h * std::abs(new_slope[i] - last_slope[i]) / (tol * (std::abs(v[i]) + reference[i])));
    }
    return worst;
  }
};

}  // namespace oxystrat::transient_detail
