#include "solver/oxygen/case_run.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <limits>

#include "solver/oxygen/cautions.hpp"

namespace oxystrat {
namespace {

// Heat, shear and cost at the solved point, with their cautions and notes.
void add_design_limits(const Case& c, CaseRun& run) {
  run.limits = design_limits(c, run.net, run.hydro, run.field ? &*run.field : nullptr);
  for (auto& w : limit_cautions(c, run.limits, run.max_biomass_kg_m3)) run.cautions.push_back(std::move(w));
  for (auto& n : limit_notes(c, run.limits)) run.notes.push_back(std::move(n));
}

}  // namespace

CaseRun run_case(const Case& c, const CaseRunOptions& opts, NewtonWorkspace* workspace, const StageReport& report) {
  const auto stage = [&report](const std::string& what) {
    if (report) report(what);
  };
  CaseRun run;
  stage(fmt::format("zone network, flow and gas paths on a {} x {} grid", c.grid.radial, c.grid.axial));
  run.net = build_zone_geometry(c);
  run.hydro = compute_hydrodynamics(c, run.net);
  run.routing = route_gas(c, run.net, run.hydro);
  if (run.hydro.gas_molar_flow_mol_s <= 0.0) {
    run.notes.push_back("no gas is sparged: hydrodynamics and mixing only; the oxygen field is not solved");
    run.cautions = cautions(c, run.hydro, nullptr);
    add_design_limits(c, run);
    return run;
  }
  const OxygenContext ctx{c, run.net, run.hydro, run.routing};
  if (workspace != nullptr) workspace->start_new_problem();
  stage(fmt::format("steady O2/CO2 field on {} zones", run.net.size()));
  run.field = solve_oxygen_field(ctx, -1.0, nullptr, workspace, opts.field_solve);

  if (opts.supportable_biomass && c.culture.q_o2_max_mol_kg_s > 0.0) {
    stage("the largest biomass every zone supports (a root search: one steady solve per step)");
    run.max_biomass_kg_m3 = max_supportable_biomass(ctx, *run.field, opts.biomass_rel_tol);
    run.biomass_searched = true;
  }
  if (opts.single_zone) {
    Case lumped = c;
    lumped.grid.radial = lumped.grid.axial = 1;
    const auto net1 = build_zone_geometry(lumped);
    const auto hydro1 = compute_hydrodynamics(lumped, net1);
    const auto routing1 = route_gas(lumped, net1, hydro1);
    const OxygenContext ctx1{lumped, net1, hydro1, routing1};
    run.single_zone = solve_oxygen_field(ctx1);
    if (opts.supportable_biomass && c.culture.q_o2_max_mol_kg_s > 0.0) {
      run.max_biomass_single_zone_kg_m3 = max_supportable_biomass(ctx1, *run.single_zone, opts.biomass_rel_tol);
    }
  }
  run.cautions = cautions(c, run.hydro, &*run.field);
  add_design_limits(c, run);
  return run;
}

HeightProfile height_profile(const ZoneNetwork& net, const std::vector<double>& field, const std::vector<bool>& include) {
  HeightProfile p;
  const int rows = net.rows();
  p.z.resize(rows);
  p.min.assign(rows, std::numeric_limits<double>::infinity());
  p.max.assign(rows, -std::numeric_limits<double>::infinity());
  p.mean.assign(rows, 0.0);
  std::vector<double> vol(rows, 0.0);
  for (int j = 0; j < rows; ++j) p.z[j] = 0.5 * (net.z_lines[j] + net.z_lines[j + 1]);
  for (int k = 0; k < net.size(); ++k) {
    if (!include.empty() && !include[k]) continue;
    const int j = net.row[k];
    p.min[j] = std::min(p.min[j], field[k]);
    p.max[j] = std::max(p.max[j], field[k]);
    p.mean[j] += field[k] * net.volume[k];
    vol[j] += net.volume[k];
  }
  const double nan = std::numeric_limits<double>::quiet_NaN();
  for (int j = 0; j < rows; ++j) {
    if (vol[j] > 0.0) {
      p.mean[j] /= vol[j];
    } else {  // no zone of this level counts
      p.mean[j] = p.min[j] = p.max[j] = nan;
    }
  }
  return p;
}

}  // namespace oxystrat
