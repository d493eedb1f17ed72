#include "solver/flow/mixing_grid.hpp"

#include "solver/flow/mixing_time.hpp"

namespace oxystrat {

CaseMixingTime case_mixing_time(const Case& c, const ZoneNetwork& net, const Hydrodynamics& h, int max_zones) {
  const auto result = [](const MixingResult& m, int zones, int halvings) {
    return CaseMixingTime{m.theta_s, zones, halvings, m.reached, m.judged_volume_fraction};
  };
  if (net.size() <= max_zones) return result(tracer_mixing_time(net, h, {}), net.size(), 0);
  Case coarse = c;
  int halvings = 0;
  const auto cells = [&coarse] { return static_cast<long>(coarse.grid.radial) * coarse.grid.axial; };
  while (cells() > max_zones && cells() > 1) {
    coarse.grid = coarse.grid.halved();
    ++halvings;
  }
  const ZoneNetwork coarse_net = build_zone_geometry(coarse);
  const Hydrodynamics coarse_hydro = compute_hydrodynamics(coarse, coarse_net);
  return result(tracer_mixing_time(coarse_net, coarse_hydro, {}), coarse_net.size(), halvings);
}

}  // namespace oxystrat
