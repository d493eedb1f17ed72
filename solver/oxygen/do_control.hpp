// The DO controller as plants run it (docs/method.md, section 12): a PID loop on the DO at one
// probe zone, in units of air saturation, acting in cascade on speed, then gas flow, then O2
// fraction, each within its limits. The transient run (solver/oxygen/transient.hpp) calls it every
// control interval.
#pragma once

#include "input/case.hpp"

namespace oxystrat {

class DoController {
 public:
  //! Limits from the case's [control] table; gas flow and O2 fraction without their own limits
  //! stay at the case's operating values. `air_saturation_mol_m3` scales the error [mol/m3].
  DoController(const Case& c, double air_saturation_mol_m3);

  //! One update from the DO at the probe [mol/m3]: the new cascade position u in [0, max_output()]
  //! [-]. Derivative on the measurement, not the error: a set-point step gives no kick. While the
  //! output is saturated the integral is held (anti-windup).
  double update(double probe_do_mol_m3);

  //! New settings (set-point, gain, times, limits) from the [control] table and operating values
  //! of `c` (a step event's case, its actuators as the case file gives them), keeping the
  //! integral and the last measurement: the loop carries on from where it is.
  void retune(const Case& c);

  //! Sets speed over u in [0, 1], then gas flow over [1, 2], then O2 fraction over [2, 3].
  void actuate(double u, Case& c) const;

  //! The cascade ends at its last stage that can act (a stage with no range would let the
  //! integral wind up): 1, 2 or 3 [-].
  double max_output() const { return u_max_; }

 private:
  ControlSettings k_;
  double air_sat_;
  double gas_lo_, gas_hi_, o2_lo_, o2_hi_, u_max_;
  double integral_ = 0.0, last_measured_ = 0.0;
  bool have_measured_ = false;
};

}  // namespace oxystrat
