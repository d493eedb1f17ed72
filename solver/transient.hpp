// The oxygen field in time: dissolved O2 and CO2 in every zone evolve (implicit Euler on the same
// balances and analytic Jacobian as the steady solve; the gas, whose residence is seconds, is
// quasi-steady), with step changes at given times and a DO controller as plants run it: a PI loop
// on the DO at one probe zone, acting in cascade on speed, then gas flow, then O2 fraction, each
// within limits. The probe sees its zone only, so the loop can be satisfied while another part of
// the tank starves.
#pragma once

#include <string>
#include <vector>

#include "case/case_reader.hpp"

namespace oxystrat {

struct TransientOptions {
  double duration_s = 3600.0;
  double step_s = 5.0;             //!< implicit Euler step [s]
  double output_interval_s = 60.0; //!< fields stored every this long [s]
  double initial_do_mol_m3 = -1.0; //!< < 0: start from the steady field of the initial settings
};

struct TransientSample {
  double time_s = 0.0;
  double probe_do = 0.0, do_min = 0.0, do_mean = 0.0;  //!< [mol/m3]
  double speed_rps = 0.0, gas_normal_m3_s = 0.0, oxygen_fraction = 0.0;
  double otr_mol_s = 0.0, our_mol_s = 0.0;             //!< vessel totals [mol/s]
  double volume_below_critical = 0.0;                  //!< [-]
};

struct TransientResult {
  std::vector<TransientSample> trace;        //!< every step
  std::vector<double> field_time_s;
  std::vector<std::vector<double>> do_fields;  //!< DO per zone at field_time_s [mol/m3]
  int probe_zone = 0;
  // O2 over the whole run [mol]: fed = out + taken up + (liquid content at end - at start).
  double o2_fed = 0.0, o2_out = 0.0, o2_taken_up = 0.0, o2_stored_change = 0.0;
};

//! Runs the case's [control] and [[event]] settings from its initial operating point.
TransientResult run_transient(const LoadedCase& base, const std::vector<Override>& base_overrides,
                              const TransientOptions& opts);

}  // namespace oxystrat
