// The oxygen field in time: dissolved O2 and CO2 in every zone evolve (implicit Euler on the same
// balances and analytic Jacobian as the steady solve; the gas, whose residence is seconds, is
// quasi-steady), with step changes at given times and a DO controller as plants run it: a PID loop
// on the DO at one probe zone, acting in cascade on speed, then gas flow, then O2 fraction, each
// within limits. The probe sees its zone only, so the loop can be satisfied while another part of
// the tank starves. A growing culture (culture.growth_rate_max) adds substrate and biomass per
// zone, carried by the liquid, with the [feed] entering at its own zone.
//
// Integrator (our choice, documented in docs/method.md, section 12): implicit Euler (BDF1) with the steady
// solver's analytic Jacobian, a variable step from the local error estimate (h/2)|x'_n+1 - x'_n|,
// and operator splitting: O2/CO2 at the culture of the old level, then substrate and biomass
// together at the new DO. First order and unconditionally stable, and every balance (O2,
// substrate, biomass) closes exactly at each step, which the tests check; CVODE's higher orders
// would buy little with the controller acting every few seconds and step events breaking the
// smoothness they rely on.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "input/case_reader.hpp"

namespace oxystrat {

struct TransientOptions {
  double duration_s = 3600.0;
  double step_s = 30.0;             //!< largest step [s] (the step when not adaptive)
  double output_interval_s = 60.0;  //!< fields stored every this long [s]
  double initial_do_mol_m3 = -1.0;  //!< < 0: start from the steady field of the initial settings
  bool adaptive = true;             //!< variable step from the local error estimate
  double tolerance = 1e-3;          //!< local error per step, relative (see error_reference) [-]
  //! Called after every accepted step with the time reached [s] (progress display).
  std::function<void(double)> progress;
};

struct TransientSample {
  double time_s = 0.0, step_s = 0.0;
  double probe_do = 0.0, do_min = 0.0, do_mean = 0.0, do_max = 0.0;  //!< [mol/m3]
  double speed_rps = 0.0, gas_normal_m3_s = 0.0, oxygen_fraction = 0.0;
  double controller_output = 0.0;                       //!< cascade position 0..3 [-]
  bool controller_at_top = false;                       //!< at the end of its last stage (as tuned then)
  double otr_mol_s = 0.0, our_mol_s = 0.0;              //!< vessel totals [mol/s]
  double cer_mol_s = 0.0;                               //!< CO2 evolution into the gas [mol/s]
  double pco2_max_pa = 0.0;                             //!< largest dissolved-CO2 partial pressure [Pa]
  double volume_below_critical = 0.0;                   //!< [-]
  double substrate_min = 0.0, substrate_mean = 0.0, substrate_max = 0.0;  //!< [kg/m3]
  double biomass_mean = 0.0;                            //!< [kg/m3]
  double growth_rate_mean = 0.0;                        //!< volume mean of mu [1/s]
  double feed_rate_m3_s = 0.0, fed_volume_m3 = 0.0;
  double heat_load_w = 0.0;                             //!< cooling duty required (heat_balance.hpp) [W]
};

//! Fields of every zone at one output time.
struct TransientFrame {
  double time_s = 0.0;
  std::vector<double> do_mol_m3, co2_mol_m3, cstar_mol_m3, kla_1_s, our_mol_m3_s;
  std::vector<double> substrate_kg_m3, biomass_kg_m3, growth_rate_1_s;  //!< empty without growth
};

struct TransientResult {
  std::vector<TransientSample> trace;  //!< every accepted step
  std::vector<TransientFrame> frames;  //!< every output interval
  int probe_zone = 0, feed_zone = -1;
  bool grows = false;
  int rejected_steps = 0, newton_iterations = 0;
  // O2 over the whole run [mol]: fed = out + taken up + (liquid content at end - at start).
  double o2_fed = 0.0, o2_out = 0.0, o2_taken_up = 0.0, o2_stored_change = 0.0;
  // Substrate and biomass over the run [kg]: fed = consumed + stored change; grown = stored change.
  double substrate_fed = 0.0, substrate_consumed = 0.0, substrate_stored_change = 0.0;
  double biomass_grown = 0.0, biomass_stored_change = 0.0;
  double working_volume_m3 = 0.0;
};

//! Runs the case's [control], [[event]], culture growth and [feed] from its initial operating point.
TransientResult run_transient(const LoadedCase& base, const std::vector<Override>& base_overrides,
                              const TransientOptions& opts);

}  // namespace oxystrat
