#include "solver/studies/lifelines.hpp"

#include <omp.h>

#include <algorithm>
#include <string>

#include "solver/studies/lifeline_chain.hpp"
#include "solver/studies/lifeline_simulator.hpp"
#include "solver/studies/lifeline_statistics.hpp"
#include "solver/studies/lifeline_tally.hpp"

namespace oxystrat {

using namespace lifelines_detail;

LifelineRegimes impeller_regimes(const ZoneNetwork& net) {
  LifelineRegimes r;
  int impellers = 1;
  for (const auto& z : net.region) impellers = std::max({impellers, z.domain + 1, z.discharge + 1});
  for (int i = 0; i < impellers; ++i) r.names.push_back("impeller" + std::to_string(i + 1));
  for (int i = 0; i < impellers; ++i) r.names.push_back("bulk" + std::to_string(i + 1));
  for (const auto& z : net.region) r.of_zone.push_back(z.discharge >= 0 ? z.discharge : impellers + z.domain);
  return r;
}

const FieldStatistics* LifelineResult::field(const std::string& name) const {
  for (const auto& f : fields) {
    if (f.name == name) return &f;
  }
  return nullptr;
}

LifelineField do_lifeline_field(const std::vector<double>& do_mol_m3, double critical_do_mol_m3) {
  return {"do", "critical DO", "mol/m3", "mmol/L", 1.0, do_mol_m3, critical_do_mol_m3, true};
}

LifelineResult simulate_lifelines(const ZoneNetwork& net, const Hydrodynamics& h, const std::vector<LifelineField>& fields,
                                  const LifelineRegimes& regimes, const LifelineOptions& opts) {
  const int n = net.size();
  const int n_fields = static_cast<int>(fields.size());
  const int n_regimes = static_cast<int>(regimes.names.size());
  const Chain chain = build_chain(net, h, fields, regimes);
  const int cells = std::max(opts.cells, 0);
  const int kept = std::clamp(opts.trajectories, 0, cells);

  LifelineResult res;
  res.cells = cells;
  res.duration_s = opts.duration_s;
  res.trajectories.resize(kept);
  Totals totals{Tally(n, n_regimes), std::vector<FieldEvents>(n_fields), std::vector<std::vector<double>>(n_fields, std::vector<double>(cells))};
  const int threads = opts.threads > 0 ? opts.threads : omp_get_max_threads();
  follow_lifelines(chain, n_fields, n_regimes, opts, cells, threads, totals, res.trajectories);
  collect_statistics(res, totals, fields, regimes, opts, threads);
  return res;
}

}  // namespace oxystrat
