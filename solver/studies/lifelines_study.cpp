#include "solver/studies/lifelines_study.hpp"

#include "solver/oxygen/transient.hpp"
#include "solver/oxygen/transient_cautions.hpp"

namespace oxystrat {

LifelineStudy run_lifeline_study(const LoadedCase& loaded, const LifelineStudyOptions& opts) {
  const Case& c = loaded.data;
  LifelineStudy s;
  s.at = c;
  std::vector<LifelineField> fields;
  if (opts.after_s) {
    // The transient's actuators at T0 set the flow, its last frame the fields.
    TransientOptions to;
    to.duration_s = *opts.after_s;
    to.output_interval_s = to.duration_s;
    const auto tr = run_transient(loaded, opts.overrides, to);
    s.cautions = transient_cautions(c, tr);
    const auto& last = tr.trace.back();
    s.at.operation.speed_rps = last.speed_rps;
    s.at.operation.gas_flow_normal_m3_s = last.gas_normal_m3_s;
    s.at.operation.oxygen_fraction = last.oxygen_fraction;
    const auto& frame = tr.frames.back();
    s.frozen_at_s = frame.time_s;
    s.do_mol_m3 = frame.do_mol_m3;
    fields.push_back(do_lifeline_field(s.do_mol_m3, c.culture.critical_do_mol_m3));
    if (tr.grows) {
      const double threshold = opts.substrate_threshold_kg_m3.value_or(c.culture.k_substrate_kg_m3);
      fields.push_back({"substrate", "substrate threshold", "kg/m3", "g/L", 1.0, frame.substrate_kg_m3, threshold, false});
    }
  }
  s.run = run_case(s.at, {false, false});
  if (!opts.after_s) s.cautions = s.run.cautions;
  if (!opts.after_s && s.run.field) {
    s.do_mol_m3 = s.run.field->do_mol_m3;
    fields.push_back(do_lifeline_field(s.do_mol_m3, c.culture.critical_do_mol_m3));
  }
  s.regimes = impeller_regimes(s.run.net);
  s.result = simulate_lifelines(s.run.net, s.run.hydro, fields, s.regimes, opts.cells);
  return s;
}

}  // namespace oxystrat
